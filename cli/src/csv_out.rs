//! `syz eval --format csv`: one row per body, four columns per quantity, each column in one
//! fixed unit (listed in docs/csv-output.md) so that a table of many files can be read
//! without looking at units row by row.

use syzygy::ast::BodyKind;
use syzygy::derive::{display_factor, QuantityResult};
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

fn number(v: f64) -> String {
    if v.is_finite() {
        format!("{v}")
    } else {
        String::new()
    }
}

fn cells(def: &QuantityDef, q: Option<&QuantityResult>) -> Vec<String> {
    let Some(q) = q else {
        return if def.text {
            vec![String::new(), String::new()]
        } else {
            vec![String::new(); 4]
        };
    };
    let mut origin = q.origin.as_str().to_string();
    match q.form {
        Form::UpperLimit => origin.push_str(";upper-limit"),
        Form::LowerLimit => origin.push_str(";lower-limit"),
        _ => {}
    }
    if def.text {
        return vec![q.text.clone().unwrap_or_default(), origin];
    }
    let f = display_factor(column_unit(def));
    vec![
        number(q.value / f),
        number(q.below / f),
        number(q.above / f),
        origin,
    ]
}

/// Write the table of every analysed file.
pub fn write(
    analyses: &[Analysis],
    db: &dyn SourceDb,
    out: impl std::io::Write,
) -> Result<(), csv::Error> {
    let defs = quantities::table();
    let mut w = csv::Writer::from_writer(out);
    let mut header = vec![
        "file".to_string(),
        "system".into(),
        "body".into(),
        "kind".into(),
        "orbits".into(),
    ];
    for def in defs {
        let n = column_name(def);
        if def.text {
            header.extend([n.clone(), format!("{n}_origin")]);
        } else {
            header.extend([
                n.clone(),
                format!("{n}_below"),
                format!("{n}_above"),
                format!("{n}_origin"),
            ]);
        }
    }
    w.write_record(&header)?;
    for a in analyses {
        for (sys, res) in a.model.systems.iter().zip(&a.results) {
            for (b, r) in sys.bodies.iter().zip(&res.bodies) {
                let orbits = b
                    .orbits
                    .and_then(|h| sys.bodies.get(h))
                    .map_or(String::new(), |h| h.id.clone());
                let mut row = vec![
                    db.name(a.file).to_string(),
                    sys.name.clone(),
                    b.id.clone(),
                    b.kind.as_str().to_string(),
                    orbits,
                ];
                for def in defs {
                    let q = if def.kind == b.kind {
                        r.quantities.iter().find(|q| q.qty == def.qty)
                    } else {
                        None
                    };
                    row.extend(cells(def, q));
                }
                w.write_record(&row)?;
            }
        }
    }
    w.flush()?;
    Ok(())
}
