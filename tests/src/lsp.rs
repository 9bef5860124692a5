//! A small language-server client for end-to-end tests: it starts the real `syz lsp`,
//! speaks JSON-RPC over its stdin and stdout, and waits for answers with bounded timeouts.

use serde_json::{json, Value};
use std::io::{BufRead, BufReader, Read, Write};
use std::process::{Child, ChildStdin, Command, ExitStatus, Stdio};
use std::sync::mpsc::{self, Receiver, RecvTimeoutError};
use std::time::{Duration, Instant};

/// How long any single answer may take before a test fails.
pub const TIMEOUT: Duration = Duration::from_secs(30);

pub struct LspClient {
    child: Child,
    stdin: Option<ChildStdin>,
    rx: Receiver<Value>,
    next_id: i64,
    /// Messages from the server that no wait has consumed yet.
    pending: Vec<Value>,
}

/// Read framed messages until end of output.
fn reader(out: impl Read, tx: mpsc::Sender<Value>) {
    let mut r = BufReader::new(out);
    loop {
        let mut len = None;
        loop {
            let mut line = String::new();
            match r.read_line(&mut line) {
                Ok(0) | Err(_) => return,
                Ok(_) => {}
            }
            let line = line.trim();
            if line.is_empty() {
                break;
            }
            if let Some(v) = line.to_ascii_lowercase().strip_prefix("content-length:") {
                len = v.trim().parse::<usize>().ok();
            }
        }
        let Some(len) = len else { return };
        let mut body = vec![0; len];
        if r.read_exact(&mut body).is_err() {
            return;
        }
        match serde_json::from_slice(&body) {
            Ok(v) => {
                if tx.send(v).is_err() {
                    return;
                }
            }
            Err(e) => panic!("server sent invalid JSON: {e}"),
        }
    }
}

impl LspClient {
    /// Start `syz lsp` from the workspace root.
    pub fn start() -> LspClient {
        let mut child = Command::new(crate::syz())
            .arg("lsp")
            .current_dir(crate::root())
            .stdin(Stdio::piped())
            .stdout(Stdio::piped())
            .stderr(Stdio::null())
            .spawn()
            .expect("syz lsp could not be started");
        let stdout = child.stdout.take().expect("stdout");
        let stdin = child.stdin.take();
        let (tx, rx) = mpsc::channel();
        std::thread::spawn(move || reader(stdout, tx));
        LspClient {
            child,
            stdin,
            rx,
            next_id: 0,
            pending: Vec::new(),
        }
    }

    pub fn pid(&self) -> u32 {
        self.child.id()
    }

    /// Write raw bytes (for malformed input).
    pub fn send_raw(&mut self, bytes: &[u8]) {
        let stdin = self.stdin.as_mut().expect("stdin open");
        stdin.write_all(bytes).expect("write to server");
        stdin.flush().expect("flush");
    }

    pub fn send(&mut self, msg: &Value) {
        let body = msg.to_string();
        let framed = format!("Content-Length: {}\r\n\r\n{body}", body.len());
        self.send_raw(framed.as_bytes());
    }

    pub fn notify(&mut self, method: &str, params: Value) {
        self.send(&json!({"jsonrpc": "2.0", "method": method, "params": params}));
    }

    /// Send a request and return its id.
    pub fn send_request(&mut self, method: &str, params: Value) -> i64 {
        self.next_id += 1;
        let id = self.next_id;
        self.send(&json!({"jsonrpc": "2.0", "id": id, "method": method, "params": params}));
        id
    }

    /// Send a request and wait for its response (the whole message, `result` or `error`).
    pub fn request(&mut self, method: &str, params: Value) -> Value {
        let id = self.send_request(method, params);
        self.response(id)
    }

    pub fn response(&mut self, id: i64) -> Value {
        self.wait_for(TIMEOUT, |m| {
            m.get("id") == Some(&json!(id)) && m.get("method").is_none()
        })
        .unwrap_or_else(|| panic!("no response to request {id} within {TIMEOUT:?}"))
    }

    /// The result of a request, failing the test on an error response.
    pub fn result(&mut self, method: &str, params: Value) -> Value {
        let r = self.request(method, params);
        assert!(r.get("error").is_none(), "{method} failed: {r}");
        r["result"].clone()
    }

    /// The first message (already received or arriving within `timeout`) that matches.
    pub fn wait_for(&mut self, timeout: Duration, pred: impl Fn(&Value) -> bool) -> Option<Value> {
        if let Some(i) = self.pending.iter().position(&pred) {
            return Some(self.pending.remove(i));
        }
        let deadline = Instant::now() + timeout;
        loop {
            let left = deadline.saturating_duration_since(Instant::now());
            match self.rx.recv_timeout(left) {
                Ok(m) if pred(&m) => return Some(m),
                Ok(m) => self.pending.push(m),
                Err(RecvTimeoutError::Timeout | RecvTimeoutError::Disconnected) => return None,
            }
        }
    }

    /// Every message received so far or within `window`, without waiting for any one.
    pub fn drain(&mut self, window: Duration) -> Vec<Value> {
        let deadline = Instant::now() + window;
        while let Ok(m) = self
            .rx
            .recv_timeout(deadline.saturating_duration_since(Instant::now()))
        {
            self.pending.push(m);
        }
        std::mem::take(&mut self.pending)
    }

    /// The messages received so far and not yet taken by a wait (in arrival order), without
    /// reading any more.
    pub fn take_pending(&mut self) -> Vec<Value> {
        std::mem::take(&mut self.pending)
    }

    /// `publishDiagnostics` for `uri` (at `version`, if given).
    pub fn diagnostics(&mut self, uri: &str, version: Option<i64>) -> Value {
        self.wait_for(TIMEOUT, |m| {
            m["method"] == "textDocument/publishDiagnostics"
                && m["params"]["uri"] == uri
                && version.is_none_or(|v| m["params"]["version"] == v)
        })
        .unwrap_or_else(|| panic!("no diagnostics for {uri} (version {version:?})"))["params"]
            .clone()
    }

    /// `initialize` and `initialized`, with the given client capabilities, the workspace
    /// root as the one workspace folder.
    pub fn initialize(&mut self, capabilities: Value) -> Value {
        self.initialize_in(&crate::root(), capabilities)
    }

    /// `initialize` and `initialized` with `folder` as the one workspace folder.
    pub fn initialize_in(&mut self, folder: &std::path::Path, capabilities: Value) -> Value {
        let r = self.result(
            "initialize",
            json!({"processId": null, "rootUri": null, "capabilities": capabilities,
                   "workspaceFolders": [{"uri": file_uri(folder), "name": "syzygy"}]}),
        );
        self.notify("initialized", json!({}));
        r
    }

    /// Answer a request the server sent (such as `client/registerCapability`).
    pub fn respond(&mut self, request: &Value, result: Value) {
        self.send(&json!({"jsonrpc": "2.0", "id": request["id"], "result": result}));
    }

    pub fn open(&mut self, uri: &str, text: &str) {
        self.notify(
            "textDocument/didOpen",
            json!({"textDocument": {"uri": uri, "languageId": "syzygy", "version": 1, "text": text}}),
        );
    }

    /// Close stdin-side politely: `shutdown`, then `exit`; the exit status.
    pub fn shutdown_and_exit(&mut self) -> Option<ExitStatus> {
        let r = self.request("shutdown", Value::Null);
        assert!(r.get("error").is_none(), "shutdown failed: {r}");
        self.notify("exit", Value::Null);
        self.wait_exit(Duration::from_secs(10))
    }

    /// Wait for the process to end by itself (stdin stays open, as editors keep it).
    pub fn wait_exit(&mut self, timeout: Duration) -> Option<ExitStatus> {
        let deadline = Instant::now() + timeout;
        while Instant::now() < deadline {
            if let Ok(Some(s)) = self.child.try_wait() {
                return Some(s);
            }
            std::thread::sleep(Duration::from_millis(10));
        }
        None
    }
}

impl Drop for LspClient {
    fn drop(&mut self) {
        if let Ok(None) = self.child.try_wait() {
            let _ = self.child.kill();
            let _ = self.child.wait();
        }
    }
}

/// A `file://` URI for a path.
pub fn file_uri(path: &std::path::Path) -> String {
    format!("file://{}", path.display())
}

/// The protocol position (0-based line, UTF-16 column) of the `nth` occurrence of `needle`,
/// plus `shift` characters.
pub fn position_of(text: &str, needle: &str, nth: usize) -> Value {
    position_in(text, needle, nth, 0, false)
}

/// As [`position_of`], `shift` characters further; columns in UTF-8 bytes if `utf8`.
pub fn position_in(text: &str, needle: &str, nth: usize, shift: usize, utf8: bool) -> Value {
    let start = crate::offset_of(text, needle, nth);
    let offset = text[start..]
        .char_indices()
        .nth(shift)
        .map_or(text.len(), |(i, _)| start + i);
    let line_start = text[..offset].rfind('\n').map_or(0, |i| i + 1);
    let line = text[..offset].matches('\n').count();
    let col: usize = if utf8 {
        offset - line_start
    } else {
        text[line_start..offset].chars().map(char::len_utf16).sum()
    };
    json!({"line": line, "character": col})
}

/// The range from `position_of(needle)` to its end.
pub fn range_of(text: &str, needle: &str, nth: usize) -> Value {
    json!({
        "start": position_of(text, needle, nth),
        "end": position_in(text, needle, nth, needle.chars().count(), false),
    })
}

/// Apply LSP text edits (UTF-16 positions) to a text.
pub fn apply_edits(text: &str, edits: &[Value]) -> String {
    let offset = |p: &Value| -> usize {
        let line = p["line"].as_u64().unwrap() as usize;
        let col = p["character"].as_u64().unwrap() as usize;
        let start = text
            .split_inclusive('\n')
            .take(line)
            .map(str::len)
            .sum::<usize>();
        let mut units = 0;
        for (i, c) in text[start..].char_indices() {
            if units >= col || c == '\n' {
                return start + i;
            }
            units += c.len_utf16();
        }
        text.len()
    };
    let mut spans: Vec<(usize, usize, String)> = edits
        .iter()
        .map(|e| {
            (
                offset(&e["range"]["start"]),
                offset(&e["range"]["end"]),
                e["newText"].as_str().unwrap().to_string(),
            )
        })
        .collect();
    spans.sort_by_key(|s| std::cmp::Reverse(s.0));
    let mut out = text.to_string();
    for (a, b, t) in spans {
        out.replace_range(a..b, &t);
    }
    out
}
