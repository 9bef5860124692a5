//! Syzygy's language core.
//!
//! Pipeline: [`syntax`] (lexer, parser) → [`model`] (name resolution, units, measurements)
//! → [`derive`] → [`checks`] → silencing comments ([`allow`]) → [`diagnostic`]s, rendered by
//! [`output`]; [`physics`] is the library of formulas the stages use. The core
//! does no I/O: front ends give it text through [`source::SourceDb`]. Editor queries over an
//! [`Analysis`] live in [`ide`]; the canonical layout (`syz fmt`) in [`layout`].

#![cfg_attr(test, allow(clippy::unwrap_used, clippy::indexing_slicing))]

// The stages of the pipeline, each in its folder: text to tree, tree to model, model to
// derived values, checks, output, editor features, incremental analysis.
pub mod allow;
pub mod catalogue;
pub mod checks;
pub mod derive;
pub mod ide;
pub mod model;
pub mod output;
pub mod parts;
pub mod reuse;
pub mod syntax;
pub mod tables;
// The physics library: formulas, composition curves, orbits, light curves, time scales.
// It imports nothing from the stages above.
pub mod physics;
// Shared foundations.
pub mod diagnostic;
pub mod format;
pub mod quantities;
pub mod settings;
pub mod source;
pub mod text;
pub mod units;
pub mod unused;

// Short paths kept for every module that moved into a folder.
pub use model::what_if;
pub use output::{diff, ephemeris, plots, report, rule_docs, shown, table};
pub use physics::{
    composition, constants, fastmath, formulas, lightcurve, orbit, sky, solar_system, spectral,
    time,
};
pub use syntax::{ast, layout, lexer, parser};

use std::collections::HashMap;
use std::sync::Arc;

pub use derive::{Options, Propagation, SampleCount};
pub use reuse::{analyze_reusing, Reusable};
pub use settings::Settings;

/// Everything the core knows about one file.
pub struct Analysis {
    pub file: source::FileId,
    pub ast: ast::File,
    pub model: model::Model,
    /// One result per system, in the order of `model.systems` (shared with the analyses
    /// that reuse it, see [`reuse`]).
    pub results: Vec<Arc<derive::SystemResult>>,
    /// Composition summaries per (system index, planet id), for the JSON output and as a
    /// line of text.
    pub composition: HashMap<(usize, String), checks::CompositionNote>,
    pub diagnostics: Vec<diagnostic::Diagnostic>,
    /// Every declaration the analysis could not use, with why, including those whose
    /// finding is silenced ([`unused`]).
    pub unused: Vec<unused::Unused>,
}

impl Analysis {
    /// The span of system `si`: what places in its results ([`source::InSystem`]) count from.
    pub fn system_span(&self, si: usize) -> source::Span {
        self.model
            .systems
            .get(si)
            .map_or_else(Default::default, |s| s.span)
    }

    /// `body.quantity` for a quantity of system `si`, as every output names it.
    pub fn key_name(&self, si: usize, k: derive::Key) -> String {
        let b = self
            .model
            .systems
            .get(si)
            .and_then(|s| s.bodies.get(k.0))
            .map_or("?", |b| b.id.as_str());
        format!("{b}.{}", quantities::def(k.1).name)
    }

    /// The declarations of system `si` that could not be used ([`unused`] lists them in
    /// system order), found without a scan of the others.
    pub fn unused_in(&self, si: usize) -> &[unused::Unused] {
        let from = self.unused.partition_point(|u| u.system < si);
        let to = self.unused.partition_point(|u| u.system <= si);
        self.unused.get(from..to).unwrap_or_default()
    }

    pub fn has_errors(&self) -> bool {
        self.diagnostics
            .iter()
            .any(|d| d.severity == diagnostic::Severity::Error)
    }

    /// How many errors the file has.
    pub fn error_count(&self) -> usize {
        self.diagnostics
            .iter()
            .filter(|d| d.severity == diagnostic::Severity::Error)
            .count()
    }
}

/// Run the whole pipeline on one source text: parse, lower, derive, check, then apply the
/// silencing comments and the settings' severity overrides.
///
/// [`analyze_reusing`] gives the same analysis while reusing the work of an earlier one.
pub fn analyze(file: source::FileId, src: &str, settings: &Settings) -> Analysis {
    analyze_part(src, parse_and_lower(file, src, settings), settings)
}

/// [`analyze`] for one part of a file read in parts ([`parts::Parts`]): what a file too
/// large to hold whole is analysed with, one part after another. The analysis holds the
/// part's systems, and the diagnostics whose place is in the part.
pub fn analyze_part(src: &str, mut part: parts::Part, settings: &Settings) -> Analysis {
    what_if::apply(&mut part.model, src, &settings.what_if);
    let lines = derive::Lines::new(src, &part.region, &part.model.systems);
    let outputs = part
        .model
        .systems
        .iter()
        .map(|sys| derive_system(sys, &settings.options, &lines))
        .collect();
    assemble(src, part, outputs, settings)
}

/// What deriving and checking one system gives, before silencing comments apply. A function
/// of the lowered system and the options alone, which is what makes it reusable.
#[derive(Debug, Clone, PartialEq)]
pub(crate) struct SystemOutput {
    /// The engine's diagnostics, then the physics checker's.
    pub(crate) diagnostics: Vec<diagnostic::Diagnostic>,
    pub(crate) result: Arc<derive::SystemResult>,
    /// Composition notes in the checker's order, with their planet's id.
    pub(crate) composition: Vec<(String, checks::CompositionNote)>,
}

/// The whole file as one part: parsed and lowered.
fn parse_and_lower(file: source::FileId, src: &str, settings: &Settings) -> parts::Part {
    let parsed = parser::parse(file, src);
    let mut diagnostics = parsed.diagnostics;
    let model = model::Lowering::with_shared(settings.shared_refs.clone()).lower(
        file,
        &parsed.file,
        None,
        &mut diagnostics,
    );
    parts::Part {
        region: source::Region::whole(src),
        ast: parsed.file,
        model,
        diagnostics,
    }
}

pub(crate) fn derive_system(
    sys: &model::System,
    options: &Options,
    lines: &derive::Lines,
) -> SystemOutput {
    let d = derive::Derivation::run(sys, options, lines);
    let mut diagnostics = d.diagnostics.clone();
    let composition = checks::run(&d, &mut diagnostics)
        .into_iter()
        .filter_map(|note| {
            let b = sys.bodies.get(note.body)?;
            Some((b.id.clone(), note))
        })
        .collect();
    SystemOutput {
        diagnostics,
        result: Arc::new(d.summarize()),
        composition,
    }
}

/// Put the per-system outputs (in the order of `model.systems`) together, then apply the
/// silencing comments and the severity overrides, and sort the diagnostics.
fn assemble(
    src: &str,
    part: parts::Part,
    outputs: Vec<SystemOutput>,
    settings: &Settings,
) -> Analysis {
    let parts::Part {
        region,
        ast,
        model,
        mut diagnostics,
    } = part;
    let mut results = Vec::with_capacity(outputs.len());
    let mut composition = HashMap::new();
    for (si, out) in outputs.into_iter().enumerate() {
        diagnostics.extend(out.diagnostics);
        for (id, note) in out.composition {
            composition.insert((si, id), note);
        }
        results.push(out.result);
    }
    // Before silencing, so that a value refused by a silenced rule still shows.
    let mut unused = unused::collect(src, &ast, &model, &results, &diagnostics);
    // Comments first: a comment that silences a rule the settings turn off is still used.
    // A comment inside a body that is not read (past a system's bound) silences nothing and
    // is not stale either: the body's own error says why nothing there is reported.
    let mut unread: Vec<source::Span> = model
        .systems
        .iter()
        .flat_map(|s| s.not_read.iter().map(|(_, at)| *at))
        .collect();
    unread.sort_unstable();
    let read_comments: Vec<ast::Comment>;
    let comments = if unread.is_empty() {
        &ast.comments
    } else {
        // Bodies do not overlap: the last one starting before the comment is the only one
        // that can hold it.
        let inside = |c: &ast::Comment| {
            let i = unread.partition_point(|b| b.start <= c.span.start);
            i.checked_sub(1)
                .and_then(|i| unread.get(i))
                .is_some_and(|b| c.span.end <= b.end)
        };
        read_comments = ast
            .comments
            .iter()
            .filter(|c| !inside(c))
            .cloned()
            .collect();
        &read_comments
    };
    let mut diagnostics = allow::apply_in(src, &region, comments, diagnostics);
    unused::mark_in_source(&mut unused, &diagnostics);
    settings.apply_overrides(&mut diagnostics);
    diagnostic::sort_diagnostics(&mut diagnostics);
    unused::mark_silenced(&mut unused, &diagnostics);
    Analysis {
        file: model.file,
        ast,
        model,
        results,
        composition,
        diagnostics,
        unused,
    }
}
