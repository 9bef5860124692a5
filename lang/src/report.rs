//! What `eval` reports: the machine-readable form (documented in `docs/json-output.md`) and
//! the text form for people. Pure functions from an [`Analysis`] to data or text.

use crate::derive::{display_factor, Origin, QuantityResult};
use crate::model::Form;
use crate::quantities::{self, Qty};
use crate::source::{LineIndex, SourceDb};
use crate::Analysis;
use serde_json::{json, Map, Value as Json};

/// Version of the JSON contract; bump on any incompatible change.
pub const JSON_VERSION: u32 = 1;

fn finite(v: f64) -> Json {
    if v.is_finite() {
        json!(v)
    } else {
        Json::Null
    }
}

fn key_label(a: &Analysis, sys: usize, k: crate::derive::Key) -> String {
    let b = a
        .model
        .systems
        .get(sys)
        .and_then(|s| s.bodies.get(k.0))
        .map_or("?", |b| b.id.as_str());
    format!("{b}.{}", quantities::def(k.1).name)
}

fn quantity_json(a: &Analysis, sys: usize, q: &QuantityResult) -> Json {
    let def = quantities::def(q.qty);
    let mut m = Map::new();
    if let Some(t) = &q.text {
        m.insert("text".into(), json!(t));
    } else {
        let unit = q.shown_unit();
        let f = display_factor(unit);
        m.insert("value".into(), finite(q.value / f));
        m.insert("unit".into(), json!(unit));
        m.insert("below".into(), finite(q.below / f));
        m.insert("above".into(), finite(q.above / f));
        m.insert(
            "si".into(),
            json!({
                "value": finite(q.value),
                "below": finite(q.below),
                "above": finite(q.above),
                "unit": def.dim.si_unit(),
            }),
        );
    }
    m.insert("form".into(), json!(q.form.as_str()));
    m.insert(
        "limit".into(),
        match q.form {
            Form::UpperLimit => json!("upper"),
            Form::LowerLimit => json!("lower"),
            _ => Json::Null,
        },
    );
    m.insert("origin".into(), json!(q.origin.as_str()));
    if let Some(r) = q.rule {
        m.insert("rule".into(), json!(r));
    }
    if let Some(f) = q.formula {
        m.insert("formula".into(), json!(f));
    }
    if !q.inputs.is_empty() {
        m.insert(
            "inputs".into(),
            json!(q
                .inputs
                .iter()
                .map(|k| key_label(a, sys, *k))
                .collect::<Vec<_>>()),
        );
    }
    if !q.citations.is_empty() {
        m.insert("citations".into(), json!(q.citations));
    }
    if !q.assumptions.is_empty() {
        m.insert("assumptions".into(), json!(q.assumptions));
    }
    if q.origin == Origin::Derived && !q.budget.is_empty() {
        m.insert(
            "budget".into(),
            json!(q
                .budget
                .iter()
                .map(|(input, share)| json!({"input": input, "share": share}))
                .collect::<Vec<_>>()),
        );
    }
    if !q.notes.is_empty() {
        m.insert("notes".into(), json!(q.notes));
    }
    Json::Object(m)
}

/// The systems of one analysed file, in the `eval --format json` shape.
pub fn systems_json(a: &Analysis, db: &dyn SourceDb) -> Vec<Json> {
    let mut out = Vec::new();
    for (si, (sys, res)) in a.model.systems.iter().zip(&a.results).enumerate() {
        let bodies: Vec<Json> = sys
            .bodies
            .iter()
            .zip(&res.bodies)
            .map(|(b, r)| {
                let mut qs = Map::new();
                for q in &r.quantities {
                    qs.insert(
                        quantities::def(q.qty).name.to_string(),
                        quantity_json(a, si, q),
                    );
                }
                let mut body = Map::new();
                body.insert("id".into(), json!(b.id));
                body.insert("kind".into(), json!(b.kind.as_str()));
                if b.kind == crate::ast::BodyKind::Planet {
                    body.insert(
                        "orbits".into(),
                        b.orbits
                            .and_then(|h| sys.bodies.get(h))
                            .map_or(Json::Null, |h| json!(h.id)),
                    );
                }
                body.insert("quantities".into(), Json::Object(qs));
                if let Some(c) = a.composition.get(&(si, b.id.clone())) {
                    body.insert("composition".into(), c.clone());
                }
                Json::Object(body)
            })
            .collect();
        out.push(json!({
            "file": db.name(a.file),
            "name": sys.name,
            "bodies": bodies,
        }));
    }
    out
}

/// The diagnostics shown of one analysed file (the first [`crate::shown::PER_FILE`]), in
/// the documented shape, and how many more it has.
pub fn diagnostics_json(a: &Analysis, db: &dyn SourceDb) -> (Vec<Json>, usize) {
    let (shown, left_out) = crate::shown::split(&a.diagnostics);
    if shown.is_empty() {
        return (Vec::new(), left_out);
    }
    let index = LineIndex::new(db.text(a.file));
    (
        shown.iter().map(|d| d.to_json(db, &index)).collect(),
        left_out,
    )
}

/// A value as people read it: `0.0443 ± 0.0006 au`, `< 0.08`, `"K0V"`.
pub fn value_text(q: &QuantityResult) -> String {
    if let Some(t) = &q.text {
        return format!("\"{t}\"");
    }
    let unit = q.shown_unit();
    let f = display_factor(unit);
    if q.qty == Qty::TransitEpoch {
        return format!(
            "{} {unit}",
            crate::format::julian_date(q.value / f, q.below / f, q.above / f)
        );
    }
    let u = if unit == "1" {
        String::new()
    } else {
        format!(" {unit}")
    };
    let v = match q.form {
        Form::UpperLimit => format!("< {}", crate::format::number(q.value / f)),
        Form::LowerLimit => format!("> {}", crate::format::number(q.value / f)),
        Form::Exact => crate::format::number(q.value / f),
        _ => crate::format::with_uncertainty(q.value / f, q.below / f, q.above / f),
    };
    let extra = if q.qty == Qty::Insolation {
        format!(
            " ({} W/m^2)",
            crate::format::with_uncertainty(q.value, q.below, q.above)
        )
    } else {
        String::new()
    };
    format!("{v}{u}{extra}")
}

/// Where a value came from, in a few words.
pub fn provenance_text(a: &Analysis, sys: usize, q: &QuantityResult) -> String {
    let cites = if q.citations.is_empty() {
        String::new()
    } else {
        format!(" [{}]", q.citations.join(", "))
    };
    match q.origin {
        Origin::Declared | Origin::Assumed if q.rule.is_none() => {
            format!("{}{cites}", q.origin.as_str())
        }
        Origin::Default => "default".to_string(),
        Origin::Estimated => format!("estimated from the spectral type{cites}"),
        _ => {
            let inputs: Vec<String> = q.inputs.iter().map(|k| key_label(a, sys, *k)).collect();
            let from = if inputs.is_empty() {
                String::new()
            } else {
                format!(" from {}", inputs.join(", "))
            };
            format!(
                "{} by {}{from}{cites}",
                if q.origin == Origin::Derived {
                    "derived"
                } else {
                    q.origin.as_str()
                },
                q.rule.unwrap_or("?"),
            )
        }
    }
}

/// The people's form of `eval` for one file.
pub fn eval_text(a: &Analysis, db: &dyn SourceDb) -> String {
    let mut out = String::new();
    for (si, (sys, res)) in a.model.systems.iter().zip(&a.results).enumerate() {
        out.push_str(&format!("system \"{}\"  ({})\n", sys.name, db.name(a.file)));
        for (b, r) in sys.bodies.iter().zip(&res.bodies) {
            match b.orbits.and_then(|h| sys.bodies.get(h)) {
                Some(h) => {
                    out.push_str(&format!("  {} {} orbits {}\n", b.kind.as_str(), b.id, h.id))
                }
                None => out.push_str(&format!("  {} {}\n", b.kind.as_str(), b.id)),
            }
            let width = r
                .quantities
                .iter()
                .map(|q| quantities::def(q.qty).name.len())
                .max()
                .unwrap_or(0);
            let rows: Vec<(String, String, String)> = r
                .quantities
                .iter()
                .map(|q| {
                    (
                        quantities::def(q.qty).name.to_string(),
                        value_text(q),
                        provenance_text(a, si, q),
                    )
                })
                .collect();
            let vwidth = rows.iter().map(|r| r.1.chars().count()).max().unwrap_or(0);
            for (name, value, prov) in rows {
                let pad = vwidth.saturating_sub(value.chars().count());
                out.push_str(&format!(
                    "    {name:<width$}  {value}{}  {prov}\n",
                    " ".repeat(pad)
                ));
            }
            if let Some(c) = a.composition_text.get(&(si, b.id.clone())) {
                out.push_str(&format!("    composition: {c}\n"));
            }
            let mut assumed: Vec<&String> = r
                .quantities
                .iter()
                .flat_map(|q| q.assumptions.iter())
                .collect();
            assumed.sort();
            assumed.dedup();
            if !assumed.is_empty() {
                out.push_str("    assumed:\n");
                for s in assumed {
                    out.push_str(&format!("      - {s}\n"));
                }
            }
            let mut notes: Vec<String> = r
                .quantities
                .iter()
                .flat_map(|q| {
                    q.notes
                        .iter()
                        .map(move |n| format!("{}: {n}", quantities::def(q.qty).name))
                })
                .collect();
            notes.dedup();
            for n in notes {
                out.push_str(&format!("    note: {n}\n"));
            }
        }
        out.push('\n');
    }
    out
}

/// Find a body by id: in the named system, or the first system that has it.
pub fn find_body(a: &Analysis, system: Option<&str>, body: &str) -> Option<(usize, usize)> {
    a.model.systems.iter().enumerate().find_map(|(si, s)| {
        if system.is_some_and(|n| n != s.name) {
            return None;
        }
        s.body(body).map(|bi| (si, bi))
    })
}

/// The derivation tree of one quantity down to the declared measurements, then its error
/// budget: each independent input's share of the variance (first order).
pub fn explain_text(a: &Analysis, si: usize, key: crate::derive::Key) -> Option<String> {
    let res = a.results.get(si)?;
    let q = res.bodies.get(key.0)?.get(key.1)?;
    let mut out = String::new();
    let mut seen = Vec::new();
    explain_node(a, si, key, "", "", &mut out, &mut seen);
    if !q.budget.is_empty() {
        out.push_str("\nerror budget (share of the variance, first order):\n");
        let width = q.budget.iter().map(|b| b.0.len()).max().unwrap_or(0);
        for (input, share) in &q.budget {
            out.push_str(&format!("  {input:<width$}  {:>5.1} %\n", share * 100.0));
        }
        if let Some((top, _)) = q.budget.first() {
            out.push_str(&format!("  to improve this value, improve {top} first\n"));
        }
    }
    let mut assumed = q.assumptions.clone();
    assumed.dedup();
    if !assumed.is_empty() {
        out.push_str("\nassumed:\n");
        for s in assumed {
            out.push_str(&format!("  - {s}\n"));
        }
    }
    Some(out)
}

fn explain_node(
    a: &Analysis,
    si: usize,
    key: crate::derive::Key,
    lead: &str,
    child_lead: &str,
    out: &mut String,
    seen: &mut Vec<crate::derive::Key>,
) {
    let label = key_label(a, si, key);
    let Some(q) = a
        .results
        .get(si)
        .and_then(|r| r.bodies.get(key.0))
        .and_then(|b| b.get(key.1))
    else {
        out.push_str(&format!("{lead}{label} (not available)\n"));
        return;
    };
    let how = match (q.origin, q.rule, q.formula) {
        (_, Some(rule), Some(f)) => format!("{} by {rule}: {f}", q.origin.as_str()),
        _ => provenance_text(a, si, q),
    };
    let again = seen.contains(&key);
    out.push_str(&format!(
        "{lead}{label} = {}  {how}{}\n",
        value_text(q),
        if again && !q.inputs.is_empty() {
            "  (expanded above)"
        } else {
            ""
        }
    ));
    if again {
        return;
    }
    seen.push(key);
    let n = q.inputs.len();
    for (i, k) in q.inputs.iter().enumerate() {
        let last = i + 1 == n;
        let (l, c) = if last {
            ("└─ ", "   ")
        } else {
            ("├─ ", "│  ")
        };
        explain_node(
            a,
            si,
            *k,
            &format!("{child_lead}{l}"),
            &format!("{child_lead}{c}"),
            out,
            seen,
        );
    }
}
