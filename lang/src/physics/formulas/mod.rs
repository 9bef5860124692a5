//! Physics formulas for stars and their planets, over typed `uom` quantities.
//!
//! This folder owns the closed-form relations the derivation engine and the physics checker use,
//! one module per subject:
//!
//! * `kepler.rs`: Kepler's third law (with the planet's mass, solved with the true mass of a
//!   transiting planet known through `K`) and the mean orbital speed;
//! * `radial_velocity.rs`: the radial-velocity semi-amplitude and its exact inverse, the planet
//!   mass (and minimum mass) from `K`;
//! * `transit.rs`: transit depth and radius ratio, impact parameter and inclination, transit
//!   durations and their inverse (impact parameter, `a/R*` and stellar density from T14 and
//!   T23), the stellar density from a transit;
//! * `bulk.rs`: a body's mean density, surface gravity and escape velocity;
//! * `stability.rs`: Hill radii, the two-planet Hill-stability test and the fluid Roche limit,
//!   with their two published coefficients;
//! * `irradiation.rs`: insolation and the planet's equilibrium temperature;
//! * `stellar.rs`: the Stefan–Boltzmann relations of a star and its `log g`;
//! * `planning.rs`: distance from parallax, luminosity from bolometric photometry, the
//!   transmission and emission spectroscopy metrics, scale height, habitable-zone limits and
//!   masses or radii predicted from a mass–radius relation (its published coefficients are
//!   there, each with its source);
//! * `typed.rs` and `domain.rs`: what every formula shares — the typed constants and the input
//!   checks.
//!
//! Every function is pure and works in SI through `uom::si::f64`, so a dimension slip (a mass
//! where a length belongs, a missing power of a period) fails to compile. Physical constants are
//! read from [`crate::constants`]; none are repeated here (the only numbers defined in this
//! folder are dimensionless formula coefficients: two in `stability.rs` and the published fits
//! in `planning.rs`, each with its source).
//! The rest of the code calls every formula as `crate::formulas::name`; the modules are private.
//!
//! # Conventions
//!
//! * Dimensionless inputs and outputs (eccentricity `e`, impact parameter `b`, radius ratio
//!   `k = Rp/R*`, scaled semi-major axis `a/R*`, transit depth, `sin i`, albedo, redistribution
//!   factor) are plain `f64`; angles are [`uom::si::f64::Angle`].
//! * `omega` is the argument of periastron **of the planet's orbit**, as in Winn (2010), sec. 2:
//!   the transit happens at true anomaly `pi/2 - omega`. Radial-velocity fits often quote the
//!   star's argument of periastron, which differs from the planet's by 180 degrees.
//! * Every function returns `Option`. `None` means an input lies outside the formula's domain
//!   (non-finite, a mass/length/period that is not positive, `e` outside `[0, 1)`, `sin i`
//!   outside `(0, 1]`, ...) or the geometry has no answer (no transit, no full transit). When a
//!   function returns `Some`, the value is finite. No function panics.
//! * Planet masses may be zero where they only add to the star's mass (Kepler's law), so the
//!   "planet mass neglected" form is the same call with a zero planet mass.

mod bulk;
mod domain;
mod irradiation;
mod kepler;
mod planning;
mod radial_velocity;
mod stability;
mod stellar;
mod transit;
mod typed;

pub use bulk::{
    bulk_density, escape_velocity, mass_from_density, mean_density, radius_from_density,
    surface_gravity,
};
pub use irradiation::{equilibrium_temperature, insolation, insolation_earth_units};
pub use kepler::{
    mean_orbital_speed, period_from_axis, semi_major_axis, semi_major_axis_transiting,
    total_mass_from_orbit,
};
pub use planning::{
    bolometric_flux_from_magnitude, distance_from_parallax, emission_metric, habitable_distance,
    habitable_flux, largest_invertible_radius_earth, luminosity_from_absolute_bolometric_magnitude,
    luminosity_from_flux, mass_radius_branches, planck_ratio, predicted_mass_earth,
    predicted_radius_earth, scale_height, transmission_metric, tsm_scale_factor, Branch,
    HabitableEdge, HABITABLE_TEFF_RANGE,
};
pub use radial_velocity::{
    minimum_mass_from_rv, planet_mass_from_rv, rv_semi_amplitude, stellar_mass_from_orbit_and_rv,
};
pub use stability::{
    hill_radius, is_hill_stable_circular, mutual_hill_radius, roche_limit_fluid,
    spacing_in_mutual_hill_radii, HILL_STABLE_SPACING, ROCHE_FLUID_COEFFICIENT,
};
pub use stellar::{
    log_g_cgs, luminosity, mass_from_log_g, radius_from_log_g, radius_from_luminosity,
    teff_from_luminosity,
};
pub use transit::{
    depth_from_radius_ratio, depth_from_radius_ratio_and_impact, impact_from_durations,
    impact_from_durations_or_central, impact_from_inclination, inclination_from_impact, is_grazing,
    radius_ratio_from_depth, radius_ratio_from_depth_and_impact, scaled_axis_from_duration,
    stellar_density_from_duration, stellar_density_from_transit, transit_duration_full,
    transit_duration_total,
};

#[cfg(test)]
mod tests;
#[cfg(test)]
mod tests_density;
