//! `syz eval --format json`, written as it is computed: the same bytes as pretty-printing
//! the whole document at once (a test checks), without ever holding the document. For a
//! catalogue of thousands of systems the document is hundreds of megabytes of text and,
//! as a `serde_json::Value`, several times that in memory.

use serde::Serialize;
use std::io::Write;

/// Indent every line after the first of a pretty-printed value by `depth` levels, so it can
/// sit inside an enclosing pretty-printed document.
fn nested(pretty: &str, depth: usize) -> String {
    pretty.replace('\n', &format!("\n{}", "  ".repeat(depth)))
}

/// A value pretty-printed on its own.
pub fn pretty(v: &impl Serialize) -> String {
    serde_json::to_string_pretty(v).unwrap_or_default()
}

/// The members of an object pretty-printed at the top level, without its braces: each on
/// its own line, indented one level, separated by commas. Empty for an empty object.
fn members(object: &impl Serialize) -> String {
    let text = pretty(object);
    debug_assert!(text.starts_with('{'), "not an object: {text}");
    text.strip_prefix("{\n")
        .and_then(|t| t.strip_suffix("\n}"))
        .unwrap_or_default()
        .to_string()
}

/// The document `{ head's members, "systems": [...], tail's members }`, with the systems
/// written one at a time. `head` and `tail` are objects (the contract's
/// `syzygy::report::json::EvalHead` and `EvalTail`). The first write error is kept and
/// later writes are skipped (a reader that closes the pipe early costs one error, not one
/// per system); [`Document::finish`] returns it.
pub struct Document<W: Write> {
    out: W,
    systems: usize,
    failed: Option<std::io::Error>,
}

impl<W: Write> Document<W> {
    /// Starts the document: the members before `systems`, and the array's opening bracket.
    pub fn start(out: W, head: &impl Serialize) -> Self {
        let mut doc = Document {
            out,
            systems: 0,
            failed: None,
        };
        doc.put("{");
        let head = members(head);
        if !head.is_empty() {
            doc.put(&format!("\n{head},"));
        }
        doc.put("\n  \"systems\": [");
        doc
    }

    fn put(&mut self, text: &str) {
        if self.failed.is_none() {
            self.failed = self.out.write_all(text.as_bytes()).err();
        }
    }

    /// One element of `systems`, already pretty-printed on its own ([`pretty`]).
    pub fn system(&mut self, pretty_system: &str) {
        let sep = if self.systems == 0 { "" } else { "," };
        self.systems += 1;
        self.put(&format!("{sep}\n    {}", nested(pretty_system, 2)));
    }

    /// Closes `systems`, writes the members after it, and says whether every write worked.
    pub fn finish(mut self, tail: &impl Serialize) -> std::io::Result<()> {
        if self.systems > 0 {
            self.put("\n  ");
        }
        self.put("]");
        let tail = members(tail);
        if !tail.is_empty() {
            self.put(&format!(",\n{tail}"));
        }
        self.put("\n}\n");
        match self.failed {
            Some(e) => Err(e),
            None => self.out.flush(),
        }
    }
}

#[cfg(test)]
#[allow(clippy::unwrap_used)]
mod tests {
    use super::*;

    #[test]
    fn streamed_document_equals_pretty_printing_it_whole() {
        let head = serde_json::json!({
            "version": 1,
            "options": {"propagation": "linear", "samples": null},
        });
        let systems = [
            serde_json::json!({"name": "A", "bodies": [{"id": "b", "q": [1.5, {"x": []}]}]}),
            serde_json::json!({"name": "B \"quoted\"\nline", "bodies": []}),
        ];
        let tail = serde_json::json!({
            "diagnostics": [{"rule": "r", "labels": []}],
            "io_errors": [],
        });
        let empty = serde_json::json!({});
        for (head, tail, n) in (0..=systems.len())
            .map(|n| (&head, &tail, n))
            .chain([(&empty, &empty, 0), (&empty, &empty, 2)])
        {
            let mut buf = Vec::new();
            let mut doc = Document::start(&mut buf, &head);
            for s in systems.iter().take(n) {
                doc.system(&pretty(s));
            }
            doc.finish(&tail).unwrap();
            let mut whole = head.as_object().unwrap().clone();
            whole.insert(
                "systems".into(),
                serde_json::Value::Array(systems.iter().take(n).cloned().collect()),
            );
            whole.extend(tail.as_object().unwrap().clone());
            let expected = format!(
                "{}\n",
                serde_json::to_string_pretty(&serde_json::Value::Object(whole)).unwrap()
            );
            assert_eq!(
                String::from_utf8(buf).unwrap(),
                expected,
                "{n} systems, head {head}"
            );
        }
    }
}
