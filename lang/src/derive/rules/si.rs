//! The rules' adapters between the engine's plain SI numbers and the `uom` quantities of
//! the typed formulas.

use crate::formulas as f;
use uom::si::angle::radian;
use uom::si::f64::{
    Angle, Length, Mass, MassDensity, Power, ThermodynamicTemperature, Time, Velocity,
};
use uom::si::length::meter;
use uom::si::mass::kilogram;
use uom::si::mass_density::kilogram_per_cubic_meter;
use uom::si::power::watt;
use uom::si::thermodynamic_temperature::kelvin;
use uom::si::time::second;
use uom::si::velocity::meter_per_second;

pub(super) fn t(x: f64) -> Time {
    Time::new::<second>(x)
}
pub(super) fn m(x: f64) -> Mass {
    Mass::new::<kilogram>(x)
}
pub(super) fn l(x: f64) -> Length {
    Length::new::<meter>(x)
}
pub(super) fn ang(x: f64) -> Angle {
    Angle::new::<radian>(x)
}
pub(super) fn density(x: f64) -> MassDensity {
    MassDensity::new::<kilogram_per_cubic_meter>(x)
}
pub(super) fn vel(x: f64) -> Velocity {
    Velocity::new::<meter_per_second>(x)
}
pub(super) fn temp(x: f64) -> ThermodynamicTemperature {
    ThermodynamicTemperature::new::<kelvin>(x)
}
pub(super) fn pow(x: f64) -> Power {
    Power::new::<watt>(x)
}
pub(super) fn sin_of(i: f64) -> f64 {
    ang(i).sin().value.abs()
}

pub(super) fn mass_earth(x: f64) -> f64 {
    x / crate::constants::M_EARTH
}
pub(super) fn radius_earth(x: f64) -> f64 {
    x / crate::constants::R_EARTH
}
pub(super) fn habitable(edge: f::HabitableEdge, te: f64) -> Option<f64> {
    f::habitable_flux(edge, temp(te)).map(|s| s * crate::constants::INSOLATION_EARTH)
}
pub(super) fn habitable_at(lum: f64, flux: f64) -> Option<f64> {
    f::habitable_distance(pow(lum), flux / crate::constants::INSOLATION_EARTH)
        .map(|v| v.get::<meter>())
}
