//! `syz eval --format csv`: the planet-centred table of `syzygy::table` (one row per planet,
//! its host star's values joined as `host.` columns), each column in one fixed unit listed in
//! docs/table-output.md, so that a table of many files can be read without looking at units
//! row by row.

use crate::TableArg;
use syzygy::source::SourceDb;
use syzygy::table::{self, Cell, Flavor};
use syzygy::Analysis;

/// The header line. Columns in a unit say so in their name's documentation, not in the header,
/// so that names stay stable.
pub fn header(which: TableArg) -> Result<Vec<u8>, csv::Error> {
    let mut w = csv::Writer::from_writer(Vec::new());
    match which {
        TableArg::Planets => {
            w.write_record(table::columns(Flavor::Csv).iter().map(|c| c.name.as_str()))?;
        }
        TableArg::Sources => w.write_record(table::SOURCE_COLUMNS)?,
    }
    w.into_inner().map_err(|e| csv::Error::from(e.into_error()))
}

fn write_cell<W: std::io::Write>(
    w: &mut csv::Writer<W>,
    buf: &mut String,
    cell: &Cell,
) -> Result<(), csv::Error> {
    use std::fmt::Write;
    match cell {
        Cell::Empty => w.write_field(""),
        Cell::Text(t) => w.write_field(t.as_bytes()),
        Cell::Number(v) => {
            // Rust's shortest form that reads back as the same number.
            buf.clear();
            let _ = write!(buf, "{v}");
            w.write_field(buf.as_bytes())
        }
    }
}

/// The rows of one analysed file, of the table asked for.
pub fn rows(a: &Analysis, db: &dyn SourceDb, which: TableArg) -> Result<Vec<u8>, csv::Error> {
    match which {
        TableArg::Planets => planet_rows(a, db),
        TableArg::Sources => {
            let lines = db.line_index(a.file);
            let line = |offset: u32| lines.line_at(offset as usize) + 1;
            let mut w = csv::Writer::from_writer(Vec::new());
            let mut buf = String::new();
            for row in table::source_rows(a, &line) {
                w.write_field(db.name(a.file))?;
                for cell in row.cells() {
                    write_cell(&mut w, &mut buf, &cell)?;
                }
                w.write_record(None::<&[u8]>)?;
            }
            w.into_inner().map_err(|e| csv::Error::from(e.into_error()))
        }
    }
}

/// The planet-centred rows of one analysed file.
fn planet_rows(a: &Analysis, db: &dyn SourceDb) -> Result<Vec<u8>, csv::Error> {
    let columns = table::columns(Flavor::Csv);
    let file = db.name(a.file);
    let mut w = csv::Writer::from_writer(Vec::new());
    let mut buf = String::new();
    for row in table::rows(&a.model) {
        for column in &columns {
            write_cell(&mut w, &mut buf, &table::cell(a, file, row, column))?;
        }
        w.write_record(None::<&[u8]>)?;
    }
    w.into_inner().map_err(|e| csv::Error::from(e.into_error()))
}
