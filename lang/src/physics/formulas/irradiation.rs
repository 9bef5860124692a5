//! Irradiation of a planet: the bolometric flux it receives (also in units of Earth's, IAU 2015
//! B3 nominal solar irradiance) and its equilibrium temperature under a stated albedo and heat
//! redistribution.

use super::domain::{finite, finite_f64, is_positive};
use super::typed::value_of;
use crate::constants;
use std::f64::consts::PI;
use uom::si::f64::{HeatFluxDensity, Length, Power, ThermodynamicTemperature};
use uom::si::heat_flux_density::watt_per_square_meter;

/// Bolometric flux received at distance `a`, `S = L / (4 pi a^2)` (inverse-square law). `None`
/// for a non-positive luminosity or distance.
pub fn insolation(luminosity: Power, a: Length) -> Option<HeatFluxDensity> {
    if !(is_positive(&luminosity) && is_positive(&a)) {
        return None;
    }
    finite(luminosity / (4.0 * PI * a * a))
}

/// Insolation relative to Earth's, `S / S_earth`, with `S_earth` the nominal total solar
/// irradiance 1361 W/m^2 (IAU 2015 Resolution B3, [`crate::constants::INSOLATION_EARTH`]).
pub fn insolation_earth_units(luminosity: Power, a: Length) -> Option<f64> {
    let s = insolation(luminosity, a)?;
    finite_f64(value_of(
        s / HeatFluxDensity::new::<watt_per_square_meter>(constants::INSOLATION_EARTH),
    ))
}

/// Equilibrium temperature of a planet,
/// `Teq = Teff sqrt(R* / (2 a)) [f (1 - A)]^(1/4)`
/// (radiative balance with a blackbody star; the same relation as in Hansen 2008, whose
/// redistribution factor `f'` is `f / 4` here — from memory).
///
/// Convention for the redistribution factor `f`: the planet absorbs `pi Rp^2 S (1 - A)` and
/// re-emits it from an area `4 pi Rp^2 / f`. So `f = 1` is full redistribution over the whole
/// sphere, `f = 2` is re-emission from the dayside only, and the largest meaningful value,
/// `f = 8/3`, is instantaneous re-emission (the substellar-limit average). `albedo` is the Bond
/// albedo. The star is treated as a blackbody at `Teff` and the orbit as circular at distance `a`.
///
/// `None` for a non-positive temperature, radius or distance, an albedo outside `[0, 1]`, or
/// `f` outside `[1, 8/3]`.
pub fn equilibrium_temperature(
    teff: ThermodynamicTemperature,
    r_star: Length,
    a: Length,
    albedo: f64,
    redistribution: f64,
) -> Option<ThermodynamicTemperature> {
    if !(is_positive(&teff)
        && is_positive(&r_star)
        && is_positive(&a)
        && albedo.is_finite()
        && (0.0..=1.0).contains(&albedo)
        && redistribution.is_finite()
        && (1.0..=8.0 / 3.0).contains(&redistribution))
    {
        return None;
    }
    let dilution = value_of(r_star / (2.0 * a)).sqrt();
    let absorbed = (redistribution * (1.0 - albedo)).sqrt().sqrt();
    finite(teff * (dilution * absorbed))
}
