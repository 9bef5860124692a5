//! What an observer plans with: a star's distance and luminosity from photometry and
//! astrometry, the transmission and emission spectroscopy metrics of a planet, its
//! atmospheric scale height, the habitable zone of its star, and masses (or radii) predicted
//! from a published mass–radius relation.
//!
//! Sources, each beside its numbers:
//!
//! * IAU 2015 Resolution B2 for the bolometric magnitude zero points
//!   ([`crate::constants::L_BOL_ZERO`], [`crate::constants::F_BOL_ZERO`]).
//! * Kempton et al. (2018, PASP 130, 114001), eqs. 1–4 and Table 1, for the transmission and
//!   emission spectroscopy metrics. The paper was not found in a stored copy: the equations,
//!   the scale factors (0.190, 1.26, 1.28, 1.15), the ESM constant 4.29e6, the day-side factor
//!   1.10 and the 7.5 µm wavelength are from memory.
//! * Kopparapu et al. (2014, ApJL 787, L29), Table 1, for the habitable-zone fits
//!   `S_eff = S_eff,sun + a T + b T^2 + c T^3 + d T^4`, `T = Teff - 5780 K`, valid for
//!   2600–7200 K (the range: the paper's abstract, verified in the VizieR description of its
//!   catalogue J/ApJ/787/L29). The coefficients are from memory; they agree digit for digit
//!   with several independent public copies of the authors' coefficient file (not the
//!   paper itself, so not a verification).
//! * Chen & Kipping (2017, ApJ 834, 17) for the mean mass–radius relation
//!   `R = C M^S` in Earth units, continuous at the transitions 2.04 Mearth (Terran to
//!   Neptunian) and 0.414 Mjup (Neptunian to Jovian), up to 0.080 Msun; the Terran
//!   normalisation 1.008, the exponents 0.279, 0.589, -0.044 and the intrinsic scatters
//!   0.0403, 0.146, 0.0738 are from memory (the 2.0 Mearth transition is in the abstract,
//!   verified). The scatters are taken as standard deviations of log10 R about the relation,
//!   the paper's model being linear in logarithms; read as fractions of R they would be
//!   2.3 times narrower, so this reading errs on the wide side.

use super::domain::{finite, finite_f64, is_positive};
use crate::constants::{
    ATOMIC_MASS, AU, C, F_BOL_ZERO, H, K_B, L_BOL_ZERO, L_SUN, M_EARTH, M_JUPITER, M_SUN,
};
use std::f64::consts::PI;
use uom::si::f64::{
    Acceleration, Angle, HeatFluxDensity, Length, Mass, Power, ThermodynamicTemperature,
};
use uom::si::heat_flux_density::watt_per_square_meter;
use uom::si::length::meter;
use uom::si::mass::kilogram;
use uom::si::power::watt;
use uom::si::thermodynamic_temperature::kelvin;

/// Luminosity of a star of absolute bolometric magnitude `m_bol`,
/// `L = L0 10^(-0.4 M_bol)` (IAU 2015 Resolution B2).
pub fn luminosity_from_absolute_bolometric_magnitude(m_bol: f64) -> Option<Power> {
    let l = L_BOL_ZERO * 10f64.powf(-0.4 * m_bol);
    (l.is_finite() && l > 0.0).then(|| Power::new::<watt>(l))
}

/// Bolometric irradiance of a source of apparent bolometric magnitude `m_bol`,
/// `f = f0 10^(-0.4 m_bol)` (IAU 2015 Resolution B2).
pub fn bolometric_flux_from_magnitude(m_bol: f64) -> Option<HeatFluxDensity> {
    let f = F_BOL_ZERO * 10f64.powf(-0.4 * m_bol);
    (f.is_finite() && f > 0.0).then(|| HeatFluxDensity::new::<watt_per_square_meter>(f))
}

/// Luminosity of an isotropic source whose bolometric irradiance at distance `d` is `f`,
/// `L = 4 pi d^2 f` (no extinction).
pub fn luminosity_from_flux(f: HeatFluxDensity, d: Length) -> Option<Power> {
    if !(is_positive(&f) && is_positive(&d)) {
        return None;
    }
    finite(4.0 * PI * d * d * f)
}

/// Distance from a trigonometric parallax, `d = 1 au / tan p` (the parsec's definition, IAU
/// 2015 Resolution B2). `None` for a parallax that is not in `(0, 90 deg)`.
pub fn distance_from_parallax(p: Angle) -> Option<Length> {
    let t = p.value.tan();
    if !(p.value.is_finite() && p.value > 0.0 && p.value < PI / 2.0 && t > 0.0) {
        return None;
    }
    finite(Length::new::<meter>(AU / t))
}

/// Atmospheric scale height `H = k_B T / (mu m_u g)` of an isothermal atmosphere of mean
/// molecular weight `mu` (in atomic mass units) at temperature `t` under gravity `g`.
pub fn scale_height(t: ThermodynamicTemperature, mu: f64, g: Acceleration) -> Option<Length> {
    if !(is_positive(&t) && is_positive(&g) && mu.is_finite() && mu > 0.0) {
        return None;
    }
    let h = K_B * t.get::<kelvin>() / (mu * ATOMIC_MASS * g.value);
    finite(Length::new::<meter>(h))
}

/// Equilibrium temperature for zero albedo and full day–night heat redistribution,
/// `Teq = Teff sqrt(R*/a) (1/4)^(1/4)`, as both metrics of Kempton et al. (2018) use it.
fn teq_full_redistribution(teff: f64, a_over_rstar: f64) -> Option<f64> {
    if !(teff.is_finite() && teff > 0.0 && a_over_rstar.is_finite() && a_over_rstar > 1.0) {
        return None;
    }
    finite_f64(teff * (1.0 / a_over_rstar).sqrt() * 0.25f64.powf(0.25))
}

/// The scale factor of the transmission spectroscopy metric for a planet of `radius_earth`
/// Earth radii (Kempton et al. 2018, Table 1, from memory): it normalises the metric to
/// simulated signal-to-noise in each radius bin. The paper's last bin ends at 10 Rearth; its
/// factor is used above that too.
pub fn tsm_scale_factor(radius_earth: f64) -> f64 {
    if radius_earth < 1.5 {
        0.190
    } else if radius_earth < 2.75 {
        1.26
    } else if radius_earth < 4.0 {
        1.28
    } else {
        1.15
    }
}

/// Transmission spectroscopy metric (Kempton et al. 2018, eq. 1):
/// `TSM = s Rp^3 Teq / (Mp R*^2) 10^(-mJ/5)`, with `Rp` in Earth radii, `Mp` in Earth masses,
/// `R*` in solar radii, `Teq` in K for zero albedo and full redistribution, `mJ` the star's
/// apparent J magnitude, `s` the scale factor of the planet's radius bin.
pub fn transmission_metric(
    radius: Length,
    mass: Mass,
    star_radius: Length,
    teff: ThermodynamicTemperature,
    a_over_rstar: f64,
    magnitude_j: f64,
) -> Option<f64> {
    if !(is_positive(&radius) && is_positive(&mass) && is_positive(&star_radius)) {
        return None;
    }
    let rp = radius.get::<meter>() / crate::constants::R_EARTH;
    let mp = mass.get::<kilogram>() / M_EARTH;
    let rs = star_radius.get::<meter>() / crate::constants::R_SUN;
    let teq = teq_full_redistribution(teff.get::<kelvin>(), a_over_rstar)?;
    if !magnitude_j.is_finite() {
        return None;
    }
    finite_f64(
        tsm_scale_factor(rp) * rp.powi(3) * teq / (mp * rs * rs) * 10f64.powf(-magnitude_j / 5.0),
    )
}

/// Wavelength of the emission spectroscopy metric, 7.5 µm (Kempton et al. 2018).
const ESM_WAVELENGTH: f64 = 7.5e-6;

/// The Planck function's ratio `B_lambda(t1) / B_lambda(t2)` at `wavelength` (m):
/// `(exp(hc/lambda k t2) - 1) / (exp(hc/lambda k t1) - 1)`.
pub fn planck_ratio(wavelength: f64, t1: f64, t2: f64) -> Option<f64> {
    if !(wavelength > 0.0 && t1 > 0.0 && t2 > 0.0) {
        return None;
    }
    let x = |t: f64| H * C / (wavelength * K_B * t);
    finite_f64(x(t2).exp_m1() / x(t1).exp_m1())
}

/// Emission spectroscopy metric (Kempton et al. 2018, eq. 4):
/// `ESM = 4.29e6 B_7.5(Tday) / B_7.5(Teff) (Rp/R*)^2 10^(-mK/5)`, `Tday = 1.10 Teq` with `Teq`
/// for zero albedo and full redistribution, `mK` the star's apparent Ks magnitude, both
/// Planck functions at 7.5 µm.
pub fn emission_metric(
    radius_ratio: f64,
    teff: ThermodynamicTemperature,
    a_over_rstar: f64,
    magnitude_k: f64,
) -> Option<f64> {
    let t = teff.get::<kelvin>();
    let teq = teq_full_redistribution(t, a_over_rstar)?;
    if !(radius_ratio.is_finite() && radius_ratio > 0.0 && magnitude_k.is_finite()) {
        return None;
    }
    let ratio = planck_ratio(ESM_WAVELENGTH, 1.10 * teq, t)?;
    finite_f64(4.29e6 * ratio * radius_ratio * radius_ratio * 10f64.powf(-magnitude_k / 5.0))
}

/// The four habitable-zone limits of Kopparapu et al. (2014), for a planet of one Earth mass.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum HabitableEdge {
    /// Conservative inner edge: runaway greenhouse.
    RunawayGreenhouse,
    /// Conservative outer edge: maximum greenhouse.
    MaximumGreenhouse,
    /// Optimistic inner edge: the flux Venus received about 1 Gyr ago.
    RecentVenus,
    /// Optimistic outer edge: the flux Mars received about 3.8 Gyr ago.
    EarlyMars,
}

/// Range of effective temperatures the fits cover, K (Kopparapu et al. 2014, abstract).
pub const HABITABLE_TEFF_RANGE: (f64, f64) = (2600.0, 7200.0);

impl HabitableEdge {
    /// `(S_eff,sun, a, b, c, d)` of the fit (Kopparapu et al. 2014, Table 1, 1 Mearth; from
    /// memory, see the module documentation).
    fn coefficients(self) -> [f64; 5] {
        match self {
            HabitableEdge::RecentVenus => [1.776, 2.136e-4, 2.533e-8, -1.332e-11, -3.097e-15],
            HabitableEdge::RunawayGreenhouse => [1.107, 1.332e-4, 1.580e-8, -8.308e-12, -1.931e-15],
            HabitableEdge::MaximumGreenhouse => [0.356, 6.171e-5, 1.698e-9, -3.198e-12, -5.575e-16],
            HabitableEdge::EarlyMars => [0.320, 5.547e-5, 1.526e-9, -2.874e-12, -5.011e-16],
        }
    }
}

/// The effective stellar flux at a habitable-zone limit, in units of the flux Earth receives
/// (Kopparapu et al. 2014). `None` outside 2600–7200 K, where the fits do not hold.
pub fn habitable_flux(edge: HabitableEdge, teff: ThermodynamicTemperature) -> Option<f64> {
    let t = teff.get::<kelvin>();
    if !(HABITABLE_TEFF_RANGE.0..=HABITABLE_TEFF_RANGE.1).contains(&t) {
        return None;
    }
    let [s, a, b, c, d] = edge.coefficients();
    let x = t - 5780.0;
    let seff = s + x * (a + x * (b + x * (c + x * d)));
    (seff.is_finite() && seff > 0.0).then_some(seff)
}

/// Distance of a habitable-zone limit of effective flux `seff` (Earth units) around a star of
/// luminosity `l`: `d = sqrt((L / Lsun) / S_eff)` au (Kopparapu et al. 2013, eq. 3).
pub fn habitable_distance(l: Power, seff: f64) -> Option<Length> {
    if !(is_positive(&l) && seff.is_finite() && seff > 0.0) {
        return None;
    }
    finite(Length::new::<meter>(
        AU * (l.get::<watt>() / L_SUN / seff).sqrt(),
    ))
}

/// One branch of the mean mass–radius relation of Chen & Kipping (2017): `R = c M^s` in Earth
/// units for masses in `[from, to)` Earth masses, with scatter `sigma` in log10 R.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Branch {
    pub name: &'static str,
    pub from: f64,
    pub to: f64,
    pub c: f64,
    pub s: f64,
    pub sigma: f64,
}

/// The planetary branches (Terran, Neptunian, Jovian), each normalisation fixed by
/// continuity with the branch below (the paper's relation is continuous).
pub fn mass_radius_branches() -> [Branch; 3] {
    let t1: f64 = 2.04;
    let t2 = 0.414 * M_JUPITER / M_EARTH;
    let t3 = 0.080 * M_SUN / M_EARTH;
    let (c1, s1, s2, s3): (f64, f64, f64, f64) = (1.008, 0.279, 0.589, -0.044);
    let c2 = c1 * t1.powf(s1 - s2);
    let c3 = c2 * t2.powf(s2 - s3);
    [
        Branch {
            name: "Terran",
            from: 0.0,
            to: t1,
            c: c1,
            s: s1,
            sigma: 0.0403,
        },
        Branch {
            name: "Neptunian",
            from: t1,
            to: t2,
            c: c2,
            s: s2,
            sigma: 0.146,
        },
        Branch {
            name: "Jovian",
            from: t2,
            to: t3,
            c: c3,
            s: s3,
            sigma: 0.0738,
        },
    ]
}

/// Radius predicted for a planet of `mass_earth` Earth masses, in Earth radii, with the
/// branch's scatter in log10 R. `None` above 0.080 Msun (a star, not a planet).
pub fn predicted_radius_earth(mass_earth: f64) -> Option<(f64, Branch)> {
    if !(mass_earth.is_finite() && mass_earth > 0.0) {
        return None;
    }
    let b = mass_radius_branches()
        .into_iter()
        .find(|b| mass_earth >= b.from && mass_earth < b.to)?;
    finite_f64(b.c * mass_earth.powf(b.s)).map(|r| (r, b))
}

/// The largest radius the relation maps to a single mass, Earth radii: the Jovian branch is
/// flat (its radii, about 11.3 to 14.3 Rearth, also occur on the Neptunian branch), so above
/// its smallest radius a radius does not tell a mass.
pub fn largest_invertible_radius_earth() -> f64 {
    let [_, _, jovian] = mass_radius_branches();
    jovian.c * jovian.to.powf(jovian.s)
}

/// Mass predicted for a planet of `radius_earth` Earth radii by inverting the Terran or
/// Neptunian branch, in Earth masses, with the branch (its scatter in log10 M is
/// `sigma / s`). `None` at radii the relation does not map to one mass.
pub fn predicted_mass_earth(radius_earth: f64) -> Option<(f64, Branch)> {
    if !(radius_earth.is_finite()
        && radius_earth > 0.0
        && radius_earth < largest_invertible_radius_earth())
    {
        return None;
    }
    let [terran, neptunian, _] = mass_radius_branches();
    let top_of_terran = terran.c * terran.to.powf(terran.s);
    let b = if radius_earth < top_of_terran {
        terran
    } else {
        neptunian
    };
    finite_f64((radius_earth / b.c).powf(1.0 / b.s)).map(|m| (m, b))
}
