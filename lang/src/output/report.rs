//! What `eval` reports: the machine-readable form (documented in `docs/json-output.md`) and
//! the text form for people. Pure functions from an [`Analysis`] to data or text.

use crate::ast::BodyKind;
use crate::derive::{DisplayUnit, Origin, QuantityResult};
use crate::model::Form;
use crate::quantities::{self, Qty};
use crate::source::{Places, SourceDb};
use crate::Analysis;

mod assumed;
mod explain;
pub mod json;
mod missing;

pub use explain::explain_text;
pub use missing::{missing_text, refused_text, written_in_file};

/// Version of the JSON contract; bump on any incompatible change.
pub const JSON_VERSION: u32 = 2;

fn quantity_json<'a>(
    a: &Analysis,
    sys: usize,
    q: &'a QuantityResult,
    places: &Places,
) -> json::Quantity<'a> {
    let system_span = a.system_span(sys);
    let sources = q
        .sources
        .iter()
        .map(|s| {
            let unit = s.shown_unit(q);
            json::Source {
                value: unit.of(s.value),
                below: unit.of(s.below),
                above: unit.of(s.above),
                unit: unit.symbol.to_string(),
                limit: limit_word(s.form),
                citations: &s.citations,
                line: places.of(s.span.in_file(system_span)).1.line,
                chosen: s.chosen,
                assumed: s.assumed,
            }
        })
        .collect();
    let measured = q.text.is_none().then(|| {
        let unit = q.shown_unit();
        json::Measured {
            value: unit.of(q.value),
            unit: unit.symbol,
            below: unit.of(q.below),
            above: unit.of(q.above),
            si: json::Si {
                value: q.value,
                below: q.below,
                above: q.above,
                unit: quantities::def(q.qty).dim.si_unit(),
            },
        }
    });
    let budget = if q.origin.is_computed() {
        q.budget
            .iter()
            .map(|(input, share)| json::Share {
                input,
                share: *share,
            })
            .collect()
    } else {
        Vec::new()
    };
    let precision = q.precision.map(|p| {
        let unit = q.shown_unit();
        json::Precision {
            samples: p.samples,
            low: unit.of(p.low),
            median: unit.of(p.median),
            high: unit.of(p.high),
            stable: q.stable(),
        }
    });
    json::Quantity {
        precision,
        range_end: q.range_end.map(|o| q.shown_unit().of(o)),
        text: q.text.as_deref(),
        measured,
        form: q.form.as_str(),
        limit: limit_word(q.form),
        origin: q.origin.as_str(),
        rule: q.rule,
        formula: q.formula,
        inputs: q.inputs.iter().map(|k| a.key_name(sys, *k)).collect(),
        citations: &q.cited,
        assumptions: &q.assumptions,
        budget,
        notes: &q.notes,
        sources,
        choice: q.choice.map(|c| c.as_str()),
    }
}

/// The JSON `limit` of a form: `upper`, `lower` or none.
fn limit_word(form: Form) -> Option<&'static str> {
    match form {
        Form::UpperLimit => Some("upper"),
        Form::LowerLimit => Some("lower"),
        _ => None,
    }
}

/// The systems of one analysed file, in the `eval --format json` shape.
pub fn systems_json<'a>(a: &'a Analysis, db: &'a dyn SourceDb) -> Vec<json::System<'a>> {
    let file = db.name(a.file);
    let places = Places::new(db, a.file);
    a.model
        .systems
        .iter()
        .zip(&a.results)
        .enumerate()
        .map(|(si, (sys, res))| json::System {
            file,
            name: &sys.name,
            bodies: sys
                .bodies
                .iter()
                .zip(&res.bodies)
                .map(|(b, r)| json::Body {
                    id: &b.id,
                    kind: b.kind.as_str(),
                    orbits: (b.kind == BodyKind::Planet).then(|| {
                        b.orbits
                            .and_then(|h| sys.bodies.get(h))
                            .map(|h| h.id.as_str())
                    }),
                    quantities: json::Pairs(
                        r.quantities
                            .iter()
                            .map(|q| {
                                (
                                    quantities::def(q.qty).name,
                                    quantity_json(a, si, q, &places),
                                )
                            })
                            .collect(),
                    ),
                    composition: a.composition.get(&(si, b.id.clone())).map(|c| &c.json),
                })
                .collect(),
            not_used: a
                .unused_in(si)
                .iter()
                .map(|u| json::NotUsed {
                    body: &u.body_id,
                    quantity: u.quantity.as_deref(),
                    text: &u.text,
                    line: places.of(u.span).1.line as usize,
                    rule: u.rule,
                    why: &u.why,
                    silenced: u.silenced,
                })
                .collect(),
        })
        .collect()
}

/// The diagnostics shown of one analysed file (the first [`crate::shown::PER_FILE`]), in
/// the documented shape, and how many more it has.
pub fn diagnostics_json(a: &Analysis, db: &dyn SourceDb) -> (Vec<json::Diagnostic>, usize) {
    let (shown, left_out) = crate::shown::split(&a.diagnostics);
    let places = Places::new(db, a.file);
    (
        shown
            .iter()
            .map(|d| json::Diagnostic::new(d, &places))
            .collect(),
        left_out,
    )
}

/// A value in SI as people read it in `unit`: `0.0443 ± 0.0006 au`, `< 0.08`. The one
/// formatter of measured values: text reports, hover and inlay hints all use it.
pub fn shown_in(value: f64, below: f64, above: f64, form: Form, unit: DisplayUnit) -> String {
    let (v, lo, hi) = (unit.of(value), unit.of(below), unit.of(above));
    let number = match form {
        Form::UpperLimit => format!("< {}", crate::format::number(v)),
        Form::LowerLimit => format!("> {}", crate::format::number(v)),
        Form::Exact => crate::format::number(v),
        _ => crate::format::with_uncertainty(v, lo, hi),
    };
    match unit.suffix() {
        "" => number,
        u => format!("{number} {u}"),
    }
}

/// A value as people read it: `0.0443 ± 0.0006 au`, `< 0.08`, `"K0V"`, in its own display
/// unit (the one written in the file, else the usual one for its size).
pub fn value_text(q: &QuantityResult) -> String {
    value_text_in(q, q.shown_unit(), Some(flux_unit(q.value)))
}

/// A value in `unit` alone, as `syz eval` shows it (a derived limit in three digits, or the
/// range it lies in): for a list of the same value in other units.
pub fn value_text_in_unit(q: &QuantityResult, unit: DisplayUnit) -> String {
    if q.qty == Qty::TransitEpoch || q.text.is_some() {
        return shown_in(q.value, q.below, q.above, q.form, unit);
    }
    value_text_in(q, unit, None)
}

/// A value as people read it in `unit`; an insolation also in the SI flux unit `flux`.
fn value_text_in(q: &QuantityResult, unit: DisplayUnit, flux: Option<DisplayUnit>) -> String {
    if let Some(t) = &q.text {
        return format!("\"{t}\"");
    }
    if q.qty == Qty::TransitEpoch {
        let unit = q.shown_unit();
        return format!(
            "{} {unit}",
            crate::format::julian_date(unit.of(q.value), unit.of(q.below), unit.of(q.above))
        );
    }
    // A derived limit has no uncertainty to set its digits: three significant ones.
    let derived_limit = q.origin.is_computed() && q.form.is_limit();
    let show = |unit: DisplayUnit| {
        if derived_limit {
            let v = format!("{:.2e}", unit.of(q.value))
                .parse()
                .unwrap_or(f64::NAN);
            shown_in(v * unit.factor, 0.0, 0.0, q.form, unit)
        } else {
            shown_in(q.value, q.below, q.above, q.form, unit)
        }
    };
    // A limit bounded at its other end too reads as the range it is: `0.00171 to 0.00249
    // au`, not an open-ended `> 0.00171 au`.
    if let Some(o) = q.range_end.filter(|_| derived_limit) {
        let (lo, hi) = if o < q.value {
            (o, q.value)
        } else {
            (q.value, o)
        };
        // Three significant digits at both ends (0.0185 to 0.0220 au), the unit once.
        let range = |u: DisplayUnit| {
            let (lo, hi) = (
                crate::format::sig(u.of(lo), 3),
                crate::format::sig(u.of(hi), 3),
            );
            if u.symbol == "1" {
                format!("{lo} to {hi}")
            } else {
                format!("{lo} to {hi} {u}")
            }
        };
        let extra = match flux.filter(|_| q.qty == Qty::Insolation) {
            Some(flux) => format!(" ({})", range(flux)),
            None => String::new(),
        };
        return format!("{}{extra}", range(unit));
    }
    let extra = match flux.filter(|_| q.qty == Qty::Insolation) {
        Some(flux) => format!(" ({})", show(flux)),
        None => String::new(),
    };
    format!("{}{extra}", show(unit))
}

/// The flux unit (W/m^2 with an SI prefix) in which an insolation of `si` W/m^2 reads as a
/// number below 1000, so the figure in brackets needs no exponent.
fn flux_unit(si: f64) -> DisplayUnit<'static> {
    let symbol = match si.abs() {
        a if a >= 1e6 => "MW/m^2",
        a if a >= 1e3 => "kW/m^2",
        _ => "W/m^2",
    };
    DisplayUnit::parse(symbol).unwrap_or(DisplayUnit {
        symbol: "W/m^2",
        factor: 1.0,
    })
}

/// The one display unit of each quantity in one table (a file's `syz eval` text), so that
/// one column never mixes km and au: the usual unit for the median magnitude of the
/// quantity's values in the file. Mass and minimum mass share theirs.
struct TableUnits {
    units: Vec<(Qty, DisplayUnit<'static>)>,
    flux: DisplayUnit<'static>,
}

impl TableUnits {
    /// Mass and minimum mass are read side by side: one unit for both.
    fn group(qty: Qty) -> Qty {
        match qty {
            Qty::MinMass => Qty::Mass,
            q => q,
        }
    }

    fn of<'q>(results: impl Iterator<Item = &'q QuantityResult> + Clone) -> TableUnits {
        let numbers = results.filter(|q| q.text.is_none() && q.qty != Qty::TransitEpoch);
        let mut groups: Vec<Qty> = numbers.clone().map(|q| Self::group(q.qty)).collect();
        groups.sort_by_key(|q| *q as usize);
        groups.dedup();
        let median = |qty: Qty| {
            let mut v: Vec<f64> = numbers
                .clone()
                .filter(|q| Self::group(q.qty) == qty && q.value.is_finite())
                .map(|q| q.value.abs())
                .collect();
            v.sort_by(f64::total_cmp);
            v.get(v.len() / 2).copied().unwrap_or(f64::NAN)
        };
        let units = groups
            .into_iter()
            .map(|qty| (qty, crate::derive::display_unit(qty, median(qty))))
            .collect();
        TableUnits {
            units,
            flux: flux_unit(median(Qty::Insolation)),
        }
    }

    fn text(&self, q: &QuantityResult) -> String {
        let unit = self
            .units
            .iter()
            .find(|(qty, _)| *qty == Self::group(q.qty))
            .map_or_else(|| q.shown_unit(), |(_, u)| *u);
        value_text_in(q, unit, Some(self.flux))
    }
}

/// Every declaration of a quantity declared more than once, as people read it, marking the
/// one used: `4.2170 ± 0.0008 d [aster]`, `4.21762 ± 0.00012 d [brenn] (used)`. Empty for a
/// quantity declared once.
pub fn sources_text(q: &QuantityResult) -> Vec<String> {
    q.sources
        .iter()
        .map(|s| {
            let unit = s.shown_unit(q);
            let shown = if q.qty == Qty::TransitEpoch {
                format!(
                    "{} {unit}",
                    crate::format::julian_date(
                        unit.of(s.value),
                        unit.of(s.below),
                        unit.of(s.above)
                    )
                )
            } else {
                shown_in(s.value, s.below, s.above, s.form, unit)
            };
            format!(
                "{shown} {}{}{}",
                crate::text::citation_mark(s.citations.iter().map(String::as_str)),
                if s.assumed { " assumed" } else { "" },
                if s.chosen { " (used)" } else { "" }
            )
        })
        .collect()
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
        Origin::Set if q.rule.is_none() => format!("{}{cites}", crate::what_if::SET_WORDS),
        Origin::Combined => format!("combined: the weighted mean of{cites}"),
        Origin::Default => "default".to_string(),
        Origin::Estimated => format!("estimated from the spectral type{cites}"),
        _ => {
            let inputs: Vec<String> = q.inputs.iter().map(|k| a.key_name(sys, *k)).collect();
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
    let places = Places::new(db, a.file);
    let units = TableUnits::of(
        a.results
            .iter()
            .flat_map(|r| &r.bodies)
            .flat_map(|b| &b.quantities),
    );
    for (si, (sys, res)) in a.model.systems.iter().zip(&a.results).enumerate() {
        // Each body's declarations not used, in one pass over the system's.
        let unused = a.unused_in(si);
        let mut by_body: Vec<Vec<&crate::unused::Unused>> = if unused.is_empty() {
            Vec::new()
        } else {
            vec![Vec::new(); sys.bodies.len()]
        };
        for u in unused {
            if let Some(list) = u.body.and_then(|b| by_body.get_mut(b)) {
                list.push(u);
            }
        }
        out.push_str(&format!("system \"{}\"  ({})\n", sys.name, db.name(a.file)));
        // Each body's assumption lines once: a planet's list is compared with its star's.
        let lines = assumed::body_lines_of(res);
        for (bi, (b, r)) in sys.bodies.iter().zip(&res.bodies).enumerate() {
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
                        units.text(q),
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
            for q in &r.quantities {
                let sources = sources_text(q);
                if !sources.is_empty() {
                    out.push_str(&format!(
                        "    {} sources: {}\n",
                        quantities::def(q.qty).name,
                        sources.join("; ")
                    ));
                }
            }
            if let Some(c) = a.composition.get(&(si, b.id.clone())) {
                out.push_str(&format!("    composition: {}\n", c.text));
            }
            let assumed = assumed::assumed_lines(sys, &lines, bi);
            if !assumed.is_empty() {
                out.push_str("    assumed:\n");
                for s in assumed {
                    out.push_str(&format!("      - {s}\n"));
                }
            }
            let notes = assumed::grouped(r.quantities.iter().flat_map(|q| {
                q.notes
                    .iter()
                    .map(move |n| (quantities::def(q.qty).name, n.as_str()))
            }));
            for n in notes {
                out.push_str(&format!("    note: {n}\n"));
            }
            if let Some(line) = precision_line(&r.quantities, res.adaptive) {
                out.push_str(&format!("    {line}\n"));
            }
            for u in by_body.get(bi).into_iter().flatten() {
                out.push_str(&format!("    {}\n", not_used_line(u, &places)));
            }
        }
        let whole = a.unused_in(si).iter().filter(|u| u.body.is_none());
        for line in whole.map(|u| not_used_line(u, &places)) {
            out.push_str(&format!("  {line}\n"));
        }
        out.push('\n');
    }
    out
}

/// A declaration that could not be used, in one line of `eval`'s text: what was written,
/// where, and why, saying so when that finding is silenced.
fn not_used_line(u: &crate::unused::Unused, places: &Places) -> String {
    let line = places.of(u.span).1.line;
    let why = match u.rule {
        Some(rule) => format!("[{rule}] {}", u.why),
        None => u.why.clone(),
    };
    let silenced = if u.silenced {
        " (this finding is silenced, so it is not reported elsewhere)"
    } else {
        ""
    };
    format!("not used: `{}` (line {line}): {why}{silenced}", u.text)
}

/// How precisely the Monte Carlo samples fix a body's values, in one line (`None` when no
/// value of it comes from samples): the worst relative precision, and the values not
/// stable to the last digit shown. `adaptive`: the count was chosen by `--samples auto`,
/// which stopped at its most before those values were stable (it is not the way on).
pub fn precision_line(quantities: &[QuantityResult], adaptive: bool) -> Option<String> {
    let sampled: Vec<&QuantityResult> = quantities
        .iter()
        .filter(|q| q.precision.is_some())
        .collect();
    let samples = sampled
        .iter()
        .filter_map(|q| q.precision.map(|p| p.samples))
        .max()?;
    let worst = sampled
        .iter()
        .filter_map(|q| q.relative_precision())
        .fold(0.0f64, f64::max);
    let unstable: Vec<&str> = sampled
        .iter()
        .filter(|q| !q.stable())
        .map(|q| quantities::def(q.qty).name)
        .collect();
    let stable = match unstable.len() {
        0 => "each is stable to two significant digits of its uncertainty".to_string(),
        k => {
            let named = if k > 4 {
                format!(
                    "{} and {} more",
                    unstable.get(..3).unwrap_or_default().join(", "),
                    k - 3
                )
            } else {
                unstable.join(", ")
            };
            // In first-order mode only the values first order cannot describe are sampled,
            // with a fixed number of draws.
            let first_order = sampled
                .iter()
                .all(|q| crate::derive::validity::was_sampled(q));
            let how = if adaptive {
                "--samples auto stopped at the most samples it draws for this system"
            } else if first_order {
                "Monte Carlo propagation with --samples auto draws until they are"
            } else {
                "--samples auto draws until they are"
            };
            let (values, their) = if sampled.len() == 1 {
                ("value", "its")
            } else {
                ("values", "their")
            };
            format!(
                "{k} of {} {values} not yet stable to two significant digits of {their} \
                 uncertainty ({named}; {how})",
                sampled.len(),
            )
        }
    };
    Some(format!(
        "Monte Carlo precision: {samples} samples fix each median and interval end to within \
         {:.1} % of its uncertainty (twice the standard error); {stable}",
        worst * 100.0
    ))
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

/// How precisely a Monte Carlo value's samples fix it, in one sentence (`None` for a value
/// not from samples): for hover and `syz explain`.
pub fn precision_text(q: &QuantityResult) -> Option<String> {
    let p = q.precision?;
    let unit = q.shown_unit();
    let at = |x: f64| match unit.suffix() {
        "" => crate::format::sig_all(unit.of(x), 2),
        u => format!("{} {u}", crate::format::sig_all(unit.of(x), 2)),
    };
    Some(format!(
        "Monte Carlo precision ({} samples, twice the standard error): lower end ± {}, \
         median ± {}, upper end ± {}; {}",
        p.samples,
        at(p.low),
        at(p.median),
        at(p.high),
        if q.stable() {
            "stable to two significant digits of the uncertainty"
        } else {
            "not yet stable to two significant digits of the uncertainty (--samples auto)"
        }
    ))
}

#[cfg(test)]
mod tests;
