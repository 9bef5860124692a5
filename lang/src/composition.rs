//! Mass–radius relations for solid planets and a bulk-composition classifier.
//!
//! This module owns (1) published mass–radius curves for solid planets, with the
//! metadata a plot needs to label them and the mass range over which each was fitted,
//! and (2) a classifier that turns Monte Carlo samples of a planet's mass and radius
//! into the probability (fraction of samples) of each composition class.
//!
//! Masses are in kg and radii in m at the interface. Internally the curves work in
//! Earth units: `M_EARTH` (IAU 2015 B3 nominal GM_earth / CODATA 2018 G) and `R_EARTH`
//! (IAU 2015 B3 nominal *equatorial* radius). The papers normalise to Earth's radius
//! without distinguishing equatorial from mean (6371.0 km); that 0.11% ambiguity is far
//! below the few-percent accuracy of the fits.
//!
//! # Curves
//!
//! * **Seager, Kuchner, Hier-Majumder & Militzer (2007, ApJ 669, 1279)**, their fitted
//!   relation (their eq. 23, from memory)
//!   `log10 R_s = k1 + (1/3) log10 M_s − k2 M_s^k3`, `M_s = M / m1`, `R_s = R / r1`,
//!   with one parameter set per material from the paper's table of fit parameters
//!   (Table 4, from memory — both the table number and the coefficients are recalled,
//!   not read):
//!
//!   | material                 | m1 (M⊕) | r1 (R⊕) | k1        | k2     | k3    |
//!   |--------------------------|---------|---------|-----------|--------|-------|
//!   | Fe (ε phase)             | 5.80    | 2.52    | −0.20949  | 0.0804 | 0.394 |
//!   | MgSiO3 (perovskite)      | 10.55   | 3.90    | −0.20959  | 0.0799 | 0.413 |
//!   | H2O (ice)                | 5.52    | 4.43    | −0.20940  | 0.0807 | 0.375 |
//!
//!   The paper quotes the fit as good to a few percent up to about 20 M⊕ (from memory).
//!   Fitted range used here: 0.01–20 M⊕ (lower end: the low end of the paper's model
//!   grid, from memory). At small mass the correction term vanishes and the fit tends to
//!   the material's zero-pressure density, so its small-mass behaviour is sound; a test
//!   checks this limit against the paper's zero-pressure densities.
//!
//! * **Zeng, Sasselov & Jacobsen (2016, ApJ 819, 127)**, semi-empirical two-layer
//!   rocky relation scaled from Earth's seismic model:
//!   `R / R⊕ = (1.07 − 0.21 CMF) (M / M⊕)^(1/3.7)`, CMF = core (iron) mass fraction.
//!   The abstract states it is applicable to 1–8 M⊕ and CMF 0.0–0.4.
//!
//! [`radius_of`] returns `None` outside a curve's fitted range (mass, and for the rocky
//! curve also CMF). [`radius_of_extrapolated`] always evaluates the formula for a
//! physically meaningful input and returns the radius with an `extrapolated` flag.
//!
//! # Composition classes and their boundaries
//!
//! At each sample's mass the classifier evaluates three radii (see [`boundary_radii`]):
//!
//! 1. **iron floor** — Seager et al. (2007) pure Fe(ε). The paper notes that the minimum
//!    plausible size of a planet of given mass is that of a pure-iron planet.
//! 2. **rock ceiling** — Zeng et al. (2016) with CMF = 0: a planet of pure silicate
//!    mantle, calibrated on the real Earth. The Seager MgSiO3 curve is *not* used as the
//!    ceiling: it assumes perovskite throughout, which is denser than the low-pressure
//!    silicates of small planets, and places Mars above "pure silicate".
//! 3. **iron-rich limit** — a planet with core mass fraction `x` (default 0.5), built by
//!    volume-additive mixing of the two end members at the same total mass:
//!    `R_x^3 = x R_floor^3 + (1 − x) R_ceiling^3`. Inside 1–8 M⊕ this reproduces Zeng's
//!    own CMF dependence to about 2% (tested), while inheriting the iron curve's correct
//!    small-mass behaviour; Zeng's formula itself is not used for CMF = 0.5 because that
//!    exceeds its stated CMF range and, extrapolated to Mars's mass, would put Mars near
//!    CMF 0.5.
//!
//! Why CMF 0.5: Earth's core is about 32% of its mass (common practice) and rocky
//! planets fitted with Zeng's relation cluster at CMF 0.26 ± 0.07 (Zeng et al. 2016
//! abstract), while Mercury's is about 0.7 (from memory). 0.5 sits clearly between
//! the Earth-like and the Mercury-like.
//!
//! Classes, tested in this order for a sample (mass `M`, radius `R`):
//!
//! | class                    | condition |
//! |--------------------------|-----------|
//! | `DenserThanIron`         | `R < iron floor` — physically implausible |
//! | `IronRich`               | `R < iron-rich limit` |
//! | `Rocky`                  | `R ≤ rock ceiling` |
//! | `VolatileRich`           | above the ceiling and `M < giant_min_mass` (default 0.1 M_J ≈ 32 M⊕): needs water and/or a gas envelope |
//! | `GasGiant`               | above the ceiling, `M ≥ giant_min_mass`, `R ≤ inflated_min_radius` (default 1.2 R_J) |
//! | `InflatedGiant`          | above the ceiling, `M ≥ giant_min_mass`, `R > inflated_min_radius` |
//!
//! Why 0.1 M_J: it lies between the ice giants (Neptune ≈ 0.054 M_J) and Saturn
//! (≈ 0.30 M_J), where hydrogen and helium start to dominate the mass (common
//! practice). Why 1.2 R_J: evolved (Gyr-old), weakly irradiated hydrogen–helium planets
//! of any mass stay below about 1.1–1.2 R_J in standard cooling models (from memory),
//! so a larger radius needs extra heating or youth. Both thresholds, and the CMF of the
//! iron-rich limit, are fields of [`ClassBoundaries`] and are reported with every
//! summary.
//!
//! # Extrapolation
//!
//! The classifier always uses [`radius_of_extrapolated`]: the Seager iron curve is
//! extrapolated outside 0.01–20 M⊕ and the Zeng ceiling outside 1–8 M⊕, as power laws
//! of the published form. A sample is counted as *extrapolated* when its mass lies
//! outside 1–8 M⊕ (where both curves are inside their fitted ranges); the summary
//! reports that fraction. Known limit: below roughly 0.05 M⊕ the extrapolated ceiling
//! grows too large (its density falls below that of real rock), so the iron-rich limit
//! rises with it; a Moon-like body there is wrongly called iron-rich. Giants are
//! classified by the mass and radius thresholds, so the solid curves only decide that
//! they lie above the rock ceiling.
//!
//! # Samples
//!
//! Mass and radius samples are paired by index. A pair is *rejected* (not counted in any
//! class) if either value is non-finite or not positive. Mismatched slice lengths are an
//! input problem: no pair is used and the summary records the problem. With no usable
//! pair every probability is `None`.

use crate::constants::{M_EARTH, M_JUPITER, R_EARTH, R_JUPITER};

/// Parameters of one Seager et al. (2007) fit.
#[derive(Clone, Copy, Debug, PartialEq)]
struct SeagerFit {
    /// Mass scale m1, Earth masses.
    m1: f64,
    /// Radius scale r1, Earth radii.
    r1: f64,
    k1: f64,
    k2: f64,
    k3: f64,
}

// Seager, Kuchner, Hier-Majumder & Militzer 2007, ApJ 669, 1279, table of fit
// parameters (Table 4, from memory).
const SEAGER_IRON: SeagerFit = SeagerFit {
    m1: 5.80,
    r1: 2.52,
    k1: -0.209_490,
    k2: 0.0804,
    k3: 0.394,
};
const SEAGER_SILICATE: SeagerFit = SeagerFit {
    m1: 10.55,
    r1: 3.90,
    k1: -0.209_594,
    k2: 0.0799,
    k3: 0.413,
};
const SEAGER_WATER: SeagerFit = SeagerFit {
    m1: 5.52,
    r1: 4.43,
    k1: -0.209_396,
    k2: 0.0807,
    k3: 0.375,
};

/// Fitted mass range of the Seager et al. (2007) relations, Earth masses
/// (upper end quoted in the paper, lower end the model grid's; both from memory).
const SEAGER_MASS_RANGE_EARTH: (f64, f64) = (0.01, 20.0);
/// Applicable mass range of the Zeng et al. (2016) relation, Earth masses (abstract).
const ZENG_MASS_RANGE_EARTH: (f64, f64) = (1.0, 8.0);
/// Applicable core-mass-fraction range of the Zeng et al. (2016) relation (abstract).
const ZENG_CMF_RANGE: (f64, f64) = (0.0, 0.4);

impl SeagerFit {
    /// Radius in Earth radii for a mass in Earth masses (no range check).
    fn radius_earth(&self, mass_earth: f64) -> f64 {
        self.radius_earth_from_ln(mass_earth.ln())
    }

    /// The same, from the natural log of the mass in Earth masses.
    fn radius_earth_from_ln(&self, ln_mass_earth: f64) -> f64 {
        // log10 Rs = k1 + (1/3) log10 Ms - k2 Ms^k3, Ms = M/m1, R = r1 Rs; written with
        // exponentials of one natural log (the same function; the classifier calls it for
        // every sample, and `powf` and `log10` cost about twice as much).
        let ln_ms = ln_mass_earth - self.m1.ln();
        let ln10 = std::f64::consts::LN_10;
        let ln_rs = ln10 * self.k1 + ln_ms / 3.0 - ln10 * self.k2 * (self.k3 * ln_ms).exp();
        self.r1 * ln_rs.exp()
    }
}

/// Zeng et al. (2016) rocky relation, R = (1.07 - 0.21 CMF) M^(1/3.7), Earth units (no range
/// check).
fn zeng_radius_earth(mass_earth: f64, cmf: f64) -> f64 {
    zeng_radius_earth_from_ln(mass_earth.ln(), cmf)
}

fn zeng_radius_earth_from_ln(ln_mass_earth: f64, cmf: f64) -> f64 {
    (1.07 - 0.21 * cmf) * (ln_mass_earth / 3.7).exp()
}

fn in_range(value: f64, range: (f64, f64)) -> bool {
    value >= range.0 && value <= range.1
}

fn is_positive_finite(x: f64) -> bool {
    x.is_finite() && x > 0.0
}

/// A published mass–radius curve.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Curve {
    /// Pure iron (ε phase), Seager et al. (2007).
    PureIron,
    /// Pure silicate (MgSiO3 perovskite), Seager et al. (2007).
    PureSilicate,
    /// Pure water ice, Seager et al. (2007).
    PureWaterIce,
    /// Two-layer rocky planet of the given core (iron) mass fraction, Zeng et al. (2016).
    Rocky {
        /// Core mass fraction, 0–1 (fitted for 0–0.4).
        core_mass_fraction: f64,
    },
}

impl Curve {
    /// The Earth-like rocky curve, CMF 0.325 (Earth's core mass fraction, common practice).
    pub const EARTH_LIKE: Curve = Curve::Rocky {
        core_mass_fraction: 0.325,
    };

    /// Short machine-friendly name, e.g. `"pure-iron"`.
    pub fn name(&self) -> &'static str {
        match self {
            Curve::PureIron => "pure-iron",
            Curve::PureSilicate => "pure-silicate",
            Curve::PureWaterIce => "pure-water-ice",
            Curve::Rocky { .. } => "rocky-core-fraction",
        }
    }

    /// Human-readable label for a plot legend.
    pub fn label(&self) -> String {
        match self {
            Curve::PureIron => "100% iron (Fe, ε phase)".to_string(),
            Curve::PureSilicate => "100% silicate (MgSiO3 perovskite)".to_string(),
            Curve::PureWaterIce => "100% water ice".to_string(),
            Curve::Rocky { core_mass_fraction } => {
                format!("rocky, core mass fraction {core_mass_fraction:.2}")
            }
        }
    }

    /// Bibliographic source of the curve.
    pub fn source(&self) -> &'static str {
        match self {
            Curve::PureIron | Curve::PureSilicate | Curve::PureWaterIce => {
                "Seager, Kuchner, Hier-Majumder & Militzer 2007, ApJ 669, 1279 \
                 (fitted relation; coefficients from memory)"
            }
            Curve::Rocky { .. } => "Zeng, Sasselov & Jacobsen 2016, ApJ 819, 127",
        }
    }

    /// Mass range over which the curve was fitted, kg (inclusive).
    pub fn mass_range_kg(&self) -> (f64, f64) {
        let (lo, hi) = self.mass_range_earth();
        (lo * M_EARTH, hi * M_EARTH)
    }

    /// Mass range over which the curve was fitted, Earth masses (inclusive).
    pub fn mass_range_earth(&self) -> (f64, f64) {
        match self {
            Curve::PureIron | Curve::PureSilicate | Curve::PureWaterIce => SEAGER_MASS_RANGE_EARTH,
            Curve::Rocky { .. } => ZENG_MASS_RANGE_EARTH,
        }
    }

    /// Whether the curve's non-mass parameters are inside the fitted range
    /// (always true except for a rocky curve with CMF outside 0–0.4).
    pub fn parameters_in_fitted_range(&self) -> bool {
        match self {
            Curve::Rocky { core_mass_fraction } => in_range(*core_mass_fraction, ZENG_CMF_RANGE),
            _ => true,
        }
    }

    /// Whether `mass_kg` (and the curve's parameters) lie inside the fitted range.
    pub fn is_fitted_at(&self, mass_kg: f64) -> bool {
        is_positive_finite(mass_kg)
            && self.parameters_in_fitted_range()
            && in_range(mass_kg / M_EARTH, self.mass_range_earth())
    }

    /// Radius in Earth radii, or `None` if the input is not physically meaningful
    /// (mass not positive and finite, CMF outside 0–1).
    fn radius_earth_unchecked(&self, mass_earth: f64) -> Option<f64> {
        if !is_positive_finite(mass_earth) {
            return None;
        }
        let r = match self {
            Curve::PureIron => SEAGER_IRON.radius_earth(mass_earth),
            Curve::PureSilicate => SEAGER_SILICATE.radius_earth(mass_earth),
            Curve::PureWaterIce => SEAGER_WATER.radius_earth(mass_earth),
            Curve::Rocky { core_mass_fraction } => {
                if !in_range(*core_mass_fraction, (0.0, 1.0)) {
                    return None;
                }
                zeng_radius_earth(mass_earth, *core_mass_fraction)
            }
        };
        is_positive_finite(r).then_some(r)
    }
}

/// A radius read off a curve, with a flag saying whether the curve was used outside
/// its fitted range.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct CurveRadius {
    /// Radius, m.
    pub radius_m: f64,
    /// True if the mass (or the curve's CMF) lies outside the fitted range.
    pub extrapolated: bool,
}

/// Radius (m) of a planet of `mass_kg` on `curve`, or `None` if the mass (or the
/// curve's CMF) lies outside the fitted range or is not a positive finite number.
pub fn radius_of(curve: Curve, mass_kg: f64) -> Option<f64> {
    radius_of_extrapolated(curve, mass_kg)
        .filter(|point| !point.extrapolated)
        .map(|point| point.radius_m)
}

/// Radius (m) of a planet of `mass_kg` on `curve`, evaluated even outside the fitted
/// range, with `extrapolated` set in that case. `None` only for inputs where the
/// formula is meaningless: mass not positive and finite, or a CMF outside 0–1.
pub fn radius_of_extrapolated(curve: Curve, mass_kg: f64) -> Option<CurveRadius> {
    let radius_earth = curve.radius_earth_unchecked(mass_kg / M_EARTH)?;
    Some(CurveRadius {
        radius_m: radius_earth * R_EARTH,
        extrapolated: !curve.is_fitted_at(mass_kg),
    })
}

/// Radius (m) of a pure-iron planet of `mass_kg` (Seager et al. 2007), `None` outside
/// the fitted range.
pub fn iron_radius(mass_kg: f64) -> Option<f64> {
    radius_of(Curve::PureIron, mass_kg)
}

/// Mean density (kg/m^3) of a pure-iron planet of `mass_kg` (Seager et al. 2007),
/// `None` outside the fitted range. No real planet of this mass can be denser.
pub fn density_of_pure_iron_body(mass_kg: f64) -> Option<f64> {
    iron_radius(mass_kg).map(|r| mass_kg / sphere_volume(r))
}

fn sphere_volume(radius_m: f64) -> f64 {
    4.0 / 3.0 * std::f64::consts::PI * radius_m.powi(3)
}

/// Bulk-composition class of a planet, from its position in the mass–radius plane.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub enum CompositionClass {
    /// Smaller than a pure-iron planet of the same mass: physically implausible.
    DenserThanIron,
    /// Between pure iron and the iron-rich limit (CMF 0.5 by default).
    IronRich,
    /// Between the iron-rich limit and the pure-silicate rock ceiling.
    Rocky,
    /// Above the rock ceiling and below the giant mass threshold: needs water or gas.
    VolatileRich,
    /// At or above the giant mass threshold, radius up to the inflation threshold.
    GasGiant,
    /// At or above the giant mass threshold, radius above the inflation threshold.
    InflatedGiant,
}

impl CompositionClass {
    /// All classes, from densest to least dense.
    pub const ALL: [CompositionClass; 6] = [
        CompositionClass::DenserThanIron,
        CompositionClass::IronRich,
        CompositionClass::Rocky,
        CompositionClass::VolatileRich,
        CompositionClass::GasGiant,
        CompositionClass::InflatedGiant,
    ];

    /// Short machine-friendly name, e.g. `"iron-rich"`.
    pub fn name(&self) -> &'static str {
        match self {
            CompositionClass::DenserThanIron => "denser-than-iron",
            CompositionClass::IronRich => "iron-rich",
            CompositionClass::Rocky => "rocky",
            CompositionClass::VolatileRich => "volatile-rich",
            CompositionClass::GasGiant => "gas-giant",
            CompositionClass::InflatedGiant => "inflated-giant",
        }
    }

    /// One-line description suitable for a report.
    pub fn description(&self) -> &'static str {
        match self {
            CompositionClass::DenserThanIron => {
                "denser than pure iron at this mass (physically implausible)"
            }
            CompositionClass::IronRich => "iron-rich (more iron than the iron-rich limit)",
            CompositionClass::Rocky => "rocky (iron core and silicate mantle)",
            CompositionClass::VolatileRich => {
                "less dense than pure rock: needs water or a gas envelope"
            }
            CompositionClass::GasGiant => "gas giant",
            CompositionClass::InflatedGiant => "inflated gas giant (radius above cold models)",
        }
    }
}

/// The thresholds that define the composition classes. Every summary carries the
/// boundaries it was computed with.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct ClassBoundaries {
    /// Core mass fraction of the iron-rich limit (0 < x < 1). Default 0.5.
    pub iron_rich_core_fraction: f64,
    /// Minimum mass of a gas giant, kg. Default 0.1 M_J.
    pub giant_min_mass_kg: f64,
    /// Radius above which a giant counts as inflated, m. Default 1.2 R_J.
    pub inflated_min_radius_m: f64,
}

impl Default for ClassBoundaries {
    fn default() -> Self {
        ClassBoundaries {
            iron_rich_core_fraction: 0.5,
            giant_min_mass_kg: 0.1 * M_JUPITER,
            inflated_min_radius_m: 1.2 * R_JUPITER,
        }
    }
}

impl ClassBoundaries {
    /// Whether all thresholds are usable (finite, positive, CMF strictly between 0 and 1).
    pub fn is_valid(&self) -> bool {
        self.iron_rich_core_fraction.is_finite()
            && self.iron_rich_core_fraction > 0.0
            && self.iron_rich_core_fraction < 1.0
            && is_positive_finite(self.giant_min_mass_kg)
            && is_positive_finite(self.inflated_min_radius_m)
    }
}

/// The three solid-planet boundary radii at one mass (all in m).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct BoundaryRadii {
    /// Pure-iron radius (Seager et al. 2007).
    pub iron_floor_m: f64,
    /// Radius of the iron-rich limit (volume mixing of floor and ceiling).
    pub iron_rich_limit_m: f64,
    /// Pure-silicate rock ceiling (Zeng et al. 2016, CMF 0).
    pub rock_ceiling_m: f64,
    /// True if any of the curves was used outside its fitted range.
    pub extrapolated: bool,
}

/// The solid-planet boundary radii at `mass_kg`, evaluated with extrapolation where
/// needed (flagged). `None` if the mass is not positive and finite or the boundaries
/// are invalid.
pub fn boundary_radii(mass_kg: f64, boundaries: &ClassBoundaries) -> Option<BoundaryRadii> {
    let (b, limit_cubed) = boundary_parts(mass_kg, boundaries)?;
    Some(BoundaryRadii {
        iron_rich_limit_m: limit_cubed.cbrt(),
        ..b
    })
}

/// The boundaries at one mass, with the iron-rich limit left as its cube (how it is defined),
/// so that classifying a sample needs no cube root.
fn boundary_parts(mass_kg: f64, boundaries: &ClassBoundaries) -> Option<(BoundaryRadii, f64)> {
    if !boundaries.is_valid() {
        return None;
    }
    boundary_parts_unchecked(mass_kg, boundaries.iron_rich_core_fraction)
}

/// [`boundary_parts`] for boundaries already known to be valid: the pure-iron floor and the
/// CMF 0 rocky ceiling from one logarithm of the mass, as [`radius_of_extrapolated`] gives
/// them (a test checks the two agree). Called once per sample by the classifier.
fn boundary_parts_unchecked(
    mass_kg: f64,
    iron_rich_core_fraction: f64,
) -> Option<(BoundaryRadii, f64)> {
    let mass_earth = mass_kg / M_EARTH;
    if !is_positive_finite(mass_earth) {
        return None;
    }
    let ln_m = mass_earth.ln();
    let floor_m = SEAGER_IRON.radius_earth_from_ln(ln_m) * R_EARTH;
    let rock_m = zeng_radius_earth_from_ln(ln_m, 0.0) * R_EARTH;
    if !(is_positive_finite(floor_m) && is_positive_finite(rock_m)) {
        return None;
    }
    // The CMF 0 curve's parameters are inside Zeng's fitted range, so only the mass decides.
    let extrapolated = !in_range(mass_earth, SEAGER_MASS_RANGE_EARTH)
        || !in_range(mass_earth, ZENG_MASS_RANGE_EARTH);
    // Guard: keep the ceiling at or above the floor at any extrapolated mass.
    let ceiling_m = rock_m.max(floor_m);
    let x = iron_rich_core_fraction;
    let limit_cubed = x * floor_m.powi(3) + (1.0 - x) * ceiling_m.powi(3);
    Some((
        BoundaryRadii {
            iron_floor_m: floor_m,
            iron_rich_limit_m: f64::NAN,
            rock_ceiling_m: ceiling_m,
            extrapolated,
        },
        limit_cubed,
    ))
}

/// Class of a single (mass, radius) point, or `None` if either value is not positive
/// and finite or the boundaries are invalid.
pub fn classify_point(
    mass_kg: f64,
    radius_m: f64,
    boundaries: &ClassBoundaries,
) -> Option<CompositionClass> {
    classify_point_flagged(mass_kg, radius_m, boundaries).map(|(class, _)| class)
}

fn classify_point_flagged(
    mass_kg: f64,
    radius_m: f64,
    boundaries: &ClassBoundaries,
) -> Option<(CompositionClass, bool)> {
    if !(is_positive_finite(radius_m) && boundaries.is_valid()) {
        return None;
    }
    classify_valid_point(mass_kg, radius_m, boundaries)
}

/// [`classify_point_flagged`] for boundaries already known to be valid.
fn classify_valid_point(
    mass_kg: f64,
    radius_m: f64,
    boundaries: &ClassBoundaries,
) -> Option<(CompositionClass, bool)> {
    if !is_positive_finite(radius_m) {
        return None;
    }
    let (b, limit_cubed) = boundary_parts_unchecked(mass_kg, boundaries.iron_rich_core_fraction)?;
    let class = if radius_m < b.iron_floor_m {
        CompositionClass::DenserThanIron
    } else if radius_m.powi(3) < limit_cubed {
        CompositionClass::IronRich
    } else if radius_m <= b.rock_ceiling_m {
        CompositionClass::Rocky
    } else if mass_kg < boundaries.giant_min_mass_kg {
        CompositionClass::VolatileRich
    } else if radius_m <= boundaries.inflated_min_radius_m {
        CompositionClass::GasGiant
    } else {
        CompositionClass::InflatedGiant
    };
    Some((class, b.extrapolated))
}

/// Why a set of samples could not be used at all.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum SampleProblem {
    /// The mass and radius slices have different lengths, so samples cannot be paired.
    LengthMismatch {
        /// Number of mass samples.
        mass_len: usize,
        /// Number of radius samples.
        radius_len: usize,
    },
    /// The class boundaries are not usable (see [`ClassBoundaries::is_valid`]).
    InvalidBoundaries,
}

impl std::fmt::Display for SampleProblem {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            SampleProblem::LengthMismatch {
                mass_len,
                radius_len,
            } => write!(
                f,
                "{mass_len} mass samples but {radius_len} radius samples; samples must pair up"
            ),
            SampleProblem::InvalidBoundaries => write!(f, "invalid composition class boundaries"),
        }
    }
}

#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
struct ClassCounts {
    denser_than_iron: usize,
    iron_rich: usize,
    rocky: usize,
    volatile_rich: usize,
    gas_giant: usize,
    inflated_giant: usize,
}

impl ClassCounts {
    fn get(&self, class: CompositionClass) -> usize {
        match class {
            CompositionClass::DenserThanIron => self.denser_than_iron,
            CompositionClass::IronRich => self.iron_rich,
            CompositionClass::Rocky => self.rocky,
            CompositionClass::VolatileRich => self.volatile_rich,
            CompositionClass::GasGiant => self.gas_giant,
            CompositionClass::InflatedGiant => self.inflated_giant,
        }
    }

    fn add(&mut self, class: CompositionClass) {
        let slot = match class {
            CompositionClass::DenserThanIron => &mut self.denser_than_iron,
            CompositionClass::IronRich => &mut self.iron_rich,
            CompositionClass::Rocky => &mut self.rocky,
            CompositionClass::VolatileRich => &mut self.volatile_rich,
            CompositionClass::GasGiant => &mut self.gas_giant,
            CompositionClass::InflatedGiant => &mut self.inflated_giant,
        };
        *slot += 1;
    }
}

/// Result of classifying Monte Carlo samples.
#[derive(Clone, Debug, PartialEq)]
pub struct CompositionSummary {
    counts: ClassCounts,
    /// Number of (mass, radius) pairs offered (0 on a length mismatch).
    pub n_pairs: usize,
    /// Pairs used (both values positive and finite).
    pub n_valid: usize,
    /// Pairs rejected (a value non-finite or not positive).
    pub n_rejected: usize,
    /// Valid pairs whose classification used a curve outside its fitted range.
    pub n_extrapolated: usize,
    /// Set when the samples could not be used at all.
    pub problem: Option<SampleProblem>,
    /// The boundaries the classes were computed with.
    pub boundaries: ClassBoundaries,
}

impl CompositionSummary {
    fn empty(problem: Option<SampleProblem>, boundaries: ClassBoundaries) -> Self {
        CompositionSummary {
            counts: ClassCounts::default(),
            n_pairs: 0,
            n_valid: 0,
            n_rejected: 0,
            n_extrapolated: 0,
            problem,
            boundaries,
        }
    }

    /// Number of valid samples in `class`.
    pub fn count(&self, class: CompositionClass) -> usize {
        self.counts.get(class)
    }

    /// Fraction of valid samples in `class`; `None` when no sample was usable.
    pub fn probability(&self, class: CompositionClass) -> Option<f64> {
        (self.n_valid > 0).then(|| self.counts.get(class) as f64 / self.n_valid as f64)
    }

    /// Every class with its probability, densest first; empty when no sample was usable.
    pub fn probabilities(&self) -> Vec<(CompositionClass, f64)> {
        CompositionClass::ALL
            .iter()
            .filter_map(|&c| self.probability(c).map(|p| (c, p)))
            .collect()
    }

    /// The class holding the most samples (ties go to the denser class); `None` when
    /// no sample was usable.
    pub fn most_probable(&self) -> Option<CompositionClass> {
        if self.n_valid == 0 {
            return None;
        }
        CompositionClass::ALL
            .iter()
            .copied()
            .rev()
            .max_by_key(|&c| self.counts.get(c))
    }

    /// Fraction of valid samples classified with an extrapolated curve; `None` when no
    /// sample was usable.
    pub fn fraction_extrapolated(&self) -> Option<f64> {
        (self.n_valid > 0).then(|| self.n_extrapolated as f64 / self.n_valid as f64)
    }
}

/// Classifies paired Monte Carlo samples with the default [`ClassBoundaries`].
pub fn classify(mass_samples_kg: &[f64], radius_samples_m: &[f64]) -> CompositionSummary {
    classify_with(
        mass_samples_kg,
        radius_samples_m,
        &ClassBoundaries::default(),
    )
}

/// Classifies paired Monte Carlo samples with the given boundaries. Never panics: a
/// length mismatch or invalid boundaries give a summary with `problem` set and no
/// probabilities; invalid pairs are counted in `n_rejected`.
pub fn classify_with(
    mass_samples_kg: &[f64],
    radius_samples_m: &[f64],
    boundaries: &ClassBoundaries,
) -> CompositionSummary {
    if mass_samples_kg.len() != radius_samples_m.len() {
        return CompositionSummary::empty(
            Some(SampleProblem::LengthMismatch {
                mass_len: mass_samples_kg.len(),
                radius_len: radius_samples_m.len(),
            }),
            *boundaries,
        );
    }
    if !boundaries.is_valid() {
        return CompositionSummary::empty(Some(SampleProblem::InvalidBoundaries), *boundaries);
    }
    let mut summary = CompositionSummary::empty(None, *boundaries);
    for (&m, &r) in mass_samples_kg.iter().zip(radius_samples_m) {
        summary.n_pairs += 1;
        match classify_valid_point(m, r, boundaries) {
            Some((class, extrapolated)) => {
                summary.n_valid += 1;
                summary.counts.add(class);
                if extrapolated {
                    summary.n_extrapolated += 1;
                }
            }
            None => summary.n_rejected += 1,
        }
    }
    summary
}

/// Class probabilities of a planet, however they were found (counted samples, or
/// quadrature over the uncertainty distributions).
#[derive(Clone, Debug, PartialEq)]
pub struct ClassProbabilities {
    /// Every class with its probability, densest first.
    pub probabilities: Vec<(CompositionClass, f64)>,
    /// Probability that the classification used a curve outside its fitted range.
    pub extrapolated: f64,
}

impl ClassProbabilities {
    /// The probabilities of a sample summary; `None` when no sample was usable.
    pub fn from_samples(summary: &CompositionSummary) -> Option<ClassProbabilities> {
        let probabilities = summary.probabilities();
        if probabilities.is_empty() {
            return None;
        }
        Some(ClassProbabilities {
            probabilities,
            extrapolated: summary.fraction_extrapolated().unwrap_or(0.0),
        })
    }

    pub fn probability(&self, class: CompositionClass) -> f64 {
        self.probabilities
            .iter()
            .find(|(c, _)| *c == class)
            .map_or(0.0, |(_, p)| *p)
    }

    /// The most probable class (ties go to the denser class).
    pub fn most_probable(&self) -> Option<CompositionClass> {
        self.probabilities
            .iter()
            .rev()
            .max_by(|a, b| a.1.total_cmp(&b.1))
            .map(|(c, _)| *c)
    }
}

/// A measured value with a standard uncertainty below and above (SI), read as the engine
/// samples it: a split normal (two half-Gaussians joined at the value), kept positive.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SplitNormal {
    pub value: f64,
    pub below: f64,
    pub above: f64,
}

impl SplitNormal {
    fn p_below(&self) -> f64 {
        let total = self.below + self.above;
        if total > 0.0 {
            self.below / total
        } else {
            0.5
        }
    }

    /// P(X <= x) of the untruncated split normal.
    fn cdf_untruncated(&self, x: f64) -> f64 {
        let p = self.p_below();
        // Standard normal CDF from the complementary error function.
        let phi = |z: f64| 0.5 * libm::erfc(-z / std::f64::consts::SQRT_2);
        if x <= self.value {
            if self.below > 0.0 {
                2.0 * p * phi((x - self.value) / self.below)
            } else if x < self.value {
                0.0
            } else {
                p
            }
        } else if self.above > 0.0 {
            p + (1.0 - p) * (2.0 * phi((x - self.value) / self.above) - 1.0)
        } else {
            1.0
        }
    }

    /// The distribution function of X kept positive (P(X <= x | X > 0)), which is what the
    /// engine samples: draws at or below zero are drawn again. `None` if nothing is positive.
    fn positive_cdf(&self) -> Option<impl Fn(f64) -> f64 + '_> {
        let at_zero = self.cdf_untruncated(0.0);
        let kept = 1.0 - at_zero;
        (kept > 0.0).then_some(move |x: f64| {
            if x <= 0.0 {
                0.0
            } else {
                ((self.cdf_untruncated(x) - at_zero) / kept).clamp(0.0, 1.0)
            }
        })
    }

    /// Quadrature nodes (value, weight) of the distribution kept positive, weights summing
    /// to one. Each half is cut into `per_side` equal steps in z out to 6 sigma, and also at
    /// every breakpoint (zero and the values where the integrand jumps); a node sits at the
    /// middle of each piece and weighs the piece's exact probability (normal CDF
    /// differences), so the jumps are integrated exactly. Empty if nothing is positive.
    fn nodes(&self, per_side: usize, breakpoints: &[f64]) -> Vec<(f64, f64)> {
        if self.below <= 0.0 && self.above <= 0.0 {
            return if self.value > 0.0 && self.value.is_finite() {
                vec![(self.value, 1.0)]
            } else {
                Vec::new()
            };
        }
        let p = self.p_below();
        let phi = |z: f64| 0.5 * libm::erfc(-z / std::f64::consts::SQRT_2);
        let mut out = Vec::with_capacity(2 * per_side + 2 * breakpoints.len() + 2);
        for (sign, sigma, share) in [(-1.0, self.below, p), (1.0, self.above, 1.0 - p)] {
            if sigma.is_nan() || sigma <= 0.0 {
                continue;
            }
            let mut edges: Vec<f64> = (0..=per_side)
                .map(|k| 6.0 * k as f64 / per_side as f64)
                .collect();
            edges.extend(
                breakpoints
                    .iter()
                    .map(|b| sign * (b - self.value) / sigma)
                    .filter(|z| *z > 0.0 && *z < 6.0),
            );
            edges.sort_by(f64::total_cmp);
            let cdf: Vec<(f64, f64)> = edges.iter().map(|z| (*z, phi(*z))).collect();
            for pair in cdf.windows(2) {
                let [(a, pa), (b, pb)] = pair else { continue };
                let w = share * 2.0 * (pb - pa);
                let x = self.value + sign * sigma * (a + b) / 2.0;
                if x > 0.0 && x.is_finite() && w > 0.0 {
                    out.push((x, w));
                }
            }
        }
        let total: f64 = out.iter().map(|(_, w)| w).sum();
        if total > 0.0 {
            for n in &mut out {
                n.1 /= total;
            }
        }
        out
    }
}

/// Class probabilities for a planet whose mass and radius are independent split normals, by
/// quadrature over the mass (about 80 nodes, cut at every mass where a class or the
/// extrapolation flag changes) with the radius's distribution function at each
/// mass's class boundaries: deterministic, and the same classes as sampling would find (a
/// test compares with 4 x 10^5 samples). `None` when either distribution has nothing
/// positive or the boundaries are invalid.
pub fn classify_distributions(
    mass_kg: SplitNormal,
    radius_m: SplitNormal,
    boundaries: &ClassBoundaries,
) -> Option<ClassProbabilities> {
    if !boundaries.is_valid() {
        return None;
    }
    let mut p = [0.0; CompositionClass::ALL.len()];
    let mut extrapolated = 0.0;
    let mut used = 0.0;
    let mut add = |class: CompositionClass, w: f64| {
        if let Some(slot) = CompositionClass::ALL
            .iter()
            .position(|c| *c == class)
            .and_then(|i| p.get_mut(i))
        {
            *slot += w;
        }
    };
    // Where the classes or the extrapolation flag jump as the mass crosses a value.
    let breakpoints = [
        0.0,
        SEAGER_MASS_RANGE_EARTH.0 * M_EARTH,
        SEAGER_MASS_RANGE_EARTH.1 * M_EARTH,
        ZENG_MASS_RANGE_EARTH.0 * M_EARTH,
        ZENG_MASS_RANGE_EARTH.1 * M_EARTH,
        boundaries.giant_min_mass_kg,
    ];
    let radius_cdf = radius_m.positive_cdf()?;
    for (m, w) in mass_kg.nodes(40, &breakpoints) {
        let Some((b, limit_cubed)) =
            boundary_parts_unchecked(m, boundaries.iron_rich_core_fraction)
        else {
            continue;
        };
        let f = &radius_cdf;
        let (floor, limit, ceiling) = (
            f(b.iron_floor_m),
            f(limit_cubed.cbrt()),
            f(b.rock_ceiling_m),
        );
        if !(floor.is_finite() && limit.is_finite() && ceiling.is_finite()) {
            return None;
        }
        used += w;
        if b.extrapolated {
            extrapolated += w;
        }
        add(CompositionClass::DenserThanIron, w * floor);
        add(CompositionClass::IronRich, w * (limit - floor).max(0.0));
        add(CompositionClass::Rocky, w * (ceiling - limit).max(0.0));
        let beyond = (1.0 - ceiling).max(0.0);
        if m < boundaries.giant_min_mass_kg {
            add(CompositionClass::VolatileRich, w * beyond);
        } else {
            let inflated_from = f(boundaries.inflated_min_radius_m.max(b.rock_ceiling_m));
            add(
                CompositionClass::GasGiant,
                w * (inflated_from - ceiling).max(0.0),
            );
            add(
                CompositionClass::InflatedGiant,
                w * (1.0 - inflated_from).max(0.0),
            );
        }
    }
    if used.is_nan() || used <= 0.0 {
        return None;
    }
    Some(ClassProbabilities {
        probabilities: CompositionClass::ALL
            .iter()
            .zip(p)
            // Below 1e-12 is rounding left over from 1 - F near 1, not a probability.
            .map(|(c, v)| (*c, if v / used < 1e-12 { 0.0 } else { v / used }))
            .collect(),
        extrapolated: extrapolated / used,
    })
}

/// The curves a mass–radius diagram shows, densest first.
pub const PLOTTED_CURVES: [Curve; 4] = [
    Curve::PureIron,
    Curve::EARTH_LIKE,
    Curve::PureSilicate,
    Curve::PureWaterIce,
];

/// Where a planet of `mass_kg` and `radius_m` sits among the composition curves, in
/// words: the curves either side of it (or the one it lies beyond), how far it is from
/// the Earth-like rocky curve, and its class. For a hover or a report line; never panics.
pub fn describe_position(mass_kg: f64, radius_m: f64) -> String {
    if !is_positive_finite(mass_kg) || !is_positive_finite(radius_m) {
        return "no position: the mass and the radius must be positive numbers".to_string();
    }
    let me = mass_kg / M_EARTH;
    let re = radius_m / R_EARTH;
    let mut points: Vec<(Curve, f64, bool)> = PLOTTED_CURVES
        .iter()
        .filter_map(|c| {
            radius_of_extrapolated(*c, mass_kg).map(|p| (*c, p.radius_m / R_EARTH, p.extrapolated))
        })
        .collect();
    points.sort_by(|a, b| a.1.total_cmp(&b.1));
    let name = |c: &Curve| match c {
        Curve::Rocky { .. } => "Earth-like rock".to_string(),
        other => other.label(),
    };
    let below = points.iter().rev().find(|p| p.1 <= re);
    let above = points.iter().find(|p| p.1 > re);
    let place = match (below, above) {
        (Some(b), Some(a)) => format!(
            "between the {} ({:.2} R⊕) and {} ({:.2} R⊕) curves",
            name(&b.0),
            b.1,
            name(&a.0),
            a.1
        ),
        (None, Some(a)) => format!("below the {} curve ({:.2} R⊕)", name(&a.0), a.1),
        (Some(b), None) => format!("above the {} curve ({:.2} R⊕)", name(&b.0), b.1),
        (None, None) => "off every curve".to_string(),
    };
    let earth_like = points
        .iter()
        .find(|p| matches!(p.0, Curve::Rocky { .. }))
        .map(|p| {
            let pct = (re / p.1 - 1.0) * 100.0;
            format!(
                ", {:.0}% {} than Earth-like rock",
                pct.abs(),
                if pct >= 0.0 { "larger" } else { "smaller" }
            )
        })
        .unwrap_or_default();
    let extrapolated = if points.iter().any(|p| p.2) {
        " (curves extrapolated beyond their fitted masses)"
    } else {
        ""
    };
    let class = classify_point(mass_kg, radius_m, &ClassBoundaries::default())
        .map(|c| format!("; {}", c.description()))
        .unwrap_or_default();
    format!(
        "{} R⊕ at {} M⊕: {place}{earth_like}{extrapolated}{class}",
        crate::format::number((re * 100.0).round() / 100.0),
        crate::format::number((me * 100.0).round() / 100.0)
    )
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::solar_system::{by_name, PLANETS};

    #[test]
    fn quadrature_classes_match_many_samples() {
        // Reference: the sample classifier over 4 x 10^5 draws of the same split normals,
        // drawn as the engine draws them (derive::value::draw, kept positive).
        use crate::derive::value::draw;
        use crate::model::{Form, Measurement};
        let me = |x: f64| x * M_EARTH;
        let re = |x: f64| x * R_EARTH;
        let cases = [
            // (mass, below, above, radius, below, above), SI
            (me(5.0), me(0.8), me(0.8), re(1.6), re(0.1), re(0.1)), // rocky / iron-rich edge
            (me(3.0), me(1.5), me(2.5), re(1.9), re(0.2), re(0.4)), // spans three classes
            (me(0.5), me(0.4), me(0.4), re(0.9), re(0.3), re(0.2)), // truncated near zero
            (me(12.0), me(0.6), me(0.6), re(1.1), re(0.03), re(0.03)), // denser than iron
            (
                me(300.0),
                me(30.0),
                me(30.0),
                1.25 * R_JUPITER,
                re(0.8),
                re(0.8),
            ), // inflated edge
            (me(30.0), me(4.0), me(6.0), re(4.0), re(0.5), re(0.5)), // volatile / giant mass edge
        ];
        let b = ClassBoundaries::default();
        for (i, (m, ml, mh, r, rl, rh)) in cases.into_iter().enumerate() {
            let split = |v, lo, hi| Measurement {
                value: v,
                below: lo,
                above: hi,
                form: Form::Asymmetric,
            };
            let n = 400_000;
            let ms = draw(&split(m, ml, mh), 0.0, f64::INFINITY, n, 11 + i as u64);
            let rs = draw(&split(r, rl, rh), 0.0, f64::INFINITY, n, 97 + i as u64);
            let sampled = classify_with(&ms, &rs, &b);
            let quad = classify_distributions(
                SplitNormal {
                    value: m,
                    below: ml,
                    above: mh,
                },
                SplitNormal {
                    value: r,
                    below: rl,
                    above: rh,
                },
                &b,
            )
            .unwrap();
            let total: f64 = quad.probabilities.iter().map(|p| p.1).sum();
            assert!((total - 1.0).abs() < 1e-9, "case {i}: sums to {total}");
            for (class, p) in &quad.probabilities {
                let s = sampled.probability(*class).unwrap();
                // 4e5 samples: binomial sigma at most 8e-4 (3e-3 is about 4 sigma); the quadrature
                // error is far smaller.
                assert!(
                    (p - s).abs() < 3e-3,
                    "case {i} {class:?}: quadrature {p}, samples {s}"
                );
            }
            let se = sampled.fraction_extrapolated().unwrap();
            assert!(
                (quad.extrapolated - se).abs() < 3e-3,
                "case {i}: {} vs {se}",
                quad.extrapolated
            );
            assert_eq!(quad.most_probable(), sampled.most_probable(), "case {i}");
        }
    }

    #[test]
    fn quadrature_handles_exact_and_impossible_inputs() {
        let b = ClassBoundaries::default();
        let exact = |v| SplitNormal {
            value: v,
            below: 0.0,
            above: 0.0,
        };
        // An exact Earth sits on the rocky side of the boundaries (fact sheet, from memory).
        let earth = classify_distributions(exact(M_EARTH), exact(R_EARTH), &b).unwrap();
        assert_eq!(earth.most_probable(), Some(CompositionClass::Rocky));
        assert!((earth.probability(CompositionClass::Rocky) - 1.0).abs() < 1e-12);
        // Nothing positive: no answer rather than NaN.
        assert!(classify_distributions(exact(-1.0), exact(R_EARTH), &b).is_none());
        assert!(classify_distributions(exact(M_EARTH), exact(-1.0), &b).is_none());
    }

    #[test]
    fn per_sample_boundaries_match_the_curves() {
        // The classifier's one-logarithm path must give the curves' own radii and flags.
        let mut m = 1e-4;
        while m < 1e4 {
            let kg = m * M_EARTH;
            let (b, _) = boundary_parts_unchecked(kg, 0.5).unwrap();
            let iron = radius_of_extrapolated(Curve::PureIron, kg).unwrap();
            let rock = radius_of_extrapolated(
                Curve::Rocky {
                    core_mass_fraction: 0.0,
                },
                kg,
            )
            .unwrap();
            assert!((b.iron_floor_m / iron.radius_m - 1.0).abs() < 1e-13, "{m}");
            assert!((b.rock_ceiling_m / rock.radius_m.max(iron.radius_m) - 1.0).abs() < 1e-13);
            assert_eq!(
                b.extrapolated,
                iron.extrapolated || rock.extrapolated,
                "{m}"
            );
            m *= 1.37;
        }
        assert!(boundary_parts_unchecked(0.0, 0.5).is_none());
        assert!(boundary_parts_unchecked(f64::NAN, 0.5).is_none());
    }

    #[test]
    fn positions_in_words() {
        // Earth (fact sheet, from memory) sits on the Earth-like curve, between pure iron
        // and pure silicate.
        let earth = by_name("Earth").unwrap();
        let d = describe_position(earth.mass_kg, earth.mean_radius_m);
        assert!(d.contains("rocky"), "{d}");
        assert!(
            d.contains("% smaller than Earth-like rock")
                || d.contains("% larger than Earth-like rock"),
            "{d}"
        );
        // Neptune is far above the water-ice curve and needs volatiles.
        let neptune = by_name("Neptune").unwrap();
        let d = describe_position(neptune.mass_kg, neptune.mean_radius_m);
        assert!(d.contains("above the 100% water ice curve"), "{d}");
        assert!(d.contains("water or a gas envelope"), "{d}");
        // A very dense point lies below the iron curve.
        let d = describe_position(5.0 * M_EARTH, 1.0 * R_EARTH);
        assert!(d.starts_with("1 R⊕ at 5 M⊕: below the 100% iron"), "{d}");
        assert!(describe_position(-1.0, 1.0).starts_with("no position"));
    }

    fn rel_diff(a: f64, b: f64) -> f64 {
        ((a - b) / b).abs()
    }

    fn me(x: f64) -> f64 {
        x * M_EARTH
    }

    fn re(x: f64) -> f64 {
        x * R_EARTH
    }

    /// Normal scatter around `mean`, from a seeded ChaCha8 generator (the engine's own).
    fn gaussian_samples(seed: u64, n: usize, mean: f64, rel_sigma: f64) -> Vec<f64> {
        use rand::{Rng, SeedableRng};
        let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(seed);
        (0..n)
            .map(|_| mean * (1.0 + rel_sigma * rng.sample::<f64, _>(rand_distr::StandardNormal)))
            .collect()
    }

    #[test]
    fn zeng_earth_like_gives_one_earth_radius() {
        // Zeng et al. 2016: CMF 0.325 at 1 M_earth gives (1.07 - 0.21*0.325) = 1.0018 R_earth.
        let r = radius_of(Curve::EARTH_LIKE, M_EARTH).expect("inside fitted range");
        assert!(rel_diff(r, R_EARTH) < 0.01, "{}", r / R_EARTH);
        // And Earth's fact-sheet mean radius is within 1% of it.
        let earth = by_name("Earth").expect("Earth");
        assert!(rel_diff(r, earth.mean_radius_m) < 0.01);
    }

    #[test]
    fn zeng_relation_coefficients() {
        // Pure-mantle planet, 1 M_earth: 1.07 R_earth; 8 M_earth: 1.07 * 8^(1/3.7).
        let r1 = radius_of(
            Curve::Rocky {
                core_mass_fraction: 0.0,
            },
            M_EARTH,
        )
        .expect("in range");
        assert!(rel_diff(r1, re(1.07)) < 1e-12);
        let r8 = radius_of(
            Curve::Rocky {
                core_mass_fraction: 0.4,
            },
            me(8.0),
        )
        .expect("in range");
        assert!(rel_diff(r8, re((1.07 - 0.084) * 8f64.powf(1.0 / 3.7))) < 1e-12);
    }

    #[test]
    fn seager_fits_tend_to_zero_pressure_densities() {
        // At small mass the Seager fit reduces to constant density. Zero-pressure
        // densities from the same paper's equation-of-state table (from memory):
        // Fe(epsilon) 8.30 g/cm^3, MgSiO3 perovskite 4.10 g/cm^3, H2O ice 1.46 g/cm^3.
        for (curve, rho0) in [
            (Curve::PureIron, 8300.0),
            (Curve::PureSilicate, 4100.0),
            (Curve::PureWaterIce, 1460.0),
        ] {
            let m = me(1e-4);
            let point = radius_of_extrapolated(curve, m).expect("valid mass");
            assert!(point.extrapolated);
            let rho = m / sphere_volume(point.radius_m);
            assert!(
                rel_diff(rho, rho0) < 0.03,
                "{}: {rho:.0} vs {rho0}",
                curve.name()
            );
        }
    }

    #[test]
    fn iron_curve_values() {
        // Direct evaluation of the Seager et al. 2007 iron fit: at M = m1 = 5.80 M_earth
        // the radius is r1 * 10^(k1 - k2) = 2.52 * 10^(-0.28989) R_earth = 1.2925 R_earth.
        let r = iron_radius(me(5.80)).expect("in range");
        assert!(rel_diff(r, re(1.2925)) < 1e-3, "{}", r / R_EARTH);
        // 1 M_earth pure iron: ~0.79 R_earth (the fit evaluated; cross-checked below
        // against the Earth-like curve, which must be larger).
        let r1 = iron_radius(M_EARTH).expect("in range");
        assert!(r1 > re(0.75) && r1 < re(0.83), "{}", r1 / R_EARTH);
        let earth_like = radius_of(Curve::EARTH_LIKE, M_EARTH).expect("in range");
        assert!(r1 < earth_like);
        // Density of a 1 M_earth iron planet exceeds Earth's (5513 kg/m^3, fact sheet).
        let rho = density_of_pure_iron_body(M_EARTH).expect("in range");
        assert!(rho > 1.5 * 5513.0 && rho < 2.5 * 5513.0, "{rho}");
    }

    #[test]
    fn curves_are_ordered_iron_silicate_water() {
        for m in [0.1, 1.0, 5.0, 10.0, 20.0] {
            let fe = radius_of(Curve::PureIron, me(m)).expect("in range");
            let si = radius_of(Curve::PureSilicate, me(m)).expect("in range");
            let h2o = radius_of(Curve::PureWaterIce, me(m)).expect("in range");
            assert!(fe < si && si < h2o, "at {m} M_earth: {fe} {si} {h2o}");
        }
    }

    #[test]
    fn mixing_rule_reproduces_zeng_cmf_dependence() {
        // Volume mixing of the Seager iron curve and Zeng's CMF 0 curve against Zeng's
        // own formula, inside Zeng's fitted mass range.
        for m in [1.0, 2.0, 4.0, 8.0] {
            for cmf in [0.2, 0.325, 0.4] {
                let b = boundary_radii(
                    me(m),
                    &ClassBoundaries {
                        iron_rich_core_fraction: cmf,
                        ..ClassBoundaries::default()
                    },
                )
                .expect("valid");
                let zeng = radius_of(
                    Curve::Rocky {
                        core_mass_fraction: cmf,
                    },
                    me(m),
                )
                .expect("in range");
                assert!(
                    rel_diff(b.iron_rich_limit_m, zeng) < 0.02,
                    "M={m} CMF={cmf}: {} vs {}",
                    b.iron_rich_limit_m / R_EARTH,
                    zeng / R_EARTH
                );
            }
        }
    }

    #[test]
    fn fitted_range_and_extrapolation_flag() {
        assert!(iron_radius(me(0.005)).is_none());
        assert!(iron_radius(me(25.0)).is_none());
        assert!(iron_radius(me(20.0)).is_some());
        let beyond = radius_of_extrapolated(Curve::PureIron, me(25.0)).expect("meaningful");
        assert!(beyond.extrapolated);
        let inside = radius_of_extrapolated(Curve::PureIron, me(10.0)).expect("meaningful");
        assert!(!inside.extrapolated);
        // Zeng: mass range 1-8, CMF range 0-0.4.
        assert!(radius_of(Curve::EARTH_LIKE, me(0.5)).is_none());
        assert!(radius_of(Curve::EARTH_LIKE, me(9.0)).is_none());
        let high_cmf = Curve::Rocky {
            core_mass_fraction: 0.6,
        };
        assert!(radius_of(high_cmf, M_EARTH).is_none());
        assert!(radius_of_extrapolated(high_cmf, M_EARTH).is_some_and(|p| p.extrapolated));
        let bad_cmf = Curve::Rocky {
            core_mass_fraction: 1.5,
        };
        assert!(radius_of_extrapolated(bad_cmf, M_EARTH).is_none());
        for bad in [0.0, -1.0, f64::NAN, f64::INFINITY] {
            assert!(radius_of_extrapolated(Curve::PureIron, bad).is_none());
            assert!(density_of_pure_iron_body(bad).is_none());
        }
    }

    #[test]
    fn curve_metadata() {
        for curve in [
            Curve::PureIron,
            Curve::PureSilicate,
            Curve::PureWaterIce,
            Curve::EARTH_LIKE,
        ] {
            assert!(!curve.name().is_empty());
            assert!(!curve.label().is_empty());
            assert!(curve.source().contains("ApJ"));
            let (lo, hi) = curve.mass_range_kg();
            assert!(lo > 0.0 && lo < hi);
        }
        assert!(Curve::PureIron.source().contains("Seager"));
        assert!(Curve::EARTH_LIKE.source().contains("Zeng"));
        assert_eq!(Curve::EARTH_LIKE.label(), "rocky, core mass fraction 0.33");
    }

    fn expected_class(name: &str) -> CompositionClass {
        match name {
            "Mercury" => CompositionClass::IronRich,
            "Venus" | "Earth" | "Mars" => CompositionClass::Rocky,
            "Uranus" | "Neptune" => CompositionClass::VolatileRich,
            "Jupiter" | "Saturn" => CompositionClass::GasGiant,
            other => panic!("unexpected body {other}"),
        }
    }

    #[test]
    fn solar_system_planets_classify_as_known_point_samples() {
        // Fact-sheet masses and mean radii (NASA GSFC planetary fact sheet, from memory).
        for planet in PLANETS {
            let s = classify(&[planet.mass_kg], &[planet.mean_radius_m]);
            assert_eq!(s.n_valid, 1);
            assert_eq!(
                s.most_probable(),
                Some(expected_class(planet.name)),
                "{}: {:?}",
                planet.name,
                s.probabilities()
            );
            assert_eq!(s.probability(CompositionClass::DenserThanIron), Some(0.0));
        }
    }

    #[test]
    fn solar_system_planets_classify_as_known_with_spreads() {
        // 2% mass and 1% radius scatter around the fact-sheet values.
        for (i, planet) in PLANETS.iter().enumerate() {
            let seed = 1000 + i as u64;
            let masses = gaussian_samples(seed, 2000, planet.mass_kg, 0.02);
            let radii = gaussian_samples(seed + 77, 2000, planet.mean_radius_m, 0.01);
            let s = classify(&masses, &radii);
            assert_eq!(s.n_valid, 2000);
            let p = s
                .probability(expected_class(planet.name))
                .expect("samples present");
            assert!(p > 0.95, "{}: {:?}", planet.name, s.probabilities());
            assert_eq!(s.probability(CompositionClass::DenserThanIron), Some(0.0));
            let total: f64 = s.probabilities().iter().map(|(_, p)| p).sum();
            assert!((total - 1.0).abs() < 1e-12);
        }
    }

    #[test]
    fn solar_system_margins_from_boundaries() {
        // The classifications above are not knife-edge: every rocky/iron-rich planet sits
        // at least 3% in radius from the nearest boundary.
        for name in ["Mercury", "Venus", "Earth", "Mars"] {
            let p = by_name(name).expect("planet");
            let b = boundary_radii(p.mass_kg, &ClassBoundaries::default()).expect("valid");
            let r = p.mean_radius_m;
            let nearest = [b.iron_floor_m, b.iron_rich_limit_m, b.rock_ceiling_m]
                .iter()
                .map(|edge| rel_diff(r, *edge))
                .fold(f64::INFINITY, f64::min);
            assert!(nearest > 0.03, "{name}: nearest boundary {nearest:.3}");
        }
    }

    #[test]
    fn denser_than_iron_and_inflated_and_volatile() {
        // 5 M_earth at 1.0 R_earth is smaller than pure iron (~1.25 R_earth).
        assert_eq!(
            classify_point(me(5.0), re(1.0), &ClassBoundaries::default()),
            Some(CompositionClass::DenserThanIron)
        );
        let masses = [me(5.0), me(5.0), me(5.0), me(5.0)];
        let radii = [re(1.0), re(1.1), re(1.5), re(3.0)];
        let p = classify(&masses, &radii)
            .probability(CompositionClass::DenserThanIron)
            .expect("valid pairs");
        assert!((p - 0.5).abs() < 1e-12, "{p}");
        // 1 M_J at 1.6 R_J: inflated; at 1.0 R_J: gas giant.
        let b = ClassBoundaries::default();
        assert_eq!(
            classify_point(M_JUPITER, 1.6 * R_JUPITER, &b),
            Some(CompositionClass::InflatedGiant)
        );
        assert_eq!(
            classify_point(M_JUPITER, R_JUPITER, &b),
            Some(CompositionClass::GasGiant)
        );
        // 5 M_earth at 2.5 R_earth: needs volatiles.
        assert_eq!(
            classify_point(me(5.0), re(2.5), &b),
            Some(CompositionClass::VolatileRich)
        );
    }

    #[test]
    fn boundaries_are_reported_and_adjustable() {
        let custom = ClassBoundaries {
            inflated_min_radius_m: 1.5 * R_JUPITER,
            ..ClassBoundaries::default()
        };
        let s = classify_with(&[M_JUPITER], &[1.3 * R_JUPITER], &custom);
        assert_eq!(s.boundaries, custom);
        assert_eq!(s.most_probable(), Some(CompositionClass::GasGiant));
        let s = classify(&[M_JUPITER], &[1.3 * R_JUPITER]);
        assert_eq!(s.most_probable(), Some(CompositionClass::InflatedGiant));
        let bad = ClassBoundaries {
            iron_rich_core_fraction: 1.0,
            ..ClassBoundaries::default()
        };
        let s = classify_with(&[M_EARTH], &[R_EARTH], &bad);
        assert_eq!(s.problem, Some(SampleProblem::InvalidBoundaries));
        assert_eq!(s.probability(CompositionClass::Rocky), None);
    }

    #[test]
    fn extrapolated_fraction_is_reported() {
        let s = classify(&[me(0.5), me(2.0), me(2.0), me(50.0)], &[re(0.8); 4]);
        assert_eq!(s.n_extrapolated, 2);
        assert_eq!(s.fraction_extrapolated(), Some(0.5));
    }

    #[test]
    fn empty_input_gives_no_probabilities() {
        let s = classify(&[], &[]);
        assert_eq!(s.n_pairs, 0);
        assert_eq!(s.n_valid, 0);
        assert_eq!(s.problem, None);
        assert!(s.probabilities().is_empty());
        assert_eq!(s.most_probable(), None);
        assert_eq!(s.fraction_extrapolated(), None);
        assert_eq!(s.probability(CompositionClass::DenserThanIron), None);
    }

    #[test]
    fn invalid_samples_are_rejected_not_counted() {
        let masses = [M_EARTH, f64::NAN, M_EARTH, -M_EARTH, M_EARTH, 0.0];
        let radii = [R_EARTH, R_EARTH, f64::NAN, R_EARTH, f64::INFINITY, R_EARTH];
        let s = classify(&masses, &radii);
        assert_eq!(s.n_pairs, 6);
        assert_eq!(s.n_valid, 1);
        assert_eq!(s.n_rejected, 5);
        assert_eq!(s.probability(CompositionClass::Rocky), Some(1.0));
        let all_nan = classify(&[f64::NAN], &[f64::NAN]);
        assert_eq!(all_nan.n_rejected, 1);
        assert_eq!(all_nan.probability(CompositionClass::Rocky), None);
        assert_eq!(
            classify(&[f64::NAN], &[R_EARTH]).probability(CompositionClass::DenserThanIron),
            None
        );
    }

    #[test]
    fn mismatched_lengths_are_an_input_problem() {
        let s = classify(&[M_EARTH, M_EARTH], &[R_EARTH]);
        assert_eq!(
            s.problem,
            Some(SampleProblem::LengthMismatch {
                mass_len: 2,
                radius_len: 1
            })
        );
        assert_eq!(s.n_valid, 0);
        assert!(s.probabilities().is_empty());
        assert_eq!(
            classify(&[M_EARTH], &[]).probability(CompositionClass::DenserThanIron),
            None
        );
        assert!(s
            .problem
            .is_some_and(|p| p.to_string().contains("must pair up")));
    }
}
