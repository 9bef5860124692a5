//! Formulas with a physical edge their Monte Carlo draws may pass for a reason of their own.

use super::si::*;
use crate::formulas as f;

/// A rule's formula over its inputs in SI.
pub type Formula = fn(&[f64]) -> Option<f64>;

/// A formula's edge its Monte Carlo draws may pass: the formula the draws use instead,
/// which takes a draw past the edge at the edge, and the words for the edge.
#[derive(Clone, Copy)]
pub struct Edge {
    pub formula: Formula,
    /// The edge's value.
    pub at: f64,
    /// What a draw past the edge is (`b^2 < 0`), what it means, and where it is taken.
    pub past: &'static str,
    pub meaning: &'static str,
    pub taken: &'static str,
}

/// For a rule whose formula has no value past a physical edge of its output, that edge.
/// Only the draws: a nominal value past the edge still has no solution (and `not-derivable`
/// says so), since the measurements as given then contradict each other.
pub fn draws_at_edge(id: &str) -> Option<Edge> {
    match id {
        "impact-from-durations" => Some(Edge {
            formula: |x| {
                args!(x, [p, t14, t23, k, e, w]);
                f::impact_from_durations_or_central(t(p), t(t14), t(t23), k, e, ang(w))
            },
            at: 0.0,
            past: "b^2 < 0",
            meaning: "durations closer together than any impact parameter gives: more central than a central transit",
            taken: "b = 0",
        }),
        _ => None,
    }
}
