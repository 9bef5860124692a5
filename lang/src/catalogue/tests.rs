use super::*;
use crate::diagnostic::{Rule, Severity};
use crate::source::{FileId, LineIndex};
use crate::{analyze, Settings};
use std::sync::Arc;

const SHARED: &str = "# shared\nref survey \"Demo spectroscopic survey (invented data)\"\nref rvs \"Demo velocities (invented data)\"\n";

fn with_shared() -> Settings {
    Settings {
        shared_refs: Arc::new(SharedRefs::from_files([("references.syz", SHARED)])),
        ..Settings::linear()
    }
}

fn rules(a: &crate::Analysis) -> Vec<Rule> {
    a.diagnostics.iter().map(|d| d.rule).collect()
}

#[test]
fn a_citation_finds_a_shared_reference_and_outputs_see_its_text() {
    let src = "system \"Quarrel\" {\n  star q { mass = 1.0 ± 0.02 Msun [survey] }\n}\n";
    let a = analyze(FileId(0), src, &with_shared());
    assert!(a.diagnostics.is_empty(), "{:?}", a.diagnostics);
    let r = a.model.refs.iter().find(|r| r.id == "survey").unwrap();
    assert_eq!(r.text, "Demo spectroscopic survey (invented data)");
    assert_eq!(
        r.shared.as_ref().map(|s| s.place()).as_deref(),
        Some("references.syz:2")
    );
    // Only the shared references cited are the file's.
    assert!(a.model.refs.iter().all(|r| r.id != "rvs"));
    // Alone, the same file cites an unknown reference, as before.
    let alone = analyze(FileId(0), src, &Settings::linear());
    assert_eq!(rules(&alone), vec![Rule::UnknownRef]);
    assert_eq!(
        alone.diagnostics[0].message,
        "no reference 'survey' is declared in this file"
    );
}

#[test]
fn an_unknown_id_names_the_shared_files_and_suggests_shared_ids() {
    let src = "system \"Quarrel\" {\n  star q { mass = 1.0 ± 0.02 Msun [survy] }\n}\n";
    let a = analyze(FileId(0), src, &with_shared());
    assert_eq!(rules(&a), vec![Rule::UnknownRef]);
    let d = &a.diagnostics[0];
    assert!(
        d.message.contains("shared references (references.syz)"),
        "{}",
        d.message
    );
    assert_eq!(d.help.as_deref(), Some("did you mean 'survey'?"));
}

#[test]
fn a_local_reference_wins_and_is_reported_only_when_its_text_differs() {
    let differs = "ref rvs \"Another campaign\"\nsystem \"Q\" {\n  star q { mass = 1.0 ± 0.02 Msun [rvs] }\n}\n";
    let a = analyze(FileId(0), differs, &with_shared());
    assert_eq!(rules(&a), vec![Rule::RefShadowsShared]);
    assert_eq!(a.diagnostics[0].severity, Severity::Warning);
    assert!(a.diagnostics[0].message.contains("references.syz:3"));
    let r = a.model.refs.iter().find(|r| r.id == "rvs").unwrap();
    assert_eq!(
        (r.text.as_str(), r.shared.is_none()),
        ("Another campaign", true)
    );
    // The same text (up to case and spaces), as in the shared file itself: nothing to say.
    let same = "ref rvs \"demo  velocities (Invented data)\"\n";
    assert!(analyze(FileId(0), same, &with_shared())
        .diagnostics
        .is_empty());
    assert!(analyze(FileId(0), SHARED, &with_shared())
        .diagnostics
        .is_empty());
}

#[test]
fn completion_offers_shared_references_not_hidden_by_the_files_own() {
    let src = "ref own \"Own\"\nsystem \"Q\" {\n  star q { mass = 1.0 ± 0.02 Msun [] }\n}\n";
    let a = analyze(FileId(0), src, &with_shared());
    let at = src.find("[]").unwrap() + 1;
    let labels: Vec<String> = crate::ide::complete::complete(&a, src, at)
        .into_iter()
        .map(|c| c.label)
        .collect();
    assert_eq!(labels, vec!["own", "survey", "rvs"]);
}

/// The settings of a file under a project file (a catalogue).
fn catalogue() -> Settings {
    Settings {
        catalogue: Some("cat/syzygy.toml".to_string()),
        ..Settings::linear()
    }
}

/// Entries of the named texts, analysed with `settings`, and the findings between them, with
/// places as `name:line`.
fn across(
    files: &[(&str, &str)],
    settings: &Settings,
) -> Vec<(String, crate::diagnostic::Diagnostic)> {
    let analyses: Vec<_> = files
        .iter()
        .enumerate()
        .map(|(i, (_, t))| analyze(FileId(i as u32), t, settings))
        .collect();
    let entries: Vec<Entry> = analyses.iter().map(|a| Entry::of(a, settings)).collect();
    let place = |s: crate::source::Span| {
        let (name, text) = files[s.file.0 as usize];
        let line = LineIndex::new(text).line_col(text, s.start as usize).line;
        format!("{name}:{line}")
    };
    check(&entries, &place)
        .into_iter()
        .map(|d| (place(d.span), d))
        .collect()
}

#[test]
fn a_system_in_two_files_is_reported_once_with_both_places() {
    let a = "system \"Quarrel\" {\n  star q { mass = 1 ± 0.1 Msun }\n}\n";
    let b =
        "# b\n\nsystem \"Quarrel\" {\n  star r { mass = 1 ± 0.1 Msun }\n}\nsystem \"Other\" {}\n";
    let found = across(&[("a.syz", a), ("b.syz", b)], &catalogue());
    assert_eq!(found.len(), 1, "{found:?}");
    let (at, d) = &found[0];
    assert_eq!((at.as_str(), d.rule), ("b.syz:3", Rule::SystemInTwoFiles));
    assert_eq!(d.severity, Severity::Warning);
    assert!(
        d.message.contains("also declared in a.syz:1"),
        "{}",
        d.message
    );
    assert_eq!(d.labels[0].span.file, FileId(0));
    // Twice in one file is the `duplicate` of that file, not a finding between files.
    let twice = "system \"A\" {}\nsystem \"A\" {}\n";
    assert!(across(&[("a.syz", twice)], &catalogue()).is_empty());
}

#[test]
fn a_star_in_two_files_is_compared_with_the_consistency_threshold() {
    let a = "system \"A\" {\n  star quen { mass = 1.00 ± 0.02 Msun; teff = 5700 ± 50 K }\n}\n";
    let far = "system \"B\" {\n  star quen { mass = 1.30 ± 0.02 Msun; teff = 5710 ± 50 K }\n}\n";
    let found = across(&[("a.syz", a), ("b.syz", far)], &catalogue());
    assert_eq!(found.len(), 1, "{found:?}");
    let (at, d) = &found[0];
    assert_eq!(
        (at.as_str(), d.rule),
        ("b.syz:2", Rule::StarDisagreesAcrossFiles)
    );
    // 0.30 / sqrt(0.02^2 + 0.02^2) = 10.6 combined standard deviations (arithmetic).
    assert!(
        d.message
            .contains("mass: 1.000 ± 0.020 Msun there and 1.300 ± 0.020 Msun here differ by 10.6"),
        "{}",
        d.message
    );
    assert!(!d.message.contains("teff"), "{}", d.message);
    // Within 3 sigma: 0.08 / 0.028 = 2.8.
    let near = "system \"B\" {\n  star quen { mass = 1.08 ± 0.02 Msun }\n}\n";
    assert!(across(&[("a.syz", a), ("b.syz", near)], &catalogue()).is_empty());
    // A lower threshold in the project reports it.
    let mut strict = catalogue();
    strict.options.consistency_sigma = 2.0;
    assert_eq!(across(&[("a.syz", a), ("b.syz", near)], &strict).len(), 1);
}

#[test]
fn one_text_under_two_ids_is_a_note_and_the_same_id_is_not() {
    let a = "ref rv \"Demo velocities (invented)\"\n";
    let b = "ref rvel \"demo velocities  (invented)\"\n";
    let c = "ref rv \"Demo velocities (invented)\"\n";
    let found = across(&[("a.syz", a), ("b.syz", b), ("c.syz", c)], &catalogue());
    assert_eq!(found.len(), 1, "{found:?}");
    let (at, d) = &found[0];
    assert_eq!(
        (at.as_str(), d.rule, d.severity),
        ("b.syz:1", Rule::PaperUnderTwoIds, Severity::Note)
    );
    assert!(
        d.message
            .contains("'rvel' has the same text as 'rv' in a.syz:1"),
        "{}",
        d.message
    );
}

#[test]
fn the_files_settings_set_the_severity_of_its_findings() {
    let a = "system \"A\" {}\n";
    let mut off = catalogue();
    off.overrides.push((Rule::SystemInTwoFiles, None));
    let mut error = catalogue();
    error
        .overrides
        .push((Rule::SystemInTwoFiles, Some(Severity::Error)));
    let entries = |second: &Settings| {
        vec![
            Entry::of(&analyze(FileId(0), a, &catalogue()), &catalogue()),
            Entry::of(&analyze(FileId(1), a, second), second),
        ]
    };
    let place = |_| String::new();
    assert!(check(&entries(&off), &place).is_empty());
    assert_eq!(check(&entries(&error), &place)[0].severity, Severity::Error);
}

#[test]
fn only_files_under_the_same_project_file_are_compared() {
    let a = "system \"A\" {}\n";
    let under = |c: Option<&str>| Settings {
        catalogue: c.map(str::to_string),
        ..Settings::linear()
    };
    let entries = |x: &Settings, y: &Settings| {
        vec![
            Entry::of(&analyze(FileId(0), a, x), x),
            Entry::of(&analyze(FileId(1), a, y), y),
        ]
    };
    let place = |_| String::new();
    let (none, one, other) = (
        under(None),
        under(Some("a/syzygy.toml")),
        under(Some("b/syzygy.toml")),
    );
    assert!(check(&entries(&none, &none), &place).is_empty());
    assert!(check(&entries(&one, &other), &place).is_empty());
    assert!(check(&entries(&one, &none), &place).is_empty());
    assert_eq!(check(&entries(&one, &one), &place).len(), 1);
}

/// A file read in parts gives each part its file's references (read ahead): one text under
/// two ids is still one finding, not one per part (it was reported once per part).
#[test]
fn a_file_in_parts_reports_one_text_under_two_ids_once() {
    let mut src = String::from(
        "ref rv \"Demo velocities (invented)\"\nref rvel \"Demo velocities (invented)\"\n",
    );
    for i in 0..6 {
        src.push_str(&format!(
            "system \"Part {i}\" {{\n  star s{i} {{ mass = 1 ± 0.1 Msun [rv] }}\n}}\n"
        ));
    }
    let settings = catalogue();
    let mut entry: Option<Entry> = None;
    let mut parts = 0;
    crate::parts::Parts::new(FileId(0), &src, 40).read_parts(|p| {
        parts += 1;
        let e = Entry::of(&crate::analyze_part(&src, p, &settings), &settings);
        match entry.as_mut() {
            Some(held) => held.absorb(e),
            None => entry = Some(e),
        }
    });
    assert!(parts > 3);
    let place = |s: crate::source::Span| format!("{}", s.start);
    let found: Vec<_> = check(&entry.into_iter().collect::<Vec<_>>(), &place)
        .into_iter()
        .filter(|d| d.rule == Rule::PaperUnderTwoIds)
        .collect();
    assert_eq!(found.len(), 1, "{found:#?}");
}
