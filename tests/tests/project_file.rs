//! End-to-end tests of `syzygy.toml`: found by walking up from each file, nearest wins,
//! command-line flags override it, a bad file is an error with exit status 2.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use syzygy_e2e::{root, rules_of, run, scratch, stderr};

fn json(args: &[&str]) -> serde_json::Value {
    let o = run(args);
    serde_json::from_slice(&o.stdout).unwrap_or_else(|e| panic!("{e}: {}", stderr(&o)))
}

#[test]
fn nearest_project_file_wins_and_flags_override_it() {
    let dir = scratch("project-file");
    let deep = dir.join("survey").join("north");
    std::fs::create_dir_all(&deep).unwrap();
    let every = std::fs::read_to_string(root().join("examples/broken/every-rule.syz")).unwrap();
    std::fs::write(dir.join("survey/top.syz"), &every).unwrap();
    std::fs::write(deep.join("deep.syz"), &every).unwrap();
    std::fs::write(
        dir.join("syzygy.toml"),
        "[rules]\ninconsistent = \"note\"\n[derivation]\npropagation = \"linear\"\n",
    )
    .unwrap();
    std::fs::write(
        deep.join("syzygy.toml"),
        "[rules]\nunstable-spacing = \"off\"\n[derivation]\nseed = 11\n",
    )
    .unwrap();
    let top = dir.join("survey/top.syz");
    let top = top.to_str().unwrap();
    let deep_file = deep.join("deep.syz");
    let deep_file = deep_file.to_str().unwrap();

    // The root file applies to survey/top.syz.
    let v = json(&["check", "--format", "json", top]);
    let r = rules_of(&v);
    assert!(r.contains(&("inconsistent".into(), "note".into())), "{r:?}");
    assert!(r.iter().any(|(id, _)| id == "unstable-spacing"), "{r:?}");

    // The nearer file replaces it for deep.syz: inconsistent keeps its default severity
    // (an error, the demo's finding being 22 sigma, past the error threshold).
    let v = json(&["check", "--format", "json", deep_file]);
    let r = rules_of(&v);
    assert!(
        r.contains(&("inconsistent".into(), "error".into())),
        "{r:?}"
    );
    assert!(!r.iter().any(|(id, _)| id == "unstable-spacing"), "{r:?}");

    // A flag beats the project file.
    let v = json(&["check", "--format", "json", "--warn", "inconsistent", top]);
    assert!(rules_of(&v).contains(&("inconsistent".into(), "warning".into())));

    // Derivation settings: the project file's, unless a flag says otherwise.
    let v = json(&["eval", "--format", "json", top]);
    assert_eq!(v["options"]["propagation"], "linear", "{:#}", v["options"]);
    let v = json(&["eval", "--format", "json", deep_file]);
    assert_eq!(v["options"]["seed"], 11);
    assert_eq!(v["options"]["propagation"], "monte-carlo");
    let v = json(&[
        "eval",
        "--format",
        "json",
        "--propagation",
        "monte-carlo",
        "--samples",
        "200",
        top,
    ]);
    assert_eq!(v["options"]["propagation"], "monte-carlo");
    assert_eq!(v["options"]["samples"], 200);
}

#[test]
fn bad_project_file_is_a_clear_error() {
    let dir = scratch("project-file-bad");
    std::fs::copy(root().join("examples/veyra.syz"), dir.join("veyra.syz")).unwrap();
    std::fs::write(
        dir.join("syzygy.toml"),
        "[rules]\ninconsistant = \"error\"\n",
    )
    .unwrap();
    let o = run(&["check", dir.join("veyra.syz").to_str().unwrap()]);
    assert_eq!(o.status.code(), Some(2));
    let e = stderr(&o);
    assert!(e.contains("syzygy.toml"), "{e}");
    assert!(e.contains("did you mean 'inconsistent'"), "{e}");
}

#[test]
fn explain_plot_and_ephemeris_read_the_project_file() {
    let dir = scratch("project-file-other-commands");
    let file = dir.join("veyra.syz");
    std::fs::copy(root().join("examples/veyra.syz"), &file).unwrap();
    std::fs::write(
        dir.join("syzygy.toml"),
        "[derivation]\npropagation = \"linear\"\n",
    )
    .unwrap();
    let f = file.to_str().unwrap();

    // explain says which propagation it used, and it is the project file's.
    let o = run(&["explain", f, "b.density"]);
    assert!(o.status.success(), "{}", stderr(&o));
    let s = syzygy_e2e::stdout(&o);
    assert!(s.contains("uncertainties: first order (linear)"), "{s}");
    let linear_flag = run(&["explain", f, "b.density", "--propagation", "linear"]);
    assert_eq!(s, syzygy_e2e::stdout(&linear_flag));
    // A flag still beats it.
    let o = run(&["explain", f, "b.density", "--propagation", "monte-carlo"]);
    let mc = syzygy_e2e::stdout(&o);
    assert!(
        mc.contains("uncertainties: Monte Carlo, 10000 samples"),
        "{mc}"
    );
    assert_ne!(
        s.lines().next(),
        mc.lines().next(),
        "linear and Monte Carlo agree to the digit?"
    );

    // A broken project file stops explain, ephemeris and plot with status 2 and its name.
    std::fs::write(dir.join("syzygy.toml"), "[derivation]\nsamples = 0\n").unwrap();
    let svg = dir.join("mr.svg");
    for args in [
        vec!["explain", f, "b.density"],
        vec!["ephemeris", f, "b", "--from", "2027-01-01", "--count", "2"],
        vec!["plot", "mass-radius", f, "-o", svg.to_str().unwrap()],
    ] {
        let o = run(&args);
        assert_eq!(o.status.code(), Some(2), "{args:?}: {}", stderr(&o));
        assert!(
            stderr(&o).contains("syzygy.toml"),
            "{args:?}: {}",
            stderr(&o)
        );
    }
    assert!(
        !svg.exists(),
        "no plot is written when the settings are bad"
    );
}
