//! A small filter between stdin and tower-lsp that smooths over what tower-lsp 0.20 does not
//! handle itself:
//! - after the `exit` notification it would go on reading stdin for ever, so the filter
//!   closes the server's input right after forwarding `exit`, and the server loop ends;
//! - it rejects `"params": null` (Emacs's eglot sends it with `shutdown`), so the filter
//!   drops a null `params` from every message;
//! - one message that is not JSON, or not JSON-RPC, ends its input stream for good, so the
//!   filter never forwards one: a malformed request with an id becomes a request for a method
//!   that does not exist (answered with an error for that id), anything else is dropped with
//!   a line on stderr;
//! - it leaves requests whose method starts with `$/` unanswered when it has no handler for
//!   them (the protocol asks for a MethodNotFound error, -32601, for a request; only such
//!   notifications may be ignored), so the filter renames every `$/` request (tower-lsp
//!   handles none: the protocol's `$/` methods are notifications) to a method that does not
//!   exist, which tower-lsp answers with MethodNotFound.

use serde_json::Value;
use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::Arc;
use tokio::io::{AsyncBufReadExt, AsyncRead, AsyncReadExt, AsyncWrite, AsyncWriteExt, BufReader};

/// Messages larger than this are skipped unread.
const MAX_MESSAGE: usize = 256 * 1024 * 1024;

/// What the filter saw, for the exit code.
#[derive(Debug, Default)]
pub struct Seen {
    pub shutdown: AtomicBool,
    pub exit: AtomicBool,
}

/// The method name the filter forwards in place of a malformed request.
pub const INVALID_METHOD: &str = "syzygy/invalidRequest";

/// Put before the method of a `$/` request, so tower-lsp answers it with MethodNotFound
/// (whose `data` then names the method) instead of leaving it unanswered.
pub const UNHANDLED_PREFIX: &str = "syzygy/unhandled:";

/// Copy framed messages from `input` to `output`, rewriting as described in the module
/// doc. Returns at end of input or right after forwarding `exit`; dropping `output` then
/// closes the server's input.
pub async fn filter<R, W>(input: R, mut output: W, seen: Arc<Seen>)
where
    R: AsyncRead + Unpin,
    W: AsyncWrite + Unpin,
{
    let mut reader = BufReader::new(input);
    loop {
        let Some(len) = read_headers(&mut reader).await else {
            return;
        };
        if len > MAX_MESSAGE {
            eprintln!("syz lsp: skipping a message of {len} bytes");
            let mut rest = (&mut reader).take(len as u64);
            if tokio::io::copy(&mut rest, &mut tokio::io::sink())
                .await
                .is_err()
            {
                return;
            }
            continue;
        }
        let mut body = vec![0u8; len];
        if reader.read_exact(&mut body).await.is_err() {
            return;
        }
        let (body, is_exit) = match rewrite(&body, &seen) {
            Some(x) => x,
            None => continue,
        };
        let header = format!("Content-Length: {}\r\n\r\n", body.len());
        if output.write_all(header.as_bytes()).await.is_err()
            || output.write_all(&body).await.is_err()
            || output.flush().await.is_err()
        {
            return;
        }
        if is_exit {
            seen.exit.store(true, Ordering::SeqCst);
            return;
        }
    }
}

/// Read header lines up to the blank line; the content length, or `None` at end of input.
async fn read_headers<R: AsyncRead + Unpin>(reader: &mut BufReader<R>) -> Option<usize> {
    let mut length: Option<usize> = None;
    let mut line = Vec::new();
    loop {
        line.clear();
        let n = reader.read_until(b'\n', &mut line).await.ok()?;
        if n == 0 {
            return None;
        }
        let text = String::from_utf8_lossy(&line);
        let text = text.trim();
        if text.is_empty() {
            if let Some(l) = length {
                return Some(l);
            }
            continue; // stray blank line before any header
        }
        if let Some((name, value)) = text.split_once(':') {
            if name.trim().eq_ignore_ascii_case("content-length") {
                length = value.trim().parse().ok();
            }
        }
    }
}

/// The message to forward (if any) and whether it is `exit`.
fn rewrite(body: &[u8], seen: &Seen) -> Option<(Vec<u8>, bool)> {
    let parsed: Option<Value> = std::str::from_utf8(body)
        .ok()
        .and_then(|s| serde_json::from_str(s).ok());
    let Some(Value::Object(mut obj)) = parsed else {
        eprintln!("syz lsp: dropped a message that is not a JSON object");
        return None;
    };
    if obj.get("params").is_some_and(Value::is_null) {
        obj.remove("params");
    }
    let id_ok = match obj.get("id") {
        None => true,
        Some(v) => v.is_string() || v.is_i64() || v.is_u64() || v.is_null(),
    };
    let method = obj.get("method").map(|m| m.as_str());
    let params_ok = obj
        .get("params")
        .is_none_or(|p| p.is_object() || p.is_array());
    let response = obj.contains_key("id")
        && method.is_none()
        && (obj.contains_key("result") || obj.contains_key("error"));
    let well_formed = obj.get("jsonrpc").and_then(Value::as_str) == Some("2.0")
        && id_ok
        && ((matches!(method, Some(Some(_))) && params_ok) || response);
    if !well_formed {
        let id = obj
            .get("id")
            .filter(|v| v.is_string() || v.is_i64() || v.is_u64())
            .cloned();
        let Some(id) = id else {
            eprintln!("syz lsp: dropped a malformed message without an id");
            return None;
        };
        let replaced = serde_json::json!({"jsonrpc": "2.0", "id": id, "method": INVALID_METHOD});
        return Some((replaced.to_string().into_bytes(), false));
    }
    let method = method.flatten().unwrap_or("").to_string();
    if method == "shutdown" {
        seen.shutdown.store(true, Ordering::SeqCst);
    }
    if method.starts_with("$/") && obj.contains_key("id") {
        obj.insert(
            "method".into(),
            Value::String(format!("{UNHANDLED_PREFIX}{method}")),
        );
    }
    let is_exit = method == "exit";
    Some((Value::Object(obj).to_string().into_bytes(), is_exit))
}

#[cfg(test)]
mod tests {
    #![allow(clippy::unwrap_used)]
    use super::*;

    fn frame(s: &str) -> String {
        format!("Content-Length: {}\r\n\r\n{s}", s.len())
    }

    async fn run(input: String) -> (String, Arc<Seen>) {
        let seen = Arc::new(Seen::default());
        let mut out = Vec::new();
        filter(input.as_bytes(), &mut out, seen.clone()).await;
        (String::from_utf8(out).unwrap(), seen)
    }

    #[tokio::test]
    async fn null_params_are_dropped_and_exit_ends_the_stream() {
        let input = [
            frame(r#"{"jsonrpc":"2.0","id":1,"method":"shutdown","params":null}"#),
            frame(r#"{"jsonrpc":"2.0","method":"exit"}"#),
            frame(r#"{"jsonrpc":"2.0","id":2,"method":"never/read"}"#),
        ]
        .concat();
        let (out, seen) = run(input).await;
        assert!(
            out.contains(r#""method":"shutdown""#) && !out.contains("params"),
            "{out}"
        );
        assert!(out.contains(r#""method":"exit""#));
        assert!(!out.contains("never/read"), "input after exit is not read");
        assert!(seen.shutdown.load(Ordering::SeqCst) && seen.exit.load(Ordering::SeqCst));
    }

    #[tokio::test]
    async fn dollar_requests_are_renamed_and_dollar_notifications_left_alone() {
        let input = [
            frame(r#"{"jsonrpc":"2.0","id":3,"method":"$/syzygy/unknown","params":{}}"#),
            frame(r#"{"jsonrpc":"2.0","method":"$/cancelRequest","params":{"id":1}}"#),
        ]
        .concat();
        let (out, _) = run(input).await;
        assert!(
            out.contains(r#""method":"syzygy/unhandled:$/syzygy/unknown""#),
            "{out}"
        );
        assert!(out.contains(r#""method":"$/cancelRequest""#), "{out}");
    }

    #[tokio::test]
    async fn malformed_messages_never_reach_the_server() {
        let input = [
            frame("{not json"),
            frame(r#"{"jsonrpc":"2.0","id":7,"method":42}"#),
            frame(r#"[1, 2]"#),
            "\r\n".to_string(),
            frame(r#"{"jsonrpc":"2.0","id":8,"method":"textDocument/hover","params":{}}"#),
        ]
        .concat();
        let (out, _) = run(input).await;
        assert!(!out.contains("not json") && !out.contains("[1, 2]"));
        assert!(
            out.contains(INVALID_METHOD) && out.contains(r#""id":7"#),
            "{out}"
        );
        assert!(out.contains(r#""id":8"#), "{out}");
    }
}
