//! End-to-end tests of `syz import`: the example tables import into files that check clean;
//! bad rows are named and the rest imported; names from tables never leave the output folder;
//! existing files are kept; hostile VOTables and oversized tables end in a clear error.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use std::path::Path;
use syzygy_e2e::{root, run, run_bounded, scratch, stderr, stdout};

fn s(p: &Path) -> &str {
    p.to_str().unwrap()
}

/// The names of the files in a folder, sorted.
fn files_in(dir: &Path) -> Vec<String> {
    let mut v: Vec<String> = std::fs::read_dir(dir)
        .unwrap()
        .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
        .collect();
    v.sort();
    v
}

fn check_clean(dir: &Path) {
    let o = run(&["check", "--deny-warnings", s(dir)]);
    assert_eq!(o.status.code(), Some(0), "{}{}", stdout(&o), stderr(&o));
}

const MAPPING: &str = "[bodies]\nsystem = \"sys\"\nplanet = \"pl\"\n[refs]\ntext = [\"paper\"]\n[star.mass]\nvalue = \"ms\"\nunit = \"Msun\"\nerror = \"ms_e\"\n[planet.period]\nvalue = \"p\"\nunit = \"d\"\n[planet.eccentricity]\nvalue = \"e\"\n";

/// Import `csv` under [`MAPPING`] into `dir/out`.
fn import(dir: &Path, csv: &str, extra: &[&str]) -> std::process::Output {
    let table = dir.join("t.csv");
    std::fs::write(&table, csv).unwrap();
    let mapping = dir.join("m.toml");
    std::fs::write(&mapping, MAPPING).unwrap();
    let out = dir.join("out");
    let mut args = vec!["import", s(&table), "--mapping", s(&mapping), "-o", s(&out)];
    args.extend_from_slice(extra);
    run(&args)
}

#[test]
fn the_example_tables_import_into_files_that_check_clean() {
    let dir = scratch("import-examples");
    for (table, mapping, files) in [
        (
            "survey.csv",
            "survey.toml",
            vec!["brannoc.syz", "quessa.syz", "tiverne.syz"],
        ),
        (
            "archive.vot",
            "archive.toml",
            vec!["caddow.syz", "ilsefell.syz"],
        ),
    ] {
        let out = dir.join(table);
        let t = root().join("examples/tables").join(table);
        let m = root().join("examples/tables").join(mapping);
        let o = run(&["import", s(&t), "--mapping", s(&m), "-o", s(&out)]);
        assert_eq!(o.status.code(), Some(0), "{}{}", stdout(&o), stderr(&o));
        assert!(stdout(&o).contains("0 cells skipped"), "{}", stdout(&o));
        assert_eq!(files_in(&out), files);
        check_clean(&out);
    }
    // The table's values are what the files declare: the negative lower error, the upper
    // limit, the empty cell, two papers' periods, a planet of the second star.
    let text = std::fs::read_to_string(dir.join("survey.csv/brannoc.syz")).unwrap();
    assert!(
        text.contains("mass   = 0.52 +0.04/-0.03  Mjup [harrowgate2031]"),
        "{text}"
    );
    assert!(
        text.contains("mass   < 0.061      Mjup [harrowgate2031]"),
        "{text}"
    );
    assert!(
        text.contains("period = 4.61310 ± 0.00003 d    [osterby2033]"),
        "{text}"
    );
    let text = std::fs::read_to_string(dir.join("survey.csv/tiverne.syz")).unwrap();
    assert!(
        !text.contains("radius ") || !text.contains("Rjup"),
        "{text}"
    );
    let text = std::fs::read_to_string(dir.join("survey.csv/quessa.syz")).unwrap();
    assert!(text.contains("planet b orbits Quessa_B"), "{text}");
    // The VOTable's units are the fields' own.
    let text = std::fs::read_to_string(dir.join("archive.vot/caddow.syz")).unwrap();
    assert!(
        text.contains("radius       = 13.9 ± 0.4      Rearth [pirrie2034]"),
        "{text}"
    );
    // Evaluating a file gives the table's value back.
    let o = run(&[
        "eval",
        "--format",
        "json",
        "--propagation",
        "linear",
        s(&dir.join("archive.vot/caddow.syz")),
    ]);
    let v: serde_json::Value = serde_json::from_str(&stdout(&o)).unwrap();
    let b = &v["systems"][0]["bodies"][1]["quantities"];
    assert!(
        (b["period"]["value"].as_f64().unwrap() - 3.0712).abs() < 1e-12,
        "{b}"
    );
    assert_eq!(b["rv_amplitude"]["value"].as_f64(), Some(112.0), "{b}");
    assert_eq!(b["rv_amplitude"]["above"].as_f64(), Some(5.0), "{b}");
}

#[test]
fn bad_rows_are_named_and_the_rest_imported() {
    let dir = scratch("import-bad-rows");
    let csv = "sys,pl,ms,ms_e,p,e,paper,extra\n\
               Orrin,b,0.9,0.03,3.5,,Pell 2031,\n\
               Orrin,c,0.9,0.03,four,,Pell 2031,\n\
               Orrin,d,0.9,0.03,7.5,1.5,Pell 2031,\n\
               Tarn,b,1.1,-0.1,2.2,,Pell 2031,\n\
               ,e,1.0,,3.0,,,\n\
               Orrin,b,0.95,0.03,,,Pell 2031,\n";
    let o = import(&dir, csv, &[]);
    assert_eq!(o.status.code(), Some(1), "{}{}", stdout(&o), stderr(&o));
    let err = stderr(&o);
    for expected in [
        "t.csv: row 2 (line 3), column `p`: period: `four` is not a number",
        "t.csv: row 3 (line 4), column `e`: eccentricity = 1.5 is outside its valid range",
        "t.csv: row 4 (line 5), column `ms_e`: mass: the uncertainty (symmetric) `-0.1` is negative",
        "t.csv: row 5 (line 6), column `sys`: no system name",
        "t.csv: row 6 (line 7), column `ms`: orrin.mass = 0.95 ± 0.03 Msun here, but = 0.9 ± 0.03 Msun in row 1",
        "columns not in the mapping, not imported: extra",
    ] {
        assert!(err.contains(expected), "missing `{expected}` in:\n{err}");
    }
    assert!(stdout(&o).contains("6 rows: 2 systems"), "{}", stdout(&o));
    let out = dir.join("out");
    assert_eq!(files_in(&out), vec!["orrin.syz", "tarn.syz"]);
    let text = std::fs::read_to_string(out.join("orrin.syz")).unwrap();
    for kept in [
        "planet b orbits orrin",
        "planet c orbits orrin",
        "period = 7.5 d",
    ] {
        assert!(text.contains(kept), "{kept}:\n{text}");
    }
    check_clean(&out);
}

#[test]
fn names_from_the_table_never_leave_the_output_folder() {
    let dir = scratch("import-hostile-names");
    let hostile = [
        "../../escaped",
        "/tmp/absolute",
        "..",
        ".hidden",
        "a/b\\c",
        "CON",
        "nul",
        "C:\\\\Windows",
        "Orrin",
        "orrin",
        "ORRIN!",
    ];
    let mut csv = String::from("sys,pl,ms,ms_e,p,e,paper\n");
    for h in hostile {
        csv.push_str(&format!("\"{h}\",b,1.0,,3.0,,\n"));
    }
    csv.push_str(&format!("{},b,1.0,,3.0,,\n", "x".repeat(5000)));
    let o = import(&dir, &csv, &[]);
    // `Orrin` and `orrin` differ only in case: pointed out (exit 1), and both still written.
    assert_eq!(o.status.code(), Some(1), "{}{}", stdout(&o), stderr(&o));
    assert!(stderr(&o).contains("[name-case]"), "{}", stderr(&o));
    let out = dir.join("out");
    let files = files_in(&out);
    assert_eq!(files.len(), hostile.len() + 1, "{files:?}");
    for f in &files {
        assert!(
            f.ends_with(".syz") && !f.starts_with('.') && f.len() <= 72,
            "{f}"
        );
        assert!(out.join(f).is_file(), "{f}");
    }
    for device in ["con.syz", "nul.syz"] {
        assert!(!files.contains(&device.to_string()), "{files:?}");
    }
    // Three systems whose names give `orrin`: three files, none overwritten.
    for f in ["orrin.syz", "orrin-2.syz", "orrin-3.syz"] {
        assert!(files.contains(&f.to_string()), "{files:?}");
    }
    // Nothing beside the output folder but what the test wrote.
    assert_eq!(files_in(&dir), vec!["m.toml", "out", "t.csv"]);
    check_clean(&out);
}

#[test]
fn existing_files_are_not_overwritten_unless_forced() {
    let dir = scratch("import-existing");
    let out = dir.join("out");
    std::fs::create_dir_all(&out).unwrap();
    std::fs::write(out.join("orrin.syz"), "# mine\n").unwrap();
    let outside = dir.join("outside.txt");
    std::fs::write(&outside, "untouched\n").unwrap();
    #[cfg(unix)]
    std::os::unix::fs::symlink(&outside, out.join("tarn.syz")).unwrap();
    let csv =
        "sys,pl,ms,ms_e,p,e,paper\nOrrin,b,1.0,,3.0,,\nTarn,b,1.0,,3.0,,\nVell,b,1.0,,3.0,,\n";
    let o = import(&dir, csv, &[]);
    assert_eq!(o.status.code(), Some(2), "{}{}", stdout(&o), stderr(&o));
    assert!(
        stderr(&o).contains("orrin.syz: exists already; not overwritten (--force replaces it)"),
        "{}",
        stderr(&o)
    );
    assert_eq!(
        std::fs::read_to_string(out.join("orrin.syz")).unwrap(),
        "# mine\n"
    );
    assert_eq!(std::fs::read_to_string(&outside).unwrap(), "untouched\n");
    assert!(out.join("vell.syz").is_file());
    // Asked to, it replaces the files (the link itself, never what it points to).
    std::fs::remove_file(out.join("vell.syz")).unwrap();
    let o = import(&dir, csv, &["--force"]);
    assert_eq!(o.status.code(), Some(0), "{}{}", stdout(&o), stderr(&o));
    assert!(std::fs::read_to_string(out.join("orrin.syz"))
        .unwrap()
        .contains("system \"Orrin\""));
    assert_eq!(std::fs::read_to_string(&outside).unwrap(), "untouched\n");
    #[cfg(unix)]
    assert!(!std::fs::symlink_metadata(out.join("tarn.syz"))
        .unwrap()
        .file_type()
        .is_symlink());
    check_clean(&out);
    // Imported again from a table that no longer holds Tarn and Vell: their files stay
    // (nothing the user owns is removed), and the import says they are there.
    let o = import(
        &dir,
        "sys,pl,ms,ms_e,p,e,paper\nOrrin,b,1.0,,3.0,,\n",
        &["--force"],
    );
    assert_eq!(o.status.code(), Some(0), "{}{}", stdout(&o), stderr(&o));
    assert!(
        stderr(&o).contains("holds 2 other .syz files this import did not write (tarn.syz, vell.syz); `syz check` of the folder reads them too"),
        "{}",
        stderr(&o)
    );
    assert!(out.join("vell.syz").is_file());
}

const VOT_HEAD: &str = "<VOTABLE version=\"1.4\"><RESOURCE><TABLE><FIELD name=\"sys\" datatype=\"char\" arraysize=\"*\"/><FIELD name=\"ms\" datatype=\"double\" unit=\"solMass\"/><DATA><TABLEDATA>";

fn import_vot(dir: &Path, text: &str) -> std::process::Output {
    let table = dir.join("t.vot");
    std::fs::write(&table, text).unwrap();
    let mapping = dir.join("m.toml");
    std::fs::write(
        &mapping,
        "[bodies]\nsystem = \"sys\"\n[star.mass]\nvalue = \"ms\"\n",
    )
    .unwrap();
    let out = dir.join("out");
    run_bounded(
        &["import", s(&table), "--mapping", s(&mapping), "-o", s(&out)],
        std::time::Duration::from_secs(60),
    )
}

#[test]
fn votables_with_entities_are_refused_safely() {
    let dir = scratch("import-entities");
    let secret = dir.join("secret.txt");
    std::fs::write(&secret, "SECRET-CONTENT").unwrap();
    let external = format!(
        "<?xml version=\"1.0\"?>\n<!DOCTYPE VOTABLE [<!ENTITY xxe SYSTEM \"file://{}\">]>\n{VOT_HEAD}<TR><TD>&xxe;</TD><TD>1</TD></TR></TABLEDATA></DATA></TABLE></RESOURCE></VOTABLE>\n",
        secret.display()
    );
    let laughs = format!(
        "<?xml version=\"1.0\"?>\n<!DOCTYPE VOTABLE [<!ENTITY a \"aaaaaaaaaa\"><!ENTITY b \"&a;&a;&a;&a;&a;&a;&a;&a;&a;&a;\"><!ENTITY c \"&b;&b;&b;&b;&b;&b;&b;&b;&b;&b;\">]>\n{VOT_HEAD}<TR><TD>&c;</TD><TD>1</TD></TR></TABLEDATA></DATA></TABLE></RESOURCE></VOTABLE>\n"
    );
    let undeclared = format!(
        "{VOT_HEAD}<TR><TD>&xxe;</TD><TD>1</TD></TR></TABLEDATA></DATA></TABLE></RESOURCE></VOTABLE>\n"
    );
    for (text, says) in [
        (external, "DOCTYPE"),
        (laughs, "DOCTYPE"),
        (undeclared, "only the XML predefined entities"),
    ] {
        let o = import_vot(&dir, &text);
        assert_eq!(o.status.code(), Some(2), "{}{}", stdout(&o), stderr(&o));
        let err = stderr(&o);
        assert!(err.contains(says), "{err}");
        assert!(
            err.contains("nothing was written") || err.contains("DOCTYPE"),
            "{err}"
        );
        assert!(!stdout(&o).contains("SECRET") && !err.contains("SECRET"));
        let out = dir.join("out");
        assert!(
            !out.exists() || files_in(&out).is_empty(),
            "{:?}",
            files_in(&out)
        );
    }
    // The same table without the entity imports.
    let fine = format!("{VOT_HEAD}<TR><TD>Orrin &amp; Tarn</TD><TD>1</TD></TR></TABLEDATA></DATA></TABLE></RESOURCE></VOTABLE>\n");
    let o = import_vot(&dir, &fine);
    assert_eq!(o.status.code(), Some(0), "{}{}", stdout(&o), stderr(&o));
    let text = std::fs::read_to_string(dir.join("out/orrin-tarn.syz")).unwrap();
    assert!(text.contains("system \"Orrin & Tarn\""), "{text}");
}

#[test]
fn oversized_cells_and_column_counts_end_in_a_clear_error() {
    let dir = scratch("import-oversized");
    // A cell beyond the cell limit (64 KiB).
    let o = import(
        &dir,
        &format!(
            "sys,pl,ms,ms_e,p,e,paper\nOrrin,b,{},,,,\n",
            "9".repeat(100_000)
        ),
        &[],
    );
    assert_eq!(o.status.code(), Some(2), "{}", stderr(&o));
    assert!(
        stderr(&o).contains("line 2: cell 3 holds 100000 bytes, more than the limit of 65536"),
        "{}",
        stderr(&o)
    );
    // More columns than the limit (10,000).
    let header: Vec<String> = (0..10_001).map(|i| format!("c{i}")).collect();
    let o = import(&dir, &format!("{}\n", header.join(",")), &[]);
    assert_eq!(o.status.code(), Some(2), "{}", stderr(&o));
    assert!(
        stderr(&o).contains("10001 columns, more than the limit of 10000"),
        "{}",
        stderr(&o)
    );
    // A multi-megabyte cell is refused while it streams, not after it is all in memory.
    let o = import(
        &dir,
        &format!(
            "sys,pl,ms,ms_e,p,e,paper\nOrrin,b,1,,3,,\"{}\"\n",
            "p".repeat(6_000_000)
        ),
        &[],
    );
    assert_eq!(o.status.code(), Some(2), "{}", stderr(&o));
    assert!(
        stderr(&o).contains("a row longer than 4194304 bytes"),
        "{}",
        stderr(&o)
    );
    assert!(files_in(&dir.join("out")).is_empty());
    // The same in a VOTable.
    let o = import_vot(&dir, &format!("{VOT_HEAD}<TR><TD>{}</TD><TD>1</TD></TR></TABLEDATA></DATA></TABLE></RESOURCE></VOTABLE>\n", "q".repeat(6_000_000)));
    assert_eq!(o.status.code(), Some(2), "{}", stderr(&o));
    assert!(
        stderr(&o).contains("a tag or text longer than"),
        "{}",
        stderr(&o)
    );
}

#[test]
fn a_mapping_that_cannot_be_used_is_exit_2() {
    let dir = scratch("import-mapping");
    let table = dir.join("t.csv");
    std::fs::write(&table, "sys,m\nOrrin,1\n").unwrap();
    let out = dir.join("out");
    let o = run(&["import", s(&table), "-o", s(&out)]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("--mapping FILE"), "{}", stderr(&o));
    let mapping = dir.join("m.toml");
    std::fs::write(
        &mapping,
        "[bodies]\nsystem = \"sys\"\n[star.mass]\nvalue = \"m\"\nunit = \"km\"\n",
    )
    .unwrap();
    let o = run(&["import", s(&table), "--mapping", s(&mapping), "-o", s(&out)]);
    assert_eq!(o.status.code(), Some(2));
    assert!(
        stderr(&o).contains("the unit `km` (column `m`) is a length"),
        "{}",
        stderr(&o)
    );
}

/// The demo files: every example and the demo catalogue.
fn demos() -> Vec<String> {
    let mut v: Vec<String> = ["examples", "examples/catalogue"]
        .iter()
        .flat_map(|d| {
            files_in(&root().join(d))
                .into_iter()
                .map(move |f| format!("{d}/{f}"))
        })
        .filter(|f| f.ends_with(".syz"))
        .collect();
    v.sort();
    v
}

/// The table of declared values of `paths`, as sorted rows of (column, cell) without the
/// columns that name where a value was (file, line).
fn declared(paths: &[&str]) -> Vec<Vec<(String, String)>> {
    let mut args = vec![
        "eval",
        "--format",
        "csv",
        "--table",
        "sources",
        "--propagation",
        "linear",
    ];
    args.extend_from_slice(paths);
    let o = run(&args);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let mut r = csv::Reader::from_reader(o.stdout.as_slice());
    let header: Vec<String> = r.headers().unwrap().iter().map(str::to_string).collect();
    let mut rows: Vec<Vec<(String, String)>> = r
        .records()
        .map(|rec| {
            header
                .iter()
                .zip(rec.unwrap().iter())
                .filter(|(h, _)| *h != "file" && *h != "line")
                .map(|(h, c)| (h.clone(), c.to_string()))
                .collect()
        })
        .collect();
    rows.sort();
    rows
}

/// Every demo file exported as the table of declared values (CSV, then VOTable) and imported
/// back with no mapping declares exactly the same values: same numbers as written, units,
/// limits, `assumed` marks, citations with their texts, and the same source used.
#[test]
fn declared_values_round_trip_through_csv_and_votable() {
    let demos = demos();
    assert!(demos.len() >= 10, "{demos:?}");
    let paths: Vec<&str> = demos.iter().map(String::as_str).collect();
    let before = declared(&paths);
    assert!(before.len() > 100);
    let dir = scratch("import-round-trip");
    for format in ["csv", "votable"] {
        let mut args = vec!["eval", "--format", format, "--table", "sources"];
        args.extend_from_slice(&paths);
        let table = dir.join(format!(
            "declared.{}",
            if format == "csv" { "csv" } else { "vot" }
        ));
        std::fs::write(&table, run(&args).stdout).unwrap();
        let out = dir.join(format!("out-{format}"));
        let o = run(&["import", s(&table), "-o", s(&out)]);
        assert_eq!(
            o.status.code(),
            Some(0),
            "{format}: {}{}",
            stdout(&o),
            stderr(&o)
        );
        check_clean(&out);
        let after = declared(&[s(&out)]);
        assert_eq!(before.len(), after.len(), "{format}");
        for (b, a) in before.iter().zip(&after) {
            assert_eq!(b, a, "{format}");
        }
    }
}

#[test]
fn a_table_of_another_layout_without_a_mapping_is_exit_2() {
    let dir = scratch("import-no-mapping");
    let table = dir.join("t.csv");
    std::fs::write(&table, "sys,p\nA,3\n").unwrap();
    let o = run(&["import", s(&table), "-o", s(&dir.join("out"))]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("--mapping"), "{}", stderr(&o));
    assert!(!dir.join("out").join("a.syz").exists());
}

#[test]
fn bad_rows_of_a_table_of_declared_values_are_named() {
    let dir = scratch("import-own-bad");
    let table = dir.join("t.csv");
    std::fs::write(
        &table,
        "system,body,kind,host,quantity,value,below,above,text,unit,limit,origin,refs,used\n\
         A,s,star,,mass,1.0,0.1,0.1,,Msun,,declared,,yes\n\
         A,b,planet,s,period,three,,,,d,,declared,,yes\n\
         A,b,planet,s,warp_factor,9,,,,,,declared,,yes\n\
         A,b,planet,s,rv_amplitude,12,1,1,,m/s,,declared,,yes\n",
    )
    .unwrap();
    let out = dir.join("out");
    let o = run(&["import", s(&table), "-o", s(&out)]);
    assert_eq!(o.status.code(), Some(1), "{}", stderr(&o));
    let err = stderr(&o);
    assert!(
        err.contains("row 2") && err.contains("`three` is not a number"),
        "{err}"
    );
    assert!(
        err.contains("row 3") && err.contains("warp_factor"),
        "{err}"
    );
    let text = std::fs::read_to_string(out.join("a.syz")).unwrap();
    assert!(text.contains("rv_amplitude = 12 ± 1 m/s"), "{text}");
    assert!(text.contains("planet b orbits s"), "{text}");
}

/// A lower limit the derivations cannot use and reference texts holding the table's
/// separator (` | `) and backslashes survive the round trip through the table of declared
/// values, and the limit's row says it is not used.
#[test]
fn unusable_limits_and_references_with_bars_round_trip() {
    let dir = scratch("import-limits-bars");
    let file = dir.join("narrowdale.syz");
    std::fs::write(
        &file,
        "ref aa \"Harl 2031 | zz: Fenwick 2030 (erratum)\"\nref zz \"Marrowby et al. 2033, A\\\\&A\"\nsystem \"Narrowdale\" {\n  star s {\n    mass = 1.0 ± 0.1 Msun [aa]\n    radius = 1.0 ± 0.05 Rsun [zz]\n  }\n  planet b orbits s {\n    period = 3.5 ± 0.1 d [aa]\n    rv_amplitude > 30 m/s [zz]\n  }\n}\n",
    )
    .unwrap();
    let before = declared(&[s(&file)]);
    let limit = before
        .iter()
        .find(|r| r.contains(&("quantity".into(), "rv_amplitude".into())))
        .expect("the lower limit has a row");
    assert!(
        limit.contains(&("limit".into(), "lower".into())),
        "{limit:?}"
    );
    assert!(limit.contains(&("used".into(), "no".into())), "{limit:?}");
    let table = dir.join("declared.csv");
    std::fs::write(
        &table,
        run(&["eval", "--format", "csv", "--table", "sources", s(&file)]).stdout,
    )
    .unwrap();
    let out = dir.join("out");
    let o = run(&["import", s(&table), "-o", s(&out)]);
    assert_eq!(o.status.code(), Some(0), "{}{}", stdout(&o), stderr(&o));
    let written = std::fs::read_to_string(out.join("narrowdale.syz")).unwrap();
    assert!(
        written.contains("\"Harl 2031 | zz: Fenwick 2030 (erratum)\""),
        "{written}"
    );
    assert!(
        written.contains("Marrowby et al. 2033, A\\\\&A"),
        "{written}"
    );
    let words: Vec<&str> = written.split_whitespace().collect();
    assert!(
        words
            .windows(4)
            .any(|w| w == ["rv_amplitude", ">", "30", "m/s"]),
        "{written}"
    );
    assert_eq!(declared(&[s(&out)]), before);
}

/// Sources a weighted-mean project combined come back with a comment saying so and how to get
/// the same value, rather than silently under the importing project's choice (invented data).
#[test]
fn combined_sources_say_so_after_the_round_trip() {
    let dir = scratch("import-combined");
    std::fs::write(
        dir.join("syzygy.toml"),
        "[sources]\nchoice = \"weighted-mean\"\n",
    )
    .unwrap();
    let file = dir.join("pellory.syz");
    std::fs::write(
        &file,
        "ref a \"Invented A\"\nref b \"Invented B\"\nsystem \"Pellory\" {\n  star s {\n    mass = 0.95 ± 0.03 Msun [a]\n    mass = 0.99 ± 0.02 Msun [b]\n  }\n}\n",
    )
    .unwrap();
    let table = dir.join("declared.csv");
    let o = run(&["eval", "--format", "csv", "--table", "sources", s(&file)]);
    assert!(stdout(&o).contains(",combined"), "{}", stdout(&o));
    std::fs::write(&table, o.stdout).unwrap();
    let out = dir.join("out");
    let o = run(&["import", s(&table), "-o", s(&out)]);
    assert_eq!(o.status.code(), Some(0), "{}{}", stdout(&o), stderr(&o));
    let written = std::fs::read_to_string(out.join("pellory.syz")).unwrap();
    assert!(
        written.contains("# mass: the exported table used the weighted mean of these sources"),
        "{written}"
    );
    assert!(!written.contains("preferred"), "{written}");
}

/// Names the language reads (`☉`, `⊕`, `µ`, `°` first) come back from the table of declared
/// values as they were, so that `☉x`, `x` and `⊕x` stay three planets and `r_☉`, `r_⊕` two
/// references with their own texts; a hand-made table whose names make the same id gets ids
/// of their own (`r_`, `r__2`), each body's table name kept in a comment (invented data).
#[test]
fn names_with_symbols_and_colliding_names_stay_apart_in_the_round_trip() {
    let dir = scratch("import-symbol-names");
    let file = dir.join("coll.syz");
    std::fs::write(
        &file,
        "ref r_☉ \"Invented ref one\"\nref r_⊕ \"Invented ref two\"\nsystem \"Coll\" {\n  star s { mass = 1.0 ± 0.1 Msun [r_☉] }\n  planet ☉x orbits s { period = 3 ± 0.1 d [r_☉] }\n  planet x orbits s { period = 5 ± 0.1 d [r_⊕] }\n  planet ⊕x orbits s { period = 7 ± 0.1 d }\n  planet °c orbits s { period = 40 ± 1 d }\n}\n",
    )
    .unwrap();
    let before = declared(&[s(&file)]);
    let csv = run(&["eval", "--format", "csv", "--table", "sources", s(&file)]).stdout;
    let table = dir.join("declared.csv");
    std::fs::write(&table, &csv).unwrap();
    let out = dir.join("out");
    let o = run(&["import", s(&table), "-o", s(&out)]);
    assert_eq!(o.status.code(), Some(0), "{}{}", stdout(&o), stderr(&o));
    assert!(stdout(&o).contains("4 planets"), "{}", stdout(&o));
    assert_eq!(declared(&[s(&out)]), before);
    // The same table with names no language would write: `r☼` and `r✶` both make `r`.
    let text = String::from_utf8(csv)
        .unwrap()
        .replace("r_☉", "r☼")
        .replace("r_⊕", "r✶")
        .replace("☉x", "p☼");
    std::fs::write(&table, text).unwrap();
    let out = dir.join("out2");
    let o = run(&["import", s(&table), "-o", s(&out)]);
    assert_eq!(o.status.code(), Some(0), "{}{}", stdout(&o), stderr(&o));
    let written = std::fs::read_to_string(out.join("coll.syz")).unwrap();
    assert!(written.contains("ref r \"Invented ref one\""), "{written}");
    assert!(
        written.contains("ref r_2 \"Invented ref two\""),
        "{written}"
    );
    assert!(
        written.contains("# \"p☼\" in the table\n  planet p orbits s"),
        "{written}"
    );
    let o = run(&["check", s(&out)]);
    assert_eq!(o.status.code(), Some(0), "{}", stdout(&o));
    // A star and a planet of one name are two bodies with two ids.
    let text = String::from_utf8(std::fs::read(&table).unwrap())
        .unwrap()
        .replace(",x,planet,", ",s,planet,");
    std::fs::write(&table, text).unwrap();
    let out = dir.join("out3");
    let o = run(&["import", s(&table), "-o", s(&out)]);
    assert_eq!(o.status.code(), Some(0), "{}{}", stdout(&o), stderr(&o));
    let written = std::fs::read_to_string(out.join("coll.syz")).unwrap();
    assert!(
        written.contains("# \"s\" in the table\n  planet s_2 orbits s"),
        "{written}"
    );
    let o = run(&["check", s(&out)]);
    assert_eq!(o.status.code(), Some(0), "{}", stdout(&o));
}

/// A table that makes one system of more bodies than a system is read with is written whole,
/// with a `too-many-bodies` issue (exit status 1) saying that checking it would not read the
/// bodies past the bound (invented data).
#[test]
fn a_system_past_the_bound_on_bodies_is_written_with_an_issue() {
    let dir = scratch("import-crowd");
    let mut csv = String::from(
        "system,body,kind,host,quantity,value,below,above,text,unit,limit,origin,refs\n",
    );
    for i in 0..1002 {
        csv.push_str(&format!("Crowd,s{i},star,,mass,0.5,,,,Msun,,declared,\n"));
    }
    let table = dir.join("crowd.csv");
    std::fs::write(&table, csv).unwrap();
    let out = dir.join("out");
    let o = run(&["import", s(&table), "-o", s(&out)]);
    assert_eq!(o.status.code(), Some(1), "{}{}", stdout(&o), stderr(&o));
    assert!(
        stderr(&o).contains("system `Crowd` has 1002 bodies, and a system is read with at most 1000: `syz check` would not read the 2 past them"),
        "{}",
        stderr(&o)
    );
    assert!(stderr(&o).contains("[too-many-bodies]"), "{}", stderr(&o));
    let written = std::fs::read_to_string(out.join("crowd.syz")).unwrap();
    assert!(written.contains("star s1001"), "{written}");
}
