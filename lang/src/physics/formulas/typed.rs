//! The typed building blocks every formula shares: the dimensions of G and of the
//! Stefan–Boltzmann constant, both constants as `uom` quantities (values from
//! [`crate::constants`]: CODATA 2018 G, sigma from the exact SI 2019 constants), the
//! restoration of the thermodynamic-temperature kind, and [`typed`], which lets a fast routine
//! supply the value of an expression whose dimension the compiler still checks.
//!
//! # Temperatures
//!
//! `uom` gives thermodynamic temperature its own kind, so a temperature rebuilt from a fourth root
//! of `L / (4 pi R^2 sigma)` has the right dimension but the generic kind. [`as_thermodynamic`] is
//! the one place where that kind is restored; the dimension is still checked by the compiler there.

use crate::constants;
use uom::si::f64::{HeatFluxDensity, Mass, Ratio, ThermodynamicTemperature, Time, Volume};
use uom::si::heat_flux_density::watt_per_square_meter;
use uom::si::mass::kilogram;
use uom::si::ratio::ratio;
use uom::si::thermodynamic_temperature::kelvin;
use uom::si::time::second;
use uom::si::volume::cubic_meter;
use uom::typenum::{N1, N2, N3, N4, P1, P3, Z0};

/// A quantity of dimension L^3 M^-1 T^-2, the dimension of G.
type GravitationalConstant =
    uom::si::Quantity<uom::si::ISQ<P3, N1, N2, Z0, Z0, Z0, Z0>, uom::si::SI<f64>, f64>;

/// A quantity of dimension M T^-3 Θ^-4, the dimension of the Stefan–Boltzmann constant.
type StefanBoltzmannConstant =
    uom::si::Quantity<uom::si::ISQ<Z0, P1, N3, Z0, N4, Z0, Z0>, uom::si::SI<f64>, f64>;

/// A quantity of dimension Θ whose kind is the generic one (the result of roots and products).
type AnyKindTemperature =
    uom::si::Quantity<uom::si::ISQ<Z0, Z0, Z0, Z0, P1, Z0, Z0>, uom::si::SI<f64>, f64>;

/// Newton's constant G as a typed quantity (CODATA value from [`crate::constants::G`]).
/// This is the one place the dimension L^3 M^-1 T^-2 is assembled.
pub(super) fn gravitational_constant() -> GravitationalConstant {
    let unit_time = Time::new::<second>(1.0);
    Volume::new::<cubic_meter>(constants::G) / (Mass::new::<kilogram>(1.0) * unit_time * unit_time)
}

/// The Stefan–Boltzmann constant as a typed quantity (from [`crate::constants::SIGMA_SB`]).
pub(super) fn stefan_boltzmann() -> StefanBoltzmannConstant {
    let unit_t = ThermodynamicTemperature::new::<kelvin>(1.0);
    HeatFluxDensity::new::<watt_per_square_meter>(constants::SIGMA_SB)
        / (unit_t * unit_t * unit_t * unit_t)
}

/// Restores the thermodynamic-temperature kind to a quantity of dimension Θ. The SI base unit of
/// Θ is the kelvin, so the stored value is kept as is.
pub(super) fn as_thermodynamic(t: AnyKindTemperature) -> ThermodynamicTemperature {
    ThermodynamicTemperature::new::<kelvin>(t.value)
}

/// The plain number a dimensionless ratio holds.
pub(super) fn value_of(r: Ratio) -> f64 {
    r.get::<ratio>()
}

/// A quantity of the type `shape` returns, holding `si_value`. `shape` is never called: it is
/// the typed expression (such as uom's own cube root) whose dimension the compiler checks,
/// while the value comes from a faster routine ([`crate::fastmath`]).
pub(super) fn typed<D, F>(_shape: F, si_value: f64) -> uom::si::Quantity<D, uom::si::SI<f64>, f64>
where
    D: uom::si::Dimension + ?Sized,
    F: FnOnce() -> uom::si::Quantity<D, uom::si::SI<f64>, f64>,
{
    uom::si::Quantity {
        dimension: std::marker::PhantomData,
        units: std::marker::PhantomData,
        value: si_value,
    }
}
