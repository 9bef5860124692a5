#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use super::*;
use crate::derive::SystemResult;
use crate::diagnostic::Diagnostic;
use crate::Settings;
use std::sync::Arc;

/// What a reader of the output sees of an analysis: the diagnostics in order, and each
/// system's name with its results.
type Seen = (Vec<Diagnostic>, Vec<(String, Arc<SystemResult>)>);

fn whole(src: &str) -> Seen {
    let a = crate::analyze(FileId(0), src, &Settings::linear());
    let systems = a.model.systems.iter().map(|s| s.name.clone());
    (a.diagnostics, systems.zip(a.results).collect())
}

fn in_parts(src: &str, part_bytes: usize) -> (Seen, usize) {
    let settings = Settings::linear();
    let (mut diags, mut systems, mut n) = (Vec::new(), Vec::new(), 0);
    let mut next_start = 0;
    // Reading and lowering overlapped give the same parts as the iterator.
    let mut overlapped = Vec::new();
    Parts::new(FileId(0), src, part_bytes).read_parts(|p| overlapped.push(p));
    let parts: Vec<Part> = Parts::new(FileId(0), src, part_bytes).collect();
    first_difference(
        &overlapped,
        &parts,
        &format!("overlapped parts of {part_bytes} bytes"),
    );
    for part in overlapped {
        // Parts tile the file: each starts where the one before ended.
        assert_eq!(part.region.start, next_start);
        next_start = part.region.end;
        n += 1;
        let a = crate::analyze_part(src, part, &settings);
        diags.extend(a.diagnostics);
        let names = a.model.systems.iter().map(|s| s.name.clone());
        systems.extend(names.zip(a.results));
    }
    assert_eq!(next_start, src.len());
    ((diags, systems), n)
}

/// Fail on the first element that differs, showing only it.
fn first_difference<T: std::fmt::Debug>(got: &[T], want: &[T], what: &str) {
    // Compared as printed: a value that is not a number (a spectral type's) is not equal
    // to itself.
    for (i, (g, w)) in got.iter().zip(want).enumerate() {
        assert_eq!(
            format!("{g:?}"),
            format!("{w:?}"),
            "{what}: element {i} differs"
        );
    }
    assert_eq!(got.len(), want.len(), "{what}: lengths differ");
}

/// Every part size gives exactly what the whole-file reading gives, and a small part size
/// really splits the file.
fn same_in_parts(src: &str) {
    let want = whole(src);
    for bytes in [1, 40, 300, 5_000, usize::MAX] {
        let (got, n) = in_parts(src, bytes);
        first_difference(
            &got.0,
            &want.0,
            &format!("diagnostics, parts of {bytes} bytes"),
        );
        assert_eq!(got.1.len(), want.1.len());
        for ((gn, g), (wn, w)) in got.1.iter().zip(&want.1) {
            assert_eq!(gn, wn);
            for (gb, wb) in g.bodies.iter().zip(&w.bodies) {
                first_difference(
                    &gb.quantities,
                    &wb.quantities,
                    &format!("{gn}, {bytes} bytes"),
                );
            }
            assert_eq!(format!("{g:?}"), format!("{w:?}"), "{gn}, {bytes} bytes");
        }
        if bytes == usize::MAX {
            assert_eq!(n, 1);
        }
    }
}

#[test]
fn the_demo_files_read_the_same_in_parts() {
    same_in_parts(include_str!("../../../examples/veyra.syz"));
    same_in_parts(include_str!("../../../examples/corvane.syz"));
}

#[test]
fn the_line_of_a_chosen_source_is_the_same_in_parts() {
    // The sentence of the choice names a line, which a part must count from the file's start.
    let halvard = include_str!("../../../examples/halvard.syz");
    let src = format!("{}\n{halvard}", include_str!("../../../examples/veyra.syz"));
    same_in_parts(&src);
    let line = src
        .lines()
        .position(|l| l.contains("period") && l.contains("[brenn]"))
        .unwrap()
        + 1;
    let (_, systems) = whole(&src);
    let said = systems
        .iter()
        .flat_map(|(_, r)| &r.bodies)
        .flat_map(|b| &b.quantities)
        .flat_map(|q| &q.assumptions)
        .any(|a| a.starts_with("b.period: 2 sources") && a.ends_with(&format!("line {line})")));
    assert!(said, "no sentence names line {line}");
}

#[test]
fn files_with_mistakes_read_the_same_in_parts() {
    same_in_parts(include_str!("../../../examples/broken/every-rule.syz"));
    same_in_parts(include_str!("../../../examples/broken/language-errors.syz"));
}

const TWO: &str = r#"system "Anvel" {
  star a { mass = 1.0 ± 0.05 Msun; radius = 1.0 ± 0.03 Rsun }
  planet b orbits a { period = 3 ± 0.01 d [late] }
}
# allow(inconsistent): a comment above the second system travels with it
system "Borrin" {
  star s { mass = 0.8 ± 0.04 Msun }
  planet c orbits s { period = 5 ± 0.01 d; rv_amplitude = 12 ± 2 m/s [late] }
}
system "Anvel" { star x { mass = 1 Msun } }
ref late "A reference declared after the systems that cite it"
ref late "The same id again"
"#;

#[test]
fn references_and_names_declared_twice_are_found_across_parts() {
    same_in_parts(TWO);
    let (seen, n) = in_parts(TWO, 1);
    assert_eq!(n, 5);
    let messages: Vec<&str> = seen.0.iter().map(|d| d.message.as_str()).collect();
    assert!(
        messages
            .iter()
            .any(|m| m.contains("\"Anvel\" is declared twice")),
        "{messages:?}"
    );
    assert!(
        messages
            .iter()
            .any(|m| m.contains("'late' is declared twice")),
        "{messages:?}"
    );
    // The citation of a reference declared further down is not unknown.
    assert!(
        !messages.iter().any(|m| m.contains("unknown reference")),
        "{messages:?}"
    );
}

#[test]
fn silencing_comments_stay_with_the_line_they_cover() {
    let src = "system \"Anvel\" {\n  star a { mass = 1.1 Msun }\n  planet b orbits a {\n    period = 12 m/s\n  }\n}\n# allow(unit-mismatch): known\nsystem \"Borrin\" {\n  star a { mass = 1.1 Msun }\n  planet b orbits a { period = 12 m/s }\n}\n# allow(unit-mismatch): covers nothing\n\nsystem \"Cyre\" { star a { mass = 1 Msun } } # allow(unit-mismatch): nor this\n";
    same_in_parts(src);
    let (seen, _) = in_parts(src, 1);
    let rules: Vec<&str> = seen.0.iter().map(|d| d.rule.id()).collect();
    assert_eq!(
        rules.iter().filter(|r| **r == "unit-mismatch").count(),
        2,
        "{rules:?}"
    );
    // Line numbers in messages are the file's, not the part's.
    let unused: Vec<&str> = seen
        .0
        .iter()
        .filter(|d| d.rule.id() == "unused-allow")
        .map(|d| d.message.as_str())
        .collect();
    assert!(unused.iter().any(|m| m.contains("line 14")), "{unused:?}");
    assert_eq!(unused.len(), 3, "{unused:?}");
}

#[test]
fn broken_structure_reads_the_same_in_parts() {
    for src in [
        "system \"A\" { star s { mass = 1 Msun } } system \"B\" { star t { mass = 2 Msun } }\n",
        "system \"A\" {\n star s { mass = 1 Msun }\n}\n}}}\nstar z { mass = 1 Msun }\nsystem \"B\" {\n star t { mass = 1 Msun\n",
        "system \"A\" {\r\n star s { mass = 1 Msun }\r\n}\r\nsystem \"B\" {\r star t { mass = 1 Msun }\r}\r",
        "ref a \"x\"\nref\nsystem \"A\" { star s { mass = 1 Msun [a, b] } }\nsystem { }\nsystem \"C\" {\n",
        "",
        "# only a comment\n",
        // A diagnostic placed at the very end of the text.
        "system \"A\" { star s { mass = 1 Msun } }\nstar",
    ] {
        same_in_parts(src);
    }
    // Two systems on one line are never split apart (a comment at the end of the line
    // covers both).
    let one_line =
        "system \"A\" { star s { mass = 1 Msun } } system \"B\" { star t { mass = 2 Msun } }\n";
    assert_eq!(in_parts(one_line, 1).1, 1);
    assert_eq!(in_parts(TWO, 1).1, 5);
}

/// A system never closed reaches over the comment lines below its last property; a
/// silencing comment there covers the next system's first line, so it travels with that
/// system (found by the fuzzer). CR LF and lone CR line ends too.
#[test]
fn comments_above_a_declaration_go_with_it_even_inside_an_unclosed_one() {
    let src = "system \"Ferrow\" {\n  star f {\n    mass = 1 Msun\n  }\n  planet b orbits f {\n    period = 12 ± 0.1 d\n    # allow(inconsistent): nothing here\n# another\nsystem \"Ferrow\" {\n  star g { mass = 1 Msun }\n}\n";
    same_in_parts(src);
    same_in_parts(&src.replace('\n', "\r\n"));
    same_in_parts(&src.replace('\n', "\r"));
    let (seen, n) = in_parts(src, 1);
    assert_eq!(n, 2);
    assert!(
        seen.0
            .iter()
            .any(|d| d.message.contains("nothing on line 9")),
        "{:#?}",
        seen.0
    );
}

/// References above the first system are all the read-ahead needs when lexing finds no
/// `ref` below it: the word in a comment or a string is not one, a `ref` line inside a
/// system is (an error there, but the reading must be the one a whole-file reading gives).
#[test]
fn references_above_the_systems_are_read_ahead_without_parsing_the_rest() {
    let top = r#"ref disc "Invented discovery paper"
ref phot "Invented photometry, with the word ref inside"
system "Anvel" {
  star a { mass = 1.0 ± 0.05 Msun [disc]; radius = 1.0 ± 0.03 Rsun [phot] }
  # a comment that says ref and system
  planet b orbits a { period = 3 ± 0.01 d [disc] }
}
system "Borrin" {
  star s { mass = 0.8 ± 0.04 Msun [phot]; radius = 0.8 ± 0.04 Rsun [nope] }
}
"#;
    let at = top.find("system \"Anvel\"").unwrap();
    assert_eq!(refs_end(top), at);
    same_in_parts(top);
    // A `ref` line inside a system: the read-ahead goes on to the end.
    let inside = top.replace(
        "  # a comment",
        "  ref late \"Inside a system\"\n  # a comment",
    );
    assert_eq!(refs_end(&inside), usize::MAX);
    same_in_parts(&inside);
    // No system at all, or a reference below the systems.
    assert_eq!(refs_end("ref a \"A\"\n"), usize::MAX);
    assert_eq!(refs_end(TWO), usize::MAX);
}

#[test]
fn a_reading_already_begun_goes_on_where_it_stopped() {
    let src = "system \"Ardel\" {\n  star a { mass = 1 Msun }\n}\nsystem \"Brisk\" {\n  star b { mass = 2 Msun }\n}\nsystem \"Cwen\" {\n  star c { mass = 3 Msun }\n}\n";
    let all: Vec<Part> = Parts::new(FileId(0), src, 10).collect();
    assert_eq!(all.len(), 3);
    let mut parts = Parts::new(FileId(0), src, 10);
    let first = parts.next().unwrap();
    let mut rest = Vec::new();
    parts.read_parts(|p| rest.push(p));
    rest.insert(0, first);
    first_difference(&rest, &all, "parts after one taken");
}

#[test]
fn the_read_ahead_of_references_stops_at_the_first_system_only_when_none_follows() {
    let head = "ref paper \"An invented paper\"\n# a note\n";
    let start = head.len();
    // Names, words and strings holding the letters `ref` are no reference.
    let none = format!("{head}system \"Preferred\" {{\n  star refx {{ mass = 1 Msun [paper] }}\n}}\n# ref in a comment\n");
    assert_eq!(refs_end(&none), start);
    // A reference declared below a system: read to the end.
    let below =
        format!("{head}system \"A\" {{\n  star a {{ mass = 1 Msun }}\n}}\nref late \"Another\"\n");
    assert_eq!(refs_end(&below), usize::MAX);
    // No system at all.
    assert_eq!(refs_end(head), usize::MAX);
}

#[test]
fn line_breaks_count_each_ending_once() {
    // `\n`, `\r\n` and a lone `\r` each end a line, as the line index counts them.
    assert_eq!(line_breaks("a\nb\r\nc\rd"), 3);
    assert_eq!(line_breaks("\r\r\n\n"), 3);
    assert_eq!(line_breaks("no break"), 0);
    assert_eq!(line_breaks("ends\r"), 1);
}
