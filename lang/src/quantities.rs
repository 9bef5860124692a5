//! The quantities a body can have: canonical name, aliases, dimension, valid range,
//! display unit and a one-line meaning. This table is the type system of the language.

use crate::ast::BodyKind;
use crate::units::Dimension;
use std::f64::consts::PI;

/// A bound of a valid range, in SI.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Bound {
    None,
    Inclusive(f64),
    Exclusive(f64),
}

#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub enum Qty {
    // star
    StarMass,
    StarRadius,
    Teff,
    Luminosity,
    LogG,
    StarDensity,
    Metallicity,
    Age,
    Distance,
    Parallax,
    RightAscension,
    Declination,
    SpectralType,
    MagnitudeV,
    MagnitudeJ,
    MagnitudeH,
    MagnitudeKs,
    BolometricMagnitude,
    AbsoluteBolometricMagnitude,
    BolometricFlux,
    HabitableInnerFlux,
    HabitableOuterFlux,
    HabitableInnerOptimisticFlux,
    HabitableOuterOptimisticFlux,
    HabitableInner,
    HabitableOuter,
    HabitableInnerOptimistic,
    HabitableOuterOptimistic,
    // planet
    Period,
    SemiMajorAxis,
    Eccentricity,
    Inclination,
    Impact,
    ArgPeriastron,
    RvAmplitude,
    MinMass,
    Mass,
    Radius,
    RadiusRatio,
    TransitDepth,
    TransitDuration,
    TransitDurationFull,
    TransitEpoch,
    ScaledAxis,
    Albedo,
    Redistribution,
    Density,
    SurfaceGravity,
    EscapeVelocity,
    OrbitalSpeed,
    HillRadius,
    Teq,
    Insolation,
    HabitableZonePosition,
    MeanMolecularWeight,
    ScaleHeight,
    Tsm,
    Esm,
    PredictedMass,
    PredictedRadius,
    PredictedRvAmplitude,
}

#[derive(Debug, Clone)]
pub struct QuantityDef {
    pub qty: Qty,
    pub kind: BodyKind,
    pub name: &'static str,
    pub aliases: &'static [&'static str],
    pub dim: Dimension,
    /// Text-valued (a spectral type) rather than a measurement.
    pub text: bool,
    pub min: Bound,
    pub max: Bound,
    /// The unit values are shown in.
    pub display: &'static str,
    pub doc: &'static str,
}

fn d(l: i32, m: i32, t: i32, k: i32, a: i32) -> Dimension {
    Dimension::of(l, m, t, k, a)
}

macro_rules! q {
    ($qty:ident, $kind:ident, $name:literal, [$($alias:literal),*], $dim:expr, $min:expr, $max:expr, $disp:literal, $doc:literal) => {
        QuantityDef {
            qty: Qty::$qty,
            kind: BodyKind::$kind,
            name: $name,
            aliases: &[$($alias),*],
            dim: $dim,
            text: false,
            min: $min,
            max: $max,
            display: $disp,
            doc: $doc,
        }
    };
}

/// The whole table, in the order output lists quantities.
pub fn table() -> &'static [QuantityDef] {
    static T: std::sync::OnceLock<Vec<QuantityDef>> = std::sync::OnceLock::new();
    T.get_or_init(build)
}

fn build() -> Vec<QuantityDef> {
    use Bound::*;
    let none = Dimension::NONE;
    let len = Dimension::LENGTH;
    let mass = Dimension::MASS;
    let time = Dimension::TIME;
    let temp = Dimension::TEMPERATURE;
    let angle = Dimension::ANGLE;
    let dens = d(-3, 1, 0, 0, 0);
    let power = d(2, 1, -3, 0, 0);
    let speed = d(1, 0, -1, 0, 0);
    let mut v = vec![
        q!(StarMass, Star, "mass", ["M"], mass, Exclusive(0.0), None, "Msun", "Stellar mass."),
        q!(StarRadius, Star, "radius", ["R"], len, Exclusive(0.0), None, "Rsun", "Stellar radius."),
        q!(Teff, Star, "teff", ["Teff", "T_eff"], temp, Exclusive(0.0), None, "K", "Effective temperature."),
        q!(Luminosity, Star, "luminosity", ["L"], power, Exclusive(0.0), None, "Lsun", "Bolometric luminosity."),
        q!(LogG, Star, "log_g", ["logg"], none, Inclusive(-2.0), Inclusive(10.0), "dex", "Surface gravity as log10(g / (cm s^-2)), as the trade quotes it."),
        q!(StarDensity, Star, "density", ["rho"], dens, Exclusive(0.0), None, "g/cm^3", "Mean stellar density."),
        q!(Metallicity, Star, "metallicity", ["feh", "FeH"], none, Inclusive(-6.0), Inclusive(2.0), "dex", "Iron abundance [Fe/H] relative to the Sun."),
        q!(Age, Star, "age", [], time, Inclusive(0.0), Inclusive(2.0e10 * 31_557_600.0), "Gyr", "Age of the star."),
        q!(Distance, Star, "distance", ["dist"], len, Exclusive(0.0), None, "pc", "Distance from the Sun."),
        q!(Parallax, Star, "parallax", ["plx"], angle, Exclusive(0.0), None, "mas", "Trigonometric parallax."),
        q!(RightAscension, Star, "right_ascension", ["ra"], angle, Inclusive(0.0), Exclusive(2.0 * PI), "deg", "Right ascension (ICRS), in degrees or as hours \"hh:mm:ss.s\"; proper motion is not applied."),
        q!(Declination, Star, "declination", ["dec"], angle, Inclusive(-PI / 2.0), Inclusive(PI / 2.0), "deg", "Declination (ICRS), in degrees or as \"±dd:mm:ss\"; proper motion is not applied."),
        QuantityDef {
            text: true,
            ..q!(SpectralType, Star, "spectral_type", ["sptype", "SpT"], none, None, None, "", "Spectral type and luminosity class, such as \"K0V\".")
        },
        q!(MagnitudeV, Star, "magnitude_v", [], none, Inclusive(-30.0), Inclusive(40.0), "mag", "Apparent magnitude in the V band."),
        q!(MagnitudeJ, Star, "magnitude_j", [], none, Inclusive(-30.0), Inclusive(40.0), "mag", "Apparent magnitude in the J band (near infrared, 1.25 µm)."),
        q!(MagnitudeH, Star, "magnitude_h", [], none, Inclusive(-30.0), Inclusive(40.0), "mag", "Apparent magnitude in the H band (near infrared, 1.65 µm)."),
        q!(MagnitudeKs, Star, "magnitude_ks", [], none, Inclusive(-30.0), Inclusive(40.0), "mag", "Apparent magnitude in the Ks band (near infrared, 2.15 µm)."),
        q!(BolometricMagnitude, Star, "bolometric_magnitude", ["m_bol"], none, Inclusive(-30.0), Inclusive(40.0), "mag", "Apparent bolometric magnitude, on the IAU 2015 B2 scale."),
        q!(AbsoluteBolometricMagnitude, Star, "absolute_bolometric_magnitude", ["M_bol"], none, Inclusive(-30.0), Inclusive(40.0), "mag", "Absolute bolometric magnitude, on the IAU 2015 B2 scale."),
        q!(BolometricFlux, Star, "bolometric_flux", ["f_bol"], d(0, 1, -3, 0, 0), Exclusive(0.0), None, "W/m^2", "Bolometric irradiance received from the star at the Sun's distance from it."),
        q!(HabitableInnerFlux, Star, "habitable_inner_insolation", [], d(0, 1, -3, 0, 0), Exclusive(0.0), None, "Searth", "Insolation at the habitable zone's inner edge (runaway greenhouse)."),
        q!(HabitableOuterFlux, Star, "habitable_outer_insolation", [], d(0, 1, -3, 0, 0), Exclusive(0.0), None, "Searth", "Insolation at the habitable zone's outer edge (maximum greenhouse)."),
        q!(HabitableInnerOptimisticFlux, Star, "habitable_inner_optimistic_insolation", [], d(0, 1, -3, 0, 0), Exclusive(0.0), None, "Searth", "Insolation at the optimistic inner edge (recent Venus)."),
        q!(HabitableOuterOptimisticFlux, Star, "habitable_outer_optimistic_insolation", [], d(0, 1, -3, 0, 0), Exclusive(0.0), None, "Searth", "Insolation at the optimistic outer edge (early Mars)."),
        q!(HabitableInner, Star, "habitable_inner", [], len, Exclusive(0.0), None, "au", "Inner edge of the habitable zone (runaway greenhouse)."),
        q!(HabitableOuter, Star, "habitable_outer", [], len, Exclusive(0.0), None, "au", "Outer edge of the habitable zone (maximum greenhouse)."),
        q!(HabitableInnerOptimistic, Star, "habitable_inner_optimistic", [], len, Exclusive(0.0), None, "au", "Optimistic inner edge of the habitable zone (recent Venus)."),
        q!(HabitableOuterOptimistic, Star, "habitable_outer_optimistic", [], len, Exclusive(0.0), None, "au", "Optimistic outer edge of the habitable zone (early Mars)."),
        q!(Period, Planet, "period", ["P"], time, Exclusive(0.0), None, "d", "Orbital period."),
        q!(SemiMajorAxis, Planet, "semi_major_axis", ["a", "sma"], len, Exclusive(0.0), None, "au", "Semi-major axis of the relative orbit."),
        q!(Eccentricity, Planet, "eccentricity", ["e"], none, Inclusive(0.0), Exclusive(1.0), "1", "Orbital eccentricity."),
        q!(Inclination, Planet, "inclination", ["i"], angle, Inclusive(0.0), Inclusive(PI), "deg", "Inclination of the orbit to the sky plane (90 deg is edge-on)."),
        q!(Impact, Planet, "impact", ["b", "impact_parameter"], none, Inclusive(0.0), None, "1", "Transit impact parameter, in stellar radii."),
        q!(ArgPeriastron, Planet, "arg_periastron", ["omega", "ω"], angle, Inclusive(-2.0 * PI), Inclusive(2.0 * PI), "deg", "Argument of periastron of the planet's orbit."),
        q!(RvAmplitude, Planet, "rv_amplitude", ["K", "K_rv"], speed, Inclusive(0.0), None, "m/s", "Semi-amplitude of the star's radial-velocity signal."),
        q!(MinMass, Planet, "min_mass", ["msini", "Msini", "m_sin_i"], mass, Exclusive(0.0), None, "Mjup", "Minimum mass Mp sin i, from radial velocities alone."),
        q!(Mass, Planet, "mass", ["M", "Mp"], mass, Exclusive(0.0), None, "Mjup", "True planet mass."),
        q!(Radius, Planet, "radius", ["R", "Rp"], len, Exclusive(0.0), None, "Rjup", "Planet radius."),
        q!(RadiusRatio, Planet, "radius_ratio", ["k", "rp_rs", "Rp_Rs"], none, Exclusive(0.0), None, "1", "Planet-to-star radius ratio Rp/R*."),
        q!(TransitDepth, Planet, "transit_depth", ["depth", "delta"], none, Exclusive(0.0), Inclusive(1.0), "%", "Fractional transit depth."),
        q!(TransitDuration, Planet, "transit_duration", ["T14", "duration"], time, Exclusive(0.0), None, "h", "Total transit duration, first to fourth contact."),
        q!(TransitDurationFull, Planet, "transit_duration_full", ["T23"], time, Exclusive(0.0), None, "h", "Full transit duration, second to third contact."),
        q!(TransitEpoch, Planet, "transit_epoch", ["T0", "epoch"], time, Exclusive(0.0), None, "BJD_TDB", "A mid-transit time, as a Julian date in a named time scale."),
        q!(ScaledAxis, Planet, "scaled_semi_major_axis", ["a_rs", "a_Rs"], none, Exclusive(0.0), None, "1", "Semi-major axis in stellar radii, a/R*."),
        q!(Albedo, Planet, "albedo", ["A", "bond_albedo"], none, Inclusive(0.0), Inclusive(1.0), "1", "Bond albedo."),
        q!(Redistribution, Planet, "redistribution", ["f"], none, Inclusive(1.0), Inclusive(8.0 / 3.0), "1", "Heat redistribution factor f: 1 spreads heat over the whole planet, 2 over the day side, 8/3 is instant re-emission."),
        q!(Density, Planet, "density", ["rho"], dens, Exclusive(0.0), None, "g/cm^3", "Bulk density."),
        q!(SurfaceGravity, Planet, "surface_gravity", ["g"], d(1, 0, -2, 0, 0), Exclusive(0.0), None, "m/s^2", "Surface gravity G Mp / Rp^2."),
        q!(EscapeVelocity, Planet, "escape_velocity", ["v_esc"], speed, Exclusive(0.0), None, "km/s", "Escape velocity at the planet's radius."),
        q!(OrbitalSpeed, Planet, "orbital_speed", ["v_orb"], speed, Exclusive(0.0), None, "km/s", "Mean orbital speed 2 pi a / P."),
        q!(HillRadius, Planet, "hill_radius", ["r_hill"], len, Exclusive(0.0), None, "au", "Hill radius at periastron."),
        q!(Teq, Planet, "teq", ["Teq", "T_eq"], temp, Exclusive(0.0), None, "K", "Equilibrium temperature."),
        q!(Insolation, Planet, "insolation", ["S", "flux"], d(0, 1, -3, 0, 0), Exclusive(0.0), None, "Searth", "Stellar flux received at the orbit's semi-major axis."),
        q!(HabitableZonePosition, Planet, "habitable_zone_position", [], none, None, None, "1", "Where the planet's insolation lies in its star's habitable zone: 0 at the inner edge, 1 at the outer edge; below 0 is hotter, above 1 colder."),
        q!(MeanMolecularWeight, Planet, "mean_molecular_weight", ["mu"], none, Exclusive(0.0), None, "1", "Mean molecular weight of the atmosphere, in atomic mass units."),
        q!(ScaleHeight, Planet, "scale_height", [], len, Exclusive(0.0), None, "km", "Atmospheric scale height k T / (mu m_u g) at the equilibrium temperature."),
        q!(Tsm, Planet, "tsm", [], none, Inclusive(0.0), None, "1", "Transmission spectroscopy metric (Kempton et al. 2018)."),
        q!(Esm, Planet, "esm", [], none, Inclusive(0.0), None, "1", "Emission spectroscopy metric (Kempton et al. 2018)."),
        q!(PredictedMass, Planet, "predicted_mass", [], mass, Exclusive(0.0), None, "Mearth", "Mass predicted from the radius by a mass-radius relation: a prediction, not a measurement."),
        q!(PredictedRadius, Planet, "predicted_radius", [], len, Exclusive(0.0), None, "Rearth", "Radius predicted from the mass (or minimum mass) by a mass-radius relation: a prediction, not a measurement."),
        q!(PredictedRvAmplitude, Planet, "predicted_rv_amplitude", [], speed, Inclusive(0.0), None, "m/s", "Radial-velocity semi-amplitude the predicted mass would give."),
    ];
    v.shrink_to_fit();
    v
}

/// Find a quantity of a body kind by canonical name or alias.
pub fn find(kind: BodyKind, name: &str) -> Option<&'static QuantityDef> {
    index().by_name.get(&(kind, name)).copied()
}

pub fn def(qty: Qty) -> &'static QuantityDef {
    // The table holds every variant; the fallback only keeps this total.
    index()
        .by_qty
        .get(qty as usize)
        .copied()
        .flatten()
        .unwrap_or(&FALLBACK)
}

/// The table looked up by name (with aliases) and by quantity: every declaration of a file
/// is found here, and a scan compared it with every name of the table.
struct Index {
    by_name: rustc_hash::FxHashMap<(BodyKind, &'static str), &'static QuantityDef>,
    by_qty: Vec<Option<&'static QuantityDef>>,
}

fn index() -> &'static Index {
    static I: std::sync::OnceLock<Index> = std::sync::OnceLock::new();
    I.get_or_init(|| {
        let mut by_name = rustc_hash::FxHashMap::default();
        let mut by_qty: Vec<Option<&'static QuantityDef>> = Vec::new();
        for q in table() {
            for name in std::iter::once(&q.name).chain(q.aliases) {
                // The first entry of a name wins, as the scan it replaces found it.
                by_name.entry((q.kind, *name)).or_insert(q);
            }
            let i = q.qty as usize;
            if by_qty.len() <= i {
                by_qty.resize(i + 1, None);
            }
            if let Some(slot @ None) = by_qty.get_mut(i) {
                *slot = Some(q);
            }
        }
        Index { by_name, by_qty }
    })
}

static FALLBACK: QuantityDef = QuantityDef {
    qty: Qty::Period,
    kind: BodyKind::Planet,
    name: "?",
    aliases: &[],
    dim: Dimension::NONE,
    text: false,
    min: Bound::None,
    max: Bound::None,
    display: "1",
    doc: "",
};

/// Names valid for a kind, canonical first (for did-you-mean and completion).
pub fn names_for(kind: BodyKind) -> impl Iterator<Item = &'static str> {
    table()
        .iter()
        .filter(move |q| q.kind == kind)
        .flat_map(|q| std::iter::once(q.name).chain(q.aliases.iter().copied()))
}

/// Short names the language does not take, each with the quantity meant: the trade writes
/// `i`, `e` and `omega` (or `ω`), and these abbreviations would be one more spelling to read.
const NOT_NAMES: &[(BodyKind, &str, &str)] = &[
    (BodyKind::Planet, "inc", "inclination"),
    (BodyKind::Planet, "ecc", "eccentricity"),
    (BodyKind::Planet, "w", "arg_periastron"),
    (BodyKind::Planet, "Tdur", "transit_duration"),
    (BodyKind::Planet, "tdur", "transit_duration"),
    (BodyKind::Planet, "T_dur", "transit_duration"),
    (BodyKind::Planet, "Mp", "mass"),
    (BodyKind::Planet, "M_p", "mass"),
    (BodyKind::Planet, "Rp", "radius"),
    (BodyKind::Planet, "R_p", "radius"),
    (BodyKind::Star, "Mstar", "mass"),
    (BodyKind::Star, "M_star", "mass"),
    (BodyKind::Star, "Ms", "mass"),
    (BodyKind::Star, "Rstar", "radius"),
    (BodyKind::Star, "R_star", "radius"),
    (BodyKind::Star, "Rs", "radius"),
];

/// Quantities the trade writes down that Syzygy has no place for, with what they are: an
/// unknown name among these is told so instead of pointed at a name that merely looks
/// alike (`vsini` is not `msini`).
const NOT_QUANTITIES: &[(&str, &str)] = &[
    ("vsini", "a star's projected rotation speed"),
    ("v_sin_i", "a star's projected rotation speed"),
    ("vsin_i", "a star's projected rotation speed"),
    ("prot", "a star's rotation period"),
    ("P_rot", "a star's rotation period"),
];

/// The quantity a ratio written as a fraction stands for: `Rp/Rs`, `Rp/R*` and `k` are the
/// radius ratio, `a/Rs` and `a/R*` the semi-major axis in stellar radii.
pub fn ratio_name(written: &str) -> Option<&'static str> {
    let n = written.to_ascii_lowercase().replace(['_', ' '], "");
    let n = n.replace("rstar", "rs").replace("r*", "rs");
    match n.as_str() {
        "rp/rs" | "r/rs" => Some("radius_ratio"),
        "a/rs" => Some("scaled_semi_major_axis"),
        _ => None,
    }
}

/// What a name the trade uses but Syzygy has no quantity for stands for.
pub fn not_a_quantity(name: &str) -> Option<&'static str> {
    NOT_QUANTITIES
        .iter()
        .find(|(n, _)| n.eq_ignore_ascii_case(name))
        .map(|(_, what)| *what)
}

/// The name meant by an unknown quantity name of a kind of body, for a did-you-mean.
pub fn suggest(kind: BodyKind, name: &str) -> Option<&'static str> {
    NOT_NAMES
        .iter()
        .find(|(k, n, _)| *k == kind && *n == name)
        .map(|(_, _, meant)| *meant)
        .or_else(|| band_magnitude(kind, name))
        .or_else(|| crate::text::closest(name, names_for(kind)))
}

/// A star's magnitude written as catalogues often head its column (`Vmag`, `Ks_mag`,
/// `mag_J`: common practice), too far from `magnitude_v` for the edit distance to find.
fn band_magnitude(kind: BodyKind, name: &str) -> Option<&'static str> {
    if kind != BodyKind::Star {
        return None;
    }
    let n = name.to_lowercase().replace('_', "");
    let band = n.strip_suffix("mag").or_else(|| n.strip_prefix("mag"))?;
    match band {
        "v" => Some("magnitude_v"),
        "j" => Some("magnitude_j"),
        "h" => Some("magnitude_h"),
        "k" | "ks" => Some("magnitude_ks"),
        "bol" => Some("bolometric_magnitude"),
        _ => None,
    }
}

impl QuantityDef {
    /// Whether an SI value lies inside the valid range.
    pub fn in_range(&self, v: f64) -> bool {
        let lo = match self.min {
            Bound::None => true,
            Bound::Inclusive(m) => v >= m,
            Bound::Exclusive(m) => v > m,
        };
        let hi = match self.max {
            Bound::None => true,
            Bound::Inclusive(m) => v <= m,
            Bound::Exclusive(m) => v < m,
        };
        lo && hi
    }

    /// Why `value` (SI) is physically impossible though inside the quantity's range, where
    /// it is: a radial-velocity amplitude at or past the speed of light. Not a bound of the
    /// range, which would make a lower limit on it samplable up to that bound.
    pub fn impossible(&self, value: f64) -> Option<&'static str> {
        (self.qty == Qty::RvAmplitude && value.abs() >= crate::constants::C)
            .then_some("a radial-velocity amplitude must be below the speed of light")
    }

    /// The range in words, in the display unit (for messages and docs).
    pub fn range_text(&self) -> String {
        let unit = crate::units::parse_unit_text(self.display);
        let f = unit.as_ref().map_or(1.0, |u| u.factor);
        let shown = |v: f64| crate::format::number(v / f);
        let u = if self.display == "1" || self.display.is_empty() {
            String::new()
        } else {
            format!(" {}", self.display)
        };
        match (self.min, self.max) {
            (Bound::None, Bound::None) => "any value".to_string(),
            (lo, Bound::None) => match lo {
                Bound::Exclusive(m) => format!("greater than {}{u}", shown(m)),
                Bound::Inclusive(m) => format!("at least {}{u}", shown(m)),
                Bound::None => String::new(),
            },
            (lo, hi) => {
                let l = match lo {
                    Bound::Inclusive(m) => format!("[{}", shown(m)),
                    Bound::Exclusive(m) => format!("({}", shown(m)),
                    Bound::None => "(-inf".to_string(),
                };
                let h = match hi {
                    Bound::Inclusive(m) => format!("{}]", shown(m)),
                    Bound::Exclusive(m) => format!("{})", shown(m)),
                    Bound::None => "inf)".to_string(),
                };
                format!("{l}, {h}{u}")
            }
        }
    }

    /// Lower and upper physical limits in SI, used to keep Monte Carlo samples physical.
    pub fn limits(&self) -> (f64, f64) {
        let lo = match self.min {
            Bound::None => f64::NEG_INFINITY,
            Bound::Inclusive(m) | Bound::Exclusive(m) => m,
        };
        let hi = match self.max {
            Bound::None => f64::INFINITY,
            Bound::Inclusive(m) | Bound::Exclusive(m) => m,
        };
        (lo, hi)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn names_the_trade_writes_point_to_the_quantity_or_say_there_is_none() {
        assert_eq!(suggest(BodyKind::Star, "Mstar"), Some("mass"));
        assert_eq!(suggest(BodyKind::Planet, "Rp"), Some("radius"));
        // `vsini` looks like `msini` but is a star's rotation: no such quantity.
        assert!(not_a_quantity("vsini").is_some_and(|w| w.contains("rotation")));
        assert_eq!(not_a_quantity("msini"), None);
        assert_eq!(ratio_name("Rp/R*"), Some("radius_ratio"));
        assert_eq!(ratio_name("a/R_star"), Some("scaled_semi_major_axis"));
        assert_eq!(ratio_name("Mp/Ms"), None);
    }

    #[test]
    fn every_variant_is_in_the_table_once() {
        let mut seen = std::collections::HashSet::new();
        for q in table() {
            assert!(seen.insert(q.qty), "{:?} twice", q.qty);
            assert!(
                q.text || crate::units::parse_unit_text(q.display).map(|u| u.dim) == Some(q.dim),
                "display unit of {} has the wrong dimension",
                q.name
            );
        }
        assert_eq!(def(Qty::Teq).name, "teq");
    }

    #[test]
    fn names_and_aliases_are_unique_per_kind() {
        for kind in [BodyKind::Star, BodyKind::Planet] {
            let mut seen = std::collections::HashSet::new();
            for n in names_for(kind) {
                assert!(seen.insert(n), "{n} twice for {kind:?}");
            }
        }
    }

    #[test]
    fn ranges() {
        let e = def(Qty::Eccentricity);
        assert!(e.in_range(0.0) && e.in_range(0.99) && !e.in_range(1.0));
        assert!(!def(Qty::Mass).in_range(-1.0));
        assert_eq!(e.range_text(), "[0, 1)");
        assert_eq!(def(Qty::Inclination).range_text(), "[0, 180] deg");
    }
}
