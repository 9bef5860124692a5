//! End-to-end tests of `syz check`, `syz eval` and `syz explain` on the real binary.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use syzygy_e2e::{run, scratch, stderr, stdout};

#[test]
fn every_demo_example_checks_clean() {
    let entries = std::fs::read_dir(syzygy_e2e::root().join("examples")).unwrap();
    let mut n = 0;
    for e in entries {
        let p = e.unwrap().path();
        if p.extension().is_some_and(|x| x == "syz") {
            n += 1;
            let o = run(&["check", p.to_str().unwrap()]);
            assert!(o.status.success(), "{}: {}", p.display(), stdout(&o));
            assert!(
                stdout(&o).contains("0 errors, 0 warnings"),
                "{}",
                stdout(&o)
            );
        }
    }
    assert!(n >= 1);
}

#[test]
fn missing_file_is_an_io_error_with_exit_2() {
    let o = run(&["check", "no/such/file.syz"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("no such file"), "{}", stderr(&o));
}

#[test]
fn a_folder_without_syz_files_is_said_not_passed_silently() {
    let dir = scratch("no-syz-files");
    std::fs::write(dir.join("notes.txt"), "not a system").unwrap();
    for cmd in ["check", "eval"] {
        let o = run(&[cmd, dir.to_str().unwrap()]);
        assert_eq!(
            o.status.code(),
            Some(0),
            "{cmd}: an empty catalogue is valid"
        );
        assert!(
            stderr(&o).contains("no .syz file found"),
            "{cmd}: {}",
            stderr(&o)
        );
    }
}

#[test]
fn binary_file_is_reported_not_panicked() {
    let dir = scratch("binary");
    let f = dir.join("garbage.syz");
    std::fs::write(&f, [0xff, 0xfe, 0x00, 0x81, 0x9f]).unwrap();
    let o = run(&["check", f.to_str().unwrap()]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("not valid UTF-8"), "{}", stderr(&o));
}

#[test]
fn unit_error_is_reported_with_rule_and_exit_1() {
    let dir = scratch("unit");
    let f = dir.join("bad.syz");
    let src = "system \"Tessaly\" {\n  star t { mass = 1.1 Msun }\n  planet b orbits t {\n    period = 12 m/s\n    inclination = 88\n  }\n}\n";
    std::fs::write(&f, src).unwrap();
    let before = std::fs::read(&f).unwrap();
    let o = run(&["check", "--format", "json", f.to_str().unwrap()]);
    assert_eq!(o.status.code(), Some(1));
    let v: serde_json::Value = serde_json::from_str(&stdout(&o)).unwrap();
    let diags = v["diagnostics"].as_array().unwrap();
    let rules: Vec<&str> = diags.iter().map(|d| d["rule"].as_str().unwrap()).collect();
    assert_eq!(rules, ["unit-mismatch", "unit-mismatch"], "{v:#}");
    assert_eq!(diags[0]["line"], 4);
    assert_eq!(diags[0]["column"], 14);
    assert_eq!(diags[1]["line"], 5);
    for k in [
        "rule",
        "severity",
        "message",
        "file",
        "line",
        "column",
        "end_line",
        "end_column",
    ] {
        assert!(diags[0].get(k).is_some(), "missing {k}");
    }
    // syz never writes to what it reads.
    assert_eq!(std::fs::read(&f).unwrap(), before);
}

#[test]
fn eval_json_follows_the_contract_and_is_reproducible() {
    let a = run(&["eval", "--format", "json", "examples/veyra.syz"]);
    let b = run(&["eval", "--format", "json", "examples/veyra.syz"]);
    assert!(a.status.success(), "{}", stderr(&a));
    assert_eq!(a.stdout, b.stdout, "byte-identical JSON on two runs");
    let v: serde_json::Value = serde_json::from_str(&stdout(&a)).unwrap();
    assert_eq!(v["version"], syzygy::report::JSON_VERSION);
    let sys = &v["systems"][0];
    assert_eq!(sys["name"], "Veyra");
    let planet = sys["bodies"]
        .as_array()
        .unwrap()
        .iter()
        .find(|b| b["id"] == "b")
        .unwrap();
    assert_eq!(planet["kind"], "planet");
    assert_eq!(planet["orbits"], "veyra");
    let d = &planet["quantities"]["density"];
    assert_eq!(d["origin"], "derived");
    assert_eq!(d["rule"], "bulk-density");
    assert_eq!(d["si"]["unit"], "kg/m^3");
    assert!(d["inputs"]
        .as_array()
        .unwrap()
        .iter()
        .any(|i| i == "b.mass"));
    let si = d["si"]["value"].as_f64().unwrap();
    let shown = d["value"].as_f64().unwrap();
    assert!((si / 1000.0 - shown).abs() < 1e-9 * si, "g/cm^3 vs kg/m^3");
    let e = &planet["quantities"]["eccentricity"];
    assert_eq!(e["limit"], "upper");
    assert_eq!(planet["quantities"]["albedo"]["origin"], "assumed");
    let period = &planet["quantities"]["period"];
    assert_eq!(period["origin"], "declared");
    assert_eq!(period["citations"][0], "ph1");
}

#[test]
fn eval_text_shows_derived_values_and_assumptions() {
    let o = run(&["eval", "examples/veyra.syz"]);
    assert!(o.status.success());
    let s = stdout(&o);
    for needle in [
        "semi_major_axis",
        "density",
        "teq",
        "insolation",
        "transit_duration",
        "derived by kepler",
        "assumed:",
        "limb darkening",
    ] {
        assert!(s.contains(needle), "missing {needle} in\n{s}");
    }
}

#[test]
fn explain_prints_tree_and_budget() {
    let o = run(&[
        "explain",
        "examples/veyra.syz",
        "b.density",
        "--propagation",
        "linear",
    ]);
    assert!(o.status.success(), "{}", stderr(&o));
    let s = stdout(&o);
    assert!(s.contains("b.density"));
    assert!(s.contains("└─"), "{s}");
    assert!(s.contains("error budget"), "{s}");
    assert!(s.contains("veyra.radius"), "{s}");
    let o = run(&["explain", "examples/veyra.syz", "zz.mass"]);
    assert_eq!(o.status.code(), Some(2));
}

#[test]
fn check_counts_diagnostics_per_rule() {
    let o = run(&[
        "check",
        "--format",
        "json",
        "--propagation",
        "linear",
        "examples/broken",
    ]);
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    let diags = v["diagnostics"].as_array().unwrap();
    let rules = v["summary"]["rules"].as_object().unwrap();
    let total: u64 = rules.values().map(|n| n.as_u64().unwrap()).sum();
    assert_eq!(total as usize, diags.len(), "{v:#}");
    for (id, n) in rules {
        let seen = diags.iter().filter(|d| d["rule"] == id.as_str()).count();
        assert_eq!(seen as u64, n.as_u64().unwrap(), "rule {id}");
    }
    assert_eq!(rules["unit-mismatch"], 2);
    let human = stdout(&run(&[
        "check",
        "--propagation",
        "linear",
        "examples/broken",
    ]));
    assert!(
        human.contains("by rule: syntax: 1, unit-mismatch: 2,"),
        "{human}"
    );
}

#[test]
fn clean_check_has_empty_rule_counts() {
    let o = run(&["check", "--format", "json", "examples/veyra.syz"]);
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert_eq!(v["summary"]["rules"], serde_json::json!({}));
    assert!(!stdout(&run(&["check", "examples/veyra.syz"])).contains("by rule"));
}

#[test]
fn the_demo_catalogue_checks_clean_with_its_project_file() {
    let o = run(&["check", "--format", "json", "examples/catalogue"]);
    assert!(o.status.success(), "{}", stdout(&o));
    let v: serde_json::Value = serde_json::from_str(&stdout(&o)).unwrap();
    assert_eq!(v["files"], 12);
    assert_eq!(v["summary"]["errors"], 0);
    assert_eq!(v["summary"]["warnings"], 0);
    // The catalogue's syzygy.toml makes inconsistencies errors: a copy with one bad entry fails.
    let dir = scratch("catalogue");
    for e in std::fs::read_dir(syzygy_e2e::root().join("examples/catalogue")).unwrap() {
        let p = e.unwrap().path();
        std::fs::copy(&p, dir.join(p.file_name().unwrap())).unwrap();
    }
    let bad = dir.join("aubrel.syz");
    let text = std::fs::read_to_string(&bad).unwrap().replace(
        "rv_amplitude  = 88",
        "semi_major_axis = 0.2 ± 0.001 au\n    rv_amplitude  = 88",
    );
    std::fs::write(&bad, text).unwrap();
    let o = run(&["check", "--format", "json", dir.to_str().unwrap()]);
    assert_eq!(o.status.code(), Some(1), "{}", stdout(&o));
    assert!(stdout(&o).contains("\"inconsistent\""));
}

/// `--compact` writes the same JSON document on one line: the same value, about half the bytes.
#[test]
fn compact_json_is_the_same_document_on_one_line() {
    let args = |compact: bool| {
        let mut a = vec!["eval", "--format", "json", "--propagation", "linear"];
        if compact {
            a.push("--compact");
        }
        a.push("examples/");
        a
    };
    let pretty = run(&args(false));
    let compact = run(&args(true));
    assert_eq!(pretty.status.code(), compact.status.code());
    let (p, c) = (stdout(&pretty), stdout(&compact));
    assert_eq!(c.lines().count(), 1, "one line");
    assert!(
        c.len() * 10 < p.len() * 7,
        "{} vs {} bytes",
        c.len(),
        p.len()
    );
    let p: serde_json::Value = serde_json::from_str(&p).unwrap();
    let c: serde_json::Value = serde_json::from_str(&c).unwrap();
    assert_eq!(p, c);
}

/// A body id found in several systems of the file is not guessed: `explain` names the
/// systems and asks for one, which `--system` or `SYSTEM/BODY.QUANTITY` gives (invented
/// systems).
#[test]
fn explain_asks_which_system_when_a_body_is_in_several() {
    let dir = scratch("explain-ambiguous");
    let file = dir.join("two.syz");
    std::fs::write(
        &file,
        "system \"Pellicor\" {\n  star p { mass = 0.9 ± 0.03 Msun }\n  planet b orbits p { period = 3 ± 0.01 d; rv_amplitude = 20 ± 2 m/s }\n}\nsystem \"Nodrey\" {\n  star n { mass = 1.1 ± 0.03 Msun }\n  planet b orbits n { period = 9 ± 0.01 d; rv_amplitude = 9 ± 1 m/s }\n}\n",
    )
    .unwrap();
    let f = file.to_str().unwrap();
    let o = run(&["explain", f, "b.min_mass"]);
    assert_eq!(o.status.code(), Some(2), "{}", stdout(&o));
    let e = stderr(&o);
    assert!(
        e.contains("'b' names a body of several systems") && e.contains("\"Pellicor\", \"Nodrey\""),
        "{e}"
    );
    // Either way of naming the system explains Nodrey's planet, and says so.
    for args in [
        vec!["explain", f, "Nodrey/b.min_mass"],
        vec!["explain", f, "b.min_mass", "--system", "Nodrey"],
    ] {
        let o = run(&args);
        assert_eq!(o.status.code(), Some(0), "{args:?}: {}", stderr(&o));
        assert!(stdout(&o).contains("n.mass"), "{args:?}: {}", stdout(&o));
        assert!(!stdout(&o).contains("p.mass"), "{args:?}: {}", stdout(&o));
    }
    // A system the file does not have is said to be missing, with the file's systems.
    let o = run(&["explain", f, "nodrey/b.min_mass"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(
        stderr(&o).contains("no system \"nodrey\"")
            && stderr(&o).contains("\"Nodrey\" differs only in letter case"),
        "{}",
        stderr(&o)
    );
    // The two ways must agree.
    let o = run(&["explain", f, "Nodrey/b.min_mass", "--system", "Pellicor"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("but --system names"), "{}", stderr(&o));
}
