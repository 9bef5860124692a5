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
            let assumed = assumed::assumed_lines(sys, res, bi);
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
        "" => crate::format::sig(unit.of(x), 2),
        u => format!("{} {u}", crate::format::sig(unit.of(x), 2)),
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
mod tests {
    use super::*;
    use crate::source::FileId;

    const SRC: &str = "system \"S\" {\n star s { mass = 1 ± 0.05 Msun; radius = 1 ± 0.02 Rsun }\n planet b orbits s {\n  period = 3 ± 0.001 d\n  transit_depth = 1 ± 0.04 %\n }\n}\n";

    fn explain(qty: Qty) -> String {
        let a = crate::analyze(FileId(0), SRC, &crate::Settings::linear());
        explain_text(&a, 0, (1, qty)).unwrap()
    }

    #[test]
    fn the_precision_line_points_to_auto_only_where_auto_was_not_used() {
        // At 10^4 samples some values of this system are not stable to two digits.
        let a = crate::analyze(FileId(0), SRC, &crate::Settings::default());
        let q = &a.results[0].bodies[1].quantities;
        assert!(q.iter().any(|q| !q.stable()), "{q:?}");
        let fixed = precision_line(q, false).unwrap();
        assert!(
            fixed.ends_with("; --samples auto draws until they are)"),
            "{fixed}"
        );
        // After `--samples auto` reached its most, pointing to it would send the user round.
        let auto = precision_line(q, true).unwrap();
        assert!(
            auto.ends_with(
                "; --samples auto stopped at the most samples it draws for this system)"
            ),
            "{auto}"
        );
    }

    #[test]
    fn explain_lists_every_source_of_a_value() {
        let src = "ref a \"Invented A\"\nref b \"Invented B\"\nsystem \"S\" {\n star s { mass = 1 ± 0.05 Msun }\n planet b orbits s {\n  period = 3 ± 0.01 d [a]\n  period = 3.002 ± 0.001 d [b]\n }\n}\n";
        let a = crate::analyze(FileId(0), src, &crate::Settings::linear());
        let text = explain_text(&a, 0, (1, Qty::Period)).unwrap();
        assert!(
            text.contains("2 sources, in file order:\n  - 3.000 ± 0.010 d [a]\n  - 3.0020 ± 0.0010 d [b] (used)\n"),
            "{text}"
        );
    }

    #[test]
    fn a_grazing_transit_says_so_and_why_it_has_no_full_duration() {
        let src = "system \"S\" {\n star s { mass = 1.1 ± 0.04 Msun; radius = 1.2 ± 0.03 Rsun }\n planet b orbits s {\n  period = 3.9 ± 0.0002 d\n  transit_depth = 0.8 ± 0.05 %\n  impact = 1.02 ± 0.02\n }\n}\n";
        let a = crate::analyze(FileId(0), src, &crate::Settings::linear());
        let k = a.results[0].bodies[1].get(Qty::RadiusRatio).unwrap();
        assert_eq!(k.rule, Some("depth-impact-radius-ratio"));
        assert!(
            k.notes.iter().any(|n| n.starts_with("grazing transit")),
            "{:?}",
            k.notes
        );
        let why = missing_text(&a, 0, 1, Qty::TransitDurationFull);
        assert!(why.contains("the transit is grazing"), "{why}");
        assert!(!why.contains("no rule derives it"), "{why}");
    }

    #[test]
    fn a_declared_radius_ratio_on_a_grazing_orbit_predicts_the_covered_fraction() {
        // k = 0.1 at b = 0.98 covers 0.616 % of a uniform star (Mandel & Agol 2002 eq. 1,
        // evaluated with numpy), where k^2 would say 1 %.
        let src = "system \"S\" {\n star s { mass = 1 ± 0.03 Msun; radius = 1 ± 0.02 Rsun }\n planet b orbits s {\n  period = 3 ± 0.0001 d\n  radius_ratio = 0.1 ± 0.002\n  impact = 0.98 ± 0.02\n }\n}\n";
        let a = crate::analyze(FileId(0), src, &crate::Settings::linear());
        let depth = a.results[0].bodies[1].get(Qty::TransitDepth).unwrap();
        assert_eq!(depth.rule, Some("radius-ratio-impact-depth"));
        assert!((depth.value - 0.006163).abs() < 2e-5, "{}", depth.value);
        assert!(
            depth.notes.iter().any(|n| n.contains("less than k^2")),
            "{:?}",
            depth.notes
        );
        // The declared k is not said to be solved from the depth.
        let k = a.results[0].bodies[1].get(Qty::RadiusRatio).unwrap();
        assert!(
            k.notes.iter().all(|n| !n.contains("solved from the depth")),
            "{:?}",
            k.notes
        );
        // Past 1 + k: no depth at all, and no grazing note, only the geometry error.
        let none = src.replace("0.98 ± 0.02", "1.2 ± 0.02");
        let a = crate::analyze(FileId(0), &none, &crate::Settings::linear());
        assert!(a.results[0].bodies[1].get(Qty::TransitDepth).is_none());
        let k = a.results[0].bodies[1].get(Qty::RadiusRatio).unwrap();
        assert!(
            k.notes.iter().all(|n| !n.contains("grazing")),
            "{:?}",
            k.notes
        );
        assert!(a
            .diagnostics
            .iter()
            .any(|d| d.message.contains("never crosses")));
    }

    #[test]
    fn a_tsm_whose_radius_spans_a_bin_edge_says_the_metric_jumps_there() {
        // Kempton et al. 2018, Table 1 (values from memory, as in `tsm_scale_factor`): the
        // scale factor is 0.190 below 1.5 Rearth and 1.26 from there, so a radius of
        // 1.5 ± 0.05 Rearth gives a metric with two peaks.
        let src = |r: &str| {
            format!("system \"S\" {{\n star s {{ mass = 0.4 ± 0.02 Msun; radius = 0.4 ± 0.01 Rsun; teff = 3500 ± 50 K; magnitude_j = 9.5 ± 0.02 mag }}\n planet c orbits s {{\n  period = 5 ± 0.0001 d\n  radius = {r} Rearth\n  mass = 3 ± 0.5 Mearth\n }}\n}}\n")
        };
        let note = |r: &str, settings: &crate::Settings| {
            let a = crate::analyze(FileId(0), &src(r), settings);
            let tsm = a.results[0].bodies[1].get(Qty::Tsm).unwrap().clone();
            tsm.notes.into_iter().find(|n| n.contains("spans the edge"))
        };
        for settings in [crate::Settings::linear(), crate::Settings::default()] {
            let n = note("1.5 ± 0.05", &settings).expect("a note at the edge");
            assert!(
                n.contains("at 1.5 Rearth (scale factor 0.19 below, 1.26 above)"),
                "{n}"
            );
            assert!(note("2.0 ± 0.05", &settings).is_none());
        }
    }

    #[test]
    fn a_star_near_the_end_of_the_habitable_zone_fits_says_so_once() {
        // Kopparapu et al. (2014): the fits hold for Teff 2600-7200 K; 7180 ± 60 K reaches
        // past it, which first order would otherwise extrapolate without a word.
        let src = |t: &str| {
            format!("system \"S\" {{\n star s {{ mass = 1.5 ± 0.05 Msun; radius = 1.6 ± 0.05 Rsun; teff = {t} K }}\n planet b orbits s {{ period = 300 ± 1 d }}\n}}\n")
        };
        for settings in [crate::Settings::linear(), crate::Settings::default()] {
            let a = crate::analyze(FileId(0), &src("7180 ± 60"), &settings);
            let notes: Vec<&String> = a.results[0].bodies[0]
                .quantities
                .iter()
                .flat_map(|q| &q.notes)
                .filter(|n| n.contains("where the fits of Kopparapu et al. (2014) end"))
                .collect();
            assert_eq!(notes.len(), 1, "{notes:?}");
            assert!(notes[0].contains("reaches past 7200 K"), "{}", notes[0]);
            let a = crate::analyze(FileId(0), &src("6500 ± 60"), &settings);
            assert!(a.results[0].bodies[0]
                .quantities
                .iter()
                .flat_map(|q| &q.notes)
                .all(|n| !n.contains("where the fits of Kopparapu")));
        }
    }

    #[test]
    fn a_value_without_a_route_says_what_each_route_lacks() {
        // An RV-only planet: the minimum mass follows, the true mass needs the inclination.
        let src = "system \"S\" {\n star s { mass = 1 ± 0.05 Msun }\n planet b orbits s { period = 4.2 d; rv_amplitude = 55 ± 2 m/s }\n planet c { period = 9 d }\n}\n";
        let a = crate::analyze(FileId(0), src, &crate::Settings::linear());
        let why = missing_text(&a, 0, 1, Qty::Mass);
        assert!(
            why.starts_with(
                "not declared, and not derivable from what the file declares: it follows by"
            ),
            "{why}"
        );
        assert!(
            why.contains("from b.rv_amplitude, b.period, s.mass, b.eccentricity and b.inclination, of which b.inclination has no value"),
            "{why}"
        );
        // Inputs the engine has defaults for (albedo, heat redistribution) are not lacking.
        let why = missing_text(&a, 0, 1, Qty::Teq);
        assert!(
            why.contains("of which s.teff and s.radius have no value"),
            "{why}"
        );
        // A planet without a host star: the host is what its routes lack.
        let why = missing_text(&a, 0, 2, Qty::SemiMajorAxis);
        assert!(why.contains("the host star's mass"), "{why}");
        // A quantity no rule derives.
        let why = missing_text(&a, 0, 0, Qty::MagnitudeV);
        assert_eq!(why, "not declared, and no rule derives it");
    }

    #[test]
    fn a_declared_value_is_never_its_own_driver() {
        let e = explain(Qty::TransitDepth);
        assert!(!e.contains("improve b.transit_depth"), "{e}");
        assert!(e.contains("b.transit_depth is declared"), "{e}");
        // A derived value still names its largest input.
        let e = explain(Qty::RadiusRatio);
        assert!(
            e.contains("to improve this value, improve b.transit_depth first"),
            "{e}"
        );
    }

    #[test]
    fn monte_carlo_values_say_how_precise_their_samples_are() {
        let mc = crate::analyze(FileId(0), SRC, &crate::Options::default().into());
        let e = explain_text(&mc, 0, (1, Qty::RadiusRatio)).unwrap();
        let line = e
            .lines()
            .find(|l| l.starts_with("Monte Carlo precision (10000 samples"))
            .unwrap_or_else(|| panic!("{e}"));
        assert!(
            line.contains("lower end ±") && line.contains("upper end ±"),
            "{line}"
        );
        // First order: a value not from samples says nothing of the kind.
        assert!(!explain(Qty::RadiusRatio).contains("Monte Carlo precision"));
        // The text report: one line per body with sampled values.
        let text = eval_text(&mc, &crate::source::MemoryDb::new());
        assert_eq!(
            text.matches("Monte Carlo precision: 10000 samples").count(),
            2,
            "{text}"
        );
    }

    /// The unit of each `quantity` row of a text report.
    fn units_of(text: &str, quantity: &str) -> Vec<String> {
        text.lines()
            .filter(|l| l.trim_start().starts_with(&format!("{quantity} ")))
            .map(|l| {
                let value = l
                    .split("  ")
                    .map(str::trim)
                    .find(|p| !p.is_empty() && *p != quantity);
                value.unwrap().rsplit(' ').next().unwrap().to_string()
            })
            .collect()
    }

    #[test]
    fn one_unit_per_quantity_in_a_table() {
        // An Earth-mass planet close in (Hill radius about 6e4 km, mass in Earth masses on
        // its own) and a Jupiter far out (Hill radius 0.3 au, mass in Jupiter masses).
        let src = "system \"S\" {\n star s { mass = 1 ± 0.05 Msun; radius = 1 ± 0.02 Rsun; teff = 5800 ± 50 K }\n planet b orbits s { period = 3 ± 0.001 d; mass = 3 ± 0.3 Mearth }\n planet c orbits s { period = 4000 ± 10 d; mass = 1 ± 0.1 Mjup }\n planet d orbits s { period = 400 ± 10 d; min_mass = 0.5 ± 0.1 Mjup }\n}\n";
        let a = crate::analyze(FileId(0), src, &crate::Settings::linear());
        // Each value alone would be shown in its own unit...
        let alone: Vec<&str> = a.results[0]
            .bodies
            .iter()
            .filter_map(|b| b.get(Qty::HillRadius))
            .map(|q| q.shown_unit().symbol)
            .collect();
        assert_eq!(alone, ["km", "au", "au"]);
        // ...but the table has one unit per quantity, mass and minimum mass together.
        let mut db = crate::source::MemoryDb::new();
        db.add("s.syz", src);
        let text = eval_text(&a, &db);
        assert_eq!(units_of(&text, "hill_radius"), ["au", "au", "au"], "{text}");
        let masses = [units_of(&text, "mass"), units_of(&text, "min_mass")].concat();
        assert_eq!(masses, ["Msun", "Mjup", "Mjup", "Mjup"], "{text}");
    }
}
