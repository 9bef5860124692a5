//! Syzygy's language core.
//!
//! Pipeline: [`lexer`] → [`parser`] → [`model`] (name resolution, units, measurements) →
//! derivations → physics checks → silencing comments ([`allow`]) → [`diagnostic`]s. The core
//! does no I/O: front ends give it text through [`source::SourceDb`]. Editor queries over an
//! [`Analysis`] live in [`ide`]; the canonical layout (`syz fmt`) in [`layout`].

#![cfg_attr(test, allow(clippy::unwrap_used, clippy::indexing_slicing))]

pub mod allow;
pub mod ast;
pub mod checks;
pub mod composition;
pub mod config;
pub mod constants;
pub mod derive;
pub mod diagnostic;
pub mod ephemeris;
pub mod fastmath;
pub mod format;
pub mod formulas;
pub mod ide;
pub mod layout;
pub mod lexer;
pub mod lightcurve;
pub mod model;
pub mod orbit;
pub mod parser;
pub mod plots;
pub mod quantities;
pub mod report;
pub mod rule_docs;
pub mod solar_system;
pub mod source;
pub mod spectral;
pub mod text;
pub mod time;
pub mod units;

use std::collections::HashMap;

pub use derive::{Options, Propagation};

/// Everything the core knows about one file.
pub struct Analysis {
    pub file: source::FileId,
    pub ast: ast::File,
    pub model: model::Model,
    /// One result per system, in the order of `model.systems`.
    pub results: Vec<derive::SystemResult>,
    /// Composition summaries per (system index, planet id), as JSON and as a line of text.
    pub composition: HashMap<(usize, String), serde_json::Value>,
    pub composition_text: HashMap<(usize, String), String>,
    pub diagnostics: Vec<diagnostic::Diagnostic>,
}

impl Analysis {
    pub fn has_errors(&self) -> bool {
        self.diagnostics
            .iter()
            .any(|d| d.severity == diagnostic::Severity::Error)
    }
}

/// Run the whole pipeline on one source text: parse, lower, derive, check.
pub fn analyze(file: source::FileId, src: &str, options: &Options) -> Analysis {
    let parsed = parser::parse(file, src);
    let mut diagnostics = parsed.diagnostics;
    let model = model::lower(file, &parsed.file, &mut diagnostics);
    let mut results = Vec::with_capacity(model.systems.len());
    let mut composition = HashMap::new();
    let mut composition_text = HashMap::new();
    for (si, sys) in model.systems.iter().enumerate() {
        let d = derive::Derivation::run(sys, options);
        diagnostics.extend(d.diagnostics.iter().cloned());
        for note in checks::run(&d, &mut diagnostics) {
            if let Some(b) = sys.bodies.get(note.body) {
                composition.insert((si, b.id.clone()), note.json);
                composition_text.insert((si, b.id.clone()), note.text);
            }
        }
        results.push(d.summarize());
    }
    let mut diagnostics = allow::apply(src, &parsed.file.comments, diagnostics);
    diagnostic::sort_diagnostics(&mut diagnostics);
    Analysis {
        file,
        ast: parsed.file,
        model,
        results,
        composition,
        composition_text,
        diagnostics,
    }
}
