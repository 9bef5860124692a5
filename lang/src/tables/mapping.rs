//! The mapping file: which columns of a table name the system, the star and the planet, and
//! which hold each quantity, its uncertainties, limit flags and references (docs/import.md).
//! It is a plain struct that TOML deserialises into, so code can build one too (a built-in
//! mapping for a known table layout is a `Mapping` value made in code).

use crate::ast::BodyKind;
use crate::quantities::{self, QuantityDef};
use serde::Deserialize;
use std::collections::BTreeMap;

/// How a table is serialised.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum TableFormat {
    Csv,
    Votable,
}

/// The whole mapping. Every field but `bodies.system` has a default.
#[derive(Debug, Clone, Default, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Mapping {
    /// The table's format; when absent, taken from the file's extension (`.xml`, `.vot`,
    /// `.votable` are VOTables, anything else CSV).
    #[serde(default)]
    pub format: Option<TableFormat>,
    /// The CSV separator (`,`, tab, `;`); detected from the header line when absent.
    #[serde(default)]
    pub delimiter: Option<char>,
    /// Columns read by nobody and not to be listed as unmapped.
    #[serde(default)]
    pub ignore: Vec<String>,
    pub bodies: BodyColumns,
    #[serde(default)]
    pub refs: RefColumns,
    #[serde(default)]
    pub limit_codes: LimitCodes,
    /// Star quantities by Syzygy quantity name (canonical or alias).
    #[serde(default)]
    pub star: BTreeMap<String, QuantityColumns>,
    /// Planet quantities by Syzygy quantity name.
    #[serde(default)]
    pub planet: BTreeMap<String, QuantityColumns>,
    #[serde(default)]
    pub constants: Constants,
}

/// The columns that name things.
#[derive(Debug, Clone, Default, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct BodyColumns {
    /// The column naming the system (required).
    pub system: String,
    /// The column naming the star; without one, each system has one star named after it.
    #[serde(default)]
    pub star: Option<String>,
    /// The column naming the planet; a row with an empty planet cell describes a star only.
    #[serde(default)]
    pub planet: Option<String>,
    /// The column naming a planet's host star, for tables with several stars per system;
    /// without one (or with an empty cell) the planet orbits the row's star.
    #[serde(default)]
    pub host: Option<String>,
}

/// References cited by every value of a row.
#[derive(Debug, Clone, Default, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RefColumns {
    /// Columns whose cells are reference texts; each non-empty one is cited by every value of
    /// its row.
    #[serde(default)]
    pub text: Vec<String>,
    /// A column of short reference keys, used as the ids of the row's references (made into
    /// valid Syzygy names) instead of ids made from the text.
    #[serde(default)]
    pub key: Option<String>,
}

/// The codes of limit-flag columns. A cell that is empty or in `measured` is a measurement.
#[derive(Debug, Clone, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct LimitCodes {
    #[serde(default = "default_upper")]
    pub upper: Vec<String>,
    #[serde(default = "default_lower")]
    pub lower: Vec<String>,
    #[serde(default = "default_measured")]
    pub measured: Vec<String>,
}

fn default_upper() -> Vec<String> {
    vec!["<".into()]
}
fn default_lower() -> Vec<String> {
    vec![">".into()]
}
fn default_measured() -> Vec<String> {
    vec!["=".into(), "0".into()]
}

impl Default for LimitCodes {
    fn default() -> Self {
        LimitCodes {
            upper: default_upper(),
            lower: default_lower(),
            measured: default_measured(),
        }
    }
}

/// Where one quantity's value and its companions are.
#[derive(Debug, Clone, Default, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct QuantityColumns {
    /// The value's column.
    pub value: String,
    /// The value's unit in Syzygy spelling; for a VOTable, absent means the FIELD's own unit.
    #[serde(default)]
    pub unit: Option<String>,
    /// A symmetric uncertainty (must not be negative).
    #[serde(default)]
    pub error: Option<String>,
    /// The uncertainty above the value (must not be negative).
    #[serde(default)]
    pub above: Option<String>,
    /// The uncertainty below the value, read by its size: `-0.02` and `0.02` both mean 0.02
    /// below.
    #[serde(default)]
    pub below: Option<String>,
    /// A limit-flag column, read with `limit_codes`.
    #[serde(default)]
    pub limit: Option<String>,
    /// A column of reference texts cited by this quantity only.
    #[serde(default)]
    pub r#ref: Option<String>,
}

/// Values given to every star or planet imported, as Syzygy value text (`"0.3 assumed"`).
#[derive(Debug, Clone, Default, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Constants {
    #[serde(default)]
    pub star: BTreeMap<String, String>,
    #[serde(default)]
    pub planet: BTreeMap<String, String>,
}

/// A mapping that cannot be used (exit status 2).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct MappingError(pub String);

impl std::fmt::Display for MappingError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(&self.0)
    }
}

impl Mapping {
    /// Read a mapping file's text.
    pub fn from_toml(text: &str) -> Result<Mapping, MappingError> {
        toml::from_str(text).map_err(|e| {
            let message = e.to_string();
            // The parser names a missing field; say what the field is for.
            let help = if message.contains("missing field `system`") {
                Some(
                    "help: `[bodies]` needs `system = \"COLUMN\"`, the column that names each \
                     row's system (where every star is its own system, its name column will do: \
                     `system = \"host\"`); docs/import.md",
                )
            } else if message.contains("missing field `value`") {
                Some(
                    "help: each `[star.QUANTITY]` and `[planet.QUANTITY]` table needs \
                     `value = \"COLUMN\"`, the column of the value itself; docs/import.md",
                )
            } else {
                None
            };
            MappingError(match help {
                Some(h) => format!("{}\n{h}", message.trim_end()),
                None => message,
            })
        })
    }
}

/// A quantity's columns found in one table's header.
#[derive(Debug, Clone)]
pub(crate) struct QuantityPlan {
    pub def: &'static QuantityDef,
    pub value: usize,
    /// Unit text in Syzygy spelling and its SI factor.
    pub unit: String,
    pub factor: f64,
    pub error: Option<usize>,
    pub above: Option<usize>,
    pub below: Option<usize>,
    pub limit: Option<usize>,
    pub refs: Option<usize>,
    /// For an uncertainty column (`error`, `above`, `below`) whose VOTable FIELD gives a unit
    /// other than the value's: the factor that turns its numbers into the value's unit.
    pub error_scales: Vec<(usize, f64)>,
}

/// The mapping resolved against a header: column indices and checked units.
#[derive(Debug, Clone)]
pub(crate) struct Plan {
    pub system: usize,
    pub star: Option<usize>,
    pub planet: Option<usize>,
    pub host: Option<usize>,
    pub ref_text: Vec<usize>,
    pub ref_key: Option<usize>,
    pub quantities: Vec<QuantityPlan>,
    pub constants: Vec<(BodyKind, &'static QuantityDef, String)>,
    pub codes: LimitCodes,
    /// Column names nobody reads (and the mapping does not ignore), in table order.
    pub unmapped: Vec<String>,
    /// Every column some part of the plan reads.
    pub used: Vec<bool>,
}

impl Plan {
    pub fn new(m: &Mapping, columns: &[super::Column]) -> Result<Plan, MappingError> {
        let mut used = vec![false; columns.len()];
        let hints = crate::text::Hints::default();
        let mut find = |name: &str, what: &str| -> Result<usize, MappingError> {
            let mut named = columns
                .iter()
                .enumerate()
                .filter(|(_, c)| c.name == name)
                .map(|(i, _)| i);
            let i = named.next().ok_or_else(|| {
                MappingError(format!(
                    "the mapping's {what} column `{name}` is not in the table's header{}",
                    header_hint(name, columns, &hints)
                ))
            })?;
            if let Some(j) = named.next() {
                return Err(MappingError(format!(
                    "the table's header names two columns `{name}` (columns {} and {}), so the mapping's {what} column could be either: rename one in the header",
                    i + 1,
                    j + 1
                )));
            }
            if let Some(u) = used.get_mut(i) {
                *u = true;
            }
            Ok(i)
        };
        let system = find(&m.bodies.system, "system")?;
        let star = opt(&mut find, m.bodies.star.as_deref(), "star")?;
        let planet = opt(&mut find, m.bodies.planet.as_deref(), "planet")?;
        let host = opt(&mut find, m.bodies.host.as_deref(), "host")?;
        if host.is_some() && planet.is_none() {
            return Err(MappingError(
                "the mapping names a host column but no planet column".into(),
            ));
        }
        let mut ref_text = Vec::new();
        for t in &m.refs.text {
            ref_text.push(find(t, "reference")?);
        }
        let ref_key = opt(&mut find, m.refs.key.as_deref(), "reference key")?;
        if ref_key.is_some() && ref_text.len() != 1 {
            return Err(MappingError(
                "a reference key column needs exactly one reference text column".into(),
            ));
        }
        let mut quantities = Vec::new();
        for (kind, table) in [(BodyKind::Star, &m.star), (BodyKind::Planet, &m.planet)] {
            if kind == BodyKind::Planet && planet.is_none() && !table.is_empty() {
                return Err(MappingError(
                    "the mapping gives planet quantities but no planet column".into(),
                ));
            }
            for (name, q) in table {
                let def = quantity(kind, name)?;
                let what = format!("{} {}", kind.as_str(), def.name);
                let value = find(&q.value, &format!("{what} value"))?;
                let col = columns.get(value);
                let (unit, factor) = unit_for(def, q.unit.as_deref(), col, &what)?;
                let error = opt(&mut find, q.error.as_deref(), &format!("{what} error"))?;
                let above = opt(&mut find, q.above.as_deref(), &format!("{what} above"))?;
                let below = opt(&mut find, q.below.as_deref(), &format!("{what} below"))?;
                let mut error_scales = Vec::new();
                for i in [error, above, below].into_iter().flatten() {
                    let scale = error_scale(def, factor, columns.get(i), &what)?;
                    if scale != 1.0 {
                        error_scales.push((i, scale));
                    }
                }
                quantities.push(QuantityPlan {
                    def,
                    value,
                    unit,
                    factor,
                    error,
                    above,
                    below,
                    limit: opt(&mut find, q.limit.as_deref(), &format!("{what} limit"))?,
                    refs: opt(&mut find, q.r#ref.as_deref(), &format!("{what} ref"))?,
                    error_scales,
                });
                if q.above.is_some() != q.below.is_some() {
                    return Err(MappingError(format!(
                        "{what}: `above` and `below` go together (use `error` for a symmetric uncertainty)"
                    )));
                }
                if q.error.is_some() && q.above.is_some() {
                    return Err(MappingError(format!(
                        "{what}: give either `error` or `above` and `below`, not both"
                    )));
                }
            }
        }
        let mut constants = Vec::new();
        for (kind, table) in [
            (BodyKind::Star, &m.constants.star),
            (BodyKind::Planet, &m.constants.planet),
        ] {
            for (name, text) in table {
                let def = quantity(kind, name)?;
                check_value_text(kind, def, text)?;
                constants.push((kind, def, text.trim().to_string()));
            }
        }
        for name in &m.ignore {
            if let Some(i) = columns.iter().position(|c| &c.name == name) {
                if let Some(u) = used.get_mut(i) {
                    *u = true;
                }
            }
        }
        let unmapped = columns
            .iter()
            .zip(&used)
            .enumerate()
            .filter(|(_, (_, u))| !**u)
            .map(|(i, (c, _))| {
                if c.name.trim().is_empty() {
                    format!("column {} (no name in the header)", i + 1)
                } else {
                    c.name.clone()
                }
            })
            .collect();
        Ok(Plan {
            system,
            star,
            planet,
            host,
            ref_text,
            ref_key,
            quantities,
            constants,
            codes: m.limit_codes.clone(),
            unmapped,
            used,
        })
    }
}

fn opt(
    find: &mut impl FnMut(&str, &str) -> Result<usize, MappingError>,
    name: Option<&str>,
    what: &str,
) -> Result<Option<usize>, MappingError> {
    name.map(|n| find(n, what)).transpose()
}

fn quantity(kind: BodyKind, name: &str) -> Result<&'static QuantityDef, MappingError> {
    quantities::find(kind, name).ok_or_else(|| {
        let hint = quantities::suggest(kind, name)
            .map(|s| format!(" (did you mean `{s}`?)"))
            .unwrap_or_default();
        MappingError(format!(
            "`{name}` is not a {} quantity{hint}; docs/language.md lists them",
            kind.as_str()
        ))
    })
}

/// The header's column a mapping's missing column name probably meant, as a clause: one
/// that differs only in letter case (`Mass` for `mass`), else a close spelling. The search
/// shares one work bound over the mapping (a header may have 10,000 columns).
fn header_hint(name: &str, columns: &[super::Column], hints: &crate::text::Hints) -> String {
    if let Some(c) = columns.iter().find(|c| c.name.eq_ignore_ascii_case(name)) {
        return format!(
            "; the header has `{}`, which differs only in letter case (column names are matched exactly)",
            c.name
        );
    }
    hints
        .closest(name, columns.iter().map(|c| c.name.as_str()))
        .map(|c| format!("; did you mean `{c}`?"))
        .unwrap_or_default()
}

/// The unit a quantity's values are written in: the mapping's, else the VOTable FIELD's;
/// either must resolve and have the quantity's dimension.
fn unit_for(
    def: &QuantityDef,
    given: Option<&str>,
    col: Option<&super::Column>,
    what: &str,
) -> Result<(String, f64), MappingError> {
    let col_name = col.map_or("?", |c| c.name.as_str());
    let field = col.and_then(|c| c.unit.as_deref());
    // A field in degrees Celsius stays in Celsius whatever the mapping says: `unit = "K"`
    // would read 5000 (°C) as 5000 K.
    if let Some(why) = field.and_then(|vo| super::votable::offset_scale(vo.trim())) {
        return Err(MappingError(format!(
            "{what}: field `{col_name}` is in `{}`, {why}",
            field.unwrap_or_default().trim()
        )));
    }
    if let (Some(u), Some(vo)) = (given, field) {
        disagreeing(u, vo, col_name, what)?;
    }
    let text = match (given, field) {
        (Some(u), _) => u.trim().to_string(),
        (None, Some(vo)) => super::vounit_to_syzygy(vo).map_err(|why| {
            MappingError(format!(
                "{what}: the unit `{vo}` of field `{col_name}` has no Syzygy equivalent ({why}); give `unit` in the mapping"
            ))
        })?,
        (None, None) => String::new(),
    };
    if def.text {
        if !text.is_empty() {
            return Err(MappingError(format!("{what} is text and takes no unit")));
        }
        return Ok((text, 1.0));
    }
    // Depths are published as fractions, per cent and ppm alike: a column read as a
    // fraction without a word made 0.02 (per cent) a depth of 2 %.
    if def.qty == crate::quantities::Qty::TransitDepth && text.is_empty() {
        return Err(MappingError(format!(
            "{what}: give `unit` in the mapping: \"%\", \"ppm\", or \"1\" for a fraction (depths are published in all three)"
        )));
    }
    let unit = crate::units::parse_unit_text(&text).ok_or_else(|| {
        let meant = crate::units::suggest_for(text.trim(), Some(def.dim))
            .map(|s| format!("; did you mean `{s}`?"))
            .unwrap_or_default();
        MappingError(format!(
            "{what}: `{text}` is not a Syzygy unit (docs/language.md, \"Units\"){meant}"
        ))
    })?;
    if unit.dim != def.dim {
        let need = if text.is_empty() {
            format!(
                "{what} needs a unit of {}; give `unit` in the mapping",
                def.dim.describe()
            )
        } else {
            format!(
                "{what}: the unit `{text}` (column `{col_name}`) is {}, but {} is {}",
                unit.dim.describe(),
                def.name,
                def.dim.describe()
            )
        };
        return Err(MappingError(need));
    }
    // Magnitudes and dex are logarithms of a ratio, not scale factors: only the quantities
    // shown in them take them (a depth in mmag is not a fraction times 1e-3).
    if !crate::units::takes_unit(def.display, text.trim()) {
        return Err(MappingError(format!(
            "{what}: the unit `{text}` (column `{col_name}`) is logarithmic, and {} is not: convert the column (a depth in mmag to a fraction, for example, is 1 - 10^(-mmag/2500))",
            def.name
        )));
    }
    // `1`, a plain number, is written without a unit (`0.02 1` would not parse).
    let text = if text == "1" { String::new() } else { text };
    Ok((text, unit.factor))
}

/// A mapping's `unit` for a VOTable field that names a unit of its own is refused where the
/// two differ: the value would be read in the mapping's unit and its uncertainty columns in
/// theirs, a value 1000 times too small beside a right uncertainty (`km/s` read as `m/s`).
/// A field unit with no Syzygy equivalent is what the mapping's `unit` is for, and stands.
fn disagreeing(given: &str, vo: &str, col_name: &str, what: &str) -> Result<(), MappingError> {
    let field = super::vounit_to_syzygy(vo)
        .ok()
        .and_then(|t| crate::units::parse_unit_text(&t));
    let (Some(field), Some(mapped)) = (field, crate::units::parse_unit_text(given.trim())) else {
        return Ok(());
    };
    let same = field.dim == mapped.dim
        && (field.factor - mapped.factor).abs()
            <= 1e-9 * field.factor.abs().max(mapped.factor.abs());
    if same {
        return Ok(());
    }
    Err(MappingError(format!(
        "{what}: the mapping says `unit = \"{}\"`, but field `{col_name}` gives its unit as `{vo}`; remove `unit` from the mapping to read the field's unit, or correct the one that is wrong",
        given.trim()
    )))
}

/// The factor that turns an uncertainty column's numbers into the value's unit (of SI factor
/// `value_factor`): 1 when its VOTable FIELD gives no unit (read in the value's unit), else
/// the ratio of the two units, which must share the quantity's dimension.
fn error_scale(
    def: &QuantityDef,
    value_factor: f64,
    col: Option<&super::Column>,
    what: &str,
) -> Result<f64, MappingError> {
    let Some((name, vo)) = col.and_then(|c| Some((c.name.as_str(), c.unit.as_deref()?))) else {
        return Ok(1.0);
    };
    if def.text {
        return Ok(1.0);
    }
    let refuse = |why: String| {
        MappingError(format!(
            "{what}: the uncertainty field `{name}` has the unit `{vo}`, {why}; convert the column, or remove its unit if it is in the value's unit"
        ))
    };
    let text = super::vounit_to_syzygy(vo)
        .map_err(|why| refuse(format!("which has no Syzygy equivalent ({why})")))?;
    let unit = crate::units::parse_unit_text(&text)
        .ok_or_else(|| refuse("which is not a Syzygy unit".to_string()))?;
    if unit.dim != def.dim {
        return Err(refuse(format!(
            "{}, but {} is {}",
            unit.dim.describe(),
            def.name,
            def.dim.describe()
        )));
    }
    Ok(if value_factor > 0.0 && unit.factor != value_factor {
        unit.factor / value_factor
    } else {
        1.0
    })
}

/// A number converted between units, written with twelve significant digits at most (the
/// conversion's rounding noise left out): `2.4` h in days is `0.1`, not `0.09999999999999999`.
pub(crate) fn scaled_text(v: f64) -> String {
    let rounded: f64 = format!("{v:.11e}").parse().unwrap_or(v);
    // Debug, not Display: an exponent for very large or small numbers (`1e-20`).
    format!("{rounded:?}")
}

/// A constant's text must be a value the language reads for that quantity.
fn check_value_text(kind: BodyKind, def: &QuantityDef, text: &str) -> Result<(), MappingError> {
    let src = format!(
        "system \"x\" {{\n  star s {{\n  }}\n  {} {} {{\n    {} = {}\n  }}\n}}\n",
        kind.as_str(),
        if kind == BodyKind::Star {
            "t"
        } else {
            "p orbits s"
        },
        def.name,
        text.trim()
    );
    let analysis = crate::analyze(
        crate::source::FileId(0),
        &src,
        &crate::settings::Settings::default(),
    );
    let errors: Vec<String> = analysis
        .diagnostics
        .iter()
        .filter(|d| d.severity == crate::diagnostic::Severity::Error)
        .map(|d| d.message.clone())
        .collect();
    // One value: a ';' would start another declaration, a '#' a comment the file would keep.
    let more_than_a_value = text.contains(['\n', '\r', '{', '}', ';', '#']);
    if more_than_a_value || !errors.is_empty() {
        return Err(MappingError(format!(
            "constant {}.{} = \"{}\" is not a value Syzygy reads: {}",
            kind.as_str(),
            def.name,
            text.trim(),
            if errors.is_empty() {
                "one value, on one line, with no ';', '#' or braces".to_string()
            } else {
                errors.join("; ")
            }
        )));
    }
    Ok(())
}
