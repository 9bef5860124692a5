//! The JSON contract of `syz check --format json` and `syz eval --format json`
//! (`docs/json-output.md`) as types. Every object of that page is one struct here, with the
//! page's field names and in the order they are written, so a field cannot be spelt one way
//! in one place and another way elsewhere. serde_json writes a number that is not finite as
//! `null`, which is what the contract says of such numbers.
//!
//! Objects whose keys are data (quantity names, composition classes, rule ids) are
//! [`Pairs`]: written in the order given.

use crate::diagnostic::{self, Rule, Severity};
use crate::source::Places;
use serde::{Serialize, Serializer};

/// A JSON object written from pairs, in their order.
#[derive(Debug, Clone, PartialEq)]
pub struct Pairs<V>(pub Vec<(&'static str, V)>);

impl<V: Serialize> Serialize for Pairs<V> {
    fn serialize<S: Serializer>(&self, serializer: S) -> Result<S::Ok, S::Error> {
        serializer.collect_map(self.0.iter().map(|(k, v)| (k, v)))
    }
}

/// The whole of `syz check --format json`.
#[derive(Debug, Serialize)]
pub struct CheckDocument<'a> {
    pub version: u32,
    pub files: usize,
    pub diagnostics: &'a [Diagnostic],
    pub diagnostics_not_shown: &'a [NotShown],
    pub io_errors: &'a [String],
    pub summary: Summary,
}

/// Counts of a check's diagnostics, after severity overrides.
#[derive(Debug, Serialize)]
pub struct Summary {
    pub errors: usize,
    pub warnings: usize,
    pub notes: usize,
    /// Rule id to count, only for rules that occur, in the catalogue's order.
    pub rules: Pairs<usize>,
    /// Declarations refused by a rule whose finding is silenced (left out when none).
    #[serde(skip_serializing_if = "is_zero")]
    pub not_used_silenced: usize,
}

fn is_zero(n: &usize) -> bool {
    *n == 0
}

/// The members of `syz eval --format json` before `systems` (the systems are streamed
/// between this and [`EvalTail`]).
#[derive(Debug, Serialize)]
pub struct EvalHead {
    pub version: u32,
    pub options: Options,
}

/// The members of `syz eval --format json` after `systems`.
#[derive(Debug, Serialize)]
pub struct EvalTail<'a> {
    pub diagnostics: &'a [Diagnostic],
    pub diagnostics_not_shown: &'a [NotShown],
    pub io_errors: &'a [String],
}

/// A file whose diagnostics were not all listed (only the first
/// [`crate::shown::PER_FILE`] are), and how many were left out.
#[derive(Debug, Serialize)]
pub struct NotShown {
    pub file: String,
    pub count: usize,
}

/// The engine settings that produced the numbers.
#[derive(Debug, Serialize)]
pub struct Options {
    pub propagation: &'static str,
    /// Monte Carlo draws; with linear propagation, the draws used for the values first
    /// order cannot describe (`derive::validity`).
    pub samples: usize,
    /// Whether Monte Carlo drew more than `samples` where needed, until stable
    /// (`--samples auto`); each value's `precision` says how many it drew.
    pub adaptive: bool,
    pub seed: u64,
    pub consistency_sigma: f64,
    pub consistency_error_sigma: f64,
}

impl Options {
    pub fn new(o: &crate::Options) -> Options {
        let monte_carlo = o.propagation == crate::Propagation::MonteCarlo;
        Options {
            propagation: if monte_carlo { "monte-carlo" } else { "linear" },
            samples: if monte_carlo {
                o.samples
            } else {
                o.samples.min(crate::derive::validity::MOST_SAMPLES)
            },
            adaptive: monte_carlo && o.adaptive,
            seed: o.seed,
            consistency_sigma: o.consistency_sigma,
            consistency_error_sigma: o.consistency_error_sigma,
        }
    }
}

/// One diagnostic. Owned, so it outlives the analysis it came from.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Diagnostic {
    pub rule: Rule,
    pub severity: Severity,
    pub message: String,
    pub file: String,
    pub line: u32,
    pub column: u32,
    pub end_line: u32,
    pub end_column: u32,
    pub labels: Vec<Label>,
    pub notes: Vec<String>,
    /// Always written, `null` when there is no suggested fix.
    pub help: Option<String>,
}

/// A secondary location of a diagnostic: its start only.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Label {
    pub file: String,
    pub line: u32,
    pub column: u32,
    pub message: String,
}

impl Diagnostic {
    pub fn new(d: &diagnostic::Diagnostic, places: &Places) -> Diagnostic {
        let (file, start, end) = places.of(d.span);
        Diagnostic {
            rule: d.rule,
            severity: d.severity,
            message: d.message.clone(),
            file: file.to_string(),
            line: start.line,
            column: start.column,
            end_line: end.line,
            end_column: end.column,
            labels: d
                .labels
                .iter()
                .map(|l| {
                    let (file, start, _) = places.of(l.span);
                    Label {
                        file: file.to_string(),
                        line: start.line,
                        column: start.column,
                        message: l.message.clone(),
                    }
                })
                .collect(),
            notes: d.notes.clone(),
            help: d.help.clone(),
        }
    }
}

/// One system of `eval`, borrowing from the analysis.
#[derive(Debug, Serialize)]
pub struct System<'a> {
    pub file: &'a str,
    pub name: &'a str,
    pub bodies: Vec<Body<'a>>,
    /// Declarations of the system that could not be used, with why (left out when none).
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub not_used: Vec<NotUsed<'a>>,
}

/// A declaration that could not be used ([`crate::unused`]).
#[derive(Debug, Serialize)]
pub struct NotUsed<'a> {
    pub body: &'a str,
    /// The quantity's name as written; `null` for a whole body.
    pub quantity: Option<&'a str>,
    pub text: &'a str,
    pub line: usize,
    /// The rule id that says why; `null` when no diagnostic does.
    pub rule: Option<&'static str>,
    pub why: &'a str,
    /// Whether that rule's finding is silenced (`--allow`, `# allow(...)`, `[rules]`).
    pub silenced: bool,
}

#[derive(Debug, Serialize)]
pub struct Body<'a> {
    pub id: &'a str,
    pub kind: &'static str,
    /// Planets only: the host's id, `null` when it could not be resolved.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub orbits: Option<Option<&'a str>>,
    /// Canonical quantity name to quantity.
    pub quantities: Pairs<Quantity<'a>>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub composition: Option<&'a Composition>,
}

/// A quantity: a text (`text`) or a number (the members of [`Measured`]), then what it is
/// and where it came from. Lists are left out when empty.
#[derive(Debug, Serialize)]
pub struct Quantity<'a> {
    #[serde(skip_serializing_if = "Option::is_none")]
    pub text: Option<&'a str>,
    #[serde(flatten)]
    pub measured: Option<Measured<'a>>,
    pub form: &'static str,
    /// Always written: `upper`, `lower` or `null`.
    pub limit: Option<&'static str>,
    pub origin: &'static str,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub rule: Option<&'static str>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub formula: Option<&'static str>,
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub inputs: Vec<String>,
    #[serde(skip_serializing_if = "<[_]>::is_empty")]
    pub citations: &'a [String],
    #[serde(skip_serializing_if = "<[_]>::is_empty")]
    pub assumptions: &'a [String],
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub budget: Vec<Share<'a>>,
    #[serde(skip_serializing_if = "<[_]>::is_empty")]
    pub notes: &'a [String],
    /// A quantity declared more than once: every declaration, in file order.
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub sources: Vec<Source<'a>>,
    /// A quantity declared more than once: how the value used was reached.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub choice: Option<&'static str>,
    /// A value summarised from Monte Carlo samples: how precisely they fix it.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub precision: Option<Precision>,
    /// A derived limit bounded at its other end as well (in the value's unit): the value
    /// lies between `value` and this.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub range_end: Option<f64>,
}

/// The numerical precision of a Monte Carlo value, in the value's display unit: twice the
/// standard error of its lower end, median and upper end (JCGM 101:2008 7.9), the samples it
/// rests on, and whether all three are fixed to the digits shown.
#[derive(Debug, Serialize)]
pub struct Precision {
    pub samples: usize,
    pub low: f64,
    pub median: f64,
    pub high: f64,
    pub stable: bool,
}

/// One of several declarations of a quantity, in the quantity's display unit.
#[derive(Debug, Serialize)]
pub struct Source<'a> {
    pub value: f64,
    pub below: f64,
    pub above: f64,
    pub unit: String,
    /// Always written: `upper`, `lower` or `null`.
    pub limit: Option<&'static str>,
    pub citations: &'a [String],
    pub line: u32,
    /// Whether this declaration is the value used (false for all when they were combined).
    pub chosen: bool,
    /// Whether this declaration is marked `assumed` (left out when not).
    #[serde(skip_serializing_if = "std::ops::Not::not")]
    pub assumed: bool,
}

/// A number with its uncertainties, in the display unit and in SI.
#[derive(Debug, Serialize)]
pub struct Measured<'a> {
    pub value: f64,
    pub unit: &'a str,
    pub below: f64,
    pub above: f64,
    pub si: Si,
}

#[derive(Debug, Serialize)]
pub struct Si {
    pub value: f64,
    pub below: f64,
    pub above: f64,
    pub unit: String,
}

/// One line of an error budget.
#[derive(Debug, Serialize)]
pub struct Share<'a> {
    pub input: &'a str,
    pub share: f64,
}

/// A planet's composition classes (made by the physics checker).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Composition {
    pub most_probable: Option<&'static str>,
    /// Class name to probability.
    pub probabilities: Pairs<f64>,
    pub method: &'static str,
    pub extrapolated_fraction: f64,
    pub boundaries: &'static str,
}

#[cfg(test)]
#[allow(clippy::unwrap_used)]
mod tests {
    use super::*;

    #[test]
    fn numbers_that_are_not_finite_are_null_and_pairs_keep_their_order() {
        let m = Measured {
            value: f64::NAN,
            unit: "au",
            below: f64::INFINITY,
            above: 0.5,
            si: Si {
                value: 1.0,
                below: f64::NEG_INFINITY,
                above: 0.0,
                unit: "m".into(),
            },
        };
        assert_eq!(
            serde_json::to_string(&m).unwrap(),
            r#"{"value":null,"unit":"au","below":null,"above":0.5,"si":{"value":1.0,"below":null,"above":0.0,"unit":"m"}}"#
        );
        let p = Pairs(vec![("z", 1), ("a", 2)]);
        assert_eq!(serde_json::to_string(&p).unwrap(), r#"{"z":1,"a":2}"#);
    }
}
