//! `syz eval --format json`, written as it is computed: the same bytes as printing the whole
//! document at once, pretty or compact (a test checks both), without ever holding the
//! document. For a catalogue of thousands of systems the document is hundreds of megabytes of
//! text and, as a `serde_json::Value`, several times that in memory.

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

/// How a JSON document is laid out: indented for people (the default), or on one line.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Style {
    Pretty,
    Compact,
}

impl Style {
    /// A value printed on its own in this style.
    pub fn render(self, v: &impl Serialize) -> String {
        match self {
            Style::Pretty => pretty(v),
            Style::Compact => serde_json::to_string(v).unwrap_or_default(),
        }
    }

    /// The members of an object printed at the top level, without its braces: in the pretty
    /// style each on its own line, indented one level; separated by commas. Empty for an
    /// empty object.
    fn members(self, object: &impl Serialize) -> String {
        let text = self.render(object);
        debug_assert!(text.starts_with('{'), "not an object: {text}");
        let (open, close) = match self {
            Style::Pretty => ("{\n", "\n}"),
            Style::Compact => ("{", "}"),
        };
        text.strip_prefix(open)
            .and_then(|t| t.strip_suffix(close))
            .unwrap_or_default()
            .to_string()
    }

    /// What goes before a member or an element at `depth`: a line break and indentation in
    /// the pretty style, nothing in the compact one.
    fn line(self, depth: usize) -> String {
        match self {
            Style::Pretty => format!("\n{}", "  ".repeat(depth)),
            Style::Compact => String::new(),
        }
    }
}

/// The document `{ head's members, "systems": [...], tail's members }`, with the systems
/// written one at a time. `head` and `tail` are objects (the contract's
/// `syzygy::report::json::EvalHead` and `EvalTail`). The first write error is kept and
/// later writes are skipped (a reader that closes the pipe early costs one error, not one
/// per system); [`Document::finish`] returns it.
pub struct Document<W: Write> {
    out: W,
    style: Style,
    systems: usize,
    failed: Option<std::io::Error>,
}

impl<W: Write> Document<W> {
    /// Starts the document: the members before `systems`, and the array's opening bracket.
    pub fn start(out: W, head: &impl Serialize, style: Style) -> Self {
        let mut doc = Document {
            out,
            style,
            systems: 0,
            failed: None,
        };
        doc.put("{");
        let head = style.members(head);
        if !head.is_empty() {
            doc.put(&format!("{}{head},", style.line(0)));
        }
        let colon = if style == Style::Pretty { ": " } else { ":" };
        doc.put(&format!("{}\"systems\"{colon}[", style.line(1)));
        doc
    }

    fn put(&mut self, text: &str) {
        if self.failed.is_none() {
            self.failed = self.out.write_all(text.as_bytes()).err();
        }
    }

    /// One element of `systems`, already printed on its own in the document's style
    /// ([`Style::render`]).
    pub fn system(&mut self, system: &str) {
        let sep = if self.systems == 0 { "" } else { "," };
        self.systems += 1;
        let text = match self.style {
            Style::Pretty => nested(system, 2),
            Style::Compact => system.to_string(),
        };
        self.put(&format!("{sep}{}{text}", self.style.line(2)));
    }

    /// Closes `systems`, writes the members after it, and says whether every write worked.
    pub fn finish(mut self, tail: &impl Serialize) -> std::io::Result<()> {
        if self.systems > 0 {
            let line = self.style.line(1);
            self.put(&line);
        }
        self.put("]");
        let tail = self.style.members(tail);
        if !tail.is_empty() {
            let line = self.style.line(0);
            self.put(&format!(",{line}{tail}"));
        }
        let line = self.style.line(0);
        self.put(&format!("{line}}}\n"));
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
    fn streamed_document_equals_printing_it_whole_in_either_style() {
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
        for style in [Style::Pretty, Style::Compact] {
            for (head, tail, n) in (0..=systems.len())
                .map(|n| (&head, &tail, n))
                .chain([(&empty, &empty, 0), (&empty, &empty, 2)])
            {
                let mut buf = Vec::new();
                let mut doc = Document::start(&mut buf, &head, style);
                for s in systems.iter().take(n) {
                    doc.system(&style.render(s));
                }
                doc.finish(&tail).unwrap();
                let mut whole = head.as_object().unwrap().clone();
                whole.insert(
                    "systems".into(),
                    serde_json::Value::Array(systems.iter().take(n).cloned().collect()),
                );
                whole.extend(tail.as_object().unwrap().clone());
                let expected = format!("{}\n", style.render(&serde_json::Value::Object(whole)));
                assert_eq!(
                    String::from_utf8(buf).unwrap(),
                    expected,
                    "{style:?}, {n} systems, head {head}"
                );
            }
        }
    }
}
