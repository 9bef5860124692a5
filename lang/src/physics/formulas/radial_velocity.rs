//! Radial velocity: the star's semi-amplitude `K` from the planet's mass, and its exact
//! inverse, the planet's mass (true for a given `sin i`, or the minimum mass) from `K`, solved
//! without assuming the planet is light.

use super::domain::{finite, is_eccentricity, is_non_negative, is_positive, is_sin_inclination};
use super::typed::{gravitational_constant, typed, value_of};
use crate::fastmath;
use std::f64::consts::PI;
use uom::si::f64::{Mass, Time, Velocity};

/// `(1 - e^2)^(3/2)`, as `x sqrt(x)`: the same number without a general power, which the
/// radial-velocity rules evaluate for every Monte Carlo sample.
fn one_minus_e2_to_three_halves(e: f64) -> f64 {
    let x = 1.0 - e * e;
    x * x.sqrt()
}

/// Radial-velocity semi-amplitude of the star,
/// `K = (2 pi G / P)^(1/3) Mp sin i / (M* + Mp)^(2/3) / sqrt(1 - e^2)`
/// (the standard two-body result, e.g. Lovis & Fischer 2010, "Radial Velocity Techniques for
/// Exoplanets" — from memory).
///
/// Computed as the cube root of `2 pi G Mp^3 sin^3 i / (P (M* + Mp)^2 (1 - e^2)^(3/2))`, which
/// the compiler checks to be a velocity cubed. `m_planet` may be zero (giving `K = 0`).
/// `None` for a non-positive period or stellar mass, a negative planet mass, `e` outside
/// `[0, 1)` or `sin_i` outside `(0, 1]`.
pub fn rv_semi_amplitude(
    m_planet: Mass,
    period: Time,
    m_star: Mass,
    e: f64,
    sin_i: f64,
) -> Option<Velocity> {
    if !(is_non_negative(&m_planet)
        && is_positive(&period)
        && is_positive(&m_star)
        && is_eccentricity(e)
        && is_sin_inclination(sin_i))
    {
        return None;
    }
    let m_total = m_star + m_planet;
    let projected = m_planet * sin_i;
    let ecc = one_minus_e2_to_three_halves(e);
    let k_cubed = 2.0 * PI * gravitational_constant() * projected * projected * projected
        / (period * m_total * m_total * ecc);
    finite(typed(|| k_cubed.cbrt(), fastmath::cbrt(k_cubed.value)))
}

/// Planet mass from the radial-velocity semi-amplitude, the exact inverse of
/// [`rv_semi_amplitude`]: solves the mass-function relation
/// `(Mp sin i)^3 / (M* + Mp)^2 = P K^3 (1 - e^2)^(3/2) / (2 pi G)`
/// (the spectroscopic mass function, the same two-body relation rearranged)
/// for `Mp`, without assuming `Mp << M*`.
///
/// What it returns: the true planet mass `Mp` for the given `sin i`. With `sin_i = 1` it returns
/// the mass that satisfies the relation with `sin i = 1`, which is the trade's minimum mass (the
/// smallest mass consistent with `K`). Because `M* + Mp` depends on the true mass, that minimum
/// mass differs slightly from `Mp_true * sin i` when the planet is not negligible against the
/// star; see [`minimum_mass_from_rv`].
///
/// Method: with `u = Mp / M*` and `phi = f / (M* sin^3 i)`, the relation reads
/// `u^3 = phi (1 + u)^2`, which has exactly one positive root (`mass_ratio`). Newton's
/// method on the cubic itself, from a series start, usually needs one or two steps; where it
/// cannot be used, Newton's method on `h(y) = 3 y - 2 ln(1 + e^y) - ln phi`, `y = ln u`,
/// converges from any start because `h` is increasing (`1 < h' <= 3`) and concave. Either way
/// the mass is accurate to rounding level (a test checks the cubic's residual from
/// `phi = 1e-30` to `1e6`).
///
/// `None` for a non-positive `k`, period or stellar mass, `e` outside `[0, 1)`, `sin_i` outside
/// `(0, 1]`, or if the iteration does not converge (not observed for finite inputs).
pub fn planet_mass_from_rv(
    k: Velocity,
    period: Time,
    m_star: Mass,
    e: f64,
    sin_i: f64,
) -> Option<Mass> {
    let f = mass_function(k, period, m_star, e)?;
    let u = mass_ratio(f, m_star, sin_i, None)?;
    finite(m_star * u)
}

/// The spectroscopic mass function `f = P K^3 (1 - e^2)^(3/2) / (2 pi G)`, a mass; `None`
/// for a non-positive `k`, period or stellar mass, or `e` outside `[0, 1)` (the cases
/// [`planet_mass_from_rv`] has no answer for).
pub(super) fn mass_function(k: Velocity, period: Time, m_star: Mass, e: f64) -> Option<Mass> {
    if !(is_positive(&k) && is_positive(&period) && is_positive(&m_star) && is_eccentricity(e)) {
        return None;
    }
    Some(
        period * k * k * k * one_minus_e2_to_three_halves(e)
            / (2.0 * PI * gravitational_constant()),
    )
}

/// The mass ratio `u = Mp / M*` for the mass function `f` (see [`mass_function`]) and
/// `sin_i`: the positive root of `u^3 = phi (1 + u)^2`, `phi = f / (M* sin^3 i)`, to rounding
/// level. `start`, when given, is the root of a nearby problem (the previous round of an
/// iteration) and saves the starting guess's cube roots. `None` for `sin_i` outside
/// `(0, 1]`, a `phi` that is not positive and finite, or no convergence.
pub(super) fn mass_ratio(f: Mass, m_star: Mass, sin_i: f64, start: Option<f64>) -> Option<f64> {
    if !is_sin_inclination(sin_i) {
        return None;
    }
    let phi = value_of(f / (m_star * sin_i.powi(3)));
    if !(phi.is_finite() && phi > 0.0) {
        return None;
    }
    // Fast path: Newton on the cubic g(u) = u^3 - phi (1 + u)^2 itself (arithmetic only).
    // The start: the given one, or the small-planet series u = c (1 + 2c/3 + c^2/3 + O(c^3)),
    // c = phi^(1/3) (from u = c (1 + u)^(2/3)), where c is small, phi + 2 where phi is large,
    // and c (1 + c)^(2/3) between. g is convex where the root lies (g'' = 6u - 2 phi > 0
    // for u > phi/3, and the root exceeds phi^(1/3)), so after the first step the iterates
    // decrease monotonically onto the root, each step squaring the relative error. Anything
    // unusual (a flat slope, no convergence) falls through to the log-space iteration below,
    // which converges from any start.
    {
        let mut u = match start.filter(|s| s.is_finite() && *s > 0.0) {
            Some(s) => s,
            None => ratio_start(phi),
        };
        for _ in 0..60 {
            let g = u * u * u - phi * (1.0 + u) * (1.0 + u);
            let slope = 3.0 * u * u - 2.0 * phi * (1.0 + u);
            if !(slope > 0.0 && g.is_finite()) {
                break;
            }
            let step = g / slope;
            u -= step;
            if !(u.is_finite() && u > 0.0) {
                break;
            }
            // Quadratic convergence: after a step s the error left is about
            // g'' / (2 g') s^2, at most 2 (s/u)^2 u here (the factor is 1 for a light planet
            // and 2 for a companion far heavier than the star), so a step below 1e-8 u
            // leaves the root at rounding level.
            if step.abs() <= 1e-8 * u {
                return Some(u);
            }
        }
    }
    let ln_phi = phi.ln();
    // ln(1 + e^y) without overflow.
    let softplus = |y: f64| {
        if y > 0.0 {
            y + (-y).exp().ln_1p()
        } else {
            y.exp().ln_1p()
        }
    };
    // Start from the small-planet solution u = phi^(1/3) (1 + phi^(1/3))^(2/3).
    let c = fastmath::cbrt(phi);
    let mut y = c.ln() + (2.0 / 3.0) * c.ln_1p();
    let newton_step = |y: f64| {
        let h = 3.0 * y - 2.0 * softplus(y) - ln_phi;
        // d/dy ln(1 + e^y) = 1 / (1 + e^-y)
        let slope = 3.0 - 2.0 / (1.0 + (-y).exp());
        h / slope
    };
    for _ in 0..100 {
        let step = newton_step(y);
        y -= step;
        if !y.is_finite() {
            return None;
        }
        if step.abs() <= 1e-10 * y.abs().max(1.0) {
            // Quadratic convergence: one more step brings the error to rounding level in y;
            // e^y carries the rounding of y (a few units in the last place times |y|), which
            // one Newton step on the cubic itself removes where its slope is positive.
            y -= newton_step(y);
            let mut u = y.exp();
            let slope = 3.0 * u * u - 2.0 * phi * (1.0 + u);
            if slope > 0.0 {
                u -= (u * u * u - phi * (1.0 + u) * (1.0 + u)) / slope;
            }
            return Some(u).filter(|u| u.is_finite() && *u > 0.0);
        }
    }
    None
}

/// The starting guess for the root of `u^3 = phi (1 + u)^2` (see [`mass_ratio`]): the
/// small-planet series where `phi^(1/3)` is small, `phi + 2` for a companion heavier than the
/// star, and `c (1 + c)^(2/3)` between.
fn ratio_start(phi: f64) -> f64 {
    let c = fastmath::cbrt_guess(phi);
    if c < 0.1 {
        c * (1.0 + c * (2.0 / 3.0 + c / 3.0))
    } else if phi > 8.0 {
        // A companion heavier than the star: u = phi (1 + 1/u)^2 = phi + 2 + O(1/phi).
        phi + 2.0
    } else {
        c * fastmath::cbrt_guess((1.0 + c) * (1.0 + c))
    }
}

/// The starting guess of [`mass_ratio`] for the mass function `f` and `sin i = 1`, without
/// solving: where an iteration refines the ratio anyway. `None` where [`mass_ratio`] has no
/// answer (a ratio `f / M*` that is not positive and finite).
pub(super) fn mass_ratio_guess(f: Mass, m_star: Mass) -> Option<f64> {
    let phi = value_of(f / m_star);
    (phi.is_finite() && phi > 0.0).then(|| ratio_start(phi))
}

/// Minimum planet mass from the radial-velocity semi-amplitude: [`planet_mass_from_rv`] with
/// `sin i = 1` (the mass that gives `K` for an edge-on orbit), solved exactly.
pub fn minimum_mass_from_rv(k: Velocity, period: Time, m_star: Mass, e: f64) -> Option<Mass> {
    planet_mass_from_rv(k, period, m_star, e, 1.0)
}

/// The star's mass from the relative orbit and the radial velocities together, where the
/// planet's mass is not known beforehand: Kepler's third law gives the total
/// `M = M* + Mp = 4 pi^2 a^3 / (G P^2)`, and with the total known the mass function
/// `f = (Mp sin i)^3 / M^2 = P K^3 (1 - e^2)^(3/2) / (2 pi G)` gives
/// `Mp = (f M^2)^(1/3) / sin i` in closed form; `M* = M - Mp`. Both relations are those of
/// [`rv_semi_amplitude`] and `kepler::total_mass_from_orbit`, so no light planet is assumed.
///
/// `None` for a non-positive axis, period or `k`, `e` outside `[0, 1)`, `sin_i` outside
/// `(0, 1]`, or a companion at least as heavy as the whole (no star left).
pub fn stellar_mass_from_orbit_and_rv(
    a: uom::si::f64::Length,
    period: Time,
    k: Velocity,
    e: f64,
    sin_i: f64,
) -> Option<Mass> {
    if !(is_positive(&k) && is_eccentricity(e) && is_sin_inclination(sin_i)) {
        return None;
    }
    let total = super::kepler::total_mass_from_orbit(a, period)?;
    let f = period * k * k * k * one_minus_e2_to_three_halves(e)
        / (2.0 * PI * gravitational_constant());
    let projected_cubed = f * total * total;
    let m_planet = typed(
        || projected_cubed.cbrt(),
        fastmath::cbrt(projected_cubed.value),
    ) / sin_i;
    let m_star = total - m_planet;
    (is_positive(&m_star)).then_some(())?;
    finite(m_star)
}
