//! `syz eval --format csv`: the table parses, has one row per planet with its host joined (and
//! one per star no planet orbits), and its numbers agree with the JSON output converted to the
//! documented fixed units.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use syzygy_e2e::{run, stdout};

/// The table's rows, header first, read by the `csv` crate (RFC 4180).
fn parse(text: &str) -> Vec<Vec<String>> {
    csv::ReaderBuilder::new()
        .has_headers(false)
        .from_reader(text.as_bytes())
        .records()
        .map(|r| r.unwrap().iter().map(str::to_string).collect())
        .collect()
}

#[test]
fn csv_has_a_row_per_planet_with_its_host_joined() {
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
    let mut expected_rows = 0;
    let mut planets = 0;
    let mjup_si = 1.898_13e27; // IAU 2015 Resolution B3 (GM_J^N / G), as the core uses; checked to 1e-4
    for sys in v["systems"].as_array().unwrap() {
        let bodies = sys["bodies"].as_array().unwrap();
        let in_sys = |r: &&Vec<String>| {
            r[col("file")] == sys["file"].as_str().unwrap()
                && r[col("system")] == sys["name"].as_str().unwrap()
        };
        for b in bodies {
            let id = b["id"].as_str().unwrap();
            if b["kind"] == "planet" {
                planets += 1;
                expected_rows += 1;
                let row = rows[1..]
                    .iter()
                    .filter(in_sys)
                    .find(|r| r[col("planet")] == id)
                    .unwrap();
                if let Some(m) = b["quantities"]["mass"]["si"]["value"].as_f64() {
                    let cell: f64 = row[col("mass")].parse().unwrap();
                    assert!(
                        (cell * mjup_si / m - 1.0).abs() < 1e-3,
                        "{cell} Mjup vs {m} kg"
                    );
                    assert_eq!(
                        row[col("mass.origin")].split(';').next().unwrap(),
                        b["quantities"]["mass"]["origin"].as_str().unwrap()
                    );
                }
                // The host's values are joined into the planet's row.
                let host = bodies
                    .iter()
                    .find(|h| h["id"].as_str() == Some(row[col("host")].as_str()));
                if let Some(t) = host.and_then(|h| h["quantities"]["teff"]["value"].as_f64()) {
                    let cell: f64 = row[col("host.teff")].parse().unwrap();
                    assert!((cell - t).abs() < 1e-6 * t, "{cell} vs {t}");
                }
            } else {
                // A star no planet orbits still has its row, with the planet cell empty.
                let orbited = bodies.iter().any(|p| p["orbits"].as_str() == Some(id));
                if !orbited {
                    expected_rows += 1;
                    assert!(
                        rows[1..]
                            .iter()
                            .filter(in_sys)
                            .any(|r| r[col("planet")].is_empty() && r[col("host")] == id),
                        "star {id} has no row"
                    );
                }
            }
        }
    }
    assert_eq!(rows.len() - 1, expected_rows);
    assert!(planets > 5);
}

#[test]
fn csv_writes_declared_values_as_declared_with_their_citations() {
    // examples/veyra.syz: `period = 3.52474 ± 0.00002 d [ph1]`, `distance = 41.2 ± 0.3 pc`:
    // the conversion to SI and back must not show in the table.
    let o = linear_csv("examples/veyra.syz");
    let rows = parse(&stdout(&o));
    let col = |n: &str| rows[0].iter().position(|h| h == n).unwrap();
    let b = rows.iter().find(|r| r[col("planet")] == "b").unwrap();
    assert_eq!(b[col("period")], "3.52474");
    assert_eq!(b[col("period.below")], "0.00002");
    assert_eq!(b[col("period.refs")], "ph1");
    assert_eq!(b[col("host.distance")], "41.2");
    assert_eq!(b[col("host.radius.below")], "0.02");
    assert_eq!(b[col("host.radius.above")], "0.03");
    assert_eq!(b[col("eccentricity.origin")], "declared;upper-limit");
    assert_eq!(b[col("transit_epoch.system")], "BJD_TDB");
    // A derived value lists every citation it rests on; the row names them with their text.
    assert_eq!(b[col("mass.refs")], "ph1; rv1");
    assert!(
        b[col("refs")].contains("rv1: Demo radial-velocity campaign"),
        "{b:?}"
    );
}

/// `syz eval --format csv --propagation linear PATH`.
fn linear_csv(path: &str) -> std::process::Output {
    run(&["eval", "--format", "csv", "--propagation", "linear", path])
}

#[test]
fn csv_keeps_the_table_on_stdout_and_the_problems_on_stderr() {
    // docs/table-output.md: diagnostics go to standard error as with the human format.
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
    assert_eq!(rows[0][2], "planet");
    // veyra.syz declares no albedo for c: the default must be visible in the table.
    assert!(
        planet_c[last].contains("Bond albedo = 0 (default)"),
        "{planet_c:?}"
    );
}

#[test]
fn the_sources_table_lists_every_declaration_with_the_one_used() {
    // examples/halvard.syz declares the stellar mass, the period, the transit depth and the
    // eccentricity twice each, from different papers.
    let o = run(&[
        "eval",
        "--format",
        "csv",
        "--table",
        "sources",
        "--propagation",
        "linear",
        "examples/halvard.syz",
    ]);
    assert_eq!(o.status.code(), Some(0), "{}", syzygy_e2e::stderr(&o));
    let rows = parse(&stdout(&o));
    let col = |n: &str| rows[0].iter().position(|h| h == n).unwrap();
    // Every line of the file that declares a value is a row, at its own line.
    let text = std::fs::read_to_string(syzygy_e2e::root().join("examples/halvard.syz")).unwrap();
    let declaring: Vec<usize> = text
        .lines()
        .enumerate()
        .filter(|(_, l)| {
            let l = l.trim_start();
            let declares = l.contains(" = ") || l.contains(" < ") || l.contains(" > ");
            !l.starts_with('#') && declares && !l.starts_with("let ")
        })
        .map(|(i, _)| i + 1)
        .collect();
    let lines: Vec<usize> = rows[1..]
        .iter()
        .map(|r| r[col("line")].parse().unwrap())
        .collect();
    assert_eq!(lines, declaring);
    // Of the two periods, the more precise (brenn) is used.
    let periods: Vec<_> = rows[1..]
        .iter()
        .filter(|r| r[col("quantity")] == "period")
        .collect();
    assert_eq!(periods.len(), 2);
    assert_eq!(
        periods
            .iter()
            .map(|r| (r[col("refs")].as_str(), r[col("used")].as_str()))
            .collect::<Vec<_>>(),
        [("aster", "no"), ("brenn", "yes")]
    );
    assert_eq!(periods[1][col("value")], "4.21762");
    assert_eq!(periods[1][col("unit")], "d");
}
