//! A bounded soak of the real `syz lsp`: thousands of random edits and requests, at valid
//! and invalid positions, on the demo file. Every request must be answered (a result or an
//! error), the server must be alive at the end, and its memory must stay under a bound.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use rand::{Rng, SeedableRng};
use rand_chacha::ChaCha8Rng;
use serde_json::{json, Value};
use syzygy_e2e::lsp::LspClient;

/// Actions in one run: a few thousand, as a day of typing would send.
const ACTIONS: usize = 5000;
/// Requests sent before waiting for their answers (editors pipeline requests too).
const PIPELINE: usize = 16;
/// Resident memory the server may reach on a file this size (it starts near 20 MiB).
const MAX_RSS_KIB: u64 = 400 * 1024;

const SNIPPETS: &[&str] = &[
    "",
    "1",
    "±",
    " ± 0.1",
    "Msun",
    " d",
    "\n",
    "\r\n",
    "\r",
    "{",
    "}",
    "(",
    ")",
    "[ref]",
    "let x = y\n",
    "let y = x\n",
    "mass = s.mass * 2\n",
    "planet q orbits ",
    "system \"Z\" {",
    "☉",
    "é",
    "\u{1F600}",
    "^",
    "-",
    "/",
    "*",
    "e999",
    ".",
    "assumed",
    "# allow unit-mismatch\n",
    "period = 3.5 ± 0.1 d\n",
    "radius = 1.1 +0.05/-0.03 Rjup\n",
    "\"text\"",
    "\t",
    "0x",
];

const REQUESTS: &[&str] = &[
    "textDocument/hover",
    "textDocument/completion",
    "textDocument/definition",
    "textDocument/references",
    "textDocument/prepareRename",
    "textDocument/rename",
    "textDocument/documentSymbol",
    "textDocument/foldingRange",
    "textDocument/formatting",
    "textDocument/codeAction",
    "textDocument/inlayHint",
    "textDocument/semanticTokens/full",
    "$/syzygy/unknown",
    "syzygy/unknown",
];

fn position(rng: &mut ChaCha8Rng, lines: usize) -> Value {
    if rng.gen_bool(0.1) {
        // Out of the document, or absurd.
        json!({"line": rng.gen_range(0..u32::MAX / 2), "character": rng.gen_range(0..u32::MAX / 2)})
    } else {
        json!({"line": rng.gen_range(0..lines.max(1) + 2), "character": rng.gen_range(0..120)})
    }
}

fn params(rng: &mut ChaCha8Rng, method: &str, uri: &str, lines: usize) -> Value {
    let doc = json!({"uri": uri});
    let at = position(rng, lines);
    let end = position(rng, lines);
    match method {
        "textDocument/references" => {
            json!({"textDocument": doc, "position": at, "context": {"includeDeclaration": true}})
        }
        "textDocument/rename" => json!({"textDocument": doc, "position": at, "newName": "renamed"}),
        "textDocument/formatting" => {
            json!({"textDocument": doc, "options": {"tabSize": 2, "insertSpaces": true}})
        }
        "textDocument/codeAction" => {
            json!({"textDocument": doc, "range": {"start": at, "end": end},
            "context": {"diagnostics": []}})
        }
        "textDocument/inlayHint" => {
            json!({"textDocument": doc, "range": {"start": at, "end": end}})
        }
        "textDocument/documentSymbol"
        | "textDocument/foldingRange"
        | "textDocument/semanticTokens/full" => json!({"textDocument": doc}),
        _ => json!({"textDocument": doc, "position": at}),
    }
}

fn rss_kib(pid: u32) -> Option<u64> {
    let status = std::fs::read_to_string(format!("/proc/{pid}/status")).ok()?;
    let line = status.lines().find(|l| l.starts_with("VmRSS:"))?;
    line.split_whitespace().nth(1)?.parse().ok()
}

#[test]
fn thousands_of_random_edits_and_requests_are_all_answered() {
    let demo = std::fs::read_to_string(syzygy_e2e::root().join("examples/veyra.syz")).unwrap();
    let uri = "file:///soak/veyra.syz";
    let mut c = LspClient::start();
    c.initialize(json!({}));
    c.open(uri, &demo);
    let mut rng = ChaCha8Rng::seed_from_u64(20_261_202);
    let mut version = 1;
    let mut lines = demo.lines().count();
    let mut waiting: Vec<(i64, &str)> = Vec::new();
    let mut answered = 0;
    for step in 0..ACTIONS {
        if rng.gen_bool(0.5) {
            version += 1;
            let change = if step % 97 == 0 {
                // Back to the demo now and then, so edits keep landing in a real file.
                lines = demo.lines().count();
                json!({"text": demo})
            } else {
                let text = SNIPPETS[rng.gen_range(0..SNIPPETS.len())];
                lines += text.matches('\n').count();
                let start = position(&mut rng, lines);
                let end = if rng.gen_bool(0.7) {
                    start.clone()
                } else {
                    position(&mut rng, lines)
                };
                json!({"range": {"start": start, "end": end}, "text": text})
            };
            c.notify(
                "textDocument/didChange",
                json!({"textDocument": {"uri": uri, "version": version}, "contentChanges": [change]}),
            );
        } else {
            let method = REQUESTS[rng.gen_range(0..REQUESTS.len())];
            let p = params(&mut rng, method, uri, lines);
            waiting.push((c.send_request(method, p), method));
        }
        if waiting.len() >= PIPELINE || step + 1 == ACTIONS {
            for (id, method) in waiting.drain(..) {
                let r = c.response(id);
                assert!(
                    r.get("result").is_some() || r.get("error").is_some(),
                    "{method} (request {id}) got neither a result nor an error: {r}"
                );
                if method.ends_with("unknown") {
                    assert_eq!(r["error"]["code"], -32601, "{method}: {r}");
                }
                answered += 1;
            }
            // Drop the notifications read so far; only answers matter here.
            c.drain(std::time::Duration::from_millis(0));
        }
    }
    assert!(answered > ACTIONS / 3, "only {answered} requests were sent");
    // Alive and still right: after all that, the demo text checks as it did.
    version += 1;
    c.notify(
        "textDocument/didChange",
        json!({"textDocument": {"uri": uri, "version": version}, "contentChanges": [{"text": demo}]}),
    );
    let diags = c.diagnostics(uri, Some(version));
    assert_eq!(diags["diagnostics"], json!([]), "the demo is clean");
    let rss = rss_kib(c.pid()).expect("the server's memory can be read");
    assert!(
        rss < MAX_RSS_KIB,
        "resident memory {rss} KiB exceeds {MAX_RSS_KIB} KiB"
    );
    assert_eq!(c.shutdown_and_exit().and_then(|s| s.code()), Some(0));
}
