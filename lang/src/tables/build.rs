//! Rows into systems of bodies and values, under a mapping. Every non-empty mapped cell is
//! either kept in a declaration or named in an [`Issue`]; nothing is dropped quietly.

use super::mapping::{Plan, QuantityPlan};
use super::names::{syzygy_name, Ids};
use super::{Column, Issue, IssueKind, Mapping, MappingError, Row};
use crate::ast::BodyKind;
use crate::quantities::QuantityDef;
use std::collections::{BTreeSet, HashMap};

mod cells;
mod refs;

pub(crate) use cells::string_literal;
use cells::{not_a_number_hint, number, shorten};

/// One declaration of a quantity, as it will be written.
#[derive(Debug, Clone)]
pub(crate) struct Decl {
    pub def: &'static QuantityDef,
    /// `=`, `<` or `>`.
    pub op: char,
    /// The value after the operator, with its uncertainty and unit.
    pub text: String,
    pub refs: BTreeSet<String>,
    pub row: usize,
}

#[derive(Debug, Clone)]
pub(crate) struct Body {
    pub kind: BodyKind,
    pub id: String,
    /// The name as the table wrote it.
    pub table_name: String,
    /// A planet's host, as the table names it.
    pub host: Option<String>,
    pub decls: Vec<Decl>,
    pub row: usize,
    pub line: u64,
    /// The column the host came from, for a missing-host issue.
    pub host_column: Option<String>,
    /// Non-empty mapped cells this body holds (its name included), counted if it is dropped.
    pub cells: usize,
}

#[derive(Debug, Clone)]
pub(crate) struct System {
    pub name: String,
    pub bodies: Vec<Body>,
    /// (kind, name in the table) to index in `bodies`.
    index: HashMap<(BodyKind, String), usize>,
    /// The body ids given.
    ids: Ids,
}

/// What an import made of one table.
#[derive(Debug, Clone, Default, PartialEq, Eq)]
pub struct Summary {
    pub rows: usize,
    pub systems: usize,
    pub stars: usize,
    pub planets: usize,
    /// Values written (declarations from cells; constants not counted).
    pub values: usize,
    /// Rows repeating a value already declared with the same sources (kept once).
    pub merged: usize,
    /// Non-empty mapped cells that are in no output file (each named in an issue).
    pub skipped_cells: usize,
}

/// One system's file.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct SystemText {
    pub system: String,
    /// The file stem made from the system's name (see `names::file_stem`).
    pub stem: String,
    pub text: String,
}

/// Everything an import produced.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct ImportResult {
    pub files: Vec<SystemText>,
    pub issues: Vec<Issue>,
    /// Columns nobody reads, in table order.
    pub unmapped: Vec<String>,
    pub summary: Summary,
}

/// Rows in, systems out: `Importer::new`, then `add_row` for every row, then `finish`.
pub struct Importer {
    /// Shared so that each row can read it while the importer changes.
    plan: std::sync::Arc<Plan>,
    columns: Vec<String>,
    table: String,
    systems: Vec<System>,
    system_index: HashMap<String, usize>,
    /// The id of each reference text, by its text with case and white space normalised.
    ref_ids: HashMap<String, String>,
    /// The key cell each reference text first came with (empty for none), by normalised text.
    ref_keys: HashMap<String, String>,
    ref_texts: HashMap<String, String>,
    ref_names: Ids,
    issues: Vec<Issue>,
    summary: Summary,
    /// Every row must have a cell per column ([`super::RowSource::full_rows`]).
    full_rows: bool,
}

impl Importer {
    /// Resolve the mapping against the table's columns. `table` names the table in the
    /// files' header comment.
    pub fn new(mapping: &Mapping, columns: &[Column], table: &str) -> Result<Self, MappingError> {
        let plan = std::sync::Arc::new(Plan::new(mapping, columns)?);
        Ok(Importer {
            plan,
            columns: columns.iter().map(|c| c.name.clone()).collect(),
            table: table.to_string(),
            systems: Vec::new(),
            system_index: HashMap::new(),
            ref_ids: HashMap::new(),
            ref_keys: HashMap::new(),
            ref_texts: HashMap::new(),
            ref_names: Ids::default(),
            issues: Vec::new(),
            summary: Summary::default(),
            full_rows: false,
        })
    }

    /// Columns nobody reads (not mapped, not ignored).
    pub fn unmapped(&self) -> &[String] {
        &self.plan.unmapped
    }

    fn column(&self, i: usize) -> String {
        self.columns
            .get(i)
            .cloned()
            .unwrap_or_else(|| format!("#{}", i + 1))
    }

    fn issue(&mut self, kind: IssueKind, row: &Row, col: Option<usize>, message: String) {
        let column = col.map(|c| self.column(c));
        self.issues.push(Issue {
            kind,
            row: row.number,
            line: row.line,
            column,
            message,
        });
    }

    /// Non-empty cells of the row among `cols`.
    fn filled(row: &Row, cols: impl IntoIterator<Item = usize>) -> Vec<usize> {
        cols.into_iter()
            .filter(|c| row.cells.get(*c).is_some_and(|v| !v.is_empty()))
            .collect()
    }

    /// Columns a quantity reads besides its value.
    fn companions(q: &QuantityPlan) -> impl Iterator<Item = usize> {
        [q.error, q.above, q.below, q.limit, q.refs]
            .into_iter()
            .flatten()
    }

    /// Whether every mapped cell of the row holds its own column's name (a header row again).
    fn repeats_header(&self, row: &Row) -> bool {
        let mut mapped = self
            .plan
            .used
            .iter()
            .zip(&self.columns)
            .enumerate()
            .filter(|(_, (used, _))| **used)
            .peekable();
        mapped.peek().is_some()
            && mapped.all(|(i, (_, c))| {
                row.cells
                    .get(i)
                    .is_some_and(|cell| cell.trim() == c.as_str())
            })
    }

    /// Refuse rows with fewer cells than columns, for a source whose rows must be full
    /// ([`super::RowSource::full_rows`]).
    pub fn with_full_rows(mut self, full: bool) -> Self {
        self.full_rows = full;
        self
    }

    /// Import one row.
    pub fn add_row(&mut self, row: &Row) {
        self.summary.rows += 1;
        let cell = |i: Option<usize>| -> &str {
            i.and_then(|i| row.cells.get(i)).map_or("", |s| s.as_str())
        };
        let extra: Vec<usize> = (self.columns.len()..row.cells.len())
            .filter(|i| row.cells.get(*i).is_some_and(|c| !c.is_empty()))
            .collect();
        // A row whose cells may have moved is refused whole: every cell after the slip would
        // be read under the wrong column, with nothing to show it. More cells than columns:
        // an unquoted decimal comma (`1,05` is two cells). Fewer, where every row must be
        // full (a VOTable row has one TD per FIELD): a cell lost.
        let shifted = if !extra.is_empty() {
            Some((
                IssueKind::ExtraCells,
                format!(
                    "the header has {} columns: the cells may be shifted (an unquoted decimal comma, or a comma inside a value, makes two cells of one)",
                    self.columns.len()
                ),
                "quote such a cell, or write the number with a decimal point",
            ))
        } else if self.full_rows && !row.cells.is_empty() && row.cells.len() < self.columns.len() {
            Some((
                IssueKind::MissingCells,
                format!(
                    "the table has {} fields: a cell is missing, so those after it would sit under the wrong fields",
                    self.columns.len()
                ),
                "give every field of the row its <TD> (an empty <TD/> for no value)",
            ))
        } else {
            None
        };
        if let Some((kind, why, fix)) = shifted {
            let filled = row.cells.iter().filter(|c| !c.is_empty()).count();
            self.summary.skipped_cells += filled;
            let cells = if filled == 1 { "cell is" } else { "cells are" };
            self.issue(
                kind,
                row,
                None,
                format!(
                    "{} cells, {why}, so none of the row's {filled} non-empty {cells} imported; {fix}",
                    row.cells.len()
                ),
            );
            return;
        }
        if self.repeats_header(row) {
            // Tables joined end to end keep each part's header: read as data, it made a
            // system called `system` with bodies called `star` and `planet`.
            self.issue(
                IssueKind::RepeatedHeader,
                row,
                None,
                "the row repeats the header's column names (tables joined end to end?), so it is read as no values".to_string(),
            );
            return;
        }
        let plan = std::sync::Arc::clone(&self.plan);
        let system = cell(Some(plan.system)).to_string();
        if system.is_empty() {
            let lost = Self::filled(
                row,
                (0..self.columns.len())
                    .filter(|i| plan.used.get(*i) == Some(&true) && *i != plan.system),
            );
            self.summary.skipped_cells += lost.len();
            if !lost.is_empty() {
                self.issue(
                    IssueKind::MissingName,
                    row,
                    Some(plan.system),
                    format!(
                        "no system name; the row's {} other cells are not imported",
                        lost.len()
                    ),
                );
            }
            return;
        }
        let star_name = match plan.star {
            Some(c) => cell(Some(c)).to_string(),
            None => system.clone(),
        };
        let planet_name = cell(plan.planet).to_string();
        let known = self.systems.len();
        let si = self.system(&system);
        if si == known {
            self.same_but_for_case(row, "system", &system, |b| {
                b.systems
                    .iter()
                    .take(known)
                    .map(|s| s.name.clone())
                    .collect()
            });
        }
        let row_refs = self.row_refs(row, &plan);
        let star = if star_name.is_empty() {
            None
        } else {
            let from_system = plan.star.is_none();
            Some(self.body(si, BodyKind::Star, &star_name, from_system, row, None))
        };
        let planet = if planet_name.is_empty() {
            None
        } else {
            let host_cell = cell(plan.host).to_string();
            let (host, host_col) = if !host_cell.is_empty() {
                (Some(host_cell), plan.host)
            } else if !star_name.is_empty() {
                (Some(star_name.clone()), plan.star.or(Some(plan.system)))
            } else {
                (None, plan.star)
            };
            let host_col = host_col.map(|c| self.column(c));
            let b = self.body(si, BodyKind::Planet, &planet_name, false, row, host.clone());
            if let Some(body) = self.systems.get_mut(si).and_then(|s| s.bodies.get_mut(b)) {
                if body.host.is_none() {
                    body.host = host;
                    body.host_column = host_col;
                }
            }
            Some(b)
        };
        if let Some(b) = planet {
            self.count_cells(si, b, 1);
        }
        for q in &plan.quantities {
            let target = match q.def.kind {
                BodyKind::Star => star,
                BodyKind::Planet => planet,
            };
            let value = cell(Some(q.value));
            let Some(b) = target else {
                let lost = Self::filled(row, std::iter::once(q.value).chain(Self::companions(q)));
                if !lost.is_empty() {
                    self.summary.skipped_cells += lost.len();
                    let (what, col) = match q.def.kind {
                        BodyKind::Star => ("star", plan.star),
                        BodyKind::Planet => ("planet", plan.planet),
                    };
                    self.issue(
                        IssueKind::MissingName,
                        row,
                        Some(q.value),
                        format!(
                            "{} {}: the row names no {what}{}; not imported",
                            what,
                            q.def.name,
                            col.map(|c| format!(" (column `{}` is empty)", self.column(c)))
                                .unwrap_or_default()
                        ),
                    );
                }
                continue;
            };
            if value.is_empty() {
                let lost = Self::filled(
                    row,
                    [q.error, q.above, q.below, q.limit, q.refs]
                        .into_iter()
                        .flatten(),
                );
                for c in lost {
                    self.summary.skipped_cells += 1;
                    self.issue(
                        IssueKind::Unused,
                        row,
                        Some(c),
                        format!("{} has no value in this row (column `{}` is empty), so this cell is not imported", q.def.name, self.column(q.value)),
                    );
                }
                continue;
            }
            let mut refs = row_refs.clone();
            let own = cell(q.refs).to_string();
            if !own.is_empty() {
                refs.insert(self.ref_id(&own, ""));
            }
            match self.decl(q, row, refs) {
                Some(d) => {
                    let used =
                        Self::filled(row, std::iter::once(q.value).chain(Self::companions(q)))
                            .len();
                    self.add_decl(si, b, d, row, q.value, used);
                }
                None => {
                    // `decl` named the cell; the value and its companions are not imported.
                    let lost =
                        Self::filled(row, std::iter::once(q.value).chain(Self::companions(q)));
                    self.summary.skipped_cells += lost.len();
                }
            }
        }
    }

    fn count_cells(&mut self, si: usize, b: usize, n: usize) {
        if let Some(body) = self.systems.get_mut(si).and_then(|s| s.bodies.get_mut(b)) {
            body.cells += n;
        }
    }

    fn system(&mut self, name: &str) -> usize {
        if let Some(&i) = self.system_index.get(name) {
            return i;
        }
        let i = self.systems.len();
        self.systems.push(System {
            name: name.to_string(),
            bodies: Vec::new(),
            index: HashMap::new(),
            ids: Ids::default(),
        });
        self.system_index.insert(name.to_string(), i);
        i
    }

    /// The body of that kind and table name in system `si`, declared on first use.
    fn body(
        &mut self,
        si: usize,
        kind: BodyKind,
        name: &str,
        from_system: bool,
        row: &Row,
        host: Option<String>,
    ) -> usize {
        let Some(sys) = self.systems.get_mut(si) else {
            return 0;
        };
        if let Some(&b) = sys.index.get(&(kind, name.to_string())) {
            return b;
        }
        // A planet written with its star's or system's name in front ("Tarn-4 b") is `b`.
        let mut short = name;
        if kind == BodyKind::Planet {
            for prefix in [host.as_deref().unwrap_or(""), sys.name.as_str()] {
                if prefix.is_empty() {
                    continue;
                }
                if let Some(rest) = name.strip_prefix(prefix) {
                    let rest = rest.trim_start_matches([' ', '-', '_']);
                    if !rest.is_empty() && rest.len() < name.len() {
                        short = rest;
                        break;
                    }
                }
            }
        }
        let mut id = syzygy_name(short, kind.as_str());
        if from_system {
            id = id.to_ascii_lowercase();
        }
        let id = sys.ids.fresh(&id);
        let b = sys.bodies.len();
        sys.bodies.push(Body {
            kind,
            id,
            table_name: name.to_string(),
            host: None,
            decls: Vec::new(),
            row: row.number,
            line: row.line,
            host_column: None,
            cells: 0,
        });
        sys.index.insert((kind, name.to_string()), b);
        self.same_but_for_case(row, kind.as_str(), name, |imp| {
            imp.systems.get(si).map_or_else(Vec::new, |s| {
                s.bodies
                    .iter()
                    .take(b)
                    .filter(|x| x.kind == kind)
                    .map(|x| x.table_name.clone())
                    .collect()
            })
        });
        b
    }

    /// A `name-case` issue when a new name equals an earlier one but for letter case
    /// (`OSPRETH` and `Ospreth`): they are kept apart, as written, but are probably one.
    fn same_but_for_case(
        &mut self,
        row: &Row,
        what: &str,
        name: &str,
        earlier: impl Fn(&Self) -> Vec<String>,
    ) {
        if let Some(other) = earlier(self)
            .into_iter()
            .find(|e| e != name && e.eq_ignore_ascii_case(name))
        {
            self.issue(
                IssueKind::NameCase,
                row,
                None,
                format!(
                    "{what} `{name}` differs from `{other}` only in letter case; they are kept apart as written (write the names alike if they are one {what})"
                ),
            );
        }
    }

    /// The declaration a row gives one quantity, or `None` after naming the cell at fault.
    fn decl(&mut self, q: &QuantityPlan, row: &Row, refs: BTreeSet<String>) -> Option<Decl> {
        let cell = |i: Option<usize>| -> String {
            i.and_then(|i| row.cells.get(i))
                .cloned()
                .unwrap_or_default()
        };
        let raw = cell(Some(q.value));
        let what = q.def.name;
        if q.def.text {
            return Some(Decl {
                def: q.def,
                op: '=',
                text: string_literal(&raw),
                refs,
                row: row.number,
            });
        }
        let Some((value, value_text)) = number(&raw) else {
            let hint = not_a_number_hint(&raw, q.limit.is_some());
            self.issue(
                IssueKind::BadNumber,
                row,
                Some(q.value),
                format!(
                    "{what}: `{}` is not a number; the value is not imported{hint}",
                    shorten(&raw)
                ),
            );
            return None;
        };
        let flag = cell(q.limit);
        let op = if flag.is_empty() || self.plan.codes.measured.contains(&flag) {
            '='
        } else if self.plan.codes.upper.contains(&flag) {
            '<'
        } else if self.plan.codes.lower.contains(&flag) {
            '>'
        } else {
            self.issue(
                IssueKind::BadLimitCode,
                row,
                q.limit,
                format!(
                    "{what}: the limit flag `{}` is none of the mapping's codes (upper {:?}, lower {:?}, measured {:?} or empty); the value is not imported",
                    shorten(&flag),
                    self.plan.codes.upper,
                    self.plan.codes.lower,
                    self.plan.codes.measured
                ),
            );
            return None;
        };
        if !q.def.in_range(value * q.factor) {
            self.issue(
                IssueKind::OutOfRange,
                row,
                Some(q.value),
                format!(
                    "{what} = {} is outside its valid range, {}; not imported",
                    format!("{value_text} {}", q.unit).trim_end(),
                    q.def.range_text()
                ),
            );
            return None;
        }
        let mut text = value_text;
        if op == '=' {
            let err = |s: &mut Self,
                       col: Option<usize>,
                       side: &str,
                       signed_ok: bool|
             -> Result<Option<String>, ()> {
                let raw = cell(col);
                if raw.is_empty() {
                    return Ok(None);
                }
                // An uncertainty in a unit of its own is written in the value's.
                let scale = q
                    .error_scales
                    .iter()
                    .find(|(c, _)| Some(*c) == col)
                    .map(|(_, f)| *f);
                let converted = |v: f64, t: String| match scale {
                    Some(f) => super::mapping::scaled_text(v.abs() * f),
                    None => t,
                };
                match number(&raw) {
                    // `-0` is 0 (written `± -0` it would not parse).
                    Some((v, t)) if v >= 0.0 => {
                        Ok(Some(converted(v, t.trim_start_matches('-').to_string())))
                    }
                    Some((v, t)) if signed_ok && scale.is_some() => Ok(Some(converted(v, t))),
                    Some((_, t)) if signed_ok => Ok(Some(t.trim_start_matches('-').to_string())),
                    Some(_) => {
                        s.issue(IssueKind::BadNumber, row, col, format!("{what}: the uncertainty {side} `{}` is negative; the value is not imported", shorten(&raw)));
                        Err(())
                    }
                    None => {
                        s.issue(IssueKind::BadNumber, row, col, format!("{what}: the uncertainty {side} `{}` is not a number; the value is not imported", shorten(&raw)));
                        Err(())
                    }
                }
            };
            let sym = err(self, q.error, "(symmetric)", false).ok()?;
            let above = err(self, q.above, "above", false).ok()?;
            let below = err(self, q.below, "below", true).ok()?;
            match (sym, above, below) {
                (Some(s), _, _) => text = format!("{text} ± {s}"),
                (None, Some(a), Some(b)) => text = format!("{text} +{a}/-{b}"),
                (None, Some(_), None) | (None, None, Some(_)) => {
                    let (col, side) = if cell(q.above).is_empty() {
                        (q.above, "above")
                    } else {
                        (q.below, "below")
                    };
                    self.issue(IssueKind::BadNumber, row, col, format!("{what}: the uncertainty {side} is empty but the other side is given; the value is not imported"));
                    return None;
                }
                (None, None, None) => {}
            }
        } else {
            for c in [q.error, q.above, q.below].into_iter().flatten() {
                if !cell(Some(c)).is_empty() {
                    self.summary.skipped_cells += 1;
                    self.issue(
                        IssueKind::Unused,
                        row,
                        Some(c),
                        format!("{what} is a limit in this row; a limit takes no uncertainty, so this cell is not imported"),
                    );
                }
            }
        }
        if !q.unit.is_empty() {
            text = format!("{text} {}", q.unit);
        }
        Some(Decl {
            def: q.def,
            op,
            text,
            refs,
            row: row.number,
        })
    }

    /// Add a declaration, unless it repeats one (merged) or conflicts with one (an issue).
    fn add_decl(&mut self, si: usize, b: usize, d: Decl, row: &Row, col: usize, cells: usize) {
        let Some(body) = self.systems.get_mut(si).and_then(|s| s.bodies.get_mut(b)) else {
            return;
        };
        let same: Vec<&Decl> = body
            .decls
            .iter()
            .filter(|e| e.def.qty == d.def.qty)
            .collect();
        if same
            .iter()
            .any(|e| e.op == d.op && cells::same_value(&e.text, &d.text) && e.refs == d.refs)
        {
            self.summary.merged += 1;
            return;
        }
        let separate = !d.def.text
            && !d.refs.is_empty()
            && same.iter().all(|e| !e.refs.is_empty() && e.refs != d.refs);
        if same.is_empty() || separate {
            body.decls.push(d);
            body.cells += cells;
            self.summary.values += 1;
            return;
        }
        // The declaration it clashes with: one citing the same sources, or none.
        let first = same
            .iter()
            .find(|e| e.refs == d.refs || e.refs.is_empty() || d.refs.is_empty() || d.def.text)
            .or(same.first())
            .map(|e| (e.row, e.op, e.text.clone(), e.refs.is_empty()));
        let id = body.id.clone();
        self.summary.skipped_cells += cells;
        if let Some((r, op, text, uncited)) = first {
            // Say what actually differs: the values, or only the citations (one row with an
            // empty reference cell).
            let why = if op == d.op && cells::same_value(&text, &d.text) {
                let empty = if d.refs.is_empty() {
                    "this row"
                } else {
                    "that row"
                };
                format!(
                    "the same value, but {empty} cites no reference (its reference cell is empty), so the two cannot be told apart as sources; only row {r}'s is kept (fill in the reference to keep both)"
                )
            } else if d.refs.is_empty() || uncited {
                let empty = if d.refs.is_empty() {
                    "this row"
                } else {
                    "that row"
                };
                format!(
                    "{empty} cites no reference (its reference cell is empty), so only row {r}'s value is kept (fill in the reference to keep both as sources)"
                )
            } else {
                // Both rows cite something, and the same: a reference column exists.
                let cited: Vec<String> = d.refs.iter().map(|id| format!("`{id}`")).collect();
                format!(
                    "both rows cite {}, so they cannot be told apart as sources and only row {r}'s value is kept (if they come from different papers, give each row its own reference)",
                    crate::text::and_list(&cited)
                )
            };
            self.issue(
                IssueKind::Conflict,
                row,
                Some(col),
                format!(
                    "{id}.{} {} {} here, but {} {} in row {r}; {why}",
                    d.def.name, d.op, d.text, op, text
                ),
            );
        }
    }

    /// Check hosts, count, and write one text per system.
    pub fn finish(mut self) -> ImportResult {
        let systems = std::mem::take(&mut self.systems);
        let mut files = Vec::new();
        for mut sys in systems {
            // Planets whose host is no star of the system.
            let stars: HashMap<String, String> = sys
                .bodies
                .iter()
                .filter(|b| b.kind == BodyKind::Star)
                .map(|b| (b.table_name.clone(), b.id.clone()))
                .collect();
            let mut kept = Vec::new();
            for body in std::mem::take(&mut sys.bodies) {
                if body.kind == BodyKind::Planet {
                    let host = body.host.as_ref().and_then(|h| stars.get(h));
                    if host.is_none() {
                        self.summary.skipped_cells += body.cells;
                        self.issues.push(Issue {
                            kind: IssueKind::MissingHost,
                            row: body.row,
                            line: body.line,
                            column: body.host_column.clone(),
                            message: match &body.host {
                                Some(h) => format!(
                                    "planet `{}` of system `{}` orbits `{h}`, which no row declares as a star of that system; the planet and its {} cells are not imported",
                                    body.table_name, sys.name, body.cells
                                ),
                                None => format!(
                                    "planet `{}` of system `{}` has no host star (no host or star cell); the planet and its {} cells are not imported",
                                    body.table_name, sys.name, body.cells
                                ),
                            },
                        });
                        self.summary.values -= body.decls.len().min(self.summary.values);
                        continue;
                    }
                }
                kept.push(body);
            }
            if kept.is_empty() {
                // Every body was refused (a planet without its star): no empty file, which
                // would say nothing; the refusals above name why.
                continue;
            }
            let hosts: Vec<Option<String>> = kept
                .iter()
                .map(|b| b.host.as_ref().and_then(|h| stars.get(h)).cloned())
                .collect();
            self.issues
                .extend(super::too_many_bodies(&sys.name, kept.len()));
            self.summary.systems += 1;
            self.summary.stars += kept.iter().filter(|b| b.kind == BodyKind::Star).count();
            self.summary.planets += kept.iter().filter(|b| b.kind == BodyKind::Planet).count();
            files.push(super::emit::system_text(
                &sys.name,
                &kept,
                &hosts,
                &self.plan.constants,
                &self.ref_texts,
                &self.table,
            ));
        }
        self.issues.sort_by_key(|i| (i.row, i.line));
        ImportResult {
            files,
            issues: self.issues,
            unmapped: self.plan.unmapped.clone(),
            summary: self.summary,
        }
    }
}
