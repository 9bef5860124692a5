//! End-to-end tests of `syz diff` (two folders, and `--against` a git revision) and of
//! what-if values (`--set`) on `eval`, `explain` and `diff`.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use std::path::Path;
use std::process::{Command, Output, Stdio};
use syzygy_e2e::{root, run, scratch, stderr, stdout, syz};

const OLD_MASS: &str = "mass          = 0.97 ± 0.039 Msun [rv]";
const NEW_MASS: &str = "mass          = 1.10 ± 0.039 Msun [rv]";

/// Copy the demo catalogue into `dir`.
fn copy_catalogue(dir: &Path) {
    std::fs::create_dir_all(dir).unwrap();
    for e in std::fs::read_dir(root().join("examples/catalogue")).unwrap() {
        let e = e.unwrap();
        std::fs::copy(e.path(), dir.join(e.file_name())).unwrap();
    }
}

/// Change Aubrel's stellar mass in the copy in `dir`.
fn heavier_aubrel(dir: &Path) {
    let file = dir.join("aubrel.syz");
    let text = std::fs::read_to_string(&file).unwrap();
    assert!(text.contains(OLD_MASS), "the demo changed: update OLD_MASS");
    std::fs::write(&file, text.replace(OLD_MASS, NEW_MASS)).unwrap();
}

fn path(p: &Path) -> &str {
    p.to_str().unwrap()
}

fn json(o: &Output) -> serde_json::Value {
    serde_json::from_slice(&o.stdout).unwrap_or_else(|e| panic!("{e}: {}", stderr(o)))
}

/// `syz diff --propagation linear --format json` with `args`, which must exit with status 1
/// (something moved); its document.
fn diff_json(args: &[&str]) -> serde_json::Value {
    let mut all = vec!["diff", "--propagation", "linear", "--format", "json"];
    all.extend_from_slice(args);
    let o = run(&all);
    assert_eq!(o.status.code(), Some(1), "{args:?}: {}", stderr(&o));
    json(&o)
}

/// Every change of a diff document, as (system, kind, body.quantity, shift).
fn changes(v: &serde_json::Value) -> Vec<(String, String, String, Option<f64>)> {
    let mut out = Vec::new();
    for s in v["systems"].as_array().unwrap() {
        for c in s["changes"].as_array().unwrap() {
            out.push((
                s["name"].as_str().unwrap_or("").to_string(),
                c["kind"].as_str().unwrap().to_string(),
                format!(
                    "{}.{}",
                    c["body"].as_str().unwrap_or(""),
                    c["quantity"].as_str().unwrap_or("")
                ),
                c["shift"].as_f64(),
            ));
        }
    }
    out
}

#[test]
fn one_stellar_mass_moves_that_systems_derived_values_in_every_format() {
    let dir = scratch("diff-mass");
    let (old, new) = (dir.join("old"), dir.join("new"));
    copy_catalogue(&old);
    copy_catalogue(&new);
    heavier_aubrel(&new);
    let args = |format: &str| {
        run(&[
            "diff",
            "--propagation",
            "linear",
            "--format",
            format,
            path(&old),
            path(&new),
        ])
    };

    let v = diff_json(&[path(&old), path(&new)]);
    let systems: Vec<&str> = v["systems"]
        .as_array()
        .unwrap()
        .iter()
        .map(|s| s["name"].as_str().unwrap())
        .collect();
    assert_eq!(systems, ["Aubrel"]);
    assert_eq!(v["systems_compared"], 12);
    assert_eq!(v["threshold"], 1.0);
    assert_eq!(v["options"]["propagation"], "linear");
    let c = changes(&v);
    // The mass itself: 0.13 Msun over sqrt(0.039² + 0.039²) = 0.0552 Msun is 2.357 sigma.
    let mass = c.iter().find(|c| c.2 == "aubrel.mass").unwrap();
    assert_eq!(mass.1, "declared-changed");
    assert!(
        (mass.3.unwrap() - 0.13 / (0.039 * 2f64.sqrt())).abs() < 1e-6,
        "{mass:?}"
    );
    // Kepler's third law: a grows as M^(1/3), by 4.3 %, past its 1.3 % uncertainty.
    let a = c.iter().find(|c| c.2 == "b.semi_major_axis").unwrap();
    assert_eq!(a.1, "derived-changed");
    assert!(a.3.unwrap() > 1.0, "{a:?}");
    for (_, kind, what, shift) in &c {
        if kind == "derived-changed" {
            assert!(shift.unwrap().abs() >= 1.0, "{what} listed below 1 sigma");
        }
    }

    let o = args("text");
    assert_eq!(o.status.code(), Some(1));
    let text = stdout(&o);
    assert!(text.contains("system \"Aubrel\""), "{text}");
    assert!(text.contains("b.semi_major_axis"), "{text}");
    assert!(!text.contains("Brannoc"), "{text}");
    assert!(text.contains("at least 1 σ"), "{text}");
    assert!(text.contains("first order (linear)"), "{text}");
    assert!(text.contains("combined uncertainty"), "{text}");

    let o = args("markdown");
    assert_eq!(o.status.code(), Some(1));
    let md = stdout(&o);
    assert!(
        md.contains("| what | change | old | new | difference | shift |"),
        "{md}"
    );
    assert!(
        md.contains("| b.semi_major_axis | derived value moved |"),
        "{md}"
    );
    assert!(md.contains("#### system \"Aubrel\""), "{md}");
    assert!(!md.contains("Brannoc"), "{md}");
    assert!(
        md.contains("first order (linear)") && md.contains("at least 1 σ"),
        "{md}"
    );

    // --all lists the moves within the threshold too (the planet's mass moves < 1 sigma).
    let all = changes(&diff_json(&["--all", path(&old), path(&new)]));
    assert!(all.len() > c.len(), "{} vs {}", all.len(), c.len());
    assert!(
        all.iter()
            .any(|c| c.2 == "b.mass" && c.3.unwrap().abs() < 1.0),
        "{all:?}"
    );
}

#[test]
fn an_unchanged_copy_shows_nothing_even_by_monte_carlo() {
    let dir = scratch("diff-same");
    let (old, new) = (dir.join("old"), dir.join("new"));
    copy_catalogue(&old);
    copy_catalogue(&new);
    // Monte Carlo (the catalogue's own setting): the same seed gives the same numbers.
    let o = run(&["diff", "--all", path(&old), path(&new)]);
    assert_eq!(o.status.code(), Some(0), "{}{}", stdout(&o), stderr(&o));
    assert!(stdout(&o).contains("0 change(s) found"), "{}", stdout(&o));
    assert!(stdout(&o).contains("Monte Carlo"), "{}", stdout(&o));
}

#[test]
fn systems_and_declared_values_added_or_removed_are_listed() {
    let dir = scratch("diff-added");
    let (old, new) = (dir.join("old"), dir.join("new"));
    copy_catalogue(&old);
    copy_catalogue(&new);
    std::fs::remove_file(new.join("lunsk.syz")).unwrap();
    let file = new.join("aubrel.syz");
    let text = std::fs::read_to_string(&file).unwrap();
    let text = text.replace("    impact        = 0.28 ± 0.05\n", "");
    std::fs::write(&file, text).unwrap();
    let v = diff_json(&[path(&old), path(&new)]);
    let lunsk = v["systems"]
        .as_array()
        .unwrap()
        .iter()
        .find(|s| s["name"] == "Lunsk")
        .unwrap();
    assert_eq!(lunsk["status"], "removed");
    let c = changes(&v);
    assert!(
        c.iter()
            .any(|c| c.1 == "declared-removed" && c.2 == "b.impact"),
        "{c:?}"
    );
}

/// `git` in `dir`, which must succeed.
fn git(dir: &Path, args: &[&str]) {
    let o = Command::new("git")
        .args([
            "-c",
            "user.name=Test",
            "-c",
            "user.email=test@example.invalid",
        ])
        .args(args)
        .current_dir(dir)
        .stdin(Stdio::null())
        .output()
        .unwrap();
    assert!(o.status.success(), "git {args:?}: {}", stderr(&o));
}

/// `syz` run in `dir`.
fn syz_in(dir: &Path, args: &[&str]) -> Output {
    Command::new(syz())
        .args(args)
        .current_dir(dir)
        .env("NO_COLOR", "1")
        .stdin(Stdio::null())
        .output()
        .unwrap()
}

#[test]
fn against_compares_the_working_tree_with_a_revision() {
    let dir = scratch("diff-git");
    copy_catalogue(&dir.join("catalogue"));
    git(&dir, &["init", "--quiet"]);
    git(&dir, &["add", "."]);
    git(&dir, &["commit", "--quiet", "-m", "catalogue"]);
    heavier_aubrel(&dir.join("catalogue"));

    let args = [
        "diff",
        "--against",
        "HEAD",
        "--propagation",
        "linear",
        "--format",
        "markdown",
        "catalogue/",
    ];
    let o = syz_in(&dir, &args);
    assert_eq!(o.status.code(), Some(1), "{}", stderr(&o));
    let md = stdout(&o);
    assert!(
        md.contains(
            "| aubrel.mass | declared value changed | 0.970 ± 0.039 Msun | 1.100 ± 0.039 Msun |"
        ),
        "{md}"
    );
    assert!(
        md.contains("b.semi_major_axis") && !md.contains("Brannoc"),
        "{md}"
    );
    assert!(md.contains("catalogue/ at HEAD"), "{md}");

    // From inside the folder, with a file path.
    let o = syz_in(
        &dir.join("catalogue"),
        &[
            "diff",
            "--against",
            "HEAD",
            "--propagation",
            "linear",
            "aubrel.syz",
        ],
    );
    assert_eq!(o.status.code(), Some(1), "{}", stderr(&o));
    assert!(stdout(&o).contains("aubrel.mass"), "{}", stdout(&o));

    // Committed: nothing to show.
    git(&dir, &["commit", "--quiet", "-am", "heavier"]);
    let o = syz_in(&dir, &args);
    assert_eq!(o.status.code(), Some(0), "{}{}", stdout(&o), stderr(&o));

    // A revision that does not exist, and ones that look like options, are refused.
    let o = syz_in(&dir, &["diff", "--against", "no-such-branch", "catalogue/"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("no such revision"), "{}", stderr(&o));
    let written = dir.join("written-by-git");
    let option = format!("--output={}", written.display());
    for rev in [option.as_str(), "-h", "--all"] {
        let o = syz_in(&dir, &["diff", "--against", rev, "catalogue/"]);
        assert_eq!(o.status.code(), Some(2), "{rev}: {}", stdout(&o));
        assert!(
            stderr(&o).contains("not a revision"),
            "{rev}: {}",
            stderr(&o)
        );
        assert!(o.stdout.is_empty(), "{rev}");
    }
    let o = syz_in(
        &dir,
        &["diff", &format!("--against={option}"), "catalogue/"],
    );
    assert_eq!(o.status.code(), Some(2));
    assert!(!written.exists());
}

#[test]
fn set_changes_evals_numbers_and_says_so() {
    let file = "examples/catalogue/aubrel.syz";
    let eval = |extra: &[&str]| {
        let mut args = vec!["eval", "--format", "json", "--propagation", "linear", file];
        args.extend_from_slice(extra);
        let o = run(&args);
        assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
        json(&o)
    };
    let plain = eval(&[]);
    let set = eval(&["--set", "aubrel.mass=0.80 ± 0.03 Msun"]);
    let star = |v: &serde_json::Value| v["systems"][0]["bodies"][0]["quantities"].clone();
    let planet = |v: &serde_json::Value| v["systems"][0]["bodies"][1]["quantities"].clone();
    assert_eq!(star(&plain)["mass"]["origin"], "declared");
    assert_eq!(star(&set)["mass"]["origin"], "set");
    assert_eq!(star(&set)["mass"]["value"], 0.8);
    let a = |v: &serde_json::Value| planet(v)["semi_major_axis"]["value"].as_f64();
    let (a0, a1) = (a(&plain).unwrap(), a(&set).unwrap());
    // Kepler's third law at a fixed period: a scales as M^(1/3).
    assert!(
        (a1 / a0 - (0.80f64 / 0.97).cbrt()).abs() < 1e-3,
        "{a0} {a1}"
    );
    let said = planet(&set)["semi_major_axis"]["assumptions"].to_string();
    assert!(
        said.contains("aubrel.mass = 0.80 ± 0.03 Msun set on the command line (--set), in place of the file's 0.97 ± 0.039 Msun"),
        "{said}"
    );
    // The file is not changed, and the text says so too.
    let text = std::fs::read_to_string(root().join(file)).unwrap();
    assert!(text.contains(OLD_MASS));
    let o = run(&[
        "eval",
        "--propagation",
        "linear",
        file,
        "--set",
        "b.albedo=0.3",
    ]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    assert!(
        stdout(&o).lines().any(|l| {
            let words: Vec<&str> = l.split_whitespace().collect();
            words.first() == Some(&"albedo") && words.get(1) == Some(&"0.3")
        }),
        "{}",
        stdout(&o)
    );
    assert!(stdout(&o).contains("set on the command line (--set), not declared in the file"));

    let o = run(&[
        "explain",
        "--propagation",
        "linear",
        file,
        "b.density",
        "--set",
        "aubrel.mass=0.80 ± 0.03 Msun",
    ]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    assert!(
        stdout(&o).contains("set on the command line"),
        "{}",
        stdout(&o)
    );
}

#[test]
fn set_on_diff_shows_the_consequences_of_a_what_if() {
    let v = diff_json(&[
        "examples/catalogue/",
        "--set",
        "Aubrel/aubrel.mass=0.80 ± 0.03 Msun",
    ]);
    assert_eq!(v["set"][0], "Aubrel/aubrel.mass=0.80 ± 0.03 Msun");
    let c = changes(&v);
    assert!(c.iter().all(|c| c.0 == "Aubrel"), "{c:?}");
    assert!(c.iter().any(|c| c.2 == "b.semi_major_axis"), "{c:?}");
    let mass = &v["systems"][0]["changes"]
        .as_array()
        .unwrap()
        .iter()
        .find(|c| c["quantity"] == "mass" && c["body"] == "aubrel")
        .unwrap()["notes"];
    assert!(
        mass.to_string().contains("set on the command line"),
        "{mass}"
    );
}

#[test]
fn bad_set_values_stop_the_command_naming_the_option() {
    let file = "examples/catalogue/aubrel.syz";
    for (set, words) in [
        ("aubrel.mass=0.8 ± 0.03 Rsun", "a length"),
        ("aubrel.mas=0.8 Msun", "did you mean 'mass'"),
        ("nobody.mass=0.8 Msun", "no body 'nobody'"),
        ("aubrel.mass=0.8 ± ± Msun", "refused"),
        ("aubrel.mass", "expected [SYSTEM/]BODY.QUANTITY=VALUE"),
        ("Elsewhere/aubrel.mass=0.8 Msun", "no system \"Elsewhere\""),
        ("aubrel.mass=0.8 Msun [rv]", "cites"),
        ("aubrel.mass=2 * 0.4 Msun", "expression"),
    ] {
        for cmd in ["eval", "diff"] {
            let o = run(&[cmd, "--propagation", "linear", file, "--set", set]);
            assert_eq!(
                o.status.code(),
                Some(2),
                "{cmd} --set {set}: {}",
                stdout(&o)
            );
            let err = stderr(&o);
            assert!(err.contains("--set"), "{set}: {err}");
            assert!(err.contains(words), "{set}: {err}");
            assert!(o.stdout.is_empty(), "{set}");
        }
    }
    // A body of several systems must be named with its system.
    let o = run(&["eval", "examples/catalogue/", "--set", "b.albedo=0.3"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(
        stderr(&o).contains("'Aubrel/b.albedo=...'"),
        "{}",
        stderr(&o)
    );
}

/// The CI job of examples/catalogue/README.md runs its `syz diff` line as written, in a clone
/// whose `origin/main` is the catalogue before a pull request's edit.
#[test]
fn the_review_job_of_the_catalogue_readme_runs_as_written() {
    let readme = std::fs::read_to_string(root().join("examples/catalogue/README.md")).unwrap();
    let lines: Vec<&str> = readme
        .lines()
        .filter(|l| l.contains("syz diff --against"))
        .collect();
    assert!(
        lines.len() >= 2,
        "the README should show the command and run it in the job"
    );
    let dir = scratch("diff-readme");
    let upstream = dir.join("upstream");
    copy_catalogue(&upstream.join("examples/catalogue"));
    std::fs::create_dir_all(&upstream).unwrap();
    git(&upstream, &["init", "--quiet", "-b", "main"]);
    git(&upstream, &["add", "."]);
    git(&upstream, &["commit", "--quiet", "-m", "catalogue"]);
    git(&dir, &["clone", "--quiet", "upstream", "work"]);
    let work = dir.join("work");
    heavier_aubrel(&work.join("examples/catalogue"));
    for line in lines {
        let command = line.trim_start().trim_start_matches("syz diff").trim();
        let command = command.split(" >").next().unwrap();
        let mut args = vec!["diff"];
        args.extend(command.split_whitespace());
        let o = syz_in(&work, &args);
        assert_eq!(o.status.code(), Some(1), "{line}: {}", stderr(&o));
        let md = stdout(&o);
        assert!(md.contains("#### system \"Aubrel\""), "{line}: {md}");
        assert!(
            md.contains("| b.semi_major_axis | derived value moved |"),
            "{md}"
        );
        assert!(md.contains("Monte Carlo"), "{md}");
    }
}

/// Every field of the diff's JSON is documented in docs/review.md, and the changes of a
/// system come most significant first.
#[test]
fn the_json_fields_are_documented_and_changes_ranked() {
    let v = diff_json(&[
        "--all",
        "examples/veyra.syz",
        "--set",
        "veyra.mass=0.85 ± 0.04 Msun",
    ]);
    fn keys(v: &serde_json::Value, out: &mut std::collections::BTreeSet<String>) {
        match v {
            serde_json::Value::Object(m) => {
                for (k, x) in m {
                    out.insert(k.clone());
                    keys(x, out);
                }
            }
            serde_json::Value::Array(a) => a.iter().for_each(|x| keys(x, out)),
            _ => {}
        }
    }
    let mut all = std::collections::BTreeSet::new();
    keys(&v, &mut all);
    let doc = std::fs::read_to_string(root().join("docs/review.md")).unwrap();
    let missing: Vec<&String> = all
        .iter()
        .filter(|k| !doc.contains(&format!("`{k}`")))
        .collect();
    assert!(missing.is_empty(), "docs/review.md lacks {missing:?}");
    let weights: Vec<f64> = v["systems"][0]["changes"]
        .as_array()
        .unwrap()
        .iter()
        .map(|c| c["shift"].as_f64().map_or(f64::INFINITY, f64::abs))
        .collect();
    assert!(weights.len() > 5, "{weights:?}");
    assert!(weights.windows(2).all(|w| w[0] >= w[1]), "{weights:?}");
}
