//! Physics formulas for stars and their planets, over typed `uom` quantities.
//!
//! This module owns the closed-form relations the derivation engine and the physics checker use:
//! Kepler's third law (with the planet's mass), the radial-velocity semi-amplitude and its exact
//! inverse, transit geometry and durations, planetary bulk properties, orbital stability and tidal
//! limits, irradiation and equilibrium temperature, and the stellar Stefan–Boltzmann and
//! surface-gravity relations. Every function is pure and works in SI through `uom::si::f64`, so a
//! dimension slip (a mass where a length belongs, a missing power of a period) fails to compile.
//! Physical constants are read from [`crate::constants`]; none are repeated here (the only
//! numbers defined here are two dimensionless formula coefficients, each with its source).
//!
//! # Conventions
//!
//! * Dimensionless inputs and outputs (eccentricity `e`, impact parameter `b`, radius ratio
//!   `k = Rp/R*`, scaled semi-major axis `a/R*`, transit depth, `sin i`, albedo, redistribution
//!   factor) are plain `f64`; angles are [`Angle`].
//! * `omega` is the argument of periastron **of the planet's orbit**, as in Winn (2010), sec. 2:
//!   the transit happens at true anomaly `pi/2 - omega`. Radial-velocity fits often quote the
//!   star's argument of periastron, which differs from the planet's by 180 degrees.
//! * Every function returns `Option`. `None` means an input lies outside the formula's domain
//!   (non-finite, a mass/length/period that is not positive, `e` outside `[0, 1)`, `sin i`
//!   outside `(0, 1]`, ...) or the geometry has no answer (no transit, no full transit). When a
//!   function returns `Some`, the value is finite. No function panics.
//! * Planet masses may be zero where they only add to the star's mass (Kepler's law), so the
//!   "planet mass neglected" form is the same call with a zero planet mass.
//!
//! # Temperatures
//!
//! `uom` gives thermodynamic temperature its own kind, so a temperature rebuilt from a fourth root
//! of `L / (4 pi R^2 sigma)` has the right dimension but the generic kind. `as_thermodynamic` is
//! the one place where that kind is restored; the dimension is still checked by the compiler there.

use crate::constants;
use crate::fastmath;
use std::f64::consts::PI;
use uom::si::acceleration::centimeter_per_second_squared;
use uom::si::f64::{
    Acceleration, Angle, HeatFluxDensity, Length, Mass, MassDensity, Power, Ratio,
    ThermodynamicTemperature, Time, Velocity, Volume,
};
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

/// Classical coefficient of the fluid-body Roche limit, `d = 2.44 R_M (rho_M / rho_m)^(1/3)`
/// (Roche 1849; the textbook value, from memory; refined equilibrium-figure treatments give
/// about 2.455).
pub const ROCHE_FLUID_COEFFICIENT: f64 = 2.44;

/// Gladman (1993) criterion for two planets on circular, coplanar orbits: they are Hill stable
/// when their separation exceeds `2 sqrt(3)` mutual Hill radii.
pub const HILL_STABLE_SPACING: f64 = 3.464_101_615_137_754_6;

/// Newton's constant G as a typed quantity (CODATA value from [`crate::constants::G`]).
/// This is the one place the dimension L^3 M^-1 T^-2 is assembled.
fn gravitational_constant() -> GravitationalConstant {
    let unit_time = Time::new::<second>(1.0);
    Volume::new::<cubic_meter>(constants::G) / (Mass::new::<kilogram>(1.0) * unit_time * unit_time)
}

/// The Stefan–Boltzmann constant as a typed quantity (from [`crate::constants::SIGMA_SB`]).
fn stefan_boltzmann() -> StefanBoltzmannConstant {
    let unit_t = ThermodynamicTemperature::new::<kelvin>(1.0);
    HeatFluxDensity::new::<watt_per_square_meter>(constants::SIGMA_SB)
        / (unit_t * unit_t * unit_t * unit_t)
}

/// Restores the thermodynamic-temperature kind to a quantity of dimension Θ. The SI base unit of
/// Θ is the kelvin, so the stored value is kept as is.
fn as_thermodynamic(t: AnyKindTemperature) -> ThermodynamicTemperature {
    ThermodynamicTemperature::new::<kelvin>(t.value)
}

// ---------------------------------------------------------------------------------------------
// Domain checks
// ---------------------------------------------------------------------------------------------

fn is_positive<D>(q: &uom::si::Quantity<D, uom::si::SI<f64>, f64>) -> bool
where
    D: uom::si::Dimension + ?Sized,
{
    q.value.is_finite() && q.value > 0.0
}

fn is_non_negative<D>(q: &uom::si::Quantity<D, uom::si::SI<f64>, f64>) -> bool
where
    D: uom::si::Dimension + ?Sized,
{
    q.value.is_finite() && q.value >= 0.0
}

/// `Some(q)` when the result is finite, so no NaN or infinity leaves this module.
fn finite<D>(
    q: uom::si::Quantity<D, uom::si::SI<f64>, f64>,
) -> Option<uom::si::Quantity<D, uom::si::SI<f64>, f64>>
where
    D: uom::si::Dimension + ?Sized,
{
    q.value.is_finite().then_some(q)
}

fn finite_f64(x: f64) -> Option<f64> {
    x.is_finite().then_some(x)
}

/// A bound eccentricity: finite and in `[0, 1)`.
fn is_eccentricity(e: f64) -> bool {
    e.is_finite() && (0.0..1.0).contains(&e)
}

/// `sin i` in `(0, 1]`.
fn is_sin_inclination(sin_i: f64) -> bool {
    sin_i.is_finite() && sin_i > 0.0 && sin_i <= 1.0
}

/// `a/R*` finite and above 1 (the orbit lies outside the star).
fn is_scaled_axis(a_over_rstar: f64) -> bool {
    a_over_rstar.is_finite() && a_over_rstar > 1.0
}

/// `(1 - e^2)^(3/2)`, as `x sqrt(x)`: the same number without a general power, which the
/// radial-velocity rules evaluate for every Monte Carlo sample.
fn one_minus_e2_to_three_halves(e: f64) -> f64 {
    let x = 1.0 - e * e;
    x * x.sqrt()
}

fn value_of(r: Ratio) -> f64 {
    r.get::<ratio>()
}

/// A quantity of the type `shape` returns, holding `si_value`. `shape` is never called: it is
/// the typed expression (such as uom's own cube root) whose dimension the compiler checks,
/// while the value comes from a faster routine ([`crate::fastmath`]).
fn typed<D, F>(_shape: F, si_value: f64) -> uom::si::Quantity<D, uom::si::SI<f64>, f64>
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

// ---------------------------------------------------------------------------------------------
// Kepler's third law
// ---------------------------------------------------------------------------------------------

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

// ---------------------------------------------------------------------------------------------
// Radial velocity
// ---------------------------------------------------------------------------------------------

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
/// `u^3 = phi (1 + u)^2`, which has exactly one positive root. Newton's method on
/// `h(y) = 3 y - 2 ln(1 + e^y) - ln phi`, `y = ln u`, converges from any start because `h` is
/// increasing (`1 < h' <= 3`) and concave; once a step falls below 1e-10 one more step is
/// taken, which leaves the mass accurate to rounding level (about 1e-15 relative).
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
    if !(is_positive(&k)
        && is_positive(&period)
        && is_positive(&m_star)
        && is_eccentricity(e)
        && is_sin_inclination(sin_i))
    {
        return None;
    }
    // Mass function f = P K^3 (1 - e^2)^(3/2) / (2 pi G), a mass.
    let mass_function: Mass = period * k * k * k * one_minus_e2_to_three_halves(e)
        / (2.0 * PI * gravitational_constant());
    let phi = value_of(mass_function / (m_star * sin_i.powi(3)));
    if !(phi.is_finite() && phi > 0.0) {
        return None;
    }
    // Fast path: Newton on the cubic g(u) = u^3 - phi (1 + u)^2 itself (arithmetic only),
    // from the small-planet guess u0 = c (1 + c)^(2/3), c = phi^(1/3). g is convex where
    // the root lies (g'' = 6u - 2 phi > 0 for u > phi/3, and the root exceeds phi^(1/3)), so
    // after the first step the iterates decrease monotonically onto the root. Anything
    // unusual (a flat slope, no convergence) falls through to the log-space iteration below,
    // which converges from any start.
    {
        let c = fastmath::cbrt_guess(phi);
        let mut u = c * fastmath::cbrt_guess((1.0 + c) * (1.0 + c));
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
            if step.abs() <= 1e-9 * u {
                let g = u * u * u - phi * (1.0 + u) * (1.0 + u);
                let slope = 3.0 * u * u - 2.0 * phi * (1.0 + u);
                if slope > 0.0 {
                    u -= g / slope;
                }
                if u.is_finite() && u > 0.0 {
                    return finite(m_star * u);
                }
                break;
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
            // Quadratic convergence: one more step brings the error to rounding level.
            y -= newton_step(y);
            return finite(m_star * y.exp());
        }
    }
    None
}

/// Minimum planet mass from the radial-velocity semi-amplitude: [`planet_mass_from_rv`] with
/// `sin i = 1` (the mass that gives `K` for an edge-on orbit), solved exactly.
pub fn minimum_mass_from_rv(k: Velocity, period: Time, m_star: Mass, e: f64) -> Option<Mass> {
    planet_mass_from_rv(k, period, m_star, e, 1.0)
}

// ---------------------------------------------------------------------------------------------
// Transits
// ---------------------------------------------------------------------------------------------

/// Transit depth from the radius ratio, `depth = k^2` (the occulted fraction of a uniform stellar
/// disc, no limb darkening; Winn 2010 sec. 2). `None` for a non-positive or non-finite `k`.
pub fn depth_from_radius_ratio(radius_ratio: f64) -> Option<f64> {
    if !(radius_ratio.is_finite() && radius_ratio > 0.0) {
        return None;
    }
    finite_f64(radius_ratio * radius_ratio)
}

/// Radius ratio from the transit depth, `k = Rp / R* = sqrt(depth)` (Winn 2010 sec. 2). This is
/// the no-limb-darkening approximation: a limb-darkened star makes a central transit deeper than
/// `k^2`, so this `k` is an estimate. `depth` is a fraction (84 ppm = 8.4e-5). `None` for a
/// depth outside `(0, 1]`.
pub fn radius_ratio_from_depth(depth: f64) -> Option<f64> {
    if !(depth.is_finite() && depth > 0.0 && depth <= 1.0) {
        return None;
    }
    finite_f64(depth.sqrt())
}

/// Star–planet distance at mid-transit in stellar radii,
/// `r / R* = (a / R*) (1 - e^2) / (1 + e sin omega)` (the eccentric factor of Winn 2010 eq. 7).
/// `None` for bad inputs or when `r / R* <= 1` (the planet would be inside the star at
/// conjunction).
fn conjunction_distance(a_over_rstar: f64, e: f64, omega: Angle) -> Option<f64> {
    if !(omega.value.is_finite() && is_scaled_axis(a_over_rstar) && is_eccentricity(e)) {
        return None;
    }
    let r = a_over_rstar * (1.0 - e * e) / (1.0 + e * omega.sin().get::<ratio>());
    (r.is_finite() && r > 1.0).then_some(r)
}

/// Impact parameter from the inclination,
/// `b = (a / R*) cos i (1 - e^2) / (1 + e sin omega)` (Winn 2010 eq. 7).
///
/// The impact parameter is non-negative by convention, so `|cos i|` is used: `i` and
/// `180 deg - i` give the same `b`. `None` for a non-finite angle, `a/R* <= 1`, `e` outside
/// `[0, 1)`, or when the star–planet distance at conjunction is at most one stellar radius.
pub fn impact_from_inclination(
    inclination: Angle,
    a_over_rstar: f64,
    e: f64,
    omega: Angle,
) -> Option<f64> {
    if !inclination.value.is_finite() {
        return None;
    }
    let r = conjunction_distance(a_over_rstar, e, omega)?;
    finite_f64(r * inclination.cos().get::<ratio>().abs())
}

/// Inclination from the impact parameter, inverting Winn 2010 eq. 7:
/// `cos i = b (1 + e sin omega) / ((a / R*) (1 - e^2))`, returned in `[0, 90 deg]`.
///
/// `None` for a negative `b`, `a/R* <= 1`, `e` outside `[0, 1)`, a star–planet distance at
/// conjunction of at most one stellar radius, or when no inclination gives this `b`
/// (`cos i > 1`: `b` exceeds that distance).
pub fn inclination_from_impact(
    impact: f64,
    a_over_rstar: f64,
    e: f64,
    omega: Angle,
) -> Option<Angle> {
    cos_inclination(impact, a_over_rstar, e, omega).map(|c| Ratio::new::<ratio>(c).acos())
}

fn cos_inclination(impact: f64, a_over_rstar: f64, e: f64, omega: Angle) -> Option<f64> {
    if !(impact.is_finite() && impact >= 0.0) {
        return None;
    }
    let cos_i = impact / conjunction_distance(a_over_rstar, e, omega)?;
    (cos_i.is_finite() && cos_i <= 1.0).then_some(cos_i)
}

/// Shared body of Winn 2010 eqs. 14–16: `T = P/pi asin[(R*/a) sqrt(chord^2 - b^2) / sin i]`
/// times `sqrt(1 - e^2) / (1 + e sin omega)`, with `chord = 1 + k` or `1 - k`.
fn transit_duration(
    period: Time,
    a_over_rstar: f64,
    chord: f64,
    impact: f64,
    e: f64,
    omega: Angle,
) -> Option<Time> {
    if !is_positive(&period) {
        return None;
    }
    let cos_i = cos_inclination(impact, a_over_rstar, e, omega)?;
    let sin_i = (1.0 - cos_i * cos_i).sqrt();
    let half_chord_sq = chord * chord - impact * impact;
    if !(half_chord_sq > 0.0 && sin_i > 0.0) {
        return None;
    }
    let arg = half_chord_sq.sqrt() / (a_over_rstar * sin_i);
    // arg > 1 means the planet would overlap the star for more than half an orbit: the
    // formula's geometry does not apply.
    if !(arg.is_finite() && arg <= 1.0) {
        return None;
    }
    let eccentric = (1.0 - e * e).sqrt() / (1.0 + e * omega.sin().get::<ratio>());
    finite(period / PI * arg.asin() * eccentric)
}

/// Total transit duration T14 (first to fourth contact),
/// `T14 = P/pi asin[(R*/a) sqrt((1 + k)^2 - b^2) / sin i]` (Winn 2010 eq. 14), times the
/// eccentric factor `sqrt(1 - e^2) / (1 + e sin omega)` (Winn 2010 eq. 16, which treats the
/// star–planet distance as constant during the transit). `sin i` is obtained from `b` with
/// Winn 2010 eq. 7.
///
/// `None` when there is no transit (`b >= 1 + k`), for a non-positive period or `k`,
/// `a/R* <= 1`, `e` outside `[0, 1)`, a `b` no inclination can give, or when the asin argument
/// exceeds 1 (the planet would overlap the star for over half an orbit).
pub fn transit_duration_total(
    period: Time,
    a_over_rstar: f64,
    radius_ratio: f64,
    impact: f64,
    e: f64,
    omega: Angle,
) -> Option<Time> {
    if !(radius_ratio.is_finite() && radius_ratio > 0.0) {
        return None;
    }
    transit_duration(period, a_over_rstar, 1.0 + radius_ratio, impact, e, omega)
}

/// Full transit duration T23 (second to third contact, planet wholly inside the disc),
/// `T23 = P/pi asin[(R*/a) sqrt((1 - k)^2 - b^2) / sin i]` (Winn 2010 eq. 15), times the
/// eccentric factor of Winn 2010 eq. 16 (see [`transit_duration_total`]).
///
/// `None` when there is no full transit (a grazing transit, `b >= 1 - k`, or `k >= 1`), and for
/// the same bad inputs as [`transit_duration_total`].
pub fn transit_duration_full(
    period: Time,
    a_over_rstar: f64,
    radius_ratio: f64,
    impact: f64,
    e: f64,
    omega: Angle,
) -> Option<Time> {
    if !(radius_ratio.is_finite() && radius_ratio > 0.0 && radius_ratio < 1.0) {
        return None;
    }
    transit_duration(period, a_over_rstar, 1.0 - radius_ratio, impact, e, omega)
}

/// Stellar mean density from the transit's scaled semi-major axis and the period,
/// `rho* = 3 pi (a / R*)^3 / (G P^2)` (Seager & Mallén-Ornelas 2003 eq. 9 with `a/R*` in place
/// of its expression in the transit shape; Winn 2010 eq. 30 without the `k^3 rho_p` term).
/// Neglects the planet's mass: the result is an estimate biased high by the factor
/// `1 + Mp/M*`.
///
/// `None` for `a/R* <= 1` or a non-positive period.
pub fn stellar_density_from_transit(a_over_rstar: f64, period: Time) -> Option<MassDensity> {
    if !(is_scaled_axis(a_over_rstar) && is_positive(&period)) {
        return None;
    }
    finite(3.0 * PI * a_over_rstar.powi(3) / (gravitational_constant() * period * period))
}

// ---------------------------------------------------------------------------------------------
// Bodies: density, gravity, escape velocity
// ---------------------------------------------------------------------------------------------

/// Mean density of a sphere, `rho = M / (4/3 pi R^3)`. `None` for a non-positive mass or radius.
pub fn mean_density(mass: Mass, radius: Length) -> Option<MassDensity> {
    if !(is_positive(&mass) && is_positive(&radius)) {
        return None;
    }
    finite(mass / (4.0 / 3.0 * PI * radius * radius * radius))
}

/// A planet's bulk density, `rho = M / (4/3 pi R^3)` (same relation as [`mean_density`]).
pub fn bulk_density(mass: Mass, radius: Length) -> Option<MassDensity> {
    mean_density(mass, radius)
}

/// Surface gravity `g = G M / R^2` (Newton's law of gravitation; no rotation). `None` for a
/// non-positive mass or radius.
pub fn surface_gravity(mass: Mass, radius: Length) -> Option<Acceleration> {
    if !(is_positive(&mass) && is_positive(&radius)) {
        return None;
    }
    finite(gravitational_constant() * mass / (radius * radius))
}

/// Escape velocity from the surface, `v = sqrt(2 G M / R)` (energy conservation). `None` for a
/// non-positive mass or radius.
pub fn escape_velocity(mass: Mass, radius: Length) -> Option<Velocity> {
    if !(is_positive(&mass) && is_positive(&radius)) {
        return None;
    }
    finite((2.0 * gravitational_constant() * mass / radius).sqrt())
}

// ---------------------------------------------------------------------------------------------
// Stability and tidal limits
// ---------------------------------------------------------------------------------------------

/// Hill radius at periastron, `r_H = a (1 - e) (Mp / (3 M*))^(1/3)` (Hill sphere of the
/// restricted three-body problem; the `(1 - e)` periastron form as in Hamilton & Burns 1992 —
/// from memory). `None` for a non-positive axis or masses, or `e` outside `[0, 1)`.
pub fn hill_radius(a: Length, e: f64, m_planet: Mass, m_star: Mass) -> Option<Length> {
    if !(is_positive(&a) && is_eccentricity(e) && is_positive(&m_planet) && is_positive(&m_star)) {
        return None;
    }
    let mass_ratio = value_of(m_planet / (3.0 * m_star));
    finite(a * (1.0 - e) * fastmath::cbrt(mass_ratio))
}

/// Mutual Hill radius of two planets,
/// `R_H,m = ((m1 + m2) / (3 M*))^(1/3) (a1 + a2) / 2` (Gladman 1993; the same definition in
/// Chambers, Wetherill & Boss 1996 — from memory). `None` for any non-positive input.
pub fn mutual_hill_radius(
    a1: Length,
    a2: Length,
    m1: Mass,
    m2: Mass,
    m_star: Mass,
) -> Option<Length> {
    if !(is_positive(&a1)
        && is_positive(&a2)
        && is_positive(&m1)
        && is_positive(&m2)
        && is_positive(&m_star))
    {
        return None;
    }
    let mass_ratio = value_of((m1 + m2) / (3.0 * m_star));
    finite(fastmath::cbrt(mass_ratio) * (a1 + a2) / 2.0)
}

/// Orbital separation `|a2 - a1|` in units of the mutual Hill radius ([`mutual_hill_radius`]).
/// `None` for any non-positive input.
pub fn spacing_in_mutual_hill_radii(
    a1: Length,
    a2: Length,
    m1: Mass,
    m2: Mass,
    m_star: Mass,
) -> Option<f64> {
    let r_h = mutual_hill_radius(a1, a2, m1, m2, m_star)?;
    finite_f64(value_of((a2 - a1).abs() / r_h))
}

/// Gladman (1993) Hill-stability test for two planets on circular, coplanar orbits: stable when
/// the separation exceeds [`HILL_STABLE_SPACING`] (`2 sqrt(3)`) mutual Hill radii. Eccentric or
/// inclined orbits need Gladman's fuller criterion, which this does not apply. `None` for any
/// non-positive input.
pub fn is_hill_stable_circular(
    a1: Length,
    a2: Length,
    m1: Mass,
    m2: Mass,
    m_star: Mass,
) -> Option<bool> {
    spacing_in_mutual_hill_radii(a1, a2, m1, m2, m_star).map(|d| d > HILL_STABLE_SPACING)
}

/// Fluid-body Roche limit around a star,
/// `d = 2.44 R* (rho* / rho_p)^(1/3) = 2.44 (3 M* / (4 pi rho_p))^(1/3)` (Roche 1849; the
/// second form substitutes `rho* = 3 M* / (4 pi R*^3)`, so only the star's mass and the planet's
/// density are needed). Uses [`ROCHE_FLUID_COEFFICIENT`]. `None` for a non-positive mass or
/// density.
pub fn roche_limit_fluid(m_star: Mass, planet_density: MassDensity) -> Option<Length> {
    if !(is_positive(&m_star) && is_positive(&planet_density)) {
        return None;
    }
    let volume: Volume = 3.0 * m_star / (4.0 * PI * planet_density);
    finite(ROCHE_FLUID_COEFFICIENT * volume.cbrt())
}

// ---------------------------------------------------------------------------------------------
// Irradiation and equilibrium temperature
// ---------------------------------------------------------------------------------------------

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

// ---------------------------------------------------------------------------------------------
// Stars
// ---------------------------------------------------------------------------------------------

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

#[cfg(test)]
mod tests {
    use super::*;
    use crate::constants::{
        AU, DAY, GM_EARTH, L_SUN, M_EARTH, M_JUPITER, M_SUN, R_EARTH, R_JUPITER, R_SUN, TEFF_SUN,
    };
    use uom::si::angle::degree;
    use uom::si::length::{kilometer, meter};
    use uom::si::mass_density::kilogram_per_cubic_meter;
    use uom::si::power::watt;
    use uom::si::velocity::{kilometer_per_second, meter_per_second};

    fn close(actual: f64, expected: f64, rel: f64) -> bool {
        ((actual - expected) / expected).abs() <= rel
    }

    fn m(x: f64) -> Length {
        Length::new::<meter>(x)
    }
    fn kg(x: f64) -> Mass {
        Mass::new::<kilogram>(x)
    }
    fn days(x: f64) -> Time {
        Time::new::<second>(x * DAY)
    }
    fn deg(x: f64) -> Angle {
        Angle::new::<degree>(x)
    }
    fn kelvins(x: f64) -> ThermodynamicTemperature {
        ThermodynamicTemperature::new::<kelvin>(x)
    }

    /// Earth's sidereal year, 365.256363004 d (IERS / Astronomical Almanac; from memory).
    const SIDEREAL_YEAR_DAYS: f64 = 365.256_363_004;
    /// Earth's volumetric mean radius, 6371.0 km (Earth fact sheet, NASA GSFC; from memory).
    const R_EARTH_MEAN: f64 = 6.371_0e6;
    /// Jupiter's volumetric mean radius, 69 911 km (Jupiter fact sheet, NASA GSFC; from memory).
    const R_JUPITER_MEAN: f64 = 6.991_1e7;

    #[test]
    fn earth_orbit_from_the_suns_mass_is_one_au() {
        // 1 au at one sidereal year (IAU 2012 B2 au; Earth fact sheet a = 1.000 au) within 1e-4.
        let a = semi_major_axis(days(SIDEREAL_YEAR_DAYS), kg(M_SUN), kg(M_EARTH)).expect("orbit");
        assert!(close(a.get::<meter>(), AU, 1e-4), "{:?}", a);
        // And back.
        let p = period_from_axis(a, kg(M_SUN), kg(M_EARTH)).expect("period");
        assert!(close(p.get::<second>(), SIDEREAL_YEAR_DAYS * DAY, 1e-12));
        let total = total_mass_from_orbit(a, p).expect("mass");
        assert!(close(total.get::<kilogram>(), M_SUN + M_EARTH, 1e-12));
    }

    #[test]
    fn jupiter_axis_from_its_period() {
        // Jupiter fact sheet (NASA GSFC): sidereal period 4332.589 d, semi-major axis
        // 778.479e6 km (from memory). The fact-sheet axis is a mean element perturbed by Saturn,
        // so agreement is at the 2e-4 level.
        let a = semi_major_axis(days(4332.589), kg(M_SUN), kg(M_JUPITER)).expect("orbit");
        assert!(close(a.get::<kilometer>(), 778.479e6, 5e-4), "{:?}", a);
    }

    #[test]
    fn planet_mass_matters_in_keplers_law() {
        // Including Jupiter's mass lengthens the axis by (1 + Mj/Msun)^(1/3) (Kepler's third law).
        let p = days(4332.589);
        let with = semi_major_axis(p, kg(M_SUN), kg(M_JUPITER)).expect("with");
        let without = semi_major_axis(p, kg(M_SUN), kg(0.0)).expect("without");
        let expected = (1.0 + M_JUPITER / M_SUN).cbrt();
        assert!(close(value_of(with / without), expected, 1e-12));
    }

    #[test]
    fn solar_reflex_velocities() {
        // Sun's reflex due to Jupiter about 12.5 m/s, due to Earth about 0.09 m/s (common
        // practice).
        // Eccentricities 0.0489 and 0.0167 (fact sheets).
        let kj = rv_semi_amplitude(kg(M_JUPITER), days(4332.589), kg(M_SUN), 0.0489, 1.0)
            .expect("K jupiter");
        assert!(
            (kj.get::<meter_per_second>() - 12.5).abs() < 0.1,
            "{:?}",
            kj
        );
        let ke = rv_semi_amplitude(
            kg(M_EARTH),
            days(SIDEREAL_YEAR_DAYS),
            kg(M_SUN),
            0.0167,
            1.0,
        )
        .expect("K earth");
        assert!(
            (ke.get::<meter_per_second>() - 0.0894).abs() < 0.0005,
            "{:?}",
            ke
        );
    }

    #[test]
    fn rv_scales_as_expected() {
        // K is proportional to sin i and to 1/sqrt(1 - e^2) (RV semi-amplitude formula).
        let base = rv_semi_amplitude(kg(M_JUPITER), days(10.0), kg(M_SUN), 0.0, 1.0).expect("K");
        let tilted = rv_semi_amplitude(kg(M_JUPITER), days(10.0), kg(M_SUN), 0.0, 0.5).expect("K");
        let eccentric =
            rv_semi_amplitude(kg(M_JUPITER), days(10.0), kg(M_SUN), 0.6, 1.0).expect("K");
        assert!(close(value_of(tilted / base), 0.5, 1e-12));
        assert!(close(value_of(eccentric / base), 1.0 / 0.8, 1e-12));
        // Zero planet mass gives K = 0.
        let none = rv_semi_amplitude(kg(0.0), days(10.0), kg(M_SUN), 0.0, 1.0).expect("K");
        assert_eq!(none.get::<meter_per_second>(), 0.0);
    }

    #[test]
    fn rv_mass_round_trips_from_earth_to_half_the_star() {
        let star = kg(M_SUN);
        let masses = [
            M_EARTH,
            10.0 * M_EARTH,
            M_JUPITER,
            13.0 * M_JUPITER,
            0.1 * M_SUN,
            0.5 * M_SUN,
        ];
        let cases = [(0.0, 1.0), (0.3, 0.8), (0.9, 0.2), (0.999, 1.0)];
        for &mp in &masses {
            for &(e, sin_i) in &cases {
                for &p in &[0.5, 4.2, 365.25, 4000.0] {
                    let k = rv_semi_amplitude(kg(mp), days(p), star, e, sin_i).expect("K");
                    let back = planet_mass_from_rv(k, days(p), star, e, sin_i).expect("mass");
                    assert!(
                        close(back.get::<kilogram>(), mp, 1e-10),
                        "mp {mp} e {e} sin_i {sin_i} P {p}: got {:?}",
                        back
                    );
                }
            }
        }
    }

    #[test]
    fn minimum_mass_is_not_the_naive_product_for_heavy_companions() {
        // For a companion of 0.5 Msun seen at sin i = 0.5, the edge-on solution is below the
        // true mass but differs from Mp sin i because M* + Mp changes (mass-function algebra).
        let star = kg(M_SUN);
        let mp = 0.5 * M_SUN;
        let k = rv_semi_amplitude(kg(mp), days(100.0), star, 0.0, 0.5).expect("K");
        let min = minimum_mass_from_rv(k, days(100.0), star, 0.0).expect("min mass");
        let min = min.get::<kilogram>();
        assert!(min < mp);
        assert!((min / (0.5 * mp) - 1.0).abs() > 0.05, "min {min}");
        // It reproduces K edge-on.
        let k_edge = rv_semi_amplitude(kg(min), days(100.0), star, 0.0, 1.0).expect("K");
        assert!(close(value_of(k_edge / k), 1.0, 1e-12));
        // For an Earth-mass planet the two agree to about Mp/M* (small-planet limit).
        let k = rv_semi_amplitude(kg(M_EARTH), days(100.0), star, 0.0, 0.5).expect("K");
        let min = minimum_mass_from_rv(k, days(100.0), star, 0.0).expect("min mass");
        assert!(close(min.get::<kilogram>(), 0.5 * M_EARTH, 1e-5));
    }

    #[test]
    fn rv_inverse_rejects_bad_input() {
        let k = Velocity::new::<meter_per_second>(10.0);
        assert!(planet_mass_from_rv(k, days(3.0), kg(M_SUN), 1.0, 1.0).is_none());
        assert!(planet_mass_from_rv(k, days(3.0), kg(M_SUN), -0.1, 1.0).is_none());
        assert!(planet_mass_from_rv(k, days(3.0), kg(M_SUN), 0.1, 0.0).is_none());
        assert!(planet_mass_from_rv(k, days(3.0), kg(M_SUN), 0.1, 1.01).is_none());
        assert!(planet_mass_from_rv(k, days(-3.0), kg(M_SUN), 0.1, 1.0).is_none());
        assert!(planet_mass_from_rv(k, days(3.0), kg(0.0), 0.1, 1.0).is_none());
        assert!(planet_mass_from_rv(-k, days(3.0), kg(M_SUN), 0.1, 1.0).is_none());
        assert!(planet_mass_from_rv(k, days(f64::NAN), kg(M_SUN), 0.1, 1.0).is_none());
        assert!(rv_semi_amplitude(kg(M_EARTH), days(3.0), kg(M_SUN), f64::NAN, 1.0).is_none());
        // Near-parabolic orbits still give finite answers.
        let mass = planet_mass_from_rv(k, days(3.0), kg(M_SUN), 1.0 - 1e-12, 1.0).expect("mass");
        assert!(mass.value.is_finite() && mass.value > 0.0);
        // Across a huge range of K (mass ratios from ~1e-9 to far above 1) the solver returns
        // a mass that reproduces K.
        for &k_mps in &[1e-3, 0.1, 10.0, 1e3, 1e5, 1e6, 1e7] {
            let k = Velocity::new::<meter_per_second>(k_mps);
            for &p in &[0.3, 30.0, 3e4] {
                let mass = planet_mass_from_rv(k, days(p), kg(M_SUN), 0.2, 0.7).expect("mass");
                let back = rv_semi_amplitude(mass, days(p), kg(M_SUN), 0.2, 0.7).expect("K");
                assert!(close(value_of(back / k), 1.0, 1e-12), "K {k_mps} P {p}");
            }
        }
        // Enormous K (companion far heavier than the star) still converges.
        let huge = Velocity::new::<kilometer_per_second>(5000.0);
        let mass = planet_mass_from_rv(huge, days(3.0), kg(M_SUN), 0.0, 1.0).expect("mass");
        let k_back = rv_semi_amplitude(mass, days(3.0), kg(M_SUN), 0.0, 1.0).expect("K");
        assert!(close(value_of(k_back / huge), 1.0, 1e-10));
    }

    #[test]
    fn earth_transit_depth_across_the_sun() {
        // (R_earth / R_sun)^2 = 84 ppm (common practice), with IAU 2015 B3 nominal radii.
        let k = R_EARTH / R_SUN;
        let depth = depth_from_radius_ratio(k).expect("depth");
        assert!((depth * 1e6 - 84.0).abs() < 0.5, "{depth}");
        let back = radius_ratio_from_depth(84.05e-6).expect("k");
        assert!(close(back, k, 1e-3));
        assert!(radius_ratio_from_depth(0.0).is_none());
        assert!(radius_ratio_from_depth(-1e-4).is_none());
        assert!(radius_ratio_from_depth(1.5).is_none());
    }

    #[test]
    fn impact_and_inclination_round_trip() {
        // Winn 2010 eq. 7, circular and eccentric.
        for &(e, w) in &[(0.0, 0.0), (0.3, 40.0), (0.8, -120.0), (0.95, 90.0)] {
            for &b in &[0.0, 0.2, 0.7, 1.05] {
                let i = inclination_from_impact(b, 40.0, e, deg(w)).expect("inclination");
                let back = impact_from_inclination(i, 40.0, e, deg(w)).expect("impact");
                assert!((back - b).abs() < 1e-12, "e {e} w {w} b {b} back {back}");
            }
        }
        // b = 0 is edge-on.
        let i = inclination_from_impact(0.0, 10.0, 0.0, deg(0.0)).expect("inclination");
        assert!((i.get::<degree>() - 90.0).abs() < 1e-12);
        // Circular: b = (a/R*) cos i; cos 80 deg * 10 = 1.7365 (direct arithmetic).
        let b = impact_from_inclination(deg(80.0), 10.0, 0.0, deg(0.0)).expect("impact");
        assert!((b - 1.736_481_776_669_303_5).abs() < 1e-12);
        // No inclination gives b > a/R*; a/R* <= 1 is inside the star.
        assert!(inclination_from_impact(11.0, 10.0, 0.0, deg(0.0)).is_none());
        assert!(inclination_from_impact(0.5, 0.9, 0.0, deg(0.0)).is_none());
        assert!(inclination_from_impact(-0.1, 10.0, 0.0, deg(0.0)).is_none());
        assert!(inclination_from_impact(0.5, 10.0, 1.0, deg(0.0)).is_none());
        // e = 0.95 transiting at periastron with a/R* = 15: r/R* = 0.75, inside the star.
        assert!(inclination_from_impact(0.2, 15.0, 0.95, deg(90.0)).is_none());
        assert!(impact_from_inclination(deg(89.0), 15.0, 0.95, deg(90.0)).is_none());
    }

    #[test]
    fn central_transit_duration_circular() {
        // Winn 2010 eq. 14 with b = 0, e = 0: T14 = P/pi asin((1 + k)/(a/R*)).
        let (a_r, k, p) = (8.8, 0.12, days(3.5));
        let t14 = transit_duration_total(p, a_r, k, 0.0, 0.0, deg(90.0)).expect("T14");
        let expected = 3.5 * DAY / PI * ((1.0 + k) / a_r).asin();
        assert!(close(t14.get::<second>(), expected, 1e-12));
        let t23 = transit_duration_full(p, a_r, k, 0.0, 0.0, deg(90.0)).expect("T23");
        let expected = 3.5 * DAY / PI * ((1.0 - k) / a_r).asin();
        assert!(close(t23.get::<second>(), expected, 1e-12));
        assert!(t23 < t14);
    }

    #[test]
    fn earths_central_transit_lasts_about_thirteen_hours() {
        // Earth crossing the Sun's centre as seen from afar: about 13 h (common practice).
        let a_r = AU / R_SUN;
        let k = R_EARTH / R_SUN;
        let t14 = transit_duration_total(days(SIDEREAL_YEAR_DAYS), a_r, k, 0.0, 0.0, deg(0.0))
            .expect("T14");
        let hours = t14.get::<second>() / 3600.0;
        assert!((hours - 13.0).abs() < 0.2, "{hours}");
    }

    #[test]
    fn eccentric_durations_scale_by_winn_factor() {
        // Winn 2010 eq. 16: at fixed b the durations scale by sqrt(1-e^2)/(1+e sin w).
        let (a_r, k, b, p) = (20.0, 0.1, 0.3, days(12.0));
        let circ = transit_duration_total(p, a_r, k, b, 0.0, deg(0.0)).expect("circular");
        let (e, w) = (0.4, 90.0);
        let ecc = transit_duration_total(p, a_r, k, b, e, deg(w)).expect("eccentric");
        // With the same b, sin i differs between the two cases, so compare with the full formula.
        let cos_i = b * (1.0 + e) / (a_r * (1.0 - e * e));
        let sin_i = (1.0 - cos_i * cos_i).sqrt();
        let expected = 12.0 * DAY / PI
            * (((1.0 + k).powi(2) - b * b).sqrt() / (a_r * sin_i)).asin()
            * (1.0 - e * e).sqrt()
            / (1.0 + e);
        assert!(close(ecc.get::<second>(), expected, 1e-12));
        // Transit at periastron (w = 90 deg) is shorter than a circular one.
        assert!(ecc < circ);
        // Transit near apastron (w = -90 deg) is longer.
        let apo = transit_duration_total(p, a_r, k, b, e, deg(-90.0)).expect("apastron");
        assert!(apo > circ);
    }

    #[test]
    fn grazing_and_missing_transits_are_none() {
        let p = days(3.0);
        // Grazing: b between 1 - k and 1 + k has T14 but no T23.
        assert!(transit_duration_total(p, 10.0, 0.1, 0.95, 0.0, deg(0.0)).is_some());
        assert!(transit_duration_full(p, 10.0, 0.1, 0.95, 0.0, deg(0.0)).is_none());
        // No transit at all.
        assert!(transit_duration_total(p, 10.0, 0.1, 1.2, 0.0, deg(0.0)).is_none());
        assert!(transit_duration_total(p, 10.0, 0.1, 1.1, 0.0, deg(0.0)).is_none());
        // Bad inputs.
        assert!(transit_duration_total(p, 10.0, 0.0, 0.0, 0.0, deg(0.0)).is_none());
        assert!(transit_duration_total(p, 10.0, 0.1, 0.0, 1.0, deg(0.0)).is_none());
        assert!(transit_duration_total(days(0.0), 10.0, 0.1, 0.0, 0.0, deg(0.0)).is_none());
        assert!(transit_duration_full(p, 10.0, 1.2, 0.0, 0.0, deg(0.0)).is_none());
        assert!(transit_duration_total(p, f64::NAN, 0.1, 0.0, 0.0, deg(0.0)).is_none());
        // A companion bigger than its orbit: asin argument above 1.
        assert!(transit_duration_total(p, 1.5, 0.9, 0.0, 0.0, deg(0.0)).is_none());
        // e very close to 1: finite or None, never NaN.
        let t = transit_duration_total(p, 10.0, 0.1, 0.0, 1.0 - 1e-12, deg(90.0));
        assert!(t.is_none_or(|t| t.value.is_finite() && t.value >= 0.0));
        let t = transit_duration_total(p, 10.0, 0.1, 0.0, 1.0 - 1e-12, deg(-90.0));
        assert!(t.is_none_or(|t| t.value.is_finite() && t.value >= 0.0));
    }

    #[test]
    fn stellar_density_from_earths_transit_is_the_suns() {
        // Sun's mean density 1.408 g/cm^3 (Sun fact sheet, NASA GSFC; from memory), recovered
        // from Earth's a/R* and sidereal year (Seager & Mallén-Ornelas 2003).
        let rho =
            stellar_density_from_transit(AU / R_SUN, days(SIDEREAL_YEAR_DAYS)).expect("density");
        assert!(
            (rho.get::<kilogram_per_cubic_meter>() - 1410.0).abs() < 3.0,
            "{:?}",
            rho
        );
        // Consistent with M/(4/3 pi R^3) from the nominal values (IAU 2015 B3).
        let direct = mean_density(kg(M_SUN), m(R_SUN)).expect("density");
        assert!(close(value_of(rho / direct), 1.0, 1e-4));
        assert!(stellar_density_from_transit(0.5, days(1.0)).is_none());
    }

    #[test]
    fn planet_densities_from_fact_sheets() {
        // Earth 5513 kg/m^3, Jupiter 1326 kg/m^3 (planetary fact sheets, NASA GSFC), from the
        // fact-sheet masses and volumetric mean radii.
        let earth = bulk_density(kg(M_EARTH), m(R_EARTH_MEAN)).expect("earth");
        assert!(
            (earth.get::<kilogram_per_cubic_meter>() - 5513.0).abs() < 2.0,
            "{:?}",
            earth
        );
        let jupiter = bulk_density(kg(M_JUPITER), m(R_JUPITER_MEAN)).expect("jupiter");
        assert!((jupiter.get::<kilogram_per_cubic_meter>() - 1326.0).abs() < 1.0);
        assert!(bulk_density(kg(M_EARTH), m(0.0)).is_none());
        assert!(bulk_density(kg(-1.0), m(R_EARTH)).is_none());
    }

    #[test]
    fn earth_gravity_and_escape_velocity() {
        // Earth fact sheet (NASA GSFC; from memory): surface gravity 9.80 m/s^2 (at the
        // equatorial radius, no rotation), escape velocity 11.186 km/s (volumetric mean radius).
        let g = surface_gravity(kg(M_EARTH), m(R_EARTH)).expect("g");
        assert!((g.value - 9.80).abs() < 0.005, "{:?}", g);
        let v = escape_velocity(kg(M_EARTH), m(R_EARTH_MEAN)).expect("v");
        assert!(
            (v.get::<kilometer_per_second>() - 11.186).abs() < 0.002,
            "{:?}",
            v
        );
        // v_esc = sqrt(2 g R) (energy conservation).
        let g_mean = surface_gravity(kg(M_EARTH), m(R_EARTH_MEAN)).expect("g");
        assert!(close(
            v.value,
            (2.0 * g_mean.value * R_EARTH_MEAN).sqrt(),
            1e-12
        ));
        // GM from the IAU 2015 B3 nominal value, not through M: same result.
        assert!(close(g.value, GM_EARTH / (R_EARTH * R_EARTH), 1e-12));
        assert!(escape_velocity(kg(M_EARTH), m(-1.0)).is_none());
    }

    #[test]
    fn earth_mean_orbital_speed() {
        // 29.78 km/s (Earth fact sheet, NASA GSFC).
        let v = mean_orbital_speed(m(AU), days(SIDEREAL_YEAR_DAYS)).expect("v");
        assert!(
            (v.get::<kilometer_per_second>() - 29.78).abs() < 0.01,
            "{:?}",
            v
        );
    }

    #[test]
    fn hot_giant_at_four_days() {
        // A Jupiter around a Sun-like star at P = 4 d sits near 0.05 au moving at about
        // 130 km/s (common practice).
        let a = semi_major_axis(days(4.0), kg(M_SUN), kg(M_JUPITER)).expect("a");
        assert!((a.get::<meter>() / AU - 0.05).abs() < 0.002, "{:?}", a);
        let v = mean_orbital_speed(a, days(4.0)).expect("v");
        assert!(
            (v.get::<kilometer_per_second>() - 130.0).abs() < 6.0,
            "{:?}",
            v
        );
    }

    #[test]
    fn solar_constant_from_nominal_luminosity() {
        // IAU 2015 B3: L = 3.828e26 W and S = 1361 W/m^2 at 1 au (consistent to ~1e-4).
        let s = insolation(Power::new::<watt>(L_SUN), m(AU)).expect("S");
        assert!(
            close(s.get::<watt_per_square_meter>(), 1361.0, 2e-4),
            "{:?}",
            s
        );
        let rel = insolation_earth_units(Power::new::<watt>(L_SUN), m(AU)).expect("S/S_earth");
        assert!(close(rel, 1.0, 2e-4));
        // Inverse square: at 0.1 au, 100 times more.
        let near = insolation_earth_units(Power::new::<watt>(L_SUN), m(0.1 * AU)).expect("S");
        assert!(close(near, 100.0 * rel, 1e-12));
        assert!(insolation(Power::new::<watt>(L_SUN), m(0.0)).is_none());
    }

    #[test]
    fn earth_equilibrium_temperature() {
        // Earth fact sheet (NASA GSFC): Bond albedo 0.306, blackbody temperature 254.0 K
        // (full redistribution), i.e. about 255 K as usually quoted.
        let t =
            equilibrium_temperature(kelvins(TEFF_SUN), m(R_SUN), m(AU), 0.306, 1.0).expect("Teq");
        assert!((t.get::<kelvin>() - 254.5).abs() < 1.0, "{:?}", t);
        // Dayside-only re-emission (f = 2) is warmer by 2^(1/4).
        let day =
            equilibrium_temperature(kelvins(TEFF_SUN), m(R_SUN), m(AU), 0.306, 2.0).expect("Teq");
        assert!(close(
            day.get::<kelvin>(),
            t.get::<kelvin>() * 2f64.powf(0.25),
            1e-12
        ));
        // Consistency with the flux form sigma T^4 = S (1 - A) f / 4 (radiative balance).
        let s = insolation(Power::new::<watt>(L_SUN), m(AU)).expect("S");
        let t_flux = (s.get::<watt_per_square_meter>() * (1.0 - 0.306) / 4.0 / constants::SIGMA_SB)
            .powf(0.25);
        assert!(close(t.get::<kelvin>(), t_flux, 1e-3));
        assert!(equilibrium_temperature(kelvins(TEFF_SUN), m(R_SUN), m(AU), 1.2, 1.0).is_none());
        assert!(equilibrium_temperature(kelvins(TEFF_SUN), m(R_SUN), m(AU), 0.3, 0.5).is_none());
        assert!(equilibrium_temperature(kelvins(TEFF_SUN), m(R_SUN), m(AU), 0.3, 3.0).is_none());
        assert!(equilibrium_temperature(kelvins(0.0), m(R_SUN), m(AU), 0.3, 1.0).is_none());
    }

    #[test]
    fn stefan_boltzmann_round_trips_on_the_sun() {
        // IAU 2015 B3 nominal L, R, Teff agree with L = 4 pi R^2 sigma T^4 to about 1e-4.
        let l = luminosity(m(R_SUN), kelvins(TEFF_SUN)).expect("L");
        assert!(close(l.get::<watt>(), L_SUN, 2e-4), "{:?}", l);
        let r = radius_from_luminosity(Power::new::<watt>(L_SUN), kelvins(TEFF_SUN)).expect("R");
        assert!(close(r.get::<meter>(), R_SUN, 1e-4));
        let t = teff_from_luminosity(Power::new::<watt>(L_SUN), m(R_SUN)).expect("Teff");
        assert!(close(t.get::<kelvin>(), TEFF_SUN, 1e-4));
        // Exact inverses of each other.
        let t_back = teff_from_luminosity(l, m(R_SUN)).expect("Teff");
        assert!(close(t_back.get::<kelvin>(), TEFF_SUN, 1e-12));
        let r_back = radius_from_luminosity(l, kelvins(TEFF_SUN)).expect("R");
        assert!(close(r_back.get::<meter>(), R_SUN, 1e-12));
        assert!(luminosity(m(R_SUN), kelvins(-5.0)).is_none());
        assert!(teff_from_luminosity(Power::new::<watt>(0.0), m(R_SUN)).is_none());
    }

    #[test]
    fn solar_log_g() {
        // log g of the Sun = 4.438 in cgs (common practice), from IAU 2015 B3 nominal GM and R.
        let lg = log_g_cgs(kg(M_SUN), m(R_SUN)).expect("log g");
        assert!((lg - 4.438).abs() < 0.001, "{lg}");
        let mass = mass_from_log_g(lg, m(R_SUN)).expect("mass");
        assert!(close(mass.get::<kilogram>(), M_SUN, 1e-12));
        let radius = radius_from_log_g(lg, kg(M_SUN)).expect("radius");
        assert!(close(radius.get::<meter>(), R_SUN, 1e-12));
        assert!(mass_from_log_g(f64::NAN, m(R_SUN)).is_none());
        assert!(mass_from_log_g(400.0, m(R_SUN)).is_none());
        assert!(radius_from_log_g(4.4, kg(0.0)).is_none());
    }

    #[test]
    fn hill_radius_of_earth() {
        // Earth's Hill sphere is about 1.5e6 km (common practice): 1 au (3e-6 / 3)^(1/3).
        let r = hill_radius(m(AU), 0.0167, kg(M_EARTH), kg(M_SUN)).expect("r_H");
        assert!((r.get::<kilometer>() / 1.5e6 - 1.0).abs() < 0.03, "{:?}", r);
        assert!(hill_radius(m(AU), 1.0, kg(M_EARTH), kg(M_SUN)).is_none());
    }

    #[test]
    fn hill_stability_of_two_planets() {
        // Gladman 1993: circular coplanar pair stable beyond 2 sqrt(3) mutual Hill radii.
        assert!(close(HILL_STABLE_SPACING, 2.0 * 3f64.sqrt(), 1e-15));
        let star = kg(M_SUN);
        let mj = kg(M_JUPITER);
        // Jupiter and Saturn (5.2 and 9.58 au; Saturn 95.16 Earth masses, fact sheets):
        // about 4.4 au apart, mutual Hill radius about 0.55 au: some 8 mutual Hill radii,
        // comfortably stable (arithmetic from the fact-sheet values).
        let ms = kg(95.16 * M_EARTH);
        let r_h = mutual_hill_radius(m(5.20 * AU), m(9.58 * AU), mj, ms, star).expect("R_H");
        let expected = ((M_JUPITER + 95.16 * M_EARTH) / (3.0 * M_SUN)).cbrt() * 7.39 * AU;
        assert!(close(r_h.get::<meter>(), expected, 1e-12));
        let spacing = spacing_in_mutual_hill_radii(m(5.20 * AU), m(9.58 * AU), mj, ms, star)
            .expect("spacing");
        assert!((spacing - 7.96).abs() < 0.05, "{spacing}");
        assert_eq!(
            is_hill_stable_circular(m(5.20 * AU), m(9.58 * AU), mj, ms, star),
            Some(true)
        );
        // Two Jupiters 0.05 au apart at 1 au are not.
        assert_eq!(
            is_hill_stable_circular(m(AU), m(1.05 * AU), mj, mj, star),
            Some(false)
        );
        assert_eq!(
            is_hill_stable_circular(m(AU), m(1.05 * AU), mj, kg(0.0), star),
            None
        );
    }

    #[test]
    fn roche_limit_for_an_earth_like_density_around_the_sun() {
        // Fluid Roche limit d = 2.44 R* (rho*/rho_p)^(1/3) (Roche 1849): for the Sun
        // (1410 kg/m^3) and an Earth-density body (5513 kg/m^3) that is about 1.55 R_sun.
        let rho_sun = mean_density(kg(M_SUN), m(R_SUN)).expect("density");
        let rho_p = MassDensity::new::<kilogram_per_cubic_meter>(5513.0);
        let d = roche_limit_fluid(kg(M_SUN), rho_p).expect("Roche");
        let expected = 2.44 * R_SUN * value_of(rho_sun / rho_p).cbrt();
        assert!(close(d.get::<meter>(), expected, 1e-12));
        assert!((d.get::<meter>() / R_SUN - 1.55).abs() < 0.01);
        assert!(
            roche_limit_fluid(kg(M_SUN), MassDensity::new::<kilogram_per_cubic_meter>(0.0))
                .is_none()
        );
    }

    #[test]
    fn kepler_rejects_bad_input() {
        assert!(semi_major_axis(days(0.0), kg(M_SUN), kg(0.0)).is_none());
        assert!(semi_major_axis(days(1.0), kg(-M_SUN), kg(0.0)).is_none());
        assert!(semi_major_axis(days(1.0), kg(M_SUN), kg(-1.0)).is_none());
        assert!(semi_major_axis(days(f64::INFINITY), kg(M_SUN), kg(0.0)).is_none());
        assert!(period_from_axis(m(0.0), kg(M_SUN), kg(0.0)).is_none());
        assert!(total_mass_from_orbit(m(AU), days(-1.0)).is_none());
        assert!(mean_orbital_speed(m(AU), days(0.0)).is_none());
        // Jupiter radius sanity (IAU 2015 B3 nominal) to exercise Length values far from 1.
        assert!(mean_density(kg(M_JUPITER), m(R_JUPITER)).is_some());
    }
}
