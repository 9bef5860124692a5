//! Kepler's third law in Newton's two-body form, with the planet's mass: the semi-major axis
//! from the period, the period from the axis, the total mass from both, and the mean orbital
//! speed.

use super::domain::{finite, is_non_negative, is_positive};
use super::radial_velocity::{mass_function, mass_ratio, mass_ratio_guess};
use super::transit::{sin_inclination_in_orbit, Eccentric};
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
/// the two are solved together, starting from the minimum mass. Each round takes `sin i` from
/// the current `a`, the true mass from that, and `a` from the mass; `Mp` depends on `a` only
/// through `sin i`, so that map moves `a` by a factor of about `Mp / (3 M*) cot^2 i` of its
/// error (far below 1 for any planet). Each round then takes Newton's step along the map's
/// known slope, so one round usually reaches rounding level (two for a heavy companion on a
/// grazing orbit).
/// `None` when any step has no answer (the impact parameter exceeds `a/R*` at some round, bad
/// inputs) or after [`TRANSITING_AXIS_ROUNDS`] rounds without converging.
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
    // The mass function does not change between rounds; each round's mass ratio starts from
    // the previous one, which differs from it only through sin i. The first round starts from
    // the edge-on ratio's guess, unrefined: the rounds solve the ratio anyway, and the axis
    // (which grows only as (1 + u)^(1/3)) is corrected by the first Newton round.
    let f = mass_function(k, period, m_star, e)?;
    let orbit = Eccentric::of(e, omega)?;
    let mut u = mass_ratio_guess(f, m_star)?;
    let mut a = semi_major_axis(period, m_star, m_star * u)?;
    for _ in 0..TRANSITING_AXIS_ROUNDS {
        let a_over_rstar = (a / r_star).get::<ratio>();
        let sin_i = sin_inclination_in_orbit(impact, a_over_rstar, orbit)?;
        u = mass_ratio(f, m_star, sin_i, Some(u))?;
        let next = semi_major_axis(period, m_star, m_star * u)?;
        let change = ((next - a) / a).get::<ratio>();
        // Newton's method on F(a) = A(a) - a, A the round's map a -> next. The map's
        // logarithmic slope is known in closed form,
        // kappa = d ln(next) / d ln(a) = -u cot^2 i / (3 + u)
        // (a^3 grows as 1 + u, u falls as sin i^(-3(1+u)/(3+u)), and sin i grows with a as
        // cot^2 i), so F'(a) = kappa next / a - 1 and the relative step is
        // delta = change / (1 - kappa (1 + change)); kappa <= 0 keeps the divisor >= 1. The
        // relative error left after it is about
        // |F''| / (2 |F'|) delta^2, and d kappa / d ln a is about 2 |kappa| (1 + cot^2 i) (the
        // change of u with a adds terms of order kappa^2), so once |kappa| (1 + cot^2 i)
        // delta^2 is below 1e-16 the result is at rounding level.
        let cot2 = (1.0 - sin_i * sin_i) / (sin_i * sin_i);
        let kappa = -u * cot2 / (3.0 + u);
        let delta = change / (1.0 - kappa * (1.0 + change));
        a *= 1.0 + delta;
        if kappa.abs() * (1.0 + cot2) * delta * delta <= 1e-16 {
            return finite(a);
        }
    }
    None
}
