//! Relations of a star: the Stefan–Boltzmann law linking luminosity, radius and effective
//! temperature, and the surface gravity as the trade quotes it, `log g` in cgs, with the mass
//! or radius it gives.

use super::bulk::surface_gravity;
use super::domain::{finite, finite_f64, is_positive};
use super::typed::{as_thermodynamic, gravitational_constant, stefan_boltzmann};
use std::f64::consts::PI;
use uom::si::acceleration::centimeter_per_second_squared;
use uom::si::f64::{Acceleration, Length, Mass, Power, ThermodynamicTemperature};

/// Luminosity of a blackbody sphere, `L = 4 pi R^2 sigma Teff^4` (Stefan–Boltzmann law).
/// `None` for a non-positive radius or temperature.
pub fn luminosity(radius: Length, teff: ThermodynamicTemperature) -> Option<Power> {
    if !(is_positive(&radius) && is_positive(&teff)) {
        return None;
    }
    finite(4.0 * PI * radius * radius * stefan_boltzmann() * teff * teff * teff * teff)
}

/// Radius from luminosity and effective temperature, `R = sqrt(L / (4 pi sigma Teff^4))`
/// (Stefan–Boltzmann law). `None` for a non-positive luminosity or temperature.
pub fn radius_from_luminosity(luminosity: Power, teff: ThermodynamicTemperature) -> Option<Length> {
    if !(is_positive(&luminosity) && is_positive(&teff)) {
        return None;
    }
    let area = luminosity / (4.0 * PI * stefan_boltzmann() * teff * teff * teff * teff);
    finite(area.sqrt())
}

/// Effective temperature from luminosity and radius, `Teff = (L / (4 pi R^2 sigma))^(1/4)`
/// (Stefan–Boltzmann law). `None` for a non-positive luminosity or radius.
pub fn teff_from_luminosity(luminosity: Power, radius: Length) -> Option<ThermodynamicTemperature> {
    if !(is_positive(&luminosity) && is_positive(&radius)) {
        return None;
    }
    let t_fourth = luminosity / (4.0 * PI * radius * radius * stefan_boltzmann());
    finite(as_thermodynamic(t_fourth.sqrt().sqrt()))
}

/// Surface gravity as the trade quotes it: `log g = log10(g / (1 cm/s^2))` with `g = G M / R^2`
/// (common practice in stellar spectroscopy). `None` for a non-positive mass or radius.
pub fn log_g_cgs(mass: Mass, radius: Length) -> Option<f64> {
    let g = surface_gravity(mass, radius)?;
    finite_f64(g.get::<centimeter_per_second_squared>().log10())
}

/// Gravity `g` from `log g` in cgs (`g = 10^log_g cm/s^2`). `None` if the result is not finite.
fn gravity_from_log_g(log_g: f64) -> Option<Acceleration> {
    if !log_g.is_finite() {
        return None;
    }
    let g = Acceleration::new::<centimeter_per_second_squared>(10f64.powf(log_g));
    (is_positive(&g)).then_some(g)
}

/// Mass from `log g` (cgs) and radius, `M = g R^2 / G`. `None` for a non-finite `log g` or a
/// non-positive radius.
pub fn mass_from_log_g(log_g: f64, radius: Length) -> Option<Mass> {
    if !is_positive(&radius) {
        return None;
    }
    let g = gravity_from_log_g(log_g)?;
    finite(g * radius * radius / gravitational_constant())
}

/// Radius from `log g` (cgs) and mass, `R = sqrt(G M / g)`. `None` for a non-finite `log g` or a
/// non-positive mass.
pub fn radius_from_log_g(log_g: f64, mass: Mass) -> Option<Length> {
    if !is_positive(&mass) {
        return None;
    }
    let g = gravity_from_log_g(log_g)?;
    finite((gravitational_constant() * mass / g).sqrt())
}
