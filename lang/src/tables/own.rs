//! Tables `syz` writes itself, read back without a mapping: the table of declared values
//! (`syz eval --format csv|votable --table sources`, docs/table-output.md). Each row is one
//! declaration; every row becomes one line of a system file, so a catalogue exported this way
//! and imported again declares the same values, sources, limits, `assumed` marks, the chosen
//! source (as `preferred`) and references.

use super::build::{string_literal, ImportResult, Summary, SystemText};
use super::names::{file_stem, syzygy_name, Ids};
use super::{Column, Issue, IssueKind, RowSource, TableError};
use crate::ast::BodyKind;
use crate::quantities;
use std::collections::{BTreeMap, HashMap};
use std::fmt::Write;

/// The columns that make a table the table of declared values (`file`, `line` and
/// `references` may be absent).
const NEEDED: [&str; 13] = [
    "system", "body", "kind", "host", "quantity", "value", "below", "above", "text", "unit",
    "limit", "origin", "refs",
];

/// Whether `columns` are those of the table of declared values.
pub fn is_sources_table(columns: &[Column]) -> bool {
    NEEDED.iter().all(|n| columns.iter().any(|c| c.name == *n))
}

/// One body as read so far.
struct Body {
    id: String,
    /// The name in the table, when the id differs from it.
    table_name: Option<String>,
    kind: BodyKind,
    host: String,
    /// (quantity name, declaration text without the name, used, citation ids)
    decls: Vec<(&'static str, String, bool, Vec<String>)>,
    /// The quantities whose sources the table says were combined (`used` = `combined`).
    combined: Vec<&'static str>,
}

/// One system as read so far, in the order its bodies first appear.
#[derive(Default)]
struct System {
    name: String,
    bodies: Vec<Body>,
    /// The references its rows name, id to text (ids are only unique within a file).
    refs: BTreeMap<String, String>,
    /// The id given to each (body kind, or `None` for a reference; name in the table): two
    /// names that make the same id (`r_☉` and `r_x` once both made `r_`) get ids of their own.
    ids: HashMap<(Option<BodyKind>, String), String>,
    /// The ids given: references, and bodies (stars and planets share one scope).
    ref_ids: Ids,
    body_ids: Ids,
    /// Where each body is in `bodies`, by id (unique among bodies of either kind).
    at: HashMap<String, usize>,
}

impl System {
    /// The id of a reference (`reference`) or body named `name` in the table: the name made a
    /// Syzygy name, with `_2`, `_3`... when another name of the table already has that id.
    /// `kind` is the body's, `None` for a reference: a star and a planet of one name are two
    /// bodies, with two ids.
    fn id(&mut self, kind: Option<BodyKind>, name: &str) -> String {
        if let Some(id) = self.ids.get(&(kind, name.to_string())) {
            return id.clone();
        }
        let id = match kind {
            None => self.ref_ids.fresh(&syzygy_name(name, "ref")),
            Some(k) => self.body_ids.fresh(&syzygy_name(name, k.as_str())),
        };
        self.ids.insert((kind, name.to_string()), id.clone());
        id
    }
}

/// Read every row of a table of declared values into one system text per (file, system).
pub fn import_sources(source: &mut dyn RowSource, table: &str) -> Result<ImportResult, TableError> {
    let index: HashMap<String, usize> = source
        .columns()
        .iter()
        .enumerate()
        .map(|(i, c)| (c.name.clone(), i))
        .collect();
    let mut systems: Vec<System> = Vec::new();
    let mut by_key: HashMap<(String, String), usize> = HashMap::new();
    let mut issues = Vec::new();
    let mut summary = Summary::default();
    while let Some(row) = source.next_row()? {
        summary.rows += 1;
        let cell = |name: &str| {
            index
                .get(name)
                .and_then(|&i| row.cells.get(i))
                .map_or("", |s| s.trim())
        };
        let issue = |kind, column: &str, message: String| Issue {
            kind,
            row: row.number,
            line: row.line,
            column: Some(column.to_string()),
            message,
        };
        let (system, body_name) = (cell("system"), cell("body"));
        if system.is_empty() || body_name.is_empty() {
            let column = if system.is_empty() { "system" } else { "body" };
            issues.push(issue(
                IssueKind::MissingName,
                column,
                "no name: the row's value is not imported".into(),
            ));
            summary.skipped_cells += 1;
            continue;
        }
        let kind = match cell("kind") {
            "star" => BodyKind::Star,
            "planet" => BodyKind::Planet,
            other => {
                issues.push(issue(
                    IssueKind::Unused,
                    "kind",
                    format!(
                        "`{other}` is neither `star` nor `planet`: the row's value is not imported"
                    ),
                ));
                summary.skipped_cells += 1;
                continue;
            }
        };
        let Some(def) = quantities::find(kind, cell("quantity")) else {
            issues.push(issue(
                IssueKind::Unused,
                "quantity",
                format!(
                    "no {} quantity is called `{}`: the row's value is not imported",
                    kind.as_str(),
                    cell("quantity")
                ),
            ));
            summary.skipped_cells += 1;
            continue;
        };
        // The table's own words for what a value was and whether it was used: another word
        // would be read as a plain declaration without a word.
        let refused = [
            (
                "origin",
                &["", "declared", "assumed", "combined", "set"][..],
            ),
            ("used", &["", "yes", "no", "combined"][..]),
        ]
        .into_iter()
        .find(|(column, words)| !words.contains(&cell(column)));
        if let Some((column, words)) = refused {
            let listed: Vec<String> = words.iter().skip(1).map(|w| format!("`{w}`")).collect();
            issues.push(issue(
                IssueKind::Unused,
                column,
                format!(
                    "`{}` is none of {}: the row's value is not imported",
                    cell(column),
                    crate::text::and_list(&listed).replacen(" and ", " or ", 1)
                ),
            ));
            summary.skipped_cells += 1;
            continue;
        }
        if kind == BodyKind::Planet && cell("host").is_empty() {
            issues.push(issue(
                IssueKind::MissingHost,
                "host",
                "a planet's row names no host star: the row's value is not imported".into(),
            ));
            summary.skipped_cells += 1;
            continue;
        }
        let text = match declaration(def.text, &cell) {
            Ok(t) => t,
            Err((column, why)) => {
                issues.push(issue(
                    IssueKind::BadNumber,
                    column,
                    format!("{why}: the row's value is not imported"),
                ));
                summary.skipped_cells += 1;
                continue;
            }
        };
        let key = (cell("file").to_string(), system.to_string());
        let si = *by_key.entry(key).or_insert_with(|| {
            systems.push(System {
                name: system.to_string(),
                ..System::default()
            });
            systems.len() - 1
        });
        let Some(sys) = systems.get_mut(si) else {
            continue;
        };
        for (id, text) in reference_texts(cell("references")) {
            let id = sys.id(None, &id);
            sys.refs.entry(id).or_insert(text);
        }
        let refs: Vec<String> = cell("refs")
            .split(';')
            .map(str::trim)
            .filter(|r| !r.is_empty())
            .map(|r| sys.id(None, r))
            .collect();
        let mut line = text;
        if !refs.is_empty() {
            let _ = write!(line, " [{}]", refs.join(", "));
        }
        if cell("origin") == "assumed" {
            line.push_str(" assumed");
        }
        let id = sys.id(Some(kind), body_name);
        let bi = match sys.at.get(&id) {
            Some(&i) => {
                let host = cell("host");
                let earlier = sys.bodies.get(i).map_or("", |b| b.host.as_str());
                let same = sys
                    .ids
                    .get(&(Some(BodyKind::Star), host.to_string()))
                    .is_some_and(|id| id == earlier);
                if kind == BodyKind::Planet && !earlier.is_empty() && !same {
                    issues.push(issue(
                        IssueKind::Unused,
                        "host",
                        format!("an earlier row gives {body_name} the host `{earlier}`; this row's `{host}` is not used (its value is)"),
                    ));
                    summary.skipped_cells += 1;
                }
                i
            }
            None => {
                let host = match cell("host") {
                    "" => String::new(),
                    h => sys.id(Some(BodyKind::Star), h),
                };
                sys.at.insert(id.clone(), sys.bodies.len());
                sys.bodies.push(Body {
                    table_name: (id != body_name).then(|| body_name.to_string()),
                    id,
                    kind,
                    host,
                    decls: Vec::new(),
                    combined: Vec::new(),
                });
                sys.bodies.len() - 1
            }
        };
        if let Some(b) = sys.bodies.get_mut(bi) {
            b.decls.push((def.name, line, cell("used") == "yes", refs));
            if cell("used") == "combined" && !b.combined.contains(&def.name) {
                b.combined.push(def.name);
            }
            summary.values += 1;
        }
    }
    // A host star that declares nothing has no row of its own: it is still declared.
    for s in &mut systems {
        let hosts: Vec<String> = s
            .bodies
            .iter()
            .filter(|b| b.kind == BodyKind::Planet && !b.host.is_empty())
            .map(|b| b.host.clone())
            .collect();
        for id in hosts {
            // A host's id is made as a star's (`System::id`), so a body of that id is the star.
            if s.at.contains_key(&id) {
                continue;
            }
            s.at.insert(id.clone(), s.bodies.len());
            s.bodies.push(Body {
                table_name: None,
                id,
                kind: BodyKind::Star,
                host: String::new(),
                decls: Vec::new(),
                combined: Vec::new(),
            });
        }
    }
    let files = systems.iter().map(|s| system_text(s, table)).collect();
    for s in &systems {
        issues.extend(super::too_many_bodies(&s.name, s.bodies.len()));
    }
    summary.systems = systems.len();
    for s in &systems {
        for b in &s.bodies {
            match b.kind {
                BodyKind::Star => summary.stars += 1,
                BodyKind::Planet => summary.planets += 1,
            }
        }
    }
    Ok(ImportResult {
        files,
        issues,
        unmapped: Vec::new(),
        summary,
    })
}

/// The declaration after the quantity's name (`= 3.52474 ± 0.00002 d`, `< 0.08`), or the
/// column that cannot be read and why.
fn declaration<'a>(
    text_quantity: bool,
    cell: &dyn Fn(&str) -> &'a str,
) -> Result<String, (&'static str, String)> {
    if text_quantity {
        return Ok(format!("= {}", string_literal(cell("text"))));
    }
    let number = |column: &'static str| -> Result<Option<f64>, (&'static str, String)> {
        let c = cell(column);
        if c.is_empty() {
            return Ok(None);
        }
        match c.parse::<f64>() {
            Ok(v) if v.is_finite() => Ok(Some(v)),
            _ => Err((column, format!("`{c}` is not a number"))),
        }
    };
    let value = cell("value");
    if number("value")?.is_none() {
        return Err(("value", "no value".into()));
    }
    let unit = match cell("unit") {
        "" => String::new(),
        u => format!(" {u}"),
    };
    let op = match cell("limit") {
        "upper" => "<",
        "lower" => ">",
        "" => "=",
        other => return Err(("limit", format!("`{other}` is neither `upper` nor `lower`"))),
    };
    if op != "=" {
        // A limit takes no uncertainty: one given would vanish (0, as this table writes a
        // limit's, is none).
        for side in ["below", "above"] {
            if number(side)?.is_some_and(|v| v != 0.0) {
                return Err((
                    side,
                    "a limit takes no uncertainty, but this cell gives one".into(),
                ));
            }
        }
        return Ok(format!("{op} {value}{unit}"));
    }
    // One side given and the other empty would be written `+/-80`, which does not parse.
    for (side, other) in [("below", "above"), ("above", "below")] {
        if cell(side).is_empty() && !cell(other).is_empty() {
            return Err((
                side,
                format!("the uncertainty {side} is empty but the one {other} is given"),
            ));
        }
    }
    let (below, above) = (
        number("below")?.unwrap_or(0.0),
        number("above")?.unwrap_or(0.0),
    );
    if below < 0.0 || above < 0.0 {
        return Err(("below", "an uncertainty is negative".into()));
    }
    let spread = if below == 0.0 && above == 0.0 {
        String::new()
    } else if below == above {
        format!(" ± {}", cell("below"))
    } else {
        format!(" +{}/-{}", cell("above"), cell("below"))
    };
    Ok(format!("= {value}{spread}{unit}"))
}

/// One system's file: its references, then its bodies in the order they first appear, each
/// declaration in table order; of several declarations of one quantity, the one the table
/// says was used is marked `preferred`.
fn system_text(s: &System, table: &str) -> SystemText {
    let mut out = String::new();
    let _ = writeln!(
        out,
        "# Imported by `syz import` from {}.",
        table.replace(['\n', '\r'], " ")
    );
    // In order of first citation; a set keeps this linear in the citations.
    let mut seen = std::collections::HashSet::new();
    let cited: Vec<&str> = s
        .bodies
        .iter()
        .flat_map(|b| &b.decls)
        .flat_map(|d| &d.3)
        .map(String::as_str)
        .filter(|r| seen.insert(*r))
        .collect();
    for id in cited {
        let text = s.refs.get(id).map_or("", String::as_str);
        let _ = writeln!(out, "ref {id} {}", string_literal(text));
    }
    let _ = writeln!(out, "\nsystem {} {{", string_literal(&s.name));
    for b in &s.bodies {
        let has_host =
            s.at.get(&b.host)
                .and_then(|&i| s.bodies.get(i))
                .is_some_and(|h| h.kind == BodyKind::Star);
        if let Some(name) = &b.table_name {
            let _ = writeln!(out, "  # {} in the table", string_literal(name));
        }
        match b.kind {
            BodyKind::Planet if has_host => {
                let _ = writeln!(out, "  planet {} orbits {} {{", b.id, b.host);
            }
            kind => {
                let _ = writeln!(out, "  {} {} {{", kind.as_str(), b.id);
            }
        }
        let mut said: Vec<&str> = Vec::new();
        for (name, line, used, _) in &b.decls {
            if b.combined.contains(name) && !said.contains(name) {
                // No mark can say "combine these": the comment keeps what the table said.
                said.push(name);
                let _ = writeln!(
                    out,
                    "    # {name}: the exported table used the weighted mean of these sources; set `[sources] choice = \"weighted-mean\"` in syzygy.toml to use it here too"
                );
            }
            let several = b.decls.iter().filter(|d| d.0 == *name).count() > 1;
            let mark = if several && *used { " preferred" } else { "" };
            let _ = writeln!(out, "    {name} {line}{mark}");
        }
        out.push_str("  }\n");
    }
    out.push_str("}\n");
    let text = crate::layout::format_source(&out).unwrap_or(out);
    SystemText {
        system: s.name.clone(),
        stem: file_stem(&s.name),
        text,
    }
}

/// The `(id, text)` pairs of a `references` cell: `id: text` entries (a bare `id` for a
/// reference with no text) joined by ` | `, with `\|` and `\\` in a text standing for a
/// bar and a backslash (see `output::table`); any other backslash is kept as written.
fn reference_texts(cell: &str) -> Vec<(String, String)> {
    let mut entries = vec![String::new()];
    let mut chars = cell.chars().peekable();
    while let Some(c) = chars.next() {
        let mut ahead = chars.clone();
        let pushed = match (c, ahead.next(), ahead.next()) {
            ('\\', Some(next @ ('|' | '\\')), _) => {
                chars.next();
                next
            }
            (' ', Some('|'), Some(' ')) => {
                chars = ahead;
                entries.push(String::new());
                continue;
            }
            _ => c,
        };
        if let Some(e) = entries.last_mut() {
            e.push(pushed);
        }
    }
    entries
        .iter()
        .filter_map(|e| e.split_once(": "))
        .map(|(id, text)| (id.to_string(), text.to_string()))
        .collect()
}

#[cfg(test)]
mod tests {
    use super::reference_texts;
    use crate::tables::{CsvTable, IssueKind, Limits};

    /// Rows a spreadsheet could have made of the table of declared values: each is refused
    /// with an issue, or imported, and every file written parses (one-sided uncertainties
    /// and a planet without a host were written as text that did not; an uncertainty on a
    /// limit, a `used` or `origin` word of another kind and a second host went unsaid).
    #[test]
    fn rows_that_cannot_be_written_are_issues_and_what_is_written_parses() {
        let csv =
            "system,body,kind,host,quantity,value,below,above,text,unit,limit,origin,refs,used\n\
            Quill,quill,star,,teff,5100,80,,,K,,declared,,\n\
            Quill,quill,star,,mass,0.9,,0.05,,Msun,,declared,,\n\
            Quill,quill,star,,radius,0.9,0.02,0.02,,Rsun,,declared,,\n\
            Quill,c,planet,,period,4,0.1,0.1,,d,,declared,,\n\
            Quill,b,planet,quill,period,3,0.1,0.1,,d,,declared,,maybe\n\
            Quill,b,planet,quill,mass,2,,,,Mjup,,estimated,,\n\
            Quill,b,planet,quill,rv_amplitude,20,1,1,,m/s,upper,declared,,\n\
            Quill,b,planet,quill,impact,0.3,0.1,0.1,,,,declared,,\n\
            Quill,b,planet,other,transit_depth,0.5,0.01,0.01,,%,,declared,,\n";
        let mut t = CsvTable::new(csv.as_bytes(), Some(','), Limits::default()).unwrap();
        let r = super::import_sources(&mut t, "t.csv").unwrap();
        let said: Vec<(usize, IssueKind, Option<String>)> = r
            .issues
            .iter()
            .map(|i| (i.row, i.kind, i.column.clone()))
            .collect();
        let at = |c: &str| Some(c.to_string());
        assert_eq!(
            said,
            [
                (1, IssueKind::BadNumber, at("above")),
                (2, IssueKind::BadNumber, at("below")),
                (4, IssueKind::MissingHost, at("host")),
                (5, IssueKind::Unused, at("used")),
                (6, IssueKind::Unused, at("origin")),
                (7, IssueKind::BadNumber, at("below")),
                (9, IssueKind::Unused, at("host")),
            ],
            "{:#?}",
            r.issues
        );
        // The radius, the impact and the depth are imported.
        assert_eq!(r.summary.values, 3);
        for f in &r.files {
            let parsed = crate::parser::parse(crate::source::FileId(0), &f.text);
            assert!(
                parsed.diagnostics.is_empty(),
                "{}\n{:?}",
                f.text,
                parsed.diagnostics
            );
        }
    }

    fn pairs(cell: &str) -> Vec<(String, String)> {
        reference_texts(cell)
    }

    #[test]
    fn reference_texts_may_hold_the_separator() {
        let owned = |v: &[(&str, &str)]| -> Vec<(String, String)> {
            v.iter()
                .map(|(a, b)| (a.to_string(), b.to_string()))
                .collect()
        };
        assert_eq!(
            pairs(r"aa: Harl 2031 \| zz: Fenwick 2030 (erratum) | zz: Marrowby et al. 2033"),
            owned(&[
                ("aa", "Harl 2031 | zz: Fenwick 2030 (erratum)"),
                ("zz", "Marrowby et al. 2033")
            ])
        );
        // A bare id has no text; an escaped backslash is one; other backslashes stay.
        assert_eq!(
            pairs(r"x | y: A\&A 12 \\ 3|4"),
            owned(&[("y", r"A\&A 12 \ 3|4")])
        );
    }
}
