//! The JSON contract of `syz diff --format json` (`docs/review.md`) as types: one struct
//! per object of that page, with its field names, in the order they are written.

use super::{About, Change as CoreChange, Diff, SystemDiff};
use serde::Serialize;

/// Version of the diff's JSON contract; bump on any incompatible change.
pub const DIFF_JSON_VERSION: u32 = 1;

/// The whole of `syz diff --format json`.
#[derive(Debug, Serialize)]
pub struct Document<'a> {
    pub version: u32,
    pub old: &'a str,
    pub new: &'a str,
    /// The derivation settings both sides were analysed with.
    pub options: crate::report::json::Options,
    /// How the uncertainties were propagated, in words.
    pub uncertainties: &'a str,
    pub threshold: f64,
    pub all: bool,
    /// What a shift is measured in, in words.
    pub shift_unit: &'static str,
    /// Values set on the command line for the new side (`--set`), as written.
    pub set: &'a [String],
    /// Something moved beyond the threshold, appeared or went away (exit status 1).
    pub significant: bool,
    pub systems_compared: usize,
    pub changes_found: usize,
    pub changes_not_listed: usize,
    pub systems: Vec<System<'a>>,
}

#[derive(Debug, Serialize)]
pub struct System<'a> {
    /// `null` for what a file says outside any system.
    pub name: Option<&'a str>,
    pub status: &'static str,
    pub old_file: Option<&'a str>,
    pub new_file: Option<&'a str>,
    pub changes: Vec<Change<'a>>,
}

#[derive(Debug, Serialize)]
pub struct Change<'a> {
    pub kind: &'static str,
    pub body: Option<&'a str>,
    pub quantity: Option<&'static str>,
    pub old: Option<&'a str>,
    pub new: Option<&'a str>,
    pub difference: Option<f64>,
    pub sigma: Option<f64>,
    pub unit: &'a str,
    pub shift: Option<f64>,
    pub significant: bool,
    pub notes: &'a [String],
}

/// The words of `shift_unit`.
pub const SHIFT_UNIT: &str = "combined standard deviations: (new - old) / sqrt(old_above^2 + new_below^2) for a move up, (new - old) / sqrt(old_below^2 + new_above^2) for a move down";

/// The document for a comparison.
pub fn document<'a>(diff: &'a Diff, about: &'a About) -> Document<'a> {
    Document {
        version: DIFF_JSON_VERSION,
        old: &about.old,
        new: &about.new,
        options: crate::report::json::Options::new(&about.options),
        uncertainties: &about.uncertainties,
        threshold: diff.options.threshold,
        all: diff.options.all,
        shift_unit: SHIFT_UNIT,
        set: &about.set,
        significant: diff.significant(),
        systems_compared: diff.systems_compared,
        changes_found: diff.changes_found,
        changes_not_listed: diff.changes_not_listed,
        systems: diff.systems.iter().map(system).collect(),
    }
}

fn system(s: &SystemDiff) -> System<'_> {
    System {
        name: s.name.as_deref(),
        status: s.status.as_str(),
        old_file: s.old_file.as_deref(),
        new_file: s.new_file.as_deref(),
        changes: s.changes.iter().map(change).collect(),
    }
}

fn change(c: &CoreChange) -> Change<'_> {
    Change {
        kind: c.kind.as_str(),
        body: c.body.as_deref(),
        quantity: c.quantity,
        old: c.old.as_deref(),
        new: c.new.as_deref(),
        difference: c.difference,
        sigma: c.sigma,
        unit: &c.unit,
        shift: c.shift,
        significant: c.significant,
        notes: &c.notes,
    }
}
