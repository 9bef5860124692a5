//! End-to-end tests of the checks between files in the language server: with a catalogue
//! folder open as the workspace folder, the real `syz lsp` publishes on closed files the
//! findings `syz check DIR` reports, follows an open document as it is edited, and resolves
//! the project's shared references.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use serde_json::{json, Value};
use std::path::Path;
use syzygy_e2e::lsp::{file_uri, position_of, LspClient, TIMEOUT};
use syzygy_e2e::{run, scratch, stderr};

const A: &str = "ref rv \"Demo velocities of the north (invented)\"\nsystem \"Quarrel\" {\n  star quarrel { mass = 1.00 ± 0.02 Msun [survey] }\n}\n";
const B: &str = "ref vel \"Demo velocities of the North (invented)\"\n\nsystem \"Quarrel\" {\n  star quarrel { mass = 1.30 ± 0.02 Msun [vel] }\n}\n";

/// A catalogue: a project file naming a shared references file, and two files that declare
/// the same system, disagree on its star and cite one paper under two ids.
fn catalogue(name: &str) -> syzygy_e2e::Scratch {
    let dir = scratch(name);
    let write = |f: &str, t: &str| std::fs::write(dir.join(f), t).unwrap();
    write(
        "syzygy.toml",
        "[references]\nfiles = [\"references.syz\"]\n",
    );
    write(
        "references.syz",
        "ref survey \"Demo spectroscopic survey (invented data)\"\n",
    );
    write("a.syz", A);
    write("b.syz", B);
    dir
}

const ACROSS: &[&str] = &[
    "system-in-two-files",
    "star-disagrees-across-files",
    "paper-under-two-ids",
];

/// (file URI, rule, start position) of the findings between files `syz check` reports.
fn from_check(dir: &Path) -> Vec<(String, String, Value)> {
    let o = run(&["check", "--format", "json", dir.to_str().unwrap()]);
    let v: Value =
        serde_json::from_slice(&o.stdout).unwrap_or_else(|e| panic!("{e}: {}", stderr(&o)));
    let mut out: Vec<(String, String, Value)> = v["diagnostics"]
        .as_array()
        .unwrap()
        .iter()
        .filter(|d| ACROSS.contains(&d["rule"].as_str().unwrap()))
        .map(|d| {
            // ASCII text: columns in characters are UTF-16 columns.
            let at = json!({"line": d["line"].as_u64().unwrap() - 1,
                            "character": d["column"].as_u64().unwrap() - 1});
            (
                file_uri(Path::new(d["file"].as_str().unwrap())),
                d["rule"].as_str().unwrap().to_string(),
                at,
            )
        })
        .collect();
    out.sort_by_key(|x| x.1.clone());
    out
}

fn findings(published: &Value) -> Vec<(String, String, Value)> {
    let mut out: Vec<(String, String, Value)> = published["diagnostics"]
        .as_array()
        .unwrap()
        .iter()
        .filter(|d| ACROSS.contains(&d["code"].as_str().unwrap()))
        .map(|d| {
            (
                published["uri"].as_str().unwrap().to_string(),
                d["code"].as_str().unwrap().to_string(),
                d["range"]["start"].clone(),
            )
        })
        .collect();
    out.sort_by_key(|x| x.1.clone());
    out
}

/// The next publication for `uri` with `n` findings between files (bounded wait).
fn published_with(c: &mut LspClient, uri: &str, n: usize) -> Value {
    c.wait_for(TIMEOUT, |m| {
        m["method"] == "textDocument/publishDiagnostics"
            && m["params"]["uri"] == uri
            && findings(&m["params"]).len() == n
    })
    .unwrap_or_else(|| panic!("no publication for {uri} with {n} findings within {TIMEOUT:?}"))
        ["params"]
        .clone()
}

/// The next publication for `b` has the two findings left once its star agrees with a's
/// (no `star-disagrees-across-files`); then the server exits cleanly.
fn stars_agree_then_exit(mut c: LspClient, b: &str) {
    let after = published_with(&mut c, b, 2);
    assert!(
        !findings(&after)
            .iter()
            .any(|f| f.1 == "star-disagrees-across-files"),
        "{after}"
    );
    assert_eq!(c.shutdown_and_exit().unwrap().code(), Some(0));
}

#[test]
fn the_editor_publishes_the_findings_of_check_on_the_folders_files() {
    let dir = catalogue("lsp-catalogue-agree");
    let cli = from_check(&dir);
    assert_eq!(cli.len(), 3, "the folder shows all three: {cli:?}");
    let b = file_uri(&dir.join("b.syz"));
    assert!(cli.iter().all(|(f, ..)| *f == b), "{cli:?}");

    let mut c = LspClient::start();
    c.initialize_in(&dir, json!({}));
    // Nothing is open: the closed file gets the findings.
    let published = published_with(&mut c, &b, 3);
    assert_eq!(findings(&published), cli);
    let system = published["diagnostics"]
        .as_array()
        .unwrap()
        .iter()
        .find(|d| d["code"] == "system-in-two-files")
        .unwrap();
    assert_eq!(system["severity"], 2);
    let related = &system["relatedInformation"][0]["location"];
    assert_eq!(related["uri"], file_uri(&dir.join("a.syz")));
    assert_eq!(related["range"]["start"], position_of(A, "\"Quarrel\"", 0));
    assert!(
        system["message"]
            .as_str()
            .unwrap()
            .contains("also declared in a.syz:2"),
        "{system}"
    );

    // An open document: the shared reference resolves (no unknown-ref), and hover shows it.
    let a = file_uri(&dir.join("a.syz"));
    c.open(&a, A);
    let own = c.diagnostics(&a, Some(1));
    assert_eq!(own["diagnostics"], json!([]), "{own}");
    let hover = c.result(
        "textDocument/hover",
        json!({"textDocument": {"uri": a}, "position": position_of(A, "survey", 0)}),
    );
    let h = hover["contents"]["value"].as_str().unwrap();
    assert!(
        h.contains("Demo spectroscopic survey (invented data)"),
        "{h}"
    );
    assert!(h.contains("shared, declared in"), "{h}");

    // Typing in the open document moves the findings: a star that now agrees is no longer
    // reported on the closed file.
    let agreeing = A.replace("1.00 ± 0.02", "1.29 ± 0.02");
    c.notify(
        "textDocument/didChange",
        json!({"textDocument": {"uri": a, "version": 2}, "contentChanges": [{"text": agreeing}]}),
    );
    stars_agree_then_exit(c, &b);
}

/// A client that cannot watch files never says a closed file changed on disk: at a save, the
/// server compares the closed files again as they now are.
#[test]
fn without_file_watching_a_save_rereads_closed_files_changed_on_disk() {
    let dir = catalogue("lsp-catalogue-save");
    let b = file_uri(&dir.join("b.syz"));
    let a = file_uri(&dir.join("a.syz"));
    let mut c = LspClient::start();
    // No `workspace.didChangeWatchedFiles` capability.
    c.initialize_in(&dir, json!({}));
    published_with(&mut c, &b, 3);
    c.open(&a, A);
    // Another tool makes b agree on the star (a shorter text, so its length changes too).
    std::fs::write(dir.join("b.syz"), B.replace("1.30 ± 0.02", "1.0 ± 0.02")).unwrap();
    c.notify("textDocument/didSave", json!({"textDocument": {"uri": a}}));
    stars_agree_then_exit(c, &b);
}
