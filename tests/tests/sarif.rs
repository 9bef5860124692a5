//! `syz check --format sarif`: the log is valid SARIF 2.1.0, checked against the OASIS schema
//! committed in `tests/reference/sarif-schema-2.1.0.json` (see the README there) by the
//! `jsonschema` crate, in every environment; and it carries the right rules, positions,
//! labels, notes and help.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use serde_json::Value;
use syzygy_e2e::{root, run, stderr};

/// The `id` of the OASIS schema of SARIF 2.1.0 with its first errata, and the URI each log
/// names as its `$schema`.
const SCHEMA_ID: &str =
    "https://docs.oasis-open.org/sarif/sarif/v2.1.0/errata01/os/schemas/sarif-schema-2.1.0.json";

fn validator() -> jsonschema::Validator {
    let path = root().join("tests/reference/sarif-schema-2.1.0.json");
    let text = std::fs::read_to_string(&path).unwrap();
    let schema: Value = serde_json::from_str(&text).unwrap();
    assert_eq!(schema["id"], SCHEMA_ID, "not the OASIS schema: {path:?}");
    assert_eq!(schema["$schema"], "http://json-schema.org/draft-04/schema#");
    jsonschema::options()
        .with_draft(jsonschema::Draft::Draft4)
        .should_validate_formats(true)
        .build(&schema)
        .unwrap()
}

/// Every schema violation of a log, as `instance path: message`.
fn violations(v: &jsonschema::Validator, log: &Value) -> Vec<String> {
    v.iter_errors(log)
        .map(|e| format!("{}: {e}", e.instance_path()))
        .collect()
}

fn sarif(args: &[&str]) -> (Option<i32>, Value) {
    let mut full = vec!["check", "--format", "sarif", "--propagation", "linear"];
    full.extend(args);
    let o = run(&full);
    let v = serde_json::from_slice(&o.stdout)
        .unwrap_or_else(|e| panic!("not JSON ({e}): {}", stderr(&o)));
    (o.status.code(), v)
}

#[test]
fn sarif_log_has_rules_results_and_positions() {
    let json = run(&[
        "check",
        "--format",
        "json",
        "--propagation",
        "linear",
        "examples/broken",
    ]);
    let json: Value = serde_json::from_slice(&json.stdout).unwrap();
    let (code, v) = sarif(&["examples/broken"]);
    assert_eq!(code, Some(1));
    assert_eq!(v["version"], "2.1.0");
    assert_eq!(v["$schema"], SCHEMA_ID);
    let run0 = &v["runs"][0];
    assert_eq!(run0["columnKind"], "unicodeCodePoints");
    let rules = run0["tool"]["driver"]["rules"].as_array().unwrap();
    let unit = rules.iter().find(|r| r["id"] == "unit-mismatch").unwrap();
    assert_eq!(
        unit["shortDescription"]["text"],
        "A value or expression has the wrong physical dimension."
    );
    assert!(!unit["help"]["text"].as_str().unwrap().is_empty());
    let results = run0["results"].as_array().unwrap();
    let diags = json["diagnostics"].as_array().unwrap();
    assert_eq!(results.len(), diags.len());
    let (mut with_labels, mut with_notes, mut with_help) = (0, 0, 0);
    for (r, d) in results.iter().zip(diags) {
        assert_eq!(r["ruleId"], d["rule"]);
        assert_eq!(
            rules[r["ruleIndex"].as_u64().unwrap() as usize]["id"],
            d["rule"]
        );
        let region = &r["locations"][0]["physicalLocation"]["region"];
        assert_eq!(region["startLine"], d["line"]);
        assert_eq!(region["startColumn"], d["column"]);
        assert_eq!(region["endLine"], d["end_line"]);
        assert_eq!(region["endColumn"], d["end_column"]);
        let uri = r["locations"][0]["physicalLocation"]["artifactLocation"]["uri"]
            .as_str()
            .unwrap();
        assert!(uri.starts_with("examples/broken/"), "{uri}");
        assert_eq!(r["level"], d["severity"]);
        // Labels are related locations, with their messages and starts.
        let labels = d["labels"].as_array().unwrap();
        let related = r["relatedLocations"].as_array().map_or(&[][..], |a| a);
        assert_eq!(related.len(), labels.len());
        for (i, (rel, l)) in related.iter().zip(labels).enumerate() {
            assert_eq!(rel["id"], i);
            assert_eq!(rel["message"]["text"], l["message"]);
            let region = &rel["physicalLocation"]["region"];
            assert_eq!(region["startLine"], l["line"]);
            assert_eq!(region["startColumn"], l["column"]);
        }
        // Notes and help are kept: after the message, and in the properties.
        let text = r["message"]["text"].as_str().unwrap();
        assert!(text.starts_with(d["message"].as_str().unwrap()), "{text}");
        for (i, n) in d["notes"].as_array().unwrap().iter().enumerate() {
            let n = n.as_str().unwrap();
            assert!(text.contains(&format!("\nnote: {n}")), "{text}");
            assert_eq!(r["properties"]["notes"][i], n);
        }
        if let Some(h) = d["help"].as_str() {
            assert!(text.ends_with(&format!("\nhelp: {h}")), "{text}");
            assert_eq!(r["properties"]["help"], h);
            assert!(r["message"]["markdown"].is_string());
        }
        with_labels += usize::from(!labels.is_empty());
        with_notes += usize::from(!d["notes"].as_array().unwrap().is_empty());
        with_help += usize::from(d["help"].is_string());
    }
    // The demos exercise all three, or the loop above proved little.
    assert!(with_labels > 0 && with_notes > 0 && with_help > 0);
}

#[test]
fn sarif_logs_are_valid_against_the_oasis_schema() {
    let v = validator();
    for (args, code) in [
        (vec!["examples/broken"], Some(1)),
        (vec!["examples/veyra.syz"], Some(0)),
        (vec!["tests/fixtures/check"], Some(1)),
        (vec!["examples/veyra.syz", "no/such.syz"], Some(2)),
    ] {
        let (got, log) = sarif(&args);
        assert_eq!(got, code, "{args:?}");
        let bad = violations(&v, &log);
        assert!(
            bad.is_empty(),
            "{args:?} is not valid SARIF 2.1.0:\n{bad:#?}"
        );
    }
}

/// The validation can fail: each deliberate break of a real log is caught, at the place
/// broken.
#[test]
fn the_schema_check_rejects_broken_logs() {
    let v = validator();
    let (_, log) = sarif(&["examples/broken"]);
    assert!(violations(&v, &log).is_empty());
    // Where a log is broken (a JSON pointer), and how.
    type Break = (&'static str, fn(&mut Value));
    let breaks: [Break; 6] = [
        ("", |l| {
            l.as_object_mut().unwrap().remove("version");
        }),
        ("/runs/0/results/0/level", |l| {
            l["runs"][0]["results"][0]["level"] = "fatal".into();
        }),
        (
            "/runs/0/results/0/locations/0/physicalLocation/region/startLine",
            |l| {
                l["runs"][0]["results"][0]["locations"][0]["physicalLocation"]["region"]
                    ["startLine"] = 0.into();
            },
        ),
        ("/runs/0/results/0", |l| {
            l["runs"][0]["results"][0]["severity"] = "error".into();
        }),
        ("/runs/0/tool/driver", |l| {
            l["runs"][0]["tool"]["driver"]
                .as_object_mut()
                .unwrap()
                .remove("name");
        }),
        // Formats are checked too (`uri`, a format of draft 4).
        ("/$schema", |l| {
            l["$schema"] = "not a uri".into();
        }),
    ];
    for (place, break_it) in breaks {
        let mut broken = log.clone();
        break_it(&mut broken);
        let bad = violations(&v, &broken);
        assert!(
            bad.iter().any(|e| e.starts_with(&format!("{place}: "))),
            "a log broken at `{place}` passed: {bad:#?}"
        );
    }
}

/// A declaration refused by a silenced rule is a suppressed result (§3.27.23), `inSource`
/// for a silencing comment and `external` for `--allow`, and the log stays valid; the check
/// still passes (invented system).
#[test]
fn silenced_refusals_are_suppressed_results() {
    let dir = syzygy_e2e::scratch("sarif-suppressed");
    let file = dir.join("tessaly.syz");
    std::fs::write(
        &file,
        "system \"Tessaly\" {\n  star tess { mass = 0.9 ± 0.03 Msun }\n  planet b orbits tess {\n    period = 7.3 ± 0.01 d\n    eccentricity = 1.3\n    rv_amplitude = 30 ± 3 km # allow(unit-mismatch): kept as published\n  }\n}\n",
    )
    .unwrap();
    let (code, log) = sarif(&["--allow", "out-of-range", file.to_str().unwrap()]);
    assert_eq!(code, Some(0));
    assert!(violations(&validator(), &log).is_empty(), "{log}");
    let results = log["runs"][0]["results"].as_array().unwrap();
    let kinds: Vec<(String, String)> = results
        .iter()
        .map(|r| {
            (
                r["ruleId"].as_str().unwrap().to_string(),
                r["suppressions"][0]["kind"].as_str().unwrap().to_string(),
            )
        })
        .collect();
    assert_eq!(
        kinds,
        [
            ("out-of-range".to_string(), "external".to_string()),
            ("unit-mismatch".to_string(), "inSource".to_string())
        ]
    );
    assert_eq!(
        results[0]["locations"][0]["physicalLocation"]["region"]["startLine"],
        5
    );
}
