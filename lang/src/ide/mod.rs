//! Editor queries over one analysed file: what is at an offset, hover text, inlay hints,
//! completion candidates, code actions, outline, folding and token classes. Everything here
//! takes and returns byte offsets and plain data; the language server only converts them to
//! protocol types and positions.

pub mod actions;
pub mod complete;
pub mod hints;
pub mod hover;
pub mod outline;
pub mod symbols;

use crate::derive::{display_unit, QuantityResult};
use crate::model::Form;
use crate::quantities::Qty;
use crate::Analysis;

/// How the numbers an editor shows were propagated (see
/// [`crate::settings::EditorSettings::method`]); hover and inlay hints say it.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Method {
    /// One line for hover and tooltips; empty to say nothing.
    pub line: String,
    /// A word or two for inlay hint labels, when `syz eval` would propagate otherwise.
    pub tag: Option<String>,
}

impl Method {
    /// When `syz eval` would propagate otherwise than the editor did, a short sentence that
    /// says so beside the numbers (an uncertainty from first order can differ from the
    /// sampled interval by much more than its last digits for a skewed result); `None`
    /// when both agree.
    pub fn estimate_note(&self) -> Option<String> {
        let tag = self.tag.as_deref()?;
        Some(if tag == "first-order" {
            "first-order estimate; `syz eval` samples (Monte Carlo): run it for the reported \
             interval"
                .to_string()
        } else {
            format!(
                "{tag} estimate; `syz eval` propagates otherwise: run it for the reported interval"
            )
        })
    }
}

/// The result of a quantity of a body, if the engine has one.
pub fn result(a: &Analysis, si: usize, bi: usize, qty: Qty) -> Option<&QuantityResult> {
    a.results.get(si)?.bodies.get(bi)?.get(qty)
}

pub use crate::report::shown_in;

/// A value in its display unit.
pub fn shown(qty: Qty, value: f64, below: f64, above: f64, form: Form) -> String {
    shown_in(value, below, above, form, display_unit(qty, value))
}

/// The byte offset of the first `{` at or after `from`, outside strings and comments.
pub(crate) fn open_brace_after(src: &str, from: usize) -> Option<usize> {
    let rest = src.get(from..)?;
    crate::lexer::lex(rest)
        .into_iter()
        .find(|t| t.kind == crate::lexer::Tok::LBrace)
        .map(|t| from + t.start)
}

/// Start and end (exclusive, before the newline) of the line holding `offset`.
pub(crate) fn line_bounds(src: &str, offset: usize) -> (usize, usize) {
    let offset = offset.min(src.len());
    let start = src
        .get(..offset)
        .and_then(|s| s.rfind(['\n', '\r']))
        .map_or(0, |i| i + 1);
    let end = src
        .get(offset..)
        .and_then(|s| s.find(['\n', '\r']))
        .map_or(src.len(), |i| offset + i);
    (start, end)
}
