//! Routes that must not take a shortcut: a companion heavy enough to matter in Kepler's third
//! law (the star's mass from the relative orbit and the radial velocities together,
//! `kepler-stellar-mass-rv`, not with the companion's mass neglected), and a depth that
//! neglects the impact parameter waiting until the impact parameter cannot become known.
//! Every system here is invented.

use super::tests_asymmetric::run;
use crate::constants::{M_JUPITER, M_SUN};
use crate::derive::{BodyResult, Options};
use crate::formulas as f;
use crate::quantities::Qty;
use crate::Analysis;
use uom::si::f64::{Length, Mass, Time, Velocity};
use uom::si::{length::meter, mass::kilogram, time::second, velocity::meter_per_second};

/// Body `i` of the first system (0 is the star).
fn body(a: &Analysis, i: usize) -> &BodyResult {
    a.results
        .first()
        .and_then(|r| r.bodies.get(i))
        .expect("the body")
}

/// The closed form inverts the two relations it rests on: a star and companion put through
/// Kepler's third law (the axis) and the semi-amplitude formula (K) come back out.
#[test]
fn the_star_mass_from_orbit_and_velocities_inverts_both_relations() {
    let day = 86_400.0;
    for (m_star, q, e, sin_i, p_days) in [
        (1.0, 0.06, 0.0, 0.9998, 6.0),
        (0.3, 0.2, 0.4, 0.8, 40.0),
        (1.4, 1e-4, 0.1, 1.0, 365.0),
    ] {
        let ms = Mass::new::<kilogram>(m_star * M_SUN);
        let mp = ms * q;
        let p = Time::new::<second>(p_days * day);
        let a = f::semi_major_axis(p, ms, mp).expect("an axis");
        let k = f::rv_semi_amplitude(mp, p, ms, e, sin_i).expect("a K");
        let back = f::stellar_mass_from_orbit_and_rv(a, p, k, e, sin_i).expect("a mass");
        let rel = (back / ms).value - 1.0;
        assert!(rel.abs() < 1e-12, "{m_star} {q}: {rel}");
    }
    // A companion as heavy as the whole leaves no star.
    let p = Time::new::<second>(10.0 * day);
    let a = Length::new::<meter>(1.5e10);
    let k = Velocity::new::<meter_per_second>(3e5);
    assert_eq!(f::stellar_mass_from_orbit_and_rv(a, p, k, 0.0, 1.0), None);
}

/// A brown-dwarf companion (K = 7 km/s at 6 d, a = 0.06465 au, i = 88.76 deg) around a star
/// with no declared mass. Neglecting the companion gave M* = 1.0014 Msun and Mp = 65.2 Mjup;
/// the two relations solved together give M* = 0.94157 Msun and Mp = 62.657 Mjup (a numpy
/// computation of the same two relations with astropy's constants, done when this test was
/// written: M = 4 pi^2 a^3 / (G P^2), Mp = (P K^3 M^2 / (2 pi G))^(1/3) / sin i).
#[test]
fn a_heavy_companion_is_not_neglected_in_the_stars_mass() {
    let src = r#"system "Thornacre" {
  star thornacre { radius = 1.0 +- 0.01 Rsun; teff = 5800 +- 50 K }
  planet b orbits thornacre {
    period = 6.0 +- 0.0001 d
    semi_major_axis = 0.06465 +- 0.0002 au
    rv_amplitude = 7000 +- 50 m/s
    inclination = 88.76 +- 0.2 deg
  }
}
"#;
    let a = run(src, Options::linear());
    let star = body(&a, 0).get(Qty::StarMass).expect("a mass");
    assert_eq!(star.rule, Some("kepler-stellar-mass-rv"));
    assert!(
        (star.value / M_SUN / 0.941_57 - 1.0).abs() < 1e-4,
        "{}",
        star.value / M_SUN
    );
    let planet = body(&a, 1).get(Qty::Mass).expect("a mass");
    assert!(
        (planet.value / M_JUPITER / 62.657 - 1.0).abs() < 1e-4,
        "{}",
        planet.value / M_JUPITER
    );
    assert!(
        !star.assumptions.iter().any(|x| x.contains("neglected")),
        "{:?}",
        star.assumptions
    );
}

/// A planet seen at i = 80 deg with a/R* of about 19 has b = a cos i / R* = 3.4: it does not
/// transit, so no transit depth follows from its radius. The depth rule that neglects b
/// (depth = k^2) stands in for the impact parameter, and it had fired before the impact
/// parameter was derived a few rounds later: the planet got a depth of 1.06 %.
#[test]
fn a_planet_that_does_not_transit_gets_no_depth() {
    let src = r#"system "Dunmere" {
  star dunmere { mass = 1.0 +- 0.04 Msun; radius = 1.0 +- 0.03 Rsun; teff = 5700 +- 80 K }
  planet b orbits dunmere { period = 10 +- 0.001 d; radius = 1.0 +- 0.05 Rjup; mass = 1.0 +- 0.1 Mjup; inclination = 80 +- 0.5 deg }
}
"#;
    for options in [Options::linear(), Options::default()] {
        let a = run(src, options);
        let planet = body(&a, 1);
        let b = planet.get(Qty::Impact).expect("an impact parameter");
        assert!(b.value > 3.0, "{b:?}");
        assert!(planet.get(Qty::TransitDepth).is_none());
        assert!(planet.get(Qty::TransitDuration).is_none());
    }
    // At i = 89.5 deg it transits (b = 0.17), and the depth is k^2 again.
    let a = run(
        &src.replace("80 +- 0.5 deg", "89.5 +- 0.2 deg"),
        Options::linear(),
    );
    let planet = body(&a, 1);
    assert!(planet.get(Qty::TransitDepth).is_some());
}

/// Two routes as precise as each other are the same information, and the value names the
/// direct one: a star's density from a declared a/R* and period, not through a transit
/// duration derived from that a/R* (both give 1.411 +- 0.015 g/cm^3; the explanation went
/// through the duration).
#[test]
fn of_two_equally_precise_routes_the_direct_one_is_named() {
    let src = r#"system "Thornacre" {
  star thornacre { radius = 1.0 +- 0.01 Rsun; teff = 5800 +- 50 K }
  planet b orbits thornacre { period = 6.0 +- 0.0001 d; scaled_semi_major_axis = 13.90 +- 0.05; radius_ratio = 0.09 +- 0.001; impact = 0.3 +- 0.05 }
}
"#;
    let a = run(src, Options::linear());
    let rho = body(&a, 0).get(Qty::StarDensity).expect("a density");
    assert_eq!(rho.rule, Some("stellar-density-from-transit"), "{rho:?}");
}

/// A companion of 46 % of its star's mass, seen in the star's velocities (no transit): the
/// star's mass comes from the orbit and velocities together (0.718 Msun: 4 pi^2 a^3 /
/// (G P^2) = 1.0487 Msun less Mp = 0.3307 Msun from the mass function; numpy with
/// astropy's constants, done when this test was written), and its density from that mass
/// and its radius (0.718 / 0.9^3 x 1.41 = 1.39 g/cm^3), not from a/R* with the companion
/// neglected (2.03 g/cm^3, the total mass over R*^3).
#[test]
fn a_stars_density_comes_from_its_mass_before_an_approximation() {
    let src = r#"system "Corrim" {
  star corrim { radius = 0.9 +- 0.02 Rsun; teff = 5400 +- 80 K }
  planet b orbits corrim { period = 200.0 +- 0.1 d; semi_major_axis = 0.68 +- 0.004 au; rv_amplitude = 9.0 +- 0.1 km/s; inclination = 45 +- 1 deg; eccentricity = 0.4 +- 0.01 }
}
"#;
    let a = run(src, Options::linear());
    let star = body(&a, 0);
    let rho = star.get(Qty::StarDensity).expect("a density");
    assert_eq!(rho.rule, Some("mean-density-star"), "{rho:?}");
    // 1.39 g/cm^3 = 1390 kg/m^3.
    assert!((rho.value / 1390.0 - 1.0).abs() < 0.01, "{}", rho.value);
    let m = star.get(Qty::StarMass).expect("a mass");
    assert!(
        (m.value / M_SUN / 0.7180 - 1.0).abs() < 1e-3,
        "{}",
        m.value / M_SUN
    );
}
