//! Orbital stability and tidal limits: the Hill radius, the mutual Hill radius of two planets
//! and the Gladman (1993) stability test, and the fluid-body Roche limit. Holds the two
//! published dimensionless coefficients of the formulas, each with its source: the Roche
//! coefficient 2.44 (Roche 1849) and the Hill-stable spacing `2 sqrt(3)` (Gladman 1993).

use super::domain::{finite, finite_f64, is_eccentricity, is_positive};
use super::typed::value_of;
use crate::fastmath;
use std::f64::consts::PI;
use uom::si::f64::{Length, Mass, MassDensity, Volume};

/// Classical coefficient of the fluid-body Roche limit, `d = 2.44 R_M (rho_M / rho_m)^(1/3)`
/// (Roche 1849; the textbook value, from memory: no primary source was found in a stored copy,
/// and secondary pages quote 2.44, 2.45 and 2.455; refined equilibrium-figure treatments give
/// about 2.455).
pub const ROCHE_FLUID_COEFFICIENT: f64 = 2.44;

/// Gladman (1993) criterion for two planets on circular, coplanar orbits: they are Hill stable
/// when their separation exceeds `2 sqrt(3)` mutual Hill radii.
pub const HILL_STABLE_SPACING: f64 = 3.464_101_615_137_754_6;

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
