//! `syz eval --format csv`: the planet-centred table of `syzygy::table` (one row per planet,
//! its host star's values joined as `host.` columns), each column in one fixed unit listed in
//! docs/table-output.md, so that a table of many files can be read without looking at units
//! row by row.

use syzygy::source::SourceDb;
use syzygy::table::{self, Cell, Flavor};
use syzygy::Analysis;

/// The header line. Columns in a unit say so in their name's documentation, not in the header,
/// so that names stay stable.
pub fn header() -> Result<Vec<u8>, csv::Error> {
    let mut w = csv::Writer::from_writer(Vec::new());
    w.write_record(table::columns(Flavor::Csv).iter().map(|c| c.name.as_str()))?;
    w.into_inner().map_err(|e| csv::Error::from(e.into_error()))
}

/// The rows of one analysed file.
pub fn rows(a: &Analysis, db: &dyn SourceDb) -> Result<Vec<u8>, csv::Error> {
    use std::fmt::Write;
    let columns = table::columns(Flavor::Csv);
    let file = db.name(a.file);
    let mut w = csv::Writer::from_writer(Vec::new());
    let mut buf = String::new();
    for row in table::rows(&a.model) {
        for column in &columns {
            match table::cell(a, file, row, column) {
                Cell::Empty => w.write_field("")?,
                Cell::Text(t) => w.write_field(t.as_bytes())?,
                Cell::Number(v) => {
                    // Rust's shortest form that reads back as the same number.
                    buf.clear();
                    let _ = write!(buf, "{v}");
                    w.write_field(buf.as_bytes())?;
                }
            }
        }
        w.write_record(None::<&[u8]>)?;
    }
    w.into_inner().map_err(|e| csv::Error::from(e.into_error()))
}
