//! Golden tests of what `syz eval` and `syz explain` print (no colour): each system of
//! `tests/fixtures/eval/` in the text, JSON and CSV formats, first-order propagation; one
//! Monte Carlo run with a fixed seed and few samples; `explain` of a derived density, a
//! declared value and a declared expression. Review changes with `cargo insta review`, and
//! check the numbers, not only that they changed.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use std::path::Path;
use std::process::Output;
use syzygy_e2e::{run, stderr, stdout};

/// The fixture's path as given on the command line (relative, so snapshots hold no machine's
/// folders).
fn relative(path: &Path) -> &str {
    path.strip_prefix(syzygy_e2e::root())
        .unwrap()
        .to_str()
        .unwrap()
}

/// Everything a user sees of one run: the exit status, standard output and standard error.
fn seen(o: &Output) -> String {
    format!(
        "exit: {:?}\n--- stdout\n{}--- stderr\n{}",
        o.status.code(),
        stdout(o),
        stderr(o)
    )
}

/// Snapshot `syz eval --format <format> --propagation linear` of a fixture, its source as the
/// snapshot's description.
fn eval_snapshot(path: &Path, format: &str) {
    let o = run(&[
        "eval",
        "--format",
        format,
        "--propagation",
        "linear",
        relative(path),
    ]);
    let src = std::fs::read_to_string(path).unwrap();
    insta::with_settings!({ description => src, omit_expression => true }, {
        insta::assert_snapshot!(format!("eval_{format}"), seen(&o));
    });
}

#[test]
fn eval_text() {
    insta::glob!("../fixtures/eval", "*.syz", |p| eval_snapshot(p, "human"));
}

#[test]
fn eval_json() {
    insta::glob!("../fixtures/eval", "*.syz", |p| eval_snapshot(p, "json"));
}

#[test]
fn eval_csv() {
    insta::glob!("../fixtures/eval", "*.syz", |p| eval_snapshot(p, "csv"));
}

/// Monte Carlo with a fixed seed and few samples: the same numbers on every run (checked
/// here, on a second run) and in the snapshot. The eccentric fixture is the one whose
/// distributions are far from normal (the argument of periastron spread over a turn).
#[test]
fn eval_monte_carlo_with_a_fixed_seed() {
    let args = [
        "eval",
        "--propagation",
        "monte-carlo",
        "--seed",
        "7",
        "--samples",
        "400",
        "tests/fixtures/eval/eccentric.syz",
    ];
    let first = run(&args);
    let second = run(&args);
    assert_eq!(
        seen(&first),
        seen(&second),
        "the same seed must give the same output"
    );
    let linear = run(&[
        "eval",
        "--propagation",
        "linear",
        "tests/fixtures/eval/eccentric.syz",
    ]);
    assert_ne!(
        stdout(&first),
        stdout(&linear),
        "the Monte Carlo run must not be the first-order one"
    );
    insta::with_settings!({ omit_expression => true }, {
        insta::assert_snapshot!(seen(&first));
    });
}

fn explain(file: &str, target: &str) -> String {
    let o = run(&["explain", "--propagation", "linear", file, target]);
    format!(
        "$ syz explain --propagation linear {file} {target}\n{}",
        seen(&o)
    )
}

#[test]
fn explain_a_derived_density() {
    insta::with_settings!({ omit_expression => true }, {
        insta::assert_snapshot!(explain("tests/fixtures/eval/transit-and-rv.syz", "b.density"));
    });
}

#[test]
fn explain_a_declared_value() {
    insta::with_settings!({ omit_expression => true }, {
        insta::assert_snapshot!(explain(
            "tests/fixtures/eval/transit-and-rv.syz",
            "b.transit_depth"
        ));
    });
}

#[test]
fn explain_a_declared_expression() {
    insta::with_settings!({ omit_expression => true }, {
        insta::assert_snapshot!(explain("tests/fixtures/eval/expressions.syz", "b.radius"));
    });
}
