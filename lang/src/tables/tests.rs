//! Unit tests of the table import: mapping, readers, names and the importer.

use super::*;

pub(super) const MAPPING: &str = r#"
ignore = ["note"]
[bodies]
system = "sys"
star = "star"
planet = "pl"
host = "host"
[refs]
text = ["paper"]
[limit_codes]
upper = ["u"]
lower = ["l"]
measured = [""]
[star.mass]
value = "ms"
unit = "Msun"
error = "ms_e"
[planet.period]
value = "p"
unit = "d"
error = "p_e"
[planet.mass]
value = "mp"
unit = "Mjup"
above = "mp_hi"
below = "mp_lo"
limit = "mp_f"
[planet.eccentricity]
value = "e"
[constants.planet]
albedo = "0.3 assumed"
"#;

pub(super) const HEADER: &str = "sys,star,pl,host,ms,ms_e,p,p_e,mp,mp_hi,mp_lo,mp_f,e,paper,note\n";

pub(super) fn import_csv(csv: &str, mapping: &str) -> ImportResult {
    let m = Mapping::from_toml(mapping).unwrap();
    let mut t = CsvTable::new(csv.as_bytes(), m.delimiter, Limits::default()).unwrap();
    let mut imp = Importer::new(&m, t.columns(), "t.csv").unwrap();
    while let Some(r) = t.next_row().unwrap() {
        imp.add_row(&r);
    }
    imp.finish()
}

pub(super) fn text_of(r: &ImportResult, system: &str) -> String {
    r.files
        .iter()
        .find(|f| f.system == system)
        .map(|f| f.text.clone())
        .unwrap_or_else(|| panic!("no file for {system}: {r:?}"))
}

/// Every file's text, one after another.
fn text_of_all(r: &ImportResult) -> String {
    r.files.iter().map(|f| f.text.as_str()).collect()
}

/// The text analyses without errors.
fn clean(text: &str) {
    let a = crate::analyze(crate::source::FileId(0), text, &crate::Settings::default());
    let errors: Vec<_> = a
        .diagnostics
        .iter()
        .filter(|d| d.severity == crate::diagnostic::Severity::Error)
        .map(|d| d.message.clone())
        .collect();
    assert!(errors.is_empty(), "{errors:?}\n{text}");
}

#[test]
fn a_row_becomes_a_star_a_planet_and_their_values() {
    let csv = format!(
        "{HEADER}Orrin,Orrin,Orrin b,,0.9,0.03,3.5,0.001,0.5,0.04,-0.03,,0.1,\"Pell, 2031\",x\n"
    );
    let r = import_csv(&csv, MAPPING);
    assert!(r.issues.is_empty(), "{:?}", r.issues);
    let t = text_of(&r, "Orrin");
    assert!(t.contains("ref pell2031 \"Pell, 2031\""), "{t}");
    assert!(t.contains("star Orrin {"), "{t}");
    assert!(t.contains("planet b orbits Orrin {"), "{t}");
    // The negative lower error is read by its size.
    assert!(
        t.contains("mass         = 0.5 +0.04/-0.03 Mjup [pell2031]"),
        "{t}"
    );
    assert!(t.contains("albedo       = 0.3 assumed"), "{t}");
    // Constants are not counted.
    assert_eq!(r.summary.values, 4);
    assert_eq!(r.summary.planets, 1);
    assert!(r.unmapped.is_empty(), "{:?}", r.unmapped);
    clean(&t);
    // Laid out as `syz fmt` lays it out.
    assert_eq!(crate::layout::format_source(&t).unwrap(), t);
}

#[test]
fn limit_flags_and_empty_cells() {
    let csv = format!(
        "{HEADER}Orrin,Orrin,Orrin b,,0.9,,3.5,,0.05,,,u,,,\nOrrin,Orrin,Orrin c,,0.9,,9.5,,0.2,,,l,,,\n"
    );
    let r = import_csv(&csv, MAPPING);
    assert!(r.issues.is_empty(), "{:?}", r.issues);
    let t = text_of(&r, "Orrin");
    assert!(t.contains("mass   < 0.05 Mjup"), "{t}");
    assert!(t.contains("mass   > 0.2 Mjup"), "{t}");
    // An empty cell is no value, never zero.
    assert!(!t.contains("eccentricity"), "{t}");
    assert!(t.contains("mass = 0.9 Msun"), "{t}");
    clean(&t);
}

#[test]
fn bad_cells_are_named_and_the_rest_imported() {
    let csv = format!(
        "{HEADER}Orrin,Orrin,Orrin b,,0.9,,abc,,0.5,,,,1.5,,\nOrrin,Orrin,Orrin c,,0.9,,4.1,,0.5,,,z,,,\n,Orrin,Orrin d,,0.9,,,,,,,,,,\nOrrin,Orrin,Orrin e,,0.9,-1,4.4,,,,,,,,\n"
    );
    let r = import_csv(&csv, MAPPING);
    let kinds: Vec<(IssueKind, usize, Option<&str>)> = r
        .issues
        .iter()
        .map(|i| (i.kind, i.row, i.column.as_deref()))
        .collect();
    assert!(
        kinds.contains(&(IssueKind::BadNumber, 1, Some("p"))),
        "{kinds:?}"
    );
    assert!(
        kinds.contains(&(IssueKind::OutOfRange, 1, Some("e"))),
        "{kinds:?}"
    );
    assert!(
        kinds.contains(&(IssueKind::BadLimitCode, 2, Some("mp_f"))),
        "{kinds:?}"
    );
    assert!(
        kinds.contains(&(IssueKind::MissingName, 3, Some("sys"))),
        "{kinds:?}"
    );
    assert!(
        kinds.contains(&(IssueKind::BadNumber, 4, Some("ms_e"))),
        "{kinds:?}"
    );
    let bad = r
        .issues
        .iter()
        .find(|i| i.kind == IssueKind::BadNumber)
        .unwrap();
    assert_eq!(bad.place(), "row 1 (line 2), column `p`");
    assert!(r.summary.skipped_cells >= 6, "{:?}", r.summary);
    // What was good is imported.
    let t = text_of(&r, "Orrin");
    assert!(t.contains("period = 4.1 d"), "{t}");
    assert!(t.contains("planet b orbits Orrin"), "{t}");
    clean(&t);
}

#[test]
fn two_papers_give_two_sources_and_the_same_paper_a_conflict() {
    let csv = format!(
        "{HEADER}Orrin,Orrin,b,,0.9,0.03,3.5,0.01,,,,,,P1 2030,\nOrrin,Orrin,b,,0.9,0.03,3.51,0.01,,,,,,P2 2031,\nOrrin,Orrin,b,,0.92,0.03,,,,,,,,P2 2031,\nOrrin,Orrin,b,,0.9,0.03,3.5,0.01,,,,,,P1 2030,\n"
    );
    let r = import_csv(&csv, MAPPING);
    let t = text_of(&r, "Orrin");
    assert!(t.contains("period = 3.5 ± 0.01  d [p2030]"), "{t}");
    assert!(t.contains("period = 3.51 ± 0.01 d [p2031]"), "{t}");
    // The star's mass, 0.90 [P1 2030] and 0.90 [P2 2031], is one value per paper; 0.92 in
    // row 3 repeats P2 2031 with another value: a conflict.
    assert_eq!(r.issues.len(), 1, "{:?}", r.issues);
    let i = &r.issues[0];
    assert_eq!(
        (i.kind, i.row, i.column.as_deref()),
        (IssueKind::Conflict, 3, Some("ms"))
    );
    assert!(i.message.contains("row 2"), "{}", i.message);
    assert_eq!(r.summary.merged, 2);
    clean(&t);
}

#[test]
fn the_same_number_written_two_ways_is_one_value() {
    // Spreadsheets write 0.9 in one row and 0.90 or 9e-1 in the next: one value of one
    // paper, kept once, not a conflict.
    let csv = format!(
        "{HEADER}Orrin,Orrin,b,,0.9,0.03,3.5,0.01,,,,,,P1 2030,\nOrrin,Orrin,b,,0.90,0.030,3.50,1e-2,,,,,,P1 2030,\nOrrin,Orrin,b,,9e-1,3e-2,,,,,,,,P1 2030,\n"
    );
    let r = import_csv(&csv, MAPPING);
    assert!(r.issues.is_empty(), "{:?}", r.issues);
    assert_eq!(r.summary.merged, 3);
    let t = text_of(&r, "Orrin");
    assert_eq!(t.matches("mass").count(), 1, "{t}");
    clean(&t);
}

#[test]
fn a_repeated_value_with_an_empty_reference_cell_says_so() {
    // Row 2 repeats row 1's period with its reference cell empty: the values are the same,
    // only the citation differs, and the message says that rather than a clash of values.
    let csv = format!(
        "{HEADER}Orrin,Orrin,b,,,,3.5,0.01,,,,,,P1 2030,\nOrrin,Orrin,b,,,,3.5,0.01,,,,,,,\n"
    );
    let r = import_csv(&csv, MAPPING);
    assert_eq!(r.issues.len(), 1, "{:?}", r.issues);
    let m = &r.issues[0].message;
    assert!(
        m.contains("the same value, but this row cites no reference"),
        "{m}"
    );
    assert!(!m.contains("do not cite different sources"), "{m}");
}

#[test]
fn names_that_differ_only_in_case_are_pointed_out() {
    // `OSPRETH` and `Ospreth`, `orrin b` and `Orrin b`: kept apart as written, each pointed
    // out once at the row that introduces it.
    let csv = format!(
        "{HEADER}Ospreth,Ospreth,Ospreth b,,0.9,0.03,3.5,0.01,,,,,,P1 2030,\nOSPRETH,Ospreth,Ospreth b,,0.9,0.03,,,,,,,,P1 2030,\nOspreth,Ospreth,ospreth b,,,,3.5,0.01,,,,,,P2 2031,\n"
    );
    let r = import_csv(&csv, MAPPING);
    let cases: Vec<(usize, &str)> = r
        .issues
        .iter()
        .filter(|i| i.kind == IssueKind::NameCase)
        .map(|i| (i.row, i.message.as_str()))
        .collect();
    assert_eq!(cases.len(), 2, "{:?}", r.issues);
    assert_eq!(cases[0].0, 2);
    assert!(
        cases[0]
            .1
            .contains("system `OSPRETH` differs from `Ospreth`"),
        "{cases:?}"
    );
    assert_eq!(cases[1].0, 3);
    assert!(cases[1].1.contains("planet `ospreth b`"), "{cases:?}");
    // Exactly repeated names raise nothing.
    let same = format!("{HEADER}Orrin,Orrin,b,,0.9,0.03,,,,,,,,P1 2030,\nOrrin,Orrin,b,,,,3.5,0.01,,,,,,P1 2030,\n");
    assert!(import_csv(&same, MAPPING)
        .issues
        .iter()
        .all(|i| i.kind != IssueKind::NameCase));
}

#[test]
fn a_planet_whose_host_is_missing_is_reported() {
    let csv =
        format!("{HEADER}Orrin,,Orrin b,Orrin B,,,3.5,,,,,,,,\nOrrin,Orrin A,,,0.9,,,,,,,,,,\n");
    let r = import_csv(&csv, MAPPING);
    assert_eq!(r.issues.len(), 1, "{:?}", r.issues);
    let i = &r.issues[0];
    assert_eq!(
        (i.kind, i.row, i.column.as_deref()),
        (IssueKind::MissingHost, 1, Some("host"))
    );
    assert!(i.message.contains("`Orrin B`"), "{}", i.message);
    assert_eq!(r.summary.skipped_cells, 2);
    assert_eq!(r.summary.planets, 0);
    clean(&text_of(&r, "Orrin"));
    // A system whose only body was refused gets no file (it would be an empty system).
    let r = import_csv(
        &format!("{HEADER}Pellucid,,Pellucid b,,,,3.5,,,,,,,,\n"),
        MAPPING,
    );
    assert_eq!(r.issues.len(), 1, "{:?}", r.issues);
    assert!(r.files.is_empty(), "{:?}", r.files);
    assert_eq!(r.summary.systems, 0);
}

#[test]
fn a_limit_with_an_uncertainty_keeps_the_limit_and_names_the_uncertainty() {
    let csv = format!("{HEADER}Orrin,Orrin,b,,,,3,,0.05,0.01,,u,,,\n");
    let r = import_csv(&csv, MAPPING);
    assert_eq!(r.issues.len(), 1, "{:?}", r.issues);
    assert_eq!(r.issues[0].kind, IssueKind::Unused);
    assert_eq!(r.issues[0].column.as_deref(), Some("mp_hi"));
    assert!(text_of(&r, "Orrin").contains("mass   < 0.05 Mjup"));
}

#[test]
fn extra_cells_and_unmapped_columns_are_reported() {
    let mapping = MAPPING.replace("ignore = [\"note\"]", "");
    let csv = format!("{HEADER}Orrin,Orrin,b,,,,3,,,,,,,,,surplus\n");
    let r = import_csv(&csv, &mapping);
    assert_eq!(r.unmapped, vec!["note".to_string()]);
    assert_eq!(r.issues.len(), 1, "{:?}", r.issues);
    assert_eq!(r.issues[0].kind, IssueKind::ExtraCells);
    // The whole row is refused: its cells may have moved under the wrong columns.
    assert_eq!(r.summary.skipped_cells, 5);
    assert!(!text_of_all(&r).contains("period"), "{r:?}");
}

/// An unquoted decimal comma makes two cells of one and shifts every cell after it: the
/// row is refused, where it was imported by position (the star's mass 1, the period 05 d,
/// the planet's mass 3.25) with one cell said to be lost.
#[test]
fn a_row_with_more_cells_than_the_header_is_refused_whole() {
    let m = Mapping::from_toml(
        "[bodies]\nsystem = \"system\"\nplanet = \"planet\"\n[star.mass]\nvalue = \"mstar\"\nunit = \"Msun\"\n[planet.period]\nvalue = \"period\"\nunit = \"d\"\n[planet.mass]\nvalue = \"mp\"\nunit = \"Mjup\"\n",
    )
    .unwrap();
    let mut t = CsvTable::new(
        "system,planet,mstar,period,mp\nCalder,b,1,05,3.25,1.2\nDunmere,c,0.9,4.5,2\n".as_bytes(),
        m.delimiter,
        Limits::default(),
    )
    .unwrap();
    let mut imp = Importer::new(&m, t.columns(), "t.csv").unwrap();
    while let Some(row) = t.next_row().unwrap() {
        imp.add_row(&row);
    }
    let r = imp.finish();
    assert_eq!(r.issues.len(), 1, "{:?}", r.issues);
    assert_eq!(r.issues[0].kind, IssueKind::ExtraCells);
    assert!(
        r.issues[0].message.contains("shifted"),
        "{}",
        r.issues[0].message
    );
    let all = text_of_all(&r);
    assert!(!all.contains("Calder"), "{all}");
    assert!(all.contains("Dunmere"), "{all}");
}

#[test]
fn a_mapped_column_named_twice_is_refused_and_a_nameless_one_is_named_by_position() {
    let m = Mapping::from_toml(
        "[bodies]\nsystem = \"sys\"\nplanet = \"pl\"\n[planet.period]\nvalue = \"per\"\nunit = \"d\"\n",
    )
    .unwrap();
    let t = CsvTable::new(
        "sys,pl,per,per\nQuorlin,b,3,4\n".as_bytes(),
        m.delimiter,
        Limits::default(),
    )
    .unwrap();
    let e = Importer::new(&m, t.columns(), "t.csv").err().unwrap();
    assert!(
        e.to_string()
            .contains("two columns `per` (columns 3 and 4)"),
        "{e}"
    );
    let csv = "sys,pl,per,\nQuorlin,b,3,4\n";
    let mut t = CsvTable::new(csv.as_bytes(), m.delimiter, Limits::default()).unwrap();
    let mut imp = Importer::new(&m, t.columns(), "t.csv").unwrap();
    while let Some(r) = t.next_row().unwrap() {
        imp.add_row(&r);
    }
    assert_eq!(
        imp.finish().unmapped,
        vec!["column 4 (no name in the header)".to_string()]
    );
}

#[test]
fn separators_quotes_and_comments() {
    let m = "[bodies]\nsystem = \"s\"\n[star.mass]\nvalue = \"m\"\nunit = \"Msun\"\n";
    for sep in [";", "\t", ","] {
        let csv = format!(
            "# a comment\ns{sep}m\n# another\n\"Orrin{sep} the first\"{sep}0.9\nTarn{sep}\n"
        );
        let r = import_csv(&csv, m);
        assert!(r.issues.is_empty(), "{sep:?}: {:?}", r.issues);
        assert_eq!(r.summary.systems, 2, "{sep:?}");
        let t = text_of(&r, &format!("Orrin{sep} the first"));
        assert!(t.contains("mass = 0.9 Msun"), "{t}");
        assert!(!text_of(&r, "Tarn").contains("mass"));
        clean(&t);
    }
}

#[test]
fn mapping_errors_say_what_is_wrong() {
    let cols: Vec<Column> = ["sys", "x"]
        .iter()
        .map(|n| Column {
            name: n.to_string(),
            unit: None,
            null: None,
            floating: false,
        })
        .collect();
    let err = |toml: &str| -> String {
        match Mapping::from_toml(toml) {
            Err(e) => e.0,
            Ok(m) => Importer::new(&m, &cols, "t").err().unwrap().0,
        }
    };
    assert!(err("[bodies]\nsystem = \"nope\"").contains("`nope` is not in the table's header"));
    // A missing required field: what it is for.
    let e = err("[bodies]\nplanet = \"x\"");
    assert!(
        e.contains("missing field `system`")
            && e.contains("the column that names each row's system"),
        "{e}"
    );
    let e = err("[bodies]\nsystem = \"sys\"\n[star.mass]\nunit = \"Msun\"");
    assert!(e.contains("needs `value = \"COLUMN\"`"), "{e}");
    assert!(err("[bodies]\nsystem = \"sys\"\nsurprise = 1").contains("unknown field"));
    assert!(
        err("[bodies]\nsystem = \"sys\"\n[star.mas]\nvalue = \"x\"\nunit = \"Msun\"")
            .contains("did you mean `mass`")
    );
    assert!(
        err("[bodies]\nsystem = \"sys\"\n[star.mass]\nvalue = \"x\"\nunit = \"km\"")
            .contains("is a length")
    );
    assert!(err("[bodies]\nsystem = \"sys\"\n[star.mass]\nvalue = \"x\"").contains("needs a unit"));
    assert!(
        err("[bodies]\nsystem = \"sys\"\n[star.mass]\nvalue = \"x\"\nunit = \"Mfoo\"")
            .contains("not a Syzygy unit")
    );
    assert!(
        err("[bodies]\nsystem = \"sys\"\n[constants.star]\nmass = \"1 Msun }\"")
            .contains("not a value Syzygy reads")
    );
    assert!(
        err("[bodies]\nsystem = \"sys\"\n[constants.star]\nmass = \"2 km\"")
            .contains("not a value Syzygy reads")
    );
    // A second declaration or a comment smuggled into a constant.
    for text in ["0.3 assumed ; eccentricity = 0.5", "0.3 # from a talk"] {
        let e = err(&format!(
            "[bodies]\nsystem = \"sys\"\n[constants.planet]\nalbedo = \"{text}\""
        ));
        assert!(e.contains("one value, on one line"), "{e}");
    }
}

#[test]
fn a_mapping_can_be_built_in_code() {
    let mut m = Mapping {
        bodies: BodyColumns {
            system: "s".into(),
            ..Default::default()
        },
        ..Default::default()
    };
    m.star.insert(
        "teff".into(),
        QuantityColumns {
            value: "t".into(),
            unit: Some("K".into()),
            ..Default::default()
        },
    );
    let mut t = CsvTable::new(&b"s,t\nOrrin,5000\n"[..], None, Limits::default()).unwrap();
    let mut imp = Importer::new(&m, t.columns(), "t").unwrap();
    while let Some(r) = t.next_row().unwrap() {
        imp.add_row(&r);
    }
    let r = imp.finish();
    assert!(text_of(&r, "Orrin").contains("teff = 5000 K"));
}

#[test]
fn csv_limits_end_in_a_clear_error() {
    let small = Limits {
        max_cell_bytes: 16,
        max_columns: 4,
        max_row_bytes: 64,
    };
    let cell = CsvTable::new(&b"a,b\nx,01234567890123456789\n"[..], None, small)
        .unwrap()
        .next_row()
        .unwrap_err();
    assert!(cell.message.contains("more than the limit of 16"), "{cell}");
    assert_eq!(cell.line, Some(2));
    let Err(cols) = CsvTable::new(&b"a,b,c,d,e\n"[..], None, small) else {
        panic!("five columns accepted")
    };
    assert!(
        cols.message.contains("5 columns, more than the limit of 4"),
        "{cols}"
    );
    // A row far longer than the limit stops the reader before it is all read.
    let long = format!("a\n{}\n", "x".repeat(1_000_000));
    let mut reader = Counting {
        inner: long.as_bytes(),
        read: 0,
    };
    let row = CsvTable::new(&mut reader, None, small)
        .unwrap()
        .next_row()
        .unwrap_err();
    assert!(row.message.contains("a row longer than 64 bytes"), "{row}");
    assert!(reader.read < 300_000, "{} bytes read", reader.read);
}

/// A reader that counts what was read from it.
struct Counting<'a> {
    inner: &'a [u8],
    read: usize,
}

impl std::io::Read for Counting<'_> {
    fn read(&mut self, buf: &mut [u8]) -> std::io::Result<usize> {
        let n = self.inner.read(buf)?;
        self.read += n;
        Ok(n)
    }
}

pub(super) const VOT: &str = r#"<?xml version="1.0"?>
<VOTABLE version="1.4"><RESOURCE><TABLE>
<FIELD name="sys" datatype="char" arraysize="*"/>
<FIELD name="m" datatype="double" unit="solMass"><VALUES null="-1"/></FIELD>
<FIELD name="r" datatype="double" unit="solRad"/>
<FIELD name="ref" datatype="char" arraysize="*"/>
<DATA><TABLEDATA>
<TR><TD>Orrin &amp; Co</TD><TD>0.9</TD><TD><![CDATA[0.8]]></TD><TD>Pell &lt;2031&gt; &#x263C;</TD></TR>
<TR><TD>Tarn</TD><TD>-1</TD><TD/><TD></TD></TR>
</TABLEDATA></DATA></TABLE></RESOURCE></VOTABLE>
"#;

pub(super) fn vot(text: &str, limits: Limits) -> Result<Vec<Row>, TableError> {
    let mut t = VoTable::new(text.as_bytes(), limits)?;
    let mut rows = Vec::new();
    while let Some(r) = t.next_row()? {
        rows.push(r);
    }
    Ok(rows)
}

#[test]
fn votable_fields_units_nulls_and_entities() {
    let t = VoTable::new(VOT.as_bytes(), Limits::default()).unwrap();
    let units: Vec<Option<&str>> = t.columns().iter().map(|c| c.unit.as_deref()).collect();
    assert_eq!(units, vec![None, Some("solMass"), Some("solRad"), None]);
    let rows = vot(VOT, Limits::default()).unwrap();
    assert_eq!(rows.len(), 2);
    assert_eq!(
        rows[0].cells,
        vec!["Orrin & Co", "0.9", "0.8", "Pell <2031> ☼"]
    );
    // The null value and an empty TD are no value.
    assert_eq!(rows[1].cells, vec!["Tarn", "", "", ""]);
    assert_eq!(rows[0].line, 8);
    let m = Mapping::from_toml(
        "[bodies]\nsystem = \"sys\"\n[refs]\ntext = [\"ref\"]\n[star.mass]\nvalue = \"m\"\n[star.radius]\nvalue = \"r\"\n",
    )
    .unwrap();
    let t = VoTable::new(VOT.as_bytes(), Limits::default()).unwrap();
    let mut imp = Importer::new(&m, t.columns(), "t.vot").unwrap();
    for r in &rows {
        imp.add_row(r);
    }
    let r = imp.finish();
    let text = text_of(&r, "Orrin & Co");
    assert!(text.contains("mass   = 0.9 Msun [pell2031]"), "{text}");
    assert!(text.contains("radius = 0.8 Rsun [pell2031]"), "{text}");
    clean(&text);
}

#[test]
fn votable_refuses_doctypes_and_unknown_entities() {
    let doctype = "<?xml version=\"1.0\"?><!DOCTYPE VOTABLE [<!ENTITY a \"aaaaaaaaaa\"><!ENTITY b \"&a;&a;&a;&a;\">]><VOTABLE/>";
    let e = vot(doctype, Limits::default()).unwrap_err();
    assert!(e.message.contains("DOCTYPE"), "{e}");
    let external =
        "<?xml version=\"1.0\"?>\n<!DOCTYPE x SYSTEM \"file:///etc/passwd\">\n<VOTABLE/>";
    assert!(vot(external, Limits::default())
        .unwrap_err()
        .message
        .contains("DOCTYPE"));
    let undeclared = VOT.replace("Orrin &amp; Co", "Orrin &xxe; Co");
    let e = vot(&undeclared, Limits::default()).unwrap_err();
    assert!(e.message.contains("predefined entities"), "{e}");
    let binary = VOT
        .replace("<TABLEDATA>", "<BINARY>")
        .replace("</TABLEDATA>", "</BINARY>");
    assert!(vot(&binary, Limits::default())
        .unwrap_err()
        .message
        .contains("only TABLEDATA"));
    assert!(vot("<html/>", Limits::default())
        .unwrap_err()
        .message
        .contains("no TABLE"));
    assert!(vot("<VOTABLE><TABLE></VOTABLE>", Limits::default()).is_err());
}

#[test]
fn votable_limits_end_in_a_clear_error() {
    let small = Limits {
        max_cell_bytes: 16,
        max_columns: 3,
        max_row_bytes: 64,
    };
    let e = vot(VOT, small).unwrap_err();
    assert!(e.message.contains("more than 3 FIELDs"), "{e}");
    let small = Limits {
        max_cell_bytes: 8,
        max_columns: 8,
        max_row_bytes: 1 << 20,
    };
    let e = vot(VOT, small).unwrap_err();
    assert!(
        e.message.contains("more than 8 bytes, the limit of a cell"),
        "{e}"
    );
    // One text run far beyond the limit stops the reader before it is all read.
    let huge = VOT.replace("0.9", &"9".repeat(2_000_000));
    let small = Limits {
        max_cell_bytes: 1 << 20,
        max_columns: 8,
        max_row_bytes: 1024,
    };
    let mut counting = Counting {
        inner: huge.as_bytes(),
        read: 0,
    };
    let e = VoTable::new(std::io::BufReader::new(&mut counting), small)
        .and_then(|mut t| t.next_row())
        .unwrap_err();
    assert!(e.message.contains("a tag or text longer than"), "{e}");
    assert!(counting.read < 300_000, "{} bytes read", counting.read);
    let deep = format!("<VOTABLE>{}", "<a>".repeat(100));
    assert!(vot(&deep, Limits::default())
        .unwrap_err()
        .message
        .contains("nested deeper"));
}

#[test]
fn vounits_in_syzygy_spelling() {
    let cases = [
        ("solMass", "Msun"),
        ("solRad", "Rsun"),
        ("jupiterMass", "Mjup"),
        ("Mjup", "Mjup"),
        ("earthMass", "Mearth"),
        ("Mearth", "Mearth"),
        ("jupiterRad", "Rjup"),
        ("Rjup", "Rjup"),
        ("earthRad", "Rearth"),
        ("Rearth", "Rearth"),
        ("d", "d"),
        ("m/s", "m/s"),
        ("m.s**-1", "m/s"),
        ("km.s-1", "km/s"),
        ("g.cm**-3", "g/cm^3"),
        ("g/cm3", "g/cm^3"),
        ("s-1", "s^-1"),
        ("K", "K"),
        ("au", "au"),
        ("AU", "au"),
        ("deg", "deg"),
        ("pc", "pc"),
        ("mas", "mas"),
        ("%", "%"),
        ("[cm/s2]", "dex"),
        ("", ""),
    ];
    for (vo, syz) in cases {
        assert_eq!(vounit_to_syzygy(vo).as_deref(), Ok(syz), "{vo}");
        assert!(crate::units::parse_unit_text(syz).is_some(), "{syz}");
    }
    // Units with a scale factor, as `syz` writes Jupiter's and the Earth's (IAU 2015 B3
    // nominal values: G M_J / G with CODATA 2018 G, R_J equatorial 7.1492e7 m, R_E
    // equatorial 6.3781e6 m), and astropy with them.
    for (vo, syz) in [
        ("1.8981245973360505e27kg", "Mjup"),
        ("7.1492e+07m", "Rjup"),
        ("6.3781e6m", "Rearth"),
        ("5.972167867791379e24kg", "Mearth"),
    ] {
        assert_eq!(vounit_to_syzygy(vo).as_deref(), Ok(syz), "{vo}");
    }
    for (vo, why) in [
        ("2e27kg", "no astronomical unit"),
        ("1.5e3furlong", "`furlong`"),
    ] {
        let e = vounit_to_syzygy(vo).unwrap_err();
        assert!(e.contains(why), "{vo}: {e}");
    }
    // What syz writes, it reads: every scaled unit of its tables.
    for unit in ["Mjup", "Rjup", "Mearth", "Rearth"] {
        let vo = crate::output::table::vo_unit(unit).unwrap();
        assert_eq!(vounit_to_syzygy(&vo).as_deref(), Ok(unit), "{vo}");
    }
    // Magnitudes are Syzygy's unit of the magnitudes (`magnitude_v`), as in VOUnits.
    assert_eq!(vounit_to_syzygy("mag").as_deref(), Ok("mag"));
    assert!(vounit_to_syzygy("Celsius").unwrap_err().contains("offset"));
    assert!(vounit_to_syzygy("furlong")
        .unwrap_err()
        .contains("`furlong`"));
}

#[test]
fn a_field_unit_without_equivalent_names_the_field() {
    let text = VOT.replace("unit=\"solRad\"", "unit=\"furlong\"");
    let t = VoTable::new(text.as_bytes(), Limits::default()).unwrap();
    let m =
        Mapping::from_toml("[bodies]\nsystem = \"sys\"\n[star.radius]\nvalue = \"r\"\n").unwrap();
    let e = Importer::new(&m, t.columns(), "t").err().unwrap();
    assert!(e.0.contains("`furlong` of field `r`"), "{e}");
}

/// A field in degrees Celsius is refused even when the mapping names a unit: `unit = "K"`
/// read 5000 (°C, 5273.15 K) as 5000 K.
#[test]
fn a_celsius_field_is_refused_whatever_the_mapping_says() {
    let text = VOT.replace("unit=\"solRad\"", "unit=\"Celsius\"");
    for mapping in [
        "[bodies]\nsystem = \"sys\"\n[star.teff]\nvalue = \"r\"\n",
        "[bodies]\nsystem = \"sys\"\n[star.teff]\nvalue = \"r\"\nunit = \"K\"\n",
    ] {
        let t = VoTable::new(text.as_bytes(), Limits::default()).unwrap();
        let m = Mapping::from_toml(mapping).unwrap();
        let e = Importer::new(&m, t.columns(), "t").err().unwrap();
        assert!(e.0.contains("field `r` is in `Celsius`"), "{e}");
        assert!(e.0.contains("convert the column to K"), "{e}");
    }
}

/// Magnitudes are taken only by the quantities shown in them: a depth in mmag is refused
/// (it is not a fraction times 1e-3), a V magnitude in mag is read.
#[test]
fn a_logarithmic_unit_is_taken_only_by_a_quantity_shown_in_it() {
    let depth = VOT.replace("unit=\"solRad\"", "unit=\"mmag\"");
    let t = VoTable::new(depth.as_bytes(), Limits::default()).unwrap();
    let m = Mapping::from_toml(
        "[bodies]\nsystem = \"sys\"\nplanet = \"sys\"\n[planet.transit_depth]\nvalue = \"r\"\n",
    )
    .unwrap();
    let e = Importer::new(&m, t.columns(), "t").err().unwrap();
    assert!(e.0.contains("`mmag` (column `r`) is logarithmic"), "{e}");
    let vmag = VOT.replace("unit=\"solRad\"", "unit=\"mag\"");
    let t = VoTable::new(vmag.as_bytes(), Limits::default()).unwrap();
    let m = Mapping::from_toml("[bodies]\nsystem = \"sys\"\n[star.magnitude_v]\nvalue = \"r\"\n")
        .unwrap();
    assert!(Importer::new(&m, t.columns(), "t").is_ok());
}

/// An uncertainty FIELD with a unit of its own is converted into the value's unit (2.4 h is
/// 0.1 d; 4 m/s is 0.004 km/s), and one of another dimension is refused.
#[test]
fn an_uncertainty_field_in_its_own_unit_is_converted() {
    let text = r#"<?xml version="1.0"?>
<VOTABLE version="1.4"><RESOURCE><TABLE>
<FIELD name="sys" datatype="char" arraysize="*"/>
<FIELD name="pl" datatype="char" arraysize="*"/>
<FIELD name="per" datatype="double" unit="d"/>
<FIELD name="per_e" datatype="double" unit="h"/>
<FIELD name="k" datatype="double" unit="km/s"/>
<FIELD name="k_e" datatype="double" unit="m/s"/>
<DATA><TABLEDATA>
<TR><TD>Oskarun</TD><TD>b</TD><TD>6.2214</TD><TD>2.4</TD><TD>0.052</TD><TD>4</TD></TR>
</TABLEDATA></DATA></TABLE></RESOURCE></VOTABLE>
"#;
    let mapping = "[bodies]\nsystem = \"sys\"\nplanet = \"pl\"\n[planet.period]\nvalue = \"per\"\nerror = \"per_e\"\n[planet.rv_amplitude]\nvalue = \"k\"\nerror = \"k_e\"\n";
    let m = Mapping::from_toml(mapping).unwrap();
    let mut t = VoTable::new(text.as_bytes(), Limits::default()).unwrap();
    let mut imp = Importer::new(&m, t.columns(), "t.vot").unwrap();
    while let Some(r) = t.next_row().unwrap() {
        imp.add_row(&r);
    }
    let out = text_of(&imp.finish(), "Oskarun");
    assert!(out.contains("6.2214 ± 0.1  d"), "{out}");
    assert!(out.contains("0.052 ± 0.004 km/s"), "{out}");
    // A relative error in per cent beside a period: refused, naming the field.
    let relative = text.replace("unit=\"h\"", "unit=\"%\"");
    let t = VoTable::new(relative.as_bytes(), Limits::default()).unwrap();
    let e = Importer::new(&m, t.columns(), "t.vot").err().unwrap();
    assert!(e.0.contains("`per_e` has the unit `%`"), "{e}");
    // A mapping `unit` that differs from the value's FIELD: refused, naming both (the value
    // was read in m/s and its uncertainty converted from its own field, 1000 times apart).
    let reused = mapping.replace("error = \"k_e\"\n", "error = \"k_e\"\nunit = \"m/s\"\n");
    let m = Mapping::from_toml(&reused).unwrap();
    let t = VoTable::new(text.as_bytes(), Limits::default()).unwrap();
    let e = Importer::new(&m, t.columns(), "t.vot").err().unwrap();
    assert!(
        e.0.contains("`unit = \"m/s\"`, but field `k` gives its unit as `km/s`"),
        "{e}"
    );
    // The same unit in another spelling agrees.
    let same = mapping.replace("error = \"k_e\"\n", "error = \"k_e\"\nunit = \"km s^-1\"\n");
    let m = Mapping::from_toml(&same).unwrap();
    let t = VoTable::new(text.as_bytes(), Limits::default()).unwrap();
    assert!(Importer::new(&m, t.columns(), "t.vot").is_ok());
}

/// A second TABLE, in the same RESOURCE or another, is refused: its rows would be lost.
#[test]
fn a_second_votable_table_is_refused() {
    let second = VOT.replace(
        "</TABLE></RESOURCE></VOTABLE>",
        "</TABLE></RESOURCE><RESOURCE><TABLE name=\"more\"><FIELD name=\"sys\"/><DATA><TABLEDATA><TR><TD>Pembrel</TD></TR></TABLEDATA></DATA></TABLE></RESOURCE></VOTABLE>",
    );
    let e = vot(&second, Limits::default()).unwrap_err();
    assert!(e.message.contains("a second TABLE `more`"), "{e}");
    // A table without data followed by another is refused as well.
    let empty_first = "<VOTABLE><RESOURCE><TABLE><FIELD name=\"a\"/></TABLE><TABLE name=\"b\"><FIELD name=\"x\"/></TABLE></RESOURCE></VOTABLE>";
    let e = VoTable::new(empty_first.as_bytes(), Limits::default())
        .err()
        .unwrap();
    assert!(e.message.contains("second TABLE `b`"), "{e}");
    // One table reads as before, and so does one followed by a table of references only
    // (every FIELD's UCD in the meta. family), as this project's own export writes.
    assert_eq!(vot(VOT, Limits::default()).unwrap().len(), 2);
    let refs = VOT.replace(
        "</TABLE></RESOURCE></VOTABLE>",
        "</TABLE><TABLE name=\"references\"><FIELD name=\"id\" ucd=\"meta.id\"/><FIELD name=\"text\" ucd=\"meta.bib\"/><DATA><TABLEDATA><TR><TD>a</TD><TD>Pell 2031</TD></TR></TABLEDATA></DATA></TABLE></RESOURCE></VOTABLE>",
    );
    assert_eq!(vot(&refs, Limits::default()).unwrap().len(), 2);
    // The table of references placed first is passed over too (with or without rows); alone,
    // it is no table of values, and the error says so.
    let table = "<TABLE name=\"references\"><FIELD name=\"id\" ucd=\"meta.id\"/><FIELD name=\"text\" ucd=\"meta.bib\"/><DATA><TABLEDATA><TR><TD>a</TD><TD>Pell 2031</TD></TR></TABLEDATA></DATA></TABLE>";
    // So is one whose UCDs are written in capitals (UCDs ignore letter case), and a table
    // with neither FIELDs nor data.
    let upper = table
        .replace("meta.id", "META.ID")
        .replace("meta.bib", "Meta.Bib");
    for first in [
        table,
        "<TABLE><FIELD name=\"id\" ucd=\"meta.id\"/></TABLE>",
        &upper,
        "<TABLE name=\"x\"></TABLE>",
        "<TABLE name=\"x\"><DATA><TABLEDATA></TABLEDATA></DATA></TABLE>",
        "<TABLE name=\"x\"><DATA><TABLEDATA/></DATA></TABLE>",
    ] {
        let refs_first = VOT.replace("<RESOURCE><TABLE>", &format!("<RESOURCE>{first}<TABLE>"));
        assert_eq!(
            vot(&refs_first, Limits::default()).unwrap(),
            vot(VOT, Limits::default()).unwrap()
        );
    }
    // Empty tables without FIELDs after the table of values are passed over as well; one
    // with rows is not (its columns are unknown), before or after.
    for after in [
        "<TABLE name=\"e\"><DATA></DATA></TABLE>",
        "<TABLE name=\"e\"><DATA><TABLEDATA/></DATA></TABLE>",
    ] {
        let text = VOT.replace(
            "</RESOURCE></VOTABLE>",
            &format!("{after}</RESOURCE></VOTABLE>"),
        );
        assert_eq!(vot(&text, Limits::default()).unwrap().len(), 2, "{after}");
    }
    let rows = "<TABLE name=\"e\"><DATA><TABLEDATA><TR><TD>1</TD></TR></TABLEDATA></DATA></TABLE>";
    let first = VOT.replace("<RESOURCE><TABLE>", &format!("<RESOURCE>{rows}<TABLE>"));
    assert!(vot(&first, Limits::default())
        .unwrap_err()
        .message
        .contains("rows but no FIELDs"));
    let last = VOT.replace(
        "</RESOURCE></VOTABLE>",
        &format!("{rows}</RESOURCE></VOTABLE>"),
    );
    assert!(vot(&last, Limits::default())
        .unwrap_err()
        .message
        .contains("second TABLE `e`"));
    let only = format!("<VOTABLE><RESOURCE>{table}</RESOURCE></VOTABLE>");
    let e = VoTable::new(only.as_bytes(), Limits::default())
        .err()
        .unwrap();
    assert!(e.message.contains("no TABLE of values: the only one, `references`, has every FIELD in the UCD family `meta.`"), "{e}");
    // A second table of rows without FIELDs is not passed over: its columns are unknown.
    let bare = VOT.replace(
        "</TABLE></RESOURCE></VOTABLE>",
        "</TABLE><TABLE name=\"bare\"><DATA><TABLEDATA><TR><TD>Oxbrin</TD></TR></TABLEDATA></DATA></TABLE></RESOURCE></VOTABLE>",
    );
    assert!(vot(&bare, Limits::default())
        .unwrap_err()
        .message
        .contains("second TABLE `bare`"));
}

/// Fresh ids: the base, then `_2`, `_3`..., past ids a table wrote itself; many names of one
/// base cost no more than distinct ones (each base keeps its next number).
#[test]
fn fresh_ids_are_unique_and_cheap() {
    let mut ids = super::names::Ids::default();
    assert_eq!(ids.fresh("b"), "b");
    assert_eq!(ids.fresh("b_3"), "b_3");
    assert_eq!(ids.fresh("b"), "b_2");
    assert_eq!(ids.fresh("b"), "b_4");
    let many: std::collections::HashSet<String> = (0..50_000).map(|_| ids.fresh("Kel")).collect();
    assert_eq!(many.len(), 50_000);
}

#[test]
fn names_from_tables_stay_names() {
    assert_eq!(syzygy_name("Orrin b", "planet"), "Orrin_b");
    assert_eq!(syzygy_name("3 Tarn", "planet"), "planet_3_Tarn");
    assert_eq!(syzygy_name("star", "star"), "star_star");
    assert_eq!(syzygy_name("☼☼", "star"), "star_unnamed");
    assert_eq!(syzygy_name("..", "planet"), "planet_unnamed");
    assert!(syzygy_name(&"x".repeat(500), "s").len() <= 64);
    // A valid name is kept whole, past the 64 bytes a made name is cut to.
    let long = format!("b{}", "_long".repeat(16));
    assert_eq!(syzygy_name(&long, "planet"), long);
    assert_eq!(syzygy_name("☉x", "planet"), "☉x");
    assert_eq!(syzygy_name("Orrin_b", "planet"), "Orrin_b");
    for hostile in [
        "../../etc/passwd",
        "/abs/path",
        "..",
        ".hidden",
        "a\\b",
        "C:\\x",
        "",
        "...",
    ] {
        let s = file_stem(hostile);
        assert!(
            !s.is_empty() && !s.starts_with(['.', '-']),
            "{hostile:?} -> {s:?}"
        );
        assert!(
            s.bytes()
                .all(|b| b.is_ascii_lowercase() || b.is_ascii_digit() || b == b'-'),
            "{s}"
        );
    }
    assert_eq!(file_stem("../../etc/passwd"), "etc-passwd");
    assert_eq!(file_stem("CON"), "con-system");
    assert_eq!(file_stem("nul"), "nul-system");
    assert_eq!(file_stem("Orrin & Co"), "orrin-co");
    assert!(file_stem(&"y".repeat(10_000)).len() <= 64);
}

#[test]
fn every_issue_kind_is_documented() {
    let doc = include_str!("../../../docs/import.md");
    for k in IssueKind::ALL {
        assert!(
            doc.contains(&format!("| `{}` |", k.id())),
            "docs/import.md lacks `{}`",
            k.id()
        );
    }
}

#[test]
fn a_quote_never_closed_is_an_error_not_rows_lost() {
    // Row 2's quote is never closed: every later line would become part of its cell.
    let csv = "sys,pl,per\nQuorlin,\"b,3\nVessa,c,4\nTorr,d,5\n";
    let mut t = CsvTable::new(csv.as_bytes(), None, Limits::default()).unwrap();
    let mut rows = 0;
    let e = loop {
        match t.next_row() {
            Ok(Some(_)) => rows += 1,
            Ok(None) => panic!("read to the end without a word after {rows} rows"),
            Err(e) => break e,
        }
    };
    assert_eq!(e.line, Some(2), "{e}");
    assert!(e.to_string().contains("never closed"), "{e}");
    // A closed quote spanning lines, and a lone inch mark in an unquoted cell, are fine.
    for ok in [
        "sys,pl,note\nQuorlin,b,\"two\nlines\"\nVessa,c,x\n",
        "sys,pl,note\nQuorlin,b,a 12\" mirror\nVessa,c,x\n",
        // An inch mark, then a quoted cell spanning lines at the very end (with a comment
        // after it): an odd number of quotes, all closed.
        "sys,pl,note\nQuorlin,b,x\nVessa,c 8\" A,\"multi\nline\"\n# the end\n",
    ] {
        let mut t = CsvTable::new(ok.as_bytes(), None, Limits::default()).unwrap();
        let mut n = 0;
        while t.next_row().unwrap().is_some() {
            n += 1;
        }
        assert_eq!(n, 2, "{ok}");
    }
}

#[test]
fn a_utf16_table_is_named_as_such() {
    let text = "sys,pl,per\nQuorlin,b,3\n";
    let le: Vec<u8> = [0xFF, 0xFE]
        .into_iter()
        .chain(text.encode_utf16().flat_map(u16::to_le_bytes))
        .collect();
    let no_mark: Vec<u8> = text.encode_utf16().flat_map(u16::to_be_bytes).collect();
    for bytes in [le, no_mark] {
        let e = CsvTable::new(bytes.as_slice(), None, Limits::default())
            .err()
            .expect("refused");
        assert!(e.to_string().contains("UTF-16"), "{e}");
    }
}

/// A row's line is the same whatever the file's line breaks: `\n`, `\r\n` (the usual
/// spreadsheet export) or a lone `\r`, also after a comment, a cell spanning lines and an
/// empty line.
#[test]
fn csv_lines_are_counted_for_every_line_break() {
    let lf = "sys,pl,note\n# a comment\nQuorlin,b,\"two\nlines\"\n\nVessa,c,x\n";
    for (name, text) in [
        ("LF", lf.to_string()),
        ("CRLF", lf.replace('\n', "\r\n")),
        ("CR", lf.replace('\n', "\r")),
    ] {
        let mut t = CsvTable::new(text.as_bytes(), None, Limits::default()).unwrap();
        let mut lines = Vec::new();
        while let Some(r) = t.next_row().unwrap() {
            lines.push((r.cells[0].clone(), r.line));
        }
        assert_eq!(
            lines,
            [("Quorlin".to_string(), 3), ("Vessa".to_string(), 6)],
            "{name}"
        );
    }
}

/// A VOTable cut short (inside its rows, or after them before the document closes) or with
/// anything but white space after its end is refused: its rows would otherwise be imported in
/// part without a word.
#[test]
fn a_votable_cut_short_or_with_content_after_it_is_refused() {
    assert_eq!(vot(VOT, Limits::default()).unwrap().len(), 2);
    let rows_end = VOT.find("</TR>").unwrap() + "</TR>".len();
    let e = vot(VOT.get(..rows_end).unwrap(), Limits::default()).unwrap_err();
    assert!(e.message.contains("ends inside the table's rows"), "{e}");
    let data_end = VOT.find("</TABLEDATA>").unwrap() + "</TABLEDATA>".len();
    let e = vot(VOT.get(..data_end).unwrap(), Limits::default()).unwrap_err();
    assert!(
        e.message.contains("ends before its elements are closed"),
        "{e}"
    );
    for tail in [
        "<VOTABLE/>",
        "junk",
        "<RESOURCE></RESOURCE>",
        "<![CDATA[x]]>",
        "<?xml version=\"1.0\"?>",
    ] {
        let e = vot(&format!("{VOT}\n{tail}\n"), Limits::default()).unwrap_err();
        assert!(
            e.message.contains("after the end of the VOTABLE document"),
            "{tail}: {e}"
        );
    }
    assert_eq!(
        vot(
            &format!("{VOT}\n  \n<!-- a comment -->\n"),
            Limits::default()
        )
        .unwrap()
        .len(),
        2
    );
}

/// A depth without a unit is refused at the mapping: depths are published as fractions, per
/// cent and ppm, and a column of per cent read as fractions made 0.02 % a depth of 2 %.
/// `unit = "1"` says it is a fraction, and is written without a unit.
#[test]
fn a_depth_needs_its_unit_said() {
    let base =
        "[bodies]\nsystem = \"sys\"\nplanet = \"pl\"\n[planet.transit_depth]\nvalue = \"depth\"\n";
    let columns = |csv: &str| {
        CsvTable::new(csv.as_bytes(), None, Limits::default())
            .unwrap()
            .columns()
            .to_vec()
    };
    let csv = "sys,pl,depth\nQuorlin,b,0.02\n";
    let m = Mapping::from_toml(base).unwrap();
    let e = Importer::new(&m, &columns(csv), "t.csv").err().unwrap();
    assert!(e.0.contains("give `unit`"), "{e}");
    let r = import_csv(csv, &format!("{base}unit = \"1\"\n"));
    let text = text_of(&r, "Quorlin");
    assert!(text.contains("transit_depth = 0.02\n"), "{text}");
    let r = import_csv(csv, &format!("{base}unit = \"%\"\n"));
    assert!(text_of(&r, "Quorlin").contains("transit_depth = 0.02 %"));
}

/// A reference key with no text in its row, a key other than the one its text first came
/// with, and a per-quantity reference beside an empty value are issues (each was dropped
/// without a word); the values themselves are imported.
#[test]
fn reference_cells_that_cannot_be_used_are_issues() {
    let mapping = "[bodies]\nsystem = \"sys\"\nplanet = \"pl\"\n[refs]\ntext = [\"paper\"]\nkey = \"pkey\"\n[planet.period]\nvalue = \"p\"\nunit = \"d\"\nref = \"p_ref\"\n";
    let csv = "sys,pl,p,p_ref,paper,pkey\n\
        Ulm,b,15.1,,,orphan\n\
        Ulm,c,3.2,,Harl 2031,vk29\n\
        Ulm,d,4.4,,Harl 2031,vk30\n\
        Ulm,e,,Penn 2031,,\n";
    let r = import_csv(csv, mapping);
    let said: Vec<(usize, Option<String>)> =
        r.issues.iter().map(|i| (i.row, i.column.clone())).collect();
    assert_eq!(
        said,
        [
            (1, Some("pkey".to_string())),
            (3, Some("pkey".to_string())),
            (4, Some("p_ref".to_string())),
        ],
        "{:#?}",
        r.issues
    );
    assert!(r.issues.iter().all(|i| i.kind == IssueKind::Unused));
    assert!(
        r.issues[1].message.contains("the key `vk29`"),
        "{}",
        r.issues[1].message
    );
    let text = text_of(&r, "Ulm");
    assert!(text.contains("period = 15.1 d\n"), "{text}");
    assert!(text.contains("period = 4.4 d [vk29]"), "{text}");
}

/// A VOTable row with fewer cells than fields has lost one, and the cells after it would
/// sit under the wrong fields: the row is refused whole, and said so. The table's PARAMs
/// are collected, so that the front end can name them (they are not imported).
#[test]
fn a_short_votable_row_is_refused_and_params_are_collected() {
    let text = r#"<?xml version="1.0"?>
<VOTABLE version="1.4"><RESOURCE>
<PARAM name="mst" datatype="double" value="0.77" unit="solMass"/>
<TABLE>
<FIELD name="sys" datatype="char" arraysize="*"/>
<FIELD name="pl" datatype="char" arraysize="*"/>
<FIELD name="per" datatype="double" unit="d"/>
<FIELD name="k" datatype="double" unit="m/s"/>
<DATA><TABLEDATA>
<TR><TD>Vintry</TD><TD>b</TD><TD>3.5</TD><TD>40</TD></TR>
<TR><TD>Wessel</TD><TD>b</TD><TD>4.5</TD></TR>
</TABLEDATA></DATA></TABLE></RESOURCE></VOTABLE>
"#;
    let mapping = "[bodies]\nsystem = \"sys\"\nplanet = \"pl\"\n[planet.period]\nvalue = \"per\"\n[planet.rv_amplitude]\nvalue = \"k\"\n";
    let m = Mapping::from_toml(mapping).unwrap();
    let mut t = VoTable::new(text.as_bytes(), Limits::default()).unwrap();
    assert!(t.full_rows());
    assert_eq!(
        t.params(),
        [crate::tables::Param {
            name: "mst".into(),
            value: "0.77".into(),
            unit: Some("solMass".into()),
        }]
    );
    let mut imp = Importer::new(&m, t.columns(), "t.vot")
        .unwrap()
        .with_full_rows(t.full_rows());
    while let Some(r) = t.next_row().unwrap() {
        imp.add_row(&r);
    }
    let r = imp.finish();
    assert_eq!(r.issues.len(), 1, "{:?}", r.issues);
    assert_eq!(r.issues[0].kind, IssueKind::MissingCells);
    assert!(r.issues[0]
        .message
        .contains("3 cells, the table has 4 fields"));
    assert_eq!(r.summary.skipped_cells, 3);
    assert_eq!(r.summary.systems, 1);
    // A CSV row may end early (writers drop trailing empty cells): read as it is.
    assert!(
        !CsvTable::new("a,b\n1\n".as_bytes(), None, Limits::default())
            .unwrap()
            .full_rows()
    );
}
