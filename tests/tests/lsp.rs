//! End-to-end tests of `syz lsp`: the real binary over stdio, positions found by needle.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use serde_json::{json, Value};
use std::time::Duration;
use syzygy_e2e::lsp::{apply_edits, file_uri, position_in, position_of, range_of, LspClient};
use syzygy_e2e::{root, run, scratch, stdout};

fn veyra() -> (String, String) {
    let path = root().join("examples/veyra.syz");
    (file_uri(&path), std::fs::read_to_string(path).unwrap())
}

fn doc(uri: &str, pos: Value) -> Value {
    json!({"textDocument": {"uri": uri}, "position": pos})
}

fn hover_text(c: &mut LspClient, uri: &str, pos: Value) -> String {
    let r = c.result("textDocument/hover", doc(uri, pos));
    r["contents"]["value"].as_str().unwrap_or("").to_string()
}

fn labels(items: &Value) -> Vec<String> {
    items
        .as_array()
        .unwrap()
        .iter()
        .map(|i| i["label"].as_str().unwrap().to_string())
        .collect()
}

#[test]
fn a_whole_editing_session_on_the_demo_file() {
    let (uri, text) = veyra();
    let mut c = LspClient::start();
    let init = c.initialize(json!({}));
    let caps = &init["capabilities"];
    assert_eq!(
        caps["positionEncoding"], "utf-16",
        "UTF-16 unless the client offers UTF-8"
    );
    assert_eq!(caps["textDocumentSync"]["change"], 2, "incremental sync");
    for cap in [
        "hoverProvider",
        "inlayHintProvider",
        "completionProvider",
        "definitionProvider",
        "referencesProvider",
        "renameProvider",
        "documentSymbolProvider",
        "semanticTokensProvider",
        "foldingRangeProvider",
        "documentFormattingProvider",
        "codeActionProvider",
    ] {
        assert!(!caps[cap].is_null(), "missing {cap}");
    }

    c.open(&uri, &text);
    let d = c.diagnostics(&uri, Some(1));
    assert_eq!(d["diagnostics"], json!([]), "the demo file is clean");

    // Inlay hints: derived values after the planet's and the star's opening brace.
    let hints = c.result(
        "textDocument/inlayHint",
        json!({"textDocument": {"uri": uri},
               "range": {"start": {"line": 0, "character": 0}, "end": {"line": 99, "character": 0}}}),
    );
    let hints = hints.as_array().unwrap();
    let after_b = position_in(&text, "planet b orbits veyra {", 0, 23, false);
    let hb = hints
        .iter()
        .find(|h| h["position"] == after_b)
        .expect("hint for b");
    let label = hb["label"].as_str().unwrap();
    assert!(
        label.contains("a = 0.04") && label.contains(" au"),
        "{label}"
    );
    assert!(
        label.contains("ρ = ") && label.contains("g/cm^3"),
        "{label}"
    );
    assert!(label.contains("Teq = ") && label.contains(" K"), "{label}");
    assert!(
        hints
            .iter()
            .any(|h| h["label"].as_str().unwrap().contains("log g = ")),
        "a star hint"
    );

    // Hover: a quantity, a body, a unit.
    let h = hover_text(&mut c, &uri, position_of(&text, "period", 0));
    assert!(
        h.contains("Orbital period") && h.contains("a time (s)"),
        "{h}"
    );
    assert!(h.contains("Demo photometry"), "{h}");
    let h = hover_text(&mut c, &uri, position_of(&text, "b orbits", 0));
    assert!(
        h.contains("| density |") && h.contains("| derived |"),
        "{h}"
    );
    let h = hover_text(&mut c, &uri, position_of(&text, "Msun", 0));
    assert!(
        h.contains("nominal solar mass") && h.contains("IAU 2015"),
        "{h}"
    );

    // Completion: quantities at the start of a property, units after a number.
    let items = c.result(
        "textDocument/completion",
        doc(&uri, position_of(&text, "rv_amplitude = 4.1", 0)),
    );
    let l = labels(&items);
    assert!(
        l.contains(&"mass".to_string()) && !l.contains(&"teff".to_string()),
        "{l:?}"
    );
    // The unit of c's amplitude, however the value is aligned.
    let c_rv = text.find("4.1 ± 0.6").unwrap();
    let c_rv = &text[c_rv..c_rv + text[c_rv..].find("m/s").unwrap() + "m/s".len()];
    let items = c.result(
        "textDocument/completion",
        doc(
            &uri,
            position_in(&text, c_rv, 0, c_rv.chars().count() - 3, false),
        ),
    );
    let l = labels(&items);
    assert!(
        l.contains(&"km/s".to_string()) && !l.contains(&"au".to_string()),
        "{l:?}"
    );

    // Definition and references.
    let def = c.result(
        "textDocument/definition",
        doc(&uri, position_of(&text, "veyra {", 1)),
    );
    assert_eq!(
        def["range"],
        range_of(&text, "veyra", 0),
        "the star's declaration"
    );
    let refs = c.result(
        "textDocument/references",
        json!({"textDocument": {"uri": uri}, "position": position_of(&text, "rv1", 2),
               "context": {"includeDeclaration": true}}),
    );
    assert_eq!(refs.as_array().unwrap().len(), 5, "{refs}");

    // Formatting agrees with `syz fmt`.
    let edits = c.result(
        "textDocument/formatting",
        json!({"textDocument": {"uri": uri}, "options": {"tabSize": 2, "insertSpaces": true}}),
    );
    let formatted = apply_edits(&text, edits.as_array().unwrap());
    let cli = run(&["fmt", "examples/veyra.syz"]);
    assert_eq!(formatted, stdout(&cli));
    assert_eq!(
        formatted, text,
        "the demo file is in canonical layout (tests/tests/readme.rs)"
    );

    // A unit error typed in is reported with rule, source and position: b's amplitude
    // (from its value to its unit, however aligned) loses its `/s`.
    let b_rv = text.find("56 ± 2").unwrap();
    let b_rv = &text[b_rv..b_rv + text[b_rv..].find("m/s").unwrap() + "m/s".len()];
    let b_rv_wrong = b_rv.replace("m/s", "m");
    c.notify(
        "textDocument/didChange",
        json!({"textDocument": {"uri": uri, "version": 2},
               "contentChanges": [{"range": range_of(&text, b_rv, 0), "text": b_rv_wrong}]}),
    );
    let d = c.diagnostics(&uri, Some(2));
    let diags = d["diagnostics"].as_array().unwrap();
    assert_eq!(diags.len(), 1, "{d}");
    let diag = &diags[0];
    assert_eq!(diag["code"], "unit-mismatch");
    assert_eq!(diag["source"], "syzygy");
    assert_eq!(diag["severity"], 1);
    assert_eq!(diag["range"]["start"], position_of(&text, b_rv, 0));
    assert!(
        diag["message"].as_str().unwrap().contains("help: "),
        "{diag}"
    );
    let new_text = text.replace(b_rv, &b_rv_wrong);

    // Code actions on it: a silencing comment, which really silences it.
    let actions = c.result(
        "textDocument/codeAction",
        json!({"textDocument": {"uri": uri}, "range": diag["range"], "context": {"diagnostics": [diag]}}),
    );
    let silence = actions
        .as_array()
        .unwrap()
        .iter()
        .find(|a| a["title"] == "Silence 'unit-mismatch' on this line")
        .expect("silencing action");
    let edits = silence["edit"]["changes"][&uri].as_array().unwrap().clone();
    let silenced = apply_edits(&new_text, &edits);
    assert!(
        silenced.contains("# allow(unit-mismatch): reason"),
        "{silenced}"
    );
    c.notify(
        "textDocument/didChange",
        json!({"textDocument": {"uri": uri, "version": 3}, "contentChanges": [{"text": silenced}]}),
    );
    let d = c.diagnostics(&uri, Some(3));
    assert_eq!(d["diagnostics"], json!([]), "{d}");

    // A did-you-mean fix from a diagnostic's help.
    let typo = text.replace("0.88 +0.03/-0.02 Rsun", "0.88 +0.03/-0.02 Rsum");
    c.notify(
        "textDocument/didChange",
        json!({"textDocument": {"uri": uri, "version": 4}, "contentChanges": [{"text": typo}]}),
    );
    let d = c.diagnostics(&uri, Some(4));
    assert_eq!(d["diagnostics"][0]["code"], "unknown-unit", "{d}");
    let actions = c.result(
        "textDocument/codeAction",
        json!({"textDocument": {"uri": uri}, "range": range_of(&typo, "Rsum", 0), "context": {"diagnostics": []}}),
    );
    let fix = actions
        .as_array()
        .unwrap()
        .iter()
        .find(|a| a["title"] == "Replace with 'Rsun'")
        .expect("did-you-mean action");
    assert_eq!(fix["kind"], "quickfix");
    assert_eq!(fix["isPreferred"], true);
    let fixed = apply_edits(&typo, fix["edit"]["changes"][&uri].as_array().unwrap());
    assert_eq!(fixed, text);

    let status = c
        .shutdown_and_exit()
        .expect("the server exits after `exit`");
    assert_eq!(status.code(), Some(0));
}

#[test]
fn navigation_rename_symbols_tokens_and_folding() {
    let (uri, text) = veyra();
    let mut c = LspClient::start();
    c.initialize(json!({}));
    c.open(&uri, &text);
    c.diagnostics(&uri, Some(1));

    let prep = c.result(
        "textDocument/prepareRename",
        doc(&uri, position_of(&text, "veyra {", 0)),
    );
    assert_eq!(prep, range_of(&text, "veyra", 0));
    let r = c.request(
        "textDocument/rename",
        json!({"textDocument": {"uri": uri}, "position": position_of(&text, "veyra {", 0), "newName": "hollin"}),
    );
    let edits = r["result"]["changes"][&uri].as_array().unwrap().clone();
    assert_eq!(edits.len(), 3, "the star and two 'orbits'");
    let renamed = apply_edits(&text, &edits);
    assert!(renamed.contains("star hollin {") && renamed.contains("planet c orbits hollin"));
    let bad = c.request(
        "textDocument/rename",
        json!({"textDocument": {"uri": uri}, "position": position_of(&text, "veyra {", 0), "newName": "2bad"}),
    );
    assert!(bad.get("error").is_some(), "{bad}");
    let q = c.request(
        "textDocument/rename",
        json!({"textDocument": {"uri": uri}, "position": position_of(&text, "period", 0), "newName": "p"}),
    );
    assert!(q.get("error").is_some(), "quantity names are fixed: {q}");

    let syms = c.result(
        "textDocument/documentSymbol",
        json!({"textDocument": {"uri": uri}}),
    );
    let sys = syms
        .as_array()
        .unwrap()
        .iter()
        .find(|s| s["name"] == "Veyra")
        .unwrap();
    let bodies: Vec<&str> = sys["children"]
        .as_array()
        .unwrap()
        .iter()
        .map(|b| b["name"].as_str().unwrap())
        .collect();
    assert_eq!(bodies, ["veyra", "b", "c"]);
    assert_eq!(sys["children"][1]["children"][0]["name"], "period");

    let toks = c.result(
        "textDocument/semanticTokens/full",
        json!({"textDocument": {"uri": uri}}),
    );
    let data = toks["data"].as_array().unwrap();
    assert_eq!(data.len() % 5, 0);
    // The first token is the comment on line 0 (type 1 in the legend).
    assert_eq!(
        &data[..5],
        &[
            json!(0),
            json!(0),
            json!(text.lines().next().unwrap().chars().count()),
            json!(1),
            json!(0)
        ]
    );

    let folds = c.result(
        "textDocument/foldingRange",
        json!({"textDocument": {"uri": uri}}),
    );
    let starts: Vec<u64> = folds
        .as_array()
        .unwrap()
        .iter()
        .map(|f| f["startLine"].as_u64().unwrap())
        .collect();
    assert!(starts.contains(&(position_of(&text, "system", 0)["line"].as_u64().unwrap())));
    assert!(starts.contains(&(position_of(&text, "planet b", 0)["line"].as_u64().unwrap())));

    // A declared value can become another unit; a derived one can be declared.
    let actions = c.result(
        "textDocument/codeAction",
        json!({"textDocument": {"uri": uri}, "range": range_of(&text, "41.2", 0), "context": {"diagnostics": []}}),
    );
    let titles: Vec<&str> = actions
        .as_array()
        .unwrap()
        .iter()
        .map(|a| a["title"].as_str().unwrap())
        .collect();
    assert!(
        titles.iter().any(|t| t.starts_with("Convert to ly")),
        "{titles:?}"
    );
    let actions = c.result(
        "textDocument/codeAction",
        json!({"textDocument": {"uri": uri}, "range": range_of(&text, "impact", 0), "context": {"diagnostics": []}}),
    );
    let declare = actions
        .as_array()
        .unwrap()
        .iter()
        .find(|a| {
            a["title"]
                .as_str()
                .unwrap()
                .starts_with("Declare b.density = ")
        })
        .expect("declare a derived value");
    let out = apply_edits(&text, declare["edit"]["changes"][&uri].as_array().unwrap());
    assert!(out.contains("    density = 0."), "{out}");
    assert_eq!(c.shutdown_and_exit().unwrap().code(), Some(0));
}

const ASTRAL: &str = "# 𝑀 and 𝑅 are written here only to move columns\nsystem \"Cassiel\" {\n  star k { mass = 1.02 ± 0.03 M☉; radius = 0.97 ± 0.02 R☉; teff = 5700 ± 90 K } # 𝑀𝑀\n  planet d orbits k { period = 9.1 ± 0.1 d; rv_amplitude = 3.0 ± 0.4 m/s }\n}\n";

#[test]
fn utf8_positions_when_offered_utf16_otherwise() {
    let uri = "file:///tmp/cassiel.syz";
    for (caps, utf8) in [
        (
            json!({"general": {"positionEncodings": ["utf-8", "utf-16"]}}),
            true,
        ),
        // Neovim 0.7 offers no list at all.
        (json!({}), false),
    ] {
        let mut c = LspClient::start();
        let init = c.initialize(caps);
        assert_eq!(
            init["capabilities"]["positionEncoding"],
            if utf8 { "utf-8" } else { "utf-16" }
        );
        c.open(uri, ASTRAL);
        c.diagnostics(uri, Some(1));
        let pos = position_in(ASTRAL, "R☉", 0, 0, utf8);
        let r = c.result("textDocument/hover", doc(uri, pos.clone()));
        let h = r["contents"]["value"].as_str().unwrap();
        assert!(h.contains("nominal solar radius"), "{h}");
        assert_eq!(r["range"]["start"], pos);
        assert_eq!(r["range"]["end"], position_in(ASTRAL, "R☉", 0, 2, utf8));
        // A typed error after astral characters lands at the right column.
        let at = position_in(ASTRAL, "5700", 0, 0, utf8);
        let end = position_in(ASTRAL, "5700 ± 90 K", 0, 11, utf8);
        c.notify(
            "textDocument/didChange",
            json!({"textDocument": {"uri": uri, "version": 2},
                   "contentChanges": [{"range": {"start": at, "end": end}, "text": "5700 ± 90 m"}]}),
        );
        let d = c.diagnostics(uri, Some(2));
        assert_eq!(d["diagnostics"][0]["code"], "unit-mismatch", "{d}");
        assert_eq!(d["diagnostics"][0]["range"]["start"], at);
        assert_eq!(c.shutdown_and_exit().unwrap().code(), Some(0));
    }
}

#[test]
fn malformed_input_and_odd_requests_never_stop_the_server() {
    let (uri, text) = veyra();
    let mut c = LspClient::start();
    c.initialize(json!({}));
    c.open(&uri, &text);
    c.diagnostics(&uri, Some(1));
    // Not JSON, not JSON-RPC, a batch, invalid UTF-8.
    c.send_raw(b"Content-Length: 9\r\n\r\n{not json");
    c.send_raw(b"Content-Length: 4\r\n\r\n\xff\xfe\x00\x81");
    c.send(&json!([1, 2, 3]));
    c.send(&json!({"jsonrpc": "2.0", "id": 900, "method": 17}));
    let bad = c.response(900);
    assert!(bad.get("error").is_some(), "{bad}");
    // Unknown documents, positions far past the end, missing params.
    let r = c.request(
        "textDocument/hover",
        doc("file:///nowhere.syz", json!({"line": 0, "character": 0})),
    );
    assert!(r.get("error").is_some(), "{r}");
    let r = c.request(
        "textDocument/hover",
        doc(&uri, json!({"line": 99999, "character": 99999})),
    );
    assert!(r.get("error").is_none() && r["result"].is_null(), "{r}");
    let r = c.request(
        "textDocument/completion",
        doc(&uri, json!({"line": 5, "character": 4000})),
    );
    assert!(r.get("error").is_none(), "{r}");
    let r = c.request("textDocument/hover", json!({}));
    assert!(r.get("error").is_some(), "{r}");
    let r = c.request("no/such/method", json!({}));
    assert_eq!(r["error"]["code"], -32601, "{r}");
    // Still answering.
    let h = hover_text(&mut c, &uri, position_of(&text, "teff", 0));
    assert!(h.contains("Effective temperature"), "{h}");
    // Eglot sends `"params": null` with shutdown.
    c.send(&json!({"jsonrpc": "2.0", "id": 901, "method": "shutdown", "params": null}));
    let r = c.response(901);
    assert!(r.get("error").is_none(), "{r}");
    c.notify("exit", Value::Null);
    let status = c
        .wait_exit(Duration::from_secs(10))
        .expect("exit ends the process");
    assert_eq!(status.code(), Some(0));
}

#[test]
fn a_file_with_hundreds_of_errors_publishes_the_first_200_and_a_count() {
    let uri = "file:///tmp/errant.syz";
    let mut text = String::from("system \"Errant\" {\n  star e {\n");
    for i in 0..600 {
        text.push_str(&format!("    = {i} Msun\n"));
    }
    text.push_str("  }\n}\n");
    let mut c = LspClient::start();
    c.initialize(json!({}));
    c.open(uri, &text);
    let d = c.diagnostics(uri, Some(1));
    let list = d["diagnostics"].as_array().unwrap();
    assert_eq!(list.len(), 201);
    let last = &list[200];
    assert_eq!(last["severity"], 3, "{last}");
    assert!(
        last["message"]
            .as_str()
            .unwrap()
            .starts_with("400 more diagnostics in this file not shown"),
        "{last}"
    );
    // It sits where the first diagnostic left out is.
    assert_eq!(last["range"]["start"]["line"], 202, "{last}");
}

/// An error after more notes than are shown is published all the same (200 notes early in a
/// file once hid the only error, in the editor as on the command line).
#[test]
fn notes_before_it_do_not_hide_an_error() {
    let uri = "file:///tmp/noted.syz";
    let text = notes_then_an_error(205);
    let mut c = LspClient::start();
    c.initialize(json!({}));
    c.open(uri, &text);
    let d = c.diagnostics(uri, Some(1));
    let list = d["diagnostics"].as_array().unwrap();
    let errors: Vec<&Value> = list.iter().filter(|d| d["severity"] == 1).collect();
    assert_eq!(errors.len(), 1, "{list:?}");
    assert!(
        errors[0]["message"].as_str().unwrap().contains("kelvins"),
        "{}",
        errors[0]
    );
    let last = list.last().unwrap();
    assert!(
        last["message"]
            .as_str()
            .unwrap()
            .starts_with("5 more diagnostics in this file not shown"),
        "{last}"
    );
    // It sits where the first diagnostic left out is: the 201st system's note.
    assert_eq!(last["range"]["start"]["line"], 200, "{last}");
}

/// `n` systems whose star's mass has two uncertainties (a `combined-uncertainty` note each),
/// then one with a misspelt unit (an error), one system a line.
fn notes_then_an_error(n: usize) -> String {
    let mut text = String::new();
    for i in 0..n {
        text.push_str(&format!(
            "system \"Noted {i}\" {{ star s{i} {{ mass = 1.0 ± 0.05 ± 0.02 Msun }} }}\n"
        ));
    }
    text.push_str(
        "system \"Last\" { star z { mass = 1.0 ± 0.05 Msun; teff = 5000 ± 50 kelvins } }\n",
    );
    text
}

#[test]
fn unhandled_dollar_requests_get_method_not_found() {
    let (uri, text) = veyra();
    let mut c = LspClient::start();
    c.initialize(json!({}));
    c.open(&uri, &text);
    c.diagnostics(&uri, Some(1));
    // A request (with an id) the server does not handle must be answered, `$/` or not.
    for method in ["$/syzygy/unknown", "$/progress", "$/cancelRequest"] {
        let r = c.request(method, json!({"id": 1}));
        assert_eq!(r["error"]["code"], -32601, "{method}: {r}");
        let data = r["error"]["data"].as_str().unwrap_or("");
        assert!(data.ends_with(method), "{method}: {r}");
    }
    // `$/` notifications are ignored quietly, and the server goes on answering.
    c.notify("$/syzygy/somethingNew", json!({}));
    c.notify("$/cancelRequest", json!({"id": 9999}));
    let h = hover_text(&mut c, &uri, position_of(&text, "teff", 0));
    assert!(h.contains("Effective temperature"), "{h}");
    assert_eq!(c.shutdown_and_exit().and_then(|s| s.code()), Some(0));
}

#[test]
fn exit_without_shutdown_ends_with_status_1() {
    let mut c = LspClient::start();
    c.initialize(json!({}));
    c.notify("exit", Value::Null);
    let status = c
        .wait_exit(Duration::from_secs(10))
        .expect("exit ends the process");
    assert_eq!(status.code(), Some(1));
}

#[test]
fn fast_edits_apply_in_order_and_the_newest_is_reported_last() {
    let uri = "file:///tmp/typing.syz";
    let base =
        "system \"Orrin\" {\n  star o { mass = 0.8 Msun }\n  planet e orbits o {\n    \n  }\n}\n";
    let mut c = LspClient::start();
    c.initialize(json!({}));
    c.open(uri, base);
    c.diagnostics(uri, Some(1));
    let line = position_of(base, "    \n", 0)["line"].as_u64().unwrap();
    let typed = "mass_typo = 1 Mjup";
    for (i, ch) in typed.chars().enumerate() {
        let col = 4 + i as u64;
        c.notify(
            "textDocument/didChange",
            json!({"textDocument": {"uri": uri, "version": 2 + i},
                   "contentChanges": [{"range": {"start": {"line": line, "character": col},
                                                  "end": {"line": line, "character": col}},
                                       "text": ch.to_string()}]}),
        );
    }
    let last = 1 + typed.chars().count() as i64;
    let d = c.diagnostics(uri, Some(last));
    let diags = d["diagnostics"].as_array().unwrap();
    assert_eq!(diags.len(), 1, "{d}");
    assert!(
        diags[0]["message"]
            .as_str()
            .unwrap()
            .starts_with("'mass_typo' is not a quantity of a planet"),
        "{d}"
    );
    // Versions analysed on the way (the server does not wait for typing to stop) came out
    // in order, before the newest; nothing older arrives after it.
    let versions_before: Vec<i64> = c
        .take_pending()
        .iter()
        .filter(|m| m["method"] == "textDocument/publishDiagnostics")
        .filter_map(|m| m["params"]["version"].as_i64())
        .collect();
    assert!(
        versions_before.windows(2).all(|w| w[0] < w[1])
            && versions_before.iter().all(|v| *v < last),
        "diagnostics out of order before the newest: {versions_before:?}"
    );
    let later = c.drain(Duration::from_millis(300));
    for m in later {
        if m["method"] == "textDocument/publishDiagnostics" {
            assert_eq!(
                m["params"]["version"], last,
                "stale diagnostics after the newest: {m}"
            );
        }
    }
    assert_eq!(c.shutdown_and_exit().unwrap().code(), Some(0));
}

#[test]
fn a_file_deleted_while_open_is_still_served_from_the_buffer() {
    let dir = scratch("lsp-deleted");
    let path = dir.join("gone.syz");
    let (_, text) = veyra();
    std::fs::write(&path, &text).unwrap();
    let uri = file_uri(&path);
    let mut c = LspClient::start();
    c.initialize(json!({}));
    c.open(&uri, &text);
    c.diagnostics(&uri, Some(1));
    std::fs::remove_file(&path).unwrap();
    c.notify(
        "workspace/didChangeWatchedFiles",
        json!({"changes": [{"uri": uri, "type": 3}]}),
    );
    let h = hover_text(&mut c, &uri, position_of(&text, "teff", 0));
    assert!(h.contains("Effective temperature"), "{h}");
    c.notify(
        "textDocument/didClose",
        json!({"textDocument": {"uri": uri}}),
    );
    let d = c.diagnostics(&uri, None);
    assert_eq!(d["diagnostics"], json!([]));
    let r = c.request(
        "textDocument/hover",
        doc(&uri, position_of(&text, "teff", 0)),
    );
    assert!(
        r.get("error").is_some(),
        "closed documents are not served: {r}"
    );
    assert_eq!(c.shutdown_and_exit().unwrap().code(), Some(0));
}

#[test]
fn diagnostics_after_edits_are_those_of_the_text_opened_afresh() {
    // Edits in one system move the others; the server reuses their work and must publish
    // exactly what it publishes for the same text opened as a new document.
    let text = "ref lab \"Invented laboratory numbers\"\n\
        system \"Pellam\" {\n  star p { mass = 0.9 ± 0.04 Msun; radius = 0.9 ± 0.02 Rsun }\n  planet b orbits p { period = 5 ± 0.01 d; rv_amplitude = 30 ± 2 m/s }\n}\n\
        system \"Quorl\" {\n  star q { mass = 1.0 ± 0.02 Msun }\n  planet b orbits q { period = 365.25 ± 0.01 d; semi_major_axis = 1.3 ± 0.01 au [lab] }\n}\n\
        system \"Tarrow\" {\n  star t { mass = 1.0 ± 0.04 Msun }\n  planet b orbits t { period = 10 ± 0.01 d; eccentricity = 0.6 ± 0.02 }\n  planet c orbits t { period = 14 ± 0.01 d }\n}\n";
    let uri = "file:///tmp/moving.syz";
    let mut c = LspClient::start();
    c.initialize(json!({}));
    c.open(uri, text);
    let first = c.diagnostics(uri, Some(1));
    assert_eq!(first["diagnostics"].as_array().unwrap().len(), 2, "{first}");

    let at = position_of(text, "  planet b orbits p", 0);
    let inserted = "  let spare = 2 ± 0.1\n  # a note\n";
    c.notify(
        "textDocument/didChange",
        json!({"textDocument": {"uri": uri, "version": 2},
               "contentChanges": [{"range": {"start": at, "end": at}, "text": inserted}]}),
    );
    let edited = text.replacen(
        "  planet b orbits p",
        &format!("{inserted}  planet b orbits p"),
        1,
    );
    let moved = c.diagnostics(uri, Some(2));
    let diags = moved["diagnostics"].as_array().unwrap();
    assert_eq!(diags.len(), 2, "{moved}");
    let inconsistent = diags.iter().find(|d| d["code"] == "inconsistent").unwrap();
    assert_eq!(
        inconsistent["range"],
        range_of(&edited, "1.0 ± 0.02 Msun", 0),
        "{moved}"
    );
    assert_eq!(
        inconsistent["relatedInformation"][1]["location"]["range"],
        range_of(&edited, "1.3 ± 0.01 au", 0)
    );

    let fresh_uri = "file:///tmp/moving-afresh.syz";
    c.open(fresh_uri, &edited);
    let fresh = c.diagnostics(fresh_uri, Some(1));
    let same_uri = fresh["diagnostics"].to_string().replace(fresh_uri, uri);
    assert_eq!(moved["diagnostics"].to_string(), same_uri);
    assert_eq!(c.shutdown_and_exit().unwrap().code(), Some(0));
}

#[test]
fn a_code_action_switches_the_source_of_a_quantity_declared_twice() {
    let path = root().join("examples/halvard.syz");
    let (uri, text) = (file_uri(&path), std::fs::read_to_string(&path).unwrap());
    let mut c = LspClient::start();
    c.initialize(json!({}));
    c.open(&uri, &text);
    c.diagnostics(&uri, Some(1));
    let actions_at = |c: &mut LspClient, text: &str, needle: &str| -> Vec<Value> {
        let r = c.result(
            "textDocument/codeAction",
            json!({"textDocument": {"uri": uri}, "range": range_of(text, needle, 0), "context": {"diagnostics": []}}),
        );
        r.as_array().unwrap().clone()
    };
    // The period of [aster] is not used (the one of [brenn] is more precise).
    let actions = actions_at(&mut c, &text, "4.2170 ± 0.0008");
    let act = actions
        .iter()
        .find(|a| a["title"] == "Use this source for b.period ([aster])")
        .unwrap_or_else(|| panic!("{actions:?}"));
    assert_eq!(act["kind"], "refactor.rewrite");
    let edited = apply_edits(&text, act["edit"]["changes"][&uri].as_array().unwrap());
    assert_eq!(
        edited,
        text.replace("0.0008   d   [aster]", "0.0008   d   [aster] preferred")
    );
    c.notify(
        "textDocument/didChange",
        json!({"textDocument": {"uri": uri, "version": 2}, "contentChanges": [{"text": edited}]}),
    );
    c.diagnostics(&uri, Some(2));
    // What the editor now shows: the marked value used, on its line.
    let line = text
        .lines()
        .position(|l| l.contains("[aster]") && l.contains("period"))
        .unwrap()
        + 1;
    let h = hover_text(&mut c, &uri, position_of(&edited, "period", 1));
    assert!(
        h.contains(&format!(
            "chosen: the one marked preferred ([aster], source 1 of 2, line {line})"
        )),
        "{h}"
    );
    let hints = c.result(
        "textDocument/inlayHint",
        json!({"textDocument": {"uri": uri}, "range": {"start": {"line": 0, "character": 0}, "end": position_of(&edited, "impact", 0)}}),
    );
    let brenn = hints
        .as_array()
        .unwrap()
        .iter()
        .find(|h| {
            h["label"]
                .as_str()
                .unwrap()
                .starts_with("not used: [aster]")
        })
        .unwrap_or_else(|| panic!("{hints}"));
    assert_eq!(
        brenn["label"],
        format!("not used: [aster] (line {line}) is marked preferred")
    );
    assert_eq!(
        brenn["position"],
        position_in(
            &edited,
            "0.00012 d   [brenn]",
            0,
            "0.00012 d   [brenn]".len(),
            false
        )
    );
    // The edit is in canonical layout.
    let edits = c.result(
        "textDocument/formatting",
        json!({"textDocument": {"uri": uri}, "options": {"tabSize": 2, "insertSpaces": true}}),
    );
    assert_eq!(apply_edits(&edited, edits.as_array().unwrap()), edited);
    // On the marked one, the policy can choose again, which gives back the file.
    let actions = actions_at(&mut c, &edited, "4.2170 ± 0.0008");
    assert!(!actions
        .iter()
        .any(|a| a["title"].as_str().unwrap().starts_with("Use this source")));
    let back = actions
        .iter()
        .find(|a| a["title"] == "Let the project policy choose for b.period")
        .unwrap_or_else(|| panic!("{actions:?}"));
    assert_eq!(
        apply_edits(&edited, back["edit"]["changes"][&uri].as_array().unwrap()),
        text
    );
    assert_eq!(c.shutdown_and_exit().unwrap().code(), Some(0));
}

/// A burst of changes to a large file costs about two analyses, not one per change: a
/// change is analysed at once when none is running, and of the changes that wait for a
/// running analysis only the newest is analysed next. Every diagnostics message is for a
/// version that was current when its analysis began, the last one for the last version.
#[test]
fn a_burst_of_changes_is_analysed_about_twice_not_once_per_change() {
    let (_, veyra) = veyra();
    // Forty renamed copies of the demo system: an analysis long enough to overlap the burst.
    let mut text = String::new();
    for i in 0..40 {
        text.push_str(&veyra.replace("system \"Veyra\"", &format!("system \"Veyra {i}\"")));
        text.push('\n');
    }
    let uri = "file:///tmp/burst.syz";
    let mut c = LspClient::start();
    c.initialize(json!({}));
    c.open(uri, &text);
    c.diagnostics(uri, Some(1));
    let at = position_of(&text, "# ", 0);
    let changes = 40i64;
    for v in 2..2 + changes {
        c.notify(
            "textDocument/didChange",
            json!({"textDocument": {"uri": uri, "version": v},
                   "contentChanges": [{"range": {"start": at, "end": at}, "text": "x"}]}),
        );
    }
    let last = 1 + changes;
    c.diagnostics(uri, Some(last));
    let versions = |messages: Vec<Value>| -> Vec<i64> {
        messages
            .iter()
            .filter(|m| m["method"] == "textDocument/publishDiagnostics")
            .map(|m| m["params"]["version"].as_i64().unwrap())
            .collect()
    };
    let published = versions(c.take_pending());
    let after = versions(c.drain(Duration::from_millis(500)));
    assert!(
        after.is_empty() && published.windows(2).all(|w| w[0] < w[1]),
        "in order, nothing after the last version's: {published:?} then {last}, then {after:?}"
    );
    assert!(
        published.len() <= 6,
        "{} analyses published for a burst of {changes} changes: {published:?}",
        published.len() + 1
    );
    assert_eq!(c.shutdown_and_exit().unwrap().code(), Some(0));
}
