//! Diagnostics for people, rendered with ariadne. Colour only on a terminal and only when
//! `NO_COLOR` is unset.
//!
//! ariadne is shown an excerpt, never the whole file: the lines the diagnostic's spans start
//! and end on (and the first line of each gap between them, all ariadne would print of it),
//! each line longer than [`LONG_LINE`] bytes cut to a window around the spans on it. So one
//! diagnostic costs the size of its excerpt, not of the file (ariadne indexes every line of
//! the text it is given), and a 10 MB line is never printed whole. The excerpt's line numbers
//! are then put back to the file's, counted by the core's `LineIndex` (the same as the JSON
//! output's; ariadne alone would also break lines at form feeds and Unicode separators).

use ariadne::{Color, Config, IndexType, Label, Report, ReportKind, Source};
use std::io::IsTerminal;
use std::ops::Range;
use syzygy::diagnostic::{Diagnostic, Severity};
use syzygy::source::{LineIndex, SourceDb};

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

/// Lines longer than this (in bytes) are shown as a window around the spans on them.
const LONG_LINE: usize = 400;
/// Bytes shown either side of the spans on a long line.
const CONTEXT: usize = 60;
/// The longest window shown of one long line.
const WINDOW: usize = 300;
/// Marks text left out at either end of a window.
const CUT: &str = "…";
/// What the primary span's underline says; the diagnostic's message says the rest.
const PRIMARY_LABEL: &str = "here";
/// The name ariadne is given for the excerpt; replaced by the file's name and position.
const PLACEHOLDER: &str = "\u{1}excerpt\u{1}";

/// One diagnostic with its source lines and labels; `index` is the line index of its file.
pub fn diagnostic(db: &dyn SourceDb, index: &LineIndex, d: &Diagnostic, color: bool) -> String {
    let d = &*printable_diagnostic(d);
    let name = db.name(d.span.file);
    let text = db.text(d.span.file);
    let primary = visible(d.span.range(), text.len());
    let labels: Vec<(Range<usize>, &str)> = d
        .labels
        .iter()
        .filter(|l| l.span.file == d.span.file)
        .map(|l| (visible(l.span.range(), text.len()), l.message.as_str()))
        .collect();
    let mut ranges = vec![primary.clone()];
    ranges.extend(labels.iter().map(|(r, _)| r.clone()));
    let excerpt = Excerpt::new(text, index, &ranges);
    let labels: Vec<(Range<usize>, &str)> =
        labels.iter().map(|(r, m)| (excerpt.range(r), *m)).collect();
    let mut buf = Vec::new();
    let _ = report(d, PLACEHOLDER, excerpt.range(&primary), &labels, color)
        .write((PLACEHOLDER, Source::from(excerpt.text.as_str())), &mut buf);
    let at = index.line_col(text, primary.start);
    notes_in_the_margin(
        d,
        note_header(
            d,
            excerpt.with_file_positions(
                &String::from_utf8_lossy(&buf),
                &format!("{name}:{}:{}", at.line, at.column),
            ),
        ),
    )
}

/// ariadne 0.4 keeps one note per report, so several are given to it as lines of one; it
/// prints the lines after the first at the left edge, outside the report's margin. Each is
/// given the first one's margin and `Note:` instead, as a note of its own.
fn notes_in_the_margin(d: &Diagnostic, rendered: String) -> String {
    let [first, rest @ ..] = d.notes.as_slice() else {
        return rendered;
    };
    if rest.is_empty() {
        return rendered;
    }
    let mut out = String::with_capacity(rendered.len() + 64 * rest.len());
    let mut prefix: Option<String> = None;
    let mut pending = rest.iter();
    let mut next = pending.next();
    for line in rendered.split_inclusive('\n') {
        let text = line.trim_end_matches('\n');
        match (&prefix, next) {
            (Some(p), Some(note)) if text == note.as_str() => {
                out.push_str(p);
                out.push_str(line);
                next = pending.next();
                continue;
            }
            (None, _) if text.ends_with(first.as_str()) => {
                prefix = text.strip_suffix(first.as_str()).map(str::to_string);
            }
            _ => {}
        }
        out.push_str(line);
    }
    out
}

/// A note is called a note, as in every other output and in the docs: ariadne's header for
/// its kind says "Advice".
fn note_header(d: &Diagnostic, rendered: String) -> String {
    if d.severity != Severity::Note {
        return rendered;
    }
    let header = format!("[{}] Advice:", d.rule.id());
    rendered.replacen(&header, &format!("[{}] Note:", d.rule.id()), 1)
}

/// ariadne's report of `d` in the source named `id`, the primary range and the labels
/// given in that source's offsets.
fn report<'a>(
    d: &'a Diagnostic,
    id: &'a str,
    primary: Range<usize>,
    labels: &[(Range<usize>, &'a str)],
    color: bool,
) -> Report<'a, (&'a str, Range<usize>)> {
    let (kind, c) = match d.severity {
        Severity::Error => (ReportKind::Error, Color::Red),
        Severity::Warning => (ReportKind::Warning, Color::Yellow),
        // Renamed "Note" afterwards by `note_header` (a custom kind would be coloured even
        // without colour).
        Severity::Note => (ReportKind::Advice, Color::Cyan),
    };
    let mut report = Report::build(kind, id, primary.start)
        .with_config(
            Config::default()
                .with_color(color)
                .with_index_type(IndexType::Byte),
        )
        .with_code(d.rule.id())
        .with_message(&d.message)
        // ariadne underlines only a label with a message; without colour an unlabelled
        // primary span would not be marked at all.
        .with_label(
            Label::new((id, primary))
                .with_message(PRIMARY_LABEL)
                .with_color(c),
        );
    for (r, message) in labels {
        report = report.with_label(
            Label::new((id, r.clone()))
                .with_message(message)
                .with_color(Color::Blue),
        );
    }
    if !d.notes.is_empty() {
        report = report.with_note(d.notes.join("\n"));
    }
    if let Some(h) = &d.help {
        report = report.with_help(h);
    }
    report.finish()
}

/// Zero-width spans are widened to one character so the renderer can point at them.
fn visible(r: Range<usize>, len: usize) -> Range<usize> {
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

/// One line of the file as it appears in the excerpt.
struct Shown {
    /// 0-based line of the file.
    line: usize,
    /// Where the line starts in the excerpt.
    at: usize,
    /// The line's text in the file, without its line break.
    content: Range<usize>,
    /// The part of it shown.
    window: Range<usize>,
    /// Bytes of the cut mark before the window (0 or `CUT.len()`).
    before: usize,
    /// Length of the line in the excerpt, without its `\n`.
    len: usize,
}

/// The lines a diagnostic shows, as ariadne is given them.
struct Excerpt<'a> {
    text: String,
    lines: Vec<Shown>,
    src: &'a str,
    index: &'a LineIndex,
}

impl<'a> Excerpt<'a> {
    fn new(src: &'a str, index: &'a LineIndex, ranges: &[Range<usize>]) -> Excerpt<'a> {
        let last_char =
            |r: &Range<usize>| floor_boundary(src, r.end.saturating_sub(1).max(r.start));
        let mut marked: Vec<usize> = ranges
            .iter()
            .flat_map(|r| [index.line_at(r.start), index.line_at(last_char(r))])
            .collect();
        marked.sort_unstable();
        marked.dedup();
        // Of a gap between marked lines ariadne prints at most the first line.
        let mut wanted = Vec::with_capacity(2 * marked.len());
        for (i, &l) in marked.iter().enumerate() {
            wanted.push(l);
            if marked.get(i + 1).is_some_and(|&next| next > l + 1) {
                wanted.push(l + 1);
            }
        }
        let mut out = Excerpt {
            text: String::new(),
            lines: Vec::with_capacity(wanted.len()),
            src,
            index,
        };
        for line in wanted {
            let content = index.line_span(src, line).unwrap_or(src.len()..src.len());
            let points: Vec<usize> = ranges
                .iter()
                .flat_map(|r| [r.start, last_char(r)])
                .filter(|p| (content.start..=content.end).contains(p))
                .collect();
            let window = window(src, &content, &points);
            let before = if window.start > content.start {
                CUT.len()
            } else {
                0
            };
            let at = out.text.len();
            if before > 0 {
                out.text.push_str(CUT);
            }
            push_shown(&mut out.text, src.get(window.clone()).unwrap_or(""));
            if window.end < content.end {
                out.text.push_str(CUT);
            }
            let len = out.text.len() - at;
            out.text.push('\n');
            out.lines.push(Shown {
                line,
                at,
                content,
                window,
                before,
                len,
            });
        }
        out
    }

    /// Where a byte offset of the file is in the excerpt (clamped into the window shown).
    fn offset(&self, o: usize) -> usize {
        let line = self.index.line_at(o);
        let i = self
            .lines
            .partition_point(|s| s.line < line)
            .min(self.lines.len().saturating_sub(1));
        let Some(s) = self.lines.get(i) else {
            return 0;
        };
        if s.line != line || o < s.content.start {
            return s.at;
        }
        if o >= s.content.end {
            // On the line break: the excerpt's `\n` (or past it).
            return s.at + s.len + usize::from(o > s.content.end);
        }
        if o < s.window.start {
            return s.at;
        }
        s.at + s.before + (o.min(s.window.end) - s.window.start)
    }

    /// A non-empty range of the file as a non-empty range of the excerpt.
    fn range(&self, r: &Range<usize>) -> Range<usize> {
        let start = self.offset(r.start);
        let last = self.offset(floor_boundary(
            self.src,
            r.end.saturating_sub(1).max(r.start),
        ));
        let width = self
            .text
            .get(last..)
            .and_then(|t| t.chars().next())
            .map_or(1, char::len_utf8);
        start
            ..(last + width)
                .max(start + 1)
                .min(self.text.len().max(start + 1))
    }

    /// ariadne's rendering with the file's name, position and line numbers put back: the
    /// excerpt's line `k` is the file's line `lines[k - 1]`, and the margin is widened for
    /// the file's longest line number.
    fn with_file_positions(&self, rendered: &str, location: &str) -> String {
        let number_of = |k: usize| {
            k.checked_sub(1)
                .and_then(|i| self.lines.get(i))
                .map_or(k, |s| s.line + 1)
        };
        let width = self.lines.last().map_or(1, |s| digits(s.line + 1));
        let mut out = String::with_capacity(rendered.len() + 64);
        let mut extra: Option<usize> = None;
        for line in rendered.split_inclusive('\n') {
            let fixed = match extra {
                None => match line.find(PLACEHOLDER) {
                    Some(p) => {
                        // The header: `{spaces}╭─[NAME:LINE:COL]`; ariadne's margin is
                        // two spaces wider than its widest line number.
                        let rest = line.get(p + PLACEHOLDER.len()..).unwrap_or("");
                        let skip = rest
                            .find(|c: char| !(c.is_ascii_digit() || c == ':'))
                            .unwrap_or(rest.len());
                        let lead = line.len() - line.trim_start_matches(' ').len();
                        let e = width.saturating_sub(lead.saturating_sub(2));
                        extra = Some(e);
                        format!(
                            "{}{}{location}{}",
                            " ".repeat(e),
                            line.get(..p).unwrap_or(""),
                            rest.get(skip..).unwrap_or("")
                        )
                    }
                    None => line.to_string(),
                },
                Some(e) => margin(line, e, number_of),
            };
            out.push_str(&fixed);
        }
        out
    }
}

/// Copy `s` into the excerpt with the characters ariadne would take for line breaks (but
/// the core does not) replaced by visible ones of the same length in bytes.
fn push_shown(out: &mut String, s: &str) {
    for c in s.chars() {
        // Each replacement takes as many bytes as the character it replaces, so the spans'
        // offsets still hold; a control character (a terminal escape that would clear the
        // screen, say) or a bidirectional override is never written to the terminal.
        out.push(match c {
            '\u{b}' | '\u{c}' => ' ',
            '\u{85}' => '·',
            '\u{2028}' | '\u{2029}' => '␤',
            '\t' => c,
            c if c.is_ascii_control() => '?',
            '\u{80}'..='\u{9f}' => '·',
            '\u{202a}'..='\u{202e}' | '\u{2066}'..='\u{2069}' => '\u{fffd}',
            c => c,
        });
    }
}

/// A message's text as the terminal may show it: control characters as their pictures
/// (U+2400 block), bidirectional overrides as U+FFFD; line ends kept.
pub fn printable(s: &str) -> String {
    s.chars()
        .map(|c| match c {
            '\n' | '\t' => c,
            '\u{7f}' => '\u{2421}',
            c if c.is_ascii_control() => char::from_u32(0x2400 + c as u32).unwrap_or('?'),
            '\u{80}'..='\u{9f}' | '\u{202a}'..='\u{202e}' | '\u{2066}'..='\u{2069}' => '\u{fffd}',
            c => c,
        })
        .collect()
}

/// The diagnostic with every text it shows made [`printable`] (a name or a reference's text
/// quoted in a message may hold any character).
fn printable_diagnostic(d: &Diagnostic) -> std::borrow::Cow<'_, Diagnostic> {
    let bad = |s: &str| s != printable(s);
    let any = bad(&d.message)
        || d.labels.iter().any(|l| bad(&l.message))
        || d.notes.iter().any(|n| bad(n))
        || d.help.as_deref().is_some_and(bad);
    if !any {
        return std::borrow::Cow::Borrowed(d);
    }
    let mut d = d.clone();
    d.message = printable(&d.message);
    for l in &mut d.labels {
        l.message = printable(&l.message);
    }
    for n in &mut d.notes {
        *n = printable(n);
    }
    d.help = d.help.as_deref().map(printable);
    std::borrow::Cow::Owned(d)
}

/// The part of a line shown: all of a short line; of a long one, a window around `points`
/// (the span ends on it), or its start when none is on it.
fn window(src: &str, content: &Range<usize>, points: &[usize]) -> Range<usize> {
    if content.len() <= LONG_LINE {
        return content.clone();
    }
    let lo = points.iter().copied().min().unwrap_or(content.start);
    let hi = points.iter().copied().max().unwrap_or(content.start);
    let start = floor_boundary(src, lo.saturating_sub(CONTEXT).max(content.start));
    let end = (hi + CONTEXT)
        .min(start + WINDOW)
        .min(content.end)
        .max(start);
    start..floor_boundary(src, end).max(start)
}

fn floor_boundary(src: &str, mut o: usize) -> usize {
    o = o.min(src.len());
    while o > 0 && !src.is_char_boundary(o) {
        o -= 1;
    }
    o
}

fn digits(n: usize) -> usize {
    n.to_string().len()
}

/// One line of ariadne's output below the header, its margin widened by `extra` columns and
/// its line number (if any) replaced by the file's. ariadne writes margins as
/// `{spaces}{colour}{spaces}{number} │…` or `{spaces}{colour}{spaces}│…`, and the closing
/// line as `{colour}───╯`.
fn margin(line: &str, extra: usize, number_of: impl Fn(usize) -> usize) -> String {
    let s1 = line.len() - line.trim_start_matches(' ').len();
    let after_s1 = line.get(s1..).unwrap_or("");
    let esc = escapes(after_s1);
    let after_esc = after_s1.get(esc..).unwrap_or("");
    let s2 = after_esc.len() - after_esc.trim_start_matches(' ').len();
    let after_s2 = after_esc.get(s2..).unwrap_or("");
    let d = after_s2
        .find(|c: char| !c.is_ascii_digit())
        .unwrap_or(after_s2.len());
    let (number, rest) = after_s2.split_at(d);
    let (lead, colour) = (" ".repeat(s1), after_s1.get(..esc).unwrap_or(""));
    if s1 == 0 && rest.starts_with('─') && number.is_empty() && s2 == 0 {
        // The closing line.
        return format!("{colour}{}{rest}", "─".repeat(extra));
    }
    if s1 == 0 && s2 == 0 && number.is_empty() && !rest.starts_with('│') {
        // Not a margin: the second and later lines of a note, which ariadne writes as they are.
        return line.to_string();
    }
    if !number.is_empty() && rest.starts_with(" │") {
        let shown = number_of(number.parse().unwrap_or(0)).to_string();
        let pad = (s2 + extra + number.len()).saturating_sub(shown.len());
        if esc == 0 {
            let total = (s1 + s2 + extra + number.len()).saturating_sub(shown.len());
            return format!("{}{shown}{rest}", " ".repeat(total));
        }
        return format!("{lead}{colour}{}{shown}{rest}", " ".repeat(pad));
    }
    if !number.is_empty() {
        return line.to_string();
    }
    if s2 == 0 {
        format!("{}{colour}{rest}", " ".repeat(s1 + extra))
    } else {
        format!("{lead}{colour}{}{rest}", " ".repeat(s2 + extra))
    }
}

/// The length of the colour escape sequences (`ESC [ … m`) at the start of `s`.
fn escapes(s: &str) -> usize {
    let mut n = 0;
    while let Some(rest) = s.get(n..).and_then(|r| r.strip_prefix("\u{1b}[")) {
        match rest.find('m') {
            Some(m) => n += 2 + m + 1,
            None => break,
        }
    }
    n
}

/// The diagnostics of an analysis that may be shown (the first `syzygy::shown::PER_FILE`),
/// each rendered for people, and how many more there are. [`crate::check_cmd::Shown`] keeps
/// the count per file across the parts of a large file.
pub fn rendered_diagnostics(
    a: &syzygy::Analysis,
    db: &syzygy::source::MemoryDb,
    color: bool,
) -> (Vec<String>, usize) {
    use syzygy::source::SourceDb;
    let (shown, left_out) = syzygy::shown::split(&a.diagnostics);
    if shown.is_empty() {
        return (Vec::new(), left_out);
    }
    let index = db.line_index(a.file);
    let out = shown
        .iter()
        .map(|d| diagnostic(db, &index, d, color))
        .collect();
    (out, left_out)
}

/// For a table, which has no place for them: one line for each declaration no output uses
/// whose finding is silenced (the others have their diagnostic), saying what and why.
pub fn silenced_unused(a: &syzygy::Analysis, db: &syzygy::source::MemoryDb) -> String {
    let silenced: Vec<&syzygy::unused::Unused> = a.unused.iter().filter(|u| u.silenced).collect();
    if silenced.is_empty() {
        return String::new();
    }
    let places = syzygy::source::Places::new(db, a.file);
    let mut out = String::new();
    for u in silenced {
        let (file, at, _) = places.of(u.span);
        out.push_str(&printable(&format!(
            "syz: note: {file}:{}: `{}` is not in the table: [{}] {} (this finding is silenced)\n",
            at.line,
            u.text,
            u.rule.unwrap_or("?"),
            u.why
        )));
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use syzygy::diagnostic::Rule;
    use syzygy::source::{MemoryDb, SourceDb, Span};

    fn render(text: &str, at: Range<usize>, color: bool) -> String {
        let mut db = MemoryDb::new();
        let f = db.add("t.syz", text);
        let d = Diagnostic::new(Rule::Syntax, Span::new(f, at.start, at.end), "bad")
            .with_help("fix it");
        diagnostic(&db, &LineIndex::new(text), &d, color)
    }

    #[test]
    fn line_numbers_are_the_files_whatever_the_excerpt() {
        let text = format!("{}x = = 1\n", "\n".repeat(12_344));
        let at = text.find("= =").map_or(0..0, |i| i + 2..i + 3);
        let out = render(&text, at.clone(), false);
        assert!(out.contains("╭─[t.syz:12345:5]"), "{out}");
        assert!(out.contains(" 12345 │ x = = 1"), "{out}");
        assert!(out.contains("───────╯"), "{out}");
        // In colour the numbers are the same, inside the margin's colour.
        let coloured = render(&text, at, true);
        assert!(coloured.contains("12345 │"), "{coloured}");
    }

    #[test]
    #[allow(clippy::unwrap_used, clippy::indexing_slicing)]
    fn without_colour_the_primary_span_is_underlined() {
        let text = "x = = 1\n";
        let out = render(text, 4..5, false);
        let lines: Vec<&str> = out.lines().collect();
        let at = lines
            .iter()
            .position(|l| l.ends_with("x = = 1"))
            .unwrap_or_else(|| panic!("{out}"));
        let source_line = lines[at];
        let mark = lines[at + 1];
        let column = source_line.find("= 1").unwrap();
        // The mark sits under the second '=' (one column: '┬' where the arrow leaves).
        assert_eq!(mark.get(column..column + 3), Some("┬"), "{out}");
        assert!(lines[at + 2].ends_with(PRIMARY_LABEL), "{out}");
    }

    #[test]
    fn control_characters_never_reach_the_terminal() {
        // A reference text or a system name may hold a terminal escape that would clear
        // the screen; neither the excerpt nor the message writes it raw.
        let mut db = MemoryDb::new();
        let text = "system \"A\u{1b}[2J\" { star s { mass = \u{1b}[2J } }\n";
        let f = db.add("t.syz", text);
        let at = text.find("\u{1b}[2J }").unwrap_or(0);
        let d = Diagnostic::new(
            Rule::Syntax,
            Span::new(f, at, at + 1),
            "system \"A\u{1b}[2J\" has \u{202e}an override",
        );
        let out = diagnostic(&db, &LineIndex::new(text), &d, false);
        assert!(
            !out.contains('\u{1b}') && !out.contains('\u{202e}'),
            "{out:?}"
        );
        assert!(out.contains("system \"A\u{241b}[2J\""), "{out}");
        // The excerpt keeps its width, so the underline still points at the character.
        assert!(out.contains("mass = ?[2J"), "{out}");
    }

    #[test]
    fn a_note_is_called_a_note() {
        let mut db = MemoryDb::new();
        let text = "x = 1\n";
        let f = db.add("t.syz", text);
        let d = Diagnostic::new(Rule::NotDerivable, Span::new(f, 0, 1), "unused");
        let out = diagnostic(&db, &LineIndex::new(text), &d, false);
        assert!(out.starts_with("[not-derivable] Note: unused"), "{out}");
        assert!(!out.contains("Advice"), "{out}");
        let coloured = diagnostic(&db, &LineIndex::new(text), &d, true);
        assert!(coloured.contains("Note:"), "{coloured}");
        assert!(!coloured.contains("Advice"), "{coloured}");
    }

    /// ariadne given the whole file: what the excerpts must reproduce on ordinary files.
    fn whole_file(db: &MemoryDb, d: &Diagnostic, color: bool) -> String {
        let name = db.name(d.span.file);
        let text = db.text(d.span.file);
        let labels: Vec<(Range<usize>, &str)> = d
            .labels
            .iter()
            .map(|l| (visible(l.span.range(), text.len()), l.message.as_str()))
            .collect();
        let primary = visible(d.span.range(), text.len());
        let mut buf = Vec::new();
        let _ =
            report(d, name, primary, &labels, color).write((name, Source::from(text)), &mut buf);
        notes_in_the_margin(
            d,
            note_header(d, String::from_utf8_lossy(&buf).into_owned()),
        )
    }

    #[test]
    fn every_note_is_in_the_margin_with_its_own_label() {
        let src = "system \"S\" { star s { mass = 1 Msun } }\n";
        let mut db = MemoryDb::new();
        let f = db.add("n.syz", src);
        let d = Diagnostic::new(
            syzygy::diagnostic::Rule::Inconsistent,
            syzygy::source::Span::new(f, 24, 37),
            "message",
        )
        .with_note("the first note")
        .with_note("the second note")
        .with_note("the third note");
        let out = diagnostic(&db, &LineIndex::new(src), &d, false);
        for n in ["first", "second", "third"] {
            assert!(out.contains(&format!("   │ Note: the {n} note\n")), "{out}");
        }
        assert!(!out.lines().any(|l| l.starts_with("the ")), "{out}");
    }

    #[test]
    fn excerpts_render_ordinary_files_exactly_as_the_whole_file() {
        // Labels on other lines, far apart (a gap between them), notes and help, in colour
        // and without.
        let far = format!(
            "system \"Twice\" {{ star a {{ }} }}\n{}system \"Twice\" {{ star a {{ }} star a {{ }} }}\n",
            "# filler\n".repeat(120)
        );
        // A label over many lines (a system never closed, to the end of the file).
        let open = format!(
            "system \"Open\" {{\n  star s {{\n    mass = 1 Msun\n  }}\n{}",
            "  # filler\n".repeat(30)
        );
        let sources = [
            include_str!("../../examples/broken/every-rule.syz").to_string(),
            include_str!("../../examples/broken/language-errors.syz").to_string(),
            far,
            open,
        ];
        let mut seen = 0;
        for src in &sources {
            let mut db = MemoryDb::new();
            let f = db.add("demo.syz", src.as_str());
            let a = syzygy::analyze(f, src, &syzygy::Options::linear().into());
            let index = LineIndex::new(src);
            for d in &a.diagnostics {
                for color in [false, true] {
                    assert_eq!(
                        diagnostic(&db, &index, d, color),
                        whole_file(&db, d, color),
                        "{}",
                        d.message
                    );
                }
                seen += usize::from(!d.labels.is_empty());
            }
        }
        assert!(seen >= 4, "too few diagnostics with labels: {seen}");
    }

    #[test]
    fn a_long_line_is_shown_as_a_window_around_the_span() {
        let text = format!("{}@{}\n", "{".repeat(1_000_000), "}".repeat(1_000_000));
        let at = text.find('@').map_or(0..0, |i| i..i + 1);
        let out = render(&text, at, false);
        assert!(out.len() < 2_000, "{} bytes", out.len());
        assert!(out.contains("[t.syz:1:1000001]"), "{out}");
        assert!(out.contains(&format!("…{}@", "{".repeat(CONTEXT))), "{out}");
        assert!(out.contains("}…"), "{out}");
    }
}
