#![allow(clippy::unwrap_used, clippy::indexing_slicing)]
//! Keep the documentation honest: every rule, quantity, unit and JSON field that the code
//! has must be documented, and the documented quantity ranges must be the code's.

use std::collections::BTreeSet;
use syzygy::ast::BodyKind;
use syzygy::diagnostic::Rule;

fn doc(name: &str) -> String {
    let path = format!("{}/../docs/{name}", env!("CARGO_MANIFEST_DIR"));
    std::fs::read_to_string(&path).unwrap_or_else(|e| panic!("cannot read {path}: {e}"))
}

/// The text of a markdown section: from its heading line to the next heading of the same
/// or a higher level.
fn section<'a>(text: &'a str, heading: &str) -> &'a str {
    let level = heading.chars().take_while(|c| *c == '#').count();
    let start = text
        .lines()
        .position(|l| l.trim_end() == heading)
        .unwrap_or_else(|| panic!("no heading `{heading}`"));
    let lines: Vec<&str> = text.lines().collect();
    let end = lines
        .iter()
        .enumerate()
        .skip(start + 1)
        .find(|(_, l)| {
            let n = l.chars().take_while(|c| *c == '#').count();
            n > 0 && n <= level && l.chars().nth(n) == Some(' ')
        })
        .map_or(lines.len(), |(i, _)| i);
    let from = lines[..start].iter().map(|l| l.len() + 1).sum::<usize>();
    let to = lines[..end].iter().map(|l| l.len() + 1).sum::<usize>();
    &text[from..to.min(text.len())]
}

/// The table row whose first cell is `` `name` ``.
fn row<'a>(text: &'a str, name: &str) -> Option<&'a str> {
    let start = format!("| `{name}` |");
    text.lines().find(|l| l.starts_with(&start))
}

#[test]
fn every_rule_has_a_section_with_its_default_severity() {
    let rules = doc("rules.md");
    let headings: BTreeSet<&str> = rules
        .lines()
        .filter_map(|l| l.strip_prefix("## "))
        .map(str::trim)
        .collect();
    let mut missing = Vec::new();
    for r in Rule::ALL {
        if !headings.contains(r.id()) {
            missing.push(r.id());
            continue;
        }
        let body = section(&rules, &format!("## {}", r.id()));
        let sev = format!("Default severity: **{}**.", r.default_severity().as_str());
        assert!(
            body.contains(&sev),
            "section `{}` of docs/rules.md does not say `{sev}`",
            r.id()
        );
    }
    assert!(
        missing.is_empty(),
        "docs/rules.md lacks sections for {missing:?}"
    );
    // And no section documents a rule the code does not have.
    let known: BTreeSet<&str> = Rule::ALL.iter().map(|r| r.id()).collect();
    for h in headings {
        if h.chars().all(|c| c.is_ascii_lowercase() || c == '-') {
            assert!(
                known.contains(h),
                "docs/rules.md documents unknown rule `{h}`"
            );
        }
    }
    for opt in ["--deny RULE", "--warn RULE", "--allow RULE"] {
        assert!(
            rules.contains(opt),
            "docs/rules.md does not explain `{opt}`"
        );
    }
}

#[test]
fn every_quantity_is_in_the_table_of_its_body_kind_with_the_codes_range() {
    let lang = doc("language.md");
    for (kind, heading) in [
        (BodyKind::Star, "### Star quantities"),
        (BodyKind::Planet, "### Planet quantities"),
    ] {
        let table = section(&lang, heading);
        for q in syzygy::quantities::table()
            .iter()
            .filter(|q| q.kind == kind)
        {
            let line = row(table, q.name).unwrap_or_else(|| {
                panic!("docs/language.md `{heading}` has no row for `{}`", q.name)
            });
            assert!(
                line.contains(&format!("| {} |", q.range_text())),
                "row of `{}` in `{heading}` does not give the range `{}`: {line}",
                q.name,
                q.range_text()
            );
            for alias in q.aliases {
                assert!(
                    line.contains(&format!("`{alias}`")),
                    "row of `{}` in `{heading}` lacks the alias `{alias}`",
                    q.name
                );
            }
            if !q.text {
                assert!(
                    line.contains(&format!("| {} |", q.display)),
                    "row of `{}` in `{heading}` lacks the display unit `{}`",
                    q.name,
                    q.display
                );
            }
        }
    }
}

#[test]
fn every_unit_symbol_and_alias_is_in_the_unit_table() {
    let lang = doc("language.md");
    let table = section(&lang, "## Units");
    for u in syzygy::units::all_units() {
        let line = row(table, u.symbol)
            .unwrap_or_else(|| panic!("docs/language.md has no unit row for `{}`", u.symbol));
        for alias in u.aliases.iter().filter(|a| **a != u.symbol) {
            assert!(
                line.contains(&format!("`{alias}`")),
                "unit row of `{}` lacks the alias `{alias}`",
                u.symbol
            );
        }
        let prefixes = if u.prefixes { "| yes |" } else { "| no |" };
        assert!(
            line.contains(prefixes),
            "unit row of `{}` should say `{prefixes}` in the prefixes column",
            u.symbol
        );
    }
}

/// Every key of a JSON value, recursively, except the keys of maps whose keys are data
/// (quantity names, composition classes).
fn keys(v: &serde_json::Value, out: &mut BTreeSet<String>) {
    match v {
        serde_json::Value::Object(m) => {
            for (k, child) in m {
                out.insert(k.clone());
                if k == "quantities" || k == "probabilities" {
                    if let serde_json::Value::Object(inner) = child {
                        for q in inner.values() {
                            keys(q, out);
                        }
                    }
                } else {
                    keys(child, out);
                }
            }
        }
        serde_json::Value::Array(a) => a.iter().for_each(|x| keys(x, out)),
        _ => {}
    }
}

#[test]
fn json_doc_mentions_every_field_of_the_real_eval_output() {
    let path = format!("{}/../examples/veyra.syz", env!("CARGO_MANIFEST_DIR"));
    let text = std::fs::read_to_string(&path).unwrap();
    let mut db = syzygy::source::MemoryDb::new();
    let file = db.add("examples/veyra.syz", text.clone());
    // The CLI default (Monte Carlo), with fewer samples to keep the test quick.
    let options = syzygy::Options {
        samples: 1000,
        ..syzygy::Options::default()
    };
    let analysis = syzygy::analyze(file, &text, &options.clone().into());
    let systems = serde_json::to_value(syzygy::report::systems_json(&analysis, &db)).unwrap();
    assert!(
        systems.as_array().is_some_and(|s| !s.is_empty()),
        "veyra.syz has no system"
    );

    let mut found = BTreeSet::new();
    keys(&systems, &mut found);
    // The walk must reach inside quantity objects, or this test would prove little.
    for must in [
        "value",
        "unit",
        "si",
        "origin",
        "rule",
        "inputs",
        "budget",
        "assumptions",
    ] {
        assert!(
            found.contains(must),
            "the eval JSON has no `{must}`; walk is broken"
        );
    }
    let json_doc = doc("json-output.md");
    let missing: Vec<&String> = found
        .iter()
        .filter(|k| !json_doc.contains(&format!("`{k}`")))
        .collect();
    assert!(
        missing.is_empty(),
        "docs/json-output.md does not mention these eval JSON fields: {missing:?}"
    );
    // The members around the systems (`systems` itself is written by the CLI's streaming
    // writer), of `check`'s document, and the diagnostic fields.
    use syzygy::report::json;
    let head = json::EvalHead {
        version: syzygy::report::JSON_VERSION,
        options: json::Options::new(&options),
    };
    let not_shown = [json::NotShown {
        file: "a.syz".to_string(),
        count: 1,
    }];
    let tail = json::EvalTail {
        diagnostics: &[],
        diagnostics_not_shown: &not_shown,
        io_errors: &[],
    };
    let check = json::CheckDocument {
        version: syzygy::report::JSON_VERSION,
        files: 1,
        diagnostics: &[],
        diagnostics_not_shown: &not_shown,
        io_errors: &[],
        summary: json::Summary {
            errors: 0,
            warnings: 0,
            notes: 0,
            rules: json::Pairs(Vec::new()),
            // Not zero, so that the key is written and looked for in the page.
            not_used_silenced: 1,
        },
    };
    let mut around = BTreeSet::from(["systems".to_string()]);
    for v in [
        serde_json::to_value(&head).unwrap(),
        serde_json::to_value(&tail).unwrap(),
        serde_json::to_value(&check).unwrap(),
    ] {
        keys(&v, &mut around);
    }
    assert!(around.contains("consistency_sigma") && around.contains("summary"));
    for k in &around {
        assert!(
            json_doc.contains(&format!("`{k}`")),
            "docs/json-output.md lacks `{k}`"
        );
    }
    let mut diag_keys = BTreeSet::new();
    let span = syzygy::source::Span::new(file, 0, 3);
    let d = syzygy::diagnostic::Diagnostic::new(Rule::Syntax, span, "x")
        .with_label(span, "y")
        .with_note("z")
        .with_help("w");
    let places = syzygy::source::Places::new(&db, file);
    let d = syzygy::report::json::Diagnostic::new(&d, &places);
    keys(&serde_json::to_value(d).unwrap(), &mut diag_keys);
    for k in &diag_keys {
        assert!(
            section(&json_doc, "## Diagnostic").contains(&format!("`{k}`")),
            "the Diagnostic section of docs/json-output.md lacks `{k}`"
        );
    }
    assert!(
        json_doc.contains(&format!("version {}", syzygy::report::JSON_VERSION))
            || json_doc.contains(&format!("version **{}**", syzygy::report::JSON_VERSION)),
        "docs/json-output.md does not state the current version"
    );
}
