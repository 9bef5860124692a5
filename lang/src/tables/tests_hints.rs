//! Unit tests of what the importer says about cells and mappings that a curator got slightly
//! wrong: a limit or a "no value" word in a value cell, a header repeated inside the table,
//! a VOTable `NaN`, a mapping column in the wrong letter case, a misspelt unit.

use super::tests::{import_csv, text_of, vot, HEADER, MAPPING, VOT};
use super::*;

fn messages(r: &ImportResult, kind: IssueKind) -> Vec<String> {
    r.issues
        .iter()
        .filter(|i| i.kind == kind)
        .map(|i| i.message.clone())
        .collect()
}

#[test]
fn a_limit_written_into_the_value_cell_says_where_a_limit_goes() {
    let row = |mp: &str| {
        format!("Orrin,Orrin,Orrin b,,0.9,0.03,3.5,0.001,{mp},,,,0.1,\"Pell, 2031\",x\n")
    };
    for (cell, bound) in [("<5", "5"), ("< 5", "5"), (">0.3", "0.3"), ("<=2.5", "2.5")] {
        let r = import_csv(&format!("{HEADER}{}", row(cell)), MAPPING);
        let m = messages(&r, IssueKind::BadNumber);
        assert_eq!(m.len(), 1, "{cell}: {r:?}");
        // The mapping names a limit column for the planet's mass.
        assert!(
            m[0].contains(&format!("write `{bound}` in the value cell and the limit's code in the quantity's limit-flag column")),
            "{cell}: {m:?}"
        );
    }
    // Without a limit column in the mapping, the hint says to name one.
    let no_limit = MAPPING.replace("limit = \"mp_f\"\n", "");
    let r = import_csv(&format!("{HEADER}{}", row("<5")), &no_limit);
    let m = messages(&r, IssueKind::BadNumber);
    assert!(
        m[0].contains("name that column as the quantity's `limit` in the mapping"),
        "{m:?}"
    );
    // A word that is not a limit gets no limit hint.
    let r = import_csv(&format!("{HEADER}{}", row("<abc")), MAPPING);
    let m = messages(&r, IssueKind::BadNumber);
    assert!(!m[0].contains("limit"), "{m:?}");
}

#[test]
fn a_no_value_word_in_a_csv_cell_says_to_leave_it_empty() {
    for word in ["NaN", "nan", "N/A", "--", "null"] {
        let csv = format!(
            "{HEADER}Orrin,Orrin,Orrin b,,0.9,0.03,3.5,0.001,{word},,,,0.1,\"Pell, 2031\",x\n"
        );
        let r = import_csv(&csv, MAPPING);
        let m = messages(&r, IssueKind::BadNumber);
        assert_eq!(m.len(), 1, "{word}: {r:?}");
        assert!(m[0].contains("leave the cell empty"), "{word}: {m:?}");
    }
    let csv =
        format!("{HEADER}Orrin,Orrin,Orrin b,,0.9,0.03,3.5,0.001,heavy,,,,0.1,\"Pell, 2031\",x\n");
    let m = messages(&import_csv(&csv, MAPPING), IssueKind::BadNumber);
    assert!(!m[0].contains("leave the cell empty"), "{m:?}");
}

#[test]
fn a_repeated_header_row_is_an_issue_and_makes_no_system() {
    let row = "Orrin,Orrin,Orrin b,,0.9,0.03,3.5,0.001,0.5,0.04,0.03,,0.1,\"Pell, 2031\",x\n";
    let csv = format!("{HEADER}{row}{HEADER}{}", row.replace("Orrin", "Tarn"));
    let r = import_csv(&csv, MAPPING);
    let m = messages(&r, IssueKind::RepeatedHeader);
    assert_eq!(m.len(), 1, "{r:?}");
    let issue = r
        .issues
        .iter()
        .find(|i| i.kind == IssueKind::RepeatedHeader)
        .unwrap();
    assert_eq!((issue.row, issue.line), (2, 3));
    let systems: Vec<&str> = r.files.iter().map(|f| f.system.as_str()).collect();
    assert_eq!(systems, vec!["Orrin", "Tarn"], "{r:?}");
    // A row whose cells merely include a column's name is data.
    let csv = format!("{HEADER}sys,star,pl,,0.9,,,,,,,,,,\n");
    let r = import_csv(&csv, MAPPING);
    assert!(messages(&r, IssueKind::RepeatedHeader).is_empty(), "{r:?}");
    assert!(text_of(&r, "sys").contains("star star"), "{r:?}");
}

#[test]
fn extra_cells_count_their_cells_in_words_that_agree() {
    let csv = format!("{HEADER},,,,,,,,,,,,,,,1\n");
    let m = messages(&import_csv(&csv, MAPPING), IssueKind::ExtraCells);
    assert!(
        m[0].contains("none of the row's 1 non-empty cell is imported"),
        "{m:?}"
    );
    let csv = format!("{HEADER}Orrin,,,,,,,,,,,,,,,1\n");
    let m = messages(&import_csv(&csv, MAPPING), IssueKind::ExtraCells);
    assert!(
        m[0].contains("none of the row's 2 non-empty cells are imported"),
        "{m:?}"
    );
}

#[test]
fn votable_nan_is_null_in_floating_point_fields_only() {
    // VOTable 1.4, section 6: for float and double fields the IEEE NaN stands for null.
    let doc = VOT.replace(
        "<TR><TD>Tarn</TD><TD>-1</TD><TD/><TD></TD></TR>",
        "<TR><TD>Tarn</TD><TD>NaN</TD><TD> nan </TD><TD>NaN</TD></TR>",
    );
    let rows = vot(&doc, Limits::default()).unwrap();
    // `ref` is a char field: its `NaN` is text.
    assert_eq!(rows[1].cells, vec!["Tarn", "", "", "NaN"]);
}

#[test]
fn a_mapping_column_missing_from_the_header_names_the_close_one() {
    let err = |mapping: &str| {
        let m = Mapping::from_toml(mapping).unwrap();
        let t = CsvTable::new(HEADER.as_bytes(), m.delimiter, Limits::default()).unwrap();
        Importer::new(&m, t.columns(), "t.csv").err().unwrap().0
    };
    let e = err(&MAPPING.replace("value = \"ms\"", "value = \"MS\""));
    assert!(
        e.contains("column `MS` is not in the table's header; the header has `ms`, which differs only in letter case"),
        "{e}"
    );
    let e = err(&MAPPING.replace("value = \"mp\"", "value = \"mpp\""));
    assert!(e.ends_with("did you mean `mp`?"), "{e}");
    let e = err(&MAPPING.replace("value = \"mp\"", "value = \"radius_of_everything\""));
    assert!(e.ends_with("is not in the table's header"), "{e}");
}

#[test]
fn a_misspelt_mapping_unit_gets_a_suggestion_of_the_quantity_s_dimension() {
    let err = |unit: &str| {
        let m =
            Mapping::from_toml(&MAPPING.replace("unit = \"Mjup\"", &format!("unit = \"{unit}\"")))
                .unwrap();
        let t = CsvTable::new(HEADER.as_bytes(), m.delimiter, Limits::default()).unwrap();
        Importer::new(&m, t.columns(), "t.csv").err().unwrap().0
    };
    let e = err("Mjupp");
    assert!(
        e.contains("`Mjupp` is not a Syzygy unit") && e.ends_with("did you mean `Mjup`?"),
        "{e}"
    );
    let e = err("zzzzzz");
    assert!(e.ends_with("\"Units\")"), "{e}");
}

#[test]
fn two_values_citing_one_paper_name_it_instead_of_asking_for_a_reference_column() {
    // The mapping has a reference column, and both rows fill it with the same paper.
    let csv = format!(
        "{HEADER}Orrin,Orrin,b,,,,3.5,0.01,,,,,,P1 2030,\nOrrin,Orrin,b,,,,3.6,0.01,,,,,,P1 2030,\n"
    );
    let r = import_csv(&csv, MAPPING);
    let m = messages(&r, IssueKind::Conflict);
    assert_eq!(m.len(), 1, "{r:?}");
    assert!(m[0].contains("both rows cite `p2030`"), "{m:?}");
    assert!(m[0].contains("give each row its own reference"), "{m:?}");
    assert!(!m[0].contains("add a reference column"), "{m:?}");
}

/// One paper typed three ways (spacing, letter case) is one reference, as `syz check` judges
/// reference texts: imported as three, a weighted mean counted its period three times.
#[test]
fn a_reference_text_typed_differently_is_one_reference() {
    let csv = format!(
        "{HEADER}Vosk,Vosk,b,,,,3.1,0.01,,,,,,Quillon et al. 2030,\nVosk,Vosk,b,,,,3.1,0.01,,,,,,\"Quillon et al.  2030 \",\nVosk,Vosk,b,,,,3.1,0.01,,,,,,quillon et al. 2030,\n"
    );
    let r = import_csv(&csv, MAPPING);
    let t = text_of(&r, "Vosk");
    assert_eq!(t.matches("ref ").count(), 1, "{t}");
    assert_eq!(t.matches("period =").count(), 1, "{t}");
    assert!(r.issues.is_empty(), "{:?}", r.issues);
}

/// A reference key given to two different texts (a copied cell) is a conflict, not a
/// silent second id.
#[test]
fn a_reference_key_reused_for_another_text_is_a_conflict() {
    let mapping = MAPPING.replace("text = [\"paper\"]", "text = [\"paper\"]\nkey = \"note\"");
    let mapping = mapping.replace("ignore = [\"note\"]\n", "");
    let csv = format!(
        "{HEADER}Lorn,Lorn,b,,,,3.1,0.01,,,,,,Alpha 2030,star\nLorn,Lorn,c,,,,7.1,0.01,,,,,,Gamma 2032,star\n"
    );
    let r = import_csv(&csv, &mapping);
    let m = messages(&r, IssueKind::Conflict);
    assert_eq!(m.len(), 1, "{:?}", r.issues);
    assert!(
        m[0].contains("`star` was given to another text earlier (\"Alpha 2030\")"),
        "{}",
        m[0]
    );
    assert!(text_of(&r, "Lorn").contains("ref ref_star_2 \"Gamma 2032\""));
}
