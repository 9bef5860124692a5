//! VOTable 1.4 tables in the TABLEDATA serialisation (IVOA VOTable 1.4, section 5.1): the
//! TABLE's FIELDs (name, unit, a VALUES `null`) and its rows; a document with a second TABLE
//! of values is refused, since its rows would be left out (see [`VoTable::finish`]). A DOCTYPE is refused, so
//! no DTD is read and no entity is declared; only the XML predefined entities and character
//! references are expanded (quick-xml's `unescape`). Every tag, text run, cell, row and the
//! field count are bounded, and the input is read incrementally.

use super::{Column, Limits, Param, Row, RowSource, TableError};
use quick_xml::events::{BytesStart, Event};
use std::io::BufRead;

/// Deepest element nesting accepted (a VOTable needs under ten levels).
const MAX_DEPTH: usize = 64;
/// Slack for the markup around one event, beyond the row limit.
const TAG_SLACK: usize = 64 * 1024;

/// A buffered reader that counts lines and fails when one event grows past its limit.
struct Counted<R> {
    inner: R,
    since: usize,
    limit: usize,
    line: u64,
}

impl<R: BufRead> std::io::Read for Counted<R> {
    fn read(&mut self, buf: &mut [u8]) -> std::io::Result<usize> {
        let available = self.fill_buf()?;
        let n = available.len().min(buf.len());
        if let (Some(dst), Some(src)) = (buf.get_mut(..n), available.get(..n)) {
            dst.copy_from_slice(src);
        }
        self.consume(n);
        Ok(n)
    }
}

impl<R: BufRead> BufRead for Counted<R> {
    fn fill_buf(&mut self) -> std::io::Result<&[u8]> {
        if self.since > self.limit {
            return Err(std::io::Error::other(format!(
                "a tag or text longer than {} bytes",
                self.limit
            )));
        }
        // Never hand out more than the rest of the allowance (plus one byte to go past it),
        // however much the inner reader holds.
        let room = self.limit.saturating_sub(self.since).saturating_add(1);
        let buf = self.inner.fill_buf()?;
        Ok(buf.get(..room).unwrap_or(buf))
    }

    fn consume(&mut self, amt: usize) {
        if let Ok(buf) = self.inner.fill_buf() {
            let taken = buf.get(..amt).unwrap_or(buf);
            self.line += taken.iter().filter(|b| **b == b'\n').count() as u64;
        }
        self.since = self.since.saturating_add(amt);
        self.inner.consume(amt);
    }
}

/// A VOTable being read.
pub struct VoTable<R: BufRead> {
    reader: quick_xml::Reader<Counted<R>>,
    buf: Vec<u8>,
    columns: Vec<Column>,
    /// The PARAMs met before the data, which are not read.
    params: Vec<Param>,
    limits: Limits,
    depth: usize,
    rows: usize,
    done: bool,
    /// Set once the root element has closed: anything but white space after it is refused.
    root_closed: bool,
}

impl<R: BufRead> VoTable<R> {
    /// Read up to the first TABLE's data, collecting its FIELDs.
    pub fn new(input: R, limits: Limits) -> Result<Self, TableError> {
        let counted = Counted {
            inner: input,
            since: 0,
            limit: limits.max_row_bytes.saturating_add(TAG_SLACK),
            line: 1,
        };
        let mut reader = quick_xml::Reader::from_reader(counted);
        reader.config_mut().check_end_names = true;
        let mut t = VoTable {
            reader,
            buf: Vec::new(),
            columns: Vec::new(),
            params: Vec::new(),
            limits,
            depth: 0,
            rows: 0,
            done: false,
            root_closed: false,
        };
        let mut in_table = false;
        let mut in_field = false;
        // Whether every FIELD of the table so far has a UCD of the `meta.` family: a table
        // of references only (this project's export writes one after its values), passed
        // over when it comes first, as [`VoTable::finish`] passes it over after.
        let mut meta_only = false;
        let mut table_name = String::new();
        let mut passed_over: Option<String> = None;
        loop {
            let (ev, name, attrs) = t.event()?;
            match (ev, name.as_str()) {
                (Kind::Start | Kind::Empty, "TABLE") => {
                    in_table = true;
                    meta_only = true;
                    t.columns.clear();
                    let get = |k: &str| attrs.iter().find(|(n, _)| n == k).map(|(_, v)| v.clone());
                    table_name = get("name").or_else(|| get("ID")).unwrap_or_default();
                }
                // A table with neither FIELDs nor data holds nothing: passed over.
                (Kind::End, "TABLE") if in_table && t.columns.is_empty() => in_table = false,
                (Kind::Start | Kind::Empty, "TABLEDATA") | (Kind::End, "TABLE")
                    if in_table && meta_only && !t.columns.is_empty() =>
                {
                    if name == "TABLEDATA" {
                        t.skip_to_table_end()?;
                    }
                    in_table = false;
                    t.columns.clear();
                    passed_over = Some(std::mem::take(&mut table_name));
                }
                (Kind::Start | Kind::Empty, "FIELD") if in_table => {
                    if t.columns.len() >= t.limits.max_columns {
                        return Err(t.error(format!(
                            "more than {} FIELDs, the limit of columns",
                            t.limits.max_columns
                        )));
                    }
                    let get = |k: &str| attrs.iter().find(|(n, _)| n == k).map(|(_, v)| v.clone());
                    meta_only &= get("ucd").is_some_and(|u| is_meta(&u));
                    let name = get("name").or_else(|| get("ID")).ok_or_else(|| {
                        t.error(format!("FIELD {} has no name", t.columns.len() + 1))
                    })?;
                    t.columns.push(Column {
                        name: name.trim().to_string(),
                        unit: get("unit").filter(|u| !u.trim().is_empty()),
                        null: None,
                        floating: get("datatype").is_some_and(|d| {
                            matches!(
                                d.trim(),
                                "float" | "double" | "floatComplex" | "doubleComplex"
                            )
                        }),
                    });
                    in_field = ev == Kind::Start;
                }
                (Kind::End, "FIELD") => in_field = false,
                (Kind::Start | Kind::Empty, "PARAM") => {
                    let get = |k: &str| attrs.iter().find(|(n, _)| n == k).map(|(_, v)| v.clone());
                    t.params.push(Param {
                        name: get("name").or_else(|| get("ID")).unwrap_or_default(),
                        value: get("value").unwrap_or_default(),
                        unit: get("unit").filter(|u| !u.trim().is_empty()),
                    });
                }
                (Kind::Start | Kind::Empty, "VALUES") if in_field => {
                    if let Some((_, v)) = attrs.iter().find(|(n, _)| n == "null") {
                        if let Some(c) = t.columns.last_mut() {
                            c.null = Some(v.trim().to_string());
                        }
                    }
                }
                (Kind::Start | Kind::Empty, "BINARY" | "BINARY2" | "FITS") if in_table => {
                    return Err(t.error(format!(
                        "the table is serialised as {name}; only TABLEDATA is read (ask the archive for TABLEDATA)"
                    )));
                }
                // Data under no FIELD: passed over when it holds no rows, refused when it does
                // (its columns are unknown).
                (Kind::Start | Kind::Empty, "TABLEDATA") if in_table && t.columns.is_empty() => {
                    t.skip_bare_table()?;
                    in_table = false;
                }
                (Kind::Start, "TABLEDATA") if in_table => return Ok(t),
                (Kind::Empty, "TABLEDATA") if in_table => {
                    t.finish()?;
                    return Ok(t);
                }
                (Kind::End, "TABLE") => {
                    // A TABLE without data: no rows.
                    t.finish()?;
                    return Ok(t);
                }
                (Kind::Eof, _) => {
                    return Err(match passed_over {
                        Some(n) => t.error(format!(
                            "no TABLE of values: the only one{} has every FIELD in the UCD family `meta.` (identifiers, references)",
                            if n.is_empty() { String::new() } else { format!(", `{n}`,") }
                        )),
                        None => t.error("no TABLE with TABLEDATA found; is this a VOTable?"),
                    })
                }
                _ => {}
            }
        }
    }

    /// The first table is read: the rest of the document must hold no other TABLE of values,
    /// whose rows would otherwise be left out without a word. A table whose every FIELD has a
    /// UCD of the `meta.` family (identifiers, bibliography: the table of references this
    /// project's own export adds) holds no values, and is passed over.
    fn finish(&mut self) -> Result<(), TableError> {
        self.done = true;
        let mut table: Option<String> = None;
        let mut values = false;
        let mut fields = 0usize;
        loop {
            let (ev, name, attrs) = self.event()?;
            let get = |k: &str| attrs.iter().find(|(n, _)| n == k).map(|(_, v)| v.clone());
            match (ev, name.as_str()) {
                (Kind::Start | Kind::Empty, "TABLE") => {
                    table = Some(get("name").or_else(|| get("ID")).unwrap_or_default());
                    values = false;
                    fields = 0;
                }
                (Kind::Start | Kind::Empty, "FIELD") if table.is_some() => {
                    fields += 1;
                    values |= !get("ucd").is_some_and(|u| is_meta(&u));
                }
                // Data of a table of values, or rows under no FIELD at all (rows of unknown
                // columns), are not passed over; a table without either is.
                (Kind::Start | Kind::Empty, "DATA") | (Kind::End, "TABLE")
                    if table.is_some() && values =>
                {
                    return Err(self.second_table(table.take()))
                }
                (Kind::Start | Kind::Empty, "TR") if table.is_some() && fields == 0 => {
                    return Err(self.second_table(table.take()))
                }
                (Kind::End, "TABLE") => table = None,
                (Kind::Eof, _) if self.depth > 0 => {
                    return Err(self
                        .error("the file ends before its elements are closed: it looks cut short"))
                }
                (Kind::Eof, _) => return Ok(()),
                _ => {}
            }
        }
    }

    fn second_table(&self, name: Option<String>) -> TableError {
        let called = name
            .filter(|n| !n.is_empty())
            .map(|n| format!(" `{n}`"))
            .unwrap_or_default();
        self.error(format!(
            "the file holds a second TABLE{called}; one table is read per file, so its rows would be left out: write each TABLE to a file of its own and import them together"
        ))
    }

    /// Read past the data of a table without FIELDs, to its end: refused if it holds a row.
    fn skip_bare_table(&mut self) -> Result<(), TableError> {
        loop {
            match self.event()? {
                (Kind::Start | Kind::Empty, name, _) if name == "TR" => {
                    return Err(
                        self.error("a TABLE has rows but no FIELDs, so its columns are unknown")
                    )
                }
                (Kind::End, name, _) if name == "TABLE" => return Ok(()),
                (Kind::Eof, _, _) => return Err(self.error("a TABLE is never closed")),
                _ => {}
            }
        }
    }

    /// Read past the rows of a table passed over, to its end.
    fn skip_to_table_end(&mut self) -> Result<(), TableError> {
        loop {
            match self.event()? {
                (Kind::End, name, _) if name == "TABLE" => return Ok(()),
                (Kind::Eof, _, _) => return Err(self.error("a TABLE is never closed")),
                _ => {}
            }
        }
    }

    fn error(&self, message: impl Into<String>) -> TableError {
        TableError::new(Some(self.reader.get_ref().line), message)
    }

    /// The next event's kind, element name and attributes (for start and empty tags); text
    /// is returned as the name of a `Text` kind, unescaped.
    fn event(&mut self) -> Result<(Kind, String, Attributes), TableError> {
        self.buf.clear();
        self.reader.get_mut().since = 0;
        let ev = match self.reader.read_event_into(&mut self.buf) {
            Ok(ev) => ev,
            Err(e) => {
                let line = self.reader.get_ref().line;
                return Err(TableError::new(
                    Some(line),
                    format!("not well-formed XML: {e}"),
                ));
            }
        };
        let line = self.reader.get_ref().line;
        let err = |m: String| TableError::new(Some(line), m);
        let after_root = || err("content after the end of the VOTABLE document".into());
        if self.root_closed
            && matches!(
                ev,
                Event::Start(_) | Event::Empty(_) | Event::CData(_) | Event::Decl(_)
            )
        {
            return Err(after_root());
        }
        let out =
            match ev {
                Event::Start(s) => {
                    self.depth += 1;
                    if self.depth > MAX_DEPTH {
                        return Err(err(format!("elements nested deeper than {MAX_DEPTH}")));
                    }
                    (Kind::Start, local(&s), attributes(&s).map_err(err)?)
                }
                Event::Empty(s) => (Kind::Empty, local(&s), attributes(&s).map_err(err)?),
                Event::End(e) => {
                    self.depth = self.depth.saturating_sub(1);
                    self.root_closed |= self.depth == 0;
                    (
                        Kind::End,
                        String::from_utf8_lossy(e.local_name().as_ref()).into_owned(),
                        Vec::new(),
                    )
                }
                Event::Text(t) => {
                    let text = t.unescape().map_err(|e| {
                        err(format!(
                        "{e}: only the XML predefined entities and character references are read"
                    ))
                    })?;
                    if self.root_closed && !text.trim().is_empty() {
                        return Err(after_root());
                    }
                    (Kind::Text, text.into_owned(), Vec::new())
                }
                Event::CData(c) => (
                    Kind::Text,
                    String::from_utf8_lossy(&c.into_inner()).into_owned(),
                    Vec::new(),
                ),
                Event::DocType(_) => return Err(err(
                    "the VOTable has a DOCTYPE; it is refused, so that no DTD or entity is read"
                        .into(),
                )),
                Event::Eof => (Kind::Eof, String::new(), Vec::new()),
                Event::Decl(_) | Event::PI(_) | Event::Comment(_) => {
                    (Kind::Other, String::new(), Vec::new())
                }
            };
        Ok(out)
    }
}

/// Whether a UCD is of the `meta.` family (identifiers, references). UCDs are compared
/// without regard to letter case (IVOA UCD 1.1 Recommendation, 2005: case is not
/// significant; from memory).
fn is_meta(ucd: &str) -> bool {
    ucd.trim()
        .get(..5)
        .is_some_and(|p| p.eq_ignore_ascii_case("meta."))
}

/// An element's attributes, by local name.
type Attributes = Vec<(String, String)>;

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Kind {
    Start,
    Empty,
    End,
    Text,
    Eof,
    Other,
}

fn local(s: &BytesStart) -> String {
    String::from_utf8_lossy(s.local_name().as_ref()).into_owned()
}

fn attributes(s: &BytesStart) -> Result<Attributes, String> {
    let mut out = Vec::new();
    for a in s.attributes() {
        let a = a.map_err(|e| format!("not well-formed XML: {e}"))?;
        let v = a.unescape_value().map_err(|e| {
            format!("{e}: only the XML predefined entities and character references are read")
        })?;
        out.push((
            String::from_utf8_lossy(a.key.local_name().as_ref()).into_owned(),
            v.into_owned(),
        ));
    }
    Ok(out)
}

impl<R: BufRead> RowSource for VoTable<R> {
    fn columns(&self) -> &[Column] {
        &self.columns
    }

    fn full_rows(&self) -> bool {
        true
    }

    fn params(&self) -> &[Param] {
        &self.params
    }

    fn next_row(&mut self) -> Result<Option<Row>, TableError> {
        if self.done {
            return Ok(None);
        }
        let mut cells: Option<Vec<String>> = None;
        let mut cell: Option<String> = None;
        let mut row_bytes = 0usize;
        let mut line = 0;
        loop {
            let (ev, name, _) = self.event()?;
            match (ev, name.as_str()) {
                (Kind::Start, "TR") => {
                    cells = Some(Vec::new());
                    line = self.reader.get_ref().line;
                    row_bytes = 0;
                }
                (Kind::Empty, "TR") => {
                    self.rows += 1;
                    let line = self.reader.get_ref().line;
                    return Ok(Some(Row {
                        number: self.rows,
                        line,
                        cells: Vec::new(),
                    }));
                }
                (Kind::Start, "TD") => cell = Some(String::new()),
                (Kind::Empty, "TD") => push(self, &mut cells, String::new())?,
                (Kind::Text, _) => {
                    if let Some(c) = cell.as_mut() {
                        c.push_str(&name);
                        row_bytes = row_bytes.saturating_add(name.len());
                        if c.len() > self.limits.max_cell_bytes {
                            return Err(self.error(format!(
                                "a cell holds more than {} bytes, the limit of a cell",
                                self.limits.max_cell_bytes
                            )));
                        }
                        if row_bytes > self.limits.max_row_bytes {
                            return Err(self.error(format!(
                                "a row holds more than {} bytes, the limit of a row",
                                self.limits.max_row_bytes
                            )));
                        }
                    }
                }
                (Kind::End, "TD") => {
                    let c = cell.take().unwrap_or_default();
                    push(self, &mut cells, c)?;
                }
                (Kind::End, "TR") => {
                    self.rows += 1;
                    let mut cells = cells.take().unwrap_or_default();
                    for (c, col) in cells.iter_mut().zip(&self.columns) {
                        let trimmed = c.trim();
                        if col.null.as_deref() == Some(trimmed)
                            || (col.floating && trimmed.eq_ignore_ascii_case("nan"))
                        {
                            c.clear();
                        } else if trimmed.len() != c.len() {
                            *c = trimmed.to_string();
                        }
                    }
                    return Ok(Some(Row {
                        number: self.rows,
                        line,
                        cells,
                    }));
                }
                (Kind::End, "TABLEDATA") => {
                    self.finish()?;
                    return Ok(None);
                }
                (Kind::Eof, _) => {
                    self.done = true;
                    return Err(self.error(
                        "the file ends inside the table's rows, without its closing </TABLEDATA>: it looks cut short, so rows may be missing",
                    ));
                }
                _ => {}
            }
        }
    }
}

fn push<R: BufRead>(
    t: &VoTable<R>,
    cells: &mut Option<Vec<String>>,
    cell: String,
) -> Result<(), TableError> {
    if let Some(cells) = cells.as_mut() {
        if cells.len() >= t.limits.max_columns {
            return Err(t.error(format!(
                "a row with more than {} cells, the limit of columns",
                t.limits.max_columns
            )));
        }
        cells.push(cell);
    }
    Ok(())
}

/// A VOUnit string (IVOA VOUnits 1.0) in Syzygy's spelling: `solMass` is `Msun`, `m.s**-1`
/// is `m/s`, `[cm/s2]` (a logarithm) is `dex`. Err says why there is no equivalent.
pub fn vounit_to_syzygy(vo: &str) -> Result<String, String> {
    let vo = vo.trim();
    if vo.is_empty() || vo == "---" || vo == "-" {
        return Ok(String::new());
    }
    // A logarithmic quantity: `[cm/s2]`, `[Sun]`, `[-]`, `log(...)`.
    if (vo.starts_with('[') && vo.ends_with(']')) || vo.starts_with("log(") {
        return Ok("dex".to_string());
    }
    if vo == "%" || vo == "ppm" {
        return Ok(vo.to_string());
    }
    if vo.starts_with(|c: char| c.is_ascii_digit()) {
        return scaled_unit(vo);
    }
    let mut num: Vec<String> = Vec::new();
    let mut den: Vec<String> = Vec::new();
    for (i, part) in vo.split('/').enumerate() {
        for (j, factor) in part.split('.').filter(|f| !f.is_empty()).enumerate() {
            let (sym, exp) = split_power(factor)?;
            let sym = syzygy_symbol(sym)?;
            // `/` divides by the one factor after it, as in Syzygy.
            let exp = if i > 0 && j == 0 { -exp } else { exp };
            let text = |e: i32| {
                if e == 1 {
                    sym.clone()
                } else {
                    format!("{sym}^{e}")
                }
            };
            if exp < 0 {
                den.push(text(-exp));
            } else {
                num.push(text(exp));
            }
        }
    }
    let mut out = num.join(" ");
    for d in den {
        if out.is_empty() {
            // Nothing above the line: write the negative power.
            out = d
                .split_once('^')
                .map_or(format!("{d}^-1"), |(s, e)| format!("{s}^-{e}"));
        } else {
            out.push('/');
            out.push_str(&d);
        }
    }
    Ok(out)
}

/// A unit with a scale factor (VOUnits 1.0, 2.7: `1.8981245973360505e27kg`, how Jupiter's
/// and the Earth's mass and radius are written, by `syz` among others, as VOUnit has no
/// symbols for them): the Syzygy unit of that size and dimension, among the astronomical
/// ones (Mjup, Mearth, Msun, Rjup, Rearth, Rsun, au), equal to a part in 10^9.
fn scaled_unit(vo: &str) -> Result<String, String> {
    // The factor is the longest leading run that reads as a number.
    let split = (1..=vo.len())
        .rev()
        .filter(|&i| vo.is_char_boundary(i))
        .find(|&i| vo[..i].parse::<f64>().is_ok())
        .unwrap_or(0);
    let (factor, rest) = vo.split_at(split);
    let factor: f64 = factor
        .parse()
        .map_err(|_| format!("cannot read the factor of `{vo}`"))?;
    let rest = vounit_to_syzygy(rest.trim_start_matches('.'))?;
    let unit = crate::units::parse_unit_text(&rest)
        .ok_or_else(|| format!("cannot read the unit of `{vo}`"))?;
    let size = factor * unit.factor;
    ["Mjup", "Mearth", "Msun", "Rjup", "Rearth", "Rsun", "au"]
        .into_iter()
        .find(|name| {
            crate::units::parse_unit_text(name)
                .is_some_and(|u| u.dim == unit.dim && ((u.factor - size) / u.factor).abs() < 1e-9)
        })
        .map(str::to_string)
        .ok_or_else(|| {
            format!("`{vo}` is {factor} times {rest}, no astronomical unit Syzygy knows")
        })
}

/// Why a temperature scale with an offset from kelvin (VOUnits' `Celsius`, and the usual
/// spellings of it and of Fahrenheit) cannot be read: a unit here is a factor, and 0 °C is
/// 273.15 K, not 0 K.
pub fn offset_scale(s: &str) -> Option<&'static str> {
    matches!(
        s,
        "Celsius" | "degC" | "deg_C" | "°C" | "℃" | "Fahrenheit" | "degF" | "deg_F" | "°F"
    )
    .then_some("a temperature scale with an offset from kelvin (0 °C is 273.15 K), which no unit factor can carry: convert the column to K")
}

/// `m**2`, `m^2`, `m2`, `s-1`, `m**(-2)` into symbol and exponent.
fn split_power(f: &str) -> Result<(&str, i32), String> {
    let bad = || format!("cannot read the factor `{f}`");
    if let Some((s, e)) = f.split_once("**").or_else(|| f.split_once('^')) {
        let e = e.trim_start_matches('(').trim_end_matches(')');
        let e: i32 = e.parse().map_err(|_| bad())?;
        return Ok((s, e));
    }
    let digits = f
        .char_indices()
        .rev()
        .take_while(|(_, c)| c.is_ascii_digit())
        .last()
        .map(|(i, _)| i);
    match digits {
        Some(0) => Err(format!("`{f}` is a number, not a unit")),
        Some(i) => {
            let (mut s, mut e) = f.split_at(i);
            let mut sign = 1;
            if let Some(rest) = s.strip_suffix(['-', '+']) {
                if s.ends_with('-') {
                    sign = -1;
                }
                s = rest;
            }
            if s.is_empty() {
                return Err(bad());
            }
            e = e.trim();
            let e: i32 = e.parse().map_err(|_| bad())?;
            Ok((s, sign * e))
        }
        None => Ok((f, 1)),
    }
}

/// One VOUnit symbol in Syzygy's spelling, if Syzygy knows the unit.
fn syzygy_symbol(s: &str) -> Result<String, String> {
    const NAMES: &[(&str, &str)] = &[
        ("solMass", "Msun"),
        ("solRad", "Rsun"),
        ("solLum", "Lsun"),
        ("jupiterMass", "Mjup"),
        ("jovMass", "Mjup"),
        ("jupiterRad", "Rjup"),
        ("jovRad", "Rjup"),
        ("earthMass", "Mearth"),
        ("geoMass", "Mearth"),
        ("earthRad", "Rearth"),
        ("geoRad", "Rearth"),
        ("AU", "au"),
        ("a", "yr"),
        ("ka", "kyr"),
        ("Ma", "Myr"),
        ("Ga", "Gyr"),
        ("ppm", "ppm"),
    ];
    if let Some((_, syz)) = NAMES.iter().find(|(v, _)| *v == s) {
        return Ok((*syz).to_string());
    }
    if let Some(why) = offset_scale(s) {
        return Err(why.into());
    }
    if crate::units::lookup(s).is_some() {
        return Ok(s.to_string());
    }
    Err(format!("`{s}` is not a unit Syzygy knows"))
}
