//! End-to-end tests of `syz fmt` and of silencing comments in `syz check`.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use syzygy_e2e::{run, scratch, stderr, stdout};

const MESSY: &str = "# Tessaly: invented.\nref r1 \"Demo survey (invented)\"\nsystem \"Tessaly\" {\n  let half=0.5\n    star t { mass=1.1±0.05 Msun   [r1]; radius = 1.05 +0.04/-0.03 Rsun\n  teff = 6000 +- 100 K # trailing note\n  }\n\n\n\n  planet b orbits t {\n    period=4.2 ± 0.01 d [r1]\n    rv_amplitude = 80 ± 4 km s^-1 /1000 * half * 2\n    transit_depth=0.9±0.05 %\n  }\n}\n";

/// The `systems` part of `eval --format json` (diagnostics carry line numbers, which
/// formatting may change).
fn systems(path: &str) -> serde_json::Value {
    let o = run(&["eval", "--format", "json", path]);
    let v: serde_json::Value = serde_json::from_str(&stdout(&o)).unwrap();
    let mut s = v["systems"].clone();
    for sys in s.as_array_mut().unwrap() {
        sys.as_object_mut().unwrap().remove("file");
    }
    s
}

#[test]
fn fmt_prints_checks_and_writes_without_changing_meaning() {
    let dir = scratch("fmt");
    let f = dir.join("tessaly.syz");
    std::fs::write(&f, MESSY).unwrap();
    let p = f.to_str().unwrap();
    let before = systems(p);

    // Default: prints, rewrites nothing.
    let o = run(&["fmt", p]);
    assert!(o.status.success(), "{}", stderr(&o));
    let printed = stdout(&o);
    assert_eq!(std::fs::read_to_string(&f).unwrap(), MESSY);
    assert!(
        printed.contains("    mass   = 1.1 ± 0.05       Msun [r1]\n"),
        "{printed}"
    );
    assert!(
        printed.contains("    teff   = 6000 +- 100      K  # trailing note\n"),
        "{printed}"
    );
    assert!(!printed.contains("\n\n\n"));

    // --check lists the file and fails; nothing is written.
    let o = run(&["fmt", "--check", p]);
    assert_eq!(o.status.code(), Some(1));
    assert_eq!(stdout(&o).trim(), p);
    assert_eq!(std::fs::read_to_string(&f).unwrap(), MESSY);

    // --write rewrites in place, silently; then --check passes and a second run is a no-op.
    let o = run(&["fmt", "--write", p]);
    assert!(o.status.success(), "{}", stderr(&o));
    assert_eq!(stdout(&o), "");
    assert_eq!(std::fs::read_to_string(&f).unwrap(), printed);
    assert_eq!(run(&["fmt", "--check", p]).status.code(), Some(0));
    assert_eq!(stdout(&run(&["fmt", p])), printed, "idempotent");

    // Same values, same provenance, same uncertainties.
    assert_eq!(systems(p), before);

    // Through a symbolic link: the target is laid out and the link stays a link.
    #[cfg(unix)]
    {
        let target = dir.join("target.syz");
        let link = dir.join("link.syz");
        std::fs::write(&target, MESSY).unwrap();
        std::os::unix::fs::symlink(&target, &link).unwrap();
        let o = run(&["fmt", "--write", link.to_str().unwrap()]);
        assert!(o.status.success(), "{}", stderr(&o));
        assert!(std::fs::symlink_metadata(&link)
            .unwrap()
            .file_type()
            .is_symlink());
        assert_eq!(std::fs::read_to_string(&target).unwrap(), printed);
    }
}

#[test]
fn fmt_refuses_files_it_cannot_lay_out_safely() {
    let dir = scratch("fmt-bad");
    let bad = dir.join("broken.syz");
    let src = "system \"A\" {\n  star s { mass = = 1 Msun }\n}\n";
    std::fs::write(&bad, src).unwrap();
    let o = run(&["fmt", "--write", bad.to_str().unwrap()]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("syntax error"), "{}", stderr(&o));
    assert_eq!(std::fs::read_to_string(&bad).unwrap(), src);

    let bin = dir.join("binary.syz");
    std::fs::write(&bin, [0xff, 0xfe, 0x00]).unwrap();
    let o = run(&["fmt", bin.to_str().unwrap()]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("not valid UTF-8"), "{}", stderr(&o));
}

#[test]
fn silencing_comments_in_check() {
    let dir = scratch("allow");
    let f = dir.join("allowed.syz");
    let src = "system \"Tessaly\" {\n  star t { mass = 1.1 Msun }\n  planet b orbits t {\n    # allow(unit-mismatch): the catalogue gives it like this\n    period = 12 m/s\n    inclination = 88 # allow(inconsistent): nothing to silence here\n  }\n}\n";
    std::fs::write(&f, src).unwrap();
    let o = run(&["check", "--format", "json", f.to_str().unwrap()]);
    let v: serde_json::Value = serde_json::from_str(&stdout(&o)).unwrap();
    let rules: Vec<&str> = v["diagnostics"]
        .as_array()
        .unwrap()
        .iter()
        .map(|d| d["rule"].as_str().unwrap())
        .collect();
    // The period's mismatch is silenced; the inclination's is not, and its allow is unused.
    assert_eq!(rules, ["unit-mismatch", "unused-allow"], "{v:#}");
    assert_eq!(v["diagnostics"][0]["line"], 6);
}
