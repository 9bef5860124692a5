//! Bulk properties of a body from its mass and radius: mean density, surface gravity and
//! escape velocity (a star's `log g` is in `stellar.rs`).

use super::domain::{finite, is_positive};
use super::typed::gravitational_constant;
use std::f64::consts::PI;
use uom::si::f64::{Acceleration, Length, Mass, MassDensity, Velocity};

/// Mean density of a sphere, `rho = M / (4/3 pi R^3)`. `None` for a non-positive mass or radius.
pub fn mean_density(mass: Mass, radius: Length) -> Option<MassDensity> {
    if !(is_positive(&mass) && is_positive(&radius)) {
        return None;
    }
    finite(mass / (4.0 / 3.0 * PI * radius * radius * radius))
}

/// Mass of a sphere of mean density `rho` and radius `R`, `M = 4/3 pi R^3 rho` (the inverse of
/// [`mean_density`]). `None` for a non-positive density or radius.
pub fn mass_from_density(density: MassDensity, radius: Length) -> Option<Mass> {
    if !(is_positive(&density) && is_positive(&radius)) {
        return None;
    }
    finite(4.0 / 3.0 * PI * radius * radius * radius * density)
}

/// Radius of a sphere of mean density `rho` and mass `M`, `R = (3 M / (4 pi rho))^(1/3)` (the
/// inverse of [`mean_density`]). `None` for a non-positive density or mass.
pub fn radius_from_density(density: MassDensity, mass: Mass) -> Option<Length> {
    if !(is_positive(&density) && is_positive(&mass)) {
        return None;
    }
    finite((3.0 * mass / (4.0 * PI * density)).cbrt())
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
