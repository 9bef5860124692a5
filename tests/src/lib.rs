//! Helpers for end-to-end tests: build the real `syz` binary once and run it.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use std::path::{Path, PathBuf};
use std::process::{Command, Output, Stdio};
use std::sync::OnceLock;

/// The workspace root.
pub fn root() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .parent()
        .unwrap()
        .to_path_buf()
}

/// Path to a freshly built `syz` (built once per test process, in the same profile).
pub fn syz() -> &'static Path {
    static BIN: OnceLock<PathBuf> = OnceLock::new();
    BIN.get_or_init(|| {
        let cargo = std::env::var("CARGO").unwrap_or_else(|_| "cargo".into());
        // The binary is built in the profile of the tests themselves, so a benchmark run
        // with `cargo test --release` measures a release binary.
        let release = !cfg!(debug_assertions);
        let mut args = vec!["build", "--quiet", "-p", "syzygy-cli", "--bin", "syz"];
        if release {
            args.push("--release");
        }
        let status = Command::new(cargo)
            .args(&args)
            .current_dir(root())
            .status()
            .expect("cargo could not be started");
        assert!(status.success(), "building syz failed");
        let target = std::env::var_os("CARGO_TARGET_DIR")
            .map(PathBuf::from)
            .unwrap_or_else(|| root().join("target"));
        target
            .join(if release { "release" } else { "debug" })
            .join("syz")
    })
}

/// Run `syz` with arguments from the workspace root, with colour off.
pub fn run(args: &[&str]) -> Output {
    Command::new(syz())
        .args(args)
        .current_dir(root())
        .env("NO_COLOR", "1")
        .stdin(Stdio::null())
        .output()
        .expect("syz could not be started")
}

/// Start `syz` like [`run`], with standard output and error piped to the test.
pub fn start(args: &[&str]) -> std::process::Child {
    Command::new(syz())
        .args(args)
        .current_dir(root())
        .env("NO_COLOR", "1")
        .stdin(Stdio::null())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .expect("syz could not be started")
}

/// Run `syz` like [`run`], but fail the test (after killing it) if it has not ended within
/// `limit`: for inputs that once made it wait for ever.
pub fn run_bounded(args: &[&str], limit: std::time::Duration) -> Output {
    let mut child = start(args);
    let drain = |r: Option<Box<dyn std::io::Read + Send>>| {
        std::thread::spawn(move || {
            let mut buf = Vec::new();
            if let Some(mut r) = r {
                let _ = r.read_to_end(&mut buf);
            }
            buf
        })
    };
    let out = drain(child.stdout.take().map(|s| Box::new(s) as _));
    let err = drain(child.stderr.take().map(|s| Box::new(s) as _));
    let deadline = std::time::Instant::now() + limit;
    let status = loop {
        if let Some(status) = child.try_wait().unwrap() {
            break status;
        }
        if std::time::Instant::now() > deadline {
            let _ = child.kill();
            let _ = child.wait();
            panic!("syz {args:?} did not end within {limit:?}");
        }
        std::thread::sleep(std::time::Duration::from_millis(20));
    };
    Output {
        status,
        stdout: out.join().unwrap(),
        stderr: err.join().unwrap(),
    }
}

pub fn stdout(o: &Output) -> String {
    String::from_utf8_lossy(&o.stdout).into_owned()
}

pub fn stderr(o: &Output) -> String {
    String::from_utf8_lossy(&o.stderr).into_owned()
}

/// The (rule, severity) of every diagnostic of a `syz check --format json` document.
pub fn rules_of(v: &serde_json::Value) -> Vec<(String, String)> {
    v["diagnostics"]
        .as_array()
        .unwrap()
        .iter()
        .map(|d| {
            (
                d["rule"].as_str().unwrap().to_string(),
                d["severity"].as_str().unwrap().to_string(),
            )
        })
        .collect()
}

/// A scratch folder for one test, emptied first and removed when the test is done (it
/// derefs to its path). Numbered as well as named: the tests of every module run in one
/// process, in parallel, so two tests that chose one name still get two folders.
pub fn scratch(name: &str) -> Scratch {
    static NEXT: std::sync::atomic::AtomicUsize = std::sync::atomic::AtomicUsize::new(0);
    let n = NEXT.fetch_add(1, std::sync::atomic::Ordering::Relaxed);
    let dir = std::env::temp_dir().join(format!("syzygy-e2e-{}-{n}-{name}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap();
    Scratch(dir)
}

/// A folder removed with everything in it when dropped.
#[derive(Debug)]
pub struct Scratch(PathBuf);

impl std::ops::Deref for Scratch {
    type Target = PathBuf;
    fn deref(&self) -> &PathBuf {
        &self.0
    }
}

impl AsRef<std::path::Path> for Scratch {
    fn as_ref(&self) -> &std::path::Path {
        &self.0
    }
}

impl Drop for Scratch {
    fn drop(&mut self) {
        let _ = std::fs::remove_dir_all(&self.0);
    }
}

/// The byte offset of the `nth` (from 0) occurrence of `needle` in `text`, so that tests
/// name places by what stands there rather than by counted columns. A `|` in the needle marks
/// the place inside it (`"kestrine.|radius"` is where `radius` starts) and is not searched for.
pub fn offset_of(text: &str, needle: &str, nth: usize) -> usize {
    let (before, after) = needle.split_once('|').unwrap_or(("", needle));
    let whole = format!("{before}{after}");
    let (start, _) = text
        .match_indices(&whole)
        .nth(nth)
        .unwrap_or_else(|| panic!("'{whole}' occurs fewer than {} times", nth + 1));
    start + before.len()
}

pub mod lsp;
