//! `syz eval --format csv`: the table parses, has one row per body, and its numbers agree
//! with the JSON output converted to the documented fixed units.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use syzygy_e2e::{run, stdout};

/// A minimal CSV reader for the test (no quoting inside the fields we compare).
fn parse(text: &str) -> Vec<Vec<String>> {
    text.lines()
        .map(|l| {
            let mut fields = Vec::new();
            let mut cur = String::new();
            let mut quoted = false;
            for c in l.chars() {
                match c {
                    '"' => quoted = !quoted,
                    ',' if !quoted => fields.push(std::mem::take(&mut cur)),
                    _ => cur.push(c),
                }
            }
            fields.push(cur);
            fields
        })
        .collect()
}

#[test]
fn csv_has_a_row_per_body_in_fixed_units() {
    let args = ["--propagation", "linear", "examples/"];
    let o = run(&[&["eval", "--format", "csv"][..], &args].concat());
    let rows = parse(&stdout(&o));
    let header = &rows[0];
    let col = |n: &str| header.iter().position(|h| h == n).unwrap();
    for r in &rows {
        assert_eq!(r.len(), header.len(), "{r:?}");
    }
    let j = run(&[&["eval", "--format", "json"][..], &args].concat());
    let v: serde_json::Value = serde_json::from_slice(&j.stdout).unwrap();
    let mut bodies = 0;
    let mjup_si = 1.898_13e27; // IAU 2015 Resolution B3 (GM_J^N / G), as the core uses; checked to 1e-4
    for sys in v["systems"].as_array().unwrap() {
        for b in sys["bodies"].as_array().unwrap() {
            bodies += 1;
            let row = rows[1..]
                .iter()
                .find(|r| {
                    r[col("file")] == sys["file"].as_str().unwrap()
                        && r[col("system")] == sys["name"].as_str().unwrap()
                        && r[col("body")] == b["id"].as_str().unwrap()
                })
                .unwrap();
            assert_eq!(row[col("kind")], b["kind"].as_str().unwrap());
            if b["kind"] == "planet" {
                if let Some(m) = b["quantities"]["mass"]["si"]["value"].as_f64() {
                    let cell: f64 = row[col("mass")].parse().unwrap();
                    assert!(
                        (cell * mjup_si / m - 1.0).abs() < 1e-3,
                        "{cell} Mjup vs {m} kg"
                    );
                    assert_eq!(
                        row[col("mass_origin")].split(';').next().unwrap(),
                        b["quantities"]["mass"]["origin"].as_str().unwrap()
                    );
                }
            } else if let Some(t) = b["quantities"]["teff"]["value"].as_f64() {
                let cell: f64 = row[col("star_teff")].parse().unwrap();
                assert!((cell - t).abs() < 1e-6 * t);
            }
        }
    }
    assert_eq!(rows.len() - 1, bodies);
    assert!(bodies > 5);
}

/// `syz eval --format csv --propagation linear PATH`.
fn linear_csv(path: &str) -> std::process::Output {
    run(&["eval", "--format", "csv", "--propagation", "linear", path])
}

#[test]
fn csv_keeps_the_table_on_stdout_and_the_problems_on_stderr() {
    // docs/csv-output.md: diagnostics go to standard error as with the human format.
    let o = linear_csv("examples/broken/language-errors.syz");
    assert_eq!(o.status.code(), Some(1), "errors make the exit status 1");
    let err = syzygy_e2e::stderr(&o);
    assert!(err.contains("Error"), "no diagnostics on stderr:\n{err}");
    let rows = parse(&stdout(&o));
    assert!(
        rows[0].first().is_some_and(|h| h == "file"),
        "{:?}",
        rows[0]
    );
    assert!(
        !stdout(&o).contains("Error"),
        "diagnostics leaked into the table"
    );
}

#[test]
fn csv_says_what_each_body_assumed() {
    let o = linear_csv("examples/veyra.syz");
    let rows = parse(&stdout(&o));
    let last = rows[0].len() - 1;
    assert_eq!(rows[0][last], "assumptions");
    let planet_c = rows.iter().find(|r| r[2] == "c").unwrap();
    // veyra.syz declares no albedo for c: the default must be visible in the table.
    assert!(
        planet_c[last].contains("Bond albedo = 0 (default)"),
        "{planet_c:?}"
    );
    let star = rows.iter().find(|r| r[3] == "star").unwrap();
    assert!(!star[last].contains("albedo"), "{star:?}");
}
