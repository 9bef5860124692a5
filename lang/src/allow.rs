//! Silencing comments: `# allow(rule-id): reason`.
//!
//! A comment of that form silences diagnostics of the named rules (several may be listed,
//! separated by commas). At the end of a line it covers that line; on a line of its own it
//! covers the next line that is not itself only a comment. A diagnostic is covered when its
//! primary span starts on a covered line. An allow comment that silences nothing, or that
//! names a rule that does not exist, is reported as `unused-allow` (which cannot itself be
//! silenced).

use crate::ast::Comment;
use crate::diagnostic::{Diagnostic, Rule};
use crate::source::{LineIndex, Region, Span};

/// One parsed silencing comment.
#[derive(Debug, Clone, PartialEq)]
pub struct Allow {
    /// Each rule id as written, with its span.
    pub rules: Vec<(String, Span)>,
    pub reason: String,
    pub span: Span,
    /// The 0-based line it covers, if any.
    pub covers: Option<usize>,
}

/// A rule id as written and its byte range within the comment.
pub type RuleId = (String, std::ops::Range<usize>);

/// Parse the text of one comment (`# allow(a, b): why`) into rule ids with byte ranges
/// relative to the comment's start, and the reason.
pub fn parse_comment(text: &str) -> Option<(Vec<RuleId>, String)> {
    let rest = text.strip_prefix('#')?;
    let lead = rest.len() - rest.trim_start().len();
    let rest = rest.trim_start().strip_prefix("allow(")?;
    let open = 1 + lead + "allow(".len();
    let close = rest.find(')')?;
    let inside = rest.get(..close)?;
    let mut ids = Vec::new();
    let mut pos = open;
    for part in inside.split(',') {
        let trimmed = part.trim();
        let lead = part.len() - part.trim_start().len();
        if !trimmed.is_empty() {
            ids.push((trimmed.to_string(), pos + lead..pos + lead + trimmed.len()));
        }
        pos += part.len() + 1;
    }
    if ids.is_empty() {
        return None;
    }
    let after = rest.get(close + 1..).unwrap_or("").trim_start();
    let reason = after.strip_prefix(':').unwrap_or(after).trim().to_string();
    Some((ids, reason))
}

/// Every silencing comment of a file, with the line each covers.
pub fn collect(src: &str, comments: &[Comment]) -> Vec<Allow> {
    collect_in(src, &Region::whole(src), comments)
}

/// The silencing comments of one region of a file (a part of it read on its own, or all
/// of it). Lines are counted from the region's start, so that a part of a large file pays
/// only for its own lines; `covers` is relative to the region.
fn collect_in(src: &str, region: &Region, comments: &[Comment]) -> Vec<Allow> {
    let parsed: Vec<(&Comment, _)> = comments
        .iter()
        .filter_map(|c| parse_comment(&c.text).map(|p| (c, p)))
        .collect();
    if parsed.is_empty() {
        // Nothing to place: no line index (a file of 10 million lines need not pay for one).
        return Vec::new();
    }
    let text = src.get(region.start..region.end).unwrap_or_default();
    let index = LineIndex::new(text);
    let line_text = |l: usize| index.line_span(text, l).and_then(|r| text.get(r));
    let mut out = Vec::new();
    // The last search for the line below a comment: where it started and what it found. A
    // comment in a stack of comment lines covers what the one above it covers, found once
    // (a search per comment made a stack of thousands quadratic).
    let mut below: Option<(usize, Option<usize>)> = None;
    for (c, (ids, reason)) in parsed {
        let start = c.span.start as usize;
        let line = index.line_at(start.saturating_sub(region.start));
        let covers = if c.trailing {
            Some(line)
        } else {
            match below {
                Some((from, found)) if from < line && found.is_none_or(|f| line < f) => found,
                _ => {
                    let found = (line + 1..index.line_count())
                        .find(|l| !line_text(*l).is_some_and(|t| t.trim_start().starts_with('#')));
                    below = Some((line, found));
                    found
                }
            }
        }
        .filter(|l| line_text(*l).is_some_and(|t| !t.trim().is_empty()));
        out.push(Allow {
            rules: ids
                .into_iter()
                .map(|(id, r)| (id, Span::new(c.span.file, start + r.start, start + r.end)))
                .collect(),
            reason,
            span: c.span,
            covers,
        });
    }
    out
}

/// Drop the diagnostics that silencing comments cover and report the comments that cover
/// nothing. The result still needs sorting.
pub fn apply(src: &str, comments: &[Comment], diags: Vec<Diagnostic>) -> Vec<Diagnostic> {
    apply_in(src, &Region::whole(src), comments, diags)
}

/// [`apply`] to the comments and diagnostics of one region of a file.
pub fn apply_in(
    src: &str,
    region: &Region,
    comments: &[Comment],
    diags: Vec<Diagnostic>,
) -> Vec<Diagnostic> {
    let allows = collect_in(src, region, comments);
    if allows.is_empty() {
        return diags;
    }
    let index = LineIndex::new(src.get(region.start..region.end).unwrap_or_default());
    let mut used = vec![false; allows.iter().map(|a| a.rules.len()).sum()];
    // Each rule id of each comment, by the line it covers, with its slot in `used`.
    let mut by_line: rustc_hash::FxHashMap<usize, Vec<(usize, &str)>> = Default::default();
    let mut slot = 0;
    for a in &allows {
        for (id, _) in &a.rules {
            if let Some(l) = a.covers {
                by_line.entry(l).or_default().push((slot, id.as_str()));
            }
            slot += 1;
        }
    }
    let mut out = Vec::with_capacity(diags.len());
    for d in diags {
        let line = index
            .utf8_position((d.span.start as usize).saturating_sub(region.start))
            .0 as usize;
        let mut silenced = false;
        if d.rule != Rule::UnusedAllow && !d.rule.is_fixed() {
            for (slot, id) in by_line.get(&line).map_or(&[][..], Vec::as_slice) {
                if *id == d.rule.id() {
                    silenced = true;
                    if let Some(u) = used.get_mut(*slot) {
                        *u = true;
                    }
                }
            }
        }
        if !silenced {
            out.push(d);
        }
    }
    let mut slot = 0;
    for a in &allows {
        for (id, span) in &a.rules {
            let was_used = used.get(slot).copied().unwrap_or(false);
            slot += 1;
            if was_used {
                continue;
            }
            if let Some(rule) = Rule::from_id(id).filter(|r| r.is_fixed()) {
                out.push(
                    Diagnostic::new(
                        Rule::UnusedAllow,
                        *span,
                        format!(
                            "'{}' cannot be silenced, so this comment silences nothing",
                            rule.id()
                        ),
                    )
                    .with_note(format!(
                        "{}; silencing it would make them disappear without a word",
                        rule.why_fixed()
                    ))
                    .with_help("fix the error instead, and remove the comment"),
                );
            } else if Rule::from_id(id).is_none() {
                let mut d = Diagnostic::new(
                    Rule::UnusedAllow,
                    *span,
                    format!("'{id}' is not a rule, so this comment silences nothing"),
                );
                let ids = Rule::ALL.iter().map(|r| r.id());
                d = match crate::text::closest(id, ids) {
                    Some(s) => d.with_help(format!("did you mean '{s}'?")),
                    None => d.with_help("the rules are listed in docs/language.md"),
                };
                out.push(d);
            } else {
                let what = match a.covers {
                    Some(l) => format!("line {}", region.first_line + l + 1),
                    None => "the line it covers".to_string(),
                };
                out.push(
                    Diagnostic::new(
                        Rule::UnusedAllow,
                        *span,
                        format!("nothing on {what} is reported as '{id}', so this comment silences nothing"),
                    )
                    .with_help("remove the comment, or move it to the line it is meant for"),
                );
            }
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::source::FileId;

    fn analyze(src: &str) -> Vec<(String, u32)> {
        let a = crate::analyze(FileId(0), src, &crate::Settings::linear());
        let idx = LineIndex::new(src);
        a.diagnostics
            .iter()
            .map(|d| {
                (
                    d.rule.id().to_string(),
                    idx.utf8_position(d.span.start as usize).0 + 1,
                )
            })
            .collect()
    }

    #[test]
    fn parses_ids_and_reason() {
        let (ids, reason) = parse_comment("# allow(unit-mismatch, inconsistent): known").unwrap();
        assert_eq!(ids.len(), 2);
        assert_eq!(ids[0].0, "unit-mismatch");
        assert_eq!(
            &"# allow(unit-mismatch, inconsistent): known"[ids[1].1.clone()],
            "inconsistent"
        );
        assert_eq!(reason, "known");
        assert!(parse_comment("# allowed to fail").is_none());
        assert!(parse_comment("# allow(oops").is_none());
        assert!(parse_comment("# allow(): x").is_none());
    }

    const BAD: &str = "system \"Tessaly\" {\n  star t { mass = 1.1 Msun }\n  planet b orbits t {\n    period = 12 m/s\n  }\n}\n";

    #[test]
    fn trailing_comment_silences_its_line() {
        assert_eq!(analyze(BAD), [("unit-mismatch".to_string(), 4)]);
        let src = BAD.replace("12 m/s", "12 m/s # allow(unit-mismatch): testing");
        assert_eq!(analyze(&src), []);
    }

    /// Each comment of a stack covers the code line below the stack (found once for the
    /// stack); a stack further down covers its own line, and one at the end covers nothing.
    #[test]
    fn every_comment_of_a_stack_covers_the_line_below_it() {
        let src = "# allow(inconsistent): a\n# plain\n# allow(unit-mismatch): b\nx = 1\n  # allow(duplicate): c\n# allow(out-of-range): d\n\ny = 2 # allow(syntax): e\n# allow(io): f\n# allow(io): g\n";
        let comments: Vec<Comment> = crate::parser::parse(crate::source::FileId(0), src)
            .file
            .comments;
        let covers: Vec<(String, Option<usize>)> = collect(src, &comments)
            .into_iter()
            .map(|a| (a.reason, a.covers))
            .collect();
        let want = [
            ("a", Some(3)),
            ("b", Some(3)),
            // A blank line below: nothing.
            ("c", None),
            ("d", None),
            ("e", Some(7)),
            ("f", None),
            ("g", None),
        ];
        assert_eq!(
            covers,
            want.map(|(r, l)| (r.to_string(), l)).to_vec(),
            "{src}"
        );
    }

    #[test]
    fn comment_above_silences_the_next_code_line() {
        let src = BAD.replace(
            "    period",
            "    # allow(unit-mismatch): testing\n    # another comment\n    period",
        );
        assert_eq!(analyze(&src), []);
    }

    #[test]
    fn a_syntax_error_cannot_be_silenced() {
        // The mass is not read (a decimal comma): silencing that would lose it silently.
        let src = "system \"Pellomar\" {\n  star p {\n    mass = 1,05 ± 0.04 Msun  # allow(syntax): reason\n  }\n}\n";
        let a = crate::analyze(FileId(0), src, &crate::Settings::linear());
        let rules: Vec<&str> = a.diagnostics.iter().map(|d| d.rule.id()).collect();
        assert!(rules.contains(&"syntax"), "{rules:?}");
        let unused = a
            .diagnostics
            .iter()
            .find(|d| d.rule == Rule::UnusedAllow)
            .expect("the comment is pointed out");
        assert!(
            unused.message.contains("'syntax' cannot be silenced"),
            "{}",
            unused.message
        );
        // Nor does the editor offer to.
        let d = a
            .diagnostics
            .iter()
            .find(|d| d.rule == Rule::Syntax)
            .unwrap();
        let actions = crate::ide::actions::actions(&a, src, d.span.range());
        assert!(
            actions.iter().all(|x| !x.title.starts_with("Silence")),
            "{:?}",
            actions.iter().map(|x| &x.title).collect::<Vec<_>>()
        );
    }

    #[test]
    fn unused_and_unknown_allows_are_reported() {
        let src = BAD.replace("star t {", "star t { # allow(inconsistent): nothing here\n");
        let got = analyze(&src);
        assert!(got.contains(&("unused-allow".to_string(), 2)), "{got:?}");
        assert!(got.contains(&("unit-mismatch".to_string(), 5)), "{got:?}");
        let src = BAD.replace("12 m/s", "12 m/s # allow(unit-mismatc): typo");
        let a = crate::analyze(FileId(0), &src, &crate::Settings::linear());
        let rules: Vec<&str> = a.diagnostics.iter().map(|d| d.rule.id()).collect();
        assert_eq!(rules, ["unit-mismatch", "unused-allow"]);
        let d = &a.diagnostics[1];
        assert_eq!(d.help.as_deref(), Some("did you mean 'unit-mismatch'?"));
        assert_eq!(&src[d.span.range()], "unit-mismatc");
    }
}
