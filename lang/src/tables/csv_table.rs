//! CSV tables: a header row, then data rows; `,`, tab or `;` separated (detected from the
//! header line unless given); quoted fields; lines starting with `#` are comments. Read
//! incrementally through the `csv` crate, with every row, cell and the column count bounded.

use super::{Column, Limits, Row, RowSource, TableError};
use std::io::Read;

/// Bytes looked at to detect the separator.
const SNIFF_BYTES: u64 = 64 * 1024;
/// The `csv` reader's buffer: a row may have been read ahead by this much.
const CSV_BUFFER: usize = 64 * 1024;

/// A reader that fails once more than `limit` bytes were read since the last `reset`, so that
/// no single row can make the `csv` reader grow its buffers without bound.
struct Capped<R> {
    inner: R,
    since: usize,
    limit: usize,
    /// Quote characters read so far outside comment lines: an odd count at the end means
    /// one was never closed (or an inch mark stands in a cell: see `last`).
    quotes: usize,
    /// The last byte read that is not white space, outside comment lines: a quoted cell
    /// closed at the end of the file leaves a quote here.
    last: u8,
    at_line_start: bool,
    in_comment: bool,
    /// Each line read but not yet passed: where it starts (the byte after the line break
    /// before it) and whether it is a comment or empty (no record starts there), so that a record's byte offset gives its line
    /// whatever the file's line breaks (the `csv` crate's own count is one short on `\r\n`
    /// files and stays at 1 on `\r` ones). The first is the line the last record was found
    /// on.
    lines: std::collections::VecDeque<(u64, bool)>,
    /// Lines already passed, bytes read so far, and whether the last byte was `\r`.
    passed: u64,
    offset: u64,
    after_cr: bool,
}

impl<R> Capped<R> {
    /// The 1-based line of the record that starts at byte `at` (as the `csv` reader counts
    /// bytes; it starts a record before the comment lines it skips). Calls must not go back:
    /// a line once passed is forgotten, which keeps memory to the read-ahead.
    fn line_at(&mut self, at: u64) -> u64 {
        let next_start = |l: &std::collections::VecDeque<(u64, bool)>| l.get(1).map(|x| x.0);
        while next_start(&self.lines).is_some_and(|s| s <= at)
            || (self.lines.front().is_some_and(|l| l.1) && self.lines.len() > 1)
        {
            self.lines.pop_front();
            self.passed += 1;
        }
        self.passed + 1
    }
}

impl<R: Read> Read for Capped<R> {
    /// Reads with every line break made `\n`: the `csv` crate takes a lone `\r` as the end
    /// of a record but not of a comment, so a comment in a file with `\r` line breaks would
    /// swallow every row after it, and it counts lines by `\n` alone.
    fn read(&mut self, buf: &mut [u8]) -> std::io::Result<usize> {
        loop {
            if self.since > self.limit {
                return Err(std::io::Error::other(RowTooLong));
            }
            let n = self.inner.read(buf)?;
            self.since += n;
            let mut kept = 0;
            for i in 0..n {
                let Some(&c) = buf.get(i) else { break };
                if c == b'\n' && self.after_cr {
                    // The `\n` of `\r\n`: its `\r` already ended the line.
                    self.after_cr = false;
                    continue;
                }
                self.after_cr = c == b'\r';
                let c = if c == b'\r' { b'\n' } else { c };
                if let Some(slot) = buf.get_mut(kept) {
                    *slot = c;
                }
                kept += 1;
                self.note(c);
            }
            // A read that kept nothing (a lone `\n` after a `\r`) is not the end of the file.
            if kept > 0 || n == 0 {
                return Ok(kept);
            }
        }
    }
}

impl<R> Capped<R> {
    /// Take note of one byte passed on to the `csv` reader (line breaks already `\n`).
    fn note(&mut self, c: u8) {
        self.offset += 1;
        match c {
            b'\n' => {
                // An empty line holds no record either: passed over like a comment.
                if let Some(l) = self.lines.back_mut().filter(|l| l.0 + 1 == self.offset) {
                    l.1 = true;
                }
                self.lines.push_back((self.offset, false));
            }
            b'#' if self.lines.back().is_some_and(|l| l.0 + 1 == self.offset) => {
                if let Some(l) = self.lines.back_mut() {
                    l.1 = true;
                }
            }
            _ => {}
        }
        if self.at_line_start {
            self.in_comment = c == b'#';
        }
        self.at_line_start = c == b'\n';
        if self.in_comment || c.is_ascii_whitespace() {
            return;
        }
        self.last = c;
        if c == b'"' {
            self.quotes += 1;
        }
    }
}

#[derive(Debug)]
struct RowTooLong;

impl std::fmt::Display for RowTooLong {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str("row too long")
    }
}

impl std::error::Error for RowTooLong {}

type Source<R> = Capped<std::io::Chain<std::io::Cursor<Vec<u8>>, R>>;

/// A CSV table being read.
pub struct CsvTable<R: Read> {
    reader: csv::Reader<Source<R>>,
    columns: Vec<Column>,
    limits: Limits,
    record: csv::ByteRecord,
    rows: usize,
    /// The line of the last record read, and that line again when one of its cells spans
    /// lines.
    line: u64,
    multiline: Option<u64>,
}

impl<R: Read> CsvTable<R> {
    /// Read the header; `delimiter` as the mapping gives it, else detected.
    pub fn new(mut input: R, delimiter: Option<char>, limits: Limits) -> Result<Self, TableError> {
        let mut prefix = Vec::new();
        (&mut input)
            .take(SNIFF_BYTES)
            .read_to_end(&mut prefix)
            .map_err(|e| TableError::new(None, format!("cannot read the table: {e}")))?;
        if prefix.starts_with(b"\xEF\xBB\xBF") {
            prefix.drain(..3);
        }
        // A table saved as UTF-16 (a byte-order mark, or a zero byte beside every ASCII
        // character) would otherwise be read as one column of garbled names.
        if prefix.starts_with(b"\xFF\xFE\x00\x00") || prefix.starts_with(b"\x00\x00\xFE\xFF") {
            return Err(TableError::new(
                None,
                "the table is encoded in UTF-32; save it as UTF-8 (the encoding CSV tables use)",
            ));
        }
        let utf16 = prefix.starts_with(b"\xFF\xFE")
            || prefix.starts_with(b"\xFE\xFF")
            || prefix.iter().take(200).filter(|&&b| b == 0).count() > 20;
        if utf16 {
            return Err(TableError::new(
                None,
                "the table is encoded in UTF-16; save it as UTF-8 (the encoding CSV tables use)",
            ));
        }
        let delimiter = match delimiter {
            Some(c) if c == ',' || c == '\t' || c == ';' => c as u8,
            Some(c) => {
                return Err(TableError::new(
                    None,
                    format!("the separator {c:?} is not one of `,`, tab and `;`"),
                ))
            }
            None => detect(&prefix),
        };
        let source = Capped {
            inner: std::io::Cursor::new(prefix).chain(input),
            since: 0,
            limit: limits.max_row_bytes.saturating_add(CSV_BUFFER),
            quotes: 0,
            last: 0,
            at_line_start: true,
            in_comment: false,
            lines: std::collections::VecDeque::from([(0, false)]),
            passed: 0,
            offset: 0,
            after_cr: false,
        };
        let reader = csv::ReaderBuilder::new()
            .has_headers(false)
            .flexible(true)
            .comment(Some(b'#'))
            .delimiter(delimiter)
            .buffer_capacity(CSV_BUFFER)
            .from_reader(source);
        let mut table = CsvTable {
            reader,
            columns: Vec::new(),
            limits,
            record: csv::ByteRecord::new(),
            rows: 0,
            line: 0,
            multiline: None,
        };
        let header = table
            .record()?
            .ok_or_else(|| TableError::new(None, "the table is empty: no header row"))?;
        table.columns = header
            .into_iter()
            .map(|name| Column {
                name: name.trim().to_string(),
                unit: None,
                null: None,
                floating: false,
            })
            .collect();
        Ok(table)
    }

    /// The next record's cells and line, within the limits.
    fn record(&mut self) -> Result<Option<Vec<String>>, TableError> {
        self.reader.get_mut().since = 0;
        let at = self.reader.position().byte();
        let line = self.reader.get_mut().line_at(at);
        match self.reader.read_byte_record(&mut self.record) {
            Ok(false) => {
                // A quote never closed makes the csv reader take every line after it into
                // one cell of the last row: those rows would vanish without a word.
                let source = self.reader.get_ref();
                let unclosed = source.quotes % 2 == 1 && source.last != b'"';
                if let (Some(at), true) = (self.multiline, unclosed) {
                    return Err(TableError::new(
                        Some(at),
                        "a quote that opens a cell on this row is never closed, so every line \
                         after it was read into that one cell; close it (a quote inside a \
                         quoted cell is written twice, `\"\"`)",
                    ));
                }
                return Ok(None);
            }
            Ok(true) => {}
            Err(e) => {
                let too_long = matches!(e.kind(), csv::ErrorKind::Io(io) if io.get_ref().is_some_and(|r| r.is::<RowTooLong>()));
                return Err(if too_long {
                    TableError::new(
                        Some(line),
                        format!(
                            "a row longer than {} bytes (a cell may hold at most {} bytes); is this a table?",
                            self.limits.max_row_bytes, self.limits.max_cell_bytes
                        ),
                    )
                } else {
                    TableError::new(Some(line), format!("cannot read the table: {e}"))
                });
            }
        }
        let line = match self.record.position().map(|p| p.byte()) {
            Some(at) => self.reader.get_mut().line_at(at),
            None => line,
        };
        self.line = line;
        self.multiline = self
            .record
            .iter()
            .any(|cell| cell.contains(&b'\n'))
            .then_some(line);
        if self.record.len() > self.limits.max_columns {
            return Err(TableError::new(
                Some(line),
                format!(
                    "{} columns, more than the limit of {}",
                    self.record.len(),
                    self.limits.max_columns
                ),
            ));
        }
        let mut cells = Vec::with_capacity(self.record.len());
        for (i, cell) in self.record.iter().enumerate() {
            if cell.len() > self.limits.max_cell_bytes {
                return Err(TableError::new(
                    Some(line),
                    format!(
                        "cell {} holds {} bytes, more than the limit of {}",
                        i + 1,
                        cell.len(),
                        self.limits.max_cell_bytes
                    ),
                ));
            }
            cells.push(String::from_utf8_lossy(cell).trim().to_string());
        }
        Ok(Some(cells))
    }
}

impl<R: Read> RowSource for CsvTable<R> {
    fn columns(&self) -> &[Column] {
        &self.columns
    }

    fn next_row(&mut self) -> Result<Option<Row>, TableError> {
        loop {
            let Some(cells) = self.record()? else {
                return Ok(None);
            };
            let line = self.line;
            // A blank line is no row.
            if cells.iter().all(|c| c.is_empty()) && cells.len() <= 1 {
                continue;
            }
            self.rows += 1;
            return Ok(Some(Row {
                number: self.rows,
                line,
                cells,
            }));
        }
    }
}

/// The separator of the first line that is not a comment: the most frequent of `,`, tab and
/// `;` outside quotes (`,` when none occurs).
fn detect(prefix: &[u8]) -> u8 {
    let line = prefix
        .split(|b| *b == b'\n' || *b == b'\r')
        .find(|l| {
            let t = l.trim_ascii();
            !t.is_empty() && !t.starts_with(b"#")
        })
        .unwrap_or(&[]);
    let mut counts = [(b',', 0usize), (b'\t', 0), (b';', 0)];
    let mut quoted = false;
    for &b in line {
        if b == b'"' {
            quoted = !quoted;
        } else if !quoted {
            for (c, n) in counts.iter_mut() {
                if *c == b {
                    *n += 1;
                }
            }
        }
    }
    counts
        .iter()
        .copied()
        .filter(|(_, n)| *n > 0)
        .max_by_key(|(_, n)| *n)
        .map_or(b',', |(c, _)| c)
}
