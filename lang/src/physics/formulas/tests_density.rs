//! The mass and radius of a sphere from its mean density (the inverses of `mean_density`).

use super::*;
use uom::si::f64::{Length, Mass, MassDensity};
use uom::si::length::kilometer;
use uom::si::mass::kilogram;
use uom::si::mass_density::kilogram_per_cubic_meter;

fn rel(a: f64, b: f64) -> f64 {
    ((a - b) / b).abs()
}

#[test]
fn earth_from_its_mean_density() {
    // NASA Earth fact sheet: volumetric mean radius 6371.000 km, mean density 5513 kg/m^3,
    // mass 5.9722e24 kg (density given to four digits, so agreement to about 1e-4).
    let rho = MassDensity::new::<kilogram_per_cubic_meter>(5513.0);
    let r = Length::new::<kilometer>(6371.0);
    let mass = mass_from_density(rho, r).expect("mass");
    assert!(rel(mass.get::<kilogram>(), 5.9722e24) < 2e-4, "{mass:?}");
    let radius = radius_from_density(rho, Mass::new::<kilogram>(5.9722e24)).expect("radius");
    assert!(rel(radius.get::<kilometer>(), 6371.0) < 1e-4, "{radius:?}");
}

#[test]
fn inverse_of_mean_density() {
    // Both inverses return the mean density's own inputs to rounding.
    for (m, r) in [(1.989e30, 6.957e8), (5.9722e24, 6.371e6), (1.0, 1e-3)] {
        let (m, r) = (Mass::new::<kilogram>(m), Length::new::<kilometer>(r / 1e3));
        let rho = mean_density(m, r).expect("density");
        let back = mass_from_density(rho, r).expect("mass");
        assert!(rel(back.get::<kilogram>(), m.get::<kilogram>()) < 1e-14);
        let back = radius_from_density(rho, m).expect("radius");
        assert!(rel(back.get::<kilometer>(), r.get::<kilometer>()) < 1e-14);
    }
}

#[test]
fn no_value_outside_the_domain() {
    let r = Length::new::<kilometer>(1.0);
    let m = Mass::new::<kilogram>(1.0);
    for rho in [0.0, -1.0, f64::NAN, f64::INFINITY] {
        let rho = MassDensity::new::<kilogram_per_cubic_meter>(rho);
        assert!(mass_from_density(rho, r).is_none(), "{rho:?}");
        assert!(radius_from_density(rho, m).is_none(), "{rho:?}");
    }
    let one = MassDensity::new::<kilogram_per_cubic_meter>(1.0);
    assert!(mass_from_density(one, Length::new::<kilometer>(0.0)).is_none());
    assert!(radius_from_density(one, Mass::new::<kilogram>(-1.0)).is_none());
}
