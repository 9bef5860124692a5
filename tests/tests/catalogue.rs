//! End-to-end tests of checks across the files of a catalogue, with the real `syz`: shared
//! references named by `syzygy.toml`, a system declared in two files, a star whose values
//! disagree between files, one paper under two ids. The rules shown here:
//! "ref-shadows-shared", "system-in-two-files", "star-disagrees-across-files",
//! "paper-under-two-ids".

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use serde_json::Value;
use std::path::Path;
use syzygy_e2e::{run, scratch, stderr, stdout};

fn write(dir: &Path, name: &str, text: &str) {
    std::fs::write(dir.join(name), text).unwrap();
}

fn json(args: &[&str]) -> Value {
    let o = run(args);
    serde_json::from_slice(&o.stdout).unwrap_or_else(|e| panic!("{e}: {}", stderr(&o)))
}

fn with_rule<'v>(v: &'v Value, rule: &str) -> Vec<&'v Value> {
    v["diagnostics"]
        .as_array()
        .unwrap()
        .iter()
        .filter(|d| d["rule"] == rule)
        .collect()
}

const QUARREL: &str = "system \"Quarrel\" {\n  star quarrel { mass = 1.00 ± 0.02 Msun }\n}\n";

#[test]
fn a_system_in_two_files_names_both_places_in_text_and_sarif() {
    let dir = scratch("catalogue-system");
    // Files under one project file form a catalogue; an empty one is enough.
    write(&dir, "syzygy.toml", "");
    write(&dir, "a.syz", QUARREL);
    write(
        &dir,
        "b.syz",
        "# a second copy\n\nsystem \"Quarrel\" {\n  star other { mass = 1.00 ± 0.02 Msun }\n}\n",
    );
    let d = dir.to_str().unwrap();
    let a = dir.join("a.syz");
    let b = dir.join("b.syz");

    let o = run(&["check", d]);
    assert_eq!(o.status.code(), Some(0), "a warning: {}", stderr(&o));
    let text = stdout(&o);
    assert!(
        text.contains("[system-in-two-files] Warning: system \"Quarrel\" is also declared in"),
        "{text}"
    );
    assert!(text.contains(&format!("{}:1", a.display())), "{text}");
    assert!(text.contains(&format!("{}:3:8", b.display())), "{text}");
    assert!(text.contains("system-in-two-files: 1"), "{text}");
    // Warnings fail a run that denies them.
    assert_eq!(run(&["check", "--deny-warnings", d]).status.code(), Some(1));

    let sarif = json(&["check", "--format", "sarif", d]);
    let results = sarif["runs"][0]["results"].as_array().unwrap();
    let r = results
        .iter()
        .find(|r| r["ruleId"] == "system-in-two-files")
        .unwrap_or_else(|| panic!("{sarif:#}"));
    let at = &r["locations"][0]["physicalLocation"];
    assert!(
        at["artifactLocation"]["uri"]
            .as_str()
            .unwrap()
            .ends_with("/b.syz"),
        "{r:#}"
    );
    assert_eq!(at["region"]["startLine"], 3);
    let other = &r["relatedLocations"][0]["physicalLocation"];
    assert!(
        other["artifactLocation"]["uri"]
            .as_str()
            .unwrap()
            .ends_with("/a.syz"),
        "{r:#}"
    );
    assert_eq!(other["region"]["startLine"], 1);

    // The project file can raise it to an error; one file alone has nothing to compare.
    write(
        &dir,
        "syzygy.toml",
        "[rules]\nsystem-in-two-files = \"error\"\n",
    );
    assert_eq!(run(&["check", d]).status.code(), Some(1));
    assert_eq!(run(&["check", a.to_str().unwrap()]).status.code(), Some(0));
}

#[test]
fn a_star_whose_values_disagree_between_files_is_reported_with_both_values() {
    let dir = scratch("catalogue-star");
    write(&dir, "syzygy.toml", "");
    write(&dir, "a.syz", QUARREL);
    write(
        &dir,
        "b.syz",
        "system \"Quarrel B\" {\n  star quarrel { mass = 1.30 ± 0.02 Msun }\n}\n",
    );
    write(
        &dir,
        "c.syz",
        "system \"Quarrel C\" {\n  star quarrel { mass = 1.04 ± 0.02 Msun }\n}\n",
    );
    let v = json(&["check", "--format", "json", dir.to_str().unwrap()]);
    let found = with_rule(&v, "star-disagrees-across-files");
    // b is 10.6 combined standard deviations from a; c only 1.4 (0.04 / 0.028, arithmetic).
    assert_eq!(found.len(), 1, "{v:#}");
    let d = found[0];
    assert!(d["file"].as_str().unwrap().ends_with("b.syz"), "{d:#}");
    assert_eq!(d["severity"], "warning");
    let m = d["message"].as_str().unwrap();
    assert!(
        m.contains("1.000 ± 0.020 Msun there and 1.300 ± 0.020 Msun here differ by 10.6"),
        "{m}"
    );
    assert!(m.contains("a.syz:2"), "{m}");
    assert!(
        d["labels"][0]["file"].as_str().unwrap().ends_with("a.syz"),
        "{d:#}"
    );
}

#[test]
fn shared_references_resolve_from_every_file_and_a_file_alone_still_checks() {
    let dir = scratch("catalogue-shared");
    write(
        &dir,
        "syzygy.toml",
        "[references]\nfiles = [\"references.syz\"]\n",
    );
    write(
        &dir,
        "references.syz",
        "# The catalogue's sources\nref survey \"Demo spectroscopic survey of the catalogue (invented data)\"\n",
    );
    write(
        &dir,
        "a.syz",
        "system \"Amble\" {\n  star amble { mass = 1.0 ± 0.02 Msun [survey] }\n  planet b orbits amble { period = 3 ± 0.01 d }\n}\n",
    );
    write(
        &dir,
        "b.syz",
        "ref own \"Own photometry (invented)\"\nsystem \"Brisk\" {\n  star brisk { radius = 0.9 ± 0.02 Rsun [survey, own] }\n}\n",
    );
    let d = dir.to_str().unwrap();
    let o = run(&["check", d]);
    assert_eq!(o.status.code(), Some(0), "{}{}", stdout(&o), stderr(&o));
    assert!(
        stdout(&o).contains("checked 3 files: 0 errors, 0 warnings, 0 notes"),
        "{}",
        stdout(&o)
    );

    // The table of references lists the shared reference once, under the file that declares
    // it (run from the folder, the files are named as given).
    let o = std::process::Command::new(syzygy_e2e::syz())
        .current_dir(&*dir)
        .args([
            "eval",
            "--format",
            "votable",
            "--propagation",
            "linear",
            "a.syz",
            "b.syz",
        ])
        .output()
        .unwrap();
    let vot = stdout(&o);
    let row = "<TR><TD>references.syz</TD><TD>survey</TD><TD>Demo spectroscopic survey of the catalogue (invented data)</TD></TR>";
    assert_eq!(vot.matches(row).count(), 1, "{vot}");
    assert!(vot.contains("<TD>b.syz</TD><TD>own</TD>"), "{vot}");

    // A file checked outside the project behaves as before: the shared id is unknown there,
    // and a file that cites only its own references is clean.
    let alone = scratch("catalogue-alone");
    std::fs::copy(dir.join("a.syz"), alone.join("a.syz")).unwrap();
    let v = json(&[
        "check",
        "--format",
        "json",
        alone.join("a.syz").to_str().unwrap(),
    ]);
    let unknown = with_rule(&v, "unknown-ref");
    assert_eq!(unknown.len(), 1, "{v:#}");
    assert_eq!(
        unknown[0]["message"],
        "no reference 'survey' is declared in this file"
    );
    write(
        &alone,
        "own.syz",
        "ref own \"Own\"\nsystem \"Own\" {\n  star own { mass = 1 ± 0.1 Msun [own] }\n}\n",
    );
    assert_eq!(
        run(&["check", alone.join("own.syz").to_str().unwrap()])
            .status
            .code(),
        Some(0)
    );

    // A file's own reference of a shared id with another text wins, with a warning.
    write(&dir, "c.syz", "ref survey \"Another survey\"\nsystem \"Cove\" {\n  star cove { mass = 1 ± 0.1 Msun [survey] }\n}\n");
    let v = json(&["check", "--format", "json", d]);
    let shadow = with_rule(&v, "ref-shadows-shared");
    assert_eq!(shadow.len(), 1, "{v:#}");
    assert!(
        shadow[0]["message"]
            .as_str()
            .unwrap()
            .contains("references.syz:2"),
        "{v:#}"
    );

    // A shared file that cannot be read stops the run, as a bad project file does.
    write(
        &dir,
        "syzygy.toml",
        "[references]\nfiles = [\"missing.syz\"]\n",
    );
    let o = run(&["check", d]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("[references]: "), "{}", stderr(&o));
    assert!(stderr(&o).contains("missing.syz"), "{}", stderr(&o));
}

#[test]
fn one_paper_under_two_ids_is_a_note_naming_both() {
    let dir = scratch("catalogue-paper");
    write(&dir, "syzygy.toml", "");
    write(
        &dir,
        "a.syz",
        "ref rv \"Demo velocities of the north (invented)\"\n",
    );
    write(
        &dir,
        "b.syz",
        "\nref vel \"Demo  velocities of the North (invented)\"\n",
    );
    let v = json(&["check", "--format", "json", dir.to_str().unwrap()]);
    let found = with_rule(&v, "paper-under-two-ids");
    assert_eq!(found.len(), 1, "{v:#}");
    let d = found[0];
    assert_eq!(d["severity"], "note");
    assert_eq!(d["line"], 2);
    let m = d["message"].as_str().unwrap();
    assert!(
        m.starts_with("reference 'vel' has the same text as 'rv' in "),
        "{m}"
    );
    assert!(m.contains("a.syz:1"), "{m}");
}

/// Files under no project file are not compared with each other: `syz check` says so, so
/// that a folder holding one system twice with masses 10 sigma apart is not taken for clean.
#[test]
fn files_under_no_project_file_are_said_not_to_be_compared() {
    let dir = scratch("catalogue-none");
    write(&dir, "a.syz", QUARREL);
    write(
        &dir,
        "b.syz",
        "system \"Quarrel\" {\n  star quarrel { mass = 1.30 ± 0.02 Msun }\n}\n",
    );
    let d = dir.to_str().unwrap();
    let o = run(&["check", d]);
    let said = "not compared with each other (system-in-two-files, star-disagrees-across-files, paper-under-two-ids): no syzygy.toml holds these files";
    assert!(stdout(&o).contains(said), "{}", stdout(&o));
    // Under a project file they are compared, and the line is gone.
    write(&dir, "syzygy.toml", "");
    let o = run(&["check", d]);
    assert!(!stdout(&o).contains(said), "{}", stdout(&o));
    assert!(
        stdout(&o).contains("system-in-two-files: 1"),
        "{}",
        stdout(&o)
    );
}
