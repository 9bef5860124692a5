//! `syz eval --format votable`: the planet-centred table of `syzygy::table` as an IVOA VOTable
//! 1.4 document (TABLEDATA serialization), with a FIELD per column (unit in VOUnit syntax, a
//! UCD1+ descriptor where the vocabulary has one, a description saying what the column holds)
//! and a second table of the citations. docs/table-output.md documents it.

use crate::TableArg;
use std::fmt::Write as _;
use syzygy::quantities::Qty;
use syzygy::source::SourceDb;
use syzygy::table::{self, Cell, Column, Content, Flavor, Part};
use syzygy::Analysis;

/// The VOTable 1.4 namespace: 1.4 kept the namespace of 1.3 (VOTable 1.4 Recommendation,
/// section 3).
const NAMESPACE: &str = "http://www.ivoa.net/xml/VOTable/v1.3";

/// Text made safe for XML content and attribute values: the five special characters escaped,
/// and characters XML 1.0 does not allow replaced by U+FFFD.
pub fn escape(out: &mut String, text: &str) {
    for c in text.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&apos;"),
            '\t' | '\n' | '\r' => out.push(c),
            c if (c as u32) < 0x20 || c == '\u{FFFE}' || c == '\u{FFFF}' => out.push('\u{FFFD}'),
            c => out.push(c),
        }
    }
}

fn attr(out: &mut String, name: &str, value: &str) {
    let _ = write!(out, " {name}=\"");
    escape(out, value);
    out.push('"');
}

/// What a column holds, in words (the FIELD's DESCRIPTION).
fn description(column: &Column) -> String {
    match column.content {
        Content::File => "The file the values were read from".into(),
        Content::System => "System name".into(),
        Content::Planet => "Planet id (empty for a star that no planet orbits)".into(),
        Content::Host => "Id of the star the planet orbits".into(),
        Content::Refs => {
            "Every citation the row's values rest on, as 'id: text', separated by ' | '".into()
        }
        Content::Assumptions => {
            "Everything the row's values assumed (defaults, approximations), separated by ' | '"
                .into()
        }
        Content::Quantity(def, part) => {
            let whose = if def.kind == syzygy::ast::BodyKind::Star {
                "Host star: "
            } else {
                ""
            };
            let doc = def.doc.trim_end_matches('.');
            let unit_words = match (column.unit, def.display) {
                (Some("Mjup"), _) => {
                    " In Jupiter masses (IAU 2015 Resolution B3 nominal GM divided by G)."
                }
                (Some("Rjup"), _) => {
                    " In Jupiter equatorial radii (IAU 2015 Resolution B3 nominal)."
                }
                (None, "%") => " As a fraction (not a percentage).",
                (None, "dex") => " In dex.",
                _ => "",
            };
            match part {
                Part::Value if def.qty == Qty::TransitEpoch => format!(
                    "{whose}{doc}: a Julian date in the time system of {}.system",
                    def.name
                ),
                Part::Value => format!("{whose}{doc}: the value (a sample median with Monte Carlo; the limit for a limit).{unit_words}"),
                Part::Below => format!("{whose}{doc}: standard uncertainty below the value (0 for exact values and limits).{unit_words}"),
                Part::Above => format!("{whose}{doc}: standard uncertainty above the value (0 for exact values and limits).{unit_words}"),
                Part::Origin => format!("{whose}{doc}: declared, assumed, derived, default or estimated; ';upper-limit' or ';lower-limit' marks a limit"),
                Part::Refs => format!("{whose}{doc}: the citation ids the value rests on, separated by '; '"),
                Part::System => format!("{whose}{doc}: its Julian-date time system"),
            }
        }
    }
}

/// Everything before the first row: the document, its resource, the notes that say what the
/// numbers are, and the table's FIELDs.
pub fn head(propagation: &str, which: TableArg) -> String {
    let mut out = String::new();
    out.push_str("<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n");
    out.push_str("<VOTABLE version=\"1.4\"");
    attr(&mut out, "xmlns", NAMESPACE);
    out.push_str(">\n <RESOURCE type=\"results\">\n  <DESCRIPTION>");
    escape(
        &mut out,
        "Planets and their host stars as evaluated by syz: declared values and values derived from them. Derived values are estimates; each row's assumptions column says what was assumed.",
    );
    out.push_str("</DESCRIPTION>\n  <INFO name=\"generator\"");
    attr(
        &mut out,
        "value",
        concat!("syz ", env!("CARGO_PKG_VERSION")),
    );
    out.push_str("/>\n  <INFO name=\"propagation\"");
    attr(&mut out, "value", propagation);
    out.push_str("/>\n");
    // No TIMESYS (VOTable 1.4, section 4.6): one FIELD may reference only one, and the
    // epochs of a catalogue are Julian dates in the time system each row's
    // `transit_epoch.system` names (BJD_TDB, HJD_UTC, JD_UTC...). Labelling the column TDB at
    // the barycentre would have a reader that honours TIMESYS take a UTC or heliocentric
    // epoch as BJD_TDB (off by a minute and up to 8 minutes of light time).
    match which {
        TableArg::Planets => planet_fields(&mut out),
        TableArg::Sources => source_fields(&mut out),
    }
    out.push_str("   <DATA>\n    <TABLEDATA>\n");
    out
}

/// The planet-centred table's start and FIELDs.
fn planet_fields(out: &mut String) {
    out.push_str("  <TABLE name=\"planets\">\n");
    for column in table::columns(Flavor::VoTable) {
        out.push_str("   <FIELD");
        attr(out, "name", &column.name);
        if column.numeric() {
            out.push_str(" datatype=\"double\"");
        } else {
            out.push_str(" datatype=\"unicodeChar\" arraysize=\"*\"");
        }
        if let Some(unit) = column.unit.and_then(table::vo_unit) {
            attr(out, "unit", &unit);
        }
        if let Some(ucd) = table::column_ucd(&column) {
            attr(out, "ucd", &ucd);
        }
        out.push_str(">\n    <DESCRIPTION>");
        escape(out, &description(&column));
        out.push_str("</DESCRIPTION>\n   </FIELD>\n");
    }
}

/// The columns of the table of declared values: name, numeric, UCD, description.
const SOURCE_FIELDS: [(&str, &str, &str); 17] = [
    ("file", "meta.id;meta.file", "The file the value is declared in"),
    ("system", "meta.id", "System name"),
    ("body", "meta.id", "Id of the star or planet"),
    ("kind", "meta.code.class", "star or planet"),
    ("host", "meta.id", "A planet's host star id"),
    ("quantity", "", "The quantity's name in the language"),
    ("value", "stat.value", "The value as declared, in the row's unit (the limit for a limit)"),
    ("below", "stat.error", "Standard uncertainty below the value, in the row's unit"),
    ("above", "stat.error", "Standard uncertainty above the value, in the row's unit"),
    ("text", "", "The value of a text quantity (a spectral type)"),
    ("unit", "meta.unit", "The unit of value, below and above (the language's spelling; an epoch's Julian-date time system)"),
    ("limit", "meta.code.error", "upper or lower for a limit"),
    ("origin", "meta.code", "declared or assumed"),
    ("refs", "meta.ref", "The citation ids of the declaration, separated by '; '"),
    ("references", "meta.bib", "The cited references as 'id: text', separated by ' | '"),
    ("line", "meta.record", "The line of the declaration in its file"),
    ("used", "meta.code", "yes: the value used; no: another source is used; combined: the value used is a weighted mean of the sources"),
];

/// The table of declared values' start and FIELDs.
fn source_fields(out: &mut String) {
    out.push_str("  <TABLE name=\"sources\">\n");
    for (i, (name, ucd, what)) in SOURCE_FIELDS.iter().enumerate() {
        out.push_str("   <FIELD");
        attr(out, "name", name);
        // SOURCE_FIELDS and SOURCE_COLUMNS both start with the file's column.
        if !table::SourceRow::numeric(i) {
            out.push_str(" datatype=\"unicodeChar\" arraysize=\"*\"");
        } else {
            out.push_str(" datatype=\"double\"");
        }
        if !ucd.is_empty() {
            attr(out, "ucd", ucd);
        }
        out.push_str(">\n    <DESCRIPTION>");
        escape(out, what);
        out.push_str("</DESCRIPTION>\n   </FIELD>\n");
    }
}

/// The rows of one analysed file, and its citations as `(file, id, text)`.
pub fn rows(a: &Analysis, db: &dyn SourceDb, which: TableArg) -> (String, Vec<[String; 3]>) {
    let file = db.name(a.file);
    let mut out = String::new();
    let td = |out: &mut String, cell: &Cell| {
        out.push_str("<TD>");
        match cell {
            Cell::Empty => {}
            Cell::Text(t) => escape(out, t),
            Cell::Number(v) => {
                let _ = write!(out, "{v}");
            }
        }
        out.push_str("</TD>");
    };
    match which {
        TableArg::Planets => {
            let columns = table::columns(Flavor::VoTable);
            for row in table::rows(&a.model) {
                out.push_str("     <TR>");
                for column in &columns {
                    td(&mut out, &table::cell(a, file, row, column));
                }
                out.push_str("</TR>\n");
            }
        }
        TableArg::Sources => {
            let lines = db.line_index(a.file);
            let line = |offset: u32| lines.line_at(offset as usize) + 1;
            for row in table::source_rows(a, &line) {
                out.push_str("     <TR>");
                td(&mut out, &Cell::Text(file.into()));
                for cell in row.cells() {
                    td(&mut out, &cell);
                }
                out.push_str("</TR>\n");
            }
        }
    }
    let refs = a
        .model
        .refs
        .iter()
        // A shared reference is listed once, under the shared file that declares it.
        .map(|r| {
            let declared_in = r.shared.as_ref().map_or(file, |s| s.file.as_str());
            [declared_in.to_string(), r.id.clone(), r.text.clone()]
        })
        .collect();
    (out, refs)
}

/// Everything after the last row: the end of the first table, the table of citations, and
/// the notes on files that could not be read.
pub fn tail(refs: &[[String; 3]], unread: usize, errors: usize) -> String {
    let mut out = String::from("    </TABLEDATA>\n   </DATA>\n  </TABLE>\n");
    out.push_str("  <TABLE name=\"references\">\n");
    out.push_str("   <DESCRIPTION>The references the files cite; an id is only unique within its file.</DESCRIPTION>\n");
    for (name, ucd, what) in [
        (
            "file",
            "meta.id;meta.file",
            "The file that declares the reference",
        ),
        ("id", "meta.id", "The id values cite"),
        ("text", "meta.bib", "The reference as written"),
    ] {
        let _ = writeln!(
            out,
            "   <FIELD name=\"{name}\" datatype=\"unicodeChar\" arraysize=\"*\" ucd=\"{ucd}\"><DESCRIPTION>{what}</DESCRIPTION></FIELD>"
        );
    }
    out.push_str("   <DATA>\n    <TABLEDATA>\n");
    for r in refs {
        out.push_str("     <TR>");
        for cell in r {
            out.push_str("<TD>");
            escape(&mut out, cell);
            out.push_str("</TD>");
        }
        out.push_str("</TR>\n");
    }
    out.push_str("    </TABLEDATA>\n   </DATA>\n  </TABLE>\n");
    if unread > 0 || errors > 0 {
        out.push_str("  <INFO name=\"diagnostics\" value=\"errors\">");
        let _ = write!(
            out,
            "{unread} file(s) could not be read and {errors} file(s) have errors; their diagnostics are on standard error"
        );
        out.push_str("</INFO>\n");
    }
    out.push_str(" </RESOURCE>\n</VOTABLE>\n");
    out
}
