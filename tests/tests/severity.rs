//! End-to-end tests of how severe a finding is, through the real `syz check` exit status:
//! an inconsistency past the error threshold (5 sigma by default, `--error-sigma`,
//! `consistency_error_sigma` in `syzygy.toml`) is an error and fails the check.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use syzygy_e2e::{rules_of, run, scratch, stderr, stdout};

/// A planet radius typed in Rearth where Rjup was meant: 21 sigma from the radius the transit
/// depth and the star give (invented system).
const WRONG_UNIT: &str = "system \"Pell\" {
  star pell {
    mass   = 0.90 ± 0.04 Msun
    radius = 0.85 ± 0.03 Rsun
  }
  planet b orbits pell {
    period        = 3.1 d
    transit_depth = 1.10 ± 0.05 %
    radius        = 1.05 ± 0.05 Rearth
  }
}
";

fn severities(out: &std::process::Output) -> Vec<(String, String)> {
    let v: serde_json::Value = serde_json::from_slice(&out.stdout)
        .unwrap_or_else(|e| panic!("{e}: {}{}", stdout(out), stderr(out)));
    rules_of(&v)
}

#[test]
fn a_radius_in_the_wrong_unit_fails_the_check() {
    let dir = scratch("severity-wrong-unit");
    let file = dir.join("pell.syz");
    std::fs::write(&file, WRONG_UNIT).unwrap();
    let file = file.to_str().unwrap();

    let out = run(&["check", file]);
    assert_eq!(out.status.code(), Some(1), "{}", stdout(&out));
    let text = stdout(&out);
    assert!(text.contains("by 21.1 sigma"), "{text}");
    assert!(
        text.contains("past the error threshold of 5 sigma"),
        "{text}"
    );

    let out = run(&["check", "--format", "json", file]);
    assert_eq!(out.status.code(), Some(1));
    assert_eq!(severities(&out), [("inconsistent".into(), "error".into())]);

    // Past the flag's threshold it is a warning again, and the check passes.
    let out = run(&["check", "--format", "json", "--error-sigma", "25", file]);
    assert_eq!(out.status.code(), Some(0), "{}", stderr(&out));
    assert_eq!(
        severities(&out),
        [("inconsistent".into(), "warning".into())]
    );
}

#[test]
fn the_project_file_sets_the_error_threshold_and_the_flag_beats_it() {
    let dir = scratch("severity-project");
    let file = dir.join("pell.syz");
    std::fs::write(&file, WRONG_UNIT).unwrap();
    std::fs::write(
        dir.join("syzygy.toml"),
        "[derivation]\nconsistency_error_sigma = 30.0\n",
    )
    .unwrap();
    let file = file.to_str().unwrap();
    let out = run(&["check", "--format", "json", file]);
    assert_eq!(out.status.code(), Some(0), "{}", stderr(&out));
    assert_eq!(
        severities(&out),
        [("inconsistent".into(), "warning".into())]
    );
    // `syz eval` reports the threshold it used among its options.
    let out = run(&["eval", "--format", "json", "--propagation", "linear", file]);
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(v["options"]["consistency_error_sigma"], 30.0, "{v}");

    let out = run(&["check", "--format", "json", "--error-sigma", "10", file]);
    assert_eq!(out.status.code(), Some(1));
    assert_eq!(severities(&out), [("inconsistent".into(), "error".into())]);

    std::fs::write(
        dir.join("syzygy.toml"),
        "[derivation]\nconsistency_error_sigma = -1\n",
    )
    .unwrap();
    let out = run(&["check", file]);
    assert_eq!(out.status.code(), Some(2));
    assert!(
        stderr(&out).contains("consistency_error_sigma = -1: expected a positive number"),
        "{}",
        stderr(&out)
    );
}

#[test]
fn a_mild_inconsistency_stays_a_warning() {
    let dir = scratch("severity-mild");
    let file = dir.join("pell.syz");
    // The same system with the radius in Rjup and 0.06 Rjup too large: about 3.5 sigma.
    std::fs::write(
        &file,
        WRONG_UNIT.replace("1.05 ± 0.05 Rearth", "1.05 ± 0.02 Rjup"),
    )
    .unwrap();
    let out = run(&["check", "--format", "json", file.to_str().unwrap()]);
    assert_eq!(out.status.code(), Some(0), "{}", stderr(&out));
    // The note: a giant's radius does not tell a mass, so none is predicted.
    assert_eq!(
        severities(&out),
        [
            ("not-derivable".into(), "note".into()),
            ("inconsistent".into(), "warning".into())
        ]
    );
}

/// Silencing a rule that refuses a value hides the finding, not the value: `check` says how
/// many values no output uses, `eval` lists each with why (text and JSON), and a table
/// says on standard error what it leaves out (invented system).
#[test]
fn a_silenced_refusal_still_shows_the_value_it_refused() {
    let dir = scratch("severity-silenced-refusal");
    let file = dir.join("tessaly.syz");
    std::fs::write(
        &file,
        "system \"Tessaly\" {
  star tess { mass = 0.9 ± 0.03 Msun }
  planet b orbits tess {
    period = 7.3 ± 0.01 d
    eccentricity = 1.3
    rv_amplitude = 30 ± 3 km # allow(unit-mismatch): checking the drop is still shown
  }
}
",
    )
    .unwrap();
    let file = file.to_str().unwrap();
    let allow = ["--allow", "out-of-range"];

    let out = run(&["check", allow[0], allow[1], file]);
    assert_eq!(out.status.code(), Some(0), "{}", stdout(&out));
    assert!(
        stdout(&out).contains("not used: 2 declared values refused by a silenced rule"),
        "{}",
        stdout(&out)
    );

    let out = run(&["eval", allow[0], allow[1], file]);
    assert_eq!(out.status.code(), Some(0), "{}", stderr(&out));
    let text = stdout(&out);
    assert!(
        text.contains("not used: `eccentricity = 1.3` (line 5): [out-of-range]"),
        "{text}"
    );
    assert!(
        text.contains("not used: `rv_amplitude = 30 ± 3 km` (line 6): [unit-mismatch]"),
        "{text}"
    );

    let out = run(&["eval", "--format", "json", allow[0], allow[1], file]);
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let listed = &v["systems"][0]["not_used"];
    assert_eq!(listed.as_array().map(Vec::len), Some(2), "{listed}");
    assert_eq!(listed[0]["quantity"], "eccentricity");
    assert_eq!(listed[0]["rule"], "out-of-range");
    assert_eq!(listed[0]["silenced"], true);
    assert_eq!(listed[0]["line"], 5);

    let out = run(&["eval", "--format", "csv", allow[0], allow[1], file]);
    assert_eq!(out.status.code(), Some(0), "{}", stderr(&out));
    let err = stderr(&out);
    assert!(
        err.contains(":5: `eccentricity = 1.3` is not in the table: [out-of-range]"),
        "{err}"
    );
    assert!(
        err.contains(":6: `rv_amplitude = 30 ± 3 km` is not in the table"),
        "{err}"
    );
}
