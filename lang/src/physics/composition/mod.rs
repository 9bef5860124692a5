//! Mass–radius relations for solid planets and a bulk-composition classifier.
//!
//! This folder owns (1) published mass–radius curves for solid planets, with the
//! metadata a plot needs to label them and the mass range over which each was fitted,
//! and (2) a classifier that turns a planet's mass and radius — Monte Carlo samples, or
//! the two uncertainty distributions — into the probability of each composition class.
//!
//! * `fits.rs` — the published fits and their coefficients (Seager et al. 2007, Zeng et al.
//!   2016) with the ranges they were fitted over;
//! * `curves.rs` — [`Curve`], the named curves with their labels and sources, and radius
//!   look-ups with or without extrapolation;
//! * `classes.rs` — [`CompositionClass`], the boundaries between classes
//!   ([`ClassBoundaries`], [`boundary_radii`]), the class of one point, and
//!   [`ClassProbabilities`];
//! * `samples.rs` — classifying paired Monte Carlo samples ([`classify`]);
//! * `quadrature.rs` — the same class probabilities by quadrature over two-sided normal
//!   distributions ([`classify_distributions`]), as linear propagation uses;
//! * `diagram.rs` — what a mass–radius diagram draws ([`PLOTTED_CURVES`]) and a planet's
//!   position among the curves in words ([`describe_position`]).
//!
//! Masses are in kg and radii in m at the interface. Internally the curves work in
//! Earth units: `M_EARTH` (IAU 2015 B3 nominal GM_earth / CODATA 2018 G) and `R_EARTH`
//! (IAU 2015 B3 nominal *equatorial* radius). The papers normalise to Earth's radius
//! without distinguishing equatorial from mean (6371.0 km); that 0.11% ambiguity is far
//! below the few-percent accuracy of the fits.
//!
//! The rest of the code uses every item as `crate::composition::name`; the modules are
//! private.

mod classes;
mod curves;
mod diagram;
mod fits;
mod quadrature;
mod samples;

pub use classes::{
    boundary_radii, classify_point, BoundaryRadii, ClassBoundaries, ClassProbabilities,
    CompositionClass,
};
pub use curves::{
    density_of_pure_iron_body, iron_radius, radius_of, radius_of_extrapolated, Curve, CurveRadius,
};
pub use diagram::{describe_position, PLOTTED_CURVES};
pub use quadrature::{classify_distributions, TwoSidedNormal};
pub use samples::{classify, classify_with, CompositionSummary, SampleProblem};

/// Whether `value` lies in the closed interval `range` (a fitted range).
fn in_range(value: f64, range: (f64, f64)) -> bool {
    value >= range.0 && value <= range.1
}

/// The domain of every mass, radius and threshold here.
fn is_positive_finite(x: f64) -> bool {
    x.is_finite() && x > 0.0
}

#[cfg(test)]
mod tests;
