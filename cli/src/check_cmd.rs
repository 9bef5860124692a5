//! `syz check`: every file's diagnostics, for people (text), machines (JSON) or code-scanning
//! tools (SARIF), streamed file by file; exit 1 on errors (or warnings with
//! `--deny-warnings`), 2 when a file cannot be read.

use crate::files::{self, load_with_settings};
use crate::render::rendered_diagnostics;
use crate::{json_out, output, render, sarif, CheckFormat};
use std::io::Write;
use std::path::PathBuf;
use syzygy::catalogue::Entry;
use syzygy::diagnostic::Rule;
use syzygy::settings::Layer;
use syzygy::source::SourceDb;

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
    let mut shown_so_far = Shown::default();
    let mut checked = 0usize;
    // Declarations no output uses whose finding is silenced: said in the summary, since
    // nothing else in `check` would show them.
    let mut silenced_unused = 0usize;
    // What the checks between files need of each file, made on the worker (one per file;
    // the parts of a large file add to the same entry).
    let mut entries: Vec<Entry> = Vec::new();
    files::for_each_analysed(
        db,
        &settings,
        |a| {
            let entry = settings.get(a.file.0 as usize).map(|s| Entry::of(&a, s));
            let kinds: Vec<(usize, Rule)> = a
                .diagnostics
                .iter()
                .map(|d| (d.severity as usize, d.rule))
                .collect();
            let (mut text, mut json, mut sarif) = (Vec::new(), Vec::new(), Vec::new());
            let (shown, mut left_out) = syzygy::shown::split(&a.diagnostics);
            let mut severities: Vec<Option<syzygy::diagnostic::Severity>> =
                shown.iter().map(|d| syzygy::shown::quota(d)).collect();
            match format {
                CheckFormat::Human => (text, left_out) = rendered_diagnostics(&a, db, color),
                CheckFormat::Json => (json, left_out) = syzygy::report::diagnostics_json(&a, db),
                CheckFormat::Sarif => {
                    let places = syzygy::source::Places::new(db, a.file);
                    sarif = shown.iter().map(|d| sarif::result(d, &places)).collect();
                    sarif.extend(
                        a.unused
                            .iter()
                            .filter(|u| u.silenced)
                            .filter_map(|u| sarif::suppressed(u, &places)),
                    );
                    // A silenced value's record is shown within the quota of notes.
                    severities.resize(sarif.len(), Some(syzygy::diagnostic::Severity::Note));
                }
            }
            let silenced = a.unused.iter().filter(|u| u.silenced).count();
            (
                kinds,
                text,
                json,
                sarif,
                (a.file, left_out, silenced),
                entry,
                severities,
            )
        },
        |(kinds, text, json, sarif, (file, left_out, silenced), entry, severities),
         last_of_file| {
            silenced_unused += silenced;
            if let Some(e) = entry {
                match entries.last_mut() {
                    Some(last) if last.file == e.file => last.absorb(e),
                    _ => entries.push(e),
                }
            }
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
            // One of the three is filled, by the format; each is cut to the file's quota.
            for t in shown_so_far.admit(text, &severities, left_out) {
                let _ = out.write_all(t.as_bytes());
            }
            json_diags.extend(shown_so_far.admit(json, &severities, 0));
            sarif_results.extend(shown_so_far.admit(sarif, &severities, 0));
            if last_of_file {
                checked += 1;
                if let Some(note) = shown_so_far.end_file(db, file) {
                    if format == CheckFormat::Human {
                        let _ = out.write_all(note.as_bytes());
                    }
                }
            }
        },
    );
    // The checks between files, once every file is read: after the files' own diagnostics.
    let place = |s: syzygy::source::Span| {
        let index = db.line_index(s.file);
        let line = index.line_col(db.text(s.file), s.start as usize).line;
        format!("{}:{line}", db.name(s.file))
    };
    let uncompared = checked >= 2 && entries.iter().all(|e| e.catalogue.is_none());
    for d in syzygy::catalogue::check(&entries, &place) {
        if let Some(c) = counts.get_mut(d.severity as usize) {
            *c += 1;
        }
        if let Some(c) = Rule::ALL
            .iter()
            .position(|r| *r == d.rule)
            .and_then(|i| rule_counts.get_mut(i))
        {
            *c += 1;
        }
        let places = syzygy::source::Places::new(db, d.span.file);
        match format {
            CheckFormat::Human => {
                let text = render::diagnostic(db, &db.line_index(d.span.file), &d, color);
                let _ = out.write_all(text.as_bytes());
            }
            CheckFormat::Json => {
                json_diags.push(syzygy::report::json::Diagnostic::new(&d, &places))
            }
            CheckFormat::Sarif => sarif_results.push(sarif::result(&d, &places)),
        }
    }
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
            let doc = sarif::log(&sarif_results, &loaded.errors, &shown_so_far.lines());
            let _ = writeln!(out, "{}", json_out::pretty(&doc));
        }
        CheckFormat::Json => {
            let doc = syzygy::report::json::CheckDocument {
                version: syzygy::report::JSON_VERSION,
                files: checked,
                diagnostics: &json_diags,
                diagnostics_not_shown: &shown_so_far.not_shown,
                io_errors: &loaded.errors,
                summary: syzygy::report::json::Summary {
                    errors,
                    warnings,
                    notes,
                    rules: syzygy::report::json::Pairs(per_rule.clone()),
                    not_used_silenced: silenced_unused,
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
            // The checks between files compare the files under one project file; said when
            // none is found, so a folder that holds a system twice is not taken for clean.
            if uncompared {
                let _ = writeln!(
                    out,
                    "not compared with each other (system-in-two-files, star-disagrees-across-files, paper-under-two-ids): no syzygy.toml holds these files; an empty one at the catalogue's root turns those checks on"
                );
            }
            if !per_rule.is_empty() {
                let words: Vec<String> = per_rule
                    .iter()
                    .map(|(id, n)| format!("{id}: {n}"))
                    .collect();
                let _ = writeln!(out, "by rule: {}", words.join(", "));
            }
            if silenced_unused > 0 {
                let _ = writeln!(
                    out,
                    "not used: {silenced_unused} declared value{} refused by a silenced rule (`syz eval` lists {}, with why)",
                    plural(silenced_unused),
                    if silenced_unused == 1 { "it" } else { "them" }
                );
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

/// The diagnostics shown per file across the parts of a large file (the first
/// `syzygy::shown::PER_FILE` of each severity), and the files whose diagnostics were not all shown, with how
/// many were left out.
#[derive(Default)]
pub struct Shown {
    pub not_shown: Vec<syzygy::report::json::NotShown>,
    budget: syzygy::shown::Budget,
    left_in_file: usize,
}

impl Shown {
    /// Of the diagnostics one part of a file would show (and the `left_out` it would not),
    /// the ones still to show for the file.
    /// `severities` are the quotas of `shown` (`syzygy::shown::quota`), in its order.
    pub fn admit<X>(
        &mut self,
        shown: Vec<X>,
        severities: &[Option<syzygy::diagnostic::Severity>],
        left_out: usize,
    ) -> Vec<X> {
        let before = shown.len();
        let kept: Vec<X> = shown
            .into_iter()
            .zip(severities)
            .filter(|(_, s)| self.budget.take(**s))
            .map(|(x, _)| x)
            .collect();
        self.left_in_file += left_out + (before - kept.len());
        kept
    }

    /// The last part of `file` is done: the line counting what was not shown of it, if any.
    pub fn end_file(
        &mut self,
        db: &syzygy::source::MemoryDb,
        file: syzygy::source::FileId,
    ) -> Option<String> {
        use syzygy::source::SourceDb;
        let count = std::mem::take(&mut self.left_in_file);
        self.budget = syzygy::shown::Budget::default();
        (count > 0).then(|| {
            self.not_shown.push(syzygy::report::json::NotShown {
                file: db.name(file).to_string(),
                count,
            });
            format!(
                "note: {}: {}\n",
                db.name(file),
                syzygy::shown::rest_words(count)
            )
        })
    }

    pub fn lines(&self) -> Vec<String> {
        self.not_shown
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
