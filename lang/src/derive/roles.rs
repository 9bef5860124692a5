//! What a rule is beyond its formula: an approximation that stands in for a quantity only
//! while that quantity is unknown, or a prediction from a population relation.

use crate::quantities::Qty::{self, Impact, Mass, Radius, SemiMajorAxis, StarMass, StarRadius};

/// The quantity a rule's approximation stands in for: the rule is not used once that
/// quantity is known (the minimum mass stands in for a planet's mass only while the mass is
/// unknown; compared with a route through the true mass, it would report the difference
/// between the two masses, which is no disagreement, as one).
pub fn stands_in_for(id: &str) -> Option<Qty> {
    match id {
        "kepler-third-law-min-mass"
        | "hill-radius-min-mass"
        | "predicted-mass"
        | "tsm-predicted-mass"
        | "predicted-radius-min-mass" => Some(Mass),
        "predicted-radius" => Some(Radius),
        // sqrt(depth) and k^2 take the transit as not grazing, which only the impact
        // parameter can tell (see `depth-impact-radius-ratio`, `radius-ratio-impact-depth`).
        "depth-radius-ratio" | "radius-ratio-depth" => Some(Impact),
        // Inverses of a rule that already compares the same measurements (`mean-density-star`,
        // `scaled-semi-major-axis`): they fill a gap (a star with a radius and a transit's
        // density but no mass) and stand in for their own output, so one disagreement is not
        // reported again through them.
        "mass-from-density" => Some(StarMass),
        "radius-from-density" => Some(StarRadius),
        "semi-major-axis-from-scaled" => Some(SemiMajorAxis),
        _ => None,
    }
}

/// Whether a rule predicts from a population relation rather than derives from measurement:
/// its value has origin `predicted`, and no rule but those meant for predictions reads it.
pub fn predicts(id: &str) -> bool {
    matches!(
        id,
        "predicted-mass" | "predicted-radius" | "predicted-radius-min-mass"
    )
}
