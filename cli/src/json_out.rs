//! `syz eval --format json`, written as it is computed: the same bytes as pretty-printing
//! the whole document at once (a test checks), without ever holding the document. For a
//! catalogue of thousands of systems the document is hundreds of megabytes of text and,
//! as a `serde_json::Value`, several times that in memory.

use std::io::Write;

/// Indent every line after the first of a pretty-printed value by `depth` levels, so it can
/// sit inside an enclosing pretty-printed document.
fn nested(pretty: &str, depth: usize) -> String {
    pretty.replace('\n', &format!("\n{}", "  ".repeat(depth)))
}

fn pretty(v: &serde_json::Value) -> String {
    serde_json::to_string_pretty(v).unwrap_or_default()
}

/// `"key": value`, pretty-printed as a member of the top-level object.
fn member(key: &str, value: &serde_json::Value) -> String {
    format!(
        "{}: {}",
        pretty(&serde_json::json!(key)),
        nested(&pretty(value), 1)
    )
}

/// The document `{"version", "options", "systems": [...], "diagnostics", "io_errors"}`,
/// with the systems written one at a time. The first write error is kept and later writes
/// are skipped (a reader that closes the pipe early costs one error, not one per system);
/// [`Document::finish`] returns it.
pub struct Document<W: Write> {
    out: W,
    systems: usize,
    failed: Option<std::io::Error>,
}

impl<W: Write> Document<W> {
    /// Starts the document: the members before `systems`, and the array's opening bracket.
    pub fn start(out: W, head: &[(&str, serde_json::Value)]) -> Self {
        let mut doc = Document {
            out,
            systems: 0,
            failed: None,
        };
        doc.put("{");
        for (key, value) in head {
            doc.put(&format!("\n  {},", member(key, value)));
        }
        doc.put("\n  \"systems\": [");
        doc
    }

    fn put(&mut self, text: &str) {
        if self.failed.is_none() {
            self.failed = self.out.write_all(text.as_bytes()).err();
        }
    }

    /// One element of `systems`, already pretty-printed on its own.
    pub fn system(&mut self, pretty_system: &str) {
        let sep = if self.systems == 0 { "" } else { "," };
        self.systems += 1;
        self.put(&format!("{sep}\n    {}", nested(pretty_system, 2)));
    }

    /// Closes `systems`, writes the members after it, and says whether every write worked.
    pub fn finish(mut self, tail: &[(&str, serde_json::Value)]) -> std::io::Result<()> {
        if self.systems > 0 {
            self.put("\n  ");
        }
        self.put("]");
        for (key, value) in tail {
            self.put(&format!(",\n  {}", member(key, value)));
        }
        self.put("\n}\n");
        match self.failed {
            Some(e) => Err(e),
            None => self.out.flush(),
        }
    }
}

/// Pretty-prints one system for [`Document::system`] (on the worker that analysed it).
pub fn system_text(v: &serde_json::Value) -> String {
    pretty(v)
}

#[cfg(test)]
#[allow(clippy::unwrap_used)]
mod tests {
    use super::*;

    #[test]
    fn streamed_document_equals_pretty_printing_it_whole() {
        let head = [
            ("version", serde_json::json!(1)),
            (
                "options",
                serde_json::json!({"propagation": "linear", "samples": null}),
            ),
        ];
        let systems = [
            serde_json::json!({"name": "A", "bodies": [{"id": "b", "q": [1.5, {"x": []}]}]}),
            serde_json::json!({"name": "B \"quoted\"\nline", "bodies": []}),
        ];
        let tail = [
            (
                "diagnostics",
                serde_json::json!([{"rule": "r", "labels": []}]),
            ),
            ("io_errors", serde_json::json!([])),
        ];
        for n in 0..=systems.len() {
            let mut buf = Vec::new();
            let mut doc = Document::start(&mut buf, &head);
            for s in systems.iter().take(n) {
                doc.system(&system_text(s));
            }
            doc.finish(&tail).unwrap();
            let mut whole = serde_json::Map::new();
            for (k, v) in &head {
                whole.insert(k.to_string(), v.clone());
            }
            whole.insert(
                "systems".into(),
                serde_json::Value::Array(systems.iter().take(n).cloned().collect()),
            );
            for (k, v) in &tail {
                whole.insert(k.to_string(), v.clone());
            }
            let expected = format!(
                "{}\n",
                serde_json::to_string_pretty(&serde_json::Value::Object(whole)).unwrap()
            );
            assert_eq!(String::from_utf8(buf).unwrap(), expected, "{n} systems");
        }
    }
}
