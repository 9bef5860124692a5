//! `syz eval --format votable`: checked against an outside reader and for well-formedness.
//!
//! `tests/reference/examples.vot` is the document `syz` writes for the examples, and
//! `tests/reference/examples.vot.json` is what astropy's VOTable parser (a general-purpose
//! library, run by the committed script `tests/reference/read_votable.py`) found in it: each
//! FIELD's unit and that unit's size in SI, and every cell. The tests check that the document
//! `syz` writes today is still that one, and that the values astropy read, times the units
//! astropy understood, are `syz`'s own SI values.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use syzygy_e2e::{root, run, scratch, stdout};

/// The command whose output astropy read (run from the repository's root).
const ARGS: &[&str] = &[
    "eval",
    "--format",
    "votable",
    "--propagation",
    "linear",
    "examples/corvane.syz",
    "examples/halvard.syz",
    "examples/veyra.syz",
];

#[test]
fn the_examples_export_is_the_document_astropy_read() {
    let o = run(ARGS);
    assert_eq!(o.status.code(), Some(0), "{}", syzygy_e2e::stderr(&o));
    let recorded = std::fs::read_to_string(root().join("tests/reference/examples.vot")).unwrap();
    assert!(
        stdout(&o) == recorded,
        "the VOTable export changed: check the change, then record it again and have astropy read it:\n  \
         syz {} > tests/reference/examples.vot\n  \
         python3 tests/reference/read_votable.py tests/reference/examples.vot > tests/reference/examples.vot.json",
        ARGS.join(" ")
    );
}

#[test]
fn astropy_finds_our_units_and_values() {
    let record: serde_json::Value = serde_json::from_str(
        &std::fs::read_to_string(root().join("tests/reference/examples.vot.json")).unwrap(),
    )
    .unwrap();
    assert_eq!(
        record["warnings"].as_array().unwrap().len(),
        0,
        "{}",
        record["warnings"]
    );
    let planets = &record["tables"][0];
    assert_eq!(planets["name"], "planets");
    let fields = planets["fields"].as_array().unwrap();
    let index = |n: &str| fields.iter().position(|f| f["name"] == n).unwrap();

    let json_args: Vec<&str> = ARGS
        .iter()
        .map(|a| if *a == "votable" { "json" } else { a })
        .collect();
    let j: serde_json::Value = serde_json::from_slice(&run(&json_args).stdout).unwrap();
    let mut compared = 0;
    for row in planets["rows"].as_array().unwrap() {
        let cell = |n: &str| row[index(n)].as_str().unwrap_or("").to_string();
        let sys = j["systems"]
            .as_array()
            .unwrap()
            .iter()
            .find(|s| s["name"] == cell("system").as_str() && s["file"] == cell("file").as_str())
            .unwrap();
        let body = |id: &str| {
            sys["bodies"]
                .as_array()
                .unwrap()
                .iter()
                .find(|b| b["id"] == id)
                .cloned()
        };
        for (k, f) in fields.iter().enumerate() {
            let name = f["name"].as_str().unwrap();
            if f["datatype"] != "double" {
                continue;
            }
            let Some(v) = row[k].as_f64() else { continue };
            let (who, rest) = match name.strip_prefix("host.") {
                Some(rest) => (cell("host"), rest),
                None => (cell("planet"), name),
            };
            let (quantity, part) = match rest.rsplit_once('.') {
                Some((q, p)) => (q, p),
                None => (rest, "value"),
            };
            let b = body(&who).unwrap_or_else(|| panic!("no body {who} for {name}"));
            let si = &b["quantities"][quantity]["si"][part];
            let expected = si.as_f64().unwrap_or_else(|| panic!("{who}.{name}: {si}"));
            // A FIELD without a unit holds a plain number (a fraction, a dex value).
            let scale = f["si"].as_f64().unwrap_or(1.0);
            let got = v * scale;
            let tol = 1e-12 * expected.abs().max(1e-300) + 1e-300;
            assert!(
                (got - expected).abs() <= tol.max(1e-14 * got.abs()),
                "{who}.{name}: astropy read {v} {} = {got} SI, syz says {expected}",
                f["unit"]
            );
            compared += 1;
        }
    }
    assert!(compared > 150, "only {compared} values compared");
}

/// The document parsed by a plain XML reader: one FIELD per TD in every row, text escaped.
#[test]
fn votable_is_well_formed_with_hostile_text_and_errors() {
    let dir = scratch("votable-hostile");
    let path = dir.join("odd.syz");
    std::fs::write(
        &path,
        "ref w \"Smith & Jones <2020> \\\"quoted\\\"\"\n\
         system \"A&B <x>\" {\n  star s {\n    mass = 1 Msun [w]\n    radius = 1 Rsun\n  }\n  \
         planet b orbits s {\n    period = 3 d [w]\n    mass = -1 Mjup\n  }\n  \
         star lone {\n    teff = 5000 K\n  }\n}\n",
    )
    .unwrap();
    let o = run(&["eval", "--format", "votable", path.to_str().unwrap()]);
    assert_eq!(o.status.code(), Some(1), "a negative mass is an error");
    assert!(
        syzygy_e2e::stderr(&o).contains("mass") && !syzygy_e2e::stderr(&o).contains("[syntax]"),
        "{}",
        syzygy_e2e::stderr(&o)
    );
    let text = stdout(&o);
    let doc = roxmltree::Document::parse(&text).unwrap_or_else(|e| panic!("{e}\n{text}"));
    let root_el = doc.root_element();
    assert_eq!(root_el.tag_name().name(), "VOTABLE");
    assert_eq!(root_el.attribute("version"), Some("1.4"));
    assert_eq!(
        root_el.tag_name().namespace(),
        Some("http://www.ivoa.net/xml/VOTable/v1.3")
    );
    let tables: Vec<_> = doc
        .descendants()
        .filter(|n| n.has_tag_name("TABLE"))
        .collect();
    assert_eq!(tables.len(), 2);
    for t in &tables {
        let fields = t.children().filter(|n| n.has_tag_name("FIELD")).count();
        let rows: Vec<_> = t.descendants().filter(|n| n.has_tag_name("TR")).collect();
        assert!(!rows.is_empty());
        for r in rows {
            assert_eq!(
                r.children().filter(|n| n.has_tag_name("TD")).count(),
                fields
            );
        }
    }
    // The system name and the reference come back exactly as written.
    assert!(doc.descendants().any(|n| n.text() == Some("A&B <x>")));
    assert!(doc
        .descendants()
        .any(|n| n.text() == Some("Smith & Jones <2020> \"quoted\"")));
    // The star no planet orbits has its own row.
    let planets = tables[0];
    assert!(planets
        .descendants()
        .filter(|n| n.has_tag_name("TR"))
        .any(|r| r.children().nth(3).and_then(|td| td.text()) == Some("lone")));
    // The errors are noted in the document too.
    assert!(doc
        .descendants()
        .any(|n| n.has_tag_name("INFO") && n.attribute("name") == Some("diagnostics")));
}

/// The table of declared values declares its numeric columns as numbers and its text columns
/// as text (`value` was declared as text and `text` as a number, one column off).
#[test]
fn the_table_of_declared_values_declares_each_column_with_its_type() {
    let o = run(&[
        "eval",
        "--format",
        "votable",
        "--table",
        "sources",
        "examples/veyra.syz",
    ]);
    let doc = stdout(&o);
    let datatype = |name: &str| -> String {
        let at = doc
            .find(&format!("<FIELD name=\"{name}\""))
            .unwrap_or_else(|| panic!("no FIELD {name}"));
        let rest = &doc[at..];
        let start = rest.find("datatype=\"").unwrap() + "datatype=\"".len();
        rest[start..start + rest[start..].find('"').unwrap()].to_string()
    };
    for numeric in ["value", "below", "above", "line"] {
        assert_eq!(datatype(numeric), "double", "{numeric}");
    }
    for text in ["file", "system", "quantity", "text", "unit", "used"] {
        assert_eq!(datatype(text), "unicodeChar", "{text}");
    }
}
