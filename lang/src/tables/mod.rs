//! Tables into Syzygy text: what `syz import` does, without the file system.
//!
//! ```text
//!  bytes ──csv_table.rs / votable.rs──▶ header + rows ──build.rs (under a mapping.rs Mapping)──▶
//!  systems of bodies and values ──emit.rs──▶ .syz text per system, laid out by `layout`
//! ```
//!
//! The readers take any `impl Read`, read incrementally and stop with a [`TableError`] at the
//! first cell, row or column count beyond [`Limits`]; a row that cannot be used costs that row
//! (an [`Issue`]), never the table. Every non-empty mapped cell ends in the output or in an
//! issue naming the row and column; `names.rs` turns table values into Syzygy names and safe
//! file names. The front end reads files and writes the results.

mod build;
mod csv_table;
mod emit;
mod mapping;
mod names;
mod own;
mod votable;

pub use build::{ImportResult, Importer, Summary, SystemText};
pub use csv_table::CsvTable;
pub use mapping::{
    BodyColumns, Constants, LimitCodes, Mapping, MappingError, QuantityColumns, RefColumns,
    TableFormat,
};
pub use names::{file_stem, syzygy_name};
pub use own::{import_sources, is_sources_table};
pub use votable::{vounit_to_syzygy, VoTable};

/// Bounds on what a reader accepts. The defaults suit real tables by a wide margin; tests
/// use small ones.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Limits {
    /// Largest cell, in bytes.
    pub max_cell_bytes: usize,
    /// Most columns in a table.
    pub max_columns: usize,
    /// Largest row (CSV: one record; VOTable: one element or text between tags), in bytes.
    pub max_row_bytes: usize,
}

impl Default for Limits {
    fn default() -> Self {
        Limits {
            max_cell_bytes: 64 * 1024,
            max_columns: 10_000,
            max_row_bytes: 4 * 1024 * 1024,
        }
    }
}

/// One column of a table: its name and, for a VOTable, the unit its FIELD declares.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Column {
    pub name: String,
    pub unit: Option<String>,
    /// A VOTable FIELD's `null` value (a cell holding it has no value).
    pub null: Option<String>,
    /// A VOTable FIELD of `datatype` `float` or `double`, where a `NaN` cell has no value
    /// (VOTable 1.4, section 6: the IEEE NaN represents null for floating-point fields).
    pub floating: bool,
}

/// A VOTable PARAM: a name, a value and a unit, for the whole table.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Param {
    pub name: String,
    pub value: String,
    pub unit: Option<String>,
}

/// One data row: 1-based number among the data rows, the line it starts on, its cells.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Row {
    pub number: usize,
    pub line: u64,
    pub cells: Vec<String>,
}

/// A source of rows: the CSV and VOTable readers.
pub trait RowSource {
    fn columns(&self) -> &[Column];
    /// The next row, `None` at the end; an error ends the table.
    fn next_row(&mut self) -> Result<Option<Row>, TableError>;
    /// Whether every row must have one cell per column (a VOTable's rows must: a row with
    /// fewer cells has lost one, and the cells after it sit under the wrong columns).
    fn full_rows(&self) -> bool {
        false
    }
    /// A VOTable's PARAMs (one value for the whole table), which the import does not read:
    /// the front end names them, so that none is passed over without a word.
    fn params(&self) -> &[Param] {
        &[]
    }
}

/// Why a table could not be read on (the import stops; exit status 2).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct TableError {
    /// The line the reader was at, when known.
    pub line: Option<u64>,
    pub message: String,
}

impl TableError {
    pub fn new(line: Option<u64>, message: impl Into<String>) -> Self {
        TableError {
            line,
            message: message.into(),
        }
    }
}

impl std::fmt::Display for TableError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self.line {
            Some(l) => write!(f, "line {l}: {}", self.message),
            None => f.write_str(&self.message),
        }
    }
}

/// A cell or row that was not imported, and why. `kind` is a stable id (docs/import.md).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Issue {
    pub kind: IssueKind,
    /// 1-based data row (0 when the issue is about the whole table).
    pub row: usize,
    pub line: u64,
    /// The column, when one cell is meant.
    pub column: Option<String>,
    pub message: String,
}

/// The kinds of issue, each documented in docs/import.md.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub enum IssueKind {
    /// A cell that should hold a number does not.
    BadNumber,
    /// A value outside the quantity's valid range.
    OutOfRange,
    /// A row without the system's name (or a planet row without its planet's name).
    MissingName,
    /// A planet whose host star is not declared in its system.
    MissingHost,
    /// Two rows give one quantity of one body different values without citing different
    /// sources.
    Conflict,
    /// A limit-flag cell with a code the mapping does not list.
    BadLimitCode,
    /// A row with more cells than the header (the extra cells are not read).
    ExtraCells,
    /// An uncertainty or other cell that cannot be used with its value (an uncertainty on a
    /// limit, an uncertainty without a value).
    Unused,
    /// A row of a table whose rows must be full (a VOTable) with fewer cells than columns.
    MissingCells,
    /// A system or body name equal to an earlier one but for letter case.
    NameCase,
    /// A system with more bodies than one system is read with.
    TooManyBodies,
    /// A row that repeats the header's column names (tables joined end to end).
    RepeatedHeader,
}

impl IssueKind {
    pub const ALL: [IssueKind; 12] = [
        IssueKind::BadNumber,
        IssueKind::OutOfRange,
        IssueKind::MissingName,
        IssueKind::MissingHost,
        IssueKind::Conflict,
        IssueKind::BadLimitCode,
        IssueKind::ExtraCells,
        IssueKind::MissingCells,
        IssueKind::Unused,
        IssueKind::NameCase,
        IssueKind::TooManyBodies,
        IssueKind::RepeatedHeader,
    ];

    pub fn id(self) -> &'static str {
        match self {
            IssueKind::BadNumber => "bad-number",
            IssueKind::OutOfRange => "out-of-range",
            IssueKind::MissingName => "missing-name",
            IssueKind::MissingHost => "missing-host",
            IssueKind::Conflict => "conflict",
            IssueKind::BadLimitCode => "bad-limit-code",
            IssueKind::ExtraCells => "extra-cells",
            IssueKind::MissingCells => "missing-cells",
            IssueKind::Unused => "unused-cell",
            IssueKind::NameCase => "name-case",
            IssueKind::TooManyBodies => "too-many-bodies",
            IssueKind::RepeatedHeader => "repeated-header",
        }
    }
}

/// The issue of a system written with more bodies than `syz` reads in one system
/// ([`crate::model::limits::MAX_SYSTEM_BODIES`]): the file is written whole, but checking it
/// would not read the bodies past the bound.
pub(crate) fn too_many_bodies(system: &str, bodies: usize) -> Option<Issue> {
    let max = crate::model::limits::MAX_SYSTEM_BODIES;
    (bodies > max).then(|| Issue {
        kind: IssueKind::TooManyBodies,
        row: 0,
        line: 0,
        column: None,
        message: format!(
            "system `{system}` has {bodies} bodies, and a system is read with at most {max}: `syz check` would not read the {} past them; give each star and its planets a system of its own",
            bodies - max
        ),
    })
}

impl Issue {
    /// `row 3 (line 5), column `mass`: message` — the table's name is put before it by the
    /// front end.
    pub fn place(&self) -> String {
        let mut s = if self.row == 0 {
            String::new()
        } else {
            format!("row {} (line {})", self.row, self.line)
        };
        if let Some(c) = &self.column {
            if !s.is_empty() {
                s.push_str(", ");
            }
            s.push_str(&format!("column `{c}`"));
        }
        s
    }
}

#[cfg(test)]
mod tests;
#[cfg(test)]
mod tests_hints;
