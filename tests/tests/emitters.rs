//! Golden tests of the machine-readable emitters: `syz check --format json` and
//! `--format sarif` on each deliberately broken demo, snapshotted with insta (the rendering
//! for people is in `snapshots.rs`). Review changes with `cargo insta review`.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use syzygy_e2e::{run, stdout};

fn emitted(path: &std::path::Path, format: &str) -> (Option<i32>, String) {
    let rel = path.strip_prefix(syzygy_e2e::root()).unwrap();
    let o = run(&[
        "check",
        "--format",
        format,
        "--propagation",
        "linear",
        rel.to_str().unwrap(),
    ]);
    (o.status.code(), stdout(&o))
}

fn json_snapshot(path: &std::path::Path) {
    let (code, text) = emitted(path, "json");
    insta::with_settings!({ omit_expression => true }, {
        insta::assert_snapshot!(format!("exit: {code:?}\n{text}"));
    });
}

/// The log as written, except the rules' long descriptions: those are the sections of
/// `docs/rules.md` (tested in `sarif.rs`), and a wording change there is not an emitter change.
fn sarif_snapshot(path: &std::path::Path) {
    let (code, text) = emitted(path, "sarif");
    let mut log: serde_json::Value = serde_json::from_str(&text).unwrap();
    for rule in log["runs"][0]["tool"]["driver"]["rules"]
        .as_array_mut()
        .unwrap()
    {
        for key in ["fullDescription", "help"] {
            let message = rule[key].as_object_mut().unwrap();
            assert!(!message["text"].as_str().unwrap().is_empty());
            for (_, v) in message.iter_mut() {
                *v = "(from docs/rules.md)".into();
            }
        }
    }
    let text = serde_json::to_string_pretty(&log).unwrap();
    insta::with_settings!({ omit_expression => true }, {
        insta::assert_snapshot!(format!("exit: {code:?}\n{text}"));
    });
}

#[test]
fn json_of_the_broken_demos() {
    insta::glob!("../../examples/broken", "*.syz", json_snapshot);
}

#[test]
fn sarif_of_the_broken_demos() {
    insta::glob!("../../examples/broken", "*.syz", sarif_snapshot);
}
