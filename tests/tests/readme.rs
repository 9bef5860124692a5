//! The README and the tool cannot drift apart: every `syz` line of its usage block runs as
//! written and ends with the exit status its comment gives, the commands for a fresh machine
//! run, the taste of the language checks clean, and every demo file is in canonical layout.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};
use syzygy_e2e::{root, run, scratch, stderr, stdout, syz};

fn readme() -> String {
    std::fs::read_to_string(root().join("README.md")).unwrap()
}

/// The lines of the first fenced block of `lang` after `heading`.
fn block_after(text: &str, heading: &str, lang: &str) -> Vec<String> {
    let from = text
        .find(heading)
        .unwrap_or_else(|| panic!("README has no `{heading}`"));
    let rest = &text[from..];
    let open = format!("```{lang}\n");
    let start = rest.find(&open).unwrap() + open.len();
    let end = start + rest[start..].find("```").unwrap();
    rest[start..end].lines().map(str::to_string).collect()
}

/// A usage line split into its command and the exit status its comment documents: `(exit N)`
/// in the comment, else 0.
fn command_and_status(line: &str) -> (Vec<String>, i32) {
    let (command, comment) = line.split_once(" #").unwrap_or((line, ""));
    assert!(
        !command.contains(['|', '>', '<', '"', '\'', '$', ';', '&']),
        "README usage lines are plain commands: {line}"
    );
    let status = comment
        .split_once("(exit ")
        .map_or(0, |(_, n)| n[..n.find(')').unwrap()].parse().unwrap());
    (
        command.split_whitespace().map(str::to_string).collect(),
        status,
    )
}

/// Copy `from` into `to`, folders included.
fn copy_tree(from: &Path, to: &Path) {
    std::fs::create_dir_all(to).unwrap();
    for entry in std::fs::read_dir(from).unwrap() {
        let entry = entry.unwrap();
        let target = to.join(entry.file_name());
        if entry.file_type().unwrap().is_dir() {
            copy_tree(&entry.path(), &target);
        } else {
            std::fs::copy(entry.path(), &target).unwrap();
        }
    }
}

#[test]
fn every_usage_line_runs_as_written() {
    let text = readme();
    // `cargo install` comes before any line that calls `syz`.
    let install = text
        .find("cargo install --locked --path cli")
        .expect("README says how to install syz");
    let first_syz = text.find("\nsyz ").expect("README shows syz commands");
    assert!(install < first_syz, "install `syz` before using it");

    // The usage block: the first `sh` block under "Using it" that runs `syz` (the one before
    // it installs it).
    let mut from = text.find("## Using it").unwrap();
    let lines = loop {
        let lines = block_after(&text[from..], "```sh", "sh");
        if lines.iter().any(|l| l.starts_with("syz ")) {
            break lines;
        }
        from += text[from..].find("```sh").unwrap() + "```sh".len();
        from += text[from..].find("```").unwrap() + 3;
    };
    let commands: Vec<&String> = lines.iter().filter(|l| l.starts_with("syz ")).collect();
    assert!(
        commands.len() >= 8,
        "the usage block shrank to {}",
        commands.len()
    );
    // Run where the README's relative paths mean what they say, without writing the figures
    // into the source tree: in a copy of `examples/`.
    let dir = scratch("readme-usage");
    copy_tree(&root().join("examples"), &dir.join("examples"));
    for line in commands {
        let (args, status) = command_and_status(line);
        let o = Command::new(syz())
            .args(&args[1..])
            .current_dir(&*dir)
            .env("NO_COLOR", "1")
            .stdin(Stdio::null())
            .output()
            .unwrap();
        assert_eq!(
            o.status.code(),
            Some(status),
            "`{line}` (exit {:?}):\n{}{}",
            o.status.code(),
            stdout(&o),
            stderr(&o)
        );
        if let Some(at) = args.iter().position(|a| a == "-o") {
            let written = dir.join(&args[at + 1]);
            assert!(written.exists(), "`{line}` wrote no {}", written.display());
        }
    }
}

#[test]
fn the_commands_for_a_fresh_machine_are_there_and_run() {
    let text = readme();
    let intro = &text[..text.find("\n## ").unwrap()];
    let lines = block_after(intro, "On a fresh machine", "sh");
    assert!(
        lines
            .iter()
            .any(|l| l.starts_with("cargo test --workspace")),
        "{lines:?}"
    );
    let run_line = lines
        .iter()
        .find(|l| l.starts_with("cargo run --release -p syzygy-cli -- "))
        .expect("a `cargo run` of the main job");
    // What `cargo run` passes on to `syz`.
    let (args, status) = command_and_status(run_line);
    let passed: Vec<&str> = args
        .iter()
        .skip_while(|a| *a != "--")
        .skip(1)
        .map(String::as_str)
        .collect();
    let o = run(&passed);
    assert_eq!(o.status.code(), Some(status), "{}", stderr(&o));
    assert!(stdout(&o).contains("derived by"), "{}", stdout(&o));
    // The minimum Rust version is the workspace's.
    let manifest = std::fs::read_to_string(root().join("Cargo.toml")).unwrap();
    let version = manifest
        .lines()
        .find_map(|l| l.strip_prefix("rust-version = "))
        .unwrap()
        .trim_matches('"');
    assert!(
        intro.contains(&format!("Rust {version} or newer")),
        "README should name Rust {version}"
    );
}

#[test]
fn the_taste_of_the_language_checks_clean_and_derives() {
    let lines = block_after(&readme(), "## A taste of the language", "text");
    assert!(
        lines.len() <= 6,
        "a taste, not a meal: {} lines",
        lines.len()
    );
    let dir = scratch("readme-taste");
    let file = dir.join("tamsin.syz");
    std::fs::write(&file, lines.join("\n") + "\n").unwrap();
    let path = file.to_str().unwrap();
    let o = run(&["check", path]);
    assert_eq!(o.status.code(), Some(0), "{}{}", stdout(&o), stderr(&o));
    let o = run(&["eval", path]);
    let text = stdout(&o);
    for what in ["semi_major_axis", "inclination", "density", "insolation"] {
        assert!(
            text.lines()
                .any(|l| l.trim_start().starts_with(what) && l.contains("derived by")),
            "the README promises a derived {what}:\n{text}"
        );
    }
    for assumed in ["circular orbit", "Bond albedo = 0"] {
        assert!(text.contains(assumed), "{assumed}:\n{text}");
    }
}

/// Every demo file: the `*.syz` under `examples/` outside `examples/broken/`.
fn demo_files(dir: &Path, out: &mut Vec<PathBuf>) {
    for entry in std::fs::read_dir(dir).unwrap() {
        let path = entry.unwrap().path();
        if path.is_dir() {
            if path.file_name().unwrap() != "broken" {
                demo_files(&path, out);
            }
        } else if path.extension().is_some_and(|e| e == "syz") {
            out.push(path);
        }
    }
}

#[test]
fn every_demo_file_is_in_canonical_layout_and_clean() {
    let mut files = Vec::new();
    demo_files(&root().join("examples"), &mut files);
    assert!(files.len() >= 14, "{files:?}");
    let paths: Vec<&str> = files.iter().map(|p| p.to_str().unwrap()).collect();
    let o = run(&[&["fmt", "--check"], &paths[..]].concat());
    assert_eq!(
        o.status.code(),
        Some(0),
        "not in canonical layout (run `syz fmt --write` on them):\n{}{}",
        stdout(&o),
        stderr(&o)
    );
    let o = run(&[&["check"], &paths[..]].concat());
    assert_eq!(o.status.code(), Some(0), "{}", stdout(&o));
}
