//! Golden tests: the rendered diagnostics of `syz check` (no colour) for each fixture and for
//! the deliberately broken demos, snapshotted with insta. Review changes with `cargo insta review`.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use syzygy::diagnostic::Rule;
use syzygy_e2e::{run, stdout};

fn check_snapshot(path: &std::path::Path) {
    let rel = path.strip_prefix(syzygy_e2e::root()).unwrap();
    let o = run(&["check", "--propagation", "linear", rel.to_str().unwrap()]);
    let code = o.status.code();
    // The source above the output, as the snapshot's header.
    let src = std::fs::read_to_string(path).unwrap_or_default();
    insta::with_settings!({ description => src, omit_expression => true }, {
        insta::assert_snapshot!(format!("exit: {code:?}\n{}", stdout(&o)));
    });
}

#[test]
fn fixtures() {
    insta::glob!("../fixtures/check", "*.syz", check_snapshot);
}

#[test]
fn broken_demos() {
    insta::glob!("../../examples/broken", "*.syz", check_snapshot);
}

/// Rules that no `syz check` of a file can report, with the test file that shows each.
const SHOWN_ELSEWHERE: &[(&str, &str)] = &[
    // A project file that cannot be used: `syz check` stops with a sentence on stderr, and
    // the language server reports it on each document as rule `io`.
    ("io", "lsp_project_file.rs"),
    // Checks that need a project file or several files: a catalogue in a scratch folder.
    ("ref-shadows-shared", "catalogue.rs"),
    ("system-in-two-files", "catalogue.rs"),
    ("star-disagrees-across-files", "catalogue.rs"),
    ("paper-under-two-ids", "catalogue.rs"),
];

/// Every rule of the rule table has a demo or fixture that triggers it, so a new rule must
/// be shown somewhere (or be listed in `SHOWN_ELSEWHERE` with the test that shows it).
#[test]
fn every_rule_fires_somewhere_in_the_broken_demos_and_fixtures() {
    let o = run(&[
        "check",
        "--format",
        "json",
        "--propagation",
        "linear",
        "examples/broken",
        "tests/fixtures/check",
    ]);
    let v: serde_json::Value = serde_json::from_str(&stdout(&o)).unwrap();
    let fired: std::collections::BTreeSet<String> = v["diagnostics"]
        .as_array()
        .unwrap()
        .iter()
        .map(|d| d["rule"].as_str().unwrap().to_string())
        .collect();
    for (id, test) in SHOWN_ELSEWHERE {
        assert!(Rule::from_id(id).is_some(), "{id} is not a rule");
        let text = std::fs::read_to_string(syzygy_e2e::root().join("tests/tests").join(test))
            .unwrap_or_else(|e| panic!("{test}: {e}"));
        assert!(
            text.contains(&format!("\"{id}\"")),
            "{test} does not mention {id}"
        );
    }
    let elsewhere = |id: &str| SHOWN_ELSEWHERE.iter().any(|(e, _)| *e == id);
    let missing: Vec<&str> = Rule::ALL
        .iter()
        .map(|r| r.id())
        .filter(|id| !elsewhere(id) && !fired.contains(*id))
        .collect();
    assert!(
        missing.is_empty(),
        "no demo or fixture triggers {missing:?}; fired: {fired:?}"
    );
}
