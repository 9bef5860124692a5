//! Scale and file-system hardening: a file of 100,000 bodies, a tree of 20,000 files, a
//! symbolic-link loop and a dangling link. (Sizes, not speed: nothing here is timed.)

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use syzygy_e2e::{run, scratch, stderr, stdout};

#[test]
fn a_file_of_100000_bodies_checks() {
    let dir = scratch("big-file");
    let f = dir.join("big.syz");
    let mut text = String::new();
    for i in 0..25_000 {
        text.push_str(&format!(
            "system \"Bulk {i}\" {{ star s {{ mass = 1 ± 0.05 Msun; radius = 1 ± 0.03 Rsun }}\n planet b orbits s {{ period = 3 ± 0.01 d }}\n planet c orbits s {{ period = 9 ± 0.01 d }}\n planet d orbits s {{ period = 27 ± 0.01 d }} }}\n"
        ));
    }
    std::fs::write(&f, text).unwrap();
    let o = run(&[
        "check",
        "--format",
        "json",
        "--propagation",
        "linear",
        f.to_str().unwrap(),
    ]);
    assert!(o.status.success(), "{}", stderr(&o));
    let v: serde_json::Value = serde_json::from_str(&stdout(&o)).unwrap();
    assert_eq!(v["summary"]["errors"], 0);
}

#[test]
fn a_tree_of_20000_files_checks_and_bad_paths_do_not_stop_it() {
    let dir = scratch("big-tree");
    for i in 0..20_000 {
        let sub = dir.join(format!("{:03}", i % 200));
        if i < 200 {
            std::fs::create_dir_all(&sub).unwrap();
        }
        std::fs::write(
            sub.join(format!("s{i}.syz")),
            format!("system \"Tree {i}\" {{ star t {{ mass = 1 ± 0.05 Msun; radius = 1 ± 0.03 Rsun }} }}\n"),
        )
        .unwrap();
    }
    // A loop back to the top and a link to nothing: each is reported, the rest is checked.
    #[cfg(unix)]
    {
        std::os::unix::fs::symlink(&dir, dir.join("000").join("loop")).unwrap();
        std::os::unix::fs::symlink(dir.join("missing.syz"), dir.join("dangling.syz")).unwrap();
    }
    let o = run(&[
        "check",
        "--format",
        "json",
        "--propagation",
        "linear",
        dir.to_str().unwrap(),
    ]);
    let v: serde_json::Value = serde_json::from_str(&stdout(&o)).unwrap();
    assert_eq!(v["files"], 20_000, "{}", stderr(&o));
    assert_eq!(v["summary"]["errors"], 0);
    #[cfg(unix)]
    {
        assert_eq!(o.status.code(), Some(2), "bad paths make the exit status 2");
        let err = stderr(&o);
        assert!(err.contains("loop"), "{err}");
        assert!(err.contains("dangling.syz"), "{err}");
    }
}
