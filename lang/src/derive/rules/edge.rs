//! Formulas with a physical edge their Monte Carlo draws may pass for a reason of their own.

use super::si::*;
use crate::formulas as f;

/// A rule's formula over its inputs in SI.
pub type Formula = fn(&[f64]) -> Option<f64>;

/// For a rule whose formula has no value past a physical edge of its output: the formula
/// Monte Carlo draws use instead, which takes a draw past the edge at the edge, and the
/// edge's value. Only the draws: a nominal value past the edge still has no solution (and
/// `not-derivable` says so), since the measurements as given then contradict each other.
pub fn draws_at_edge(id: &str) -> Option<(Formula, f64)> {
    match id {
        "impact-from-durations" => Some((
            |x| {
                args!(x, [p, t14, t23, k, e, w]);
                f::impact_from_durations_or_central(t(p), t(t14), t(t23), k, e, ang(w))
            },
            0.0,
        )),
        _ => None,
    }
}
