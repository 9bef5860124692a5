//! Golden tests of what an editor shows: the hover Markdown at chosen places and the inlay
//! hints of each system of `tests/fixtures/eval/`, from the core functions the language
//! server calls (`syzygy::ide::hover::hover`, `syzygy::ide::hints::hints`), analysed with the
//! settings the server uses when there is no project file. Places are found by what stands
//! there (`syzygy_e2e::offset_of`), never by counted columns. Review changes with
//! `cargo insta review`, and check the numbers, not only that they changed.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use std::fmt::Write;
use std::path::Path;
use syzygy::ide::{hints, hover, symbols};
use syzygy::settings::EditorSettings;
use syzygy::source::{FileId, LineIndex};
use syzygy::Analysis;
use syzygy_e2e::offset_of;

/// Where to hover in each fixture: a needle with `|` at the place, and which occurrence
/// (from 0). Each fixture must have an entry, so a new fixture gets its hovers chosen.
const HOVERS: &[(&str, &[(&str, usize)])] = &[
    (
        "asymmetric.syz",
        &[("|radius", 0), ("|transit_depth", 0), ("planet |b", 0)],
    ),
    (
        "eccentric.syz",
        &[("|eccentricity", 0), ("|impact", 0), ("planet |b", 0)],
    ),
    (
        "expressions.syz",
        &[
            ("let |year", 0),
            ("0.1 * |year", 0),
            ("|ratio *", 0),
            ("kestrine.|radius", 0),
            ("|radius       = ratio", 0),
            ("|period", 0),
        ],
    ),
    (
        "limits.syz",
        &[
            ("|rv_amplitude", 0),
            ("|eccentricity  <", 0),
            ("|mass   > 0.5", 0),
            ("planet |c", 0),
        ],
    ),
    ("rv-only.syz", &[("|rv_amplitude", 0), ("planet |b", 0)]),
    (
        "spectral-type.syz",
        &[("star |thaloway", 0), ("|spectral_type", 0)],
    ),
    (
        "transit-and-rv.syz",
        &[
            ("planet |b", 0),
            ("|transit_depth", 0),
            ("[|ph_h]", 0),
            ("|Msun", 0),
            ("orbits |haverly", 0),
        ],
    ),
    (
        "unevaluable.syz",
        &[("|radius = sqrt", 0), ("b.|transit_depth", 0), ("|sqrt", 0)],
    ),
];

struct Fixture {
    name: String,
    src: String,
    analysis: Analysis,
    editor: EditorSettings,
    lines: LineIndex,
}

/// A fixture analysed as the language server analyses a document with no project file.
fn load(path: &Path) -> Fixture {
    let src = std::fs::read_to_string(path).unwrap();
    let editor = EditorSettings::new(None);
    let analysis = syzygy::analyze(FileId(0), &src, &editor.settings);
    Fixture {
        name: path.file_name().unwrap().to_str().unwrap().to_string(),
        lines: LineIndex::new(&src),
        src,
        analysis,
        editor,
    }
}

impl Fixture {
    /// `line:column` (1-based, characters) of a byte offset.
    fn place(&self, offset: usize) -> String {
        let p = self.lines.line_col(&self.src, offset);
        format!("{}:{}", p.line, p.column)
    }
}

fn hover_snapshot(path: &Path) {
    let f = load(path);
    let targets = HOVERS
        .iter()
        .find(|(name, _)| *name == f.name)
        .map(|(_, t)| *t)
        .unwrap_or_else(|| panic!("choose the places to hover in {} (HOVERS)", f.name));
    let occurrences = symbols::occurrences(&f.analysis.ast);
    let method = f.editor.method();
    let mut out = String::new();
    for (needle, nth) in targets {
        let offset = offset_of(&f.src, needle, *nth);
        let _ = write!(out, "=== hover at `{needle}` #{nth} ({})", f.place(offset));
        match hover::hover(&f.analysis, &occurrences, offset, &method) {
            Some((text, span)) => {
                let over = &f.src[span.range()];
                let _ = writeln!(out, ", over `{over}`\n{}", text.trim_end());
            }
            None => out.push_str(": nothing\n"),
        }
    }
    insta::with_settings!({ description => f.src.clone(), omit_expression => true }, {
        insta::assert_snapshot!(out);
    });
}

fn hints_snapshot(path: &Path) {
    let f = load(path);
    let method = f.editor.method();
    let all = hints::hints(&f.analysis, &f.src, 0..f.src.len(), &method);
    let mut out = String::new();
    for h in &all {
        let line_start = f.src[..h.offset].rfind('\n').map_or(0, |i| i + 1);
        let _ = writeln!(
            out,
            "{} after `{}`\n  label: {}\n  tooltip: {}",
            f.place(h.offset),
            f.src[line_start..h.offset].trim_start(),
            h.label,
            h.detail.replace('\n', "\n           ")
        );
    }
    if all.is_empty() {
        out.push_str("(no hints)\n");
    }
    insta::with_settings!({ description => f.src.clone(), omit_expression => true }, {
        insta::assert_snapshot!(out);
    });
}

#[test]
fn hovers() {
    insta::glob!("../fixtures/eval", "*.syz", hover_snapshot);
}

#[test]
fn inlay_hints() {
    insta::glob!("../fixtures/eval", "*.syz", hints_snapshot);
}

/// The hints of a part of a file are the hints of the whole file that lie in that part, as
/// an editor asks for the visible lines only.
#[test]
fn hints_of_a_range_are_those_of_the_whole_file_within_it() {
    let f = load(&syzygy_e2e::root().join("tests/fixtures/eval/transit-and-rv.syz"));
    let method = f.editor.method();
    let all = hints::hints(&f.analysis, &f.src, 0..f.src.len(), &method);
    let planet = offset_of(&f.src, "|planet b", 0);
    let part = hints::hints(&f.analysis, &f.src, planet..f.src.len(), &method);
    let expected: Vec<_> = all.iter().filter(|h| h.offset >= planet).cloned().collect();
    assert!(!part.is_empty() && part.len() < all.len(), "{all:?}");
    assert_eq!(part, expected);
}

#[test]
fn the_demo_with_several_sources_shows_which_is_used_and_why_the_others_are_not() {
    let f = load(&syzygy_e2e::root().join("examples/halvard.syz"));
    let line = |needle: &str| f.lines.line_col(&f.src, offset_of(&f.src, needle, 0)).line;
    let end = |needle: &str| offset_of(&f.src, needle, 0) + needle.len();
    let hints = hints::hints(&f.analysis, &f.src, 0..f.src.len(), &f.editor.method());
    let unused: Vec<(usize, &str)> = hints
        .iter()
        .filter(|h| h.label.starts_with("not used"))
        .map(|h| (h.offset, h.label.as_str()))
        .collect();
    let brenn_period = line("4.21762");
    let cole_mass = line("0.99 ± 0.03");
    assert_eq!(
        unused,
        [
            (
                end("0.97 ± 0.04 Msun [aster]"),
                format!("not used: [cole] (line {cole_mass}) is more precise").as_str()
            ),
            (
                end("0.0008   d   [aster]"),
                format!("not used: [brenn] (line {brenn_period}) is more precise").as_str()
            ),
            (
                end("90         ppm [aster]"),
                format!(
                    "not used: [brenn] (line {}) is marked preferred",
                    line("1390")
                )
                .as_str()
            ),
            (
                end("< 0.2                   [aster]"),
                format!(
                    "not used: [cole] (line {}) is a measurement, this a limit",
                    line("0.05 ± 0.03")
                )
                .as_str()
            ),
        ]
    );
    // Hover on either declaration of the period: both sources, the one used, and why.
    let occurrences = symbols::occurrences(&f.analysis.ast);
    for nth in 0..2 {
        let at = offset_of(&f.src, "|period ", nth);
        let (h, _) = hover::hover(&f.analysis, &occurrences, at, &f.editor.method()).unwrap();
        assert!(h.contains("- 2 sources:"), "{h}");
        assert!(h.contains("[brenn] (used)`"), "{h}");
        assert!(
            h.contains(&format!(
                "chosen: the most precise, by standard uncertainty ([brenn], source 2 of 2, line {brenn_period})"
            )),
            "{h}"
        );
    }
}
