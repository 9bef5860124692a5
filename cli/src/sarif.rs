//! `syz check --format sarif`: the diagnostics as a SARIF 2.1.0 log (the OASIS standard read
//! by code-review tools). Built from the documented JSON form of each diagnostic, so the
//! positions follow the same conventions: 1-based lines, columns counted in characters
//! (declared as `columnKind` "unicodeCodePoints"), end column exclusive.

use serde_json::{json, Value};
use syzygy::diagnostic::Rule;

const SCHEMA: &str =
    "https://docs.oasis-open.org/sarif/sarif/v2.1.0/errata01/os/schemas/sarif-schema-2.1.0.json";

fn level(severity: &str) -> &'static str {
    match severity {
        "error" => "error",
        "warning" => "warning",
        _ => "note",
    }
}

/// A relative URI reference for a path as given (forward slashes, reserved characters
/// percent-encoded); an absolute path becomes a `file://` URI.
pub fn uri(path: &str) -> String {
    let path = path.replace('\\', "/");
    let mut out = String::new();
    for c in path.chars() {
        match c {
            'A'..='Z' | 'a'..='z' | '0'..='9' | '-' | '.' | '_' | '~' | '/' => out.push(c),
            _ => {
                let mut buf = [0u8; 4];
                for b in c.encode_utf8(&mut buf).bytes() {
                    out.push_str(&format!("%{b:02X}"));
                }
            }
        }
    }
    let out = out.strip_prefix("./").map(str::to_string).unwrap_or(out);
    if out.starts_with('/') {
        format!("file://{out}")
    } else {
        out
    }
}

fn rules() -> Vec<Value> {
    Rule::ALL
        .iter()
        .map(|r| {
            let text = syzygy::rule_docs::help_text(*r).unwrap_or_else(|| r.summary().into());
            let md = syzygy::rule_docs::help_markdown(*r).unwrap_or(r.summary());
            json!({
                "id": r.id(),
                "shortDescription": { "text": r.summary() },
                "fullDescription": { "text": text },
                "help": { "text": text, "markdown": md },
                "defaultConfiguration": { "level": level(r.default_severity().as_str()) },
            })
        })
        .collect()
}

fn field<'a>(v: &'a Value, key: &str) -> &'a Value {
    v.get(key).unwrap_or(&Value::Null)
}

fn text<'a>(v: &'a Value, key: &str) -> &'a str {
    field(v, key).as_str().unwrap_or("")
}

fn result(d: &Value) -> Value {
    let rule_id = text(d, "rule");
    let mut message = text(d, "message").to_string();
    if let Some(h) = field(d, "help").as_str() {
        message.push_str("\nhelp: ");
        message.push_str(h);
    }
    let primary = json!({
        "physicalLocation": {
            "artifactLocation": { "uri": uri(text(d, "file")) },
            "region": {
                "startLine": field(d, "line"),
                "startColumn": field(d, "column"),
                "endLine": field(d, "end_line"),
                "endColumn": field(d, "end_column"),
            },
        }
    });
    let related: Vec<Value> = field(d, "labels")
        .as_array()
        .map(|ls| {
            ls.iter()
                .enumerate()
                .map(|(i, l)| {
                    json!({
                        "id": i,
                        "message": { "text": text(l, "message") },
                        "physicalLocation": {
                            "artifactLocation": { "uri": uri(text(l, "file")) },
                            "region": {
                                "startLine": field(l, "line"),
                                "startColumn": field(l, "column"),
                            },
                        },
                    })
                })
                .collect()
        })
        .unwrap_or_default();
    let mut r = serde_json::Map::new();
    r.insert("ruleId".into(), json!(rule_id));
    if let Some(i) = Rule::ALL.iter().position(|r| r.id() == rule_id) {
        r.insert("ruleIndex".into(), json!(i));
    }
    r.insert("level".into(), json!(level(text(d, "severity"))));
    r.insert("message".into(), json!({ "text": message }));
    r.insert("locations".into(), json!([primary]));
    if !related.is_empty() {
        r.insert("relatedLocations".into(), json!(related));
    }
    Value::Object(r)
}

/// The whole log: one run, every rule in `tool.driver.rules`, one result per diagnostic;
/// unreadable paths become tool execution notifications.
pub fn log(diagnostics: &[Value], io_errors: &[String]) -> Value {
    let notifications: Vec<Value> = io_errors
        .iter()
        .map(|e| json!({ "level": "error", "message": { "text": e } }))
        .collect();
    json!({
        "$schema": SCHEMA,
        "version": "2.1.0",
        "runs": [{
            "tool": { "driver": {
                "name": "syz",
                "version": env!("CARGO_PKG_VERSION"),
                "rules": rules(),
            }},
            "columnKind": "unicodeCodePoints",
            "invocations": [{
                "executionSuccessful": io_errors.is_empty(),
                "toolExecutionNotifications": notifications,
            }],
            "results": diagnostics.iter().map(result).collect::<Vec<_>>(),
        }],
    })
}

/// Add one tool execution notification at level `note` per line (a file whose diagnostics
/// were not all reported, `syzygy::shown`).
pub fn add_notes(log: &mut Value, lines: &[String]) {
    let Some(list) = log
        .pointer_mut("/runs/0/invocations/0/toolExecutionNotifications")
        .and_then(Value::as_array_mut)
    else {
        return;
    };
    list.extend(
        lines
            .iter()
            .map(|l| json!({ "level": "note", "message": { "text": l } })),
    );
}

#[cfg(test)]
mod tests {
    use super::uri;

    #[test]
    fn uris_are_relative_and_encoded() {
        assert_eq!(uri("examples/veyra.syz"), "examples/veyra.syz");
        assert_eq!(uri("./a b/c#1.syz"), "a%20b/c%231.syz");
        assert_eq!(uri("/tmp/x.syz"), "file:///tmp/x.syz");
        assert_eq!(uri("é.syz"), "%C3%A9.syz");
    }
}
