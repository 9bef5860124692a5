//! `syz eval`: every declared and derived quantity, as text, JSON or CSV, streamed file by
//! file with the files' diagnostics on standard error.

use crate::check_cmd::Shown;
use crate::files::{self, load_with_settings};
use crate::render::rendered_diagnostics;
use crate::{csv_out, json_out, output, render, votable_out, EvalFormat, TableArg};
use std::io::Write;
use std::path::PathBuf;
use syzygy::settings::Layer;
use syzygy::{Options, Propagation, Settings};

pub fn run(
    paths: &[PathBuf],
    format: EvalFormat,
    table: Option<TableArg>,
    compact: bool,
    flags: &Layer,
    read: files::ReadArgs,
) -> u8 {
    // A table chosen for a format that writes none would be dropped without a word.
    let table = match (table, format) {
        (Some(_), EvalFormat::Human | EvalFormat::Json) => {
            eprintln!("syz: error: --table chooses the table of --format csv or --format votable; add one of them (the text and JSON outputs hold every value already)");
            return 2;
        }
        (t, _) => t.unwrap_or(TableArg::Planets),
    };
    let Some((loaded, settings)) = load_with_settings(paths, flags, read) else {
        return 2;
    };
    let options = settings.first().map_or_else(
        || Settings::resolve(None, flags).options,
        |s| s.options.clone(),
    );
    let db = &loaded.db;
    let mut out = output::stdout();
    let mut errors = false;
    // Every format is streamed: files are analysed in parallel batches, each analysis is
    // turned into its output on the worker and dropped, and the outputs are written in file
    // order, so memory does not grow with the number of files.
    match format {
        EvalFormat::Json => {
            let head = syzygy::report::json::EvalHead {
                version: syzygy::report::JSON_VERSION,
                options: syzygy::report::json::Options::new(&options),
            };
            let style = if compact {
                json_out::Style::Compact
            } else {
                json_out::Style::Pretty
            };
            let mut doc = json_out::Document::start(&mut out, &head, style);
            let mut diags = Vec::new();
            let mut shown = Shown::default();
            files::for_each_analysed(
                db,
                &settings,
                |a| {
                    let systems: Vec<String> = syzygy::report::systems_json(&a, db)
                        .iter()
                        .map(|s| style.render(s))
                        .collect();
                    let diagnostics = syzygy::report::diagnostics_json(&a, db);
                    let severities = shown_severities(&a);
                    (a.has_errors(), systems, diagnostics, a.file, severities)
                },
                |(bad, systems, (d, left_out), file, severities), last_of_file| {
                    errors |= bad;
                    diags.extend(shown.admit(d, &severities, left_out));
                    if last_of_file {
                        let _ = shown.end_file(db, file);
                    }
                    for s in &systems {
                        doc.system(s);
                    }
                },
            );
            let tail = syzygy::report::json::EvalTail {
                diagnostics: &diags,
                diagnostics_not_shown: &shown.not_shown,
                io_errors: &loaded.errors,
            };
            if let Err(e) = doc.finish(&tail) {
                // A reader that stops early (`| head`) is not an error of ours.
                if e.kind() != std::io::ErrorKind::BrokenPipe {
                    eprintln!("syz: error: writing the output failed: {e}");
                    return 2;
                }
            }
        }
        EvalFormat::Csv => {
            let header = csv_out::header(table)
                .map_err(std::io::Error::other)
                .and_then(|h| out.write_all(&h))
                .err();
            let (bad, failure) = stream_per_file(
                db,
                &settings,
                &mut out,
                (render::stderr_color(), true),
                |a| {
                    (
                        csv_out::rows(a, db, table).map_err(std::io::Error::other),
                        (),
                    )
                },
                |()| {},
            );
            errors |= bad;
            if table_write_failed(header.or(failure)) {
                return 2;
            }
        }
        EvalFormat::Votable => {
            let mut refs: Vec<[String; 3]> = Vec::new();
            // (file, id) of those listed: a file read in parts names its references in
            // every part, and a scan of the list for each would be quadratic.
            let mut listed: std::collections::HashSet<(String, String)> =
                std::collections::HashSet::new();
            let mut files_with_errors = 0usize;
            let head = out
                .write_all(votable_out::head(&propagation_words(&options), table).as_bytes())
                .err();
            let (bad, failure) = stream_per_file(
                db,
                &settings,
                &mut out,
                (render::stderr_color(), true),
                |a| {
                    let (rows, refs) = votable_out::rows(a, db, table);
                    (Ok(rows.into_bytes()), (refs, a.has_errors()))
                },
                |(more, bad)| {
                    files_with_errors += usize::from(bad);
                    // A file read in parts names its references in every part.
                    for r in more {
                        if listed.insert((r[0].clone(), r[1].clone())) {
                            refs.push(r);
                        }
                    }
                },
            );
            errors |= bad;
            let tail = votable_out::tail(&refs, loaded.errors.len(), files_with_errors);
            let failure = head.or(failure).or_else(|| {
                out.write_all(tail.as_bytes())
                    .and_then(|()| out.flush())
                    .err()
            });
            if table_write_failed(failure) {
                return 2;
            }
        }
        EvalFormat::Human => {
            let color = render::use_color() && render::stderr_color();
            let (bad, _) = stream_per_file(
                db,
                &settings,
                &mut out,
                (color, false),
                |a| {
                    (
                        Ok(render::printable(&syzygy::report::eval_text(a, db)).into_bytes()),
                        (),
                    )
                },
                |()| {},
            );
            errors |= bad;
        }
    }
    files::report_io_errors(&loaded.errors);
    if !loaded.errors.is_empty() {
        2
    } else if errors {
        1
    } else {
        0
    }
}

/// Analyse every file and write `body` of each to `out` in file order, as it comes; the
/// files' diagnostics, rendered for people, go to standard error after all of it (for a
/// `table`, with a line for each value it leaves out whose finding is silenced). Returns
/// whether any file has errors, and the first failure to make or write a body (later bodies
/// are not written after one). `body` also returns something for `keep`, which sees it in
/// file order.
fn stream_per_file<X: Send>(
    db: &syzygy::source::MemoryDb,
    settings: &[Settings],
    out: &mut impl Write,
    (color, table): (bool, bool),
    body: impl Fn(&syzygy::Analysis) -> (std::io::Result<Vec<u8>>, X) + Sync,
    mut keep: impl FnMut(X),
) -> (bool, Option<std::io::Error>) {
    let mut errors = false;
    let mut failure = None;
    let mut rendered = String::new();
    let mut shown = Shown::default();
    files::for_each_analysed(
        db,
        settings,
        |a| {
            let unused = if table {
                render::silenced_unused(&a, db)
            } else {
                String::new()
            };
            (
                a.has_errors(),
                body(&a),
                (rendered_diagnostics(&a, db, color), unused),
                (a.file, shown_severities(&a)),
            )
        },
        |(bad, (bytes, extra), ((diags, left_out), unused), (file, severities)), last_of_file| {
            errors |= bad;
            keep(extra);
            rendered.extend(shown.admit(diags, &severities, left_out));
            rendered.push_str(&unused);
            if last_of_file {
                rendered.extend(shown.end_file(db, file));
            }
            if failure.is_none() {
                failure = bytes.and_then(|b| out.write_all(&b)).err();
            }
        },
    );
    if failure.is_none() {
        failure = out.flush().err();
    }
    let _ = std::io::stderr().lock().write_all(rendered.as_bytes());
    (errors, failure)
}

/// Say so when writing a table failed; a reader that stops early (`| head`) is not an error
/// of ours.
fn table_write_failed(failure: Option<std::io::Error>) -> bool {
    match failure.filter(|e| e.kind() != std::io::ErrorKind::BrokenPipe) {
        Some(e) => {
            eprintln!("syz: error: writing the table failed: {e}");
            true
        }
        None => false,
    }
}

/// How the uncertainties shown were propagated, in words.
pub fn propagation_words(options: &Options) -> String {
    match options.propagation {
        Propagation::MonteCarlo if options.adaptive => format!(
            "Monte Carlo, adaptive: from {} samples, doubled until every value is stable to the digits shown \
             (seed {}); derived values are sample medians with 16th-84th percentile ranges",
            options.samples, options.seed
        ),
        Propagation::MonteCarlo => format!(
            "Monte Carlo, {} samples (seed {}); derived values are sample medians with 16th-84th percentile ranges",
            options.samples, options.seed
        ),
        Propagation::Linear => {
            "first order (linear) from the measurements' standard uncertainties".to_string()
        }
    }
}

/// The severities of the diagnostics of `a` that are shown, in their order (for
/// [`Shown::admit`] across the parts of a large file).
fn shown_severities(a: &syzygy::Analysis) -> Vec<Option<syzygy::diagnostic::Severity>> {
    syzygy::shown::split(&a.diagnostics)
        .0
        .iter()
        .map(|d| syzygy::shown::quota(d))
        .collect()
}
