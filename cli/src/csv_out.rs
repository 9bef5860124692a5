//! `syz eval --format csv`: one row per body, four columns per quantity, each column in one
//! fixed unit (listed in docs/csv-output.md) so that a table of many files can be read
//! without looking at units row by row.

use syzygy::ast::BodyKind;
use syzygy::derive::{DisplayUnit, QuantityResult};
use syzygy::model::Form;
use syzygy::quantities::{self, Qty, QuantityDef};
use syzygy::source::SourceDb;
use syzygy::Analysis;

/// The fixed unit of a quantity's columns: the display unit, except planet mass, minimum
/// mass and radius (whose display unit depends on size) and the two whose display unit
/// switches for small values.
pub fn column_unit(def: &QuantityDef) -> &'static str {
    match def.qty {
        Qty::Mass | Qty::MinMass => "Mjup",
        Qty::Radius => "Rjup",
        _ => def.display,
    }
}

/// The column stem of a quantity: its canonical name, prefixed `star_` for a star's.
pub fn column_name(def: &QuantityDef) -> String {
    match def.kind {
        BodyKind::Star => format!("star_{}", def.name),
        _ => def.name.to_string(),
    }
}

/// Write a number's cell into `buf` (empty when not finite): Rust's shortest round-trip form.
fn number(buf: &mut String, v: f64) -> &str {
    use std::fmt::Write;
    buf.clear();
    if v.is_finite() {
        let _ = write!(buf, "{v}");
    }
    buf
}

/// The cells of one quantity: value, below, above and origin (text and origin for text).
fn write_cells<W: std::io::Write>(
    w: &mut csv::Writer<W>,
    buf: &mut String,
    def: &QuantityDef,
    q: Option<&QuantityResult>,
) -> Result<(), csv::Error> {
    let Some(q) = q else {
        let n = if def.text { 2 } else { 4 };
        for _ in 0..n {
            w.write_field("")?;
        }
        return Ok(());
    };
    let limit = match q.form {
        Form::UpperLimit => ";upper-limit",
        Form::LowerLimit => ";lower-limit",
        _ => "",
    };
    if def.text {
        w.write_field(q.text.as_deref().unwrap_or_default())?;
    } else {
        let f = DisplayUnit::parse(column_unit(def)).map_or(f64::NAN, |u| u.factor);
        w.write_field(number(buf, q.value / f))?;
        w.write_field(number(buf, q.below / f))?;
        w.write_field(number(buf, q.above / f))?;
    }
    buf.clear();
    buf.push_str(q.origin.as_str());
    buf.push_str(limit);
    w.write_field(buf.as_str())?;
    Ok(())
}

/// The header line.
pub fn header() -> Result<Vec<u8>, csv::Error> {
    let mut w = csv::Writer::from_writer(Vec::new());
    for h in ["file", "system", "body", "kind", "orbits"] {
        w.write_field(h)?;
    }
    for def in quantities::table() {
        let n = column_name(def);
        w.write_field(&n)?;
        if !def.text {
            w.write_field(format!("{n}_below"))?;
            w.write_field(format!("{n}_above"))?;
        }
        w.write_field(format!("{n}_origin"))?;
    }
    w.write_field("assumptions")?;
    w.write_record(None::<&[u8]>)?;
    w.into_inner().map_err(|e| csv::Error::from(e.into_error()))
}

/// The rows of one analysed file, one per body.
pub fn rows(a: &Analysis, db: &dyn SourceDb) -> Result<Vec<u8>, csv::Error> {
    let defs = quantities::table();
    let mut w = csv::Writer::from_writer(Vec::new());
    let mut buf = String::new();
    for (sys, res) in a.model.systems.iter().zip(&a.results) {
        for (b, r) in sys.bodies.iter().zip(&res.bodies) {
            let orbits = b
                .orbits
                .and_then(|h| sys.bodies.get(h))
                .map_or("", |h| h.id.as_str());
            for field in [db.name(a.file), &sys.name, &b.id, b.kind.as_str(), orbits] {
                w.write_field(field)?;
            }
            for def in defs {
                let q = if def.kind == b.kind {
                    r.quantities.iter().find(|q| q.qty == def.qty)
                } else {
                    None
                };
                write_cells(&mut w, &mut buf, def, q)?;
            }
            // What the body's values assumed, in words, so the table never hides a default
            // or an approximation (the JSON output has them per quantity).
            let assumed: std::collections::BTreeSet<&str> = r
                .quantities
                .iter()
                .flat_map(|q| q.assumptions.iter().map(String::as_str))
                .collect();
            buf.clear();
            for (i, a) in assumed.iter().enumerate() {
                if i > 0 {
                    buf.push_str(" | ");
                }
                buf.push_str(a);
            }
            w.write_field(buf.as_str())?;
            w.write_record(None::<&[u8]>)?;
        }
    }
    w.into_inner().map_err(|e| csv::Error::from(e.into_error()))
}
