//! `syz check --format sarif`: the diagnostics as a SARIF 2.1.0 log (the OASIS standard read
//! by code-review tools), built from each [`Diagnostic`] directly, with typed structs named
//! after the standard's objects. Positions follow the JSON output's conventions (the same
//! [`Places`]): 1-based lines, columns counted in characters (declared as `columnKind`
//! "unicodeCodePoints"), end column exclusive.
//!
//! Severity maps one to one: error → `error`, warning → `warning`, note → `note`, after
//! severity overrides; `kind` is left out, so it is "fail" (a problem of that level). Every
//! result has its primary location; labels are `relatedLocations` with their messages;
//! notes and help follow the message (plain lines in `message.text`, a list in
//! `message.markdown`) and are also in the result's `properties`.

use serde::Serialize;
use syzygy::diagnostic::{Diagnostic, Rule, Severity};
use syzygy::source::{Places, Span};

const SCHEMA: &str =
    "https://docs.oasis-open.org/sarif/sarif/v2.1.0/errata01/os/schemas/sarif-schema-2.1.0.json";

/// The severity mapping of the module documentation.
fn level(severity: Severity) -> &'static str {
    match severity {
        Severity::Error => "error",
        Severity::Warning => "warning",
        Severity::Note => "note",
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

/// Text for people, with an optional GitHub-flavoured Markdown form (SARIF §3.11: when
/// `markdown` is present, `text` is too, and says the same in plain text).
#[derive(Debug, Serialize)]
pub struct Message {
    text: String,
    #[serde(skip_serializing_if = "Option::is_none")]
    markdown: Option<String>,
}

impl Message {
    fn plain(text: impl Into<String>) -> Message {
        Message {
            text: text.into(),
            markdown: None,
        }
    }
}

#[derive(Debug, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct Log<'a> {
    #[serde(rename = "$schema")]
    schema: &'static str,
    version: &'static str,
    runs: [Run<'a>; 1],
}

#[derive(Debug, Serialize)]
#[serde(rename_all = "camelCase")]
struct Run<'a> {
    tool: Tool,
    column_kind: &'static str,
    invocations: [Invocation; 1],
    results: &'a [SarifResult],
}

#[derive(Debug, Serialize)]
struct Tool {
    driver: Driver,
}

#[derive(Debug, Serialize)]
struct Driver {
    name: &'static str,
    version: &'static str,
    rules: Vec<ReportingDescriptor>,
}

/// A rule's metadata, from the rule table and its section of `docs/rules.md`.
#[derive(Debug, Serialize)]
#[serde(rename_all = "camelCase")]
struct ReportingDescriptor {
    id: Rule,
    short_description: Message,
    full_description: Message,
    help: Message,
    default_configuration: Configuration,
}

#[derive(Debug, Serialize)]
struct Configuration {
    level: &'static str,
}

#[derive(Debug, Serialize)]
#[serde(rename_all = "camelCase")]
struct Invocation {
    execution_successful: bool,
    tool_execution_notifications: Vec<Notification>,
}

#[derive(Debug, Serialize)]
struct Notification {
    level: &'static str,
    message: Message,
}

/// One diagnostic as a SARIF `result`.
#[derive(Debug, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct SarifResult {
    rule_id: Rule,
    rule_index: usize,
    level: &'static str,
    message: Message,
    locations: [Location; 1],
    #[serde(skip_serializing_if = "Vec::is_empty")]
    related_locations: Vec<Location>,
    #[serde(skip_serializing_if = "Option::is_none")]
    properties: Option<Properties>,
    /// For a finding that is silenced (SARIF 2.1.0 §3.27.23): how.
    #[serde(skip_serializing_if = "Option::is_none")]
    suppressions: Option<[Suppression; 1]>,
}

/// A suppression (§3.35): `inSource` for a silencing comment, `external` for `--allow` or
/// the project file.
#[derive(Debug, Serialize)]
struct Suppression {
    kind: &'static str,
}

#[derive(Debug, Serialize)]
#[serde(rename_all = "camelCase")]
struct Location {
    /// Related locations only: unique within the result (§3.28.2).
    #[serde(skip_serializing_if = "Option::is_none")]
    id: Option<usize>,
    physical_location: PhysicalLocation,
    #[serde(skip_serializing_if = "Option::is_none")]
    message: Option<Message>,
}

#[derive(Debug, Serialize)]
#[serde(rename_all = "camelCase")]
struct PhysicalLocation {
    artifact_location: ArtifactLocation,
    region: Region,
}

#[derive(Debug, Serialize)]
struct ArtifactLocation {
    uri: String,
}

#[derive(Debug, Serialize)]
#[serde(rename_all = "camelCase")]
struct Region {
    start_line: u32,
    start_column: u32,
    end_line: u32,
    end_column: u32,
}

/// The diagnostic's notes and help, for tools that read them apart from the message.
#[derive(Debug, Serialize)]
struct Properties {
    #[serde(skip_serializing_if = "Vec::is_empty")]
    notes: Vec<String>,
    #[serde(skip_serializing_if = "Option::is_none")]
    help: Option<String>,
}

fn physical(places: &Places, span: Span) -> PhysicalLocation {
    let (file, start, end) = places.of(span);
    PhysicalLocation {
        artifact_location: ArtifactLocation { uri: uri(file) },
        region: Region {
            start_line: start.line,
            start_column: start.column,
            end_line: end.line,
            end_column: end.column,
        },
    }
}

/// Text that Markdown shows as it is: a backslash before each character that could start
/// inline syntax (code, emphasis, links, HTML, entities, tables, strikethrough) and before
/// a block marker at the start of a line (heading, quote, list item, underline), so that a
/// message with `*`, `_` or `[..](..)` in it is not rendered as something else.
fn escape_markdown(text: &str) -> String {
    let mut out = String::with_capacity(text.len() + 8);
    for (i, line) in text.split('\n').enumerate() {
        if i > 0 {
            out.push('\n');
        }
        let rest = line.trim_start();
        let indent = line.len() - rest.len();
        let digits = rest.bytes().take_while(u8::is_ascii_digit).count();
        for (j, c) in line.char_indices() {
            let inline = matches!(
                c,
                '\\' | '`' | '*' | '_' | '[' | ']' | '<' | '&' | '|' | '~'
            );
            let block = j == indent && matches!(c, '#' | '>' | '-' | '+' | '=');
            let numbered = digits > 0 && j == indent + digits && matches!(c, '.' | ')');
            if inline || block || numbered {
                out.push('\\');
            }
            out.push(c);
        }
    }
    out
}

/// The message with the notes and help after it: as plain lines, and (when there are any)
/// as a Markdown list.
fn message(d: &Diagnostic) -> Message {
    let extra: Vec<(&str, &str)> = d
        .notes
        .iter()
        .map(|n| ("note", n.as_str()))
        .chain(d.help.as_deref().map(|h| ("help", h)))
        .collect();
    if extra.is_empty() {
        return Message::plain(d.message.clone());
    }
    let mut text = d.message.clone();
    let mut markdown = format!("{}\n", escape_markdown(&d.message));
    for (what, line) in extra {
        text.push_str(&format!("\n{what}: {line}"));
        markdown.push_str(&format!("\n- *{what}:* {}", escape_markdown(line)));
    }
    Message {
        text,
        markdown: Some(markdown),
    }
}

/// One diagnostic as a result (made on the worker that analysed its file).
pub fn result(d: &Diagnostic, places: &Places) -> SarifResult {
    let related_locations = d
        .labels
        .iter()
        .enumerate()
        .map(|(i, l)| Location {
            id: Some(i),
            physical_location: physical(places, l.span),
            message: Some(Message::plain(l.message.clone())),
        })
        .collect();
    let properties = (!d.notes.is_empty() || d.help.is_some()).then(|| Properties {
        notes: d.notes.clone(),
        help: d.help.clone(),
    });
    SarifResult {
        rule_id: d.rule,
        rule_index: Rule::ALL.iter().position(|r| *r == d.rule).unwrap_or(0),
        level: level(d.severity),
        message: message(d),
        locations: [Location {
            id: None,
            physical_location: physical(places, d.span),
            message: None,
        }],
        related_locations,
        properties,
        suppressions: None,
    }
}

/// A declaration refused by a rule whose finding is silenced, as a suppressed result: a
/// code-scanning tool lists it as suppressed instead of the value vanishing from the log.
pub fn suppressed(u: &syzygy::unused::Unused, places: &Places) -> Option<SarifResult> {
    let rule = Rule::ALL.iter().copied().find(|r| Some(r.id()) == u.rule)?;
    Some(SarifResult {
        rule_id: rule,
        rule_index: Rule::ALL.iter().position(|r| *r == rule).unwrap_or(0),
        level: level(rule.default_severity()),
        message: Message::plain(format!("`{}` is not used: {}", u.text, u.why)),
        locations: [Location {
            id: None,
            physical_location: physical(places, u.span),
            message: None,
        }],
        related_locations: Vec::new(),
        properties: None,
        suppressions: Some([Suppression {
            kind: if u.in_source { "inSource" } else { "external" },
        }]),
    })
}

fn rules() -> Vec<ReportingDescriptor> {
    Rule::ALL
        .iter()
        .map(|r| {
            let text = syzygy::rule_docs::help_text(*r).unwrap_or_else(|| r.summary().into());
            let md = syzygy::rule_docs::help_markdown(*r).unwrap_or(r.summary());
            ReportingDescriptor {
                id: *r,
                short_description: Message::plain(r.summary()),
                full_description: Message::plain(text.clone()),
                help: Message {
                    text,
                    markdown: Some(md.to_string()),
                },
                default_configuration: Configuration {
                    level: level(r.default_severity()),
                },
            }
        })
        .collect()
}

/// The whole log: one run, every rule in `tool.driver.rules`, one result per diagnostic;
/// unreadable paths become tool execution notifications at level `error`, and each line of
/// `not_shown` (a file whose diagnostics were not all reported, `syzygy::shown`) one at level
/// `note`.
pub fn log<'a>(results: &'a [SarifResult], io_errors: &[String], not_shown: &[String]) -> Log<'a> {
    Log {
        schema: SCHEMA,
        version: "2.1.0",
        runs: [Run {
            tool: Tool {
                driver: Driver {
                    name: "syz",
                    version: env!("CARGO_PKG_VERSION"),
                    rules: rules(),
                },
            },
            column_kind: "unicodeCodePoints",
            invocations: [Invocation {
                execution_successful: io_errors.is_empty(),
                tool_execution_notifications: io_errors
                    .iter()
                    .map(|e| Notification {
                        level: "error",
                        message: Message::plain(e.clone()),
                    })
                    .chain(not_shown.iter().map(|l| Notification {
                        level: "note",
                        message: Message::plain(l.clone()),
                    }))
                    .collect(),
            }],
            results,
        }],
    }
}

#[cfg(test)]
#[allow(clippy::unwrap_used, clippy::indexing_slicing)]
mod tests {
    use super::*;
    use syzygy::source::{FileId, MemoryDb};

    #[test]
    fn uris_are_relative_and_encoded() {
        assert_eq!(uri("examples/veyra.syz"), "examples/veyra.syz");
        assert_eq!(uri("./a b/c#1.syz"), "a%20b/c%231.syz");
        assert_eq!(uri("/tmp/x.syz"), "file:///tmp/x.syz");
        assert_eq!(uri("é.syz"), "%C3%A9.syz");
    }

    #[test]
    fn markdown_escapes_inline_syntax_and_line_start_markers() {
        assert_eq!(
            escape_markdown("a_b <c> & `d` | ~e~ [f](0) 1. g - h"),
            "a\\_b \\<c> \\& \\`d\\` \\| \\~e\\~ \\[f\\](0) 1. g - h"
        );
        assert_eq!(
            escape_markdown("- x\n  # y\n12) z\n> q\n==="),
            "\\- x\n  \\# y\n12\\) z\n\\> q\n\\==="
        );
    }

    #[test]
    fn a_result_keeps_labels_notes_and_help() {
        let mut db = MemoryDb::new();
        let file = db.add("dir/a.syz", "let x = 1\nlet é_y = [2](0)\n");
        let places = Places::new(&db, file);
        let d = Diagnostic::new(
            Rule::Duplicate,
            Span::new(FileId(0), 14, 18),
            "'é_y' is [2](0) *twice*",
        )
        .with_label(Span::new(FileId(0), 4, 5), "first here")
        .with_note("a note")
        .with_help("remove one");
        let v = serde_json::to_value(result(&d, &places)).unwrap();
        assert_eq!(v["ruleId"], "duplicate");
        assert_eq!(v["level"], "error");
        let region = &v["locations"][0]["physicalLocation"]["region"];
        // Columns count characters: 'é' is two bytes, one column.
        assert_eq!(
            (
                &region["startLine"],
                &region["startColumn"],
                &region["endColumn"]
            ),
            (&2.into(), &5.into(), &8.into())
        );
        let related = &v["relatedLocations"][0];
        assert_eq!(related["id"], 0);
        assert_eq!(related["message"]["text"], "first here");
        assert_eq!(related["physicalLocation"]["region"]["startColumn"], 5);
        assert_eq!(
            related["physicalLocation"]["artifactLocation"]["uri"],
            "dir/a.syz"
        );
        assert_eq!(
            v["message"]["text"],
            "'é_y' is [2](0) *twice*\nnote: a note\nhelp: remove one"
        );
        assert_eq!(
            v["message"]["markdown"],
            "'é\\_y' is \\[2\\](0) \\*twice\\*\n\n- *note:* a note\n- *help:* remove one"
        );
        assert_eq!(v["properties"]["notes"][0], "a note");
        assert_eq!(v["properties"]["help"], "remove one");

        let bare = Diagnostic::new(Rule::Syntax, Span::new(FileId(0), 0, 3), "x");
        let v = serde_json::to_value(result(&bare, &places)).unwrap();
        assert_eq!(v["message"], serde_json::json!({"text": "x"}));
        assert!(v.get("relatedLocations").is_none() && v.get("properties").is_none());
    }
}
