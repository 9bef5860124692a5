//! Kepler's third law in Newton's two-body form, with the planet's mass: the semi-major axis
//! from the period, the period from the axis, the total mass from both, and the mean orbital
//! speed.

use super::domain::{finite, is_non_negative, is_positive};
use super::radial_velocity::{minimum_mass_from_rv, planet_mass_from_rv};
use super::transit::sin_inclination_from_impact;
use super::typed::{gravitational_constant, typed};
use crate::fastmath;
use std::f64::consts::PI;
use uom::si::f64::{Angle, Length, Mass, Time, Velocity};
use uom::si::ratio::ratio;

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

/// Most rounds of [`semi_major_axis_transiting`]'s iteration.
const TRANSITING_AXIS_ROUNDS: usize = 60;

/// Semi-major axis of a transiting planet whose mass is known only through the
/// radial-velocity amplitude `K`, with its **true** mass in Kepler's third law.
///
/// The true mass needs `sin i`, which the transit gives through the impact parameter and
/// `a/R*` (Winn 2010 eq. 7), and `a` needs the true mass (`a^3 = G (M* + Mp) P^2 / (4 pi^2)`):
/// the two are solved together by fixed-point iteration, starting from the minimum mass. Each
/// round changes `a` by a factor `(M* + Mp)^(1/3)`, and `Mp` depends on `a` only through
/// `sin i`, so the map contracts by about `Mp / (3 M*) cot^2 i` per round (far below 1 for
/// any planet) and a few rounds reach rounding level. `None` when any step has no answer (the
/// impact parameter exceeds `a/R*` at some round, bad inputs) or after
/// [`TRANSITING_AXIS_ROUNDS`] rounds without converging to 1e-13 relative.
#[allow(clippy::too_many_arguments)]
pub fn semi_major_axis_transiting(
    period: Time,
    m_star: Mass,
    k: Velocity,
    e: f64,
    impact: f64,
    omega: Angle,
    r_star: Length,
) -> Option<Length> {
    if !is_positive(&r_star) {
        return None;
    }
    let mut a = semi_major_axis(period, m_star, minimum_mass_from_rv(k, period, m_star, e)?)?;
    for _ in 0..TRANSITING_AXIS_ROUNDS {
        let a_over_rstar = (a / r_star).get::<ratio>();
        let sin_i = sin_inclination_from_impact(impact, a_over_rstar, e, omega)?;
        let m_planet = planet_mass_from_rv(k, period, m_star, e, sin_i)?;
        let next = semi_major_axis(period, m_star, m_planet)?;
        let change = ((next - a) / a).get::<ratio>().abs();
        a = next;
        if change <= 1e-13 {
            return finite(a);
        }
    }
    None
}
