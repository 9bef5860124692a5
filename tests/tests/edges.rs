//! The edges of the tool: inputs that are not regular files, sizes past the limit, a reader
//! that closes the pipe early, thousands of errors in one file, old line ends, degenerate
//! values in plots. Each must end promptly with a clear word, never hang, panic or flood.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use std::io::{BufRead, BufReader, Read};
use std::path::Path;
use std::process::Command;
use std::time::Duration;
use syzygy_e2e::{root, run, run_bounded, scratch, start, stderr, stdout, syz};

/// Far longer than any of these commands takes; only a hang reaches it.
const HANG: Duration = Duration::from_secs(60);

const GOOD: &str = "system \"Quillon\" {\n  star q { mass = 1.0 ± 0.05 Msun; radius = 1.0 ± 0.02 Rsun }\n  planet b orbits q { period = 3.0 ± 0.001 d; rv_amplitude = 40 ± 2 m/s }\n}\n";

fn path(p: &Path) -> &str {
    p.to_str().unwrap()
}

#[cfg(unix)]
fn mkfifo(p: &Path) {
    let ok = Command::new("mkfifo").arg(p).status().unwrap().success();
    assert!(ok, "mkfifo {}", p.display());
}

#[cfg(unix)]
#[test]
fn a_named_pipe_is_skipped_without_being_opened() {
    let dir = scratch("fifo");
    let fifo = dir.join("x.syz");
    mkfifo(&fifo);
    for cmd in [
        vec!["check", path(&fifo)],
        vec!["eval", path(&fifo)],
        vec!["fmt", path(&fifo)],
        vec!["explain", path(&fifo), "b.mass"],
        vec!["ephemeris", path(&fifo), "b"],
    ] {
        let o = run_bounded(&cmd, HANG);
        assert_eq!(o.status.code(), Some(2), "{cmd:?}");
        assert!(
            stderr(&o).contains("x.syz: a named pipe (FIFO), not a regular file; skipped"),
            "{cmd:?}: {}",
            stderr(&o)
        );
    }
    // Met in a folder walk: skipped with the same word, the other files still checked.
    std::fs::write(dir.join("good.syz"), GOOD).unwrap();
    let o = run_bounded(&["check", path(&dir)], HANG);
    assert_eq!(o.status.code(), Some(2));
    assert!(
        stdout(&o).contains("checked 1 file: 0 errors"),
        "{}",
        stdout(&o)
    );
    assert!(stderr(&o).contains("named pipe"), "{}", stderr(&o));
    let o = run_bounded(&["check", "--format", "json", path(&dir)], HANG);
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert!(v["io_errors"][0].as_str().unwrap().contains("named pipe"));
}

#[cfg(unix)]
#[test]
fn a_device_is_not_read() {
    let o = run_bounded(&["check", "/dev/zero"], HANG);
    assert_eq!(o.status.code(), Some(2));
    assert!(
        stderr(&o).contains("/dev/zero: a character device, not a regular file; skipped"),
        "{}",
        stderr(&o)
    );
}

#[test]
fn files_over_the_size_limit_are_skipped_with_a_word() {
    let dir = scratch("size-limit");
    let f = dir.join("big.syz");
    std::fs::write(&f, format!("{GOOD}{}", "# padding\n".repeat(200))).unwrap();
    let size = std::fs::metadata(&f).unwrap().len();
    for cmd in [
        vec!["check", "--max-file-size", "1KiB", path(&f)],
        vec!["eval", "--max-file-size", "1000", path(&f)],
        vec!["fmt", "--max-file-size", "1kb", path(&f)],
        vec![
            "plot",
            "rv",
            path(&f),
            "b",
            "-o",
            "x.svg",
            "--max-file-size",
            "1k",
        ],
    ] {
        let o = run(&cmd);
        assert_ne!(o.status.code(), Some(0), "{cmd:?}");
        assert!(
            stderr(&o).contains(&format!("{size} bytes is larger than the limit of")),
            "{cmd:?}: {}",
            stderr(&o)
        );
    }
    // Under the limit (and by default) the file is read.
    let o = run(&["check", "--max-file-size", "1MiB", path(&f)]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    assert_eq!(run(&["check", path(&f)]).status.code(), Some(0));
    let o = run(&["check", "--max-file-size", "lots", path(&f)]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("expected a size"), "{}", stderr(&o));
}

/// Start `syz` with `args`, read `lines` lines of its output, close the pipe, and return
/// the exit status and standard error.
fn close_after(args: &[&str], lines: usize) -> (Option<i32>, String) {
    let mut child = start(args);
    let mut err_pipe = child.stderr.take().unwrap();
    let err = std::thread::spawn(move || {
        let mut s = String::new();
        let _ = err_pipe.read_to_string(&mut s);
        s
    });
    {
        let mut out = BufReader::new(child.stdout.take().unwrap());
        for _ in 0..lines {
            let mut line = String::new();
            out.read_line(&mut line).unwrap();
        }
    } // the read end is closed here, with most of the output unread
    let status = child.wait().unwrap();
    (status.code(), err.join().unwrap())
}

#[test]
fn a_reader_that_stops_early_ends_the_command_quietly() {
    // Each output is far larger than a pipe's buffer, so the command is still writing when
    // the reader goes away.
    let dir = scratch("closed-stdout");
    for i in 0..4 {
        let broken = "system \"Y\" {\n  star y { mass = = 1 Msun }\n}\n".repeat(150);
        std::fs::write(dir.join(format!("many-{i}.syz")), broken).unwrap();
    }
    for args in [
        vec![
            "ephemeris",
            "examples/veyra.syz",
            "b",
            "--count",
            "10000",
            "--from",
            "2027-01-01",
        ],
        vec![
            "ephemeris",
            "examples/veyra.syz",
            "b",
            "--count",
            "10000",
            "--from",
            "2027-01-01",
            "--format",
            "json",
        ],
        vec!["check", path(&dir)],
        vec!["check", "--format", "json", path(&dir)],
        vec![
            "eval",
            "--format",
            "json",
            "--propagation",
            "linear",
            "examples/catalogue",
        ],
    ] {
        let (code, err) = close_after(&args, 3);
        assert_eq!(code, Some(0), "{args:?}: {err}");
        assert!(
            !err.contains("panicked") && !err.contains("Broken pipe"),
            "{args:?}: {err}"
        );
    }
}

#[cfg(target_os = "linux")]
#[test]
fn a_full_disk_is_an_error_not_a_panic() {
    let full = std::fs::OpenOptions::new()
        .write(true)
        .open("/dev/full")
        .unwrap();
    let o = Command::new(syz())
        .args(["eval", "examples/veyra.syz"])
        .current_dir(root())
        .stdout(full)
        .output()
        .unwrap();
    assert_eq!(o.status.code(), Some(2));
    assert!(
        stderr(&o).contains("writing the output failed"),
        "{}",
        stderr(&o)
    );
}

#[test]
fn old_mac_line_ends_read_like_unix_ones() {
    // A file with lone carriage returns once read as one long comment line and checked clean.
    let lf = std::fs::read_to_string(root().join("examples/broken/every-rule.syz")).unwrap();
    let dir = scratch("line-ends");
    let positions = |nl: &str| {
        let f = dir.join(format!(
            "every-rule-{}.syz",
            nl.len() + nl.matches('\r').count()
        ));
        std::fs::write(&f, lf.replace('\n', nl)).unwrap();
        let o = run(&[
            "check",
            "--propagation",
            "linear",
            "--format",
            "json",
            path(&f),
        ]);
        let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
        let found: Vec<String> = v["diagnostics"]
            .as_array()
            .unwrap()
            .iter()
            .map(|d| {
                format!(
                    "{} {}:{}-{}:{} {}",
                    d["rule"], d["line"], d["column"], d["end_line"], d["end_column"], d["message"]
                )
            })
            .collect();
        (found, f)
    };
    let (unix, unix_file) = positions("\n");
    assert!(unix.len() > 10, "{unix:?}");
    for nl in ["\r", "\r\n"] {
        let (found, file) = positions(nl);
        assert_eq!(found, unix, "{nl:?}");
        // The formatter lays it out the same, keeping the file's line ends.
        let laid_out = stdout(&run(&["fmt", path(&file)]));
        let want = stdout(&run(&["fmt", path(&unix_file)])).replace('\n', nl);
        assert_eq!(laid_out, want, "{nl:?}");
    }
}

/// A file of `n` lines, each with one syntax error of its own (no two alike).
fn many_errors(n: usize) -> String {
    let mut s = String::from("system \"Errant\" {\n  star e {\n");
    for i in 0..n {
        s.push_str(&format!("    = {i} Msun\n"));
    }
    s.push_str("  }\n}\n");
    s
}

/// An error after more notes than are shown is shown all the same, in text and JSON (200
/// notes early in a file once hid the only error: exit 1 with nothing to read).
#[test]
fn notes_before_it_do_not_hide_an_error() {
    let dir = scratch("noted");
    let f = dir.join("noted.syz");
    let mut text = String::new();
    for i in 0..205 {
        text.push_str(&format!(
            "system \"Noted {i}\" {{ star s{i} {{ mass = 1.0 ± 0.05 ± 0.02 Msun }} }}\n"
        ));
    }
    text.push_str(
        "system \"Last\" { star z { mass = 1.0 ± 0.05 Msun; teff = 5000 ± 50 kelvins } }\n",
    );
    std::fs::write(&f, text).unwrap();
    let file = path(&f);
    let o = run_bounded(&["check", file], HANG);
    let out = stdout(&o);
    assert_eq!(o.status.code(), Some(1));
    assert!(out.contains("kelvins"), "{out}");
    assert!(
        out.contains("5 more diagnostics in this file not shown"),
        "{out}"
    );
    let o = run_bounded(&["check", "--format", "json", file], HANG);
    let doc: serde_json::Value = serde_json::from_str(&stdout(&o)).unwrap();
    let list = doc["diagnostics"].as_array().unwrap();
    assert_eq!(list.len(), 201, "{doc}");
    assert_eq!(list.iter().filter(|d| d["severity"] == "error").count(), 1);
    let o = run_bounded(&["eval", file], HANG);
    assert!(stdout(&o).contains("kelvins") || stderr(&o).contains("kelvins"));
}

#[test]
fn a_file_shows_its_first_200_diagnostics_and_counts_the_rest() {
    let dir = scratch("many-errors");
    let f = dir.join("errant.syz");
    std::fs::write(&f, many_errors(300)).unwrap();
    let file = path(&f);
    let o = run_bounded(&["check", file], HANG);
    let text = stdout(&o);
    assert_eq!(text.matches("[syntax] Error").count(), 200, "{text}");
    assert!(
        text.contains(&format!(
            "note: {file}: 100 more diagnostics in this file not shown (only the first 200 errors, 200 warnings and 200 notes of a file are)"
        )),
        "{text}"
    );
    // Every diagnostic is counted, shown or not.
    assert!(text.contains("checked 1 file: 300 errors"), "{text}");
    assert_eq!(o.status.code(), Some(1));

    let o = run_bounded(&["check", "--format", "json", file], HANG);
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert_eq!(v["diagnostics"].as_array().unwrap().len(), 200);
    assert_eq!(
        v["diagnostics_not_shown"],
        serde_json::json!([{ "file": file, "count": 100 }])
    );
    assert_eq!(v["summary"]["errors"], 300);

    let o = run_bounded(
        &["eval", "--format", "json", "--propagation", "linear", file],
        HANG,
    );
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert_eq!(v["diagnostics"].as_array().unwrap().len(), 200);
    assert_eq!(v["diagnostics_not_shown"][0]["count"], 100);

    let o = run_bounded(&["check", "--format", "sarif", file], HANG);
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert_eq!(v["runs"][0]["results"].as_array().unwrap().len(), 200);
    let notes = &v["runs"][0]["invocations"][0]["toolExecutionNotifications"];
    assert_eq!(notes[0]["level"], "note");
    assert!(
        notes[0]["message"]["text"]
            .as_str()
            .unwrap()
            .contains("100 more diagnostics"),
        "{notes}"
    );
    // A file under the limit has no such line or entry.
    std::fs::write(&f, many_errors(3)).unwrap();
    let o = run(&["check", "--format", "json", file]);
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert_eq!(v["diagnostics_not_shown"], serde_json::json!([]));
}

#[test]
fn thousands_of_errors_and_very_long_lines_print_in_bounded_size() {
    let dir = scratch("floods");
    // 100,000 braces of each kind on one line: two errors, each shown as a window.
    let braces = dir.join("braces.syz");
    std::fs::write(
        &braces,
        format!("{}{}\n", "{".repeat(100_000), "}".repeat(100_000)),
    )
    .unwrap();
    let o = run_bounded(&["check", path(&braces)], HANG);
    let text = stdout(&o);
    assert!(text.len() < 4_000, "{} bytes", text.len());
    assert!(
        text.contains("unmatched '}' (99999 times in a row on this line)"),
        "{text}"
    );
    assert!(text.contains("checked 1 file: 2 errors"), "{text}");
    // About 10 MB with 81,000 syntax errors (and as many duplicate properties): the parser
    // stops after 1,000 syntax errors, and 200 diagnostics are shown.
    let big = dir.join("big.syz");
    let mut src = String::from("system \"Aster\" {\n  star s {\n");
    for _ in 0..81_000 {
        src.push_str(&format!("    mass = = 1 Msun  # {}\n", "x".repeat(100)));
    }
    src.push_str("  }\n}\n");
    std::fs::write(&big, src).unwrap();
    let o = run_bounded(&["check", path(&big)], HANG);
    let text = stdout(&o);
    assert!(text.len() < 200_000, "{} bytes", text.len());
    // The error that says where reading stopped is shown past the cap of 200 errors.
    assert!(text.contains("1799 more diagnostics"), "{text}");
    assert!(
        text.contains("1000 syntax errors: the file is not read past this point"),
        "{text}"
    );
    assert!(
        text.contains("by rule: syntax: 1001, duplicate: 999"),
        "{text}"
    );
    // Ten megabytes of stray names: stopped at 1,000 errors, said where.
    let names = dir.join("names.syz");
    std::fs::write(&names, "a\n".repeat(5_000_000)).unwrap();
    let o = run_bounded(&["check", "--format", "json", path(&names)], HANG);
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert_eq!(v["summary"]["errors"], 1001);
    assert_eq!(v["diagnostics_not_shown"][0]["count"], 800);
}

/// The numbers of an SVG's drawing attributes, which must all be finite.
fn svg_numbers_are_finite(svg: &Path) {
    let text = std::fs::read_to_string(svg).unwrap();
    let doc = roxmltree::Document::parse(&text).unwrap();
    for node in doc.descendants().filter(|n| n.is_element()) {
        for a in node.attributes() {
            if [
                "x", "y", "x1", "y1", "x2", "y2", "cx", "cy", "r", "points", "d", "width", "height",
            ]
            .contains(&a.name())
            {
                let v = a.value().to_ascii_lowercase();
                assert!(!v.contains("nan") && !v.contains("inf"), "{}={v}", a.name());
            }
        }
    }
}

#[test]
fn plots_of_absurd_uncertainties_end_and_say_what_was_left_out() {
    // `check` passes this file; the plots once looped for ever on their axes.
    let dir = scratch("absurd-plots");
    let veyra = std::fs::read_to_string(root().join("examples/veyra.syz")).unwrap();
    let absurd = veyra.replace("56 ± 2 ", "12.5 ± 1e308 ");
    assert_ne!(absurd, veyra);
    let f = dir.join("absurd.syz");
    std::fs::write(&f, absurd).unwrap();
    let svg = dir.join("out.svg");
    let (file, out) = (path(&f), path(&svg));
    let o = run_bounded(&["plot", "rv", file, "b", "-o", out], HANG);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    assert!(
        stderr(&o).contains("are not finite numbers and are left out"),
        "{}",
        stderr(&o)
    );
    assert!(
        stderr(&o).contains("drawn at the edge of the axis"),
        "{}",
        stderr(&o)
    );
    svg_numbers_are_finite(&svg);
    let o = run_bounded(&["plot", "mass-radius", file, "-o", out], HANG);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    assert!(
        stderr(&o).contains("Veyra b: the mass error bar reaches beyond the axis"),
        "{}",
        stderr(&o)
    );
    assert!(std::fs::read_to_string(&svg)
        .unwrap()
        .contains("cut at the edge of the diagram"));
    svg_numbers_are_finite(&svg);
    let o = run_bounded(&["plot", "transit", file, "b", "-o", out], HANG);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    svg_numbers_are_finite(&svg);
    // A planet far outside any planet's range is listed, on the figure too, not drawn.
    let huge = dir.join("huge.syz");
    std::fs::write(
        &huge,
        "system \"Gargant\" {\n  star g { mass = 1 Msun; radius = 1 Rsun }\n  planet b orbits g { period = 10 d; mass = 1e9 Mearth; radius = 2 Rjup }\n  planet c orbits g { period = 30 d; mass = 1 Mjup; radius = 1 Rjup }\n}\n",
    )
    .unwrap();
    let o = run_bounded(&["plot", "mass-radius", path(&huge), "-o", out], HANG);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    assert!(
        stderr(&o).contains("Gargant b: 1e9 Earth masses"),
        "{}",
        stderr(&o)
    );
    assert!(std::fs::read_to_string(&svg)
        .unwrap()
        .contains("beyond the diagram"));
}

/// A system is read with at most 1,000 bodies (`syzygy::model::limits::MAX_SYSTEM_BODIES`):
/// a file of one system of 1,003 stars is checked with an error for each star past the
/// bound, `--allow` cannot silence it, and `eval` lists each such star as not used, with the
/// rule that says why, while the stars within the bound keep their values.
#[test]
fn a_system_past_its_bound_on_bodies_says_which_bodies_are_not_read() {
    let dir = scratch("crowd");
    let file = dir.join("crowd.syz");
    let mut src = String::from("system \"Crowd\" {\n");
    for i in 0..1003 {
        src.push_str(&format!("  star s{i} {{ mass = 0.5 Msun }}\n"));
    }
    src.push_str("}\n");
    std::fs::write(&file, &src).unwrap();
    let o = run_bounded(&["check", "--allow", "too-many-bodies", path(&file)], HANG);
    assert_eq!(o.status.code(), Some(2));
    assert!(
        stderr(&o).contains("'too-many-bodies' cannot be changed"),
        "{}",
        stderr(&o)
    );
    let o = run_bounded(&["check", "--format", "json", path(&file)], HANG);
    assert_eq!(o.status.code(), Some(1), "{}", stderr(&o));
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert_eq!(v["summary"]["rules"]["too-many-bodies"], 3, "{v}");
    let o = run_bounded(&["eval", "--format", "json", path(&file)], HANG);
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    let sys = &v["systems"][0];
    let not_used = sys["not_used"].as_array().unwrap();
    let ids: Vec<&str> = not_used
        .iter()
        .map(|u| u["body"].as_str().unwrap())
        .collect();
    assert_eq!(ids, ["s1000", "s1001", "s1002"], "{not_used:?}");
    assert!(not_used.iter().all(|u| u["rule"] == "too-many-bodies"));
    assert_eq!(not_used[0]["line"], 1002);
    assert_eq!(sys["bodies"].as_array().unwrap().len(), 1000);
    // Named where it is not read, a body past the bound is said to be declared but not read;
    // a silencing comment inside it is not called stale.
    let o = run_bounded(&["explain", path(&file), "s1001.mass"], HANG);
    assert!(
        stderr(&o).contains(
            "'s1001' is declared but not read: system \"Crowd\" has more than 1000 bodies"
        ),
        "{}",
        stderr(&o)
    );
    let with_comment = src.replace(
        "  star s1002 { mass = 0.5 Msun }",
        "  star s1002 {\n    # allow(unknown-quantity)\n    masss = 1 Msun\n  }",
    );
    std::fs::write(&file, with_comment).unwrap();
    let o = run_bounded(&["check", "--format", "json", path(&file)], HANG);
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert_eq!(v["summary"]["rules"]["too-many-bodies"], 3, "{v}");
    assert!(v["summary"]["rules"].get("unused-allow").is_none(), "{v}");
}

/// A system evaluates at most 1,000 `let` bindings (`syzygy::model::limits::
/// MAX_SYSTEM_BINDINGS`): a chain of 1,003 bindings, each adding an uncertain number, is
/// checked with an error on each binding past the bound that `--allow` cannot silence, and
/// the period that uses the last one is listed as not used; within the bound the chain keeps
/// its value (x999 = 1000 ± 0.32, the sum of 1,000 numbers 1 ± 0.01: 0.01 sqrt(1000)).
#[test]
fn a_system_past_its_bound_on_bindings_says_which_are_not_evaluated() {
    let dir = scratch("long-chain");
    let file = dir.join("long.syz");
    let chain = |n: usize, uses: &str| {
        let mut src = String::from(
            "system \"Long\" {\n  star s { mass = 1 ± 0.01 Msun }\n  let x0 = 1 ± 0.01\n",
        );
        for i in 1..n {
            src.push_str(&format!("  let x{i} = x{} + (1 ± 0.01)\n", i - 1));
        }
        src.push_str(&format!(
            "  planet b orbits s {{ period = {uses} * 0.005 d }}\n}}\n"
        ));
        src
    };
    let eval_json = || -> serde_json::Value {
        let args = ["eval", "--format", "json", "--propagation", "linear"];
        let o = run_bounded(&[&args[..], &[path(&file)]].concat(), HANG);
        serde_json::from_slice(&o.stdout).unwrap()
    };
    std::fs::write(&file, chain(1003, "x1002")).unwrap();
    let o = run_bounded(
        &["check", "--allow", "too-many-bindings", path(&file)],
        HANG,
    );
    assert_eq!(o.status.code(), Some(2));
    assert!(
        stderr(&o).contains("'too-many-bindings' cannot be changed"),
        "{}",
        stderr(&o)
    );
    let o = run_bounded(&["check", "--format", "json", path(&file)], HANG);
    assert_eq!(o.status.code(), Some(1), "{}", stderr(&o));
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    // One error for the three bindings past the bound (one scope).
    assert_eq!(v["summary"]["rules"]["too-many-bindings"], 1, "{v}");
    let v = eval_json();
    let not_used = v["systems"][0]["not_used"].as_array().unwrap();
    assert!(
        not_used
            .iter()
            .any(|u| u["body"] == "b" && u["quantity"] == "period"),
        "{not_used:?}"
    );
    // Within the bound: the period is 0.005 d times the last binding's value.
    std::fs::write(&file, chain(1000, "x999")).unwrap();
    let v = eval_json();
    assert!(
        v["systems"][0]["not_used"]
            .as_array()
            .is_none_or(|a| a.is_empty()),
        "{v}"
    );
    let period = &v["systems"][0]["bodies"][1]["quantities"]["period"];
    let days = period["value"].as_f64().unwrap();
    let sigma = period["above"].as_f64().unwrap();
    assert!((days - 5.0).abs() < 1e-9, "{period}");
    assert!(
        (sigma / (0.005 * 0.01 * 1000f64.sqrt()) - 1.0).abs() < 1e-6,
        "{period}"
    );
}
