//! `syz check`: every file's diagnostics, for people (text), machines (JSON) or code-scanning
//! tools (SARIF), streamed file by file; exit 1 on errors (or warnings with
//! `--deny-warnings`), 2 when a file cannot be read.

use crate::files::{self, load_with_settings};
use crate::render::rendered_diagnostics;
use crate::{json_out, output, render, sarif, CheckFormat};
use std::io::Write;
use std::path::PathBuf;
use syzygy::diagnostic::Rule;
use syzygy::settings::Layer;

pub fn run(
    paths: &[PathBuf],
    format: CheckFormat,
    deny_warnings: bool,
    flags: &Layer,
    read: files::ReadArgs,
) -> u8 {
    let Some((loaded, settings)) = load_with_settings(paths, flags, read) else {
        return 2;
    };
    let db = &loaded.db;
    let mut out = output::stdout();
    // Streamed like `eval`: each file's diagnostics are rendered (for people) or turned into
    // JSON or SARIF results on the worker that analysed it, and the analysis is dropped.
    let color = render::use_color();
    let mut counts = [0usize; 3];
    let mut rule_counts = vec![0usize; Rule::ALL.len()];
    let mut json_diags = Vec::new();
    let mut sarif_results = Vec::new();
    let mut not_shown = NotShown::default();
    let mut checked = 0usize;
    files::for_each_analysed(
        db,
        &settings,
        |a| {
            let kinds: Vec<(usize, Rule)> = a
                .diagnostics
                .iter()
                .map(|d| (d.severity as usize, d.rule))
                .collect();
            let mut text = String::new();
            let (mut json, mut sarif) = (Vec::new(), Vec::new());
            let (shown, left_out) = syzygy::shown::split(&a.diagnostics);
            match format {
                CheckFormat::Human => text = rendered_diagnostics(&a, db, color),
                CheckFormat::Json => json = syzygy::report::diagnostics_json(&a, db).0,
                CheckFormat::Sarif => {
                    let places = syzygy::source::Places::new(db, a.file);
                    sarif = shown.iter().map(|d| sarif::result(d, &places)).collect();
                }
            }
            (kinds, text, json, sarif, (a.file, left_out))
        },
        |(kinds, text, json, sarif, (file, left_out))| {
            checked += 1;
            not_shown.add(db, file, left_out);
            for (severity, rule) in kinds {
                if let Some(c) = counts.get_mut(severity) {
                    *c += 1;
                }
                if let Some(c) = Rule::ALL
                    .iter()
                    .position(|r| *r == rule)
                    .and_then(|i| rule_counts.get_mut(i))
                {
                    *c += 1;
                }
            }
            let _ = out.write_all(text.as_bytes());
            json_diags.extend(json);
            sarif_results.extend(sarif);
        },
    );
    let (notes, warnings, errors) = (counts[0], counts[1], counts[2]);
    // Counts per rule id, in the catalogue's order (the order of docs/rules.md).
    let per_rule: Vec<(&'static str, usize)> = Rule::ALL
        .iter()
        .zip(&rule_counts)
        .filter(|(_, n)| **n > 0)
        .map(|(r, n)| (r.id(), *n))
        .collect();
    match format {
        CheckFormat::Sarif => {
            let doc = sarif::log(&sarif_results, &loaded.errors, &not_shown.lines());
            let _ = writeln!(out, "{}", json_out::pretty(&doc));
        }
        CheckFormat::Json => {
            let doc = syzygy::report::json::CheckDocument {
                version: syzygy::report::JSON_VERSION,
                files: checked,
                diagnostics: &json_diags,
                diagnostics_not_shown: &not_shown.0,
                io_errors: &loaded.errors,
                summary: syzygy::report::json::Summary {
                    errors,
                    warnings,
                    notes,
                    rules: syzygy::report::json::Pairs(per_rule.clone()),
                },
            };
            let _ = writeln!(out, "{}", json_out::pretty(&doc));
        }
        CheckFormat::Human => {
            let _ = writeln!(
                out,
                "checked {} file{}: {} error{}, {} warning{}, {} note{}",
                checked,
                plural(checked),
                errors,
                plural(errors),
                warnings,
                plural(warnings),
                notes,
                plural(notes)
            );
            if !per_rule.is_empty() {
                let words: Vec<String> = per_rule
                    .iter()
                    .map(|(id, n)| format!("{id}: {n}"))
                    .collect();
                let _ = writeln!(out, "by rule: {}", words.join(", "));
            }
        }
    }
    files::report_io_errors(&loaded.errors);
    if !loaded.errors.is_empty() {
        2
    } else if errors > 0 || (deny_warnings && warnings > 0) {
        1
    } else {
        0
    }
}

/// The files whose diagnostics were not all shown, with how many were left out.
#[derive(Default)]
pub struct NotShown(pub Vec<syzygy::report::json::NotShown>);

impl NotShown {
    pub fn add(
        &mut self,
        db: &syzygy::source::MemoryDb,
        file: syzygy::source::FileId,
        count: usize,
    ) {
        use syzygy::source::SourceDb;
        if count > 0 {
            self.0.push(syzygy::report::json::NotShown {
                file: db.name(file).to_string(),
                count,
            });
        }
    }

    pub fn lines(&self) -> Vec<String> {
        self.0
            .iter()
            .map(|n| format!("{}: {}", n.file, syzygy::shown::rest_words(n.count)))
            .collect()
    }
}

pub fn plural(n: usize) -> &'static str {
    if n == 1 {
        ""
    } else {
        "s"
    }
}
