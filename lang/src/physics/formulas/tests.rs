//! Unit tests of the formulas, one module per formula module; each reference value names its
//! source.

use super::typed::value_of;
use super::*;
use crate::constants::{
    self, AU, DAY, GM_EARTH, L_SUN, M_EARTH, M_JUPITER, M_SUN, R_EARTH, R_JUPITER, R_SUN, TEFF_SUN,
};
use std::f64::consts::PI;
use uom::si::angle::degree;
use uom::si::f64::{
    Angle, Length, Mass, MassDensity, Power, ThermodynamicTemperature, Time, Velocity,
};
use uom::si::heat_flux_density::watt_per_square_meter;
use uom::si::length::{kilometer, meter};
use uom::si::mass::kilogram;
use uom::si::mass_density::kilogram_per_cubic_meter;
use uom::si::power::watt;
use uom::si::thermodynamic_temperature::kelvin;
use uom::si::time::second;
use uom::si::velocity::{kilometer_per_second, meter_per_second};

fn close(actual: f64, expected: f64, rel: f64) -> bool {
    ((actual - expected) / expected).abs() <= rel
}

fn m(x: f64) -> Length {
    Length::new::<meter>(x)
}
fn kg(x: f64) -> Mass {
    Mass::new::<kilogram>(x)
}
fn days(x: f64) -> Time {
    Time::new::<second>(x * DAY)
}
fn deg(x: f64) -> Angle {
    Angle::new::<degree>(x)
}
fn kelvins(x: f64) -> ThermodynamicTemperature {
    ThermodynamicTemperature::new::<kelvin>(x)
}

/// Earth's sidereal year, 365.256363004 d (IERS / Astronomical Almanac; from memory).
const SIDEREAL_YEAR_DAYS: f64 = 365.256_363_004;
/// Earth's volumetric mean radius, 6371.0 km (Earth fact sheet, NASA GSFC; from memory).
const R_EARTH_MEAN: f64 = 6.371_0e6;
/// Jupiter's volumetric mean radius, 69 911 km (Jupiter fact sheet, NASA GSFC; from memory).
const R_JUPITER_MEAN: f64 = 6.991_1e7;

mod kepler {
    use super::*;

    #[test]
    fn earth_orbit_from_the_suns_mass_is_one_au() {
        // 1 au at one sidereal year (IAU 2012 B2 au; Earth fact sheet a = 1.000 au) within 1e-4.
        let a = semi_major_axis(days(SIDEREAL_YEAR_DAYS), kg(M_SUN), kg(M_EARTH)).expect("orbit");
        assert!(close(a.get::<meter>(), AU, 1e-4), "{:?}", a);
        // And back.
        let p = period_from_axis(a, kg(M_SUN), kg(M_EARTH)).expect("period");
        assert!(close(p.get::<second>(), SIDEREAL_YEAR_DAYS * DAY, 1e-12));
        let total = total_mass_from_orbit(a, p).expect("mass");
        assert!(close(total.get::<kilogram>(), M_SUN + M_EARTH, 1e-12));
    }

    #[test]
    fn jupiter_axis_from_its_period() {
        // Jupiter fact sheet (NASA GSFC): sidereal period 4332.589 d, semi-major axis
        // 778.479e6 km (from memory). The fact-sheet axis is a mean element perturbed by Saturn,
        // so agreement is at the 2e-4 level.
        let a = semi_major_axis(days(4332.589), kg(M_SUN), kg(M_JUPITER)).expect("orbit");
        assert!(close(a.get::<kilometer>(), 778.479e6, 5e-4), "{:?}", a);
    }

    #[test]
    fn planet_mass_matters_in_keplers_law() {
        // Including Jupiter's mass lengthens the axis by (1 + Mj/Msun)^(1/3) (Kepler's third law).
        let p = days(4332.589);
        let with = semi_major_axis(p, kg(M_SUN), kg(M_JUPITER)).expect("with");
        let without = semi_major_axis(p, kg(M_SUN), kg(0.0)).expect("without");
        let expected = (1.0 + M_JUPITER / M_SUN).cbrt();
        assert!(close(value_of(with / without), expected, 1e-12));
    }

    #[test]
    fn earth_mean_orbital_speed() {
        // 29.78 km/s (Earth fact sheet, NASA GSFC).
        let v = mean_orbital_speed(m(AU), days(SIDEREAL_YEAR_DAYS)).expect("v");
        assert!(
            (v.get::<kilometer_per_second>() - 29.78).abs() < 0.01,
            "{:?}",
            v
        );
    }

    #[test]
    fn hot_giant_at_four_days() {
        // A Jupiter around a Sun-like star at P = 4 d sits near 0.05 au moving at about
        // 130 km/s (common practice).
        let a = semi_major_axis(days(4.0), kg(M_SUN), kg(M_JUPITER)).expect("a");
        assert!((a.get::<meter>() / AU - 0.05).abs() < 0.002, "{:?}", a);
        let v = mean_orbital_speed(a, days(4.0)).expect("v");
        assert!(
            (v.get::<kilometer_per_second>() - 130.0).abs() < 6.0,
            "{:?}",
            v
        );
    }

    #[test]
    fn kepler_rejects_bad_input() {
        assert!(semi_major_axis(days(0.0), kg(M_SUN), kg(0.0)).is_none());
        assert!(semi_major_axis(days(1.0), kg(-M_SUN), kg(0.0)).is_none());
        assert!(semi_major_axis(days(1.0), kg(M_SUN), kg(-1.0)).is_none());
        assert!(semi_major_axis(days(f64::INFINITY), kg(M_SUN), kg(0.0)).is_none());
        assert!(period_from_axis(m(0.0), kg(M_SUN), kg(0.0)).is_none());
        assert!(total_mass_from_orbit(m(AU), days(-1.0)).is_none());
        assert!(mean_orbital_speed(m(AU), days(0.0)).is_none());
        // Jupiter radius sanity (IAU 2015 B3 nominal) to exercise Length values far from 1.
        assert!(mean_density(kg(M_JUPITER), m(R_JUPITER)).is_some());
    }
}

mod radial_velocity {
    use super::*;

    #[test]
    fn solar_reflex_velocities() {
        // Sun's reflex due to Jupiter about 12.5 m/s, due to Earth about 0.09 m/s (common
        // practice).
        // Eccentricities 0.0489 and 0.0167 (fact sheets).
        let kj = rv_semi_amplitude(kg(M_JUPITER), days(4332.589), kg(M_SUN), 0.0489, 1.0)
            .expect("K jupiter");
        assert!(
            (kj.get::<meter_per_second>() - 12.5).abs() < 0.1,
            "{:?}",
            kj
        );
        let ke = rv_semi_amplitude(
            kg(M_EARTH),
            days(SIDEREAL_YEAR_DAYS),
            kg(M_SUN),
            0.0167,
            1.0,
        )
        .expect("K earth");
        assert!(
            (ke.get::<meter_per_second>() - 0.0894).abs() < 0.0005,
            "{:?}",
            ke
        );
    }

    #[test]
    fn rv_scales_as_expected() {
        // K is proportional to sin i and to 1/sqrt(1 - e^2) (RV semi-amplitude formula).
        let base = rv_semi_amplitude(kg(M_JUPITER), days(10.0), kg(M_SUN), 0.0, 1.0).expect("K");
        let tilted = rv_semi_amplitude(kg(M_JUPITER), days(10.0), kg(M_SUN), 0.0, 0.5).expect("K");
        let eccentric =
            rv_semi_amplitude(kg(M_JUPITER), days(10.0), kg(M_SUN), 0.6, 1.0).expect("K");
        assert!(close(value_of(tilted / base), 0.5, 1e-12));
        assert!(close(value_of(eccentric / base), 1.0 / 0.8, 1e-12));
        // Zero planet mass gives K = 0.
        let none = rv_semi_amplitude(kg(0.0), days(10.0), kg(M_SUN), 0.0, 1.0).expect("K");
        assert_eq!(none.get::<meter_per_second>(), 0.0);
    }

    #[test]
    fn rv_mass_round_trips_from_earth_to_half_the_star() {
        let star = kg(M_SUN);
        let masses = [
            M_EARTH,
            10.0 * M_EARTH,
            M_JUPITER,
            13.0 * M_JUPITER,
            0.1 * M_SUN,
            0.5 * M_SUN,
        ];
        let cases = [(0.0, 1.0), (0.3, 0.8), (0.9, 0.2), (0.999, 1.0)];
        for &mp in &masses {
            for &(e, sin_i) in &cases {
                for &p in &[0.5, 4.2, 365.25, 4000.0] {
                    let k = rv_semi_amplitude(kg(mp), days(p), star, e, sin_i).expect("K");
                    let back = planet_mass_from_rv(k, days(p), star, e, sin_i).expect("mass");
                    assert!(
                        close(back.get::<kilogram>(), mp, 1e-10),
                        "mp {mp} e {e} sin_i {sin_i} P {p}: got {:?}",
                        back
                    );
                }
            }
        }
    }

    #[test]
    fn minimum_mass_is_not_the_naive_product_for_heavy_companions() {
        // For a companion of 0.5 Msun seen at sin i = 0.5, the edge-on solution is below the
        // true mass but differs from Mp sin i because M* + Mp changes (mass-function algebra).
        let star = kg(M_SUN);
        let mp = 0.5 * M_SUN;
        let k = rv_semi_amplitude(kg(mp), days(100.0), star, 0.0, 0.5).expect("K");
        let min = minimum_mass_from_rv(k, days(100.0), star, 0.0).expect("min mass");
        let min = min.get::<kilogram>();
        assert!(min < mp);
        assert!((min / (0.5 * mp) - 1.0).abs() > 0.05, "min {min}");
        // It reproduces K edge-on.
        let k_edge = rv_semi_amplitude(kg(min), days(100.0), star, 0.0, 1.0).expect("K");
        assert!(close(value_of(k_edge / k), 1.0, 1e-12));
        // For an Earth-mass planet the two agree to about Mp/M* (small-planet limit).
        let k = rv_semi_amplitude(kg(M_EARTH), days(100.0), star, 0.0, 0.5).expect("K");
        let min = minimum_mass_from_rv(k, days(100.0), star, 0.0).expect("min mass");
        assert!(close(min.get::<kilogram>(), 0.5 * M_EARTH, 1e-5));
    }

    /// The mass ratio solves `u^3 = phi (1 + u)^2` to rounding level from phi = 1e-30
    /// (far lighter than any planet) to 1e6 (a companion a hundred times the star), from its
    /// own start and from starts 0.1 % and 30 % off (an iteration's previous round): the
    /// relative residual of the cubic, which bounds the root's relative error (the log of
    /// the cubic's ratio has slope 3 - 2u/(1+u) >= 1 in ln u), is within a few roundings.
    #[test]
    fn the_mass_ratio_is_the_root_to_rounding_level() {
        let mut phi = 1e-30_f64;
        while phi < 1e6 {
            for start in [None, Some(0.999), Some(1.001), Some(1.3), Some(0.7)] {
                // f / M* = phi with sin i = 1.
                let guess = start.map(|g| {
                    let u =
                        crate::formulas::radial_velocity::mass_ratio(kg(phi), kg(1.0), 1.0, None)
                            .expect("root");
                    u * g
                });
                let u = crate::formulas::radial_velocity::mass_ratio(kg(phi), kg(1.0), 1.0, guess)
                    .expect("root");
                let residual = (u * u * u - phi * (1.0 + u) * (1.0 + u)) / (u * u * u);
                assert!(
                    residual.abs() < 3e-15,
                    "phi {phi:e} start {start:?}: {residual:e}"
                );
            }
            phi *= 7.3;
        }
    }

    #[test]
    fn rv_inverse_rejects_bad_input() {
        let k = Velocity::new::<meter_per_second>(10.0);
        assert!(planet_mass_from_rv(k, days(3.0), kg(M_SUN), 1.0, 1.0).is_none());
        assert!(planet_mass_from_rv(k, days(3.0), kg(M_SUN), -0.1, 1.0).is_none());
        assert!(planet_mass_from_rv(k, days(3.0), kg(M_SUN), 0.1, 0.0).is_none());
        assert!(planet_mass_from_rv(k, days(3.0), kg(M_SUN), 0.1, 1.01).is_none());
        assert!(planet_mass_from_rv(k, days(-3.0), kg(M_SUN), 0.1, 1.0).is_none());
        assert!(planet_mass_from_rv(k, days(3.0), kg(0.0), 0.1, 1.0).is_none());
        assert!(planet_mass_from_rv(-k, days(3.0), kg(M_SUN), 0.1, 1.0).is_none());
        assert!(planet_mass_from_rv(k, days(f64::NAN), kg(M_SUN), 0.1, 1.0).is_none());
        assert!(rv_semi_amplitude(kg(M_EARTH), days(3.0), kg(M_SUN), f64::NAN, 1.0).is_none());
        // Near-parabolic orbits still give finite answers.
        let mass = planet_mass_from_rv(k, days(3.0), kg(M_SUN), 1.0 - 1e-12, 1.0).expect("mass");
        assert!(mass.value.is_finite() && mass.value > 0.0);
        // Across a huge range of K (mass ratios from ~1e-9 to far above 1) the solver returns
        // a mass that reproduces K.
        for &k_mps in &[1e-3, 0.1, 10.0, 1e3, 1e5, 1e6, 1e7] {
            let k = Velocity::new::<meter_per_second>(k_mps);
            for &p in &[0.3, 30.0, 3e4] {
                let mass = planet_mass_from_rv(k, days(p), kg(M_SUN), 0.2, 0.7).expect("mass");
                let back = rv_semi_amplitude(mass, days(p), kg(M_SUN), 0.2, 0.7).expect("K");
                assert!(close(value_of(back / k), 1.0, 1e-12), "K {k_mps} P {p}");
            }
        }
        // Enormous K (companion far heavier than the star) still converges.
        let huge = Velocity::new::<kilometer_per_second>(5000.0);
        let mass = planet_mass_from_rv(huge, days(3.0), kg(M_SUN), 0.0, 1.0).expect("mass");
        let k_back = rv_semi_amplitude(mass, days(3.0), kg(M_SUN), 0.0, 1.0).expect("K");
        assert!(close(value_of(k_back / huge), 1.0, 1e-10));
    }
}

mod transit {
    use super::*;

    #[test]
    fn earth_transit_depth_across_the_sun() {
        // (R_earth / R_sun)^2 = 84 ppm (common practice), with IAU 2015 B3 nominal radii.
        let k = R_EARTH / R_SUN;
        let depth = depth_from_radius_ratio(k).expect("depth");
        assert!((depth * 1e6 - 84.0).abs() < 0.5, "{depth}");
        let back = radius_ratio_from_depth(84.05e-6).expect("k");
        assert!(close(back, k, 1e-3));
        assert!(radius_ratio_from_depth(0.0).is_none());
        assert!(radius_ratio_from_depth(-1e-4).is_none());
        assert!(radius_ratio_from_depth(1.5).is_none());
    }

    #[test]
    fn impact_and_inclination_round_trip() {
        // Winn 2010 eq. 7, circular and eccentric.
        for &(e, w) in &[(0.0, 0.0), (0.3, 40.0), (0.8, -120.0), (0.95, 90.0)] {
            for &b in &[0.0, 0.2, 0.7, 1.05] {
                let i = inclination_from_impact(b, 40.0, e, deg(w)).expect("inclination");
                let back = impact_from_inclination(i, 40.0, e, deg(w)).expect("impact");
                assert!((back - b).abs() < 1e-12, "e {e} w {w} b {b} back {back}");
            }
        }
        // b = 0 is edge-on.
        let i = inclination_from_impact(0.0, 10.0, 0.0, deg(0.0)).expect("inclination");
        assert!((i.get::<degree>() - 90.0).abs() < 1e-12);
        // Circular: b = (a/R*) cos i; cos 80 deg * 10 = 1.7365 (direct arithmetic).
        let b = impact_from_inclination(deg(80.0), 10.0, 0.0, deg(0.0)).expect("impact");
        assert!((b - 1.736_481_776_669_303_5).abs() < 1e-12);
        // No inclination gives b > a/R*; a/R* <= 1 is inside the star.
        assert!(inclination_from_impact(11.0, 10.0, 0.0, deg(0.0)).is_none());
        assert!(inclination_from_impact(0.5, 0.9, 0.0, deg(0.0)).is_none());
        assert!(inclination_from_impact(-0.1, 10.0, 0.0, deg(0.0)).is_none());
        assert!(inclination_from_impact(0.5, 10.0, 1.0, deg(0.0)).is_none());
        // e = 0.95 transiting at periastron with a/R* = 15: r/R* = 0.75, inside the star.
        assert!(inclination_from_impact(0.2, 15.0, 0.95, deg(90.0)).is_none());
        assert!(impact_from_inclination(deg(89.0), 15.0, 0.95, deg(90.0)).is_none());
    }

    #[test]
    fn central_transit_duration_circular() {
        // Winn 2010 eq. 14 with b = 0, e = 0: T14 = P/pi asin((1 + k)/(a/R*)).
        let (a_r, k, p) = (8.8, 0.12, days(3.5));
        let t14 = transit_duration_total(p, a_r, k, 0.0, 0.0, deg(90.0)).expect("T14");
        let expected = 3.5 * DAY / PI * ((1.0 + k) / a_r).asin();
        assert!(close(t14.get::<second>(), expected, 1e-12));
        let t23 = transit_duration_full(p, a_r, k, 0.0, 0.0, deg(90.0)).expect("T23");
        let expected = 3.5 * DAY / PI * ((1.0 - k) / a_r).asin();
        assert!(close(t23.get::<second>(), expected, 1e-12));
        assert!(t23 < t14);
    }

    #[test]
    fn earths_central_transit_lasts_about_thirteen_hours() {
        // Earth crossing the Sun's centre as seen from afar: about 13 h (common practice).
        let a_r = AU / R_SUN;
        let k = R_EARTH / R_SUN;
        let t14 = transit_duration_total(days(SIDEREAL_YEAR_DAYS), a_r, k, 0.0, 0.0, deg(0.0))
            .expect("T14");
        let hours = t14.get::<second>() / 3600.0;
        assert!((hours - 13.0).abs() < 0.2, "{hours}");
    }

    #[test]
    fn eccentric_durations_scale_by_winn_factor() {
        // Winn 2010 eq. 16: at fixed b the durations scale by sqrt(1-e^2)/(1+e sin w).
        let (a_r, k, b, p) = (20.0, 0.1, 0.3, days(12.0));
        let circ = transit_duration_total(p, a_r, k, b, 0.0, deg(0.0)).expect("circular");
        let (e, w) = (0.4, 90.0);
        let ecc = transit_duration_total(p, a_r, k, b, e, deg(w)).expect("eccentric");
        // With the same b, sin i differs between the two cases, so compare with the full formula.
        let cos_i = b * (1.0 + e) / (a_r * (1.0 - e * e));
        let sin_i = (1.0 - cos_i * cos_i).sqrt();
        let expected = 12.0 * DAY / PI
            * (((1.0 + k).powi(2) - b * b).sqrt() / (a_r * sin_i)).asin()
            * (1.0 - e * e).sqrt()
            / (1.0 + e);
        assert!(close(ecc.get::<second>(), expected, 1e-12));
        // Transit at periastron (w = 90 deg) is shorter than a circular one.
        assert!(ecc < circ);
        // Transit near apastron (w = -90 deg) is longer.
        let apo = transit_duration_total(p, a_r, k, b, e, deg(-90.0)).expect("apastron");
        assert!(apo > circ);
    }

    #[test]
    fn grazing_and_missing_transits_are_none() {
        let p = days(3.0);
        // Grazing: b between 1 - k and 1 + k has T14 but no T23.
        assert!(transit_duration_total(p, 10.0, 0.1, 0.95, 0.0, deg(0.0)).is_some());
        assert!(transit_duration_full(p, 10.0, 0.1, 0.95, 0.0, deg(0.0)).is_none());
        // No transit at all.
        assert!(transit_duration_total(p, 10.0, 0.1, 1.2, 0.0, deg(0.0)).is_none());
        assert!(transit_duration_total(p, 10.0, 0.1, 1.1, 0.0, deg(0.0)).is_none());
        // Bad inputs.
        assert!(transit_duration_total(p, 10.0, 0.0, 0.0, 0.0, deg(0.0)).is_none());
        assert!(transit_duration_total(p, 10.0, 0.1, 0.0, 1.0, deg(0.0)).is_none());
        assert!(transit_duration_total(days(0.0), 10.0, 0.1, 0.0, 0.0, deg(0.0)).is_none());
        assert!(transit_duration_full(p, 10.0, 1.2, 0.0, 0.0, deg(0.0)).is_none());
        assert!(transit_duration_total(p, f64::NAN, 0.1, 0.0, 0.0, deg(0.0)).is_none());
        // A companion bigger than its orbit: asin argument above 1.
        assert!(transit_duration_total(p, 1.5, 0.9, 0.0, 0.0, deg(0.0)).is_none());
        // e very close to 1: finite or None, never NaN.
        let t = transit_duration_total(p, 10.0, 0.1, 0.0, 1.0 - 1e-12, deg(90.0));
        assert!(t.is_none_or(|t| t.value.is_finite() && t.value >= 0.0));
        let t = transit_duration_total(p, 10.0, 0.1, 0.0, 1.0 - 1e-12, deg(-90.0));
        assert!(t.is_none_or(|t| t.value.is_finite() && t.value >= 0.0));
    }

    #[test]
    fn stellar_density_from_earths_transit_is_the_suns() {
        // Sun's mean density 1.408 g/cm^3 (Sun fact sheet, NASA GSFC; from memory), recovered
        // from Earth's a/R* and sidereal year (Seager & Mallén-Ornelas 2003).
        let rho =
            stellar_density_from_transit(AU / R_SUN, days(SIDEREAL_YEAR_DAYS)).expect("density");
        assert!(
            (rho.get::<kilogram_per_cubic_meter>() - 1410.0).abs() < 3.0,
            "{:?}",
            rho
        );
        // Consistent with M/(4/3 pi R^3) from the nominal values (IAU 2015 B3).
        let direct = mean_density(kg(M_SUN), m(R_SUN)).expect("density");
        assert!(close(value_of(rho / direct), 1.0, 1e-4));
        assert!(stellar_density_from_transit(0.5, days(1.0)).is_none());
    }
}

mod bulk {
    use super::*;

    #[test]
    fn planet_densities_from_fact_sheets() {
        // Earth 5513 kg/m^3, Jupiter 1326 kg/m^3 (planetary fact sheets, NASA GSFC), from the
        // fact-sheet masses and volumetric mean radii.
        let earth = bulk_density(kg(M_EARTH), m(R_EARTH_MEAN)).expect("earth");
        assert!(
            (earth.get::<kilogram_per_cubic_meter>() - 5513.0).abs() < 2.0,
            "{:?}",
            earth
        );
        let jupiter = bulk_density(kg(M_JUPITER), m(R_JUPITER_MEAN)).expect("jupiter");
        assert!((jupiter.get::<kilogram_per_cubic_meter>() - 1326.0).abs() < 1.0);
        assert!(bulk_density(kg(M_EARTH), m(0.0)).is_none());
        assert!(bulk_density(kg(-1.0), m(R_EARTH)).is_none());
    }

    #[test]
    fn earth_gravity_and_escape_velocity() {
        // Earth fact sheet (NASA GSFC; from memory): surface gravity 9.80 m/s^2 (at the
        // equatorial radius, no rotation), escape velocity 11.186 km/s (volumetric mean radius).
        let g = surface_gravity(kg(M_EARTH), m(R_EARTH)).expect("g");
        assert!((g.value - 9.80).abs() < 0.005, "{:?}", g);
        let v = escape_velocity(kg(M_EARTH), m(R_EARTH_MEAN)).expect("v");
        assert!(
            (v.get::<kilometer_per_second>() - 11.186).abs() < 0.002,
            "{:?}",
            v
        );
        // v_esc = sqrt(2 g R) (energy conservation).
        let g_mean = surface_gravity(kg(M_EARTH), m(R_EARTH_MEAN)).expect("g");
        assert!(close(
            v.value,
            (2.0 * g_mean.value * R_EARTH_MEAN).sqrt(),
            1e-12
        ));
        // GM from the IAU 2015 B3 nominal value, not through M: same result.
        assert!(close(g.value, GM_EARTH / (R_EARTH * R_EARTH), 1e-12));
        assert!(escape_velocity(kg(M_EARTH), m(-1.0)).is_none());
    }
}

mod stability {
    use super::*;

    #[test]
    fn hill_radius_of_earth() {
        // Earth's Hill sphere is about 1.5e6 km (common practice): 1 au (3e-6 / 3)^(1/3).
        let r = hill_radius(m(AU), 0.0167, kg(M_EARTH), kg(M_SUN)).expect("r_H");
        assert!((r.get::<kilometer>() / 1.5e6 - 1.0).abs() < 0.03, "{:?}", r);
        assert!(hill_radius(m(AU), 1.0, kg(M_EARTH), kg(M_SUN)).is_none());
    }

    #[test]
    fn hill_stability_of_two_planets() {
        // Gladman 1993: circular coplanar pair stable beyond 2 sqrt(3) mutual Hill radii.
        assert!(close(HILL_STABLE_SPACING, 2.0 * 3f64.sqrt(), 1e-15));
        let star = kg(M_SUN);
        let mj = kg(M_JUPITER);
        // Jupiter and Saturn (5.2 and 9.58 au; Saturn 95.16 Earth masses, fact sheets):
        // about 4.4 au apart, mutual Hill radius about 0.55 au: some 8 mutual Hill radii,
        // comfortably stable (arithmetic from the fact-sheet values).
        let ms = kg(95.16 * M_EARTH);
        let r_h = mutual_hill_radius(m(5.20 * AU), m(9.58 * AU), mj, ms, star).expect("R_H");
        let expected = ((M_JUPITER + 95.16 * M_EARTH) / (3.0 * M_SUN)).cbrt() * 7.39 * AU;
        assert!(close(r_h.get::<meter>(), expected, 1e-12));
        let spacing = spacing_in_mutual_hill_radii(m(5.20 * AU), m(9.58 * AU), mj, ms, star)
            .expect("spacing");
        assert!((spacing - 7.96).abs() < 0.05, "{spacing}");
        assert_eq!(
            is_hill_stable_circular(m(5.20 * AU), m(9.58 * AU), mj, ms, star),
            Some(true)
        );
        // Two Jupiters 0.05 au apart at 1 au are not.
        assert_eq!(
            is_hill_stable_circular(m(AU), m(1.05 * AU), mj, mj, star),
            Some(false)
        );
        assert_eq!(
            is_hill_stable_circular(m(AU), m(1.05 * AU), mj, kg(0.0), star),
            None
        );
    }

    #[test]
    fn roche_limit_for_an_earth_like_density_around_the_sun() {
        // Fluid Roche limit d = 2.44 R* (rho*/rho_p)^(1/3) (Roche 1849): for the Sun
        // (1410 kg/m^3) and an Earth-density body (5513 kg/m^3) that is about 1.55 R_sun.
        let rho_sun = mean_density(kg(M_SUN), m(R_SUN)).expect("density");
        let rho_p = MassDensity::new::<kilogram_per_cubic_meter>(5513.0);
        let d = roche_limit_fluid(kg(M_SUN), rho_p).expect("Roche");
        let expected = 2.44 * R_SUN * value_of(rho_sun / rho_p).cbrt();
        assert!(close(d.get::<meter>(), expected, 1e-12));
        assert!((d.get::<meter>() / R_SUN - 1.55).abs() < 0.01);
        assert!(
            roche_limit_fluid(kg(M_SUN), MassDensity::new::<kilogram_per_cubic_meter>(0.0))
                .is_none()
        );
    }
}

mod irradiation {
    use super::*;

    #[test]
    fn solar_constant_from_nominal_luminosity() {
        // IAU 2015 B3: L = 3.828e26 W and S = 1361 W/m^2 at 1 au (consistent to ~1e-4).
        let s = insolation(Power::new::<watt>(L_SUN), m(AU)).expect("S");
        assert!(
            close(s.get::<watt_per_square_meter>(), 1361.0, 2e-4),
            "{:?}",
            s
        );
        let rel = insolation_earth_units(Power::new::<watt>(L_SUN), m(AU)).expect("S/S_earth");
        assert!(close(rel, 1.0, 2e-4));
        // Inverse square: at 0.1 au, 100 times more.
        let near = insolation_earth_units(Power::new::<watt>(L_SUN), m(0.1 * AU)).expect("S");
        assert!(close(near, 100.0 * rel, 1e-12));
        assert!(insolation(Power::new::<watt>(L_SUN), m(0.0)).is_none());
    }

    #[test]
    fn earth_equilibrium_temperature() {
        // Earth fact sheet (NASA GSFC): Bond albedo 0.306, blackbody temperature 254.0 K
        // (full redistribution), i.e. about 255 K as usually quoted.
        let t =
            equilibrium_temperature(kelvins(TEFF_SUN), m(R_SUN), m(AU), 0.306, 1.0).expect("Teq");
        assert!((t.get::<kelvin>() - 254.5).abs() < 1.0, "{:?}", t);
        // Dayside-only re-emission (f = 2) is warmer by 2^(1/4).
        let day =
            equilibrium_temperature(kelvins(TEFF_SUN), m(R_SUN), m(AU), 0.306, 2.0).expect("Teq");
        assert!(close(
            day.get::<kelvin>(),
            t.get::<kelvin>() * 2f64.powf(0.25),
            1e-12
        ));
        // Consistency with the flux form sigma T^4 = S (1 - A) f / 4 (radiative balance).
        let s = insolation(Power::new::<watt>(L_SUN), m(AU)).expect("S");
        let t_flux = (s.get::<watt_per_square_meter>() * (1.0 - 0.306) / 4.0 / constants::SIGMA_SB)
            .powf(0.25);
        assert!(close(t.get::<kelvin>(), t_flux, 1e-3));
        assert!(equilibrium_temperature(kelvins(TEFF_SUN), m(R_SUN), m(AU), 1.2, 1.0).is_none());
        assert!(equilibrium_temperature(kelvins(TEFF_SUN), m(R_SUN), m(AU), 0.3, 0.5).is_none());
        assert!(equilibrium_temperature(kelvins(TEFF_SUN), m(R_SUN), m(AU), 0.3, 3.0).is_none());
        assert!(equilibrium_temperature(kelvins(0.0), m(R_SUN), m(AU), 0.3, 1.0).is_none());
    }
}

mod stellar {
    use super::*;

    #[test]
    fn stefan_boltzmann_round_trips_on_the_sun() {
        // IAU 2015 B3 nominal L, R, Teff agree with L = 4 pi R^2 sigma T^4 to about 1e-4.
        let l = luminosity(m(R_SUN), kelvins(TEFF_SUN)).expect("L");
        assert!(close(l.get::<watt>(), L_SUN, 2e-4), "{:?}", l);
        let r = radius_from_luminosity(Power::new::<watt>(L_SUN), kelvins(TEFF_SUN)).expect("R");
        assert!(close(r.get::<meter>(), R_SUN, 1e-4));
        let t = teff_from_luminosity(Power::new::<watt>(L_SUN), m(R_SUN)).expect("Teff");
        assert!(close(t.get::<kelvin>(), TEFF_SUN, 1e-4));
        // Exact inverses of each other.
        let t_back = teff_from_luminosity(l, m(R_SUN)).expect("Teff");
        assert!(close(t_back.get::<kelvin>(), TEFF_SUN, 1e-12));
        let r_back = radius_from_luminosity(l, kelvins(TEFF_SUN)).expect("R");
        assert!(close(r_back.get::<meter>(), R_SUN, 1e-12));
        assert!(luminosity(m(R_SUN), kelvins(-5.0)).is_none());
        assert!(teff_from_luminosity(Power::new::<watt>(0.0), m(R_SUN)).is_none());
    }

    #[test]
    fn solar_log_g() {
        // log g of the Sun = 4.438 in cgs (common practice), from IAU 2015 B3 nominal GM and R.
        let lg = log_g_cgs(kg(M_SUN), m(R_SUN)).expect("log g");
        assert!((lg - 4.438).abs() < 0.001, "{lg}");
        let mass = mass_from_log_g(lg, m(R_SUN)).expect("mass");
        assert!(close(mass.get::<kilogram>(), M_SUN, 1e-12));
        let radius = radius_from_log_g(lg, kg(M_SUN)).expect("radius");
        assert!(close(radius.get::<meter>(), R_SUN, 1e-12));
        assert!(mass_from_log_g(f64::NAN, m(R_SUN)).is_none());
        assert!(mass_from_log_g(400.0, m(R_SUN)).is_none());
        assert!(radius_from_log_g(4.4, kg(0.0)).is_none());
    }
}

mod transiting_axis {
    use super::*;

    #[test]
    fn transiting_axis_is_a_fixed_point_of_kepler_and_the_rv_mass() {
        // Invented planet: K = 1300 m/s, P = 2.6 d, b = 0.85 around 1.1 Msun, 1.3 Rsun.
        let (p, ms, rs) = (days(2.6), kg(1.1 * M_SUN), m(1.3 * R_SUN));
        let k = Velocity::new::<meter_per_second>(1300.0);
        let a = semi_major_axis_transiting(p, ms, k, 0.0, 0.85, deg(90.0), rs).expect("axis");
        // The fixed point: the inclination from this axis (Winn 2010 eq. 7) gives the true
        // mass, and Kepler's third law with that mass gives this axis back.
        let i = inclination_from_impact(0.85, value_of(a / rs), 0.0, deg(90.0)).expect("i");
        let mp = planet_mass_from_rv(k, p, ms, 0.0, i.sin().value).expect("mass");
        let again = semi_major_axis(p, ms, mp).expect("again");
        assert!(close(again.value, a.value, 1e-12));
        let min = minimum_mass_from_rv(k, p, ms, 0.0).expect("min");
        assert!(mp.value > min.value * 1.001, "sin i well below 1 here");
        // An impact parameter beyond a/R* gives no inclination, so no axis.
        assert!(semi_major_axis_transiting(p, ms, k, 0.0, 50.0, deg(90.0), rs).is_none());
    }

    /// The axis over a grid from an Earth-mass planet to a companion of 0.3 Msun, central to
    /// grazing, circular and eccentric: each is a fixed point of the round it is solved by
    /// (inclination from the axis, true mass from the inclination, axis from the mass) to
    /// 1e-14 relative, computed here with the public formulas. Impact parameters go up to
    /// the largest the orbit allows, whether or not a body of the planet's size would still
    /// cross the disc: the solver must hold wherever it is asked. The grid includes heavy
    /// companions on grazing orbits, where the axis and the mass are strongly coupled (the
    /// slope of one round's map, u cot^2 i / (3 + u), above 0.1).
    #[test]
    fn transiting_axis_is_a_fixed_point_across_planets_and_geometries() {
        let (ms, rs) = (kg(M_SUN), m(R_SUN));
        let mut solved = 0;
        let mut coupled = 0;
        let mut unreachable = 0;
        for &mp in &[
            M_EARTH,
            30.0 * M_EARTH,
            M_JUPITER,
            13.0 * M_JUPITER,
            0.3 * M_SUN,
        ] {
            for &p_days in &[0.35, 0.8, 3.0, 40.0] {
                for &(e, w) in &[(0.0, 90.0), (0.3, 200.0), (0.6, 20.0)] {
                    for &q in &[0.0, 0.3, 0.6, 0.9, 0.99] {
                        let p = days(p_days);
                        // The impact parameter as a fraction q of the largest one the orbit
                        // allows, b = q (a/R*) (1 - e^2) / (1 + e sin w) (Winn 2010 eq. 7),
                        // and K of this planet at the inclination that gives.
                        let Some(a0) = semi_major_axis(p, ms, kg(mp)) else {
                            continue;
                        };
                        let b = q * value_of(a0 / rs) * (1.0 - e * e)
                            / (1.0 + e * deg(w).get::<uom::si::angle::radian>().sin());
                        let Some(i) = inclination_from_impact(b, value_of(a0 / rs), e, deg(w))
                        else {
                            continue;
                        };
                        let k = rv_semi_amplitude(kg(mp), p, ms, e, i.sin().value).expect("K");
                        let Some(a) = semi_major_axis_transiting(p, ms, k, e, b, deg(w), rs) else {
                            // Only where the start, the axis of the minimum mass, is too
                            // small for this impact parameter to be reached at all.
                            let min = minimum_mass_from_rv(k, p, ms, e).expect("min mass");
                            let start = semi_major_axis(p, ms, min).expect("axis");
                            assert!(
                                inclination_from_impact(b, value_of(start / rs), e, deg(w))
                                    .is_none(),
                                "mp {mp:e} P {p_days} e {e} q {q}: no axis"
                            );
                            unreachable += 1;
                            continue;
                        };
                        let i = inclination_from_impact(b, value_of(a / rs), e, deg(w))
                            .expect("inclination at the solution");
                        let sin_i = i.sin().value;
                        let mass = planet_mass_from_rv(k, p, ms, e, sin_i).expect("mass");
                        let again = semi_major_axis(p, ms, mass).expect("axis");
                        assert!(
                            close(again.value, a.value, 1e-14),
                            "mp {mp:e} P {p_days} e {e} b {b} (q {q}): {:e} vs {:e}",
                            again.value,
                            a.value
                        );
                        let u = mass.value / ms.value;
                        let slope = u * (1.0 - sin_i * sin_i) / (sin_i * sin_i) / (3.0 + u);
                        if slope > 0.1 {
                            coupled += 1;
                        }
                        solved += 1;
                    }
                }
            }
        }
        assert_eq!(solved + unreachable, 5 * 4 * 3 * 5);
        assert!(unreachable < 20, "{unreachable} cases without an answer");
        assert!(coupled > 0, "no strongly coupled case");
    }
}

mod transit_inverse {
    use super::*;

    fn hours(x: f64) -> Time {
        Time::new::<second>(x * 3600.0)
    }

    /// A worked example: P = 3 d, k = 0.1, T14 = 2.692 h, T23 = 2.116 h (an invented
    /// planet). The expected numbers are Seager & Mallén-Ornelas (2003) eqs. 7–9 written out
    /// here in plain f64, with their depth Delta F = k^2 (so sqrt(Delta F) = k).
    #[test]
    fn durations_give_impact_axis_and_density_as_seager_and_mallen_ornelas() {
        let (p_s, k, t14_s, t23_s) = (3.0 * DAY, 0.1, 2.692 * 3600.0, 2.116 * 3600.0);
        let s14 = (PI * t14_s / p_s).sin().powi(2);
        let s23 = (PI * t23_s / p_s).sin().powi(2);
        // Eq. 7: b = {[(1 - sqrt dF)^2 - (s23/s14)(1 + sqrt dF)^2] / (1 - s23/s14)}^(1/2).
        let b_paper = (((1.0 - k) * (1.0 - k) - s23 / s14 * (1.0 + k) * (1.0 + k))
            / (1.0 - s23 / s14))
            .sqrt();
        // Eq. 8: a/R* = {[(1 + sqrt dF)^2 - b^2 (1 - s14)] / s14}^(1/2).
        let a_paper = (((1.0 + k) * (1.0 + k) - b_paper * b_paper * (1.0 - s14)) / s14).sqrt();
        // Eq. 9: M*/R*^3 = 4 pi^2 / (P^2 G) (a/R*)^3; the mean density is 3/(4 pi) of it.
        // G is CODATA 2018.
        let rho_paper =
            4.0 * PI * PI / (p_s * p_s * 6.674_30e-11) * a_paper.powi(3) * 3.0 / (4.0 * PI);

        let (p, t14, t23) = (days(3.0), hours(2.692), hours(2.116));
        let b = impact_from_durations(p, t14, t23, k, 0.0, deg(90.0)).expect("b");
        assert!(close(b, b_paper, 1e-12), "{b} vs {b_paper}");
        let a = scaled_axis_from_duration(p, t14, k, b, 0.0, deg(90.0)).expect("a/R*");
        assert!(close(a, a_paper, 1e-12), "{a} vs {a_paper}");
        let rho = stellar_density_from_duration(p, t14, k, b, 0.0, deg(90.0)).expect("rho");
        assert!(close(
            rho.get::<kilogram_per_cubic_meter>(),
            rho_paper,
            1e-12
        ));
        // These durations were made for b = 0.4 around a 1 Msun, 1 Rsun star (IAU 2015 B3
        // nominal), whose mean density is 1.410 g/cm^3: the transit gives it back to the
        // rounding of the durations to 1 s.
        assert!((b - 0.4).abs() < 2e-3, "{b}");
        assert!(
            close(rho.get::<kilogram_per_cubic_meter>(), 1409.78, 2e-3),
            "{rho:?}"
        );
    }

    #[test]
    fn the_inverse_undoes_the_forward_durations_circular_and_eccentric() {
        for &(e, w) in &[(0.0, 90.0), (0.3, 40.0), (0.5, -100.0)] {
            for &b in &[0.0, 0.3, 0.7] {
                let (p, a, k) = (days(4.5), 11.0, 0.08);
                let t14 = transit_duration_total(p, a, k, b, e, deg(w)).expect("T14");
                let t23 = transit_duration_full(p, a, k, b, e, deg(w)).expect("T23");
                let back = impact_from_durations(p, t14, t23, k, e, deg(w)).expect("b");
                assert!((back - b).abs() < 1e-7, "e {e} w {w} b {b}: {back}");
                let a_back = scaled_axis_from_duration(p, t14, k, b, e, deg(w)).expect("a");
                assert!(close(a_back, a, 1e-10), "e {e} w {w} b {b}: {a_back}");
            }
        }
    }

    #[test]
    fn durations_in_the_wrong_order_or_out_of_range_give_nothing() {
        let p = days(3.0);
        // T23 longer than T14: no impact parameter.
        assert!(impact_from_durations(p, hours(1.12), hours(1.30), 0.1, 0.0, deg(90.0)).is_none());
        // Equal durations need k = 0.
        assert!(impact_from_durations(p, hours(2.0), hours(2.0), 0.1, 0.0, deg(90.0)).is_none());
        // A duration over half the period is beyond the formula's asin.
        assert!(scaled_axis_from_duration(p, hours(40.0), 0.1, 0.2, 0.0, deg(90.0)).is_none());
        // No transit at b >= 1 + k.
        assert!(scaled_axis_from_duration(p, hours(2.0), 0.1, 1.2, 0.0, deg(90.0)).is_none());
    }
}

/// The area two discs of radii 1 and `k` share at centre separation `b`, over pi: the
/// fraction of a uniform star the planet hides (Mandel & Agol 2002, eq. 1), written out here
/// from the circle–circle intersection (common practice) rather than taken from the code.
fn covered_fraction(k: f64, b: f64) -> f64 {
    if b >= 1.0 + k {
        return 0.0;
    }
    if b <= 1.0 - k {
        return k * k;
    }
    let kappa0 = ((k * k + b * b - 1.0) / (2.0 * k * b)).acos();
    let kappa1 = ((1.0 - k * k + b * b) / (2.0 * b)).acos();
    let lens = (4.0 * b * b - (1.0 + b * b - k * k).powi(2)).sqrt() / 2.0;
    (k * k * kappa0 + kappa1 - lens) / PI
}

#[test]
fn grazing_transits_need_a_larger_radius_ratio_than_sqrt_depth() {
    // Not grazing: exactly sqrt(depth), whatever b.
    for (depth, b) in [(0.01, 0.0), (0.01, 0.89), (8.4e-5, 0.99)] {
        let k = radius_ratio_from_depth_and_impact(depth, b).unwrap();
        assert_eq!(k, depth.sqrt(), "depth {depth}, b {b}");
        assert!(!is_grazing(k, b));
    }
    // Grazing: the k whose covered fraction at b is the depth, larger than sqrt(depth).
    for (depth, b) in [(0.008, 0.95), (0.008, 1.02), (0.002, 1.0), (0.01, 1.05)] {
        let k = radius_ratio_from_depth_and_impact(depth, b).unwrap();
        assert!(is_grazing(k, b), "depth {depth}, b {b}, k {k}");
        assert!(k > depth.sqrt());
        let back = covered_fraction(k, b);
        assert!((back - depth).abs() < 1e-9 * depth, "{back} vs {depth}");
    }
    // A depth of 0.8 % at b = 1.02 needs k = 0.1421, where sqrt(depth) = 0.0894 would make
    // the planet 37 % too small.
    let k = radius_ratio_from_depth_and_impact(0.008, 1.02).unwrap();
    assert!((k - 0.1421).abs() < 5e-4, "{k}");
    // No depth outside (0, 1], no b that is not a number.
    assert!(radius_ratio_from_depth_and_impact(1.2, 0.5).is_none());
    assert!(radius_ratio_from_depth_and_impact(0.01, f64::NAN).is_none());
}

#[test]
fn the_depth_of_a_grazing_transit_is_the_covered_fraction_not_k_squared() {
    // Not grazing: exactly k^2.
    for (k, b) in [(0.1, 0.0), (0.1, 0.9), (0.01, 0.99)] {
        assert_eq!(
            depth_from_radius_ratio_and_impact(k, b),
            Some(k * k),
            "k {k}, b {b}"
        );
    }
    // Grazing: the covered fraction, below k^2, and the inverse of the depth's k.
    for (k, b) in [
        (0.1, 0.95),
        (0.1, 0.98),
        (0.1, 1.08),
        (0.15, 1.1),
        (0.3, 0.9),
    ] {
        let depth = depth_from_radius_ratio_and_impact(k, b).unwrap();
        let expected = covered_fraction(k, b);
        assert!((depth - expected).abs() < 1e-12, "{depth} vs {expected}");
        assert!(depth < k * k);
        let back = radius_ratio_from_depth_and_impact(depth, b).unwrap();
        assert!((back - k).abs() < 1e-8 * k, "{back} vs {k}");
    }
    // k = 0.1 at b = 0.98 covers 0.616 % of the star, not the 1 % of k^2 (an outside check
    // of this case, Mandel & Agol 2002 eq. 1 evaluated with numpy, gave 0.616 %).
    let d = depth_from_radius_ratio_and_impact(0.1, 0.98).unwrap();
    assert!((d - 0.00616).abs() < 5e-6, "{d}");
    // No transit at b >= 1 + k; nothing for a k that is not positive or a b not a number.
    assert!(depth_from_radius_ratio_and_impact(0.1, 1.1).is_none());
    assert!(depth_from_radius_ratio_and_impact(0.1, 1.5).is_none());
    assert!(depth_from_radius_ratio_and_impact(0.0, 0.5).is_none());
    assert!(depth_from_radius_ratio_and_impact(0.1, f64::NAN).is_none());
}

#[test]
fn an_edge_on_orbit_has_an_impact_parameter_of_exactly_zero() {
    // 90 deg in radians has a cosine of 6e-17; the impact parameter is 0, not 1e-15.
    let b = impact_from_inclination(deg(90.0), 19.6, 0.0, deg(90.0)).unwrap();
    assert_eq!(b, 0.0);
    let b = impact_from_inclination(deg(89.9), 19.6, 0.0, deg(90.0)).unwrap();
    assert!(
        (b - 19.6 * (89.9f64).to_radians().cos()).abs() < 1e-12,
        "{b}"
    );
}
