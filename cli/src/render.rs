//! Diagnostics for people, rendered with ariadne. Colour only on a terminal and only when
//! `NO_COLOR` is unset.

use ariadne::{Color, Config, IndexType, Label, Report, ReportKind, Source};
use std::io::IsTerminal;
use syzygy::diagnostic::{Diagnostic, Severity};
use syzygy::source::SourceDb;

pub fn use_color() -> bool {
    color_allowed() && std::io::stdout().is_terminal()
}

/// Colour for what goes to standard error (NO_COLOR is honoured there too).
pub fn stderr_color() -> bool {
    color_allowed() && std::io::stderr().is_terminal()
}

/// The NO_COLOR convention (no-color.org): set and not empty means no colour.
fn color_allowed() -> bool {
    std::env::var_os("NO_COLOR").is_none_or(|v| v.is_empty())
}

/// One diagnostic with its source lines and labels.
pub fn diagnostic(db: &dyn SourceDb, d: &Diagnostic, color: bool) -> String {
    let name = db.name(d.span.file).to_string();
    let text = db.text(d.span.file);
    let (kind, c) = match d.severity {
        Severity::Error => (ReportKind::Error, Color::Red),
        Severity::Warning => (ReportKind::Warning, Color::Yellow),
        Severity::Note => (ReportKind::Advice, Color::Cyan),
    };
    let range = visible(d.span.range(), text.len());
    let mut report = Report::build(kind, name.clone(), range.start)
        .with_config(
            Config::default()
                .with_color(color)
                .with_index_type(IndexType::Byte),
        )
        .with_code(d.rule.id())
        .with_message(&d.message)
        .with_label(Label::new((name.clone(), range)).with_color(c));
    for l in &d.labels {
        if l.span.file == d.span.file {
            report = report.with_label(
                Label::new((name.clone(), visible(l.span.range(), text.len())))
                    .with_message(&l.message)
                    .with_color(Color::Blue),
            );
        }
    }
    if !d.notes.is_empty() {
        report = report.with_note(d.notes.join("\n"));
    }
    if let Some(h) = &d.help {
        report = report.with_help(h);
    }
    let mut buf = Vec::new();
    let _ = report.finish().write((name, Source::from(text)), &mut buf);
    String::from_utf8_lossy(&buf).into_owned()
}

/// Zero-width spans are widened to one character so the renderer can point at them.
fn visible(r: std::ops::Range<usize>, len: usize) -> std::ops::Range<usize> {
    let start = r.start.min(len);
    let end = r.end.min(len).max(start);
    if end > start {
        start..end
    } else if start < len {
        start..start + 1
    } else {
        start.saturating_sub(1)..start
    }
}
