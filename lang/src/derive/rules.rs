//! The derivation rules: which quantity follows from which, through which formula.
//!
//! Each rule adapts one typed formula of [`crate::formulas`] to the engine's SI numbers; the
//! conversion between plain SI values and `uom` quantities happens here (the adapters in
//! `rules/si.rs`) and nowhere else.

use crate::formulas as f;
use crate::quantities::Qty;
use si::*;
use uom::si::angle::radian;
use uom::si::heat_flux_density::watt_per_square_meter;
use uom::si::length::meter;
use uom::si::mass::kilogram;
use uom::si::mass_density::kilogram_per_cubic_meter;
use uom::si::power::watt;
use uom::si::thermodynamic_temperature::kelvin;
use uom::si::time::second;
use uom::si::velocity::meter_per_second;

mod si;

mod def;
pub use def::{RuleDef, Slot};

use Qty::*;
use Slot::{Host as H, Planet as P, Star as S};

macro_rules! args {
    ($x:ident, [$($v:ident),*]) => {
        let &[$($v),*] = $x else { return None };
    };
}

mod edge;
pub use super::roles::{predicts, stands_in_for};
pub use edge::{draws_at_edge, Edge, Formula};

/// Tier of the rules that predict from a population relation: after every route from
/// measurements has had its chance.
const PREDICTION_TIER: u8 = 5;

pub static RULES: &[RuleDef] = &[
    // ---- stars ----
    RuleDef {
        id: "stefan-boltzmann",
        formula: "L = 4 pi R^2 sigma Teff^4",
        output: S(Luminosity),
        inputs: &[S(StarRadius), S(Teff)],
        tier: 0,
        eval: |x| {
            args!(x, [r, te]);
            f::luminosity(l(r), temp(te)).map(|v| v.get::<watt>())
        },
    },
    RuleDef {
        id: "stefan-boltzmann-radius",
        formula: "R = sqrt(L / (4 pi sigma Teff^4))",
        output: S(StarRadius),
        inputs: &[S(Luminosity), S(Teff)],
        tier: 0,
        eval: |x| {
            args!(x, [lum, te]);
            f::radius_from_luminosity(pow(lum), temp(te)).map(|v| v.get::<meter>())
        },
    },
    RuleDef {
        id: "stefan-boltzmann-teff",
        formula: "Teff = (L / (4 pi R^2 sigma))^(1/4)",
        output: S(Teff),
        inputs: &[S(Luminosity), S(StarRadius)],
        tier: 0,
        eval: |x| {
            args!(x, [lum, r]);
            f::teff_from_luminosity(pow(lum), l(r)).map(|v| v.get::<kelvin>())
        },
    },
    RuleDef {
        id: "surface-gravity-star",
        formula: "log g = log10(G M / R^2 in cm s^-2)",
        output: S(LogG),
        inputs: &[S(StarMass), S(StarRadius)],
        tier: 0,
        eval: |x| {
            args!(x, [ms, r]);
            f::log_g_cgs(m(ms), l(r))
        },
    },
    RuleDef {
        id: "mass-from-log-g",
        formula: "M = g R^2 / G",
        output: S(StarMass),
        inputs: &[S(LogG), S(StarRadius)],
        tier: 1,
        eval: |x| {
            args!(x, [lg, r]);
            f::mass_from_log_g(lg, l(r)).map(|v| v.get::<kilogram>())
        },
    },
    RuleDef {
        id: "radius-from-log-g",
        formula: "R = sqrt(G M / g)",
        output: S(StarRadius),
        inputs: &[S(LogG), S(StarMass)],
        tier: 1,
        eval: |x| {
            args!(x, [lg, ms]);
            f::radius_from_log_g(lg, m(ms)).map(|v| v.get::<meter>())
        },
    },
    RuleDef {
        id: "mean-density-star",
        formula: "rho = M / (4/3 pi R^3)",
        output: S(StarDensity),
        inputs: &[S(StarMass), S(StarRadius)],
        tier: 0,
        eval: |x| {
            args!(x, [ms, r]);
            f::mean_density(m(ms), l(r)).map(|v| v.get::<kilogram_per_cubic_meter>())
        },
    },
    RuleDef {
        id: "mass-from-density",
        formula: "M = 4/3 pi R^3 rho",
        output: S(StarMass),
        inputs: &[S(StarDensity), S(StarRadius)],
        tier: 3,
        eval: |x| {
            args!(x, [rho, r]);
            f::mass_from_density(density(rho), l(r)).map(|v| v.get::<kilogram>())
        },
    },
    RuleDef {
        id: "radius-from-density",
        formula: "R = (3 M / (4 pi rho))^(1/3)",
        output: S(StarRadius),
        inputs: &[S(StarDensity), S(StarMass)],
        tier: 3,
        eval: |x| {
            args!(x, [rho, ms]);
            f::radius_from_density(density(rho), m(ms)).map(|v| v.get::<meter>())
        },
    },
    // ---- orbit ----
    RuleDef {
        id: "kepler-third-law",
        formula: "a^3 = G (M* + Mp) P^2 / (4 pi^2)",
        output: P(SemiMajorAxis),
        inputs: &[P(Period), H(StarMass), P(Mass)],
        tier: 0,
        eval: |x| {
            args!(x, [p, ms, mp]);
            f::semi_major_axis(t(p), m(ms), m(mp)).map(|v| v.get::<meter>())
        },
    },
    RuleDef {
        id: "kepler-third-law-transiting",
        formula: "a^3 = G (M* + Mp) P^2 / (4 pi^2) with the true mass Mp from K and sin i, sin i from b and a/R* (Winn 2010 eq. 7): solved together by iteration",
        output: P(SemiMajorAxis),
        inputs: &[P(Period), H(StarMass), P(RvAmplitude), P(Eccentricity), P(Impact), P(ArgPeriastron), H(StarRadius)],
        tier: 0,
        eval: |x| {
            args!(x, [p, ms, k, e, b, w, rs]);
            f::semi_major_axis_transiting(t(p), m(ms), vel(k), e, b, ang(w), l(rs))
                .map(|v| v.get::<meter>())
        },
    },
    RuleDef {
        id: "kepler-third-law-min-mass",
        formula: "a^3 = G (M* + Mp sin i) P^2 / (4 pi^2), with the minimum mass standing in for Mp",
        output: P(SemiMajorAxis),
        inputs: &[P(Period), H(StarMass), P(MinMass)],
        tier: 1,
        eval: |x| {
            args!(x, [p, ms, mp]);
            f::semi_major_axis(t(p), m(ms), m(mp)).map(|v| v.get::<meter>())
        },
    },
    RuleDef {
        id: "kepler-third-law-light-planet",
        formula: "a^3 = G M* P^2 / (4 pi^2), the planet's mass neglected",
        output: P(SemiMajorAxis),
        inputs: &[P(Period), H(StarMass)],
        tier: 2,
        eval: |x| {
            args!(x, [p, ms]);
            f::semi_major_axis(t(p), m(ms), m(0.0)).map(|v| v.get::<meter>())
        },
    },
    RuleDef {
        id: "kepler-period",
        formula: "P = 2 pi sqrt(a^3 / (G (M* + Mp)))",
        output: P(Period),
        inputs: &[P(SemiMajorAxis), H(StarMass), P(Mass)],
        tier: 0,
        eval: |x| {
            args!(x, [a, ms, mp]);
            f::period_from_axis(l(a), m(ms), m(mp)).map(|v| v.get::<second>())
        },
    },
    RuleDef {
        id: "kepler-period-light-planet",
        formula: "P = 2 pi sqrt(a^3 / (G M*)), the planet's mass neglected",
        output: P(Period),
        inputs: &[P(SemiMajorAxis), H(StarMass)],
        tier: 2,
        eval: |x| {
            args!(x, [a, ms]);
            f::period_from_axis(l(a), m(ms), m(0.0)).map(|v| v.get::<second>())
        },
    },
    RuleDef {
        id: "kepler-stellar-mass",
        formula: "M* = 4 pi^2 a^3 / (G P^2) - Mp",
        output: H(StarMass),
        inputs: &[P(SemiMajorAxis), P(Period), P(Mass)],
        tier: 0,
        eval: |x| {
            args!(x, [a, p, mp]);
            f::total_mass_from_orbit(l(a), t(p))
                .map(|v| v.get::<kilogram>() - mp)
                .filter(|v| *v > 0.0)
        },
    },
    RuleDef {
        id: "kepler-stellar-mass-rv",
        formula: "M* = 4 pi^2 a^3 / (G P^2) - Mp, with Mp = (f (M* + Mp)^2)^(1/3) / sin i from the mass function f = P K^3 (1 - e^2)^(3/2) / (2 pi G)",
        output: H(StarMass),
        inputs: &[P(SemiMajorAxis), P(Period), P(RvAmplitude), P(Eccentricity), P(Inclination)],
        tier: 1,
        eval: |x| {
            args!(x, [a, p, k, e, i]);
            f::stellar_mass_from_orbit_and_rv(l(a), t(p), vel(k), e, sin_of(i))
                .map(|v| v.get::<kilogram>())
        },
    },
    RuleDef {
        id: "kepler-stellar-mass-light-planet",
        formula: "M* = 4 pi^2 a^3 / (G P^2), the planet's mass neglected",
        output: H(StarMass),
        inputs: &[P(SemiMajorAxis), P(Period)],
        tier: 2,
        eval: |x| {
            args!(x, [a, p]);
            f::total_mass_from_orbit(l(a), t(p)).map(|v| v.get::<kilogram>())
        },
    },
    RuleDef {
        id: "orbital-speed",
        formula: "v = 2 pi a / P",
        output: P(OrbitalSpeed),
        inputs: &[P(SemiMajorAxis), P(Period)],
        tier: 0,
        eval: |x| {
            args!(x, [a, p]);
            f::mean_orbital_speed(l(a), t(p)).map(|v| v.get::<meter_per_second>())
        },
    },
    // ---- radial velocity ----
    RuleDef {
        id: "rv-minimum-mass",
        formula: "K = (2 pi G / P)^(1/3) Mp sin i / (M* + Mp)^(2/3) / sqrt(1 - e^2), solved exactly with sin i = 1",
        output: P(MinMass),
        inputs: &[P(RvAmplitude), P(Period), H(StarMass), P(Eccentricity)],
        tier: 0,
        eval: |x| {
            args!(x, [k, p, ms, e]);
            f::minimum_mass_from_rv(vel(k), t(p), m(ms), e).map(|v| v.get::<kilogram>())
        },
    },
    RuleDef {
        id: "rv-true-mass",
        formula: "K = (2 pi G / P)^(1/3) Mp sin i / (M* + Mp)^(2/3) / sqrt(1 - e^2), solved exactly for Mp",
        output: P(Mass),
        inputs: &[P(RvAmplitude), P(Period), H(StarMass), P(Eccentricity), P(Inclination)],
        tier: 0,
        eval: |x| {
            args!(x, [k, p, ms, e, i]);
            f::planet_mass_from_rv(vel(k), t(p), m(ms), e, sin_of(i)).map(|v| v.get::<kilogram>())
        },
    },
    RuleDef {
        id: "projected-mass",
        formula: "Mp sin i",
        output: P(MinMass),
        inputs: &[P(Mass), P(Inclination)],
        tier: 1,
        eval: |x| {
            args!(x, [mp, i]);
            Some(mp * sin_of(i)).filter(|v| *v > 0.0)
        },
    },
    // ---- transit ----
    RuleDef {
        id: "depth-radius-ratio",
        formula: "k = sqrt(depth) (no limb darkening)",
        output: P(RadiusRatio),
        inputs: &[P(TransitDepth)],
        tier: 0,
        eval: |x| {
            args!(x, [d]);
            f::radius_ratio_from_depth(d)
        },
    },
    RuleDef {
        id: "depth-impact-radius-ratio",
        formula: "depth = overlap of the planet's and the star's discs at separation b, over pi (no limb darkening): k = sqrt(depth) unless the transit is grazing (b > 1 - k)",
        output: P(RadiusRatio),
        inputs: &[P(TransitDepth), P(Impact)],
        tier: 0,
        eval: |x| {
            args!(x, [d, b]);
            f::radius_ratio_from_depth_and_impact(d, b)
        },
    },
    RuleDef {
        id: "radius-ratio-impact-depth",
        formula: "depth = overlap of the planet's and the star's discs at separation b, over pi (no limb darkening): k^2 unless the transit is grazing (b > 1 - k), none once b >= 1 + k",
        output: P(TransitDepth),
        inputs: &[P(RadiusRatio), P(Impact)],
        tier: 0,
        eval: |x| {
            args!(x, [k, b]);
            f::depth_from_radius_ratio_and_impact(k, b)
        },
    },
    RuleDef {
        id: "radius-ratio-depth",
        formula: "depth = k^2 (no limb darkening)",
        output: P(TransitDepth),
        inputs: &[P(RadiusRatio)],
        tier: 0,
        eval: |x| {
            args!(x, [k]);
            f::depth_from_radius_ratio(k)
        },
    },
    RuleDef {
        id: "planet-radius",
        formula: "Rp = k R*",
        output: P(Radius),
        inputs: &[P(RadiusRatio), H(StarRadius)],
        tier: 0,
        eval: |x| {
            args!(x, [k, r]);
            Some(k * r).filter(|v| *v > 0.0)
        },
    },
    RuleDef {
        id: "radius-ratio",
        formula: "k = Rp / R*",
        output: P(RadiusRatio),
        inputs: &[P(Radius), H(StarRadius)],
        tier: 0,
        eval: |x| {
            args!(x, [rp, r]);
            Some(rp / r).filter(|v| v.is_finite() && *v > 0.0)
        },
    },
    RuleDef {
        id: "scaled-semi-major-axis",
        formula: "a / R*",
        output: P(ScaledAxis),
        inputs: &[P(SemiMajorAxis), H(StarRadius)],
        tier: 0,
        eval: |x| {
            args!(x, [a, r]);
            Some(a / r).filter(|v| v.is_finite() && *v > 0.0)
        },
    },
    RuleDef {
        id: "semi-major-axis-from-scaled",
        formula: "a = (a/R*) R*",
        output: P(SemiMajorAxis),
        inputs: &[P(ScaledAxis), H(StarRadius)],
        tier: 3,
        eval: |x| {
            args!(x, [ar, r]);
            Some(ar * r).filter(|v| v.is_finite() && *v > 0.0)
        },
    },
    RuleDef {
        id: "inclination-from-impact",
        formula: "cos i = b (1 + e sin omega) / ((a/R*) (1 - e^2)) (Winn 2010 eq. 7)",
        output: P(Inclination),
        inputs: &[P(Impact), P(ScaledAxis), P(Eccentricity), P(ArgPeriastron)],
        tier: 0,
        eval: |x| {
            args!(x, [b, ars, e, w]);
            f::inclination_from_impact(b, ars, e, ang(w)).map(|v| v.get::<radian>())
        },
    },
    RuleDef {
        id: "impact-from-inclination",
        formula: "b = (a/R*) cos i (1 - e^2) / (1 + e sin omega) (Winn 2010 eq. 7)",
        output: P(Impact),
        inputs: &[P(Inclination), P(ScaledAxis), P(Eccentricity), P(ArgPeriastron)],
        tier: 0,
        eval: |x| {
            args!(x, [i, ars, e, w]);
            f::impact_from_inclination(ang(i), ars, e, ang(w))
        },
    },
    RuleDef {
        id: "transit-duration-total",
        formula: "T14 = P/pi asin[(R*/a) sqrt((1 + k)^2 - b^2) / sin i] sqrt(1 - e^2)/(1 + e sin omega) (Winn 2010 eqs. 14, 16)",
        output: P(TransitDuration),
        inputs: &[P(Period), P(ScaledAxis), P(RadiusRatio), P(Impact), P(Eccentricity), P(ArgPeriastron)],
        tier: 0,
        eval: |x| {
            args!(x, [p, ars, k, b, e, w]);
            f::transit_duration_total(t(p), ars, k, b, e, ang(w)).map(|v| v.get::<second>())
        },
    },
    RuleDef {
        id: "transit-duration-full",
        formula: "T23 = P/pi asin[(R*/a) sqrt((1 - k)^2 - b^2) / sin i] sqrt(1 - e^2)/(1 + e sin omega) (Winn 2010 eqs. 15, 16)",
        output: P(TransitDurationFull),
        inputs: &[P(Period), P(ScaledAxis), P(RadiusRatio), P(Impact), P(Eccentricity), P(ArgPeriastron)],
        tier: 0,
        eval: |x| {
            args!(x, [p, ars, k, b, e, w]);
            f::transit_duration_full(t(p), ars, k, b, e, ang(w)).map(|v| v.get::<second>())
        },
    },
    RuleDef {
        id: "impact-from-durations",
        formula: "b^2 = [(1 - k)^2 - r (1 + k)^2] / (1 - r), r = sin^2(pi T23'/P) / sin^2(pi T14'/P) (Seager & Mallén-Ornelas 2003 eq. 7; T' = T (1 + e sin omega) / sqrt(1 - e^2), Winn 2010 eq. 16)",
        output: P(Impact),
        inputs: &[P(Period), P(TransitDuration), P(TransitDurationFull), P(RadiusRatio), P(Eccentricity), P(ArgPeriastron)],
        tier: 0,
        eval: |x| {
            args!(x, [p, t14, t23, k, e, w]);
            f::impact_from_durations(t(p), t(t14), t(t23), k, e, ang(w))
        },
    },
    RuleDef {
        id: "scaled-axis-from-duration",
        formula: "(a/R*)^2 = [(1 + k)^2 - b^2] / sin^2(pi T14'/P) + b^2 (1 + e sin omega)^2 / (1 - e^2)^2 (Seager & Mallén-Ornelas 2003 eq. 8 when e = 0; T' as in Winn 2010 eq. 16)",
        output: P(ScaledAxis),
        inputs: &[P(Period), P(TransitDuration), P(RadiusRatio), P(Impact), P(Eccentricity), P(ArgPeriastron)],
        tier: 0,
        eval: |x| {
            args!(x, [p, t14, k, b, e, w]);
            f::scaled_axis_from_duration(t(p), t(t14), k, b, e, ang(w))
        },
    },
    RuleDef {
        id: "stellar-density-from-duration",
        formula: "rho* = 3 pi (a/R*)^3 / (G P^2) with a/R* from T14, k and b (Seager & Mallén-Ornelas 2003 eqs. 8-9)",
        output: H(StarDensity),
        inputs: &[P(Period), P(TransitDuration), P(RadiusRatio), P(Impact), P(Eccentricity), P(ArgPeriastron)],
        tier: 2,
        eval: |x| {
            args!(x, [p, t14, k, b, e, w]);
            f::stellar_density_from_duration(t(p), t(t14), k, b, e, ang(w))
                .map(|v| v.get::<kilogram_per_cubic_meter>())
        },
    },
    RuleDef {
        id: "stellar-density-from-transit",
        formula: "rho* = 3 pi (a/R*)^3 / (G P^2) (Seager & Mallén-Ornelas 2003)",
        output: H(StarDensity),
        inputs: &[P(ScaledAxis), P(Period)],
        tier: 2,
        eval: |x| {
            args!(x, [ars, p]);
            f::stellar_density_from_transit(ars, t(p)).map(|v| v.get::<kilogram_per_cubic_meter>())
        },
    },
    // ---- planet bulk ----
    RuleDef {
        id: "bulk-density",
        formula: "rho = Mp / (4/3 pi Rp^3)",
        output: P(Density),
        inputs: &[P(Mass), P(Radius)],
        tier: 0,
        eval: |x| {
            args!(x, [mp, rp]);
            f::bulk_density(m(mp), l(rp)).map(|v| v.get::<kilogram_per_cubic_meter>())
        },
    },
    RuleDef {
        id: "surface-gravity",
        formula: "g = G Mp / Rp^2",
        output: P(SurfaceGravity),
        inputs: &[P(Mass), P(Radius)],
        tier: 0,
        eval: |x| {
            args!(x, [mp, rp]);
            f::surface_gravity(m(mp), l(rp)).map(|v| v.value)
        },
    },
    RuleDef {
        id: "escape-velocity",
        formula: "v_esc = sqrt(2 G Mp / Rp)",
        output: P(EscapeVelocity),
        inputs: &[P(Mass), P(Radius)],
        tier: 0,
        eval: |x| {
            args!(x, [mp, rp]);
            f::escape_velocity(m(mp), l(rp)).map(|v| v.get::<meter_per_second>())
        },
    },
    RuleDef {
        id: "hill-radius",
        formula: "r_H = a (1 - e) (Mp / (3 M*))^(1/3)",
        output: P(HillRadius),
        inputs: &[P(SemiMajorAxis), P(Eccentricity), P(Mass), H(StarMass)],
        tier: 0,
        eval: |x| {
            args!(x, [a, e, mp, ms]);
            f::hill_radius(l(a), e, m(mp), m(ms)).map(|v| v.get::<meter>())
        },
    },
    RuleDef {
        id: "hill-radius-min-mass",
        formula: "r_H = a (1 - e) (Mp sin i / (3 M*))^(1/3), with the minimum mass standing in for Mp",
        output: P(HillRadius),
        inputs: &[P(SemiMajorAxis), P(Eccentricity), P(MinMass), H(StarMass)],
        tier: 1,
        eval: |x| {
            args!(x, [a, e, mp, ms]);
            f::hill_radius(l(a), e, m(mp), m(ms)).map(|v| v.get::<meter>())
        },
    },
    // ---- irradiation ----
    RuleDef {
        id: "insolation",
        formula: "S = L* / (4 pi a^2)",
        output: P(Insolation),
        inputs: &[H(Luminosity), P(SemiMajorAxis)],
        tier: 0,
        eval: |x| {
            args!(x, [lum, a]);
            f::insolation(pow(lum), l(a)).map(|v| v.get::<watt_per_square_meter>())
        },
    },
    RuleDef {
        id: "equilibrium-temperature",
        formula: "Teq = Teff sqrt(R* / 2a) [f (1 - A)]^(1/4)",
        output: P(Teq),
        inputs: &[H(Teff), H(StarRadius), P(SemiMajorAxis), P(Albedo), P(Redistribution)],
        tier: 0,
        eval: |x| {
            args!(x, [te, r, a, alb, fr]);
            f::equilibrium_temperature(temp(te), l(r), l(a), alb, fr).map(|v| v.get::<kelvin>())
        },
    },
    // ---- what an observer plans with ----
    RuleDef {
        id: "distance-from-parallax",
        formula: "d = 1 au / tan(parallax)",
        output: S(Distance),
        inputs: &[S(Parallax)],
        tier: 0,
        eval: |x| {
            args!(x, [p]);
            f::distance_from_parallax(ang(p)).map(|v| v.get::<meter>())
        },
    },
    RuleDef {
        id: "luminosity-from-absolute-bolometric-magnitude",
        formula: "L = L0 10^(-0.4 M_bol), L0 = 3.0128e28 W (IAU 2015 B2)",
        output: S(Luminosity),
        inputs: &[S(AbsoluteBolometricMagnitude)],
        tier: 0,
        eval: |x| {
            args!(x, [mb]);
            f::luminosity_from_absolute_bolometric_magnitude(mb).map(|v| v.get::<watt>())
        },
    },
    RuleDef {
        id: "bolometric-flux-from-magnitude",
        formula: "f = f0 10^(-0.4 m_bol), f0 = 2.518021002e-8 W/m^2 (IAU 2015 B2)",
        output: S(BolometricFlux),
        inputs: &[S(BolometricMagnitude)],
        tier: 0,
        eval: |x| {
            args!(x, [mb]);
            f::bolometric_flux_from_magnitude(mb).map(|v| v.get::<watt_per_square_meter>())
        },
    },
    RuleDef {
        id: "luminosity-from-bolometric-flux",
        formula: "L = 4 pi d^2 f_bol",
        output: S(Luminosity),
        inputs: &[S(BolometricFlux), S(Distance)],
        tier: 0,
        eval: |x| {
            args!(x, [fb, d]);
            f::luminosity_from_flux(
                uom::si::f64::HeatFluxDensity::new::<watt_per_square_meter>(fb),
                l(d),
            )
            .map(|v| v.get::<watt>())
        },
    },
    RuleDef {
        id: "habitable-inner-insolation",
        formula: "S_eff = S_sun + a T + b T^2 + c T^3 + d T^4, T = Teff - 5780 K (Kopparapu et al. 2014, runaway greenhouse, 1 Mearth)",
        output: S(HabitableInnerFlux),
        inputs: &[S(Teff)],
        tier: 0,
        eval: |x| {
            args!(x, [te]);
            habitable(f::HabitableEdge::RunawayGreenhouse, te)
        },
    },
    RuleDef {
        id: "habitable-outer-insolation",
        formula: "S_eff = S_sun + a T + b T^2 + c T^3 + d T^4, T = Teff - 5780 K (Kopparapu et al. 2014, maximum greenhouse)",
        output: S(HabitableOuterFlux),
        inputs: &[S(Teff)],
        tier: 0,
        eval: |x| {
            args!(x, [te]);
            habitable(f::HabitableEdge::MaximumGreenhouse, te)
        },
    },
    RuleDef {
        id: "habitable-inner-optimistic-insolation",
        formula: "S_eff = S_sun + a T + b T^2 + c T^3 + d T^4, T = Teff - 5780 K (Kopparapu et al. 2014, recent Venus)",
        output: S(HabitableInnerOptimisticFlux),
        inputs: &[S(Teff)],
        tier: 0,
        eval: |x| {
            args!(x, [te]);
            habitable(f::HabitableEdge::RecentVenus, te)
        },
    },
    RuleDef {
        id: "habitable-outer-optimistic-insolation",
        formula: "S_eff = S_sun + a T + b T^2 + c T^3 + d T^4, T = Teff - 5780 K (Kopparapu et al. 2014, early Mars)",
        output: S(HabitableOuterOptimisticFlux),
        inputs: &[S(Teff)],
        tier: 0,
        eval: |x| {
            args!(x, [te]);
            habitable(f::HabitableEdge::EarlyMars, te)
        },
    },
    RuleDef {
        id: "habitable-inner",
        formula: "d = sqrt((L / Lsun) / S_eff) au (Kopparapu et al. 2013, eq. 3)",
        output: S(HabitableInner),
        inputs: &[S(Luminosity), S(HabitableInnerFlux)],
        tier: 0,
        eval: |x| {
            args!(x, [lum, s]);
            habitable_at(lum, s)
        },
    },
    RuleDef {
        id: "habitable-outer",
        formula: "d = sqrt((L / Lsun) / S_eff) au (Kopparapu et al. 2013, eq. 3)",
        output: S(HabitableOuter),
        inputs: &[S(Luminosity), S(HabitableOuterFlux)],
        tier: 0,
        eval: |x| {
            args!(x, [lum, s]);
            habitable_at(lum, s)
        },
    },
    RuleDef {
        id: "habitable-inner-optimistic",
        formula: "d = sqrt((L / Lsun) / S_eff) au (Kopparapu et al. 2013, eq. 3)",
        output: S(HabitableInnerOptimistic),
        inputs: &[S(Luminosity), S(HabitableInnerOptimisticFlux)],
        tier: 0,
        eval: |x| {
            args!(x, [lum, s]);
            habitable_at(lum, s)
        },
    },
    RuleDef {
        id: "habitable-outer-optimistic",
        formula: "d = sqrt((L / Lsun) / S_eff) au (Kopparapu et al. 2013, eq. 3)",
        output: S(HabitableOuterOptimistic),
        inputs: &[S(Luminosity), S(HabitableOuterOptimisticFlux)],
        tier: 0,
        eval: |x| {
            args!(x, [lum, s]);
            habitable_at(lum, s)
        },
    },
    RuleDef {
        id: "habitable-zone-position",
        formula: "x = (S_inner - S) / (S_inner - S_outer): 0 at the inner edge, 1 at the outer",
        output: P(HabitableZonePosition),
        inputs: &[P(Insolation), H(HabitableInnerFlux), H(HabitableOuterFlux)],
        tier: 0,
        eval: |x| {
            args!(x, [s, si, so]);
            let w = si - so;
            (w > 0.0).then(|| (si - s) / w)
        },
    },
    RuleDef {
        id: "scale-height",
        formula: "H = k Teq / (mu m_u g)",
        output: P(ScaleHeight),
        inputs: &[P(Teq), P(MeanMolecularWeight), P(SurfaceGravity)],
        tier: 0,
        eval: |x| {
            args!(x, [te, mu, g]);
            f::scale_height(
                temp(te),
                mu,
                uom::si::f64::Acceleration::new::<uom::si::acceleration::meter_per_second_squared>(g),
            )
            .map(|v| v.get::<meter>())
        },
    },
    RuleDef {
        id: "tsm",
        formula: "TSM = s Rp^3 Teq / (Mp R*^2) 10^(-mJ/5), Rp in Rearth, Mp in Mearth, R* in Rsun, Teq = Teff sqrt(R*/a) (1/4)^(1/4) (Kempton et al. 2018, eq. 1)",
        output: P(Tsm),
        inputs: &[P(Radius), P(Mass), H(StarRadius), H(Teff), P(ScaledAxis), H(MagnitudeJ)],
        tier: 0,
        eval: |x| {
            args!(x, [rp, mp, rs, te, ars, mj]);
            f::transmission_metric(l(rp), m(mp), l(rs), temp(te), ars, mj)
        },
    },
    RuleDef {
        id: "tsm-predicted-mass",
        formula: "TSM = s Rp^3 Teq / (Mp R*^2) 10^(-mJ/5), with the predicted mass standing in for Mp (Kempton et al. 2018, eq. 1)",
        output: P(Tsm),
        inputs: &[P(Radius), P(PredictedMass), H(StarRadius), H(Teff), P(ScaledAxis), H(MagnitudeJ)],
        tier: PREDICTION_TIER + 1,
        eval: |x| {
            args!(x, [rp, mp, rs, te, ars, mj]);
            f::transmission_metric(l(rp), m(mp), l(rs), temp(te), ars, mj)
        },
    },
    RuleDef {
        id: "esm",
        formula: "ESM = 4.29e6 B_7.5um(1.10 Teq) / B_7.5um(Teff) (Rp/R*)^2 10^(-mK/5), Teq = Teff sqrt(R*/a) (1/4)^(1/4) (Kempton et al. 2018, eq. 4)",
        output: P(Esm),
        inputs: &[P(RadiusRatio), H(Teff), P(ScaledAxis), H(MagnitudeKs)],
        tier: 0,
        eval: |x| {
            args!(x, [k, te, ars, mk]);
            f::emission_metric(k, temp(te), ars, mk)
        },
    },
    RuleDef {
        id: "predicted-mass",
        formula: "M = (R / C)^(1/S) on the Terran or Neptunian branch of R = C M^S (Chen & Kipping 2017)",
        output: P(PredictedMass),
        inputs: &[P(Radius)],
        tier: PREDICTION_TIER,
        eval: |x| {
            args!(x, [rp]);
            f::predicted_mass_earth(radius_earth(rp)).map(|(me, _)| me * crate::constants::M_EARTH)
        },
    },
    RuleDef {
        id: "predicted-radius",
        formula: "R = C M^S (Chen & Kipping 2017)",
        output: P(PredictedRadius),
        inputs: &[P(Mass)],
        tier: PREDICTION_TIER,
        eval: |x| {
            args!(x, [mp]);
            f::predicted_radius_earth(mass_earth(mp)).map(|(re, _)| re * crate::constants::R_EARTH)
        },
    },
    RuleDef {
        id: "predicted-radius-min-mass",
        formula: "R = C M^S (Chen & Kipping 2017), with the minimum mass standing in for M",
        output: P(PredictedRadius),
        inputs: &[P(MinMass)],
        tier: PREDICTION_TIER + 1,
        eval: |x| {
            args!(x, [mp]);
            f::predicted_radius_earth(mass_earth(mp)).map(|(re, _)| re * crate::constants::R_EARTH)
        },
    },
    RuleDef {
        id: "predicted-rv-amplitude",
        formula: "K = (2 pi G / P)^(1/3) Mp sin i / (M* + Mp)^(2/3) / sqrt(1 - e^2), with the predicted mass",
        output: P(PredictedRvAmplitude),
        inputs: &[P(PredictedMass), P(Period), H(StarMass), P(Eccentricity), P(Inclination)],
        tier: PREDICTION_TIER + 1,
        eval: |x| {
            args!(x, [mp, p, ms, e, i]);
            f::rv_semi_amplitude(m(mp), t(p), m(ms), e, sin_of(i)).map(|v| v.get::<meter_per_second>())
        },
    },
];
