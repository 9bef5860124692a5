//! End-to-end tests of `syzygy.toml` in the language server: the real `syz lsp` publishes
//! the diagnostics `syz check` reports under the same project file, reports a bad project
//! file, and follows a project file that changes.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use serde_json::{json, Value};
use std::path::Path;
use std::time::Duration;
use syzygy_e2e::lsp::{file_uri, position_of, LspClient, TIMEOUT};
use syzygy_e2e::{root, run, scratch, stderr};

/// `examples/broken/every-rule.syz` with a silencing comment and one system whose
/// inconsistency is about 1.7 sigma: reported under a threshold of 1.5, not under the
/// default 3.
fn every_rule() -> String {
    let src = std::fs::read_to_string(root().join("examples/broken/every-rule.syz")).unwrap();
    let star = "  star ilde { mass = 1 ± 0.05 Msun; radius = 0.01 ± 0.001 Rsun }";
    assert!(
        src.contains(star),
        "every-rule.syz changed; update this test"
    );
    let src = src.replace(
        star,
        &format!("  # allow(implausible-star): a white dwarf, on purpose\n{star}"),
    );
    format!(
        "{src}\nsystem \"Nearly Orlen\" {{\n  star orlen {{ mass = 1.0 ± 0.02 Msun }}\n  planet b orbits orlen {{ period = 365.25 ± 0.01 d; semi_major_axis = 1.02 ± 0.01 au }}\n}}\n"
    )
}

/// Switches one rule off, raises one to error, lowers one to a note, tightens the threshold.
const PROJECT: &str = "[rules]\nunstable-spacing = \"off\"\ninconsistent = \"error\"\nabove-deuterium-limit = \"note\"\n\n[derivation]\nconsistency_sigma = 1.5\n";

/// (rule, severity, range) of every diagnostic the server published, in its order.
type Found = Vec<(String, String, Value)>;

fn from_server(published: &Value) -> Found {
    published["diagnostics"]
        .as_array()
        .unwrap()
        .iter()
        .map(|d| {
            let severity = match d["severity"].as_u64() {
                Some(1) => "error",
                Some(2) => "warning",
                Some(3) => "note",
                other => panic!("unexpected severity {other:?} in {d}"),
            };
            (
                d["code"].as_str().unwrap().to_string(),
                severity.to_string(),
                d["range"].clone(),
            )
        })
        .collect()
}

/// The protocol position (0-based, UTF-16) of a 1-based line and character column.
fn position(text: &str, line: u64, column: u64) -> Value {
    let l = text.lines().nth(line as usize - 1).unwrap_or("");
    let units: usize = l
        .chars()
        .take(column as usize - 1)
        .map(char::len_utf16)
        .sum();
    json!({"line": line - 1, "character": units})
}

fn from_check(file: &Path, text: &str) -> Found {
    let o = run(&["check", "--format", "json", file.to_str().unwrap()]);
    let v: Value =
        serde_json::from_slice(&o.stdout).unwrap_or_else(|e| panic!("{e}: {}", stderr(&o)));
    v["diagnostics"]
        .as_array()
        .unwrap()
        .iter()
        .map(|d| {
            let n = |k: &str| d[k].as_u64().unwrap();
            (
                d["rule"].as_str().unwrap().to_string(),
                d["severity"].as_str().unwrap().to_string(),
                json!({"start": position(text, n("line"), n("column")),
                       "end": position(text, n("end_line"), n("end_column"))}),
            )
        })
        .collect()
}

fn rules(found: &Found) -> Vec<(&str, &str)> {
    found
        .iter()
        .map(|(r, s, _)| (r.as_str(), s.as_str()))
        .collect()
}

/// The next `publishDiagnostics` for `uri` whose diagnostics satisfy `pred` (bounded wait).
fn published_when(c: &mut LspClient, uri: &str, pred: impl Fn(&Found) -> bool) -> Found {
    let m = c
        .wait_for(TIMEOUT, |m| {
            m["method"] == "textDocument/publishDiagnostics"
                && m["params"]["uri"] == uri
                && pred(&from_server(&m["params"]))
        })
        .unwrap_or_else(|| panic!("no such diagnostics for {uri} within {TIMEOUT:?}"));
    from_server(&m["params"])
}

#[test]
fn the_editor_publishes_what_check_reports_under_the_project_file() {
    let dir = scratch("lsp-project-agree");
    let text = every_rule();
    let file = dir.join("survey").join("every.syz");
    std::fs::create_dir_all(file.parent().unwrap()).unwrap();
    std::fs::write(&file, &text).unwrap();
    std::fs::write(dir.join("syzygy.toml"), PROJECT).unwrap();

    let cli = from_check(&file, &text);
    // The project file really acts, so agreement below is not agreement on the defaults.
    let r = rules(&cli);
    assert!(!r.iter().any(|(id, _)| *id == "unstable-spacing"), "{r:?}");
    assert!(!r.iter().any(|(id, _)| *id == "implausible-star"), "{r:?}");
    assert_eq!(
        r.iter()
            .filter(|x| **x == ("inconsistent", "error"))
            .count(),
        2,
        "both inconsistencies, as errors, under 1.5 sigma: {r:?}"
    );
    assert!(r.contains(&("above-deuterium-limit", "note")), "{r:?}");
    assert!(r.contains(&("crossing-orbits", "error")), "{r:?}");

    let uri = file_uri(&file);
    let mut c = LspClient::start();
    c.initialize_in(&dir, json!({}));
    c.open(&uri, &text);
    let editor = from_server(&c.diagnostics(&uri, Some(1)));
    assert_eq!(editor, cli);

    // The editor propagates to first order, and says so where it shows numbers.
    let hover = c.result(
        "textDocument/hover",
        json!({"textDocument": {"uri": uri}, "position": position_of(&text, "orlen {", 0)}),
    );
    let h = hover["contents"]["value"].as_str().unwrap();
    assert!(
        h.contains("uncertainties: first-order propagation (the editor's choice for speed; `syz eval` uses Monte Carlo by default"),
        "{h}"
    );
    let hints = c.result(
        "textDocument/inlayHint",
        json!({"textDocument": {"uri": uri},
               "range": {"start": {"line": 0, "character": 0}, "end": {"line": 999, "character": 0}}}),
    );
    let hints = hints.as_array().unwrap();
    assert!(!hints.is_empty());
    for hint in hints {
        assert!(
            hint["tooltip"]
                .as_str()
                .unwrap()
                .contains("first-order propagation"),
            "{hint}"
        );
    }
    assert!(
        hints
            .iter()
            .any(|h| h["label"].as_str().unwrap().ends_with(" (first-order)")),
        "{hints:?}"
    );
    assert_eq!(c.shutdown_and_exit().unwrap().code(), Some(0));
}

#[test]
fn a_bad_project_file_is_a_diagnostic_in_the_editor() {
    let dir = scratch("lsp-project-bad");
    let text = std::fs::read_to_string(root().join("examples/veyra.syz")).unwrap();
    let file = dir.join("veyra.syz");
    std::fs::write(&file, &text).unwrap();
    std::fs::write(
        dir.join("syzygy.toml"),
        "[rules]\ninconsistant = \"error\"\n",
    )
    .unwrap();

    let o = run(&["check", file.to_str().unwrap()]);
    assert_eq!(o.status.code(), Some(2));
    let e = stderr(&o);
    let sentence = e
        .lines()
        .find_map(|l| l.strip_prefix("syz: error: "))
        .unwrap_or_else(|| panic!("{e}"));
    assert!(
        sentence.contains("did you mean 'inconsistent'"),
        "{sentence}"
    );

    let uri = file_uri(&file);
    let mut c = LspClient::start();
    c.initialize_in(&dir, json!({}));
    c.open(&uri, &text);
    let d = c.diagnostics(&uri, Some(1));
    let diags = d["diagnostics"].as_array().unwrap();
    assert_eq!(diags.len(), 1, "veyra.syz is clean otherwise: {d}");
    let io = &diags[0];
    assert_eq!(io["code"], "io");
    assert_eq!(io["severity"], 1);
    assert_eq!(io["range"]["start"], json!({"line": 0, "character": 0}));
    assert_eq!(
        io["range"]["end"],
        json!({"line": 0, "character": text.lines().next().unwrap().encode_utf16().count()})
    );
    let message = io["message"].as_str().unwrap();
    assert!(
        message.starts_with(&format!("{sentence}\n")),
        "the sentence `syz check` prints: {message}"
    );
    // A document with mistakes of its own shows that error alone, as `syz check` checks
    // nothing under such a project file (what the default settings find is not the project's).
    let errant = dir.join("errant.syz");
    let errant_text = every_rule();
    std::fs::write(&errant, &errant_text).unwrap();
    let errant_uri = file_uri(&errant);
    c.open(&errant_uri, &errant_text);
    let d = c.diagnostics(&errant_uri, Some(1));
    let diags = d["diagnostics"].as_array().unwrap();
    assert_eq!(diags.len(), 1, "{d}");
    assert_eq!(diags[0]["code"], "io");
    assert_eq!(c.shutdown_and_exit().unwrap().code(), Some(0));
}

#[test]
fn a_changed_project_file_changes_the_published_diagnostics() {
    let dir = scratch("lsp-project-changes");
    let text = every_rule();
    let file = dir.join("every.syz");
    std::fs::write(&file, &text).unwrap();
    let toml = dir.join("syzygy.toml");
    let toml_uri = file_uri(&toml);
    let uri = file_uri(&file);

    let mut c = LspClient::start();
    c.initialize_in(
        &dir,
        json!({"workspace": {"didChangeWatchedFiles": {"dynamicRegistration": true}}}),
    );
    // The server asks to hear about project files.
    let reg = c
        .wait_for(TIMEOUT, |m| m["method"] == "client/registerCapability")
        .expect("a registration for watched files");
    let r = &reg["params"]["registrations"][0];
    assert_eq!(r["method"], "workspace/didChangeWatchedFiles");
    assert_eq!(
        r["registerOptions"]["watchers"][0]["globPattern"],
        "**/syzygy.toml"
    );
    c.respond(&reg, Value::Null);

    c.open(&uri, &text);
    let defaults = from_server(&c.diagnostics(&uri, Some(1)));
    assert!(rules(&defaults).contains(&("unstable-spacing", "warning")));
    // The demo's 22-sigma inconsistency is past the default error threshold of 5 sigma.
    assert!(rules(&defaults).contains(&("inconsistent", "error")));

    // Created on disk, announced by the client: the document is analysed again.
    std::fs::write(&toml, PROJECT).unwrap();
    c.notify(
        "workspace/didChangeWatchedFiles",
        json!({"changes": [{"uri": toml_uri, "type": 1}]}),
    );
    let under = published_when(&mut c, &uri, |f| {
        !rules(f).contains(&("unstable-spacing", "warning"))
    });
    assert_eq!(under, from_check(&file, &text));

    // Changed on disk with no word from the client: noticed at the next edit.
    std::fs::write(&toml, "[rules]\ncrossing-orbits = \"off\"\n").unwrap();
    let edited = format!("{text}# one more line\n");
    c.notify(
        "textDocument/didChange",
        json!({"textDocument": {"uri": uri, "version": 2},
               "contentChanges": [{"text": edited}]}),
    );
    let after = from_server(&c.diagnostics(&uri, Some(2)));
    assert!(
        !rules(&after).iter().any(|(id, _)| *id == "crossing-orbits"),
        "{after:?}"
    );
    assert!(
        rules(&after).contains(&("unstable-spacing", "warning")),
        "{after:?}"
    );
    std::fs::write(&file, &edited).unwrap();
    assert_eq!(after, from_check(&file, &edited));

    // Opened and edited in the editor: the buffer applies until it is closed.
    c.open(&toml_uri, "[rules]\ncrossing-orbits = \"off\"\n");
    c.notify(
        "textDocument/didChange",
        json!({"textDocument": {"uri": toml_uri, "version": 2},
               "contentChanges": [{"range": {"start": {"line": 2, "character": 0}, "end": {"line": 2, "character": 0}},
                                   "text": "inside-roche-limit = \"error\"\n"}]}),
    );
    let buffer = published_when(&mut c, &uri, |f| {
        rules(f).contains(&("inside-roche-limit", "error"))
    });
    assert!(!rules(&buffer)
        .iter()
        .any(|(id, _)| *id == "crossing-orbits"));
    // Whatever was published before the last change is stale now.
    c.drain(Duration::from_millis(200));
    c.notify(
        "textDocument/didClose",
        json!({"textDocument": {"uri": toml_uri}}),
    );
    published_when(&mut c, &uri, |f| {
        rules(f).contains(&("inside-roche-limit", "warning"))
    });
    c.drain(Duration::from_millis(200));

    // Deleted: the defaults again.
    std::fs::remove_file(&toml).unwrap();
    c.notify(
        "workspace/didChangeWatchedFiles",
        json!({"changes": [{"uri": toml_uri, "type": 3}]}),
    );
    published_when(&mut c, &uri, |f| {
        rules(f).contains(&("crossing-orbits", "error"))
    });
    assert_eq!(c.shutdown_and_exit().unwrap().code(), Some(0));
}

/// A shared reference file the project file names changed on disk, announced by the
/// client: the open document that cites it is analysed again, and agrees with `syz check`
/// (a citation of a reference added there no longer errs). A shared file that is missing is
/// said in the words `syz check` uses.
#[test]
fn a_changed_shared_reference_file_changes_the_published_diagnostics() {
    let dir = scratch("lsp-shared-refs");
    let refs = dir.join("refs.syz");
    std::fs::write(&refs, "ref sv \"Invented shared survey\"\n").unwrap();
    std::fs::write(
        dir.join("syzygy.toml"),
        "[references]\nfiles = [\"refs.syz\"]\n",
    )
    .unwrap();
    let text = "system \"Harlowe\" {\n  star harlowe { teff = 5650 ± 80 K [sv3] }\n}\n";
    let file = dir.join("harlowe.syz");
    std::fs::write(&file, text).unwrap();
    let uri = file_uri(&file);

    let mut c = LspClient::start();
    c.initialize_in(
        &dir,
        json!({"workspace": {"didChangeWatchedFiles": {"dynamicRegistration": true}}}),
    );
    if let Some(reg) = c.wait_for(TIMEOUT, |m| m["method"] == "client/registerCapability") {
        c.respond(&reg, Value::Null);
    }
    c.open(&uri, text);
    let before = from_server(&c.diagnostics(&uri, Some(1)));
    assert!(
        rules(&before).contains(&("unknown-ref", "error")),
        "{before:?}"
    );

    std::fs::write(
        &refs,
        "ref sv \"Invented shared survey\"\nref sv3 \"Invented third survey\"\n",
    )
    .unwrap();
    c.notify(
        "workspace/didChangeWatchedFiles",
        json!({"changes": [{"uri": file_uri(&refs), "type": 2}]}),
    );
    let after = published_when(&mut c, &uri, |f| {
        !rules(f).contains(&("unknown-ref", "error"))
    });
    assert_eq!(after, from_check(&file, text));

    // Gone: the project file's error names it as `syz check` does.
    std::fs::remove_file(&refs).unwrap();
    c.notify(
        "workspace/didChangeWatchedFiles",
        json!({"changes": [{"uri": file_uri(&refs), "type": 3}]}),
    );
    let said = |m: &Value| {
        m["method"] == "textDocument/publishDiagnostics"
            && m["params"]["uri"] == uri.as_str()
            && m.to_string().contains("refs.syz: no such file or folder")
    };
    assert!(
        c.wait_for(TIMEOUT, said).is_some(),
        "the editor says the shared file is missing as check does"
    );
    let o = run(&["check", file.to_str().unwrap()]);
    let words = format!("{}{}", stderr(&o), syzygy_e2e::stdout(&o));
    assert!(
        words.contains("refs.syz: no such file or folder"),
        "{words}"
    );
    c.shutdown_and_exit();
}
