//! Kepler's third law in Newton's two-body form, with the planet's mass: the semi-major axis
//! from the period, the period from the axis, the total mass from both, and the mean orbital
//! speed.

use super::domain::{finite, is_non_negative, is_positive};
use super::typed::{gravitational_constant, typed};
use crate::fastmath;
use std::f64::consts::PI;
use uom::si::f64::{Length, Mass, Time, Velocity};

/// Semi-major axis of the relative orbit from Kepler's third law with the full mass,
/// `a^3 = G (M* + Mp) P^2 / (4 pi^2)` (Newton's form of Kepler's third law for the two-body
/// problem).
///
/// `m_planet` may be zero (planet mass neglected). `None` for a non-positive period or stellar
/// mass, or a negative planet mass.
pub fn semi_major_axis(period: Time, m_star: Mass, m_planet: Mass) -> Option<Length> {
    if !(is_positive(&period) && is_positive(&m_star) && is_non_negative(&m_planet)) {
        return None;
    }
    let a_cubed =
        gravitational_constant() * (m_star + m_planet) * period * period / (4.0 * PI * PI);
    finite(typed(|| a_cubed.cbrt(), fastmath::cbrt(a_cubed.value)))
}

/// Orbital period from Kepler's third law with the full mass,
/// `P = 2 pi sqrt(a^3 / (G (M* + Mp)))`.
///
/// `None` for a non-positive axis or stellar mass, or a negative planet mass.
pub fn period_from_axis(a: Length, m_star: Mass, m_planet: Mass) -> Option<Time> {
    if !(is_positive(&a) && is_positive(&m_star) && is_non_negative(&m_planet)) {
        return None;
    }
    let p_squared = 4.0 * PI * PI * a * a * a / (gravitational_constant() * (m_star + m_planet));
    finite(p_squared.sqrt())
}

/// Total mass `M* + Mp` of a two-body system from its relative semi-major axis and period,
/// `M = 4 pi^2 a^3 / (G P^2)` (Kepler's third law).
///
/// `None` for a non-positive axis or period.
pub fn total_mass_from_orbit(a: Length, period: Time) -> Option<Mass> {
    if !(is_positive(&a) && is_positive(&period)) {
        return None;
    }
    finite(4.0 * PI * PI * a * a * a / (gravitational_constant() * period * period))
}

/// Mean orbital speed `2 pi a / P`: the circumference of a circle of radius `a` over the period
/// (exact for a circular orbit; for an eccentric one it is `n a`, the mean-motion speed).
///
/// `None` for a non-positive axis or period.
pub fn mean_orbital_speed(a: Length, period: Time) -> Option<Velocity> {
    if !(is_positive(&a) && is_positive(&period)) {
        return None;
    }
    finite(2.0 * PI * a / period)
}
