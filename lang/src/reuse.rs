//! Reusing per-system work between analyses of a changing text (the language server analyses
//! its document again after every keystroke).
//!
//! Deriving and checking a system reads nothing but its lowered model ([`model::System`]) and
//! the [`Options`], and the spans in what it gives come from that model. So when a system of
//! the new text, once lowered, equals a system of the previous analysis with every span moved
//! by the same distance (the system moved because text before it changed), its results,
//! diagnostics and composition notes are the old ones with their spans moved by that
//! distance. Only the diagnostics have spans to move: results count their places from the
//! system's start ([`crate::source::InSystem`]), so a moved system's results are shared as
//! they are, not copied. [`analyze_reusing`] parses and lowers the whole text every time
//! (cheap next to derivation), looks for such a system among those of the previous analysis with the same
//! source text, and derives only the systems it does not find. Everything that spans systems
//! is done afresh: silencing comments, sorting, and the system index of composition notes.
//! The result is the analysis [`crate::analyze`] gives for the same text.
//!
//! One thing a move can change besides offsets: the sentence that says which of several
//! declarations of a quantity is used names that declaration's line. A system with such a
//! quantity is reused only when it starts on the same line as before.
//!
//! Literal inputs are named by order of use, not by position, so seeds and error-budget
//! labels survive the move. An output is kept for reuse only if every span in it lies inside
//! its system (a span made up elsewhere, such as an empty placeholder, would not move).

use crate::ast::{self, ExprKind, Uncertainty};
use crate::diagnostic::{Diagnostic, Label};
use crate::model::{Body, Content, Declared, LetInfo, Node, Resolved, System};
use crate::source::{FileId, Span};
use crate::{Analysis, Options, Settings, SystemOutput};
use std::collections::HashMap;
use std::sync::Arc;

/// The per-system work of one analysis, kept for the next analysis of the same document.
#[derive(Debug, Clone, Default)]
pub struct Reusable {
    file: FileId,
    options: Option<Options>,
    systems: Vec<Kept>,
    reused: usize,
}

impl Reusable {
    /// How many systems the analysis that made this took from the previous one instead of
    /// deriving them.
    pub fn reused(&self) -> usize {
        self.reused
    }

    /// How many systems it holds.
    pub fn systems(&self) -> usize {
        self.systems.len()
    }
}

#[derive(Debug, Clone)]
struct Kept {
    /// The system's source text, by which candidates are found.
    text: String,
    system: System,
    /// The 1-based line the system starts on, when the text was indexed by lines.
    line: Option<usize>,
    /// None when something in the output would not move with the system.
    output: Option<Arc<SystemOutput>>,
}

impl Kept {
    /// This system's output for `sys`, moved to its position, if `sys` is this system moved.
    fn output_for(&self, sys: &System, line: Option<usize>) -> Option<Arc<SystemOutput>> {
        let output = self.output.as_ref()?;
        // Its sentences name lines (see the module documentation).
        if line != self.line && sys.bodies.iter().any(|b| !b.further.is_empty()) {
            return None;
        }
        let by = i64::from(sys.span.start) - i64::from(self.system.span.start);
        if by == 0 {
            return (self.system == *sys).then(|| output.clone());
        }
        let mut moved = self.system.clone();
        if !shift(&mut moved, by) || moved != *sys {
            return None;
        }
        let mut out = SystemOutput::clone(output);
        shift(&mut out, by).then(|| Arc::new(out))
    }
}

/// [`crate::analyze`], reusing the systems of `previous` that did not change (see the module
/// documentation), and what the next call can reuse. Reuse needs the same file id and
/// derivation options (severity overrides apply afresh, so they may differ).
pub fn analyze_reusing(
    file: FileId,
    src: &str,
    settings: &Settings,
    previous: Option<&Reusable>,
) -> (Analysis, Reusable) {
    let options = &settings.options;
    let mut part = crate::parse_and_lower(file, src, settings);
    crate::what_if::apply(&mut part.model, src, &settings.what_if);
    let model = &part.model;
    let lines = crate::derive::Lines::new(src, &part.region, &model.systems);
    let mut candidates: HashMap<&str, Vec<&Kept>> = HashMap::new();
    if let Some(p) = previous.filter(|p| p.file == file && p.options.as_ref() == Some(options)) {
        for k in &p.systems {
            candidates.entry(k.text.as_str()).or_default().push(k);
        }
    }
    let mut kept = Vec::with_capacity(model.systems.len());
    let mut outputs = Vec::with_capacity(model.systems.len());
    let mut reused = 0;
    for sys in &model.systems {
        let text = src.get(sys.span.range()).unwrap_or_default();
        let line = lines.line(sys.span.start);
        let found = candidates
            .get(text)
            .and_then(|ks| ks.iter().find_map(|k| k.output_for(sys, line)));
        let (output, keep) = match found {
            Some(out) => {
                reused += 1;
                (SystemOutput::clone(&out), Some(out))
            }
            None => {
                let mut out = crate::derive_system(sys, options, &lines);
                if inside(&mut out, sys.span) {
                    let out = Arc::new(out);
                    (SystemOutput::clone(&out), Some(out))
                } else {
                    (out, None)
                }
            }
        };
        outputs.push(output);
        kept.push(Kept {
            text: text.to_string(),
            system: sys.clone(),
            line,
            output: keep,
        });
    }
    let analysis = crate::assemble(src, part, outputs, settings);
    let reusable = Reusable {
        file,
        options: Some(options.clone()),
        systems: kept,
        reused,
    };
    (analysis, reusable)
}

/// Whether every span of `out` lies inside `within` (and is not the empty placeholder span).
fn inside(out: &mut SystemOutput, within: Span) -> bool {
    let mut ok = true;
    out.each_span(&mut |s| {
        ok &= *s != Span::default()
            && s.file == within.file
            && within.start <= s.start
            && s.end <= within.end;
    });
    ok
}

/// Move every span by `by` bytes; false if one would leave the range of offsets.
fn shift(x: &mut impl Spans, by: i64) -> bool {
    let mut ok = true;
    x.each_span(&mut |s| {
        let start = u32::try_from(i64::from(s.start) + by);
        let end = u32::try_from(i64::from(s.end) + by);
        match (start, end) {
            (Ok(a), Ok(b)) => (s.start, s.end) = (a, b),
            _ => ok = false,
        }
    });
    ok
}

/// Things that hold spans. Every implementation names all fields of its type, so that a new
/// field cannot be forgotten.
trait Spans {
    fn each_span(&mut self, f: &mut dyn FnMut(&mut Span));
}

impl Spans for Span {
    fn each_span(&mut self, f: &mut dyn FnMut(&mut Span)) {
        f(self);
    }
}

impl<T: Spans> Spans for Option<T> {
    fn each_span(&mut self, f: &mut dyn FnMut(&mut Span)) {
        if let Some(x) = self {
            x.each_span(f);
        }
    }
}

impl<T: Spans> Spans for Vec<T> {
    fn each_span(&mut self, f: &mut dyn FnMut(&mut Span)) {
        for x in self {
            x.each_span(f);
        }
    }
}

/// A shared value is copied before its spans move, unless nothing else holds it.
impl<T: Spans + Clone> Spans for Arc<T> {
    fn each_span(&mut self, f: &mut dyn FnMut(&mut Span)) {
        Arc::make_mut(self).each_span(f);
    }
}

impl<T: Spans> Spans for Box<T> {
    fn each_span(&mut self, f: &mut dyn FnMut(&mut Span)) {
        T::each_span(self, f);
    }
}

impl Spans for SystemOutput {
    fn each_span(&mut self, f: &mut dyn FnMut(&mut Span)) {
        // Composition notes hold no spans.
        // A result places declarations from its system's start (`InSystem`): nothing in it
        // moves, so the shared result is not copied (the property tests in `reuse/tests.rs` compare moved
        // systems with fresh analyses).
        let SystemOutput {
            diagnostics,
            result: _,
            composition: _,
        } = self;
        diagnostics.each_span(f);
    }
}

impl Spans for Diagnostic {
    fn each_span(&mut self, f: &mut dyn FnMut(&mut Span)) {
        let Diagnostic {
            rule: _,
            severity: _,
            span,
            message: _,
            labels,
            notes: _,
            help: _,
            fix,
        } = self;
        f(span);
        labels.each_span(f);
        if let Some(fix) = fix {
            f(&mut fix.span);
        }
    }
}

impl Spans for Label {
    fn each_span(&mut self, f: &mut dyn FnMut(&mut Span)) {
        let Label { span, message: _ } = self;
        f(span);
    }
}

impl Spans for System {
    fn each_span(&mut self, f: &mut dyn FnMut(&mut Span)) {
        let System {
            name: _,
            name_span,
            span,
            bodies,
            lets,
            let_order: _,
            not_read,
        } = self;
        f(name_span);
        f(span);
        for (_, s) in not_read {
            f(s);
        }
        bodies.each_span(f);
        lets.each_span(f);
    }
}

impl Spans for Body {
    fn each_span(&mut self, f: &mut dyn FnMut(&mut Span)) {
        let Body {
            id: _,
            kind: _,
            name_span,
            span,
            orbits: _,
            orbits_span,
            declared,
            further,
            refused,
            lets,
        } = self;
        f(name_span);
        f(span);
        orbits_span.each_span(f);
        declared.each_span(f);
        further.each_span(f);
        for (_, s) in refused {
            f(s);
        }
        lets.each_span(f);
    }
}

impl Spans for Declared {
    fn each_span(&mut self, f: &mut dyn FnMut(&mut Span)) {
        let Declared {
            qty: _,
            name_span,
            span,
            value_span,
            content,
            assumed: _,
            preferred: _,
            citations,
            written_unit: _,
            timestamp: _,
            set: _,
        } = self;
        f(name_span);
        f(span);
        f(value_span);
        if let Content::Expr(e) = content {
            e.each_span(f);
        }
        for (_, s) in citations {
            f(s);
        }
    }
}

impl Spans for LetInfo {
    fn each_span(&mut self, f: &mut dyn FnMut(&mut Span)) {
        let LetInfo {
            name: _,
            name_span,
            value,
            dim: _,
            span,
        } = self;
        f(name_span);
        value.each_span(f);
        f(span);
    }
}

impl Spans for Resolved {
    fn each_span(&mut self, f: &mut dyn FnMut(&mut Span)) {
        let Resolved { node, span } = self;
        f(span);
        match node {
            Node::Uncertain(lit) => f(&mut lit.value_span),
            Node::Neg(x) | Node::Call(_, x) => x.each_span(f),
            Node::Binary(_, a, b) | Node::Pow(a, b) => {
                a.each_span(f);
                b.each_span(f);
            }
            Node::Exact(_) | Node::Binding(_) | Node::Quantity(..) => {}
        }
    }
}

impl Spans for ast::Ident {
    fn each_span(&mut self, f: &mut dyn FnMut(&mut Span)) {
        let ast::Ident { name: _, span } = self;
        f(span);
    }
}

impl Spans for ast::Expr {
    fn each_span(&mut self, f: &mut dyn FnMut(&mut Span)) {
        let ast::Expr { kind, span } = self;
        f(span);
        match kind {
            ExprKind::Literal(l) => l.each_span(f),
            ExprKind::Name(id) => id.each_span(f),
            ExprKind::Ref(body, qty) => {
                body.each_span(f);
                qty.each_span(f);
            }
            ExprKind::Neg(x) => x.each_span(f),
            ExprKind::Binary(_, a, b) | ExprKind::Pow(a, b) => {
                a.each_span(f);
                b.each_span(f);
            }
            ExprKind::Call(name, args) => {
                name.each_span(f);
                args.each_span(f);
            }
            ExprKind::Error => {}
        }
    }
}

impl Spans for ast::Literal {
    fn each_span(&mut self, f: &mut dyn FnMut(&mut Span)) {
        let ast::Literal {
            value: _,
            value_span,
            uncertainty,
            unit,
        } = self;
        f(value_span);
        match uncertainty {
            Uncertainty::None => {}
            Uncertainty::Symmetric(_, s)
            | Uncertainty::Quadrature(_, s)
            | Uncertainty::Asymmetric { span: s, .. } => f(s),
        }
        unit.each_span(f);
    }
}

impl Spans for ast::UnitExpr {
    fn each_span(&mut self, f: &mut dyn FnMut(&mut Span)) {
        let ast::UnitExpr { factors, span } = self;
        f(span);
        for ast::UnitFactor {
            symbol,
            exponent: _,
        } in factors
        {
            symbol.each_span(f);
        }
    }
}

#[cfg(test)]
mod tests;
