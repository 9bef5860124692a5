//! The planet-centred table behind `syz eval --format csv` and `--format votable`: one row per
//! planet with its host star's values joined, and one row for each star that no planet orbits,
//! so that every body appears. The layout (column names, units, UCDs) is described once here
//! and written by both front ends; docs/table-output.md documents it.

use crate::ast::BodyKind;
use crate::derive::{BodyResult, DisplayUnit, QuantityResult};
use crate::model::{Form, Model};
use crate::quantities::{self, Qty, QuantityDef};
use crate::Analysis;
use std::collections::BTreeSet;

/// The prefix of a host star's columns (`host.mass`, `host.teff`, ...).
pub const HOST: &str = "host.";

/// Which of a quantity's cells a column holds.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Part {
    /// The value: the median with Monte Carlo, the limit for a limit.
    Value,
    /// Standard uncertainty below the value (0 for exact values and limits).
    Below,
    /// Standard uncertainty above the value.
    Above,
    /// `declared`, `assumed`, `derived`, `default`, `estimated` or `predicted`, with `;upper-limit` or
    /// `;lower-limit` for a limit.
    Origin,
    /// The citation ids the value rests on, through any depth of derivation.
    Refs,
    /// A transit epoch's Julian-date time system (`BJD_TDB`, `HJD_UTC`, ...): epochs keep the
    /// system they were declared in.
    System,
}

impl Part {
    /// The suffix after the quantity's name (`mass.below`); none for the value.
    pub fn suffix(self) -> &'static str {
        match self {
            Part::Value => "",
            Part::Below => ".below",
            Part::Above => ".above",
            Part::Origin => ".origin",
            Part::Refs => ".refs",
            Part::System => ".system",
        }
    }
}

/// What a column holds.
#[derive(Debug, Clone, Copy)]
pub enum Content {
    File,
    System,
    Planet,
    Host,
    Quantity(&'static QuantityDef, Part),
    /// Every citation of the row's values, `id: text`, separated by ` | `.
    Refs,
    /// Everything the row's values assumed, in words, separated by ` | `.
    Assumptions,
}

/// One column of the table.
#[derive(Debug, Clone)]
pub struct Column {
    pub name: String,
    pub content: Content,
    /// The unit numbers are written in (registry spelling, `g/cm^3`), for numeric columns of
    /// dimensioned quantities; `None` for text and dimensionless columns.
    pub unit: Option<&'static str>,
}

impl Column {
    pub fn numeric(&self) -> bool {
        matches!(
            self.content,
            Content::Quantity(def, Part::Value | Part::Below | Part::Above) if !def.text
        )
    }
}

/// Which front end a layout is for: the columns are the same, only some units differ (a
/// VOTable's units must be expressible in VOUnit, so insolation is in W/m^2 there).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Flavor {
    Csv,
    VoTable,
}

/// The fixed unit of a quantity's numeric columns: the display unit, except planet mass,
/// minimum mass and radius (whose display unit depends on size) and, in a VOTable, insolation.
pub fn column_unit(def: &QuantityDef, flavor: Flavor) -> Option<&'static str> {
    let unit = match def.qty {
        Qty::Mass | Qty::MinMass => "Mjup",
        Qty::Radius => "Rjup",
        Qty::Insolation
        | Qty::HabitableInnerFlux
        | Qty::HabitableOuterFlux
        | Qty::HabitableInnerOptimisticFlux
        | Qty::HabitableOuterOptimisticFlux
            if flavor == Flavor::VoTable =>
        {
            "W/m^2"
        }
        _ => def.display,
    };
    // VOUnit has no scaled dimensionless units and no logarithmic ones: a VOTable gives
    // fractions for percentages and leaves dex values without a unit (their description says
    // what they are).
    let unitless = unit == "1" || (flavor == Flavor::VoTable && (unit == "%" || unit == "dex"));
    (!def.text && !unit.is_empty() && !unitless).then_some(unit)
}

/// The column name of a quantity's part: `period`, `period.below`, `host.mass.refs`.
pub fn column_name(def: &QuantityDef, part: Part) -> String {
    let prefix = if def.kind == BodyKind::Star { HOST } else { "" };
    format!("{prefix}{}{}", def.name, part.suffix())
}

/// The parts a quantity has columns for: text quantities have no uncertainty.
pub fn parts(def: &QuantityDef) -> &'static [Part] {
    if def.text {
        &[Part::Value, Part::Origin, Part::Refs]
    } else if def.qty == Qty::TransitEpoch {
        &[
            Part::Value,
            Part::Below,
            Part::Above,
            Part::System,
            Part::Origin,
            Part::Refs,
        ]
    } else {
        &[
            Part::Value,
            Part::Below,
            Part::Above,
            Part::Origin,
            Part::Refs,
        ]
    }
}

/// Every column, in order: `file`, `system`, `planet`, `host`, the planet's quantities, the
/// host star's (`host.`), `refs`, `assumptions`.
pub fn columns(flavor: Flavor) -> Vec<Column> {
    let plain = |name: &str, content| Column {
        name: name.to_string(),
        content,
        unit: None,
    };
    let mut v = vec![
        plain("file", Content::File),
        plain("system", Content::System),
        plain("planet", Content::Planet),
        plain("host", Content::Host),
    ];
    let defs = quantities::table();
    let ordered = defs
        .iter()
        .filter(|d| d.kind == BodyKind::Planet)
        .chain(defs.iter().filter(|d| d.kind == BodyKind::Star));
    for def in ordered {
        for &part in parts(def) {
            let numeric = matches!(part, Part::Value | Part::Below | Part::Above);
            v.push(Column {
                name: column_name(def, part),
                content: Content::Quantity(def, part),
                unit: if numeric {
                    column_unit(def, flavor)
                } else {
                    None
                },
            });
        }
    }
    v.push(plain("refs", Content::Refs));
    v.push(plain("assumptions", Content::Assumptions));
    v
}

/// One cell.
#[derive(Debug, Clone, PartialEq)]
pub enum Cell<'a> {
    Empty,
    Text(std::borrow::Cow<'a, str>),
    Number(f64),
}

/// One row: the planet (if any) and its host star (if any), as indexes into the system's
/// bodies.
#[derive(Debug, Clone, Copy)]
pub struct Row {
    pub system: usize,
    pub planet: Option<usize>,
    pub host: Option<usize>,
}

/// The rows of an analysis, in declaration order: a row for every planet, and a row for
/// every star at its own place when no planet orbits it. A body that is neither (a planet
/// orbiting a planet) is still a row of its own, with its host's columns empty.
pub fn rows(model: &Model) -> Vec<Row> {
    let mut out = Vec::new();
    for (s, sys) in model.systems.iter().enumerate() {
        for (i, b) in sys.bodies.iter().enumerate() {
            match b.kind {
                BodyKind::Planet => {
                    let host = b
                        .orbits
                        .filter(|&h| sys.bodies.get(h).is_some_and(|h| h.kind == BodyKind::Star));
                    out.push(Row {
                        system: s,
                        planet: Some(i),
                        host,
                    });
                }
                BodyKind::Star => {
                    let orbited = sys
                        .bodies
                        .iter()
                        .any(|p| p.kind == BodyKind::Planet && p.orbits == Some(i));
                    if !orbited {
                        out.push(Row {
                            system: s,
                            planet: None,
                            host: Some(i),
                        });
                    }
                }
            }
        }
    }
    out
}

/// The results of the row's planet and host.
fn results(a: &Analysis, row: Row) -> (Option<&BodyResult>, Option<&BodyResult>) {
    let res = a.results.get(row.system);
    let get = |i: Option<usize>| i.and_then(|i| res.and_then(|r| r.bodies.get(i)));
    (get(row.planet), get(row.host))
}

/// An SI value in a column whose unit is `factor` SI units, tidied; empty when not finite.
fn number_cell(si: f64, factor: f64) -> Cell<'static> {
    let v = tidy(si / factor);
    if v.is_finite() {
        Cell::Number(v)
    } else {
        Cell::Empty
    }
}

/// Citation ids with their references' texts: `id: text`, separated by ` | `.
fn described<'a>(model: &Model, ids: impl IntoIterator<Item = &'a String>) -> String {
    let parts: Vec<String> = ids
        .into_iter()
        .map(|id| match model.reference(id) {
            // A bar or backslash in a text is escaped, so the importer can tell it from
            // the separator (`tables::own`).
            Some(r) => format!("{id}: {}", r.text.replace('\\', "\\\\").replace('|', "\\|")),
            None => id.clone(),
        })
        .collect();
    joined(parts.iter().map(String::as_str))
}

/// Join with ` | `.
fn joined<'a>(items: impl IntoIterator<Item = &'a str>) -> String {
    let mut s = String::new();
    for (i, item) in items.into_iter().enumerate() {
        if i > 0 {
            s.push_str(" | ");
        }
        s.push_str(item);
    }
    s
}

/// The cell of `column` in `row`. `file` is the file's name as shown.
pub fn cell<'a>(a: &'a Analysis, file: &'a str, row: Row, column: &Column) -> Cell<'a> {
    let sys = a.model.systems.get(row.system);
    let body_id = |i: Option<usize>| {
        i.and_then(|i| sys.and_then(|s| s.bodies.get(i)))
            .map_or(Cell::Empty, |b| Cell::Text(b.id.as_str().into()))
    };
    let (planet, host) = results(a, row);
    match column.content {
        Content::File => Cell::Text(file.into()),
        Content::System => sys.map_or(Cell::Empty, |s| Cell::Text(s.name.as_str().into())),
        Content::Planet => body_id(row.planet),
        Content::Host => body_id(row.host),
        Content::Quantity(def, part) => {
            let body = if def.kind == BodyKind::Star {
                host
            } else {
                planet
            };
            match body.and_then(|b| b.get(def.qty)) {
                Some(q) => quantity_cell(def, part, q, column.unit),
                None => Cell::Empty,
            }
        }
        Content::Refs => {
            let ids: BTreeSet<&String> = [planet, host]
                .into_iter()
                .flatten()
                .flat_map(|b| &b.quantities)
                .flat_map(|q| &q.cited)
                .collect();
            Cell::Text(described(&a.model, ids).into())
        }
        Content::Assumptions => {
            // What the row's values assumed, in words, so the table never hides a default or
            // an approximation (the JSON output has them per quantity). A note that speaks of
            // one value ("sampled, not first-order: ... of the value") names it.
            let name = |i: Option<usize>| {
                i.and_then(|i| sys.and_then(|s| s.bodies.get(i)))
                    .map_or("", |b| b.id.as_str())
            };
            let mut assumed: BTreeSet<std::borrow::Cow<str>> = BTreeSet::new();
            for (body, id) in [(planet, name(row.planet)), (host, name(row.host))] {
                for q in body.iter().flat_map(|b| &b.quantities) {
                    for a in &q.assumptions {
                        if crate::derive::validity::is_interval_note(a) {
                            let qname = quantities::def(q.qty).name;
                            assumed.insert(format!("{id}.{qname}: {a}").into());
                        } else {
                            assumed.insert(a.as_str().into());
                        }
                    }
                }
            }
            Cell::Text(joined(assumed.iter().map(|a| a.as_ref())).into())
        }
    }
}

fn quantity_cell<'a>(
    def: &QuantityDef,
    part: Part,
    q: &'a QuantityResult,
    unit: Option<&str>,
) -> Cell<'a> {
    let factor = unit.and_then(DisplayUnit::parse).map_or(1.0, |u| u.factor);
    let number = |v: f64| number_cell(v, factor);
    match part {
        Part::Value if def.text => q
            .text
            .as_deref()
            .map_or(Cell::Empty, |t| Cell::Text(t.into())),
        Part::Value => number(q.value),
        Part::Below => number(q.below),
        Part::Above => number(q.above),
        Part::Origin => {
            let limit = match q.form {
                Form::UpperLimit => ";upper-limit",
                Form::LowerLimit => ";lower-limit",
                _ => "",
            };
            Cell::Text(format!("{}{limit}", q.origin.as_str()).into())
        }
        Part::Refs => Cell::Text(q.cited.join("; ").into()),
        Part::System => Cell::Text(q.unit.as_deref().unwrap_or(def.display).into()),
    }
}

/// `v` rounded to 15 significant digits, which every double holds exactly: a declared value
/// converted to SI and back (3.52474 d, through seconds) is written as declared rather than
/// with the last bit's noise (3.5247400000000004).
pub fn tidy(v: f64) -> f64 {
    if !v.is_finite() || v == 0.0 {
        return v;
    }
    format!("{v:.14e}").parse().unwrap_or(v)
}

/// The IVOA UCD1+ descriptor of a quantity's value (UCD list EN-1.6, 2024-12-18; the words
/// are checked against a copy of that list in tests/reference/ucd-list.txt); `None` where the
/// vocabulary has no word for it.
pub fn ucd(def: &QuantityDef) -> Option<&'static str> {
    Some(match def.qty {
        Qty::StarMass | Qty::Mass => "phys.mass",
        Qty::MinMass => "phys.mass",
        Qty::StarRadius | Qty::Radius => "phys.size.radius",
        Qty::Teff => "phys.temperature.effective",
        Qty::Luminosity => "phys.luminosity",
        Qty::LogG => "phys.gravity",
        Qty::StarDensity | Qty::Density => "phys.density",
        Qty::Metallicity => "phys.abund.Z",
        Qty::Age => "time.age",
        Qty::Distance => "pos.distance",
        Qty::Parallax => "pos.parallax.trig",
        Qty::RightAscension => "pos.eq.ra;meta.main",
        Qty::Declination => "pos.eq.dec;meta.main",
        Qty::SpectralType => "src.spType",
        Qty::Period => "time.period.revolution",
        Qty::SemiMajorAxis => "phys.size.smajAxis",
        Qty::Eccentricity => "src.orbital.eccentricity",
        Qty::Inclination => "src.orbital.inclination",
        Qty::ArgPeriastron => "src.orbital.periastron",
        Qty::RvAmplitude => "spect.dopplerVeloc;src.var.amplitude",
        Qty::RadiusRatio => "phys.size.radius;arith.ratio",
        Qty::TransitDuration | Qty::TransitDurationFull => "time.duration",
        Qty::TransitEpoch => "time.epoch",
        Qty::Albedo => "phys.albedo",
        Qty::SurfaceGravity => "phys.gravity",
        Qty::EscapeVelocity => "phys.veloc.escape",
        Qty::OrbitalSpeed => "phys.veloc.orbital",
        Qty::Teq => "phys.temperature",
        Qty::Insolation => "phot.flux.bol",
        Qty::MagnitudeV => "phot.mag;em.opt.V",
        Qty::MagnitudeJ => "phot.mag;em.IR.J",
        Qty::MagnitudeH => "phot.mag;em.IR.H",
        Qty::MagnitudeKs => "phot.mag;em.IR.K",
        Qty::BolometricMagnitude => "phot.mag.bol",
        Qty::AbsoluteBolometricMagnitude => "phys.magAbs.bol",
        Qty::BolometricFlux
        | Qty::HabitableInnerFlux
        | Qty::HabitableOuterFlux
        | Qty::HabitableInnerOptimisticFlux
        | Qty::HabitableOuterOptimisticFlux => "phot.flux.bol",
        Qty::HabitableInner
        | Qty::HabitableOuter
        | Qty::HabitableInnerOptimistic
        | Qty::HabitableOuterOptimistic => "pos.distance",
        Qty::PredictedMass => "phys.mass",
        Qty::PredictedRadius => "phys.size.radius",
        Qty::PredictedRvAmplitude => "spect.dopplerVeloc;src.var.amplitude",
        Qty::ScaleHeight => "phys.size",
        _ => return None,
    })
}

/// The UCD of a column, where there is one: the quantity's for its value, `stat.error;` and
/// the quantity's for its uncertainties, `meta.id` for names, `meta.ref` for citations.
pub fn column_ucd(column: &Column) -> Option<String> {
    match column.content {
        Content::File => Some("meta.id;meta.file".into()),
        Content::System => Some("meta.id".into()),
        Content::Planet | Content::Host => Some("meta.id".into()),
        Content::Quantity(def, part) => {
            let base = ucd(def)?;
            match part {
                Part::Value => Some(base.into()),
                Part::Below | Part::Above => Some(format!("stat.error;{base}")),
                Part::Origin => Some("meta.code".into()),
                Part::System => Some("time.scale".into()),
                Part::Refs => Some("meta.ref".into()),
            }
        }
        Content::Refs => Some("meta.bib".into()),
        Content::Assumptions => Some("meta.note".into()),
    }
}

/// A column unit in VOUnit syntax (IVOA VOUnits 1.0): `None` for a unit it cannot express.
/// VOUnit has no Jupiter units: Jupiter's mass and radius are written as SI units with a scale
/// factor (the core's IAU 2015 Resolution B3 values, `1.8981245973360505e27kg`), the form
/// astropy's VOUnit writer uses and its reader understands; the FIELD's description names
/// them in words.
pub fn vo_unit(unit: &str) -> Option<std::borrow::Cow<'static, str>> {
    let scaled = |si: &str| {
        DisplayUnit::parse(unit).map(|u| std::borrow::Cow::Owned(format!("{:e}{si}", u.factor)))
    };
    Some(std::borrow::Cow::Borrowed(match unit {
        "Mjup" => return scaled("kg"),
        "Rjup" | "Rearth" => return scaled("m"),
        "Mearth" => return scaled("kg"),
        "km" => "km",
        "mag" => "mag",
        "Msun" => "solMass",
        "Rsun" => "solRad",
        "Lsun" => "solLum",
        "K" => "K",
        "g/cm^3" => "g.cm**-3",
        "Gyr" => "Gyr",
        "pc" => "pc",
        "mas" => "mas",
        "d" | "BJD_TDB" => "d",
        "h" => "h",
        "au" => "au",
        "deg" => "deg",
        "m/s" => "m.s**-1",
        "km/s" => "km.s**-1",
        "m/s^2" => "m.s**-2",
        "W/m^2" => "W.m**-2",
        _ => return None,
    }))
}

/// The columns of the table of declared values (`--table sources`): one row per declaration,
/// every source of a quantity declared several times included.
pub const SOURCE_COLUMNS: &[&str] = &[
    "file",
    "system",
    "body",
    "kind",
    "host",
    "quantity",
    "value",
    "below",
    "above",
    "text",
    "unit",
    "limit",
    "origin",
    "refs",
    "references",
    "line",
    "used",
];

/// One declared value, for the table of declared values.
#[derive(Debug, Clone, PartialEq)]
pub struct SourceRow<'a> {
    pub system: &'a str,
    pub body: &'a str,
    pub kind: &'static str,
    /// A planet's host star id (empty for stars).
    pub host: &'a str,
    pub quantity: &'static str,
    /// The value in `unit`, uncertainties in the same unit (empty for a text quantity).
    pub value: Cell<'a>,
    pub below: Cell<'a>,
    pub above: Cell<'a>,
    /// The value of a text quantity (a spectral type).
    pub text: &'a str,
    /// The column unit of the quantity (registry spelling), or the epoch's time system; empty
    /// for plain numbers and text.
    pub unit: &'a str,
    /// `upper`, `lower` or empty.
    pub limit: &'static str,
    /// `declared` or `assumed`.
    pub origin: &'static str,
    /// Citation ids, separated by `; `.
    pub refs: String,
    /// The cited references as `id: text`, separated by ` | `.
    pub references: String,
    /// 1-based line of the declaration (0 when unknown).
    pub line: usize,
    /// `yes` (the value used), `no` (another source was used, or the value cannot be: a
    /// lower limit without an upper bound), `combined` (the value used is a weighted mean of
    /// the sources).
    pub used: &'static str,
}

/// Every declared value of an analysis, in file order of the bodies and table order of the
/// quantities; `line` turns a byte offset into a 1-based line.
pub fn source_rows<'a>(a: &'a Analysis, line: &dyn Fn(u32) -> usize) -> Vec<SourceRow<'a>> {
    use crate::derive::Origin;
    let mut out = Vec::new();
    for (sys, res) in a.model.systems.iter().zip(&a.results) {
        for (b, r) in sys.bodies.iter().zip(&res.bodies) {
            let host = b
                .orbits
                .and_then(|h| sys.bodies.get(h))
                .map_or("", |h| h.id.as_str());
            let first = out.len();
            for q in &r.quantities {
                let origin = match q.origin {
                    Origin::Declared => "declared",
                    Origin::Combined => "combined",
                    Origin::Assumed => "assumed",
                    Origin::Set => "set",
                    _ => continue,
                };
                let def = quantities::def(q.qty);
                let unit = if q.qty == Qty::TransitEpoch {
                    q.unit.as_deref().unwrap_or(def.display)
                } else {
                    column_unit(def, Flavor::Csv).unwrap_or("")
                };
                let factor = DisplayUnit::parse(unit).map_or(1.0, |u| u.factor);
                let number = |v: f64| number_cell(v, factor);
                let limit = |f: Form| match f {
                    Form::UpperLimit => "upper",
                    Form::LowerLimit => "lower",
                    _ => "",
                };
                let mut row = SourceRow {
                    system: &sys.name,
                    body: &b.id,
                    kind: b.kind.as_str(),
                    host,
                    quantity: def.name,
                    value: number(q.value),
                    below: number(q.below),
                    above: number(q.above),
                    text: "",
                    unit,
                    limit: limit(q.form),
                    origin,
                    // Filled below for a quantity listed alone: a combination cites every
                    // source, which each source's row would otherwise copy (quadratic in
                    // the sources).
                    refs: String::new(),
                    references: String::new(),
                    line: q.span.map_or(0, |s| line(s.in_file(sys.span).start)),
                    used: if q.unused() { "no" } else { "yes" },
                };
                if def.text {
                    row.text = q.text.as_deref().unwrap_or("");
                    row.value = Cell::Empty;
                    row.below = Cell::Empty;
                    row.above = Cell::Empty;
                }
                if q.sources.is_empty() {
                    row.refs = q.citations.join("; ");
                    row.references = described(&a.model, &q.citations);
                    out.push(row);
                    continue;
                }
                let combined = q.sources.iter().all(|s| !s.chosen);
                for s in &q.sources {
                    // Each source keeps its own `assumed` mark and an epoch its time scale.
                    let origin = match q.origin {
                        Origin::Set if s.chosen => "set",
                        _ if s.assumed => "assumed",
                        _ => "declared",
                    };
                    out.push(SourceRow {
                        origin,
                        unit: s.unit.as_deref().unwrap_or(unit),
                        value: number(s.value),
                        below: number(s.below),
                        above: number(s.above),
                        limit: limit(s.form),
                        refs: s.citations.join("; "),
                        references: described(&a.model, &s.citations),
                        line: line(s.span.in_file(sys.span).start),
                        used: if combined {
                            let m = crate::model::Measurement {
                                value: s.value,
                                below: s.below,
                                above: s.above,
                                form: s.form,
                            };
                            // Only what the mean averaged; the rest were left out of it.
                            if crate::derive::sources::ranked(&m, s.assumed) {
                                "combined"
                            } else {
                                "no"
                            }
                        } else if s.chosen {
                            "yes"
                        } else {
                            "no"
                        },
                        ..row.clone()
                    });
                }
            }
            // In the order the body declares them.
            if let Some(rows) = out.get_mut(first..) {
                rows.sort_by_key(|r| r.line);
            }
        }
    }
    out
}

impl SourceRow<'_> {
    /// Whether the column of [`SOURCE_COLUMNS`] at `i` holds numbers.
    pub fn numeric(i: usize) -> bool {
        matches!(
            SOURCE_COLUMNS.get(i),
            Some(&("value" | "below" | "above" | "line"))
        )
    }

    /// The cells in the order of [`SOURCE_COLUMNS`], after the file's name.
    pub fn cells(&self) -> [Cell<'_>; 16] {
        let t = |s: &str| Cell::Text(std::borrow::Cow::Owned(s.to_string()));
        [
            t(self.system),
            t(self.body),
            t(self.kind),
            t(self.host),
            t(self.quantity),
            self.value.clone(),
            self.below.clone(),
            self.above.clone(),
            t(self.text),
            t(self.unit),
            t(self.limit),
            t(self.origin),
            t(&self.refs),
            t(&self.references),
            Cell::Number(self.line as f64),
            t(self.used),
        ]
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn tidy_removes_conversion_noise_only() {
        // 3.52474 d through seconds and back, and 41.2 pc through metres and back.
        assert_eq!(tidy(3.52474 * 86_400.0 / 86_400.0), 3.52474);
        assert_eq!(tidy(41.199999999999996), 41.2);
        // Digits that are really there stay.
        assert_eq!(tidy(0.123456789012345), 0.123456789012345);
        assert_eq!(tidy(-2.5e-30), -2.5e-30);
        assert!(tidy(f64::NAN).is_nan());
    }

    #[test]
    fn every_column_name_is_unique_and_every_unit_is_known() {
        for flavor in [Flavor::Csv, Flavor::VoTable] {
            let cols = columns(flavor);
            let names: BTreeSet<&str> = cols.iter().map(|c| c.name.as_str()).collect();
            assert_eq!(names.len(), cols.len(), "{flavor:?}");
            for c in &cols {
                if let Some(u) = c.unit {
                    assert!(DisplayUnit::parse(u).is_some(), "{u}");
                    if flavor == Flavor::VoTable {
                        assert!(vo_unit(u).is_some(), "no VOUnit for {u}");
                    }
                }
            }
        }
    }

    /// Every UCD written is made of words of the UCD1+ list (IVOA, EN-UCDlist-v1.6-2024-12-18,
    /// copied unchanged from the `ivoa-std/UCDList` repository) in allowed places: the first
    /// word may be primary (codes P, Q, E, C, V), later ones secondary (S, Q, E, C, V).
    #[test]
    fn every_ucd_uses_the_ivoa_vocabulary_in_order() {
        let list = include_str!("../../../tests/reference/ucd-list.txt");
        let words: std::collections::HashMap<&str, &str> = list
            .lines()
            .filter(|l| !l.starts_with('#'))
            .filter_map(|l| {
                let mut f = l.split('|').map(str::trim);
                let code = f.next()?;
                Some((f.next()?, code))
            })
            .collect();
        assert!(words.len() > 400, "the list did not read");
        let mut checked = 0;
        for c in columns(Flavor::VoTable) {
            let Some(ucd) = column_ucd(&c) else { continue };
            for (i, w) in ucd.split(';').enumerate() {
                let code = words
                    .get(w)
                    .unwrap_or_else(|| panic!("{}: {w} not in the list", c.name));
                let allowed = if i == 0 { "PQECV" } else { "SQECV" };
                assert!(
                    allowed.contains(code),
                    "{}: {w} ({code}) at place {i}",
                    c.name
                );
            }
            checked += 1;
        }
        assert!(checked > 100);
    }

    #[test]
    fn no_column_uses_a_prefix_scheme_for_the_host() {
        // Host columns are grouped under `host.`, never `star_` / `st_` prefixes.
        for c in columns(Flavor::Csv) {
            assert!(
                !c.name.starts_with("star_") && !c.name.starts_with("st_"),
                "{}",
                c.name
            );
        }
        assert!(columns(Flavor::Csv).iter().any(|c| c.name == "host.mass"));
    }
}
