//! What a derivation rule is: the quantities it reads and writes, and its formula.

use crate::quantities::Qty;

/// Where a rule reads or writes a quantity: on the planet, on its host star, or (for rules
/// about a star alone) on the star itself.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Slot {
    Planet(Qty),
    Host(Qty),
    Star(Qty),
}

pub struct RuleDef {
    /// Stable id shown in output (`rule` in JSON).
    pub id: &'static str,
    /// The formula in words, for `explain` and hovers.
    pub formula: &'static str,
    pub output: Slot,
    pub inputs: &'static [Slot],
    /// Lower is more complete physics; among routes to one quantity the lowest tier wins,
    /// then the most precise. Tier 3 holds the inverses that only fill a gap once nothing
    /// else gives their output (see [`super::stands_in_for`]).
    pub tier: u8,
    pub eval: fn(&[f64]) -> Option<f64>,
}
