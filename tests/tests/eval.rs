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

/// The derived values of a JSON document: (name, quantity object).
fn derived(doc: &serde_json::Value) -> Vec<(String, serde_json::Value)> {
    let mut out = Vec::new();
    for sys in doc["systems"].as_array().unwrap() {
        for body in sys["bodies"].as_array().unwrap() {
            for (name, q) in body["quantities"].as_object().unwrap() {
                if q["origin"] == "derived" && q.get("precision").is_some() {
                    out.push((
                        format!("{}.{name}", body["id"].as_str().unwrap()),
                        q.clone(),
                    ));
                }
            }
        }
    }
    out
}

/// `--samples auto` (JCGM 101:2008 7.9): draws until every derived value is stable to two
/// significant digits of its uncertainty, says so, and lands where the stated precision of a
/// 10^4-sample run said the values were.
#[test]
fn adaptive_sampling_draws_until_every_value_is_stable() {
    let file = "tests/fixtures/eval/transit-and-rv.syz";
    let json = |extra: &[&str]| -> serde_json::Value {
        let mut args = vec!["eval", "--format", "json", file];
        args.extend_from_slice(extra);
        let o = run(&args);
        assert!(o.status.success(), "{}", stderr(&o));
        serde_json::from_str(&stdout(&o)).unwrap()
    };
    let fixed = json(&["--samples", "10000"]);
    let auto = json(&["--samples", "auto"]);
    assert_eq!(fixed["options"]["adaptive"], false);
    assert_eq!(auto["options"]["adaptive"], true);
    let (fixed, auto) = (derived(&fixed), derived(&auto));
    assert!(!auto.is_empty() && auto.len() == fixed.len());
    // At 10^4 samples some values are not yet stable; adaptive sampling makes all of them so.
    assert!(fixed.iter().any(|(_, q)| q["precision"]["stable"] == false));
    for (name, q) in &auto {
        assert_eq!(q["precision"]["stable"], true, "{name} is not stable: {q}");
        assert!(
            q["precision"]["samples"].as_u64().unwrap() > 10_000,
            "{name}"
        );
        let said = q["assumptions"].as_array().unwrap().iter().any(|a| {
            a.as_str().is_some_and(|a| {
                a.contains("until every derived value") && a.contains("JCGM 101:2008 7.9")
            })
        });
        assert!(said, "{name} does not say how many samples were drawn: {q}");
    }
    // The 10^4 run's ends lie within twice their stated precision (four standard errors) of
    // the adaptive run's, which are far more precise.
    for ((name, f), (_, a)) in fixed.iter().zip(&auto) {
        let end = |q: &serde_json::Value, side: &str| {
            let v = q["value"].as_f64().unwrap();
            match side {
                "low" => v - q["below"].as_f64().unwrap(),
                "high" => v + q["above"].as_f64().unwrap(),
                _ => v,
            }
        };
        for side in ["low", "median", "high"] {
            let stated = f["precision"][side].as_f64().unwrap();
            let moved = (end(f, side) - end(a, side)).abs();
            assert!(
                moved <= 2.0 * stated,
                "{name} {side}: moved {moved} with a stated precision of {stated}"
            );
        }
    }
}

/// `samples = "auto"` in a project file turns adaptive sampling on; a count turns it off.
#[test]
fn adaptive_sampling_from_the_project_file() {
    let dir = syzygy_e2e::scratch("adaptive");
    std::fs::copy(
        syzygy_e2e::root().join("tests/fixtures/eval/rv-only.syz"),
        dir.join("a.syz"),
    )
    .unwrap();
    std::fs::write(
        dir.join("syzygy.toml"),
        "[derivation]\nsamples = \"auto\"\n",
    )
    .unwrap();
    let path = dir.join("a.syz");
    let path = path.to_str().unwrap();
    let options = |extra: &[&str]| {
        let mut args = vec!["eval", "--format", "json", path];
        args.extend_from_slice(extra);
        let o = run(&args);
        assert!(o.status.success(), "{}", stderr(&o));
        let v: serde_json::Value = serde_json::from_str(&stdout(&o)).unwrap();
        v["options"]["adaptive"].clone()
    };
    assert_eq!(options(&[]), true);
    assert_eq!(options(&["--samples", "500"]), false);
    std::fs::write(
        dir.join("syzygy.toml"),
        "[derivation]\nsamples = \"lots\"\n",
    )
    .unwrap();
    let o = run(&["eval", path]);
    assert_eq!(o.status.code(), Some(2), "{}", stderr(&o));
    assert!(stderr(&o).contains("\"auto\""), "{}", stderr(&o));
}
