//! Golden tests: the rendered diagnostics of `syz check` (no colour) for each fixture and for
//! the deliberately broken demos, snapshotted with insta. Review changes with `cargo insta review`.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

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

/// Every rule has a demo or fixture that triggers it (the rules that need special
/// situations — I/O failure, an unusable limit, a stale silencing comment — are tested
/// elsewhere).
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
    let all = [
        "syntax",
        "unit-mismatch",
        "unknown-unit",
        "unknown-quantity",
        "unknown-body",
        "unknown-ref",
        "unknown-name",
        "duplicate",
        "out-of-range",
        "invalid-value",
        "inconsistent",
        "denser-than-iron",
        "above-deuterium-limit",
        "stellar-mass-companion",
        "larger-than-star",
        "periastron-inside-star",
        "inside-roche-limit",
        "transit-geometry",
        "crossing-orbits",
        "unstable-spacing",
        "implausible-star",
    ];
    for r in all {
        assert!(
            fired.contains(r),
            "no demo or fixture triggers {r}; fired: {fired:?}"
        );
    }
}
