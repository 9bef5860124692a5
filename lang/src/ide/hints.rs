//! Inlay hints: the key derived values of each body after its opening brace, beside a
//! declared value the value the engine derives for it from other measurements, beside
//! each declaration of a quantity declared several times that is not used, why not, and
//! beside a declaration refused by a silenced rule, that it is not used.

use super::{open_brace_after, result, shown, Method};
use crate::derive::{Choice, QuantityResult, SourceResult};
use crate::model::Form;
use crate::quantities::Qty;
use crate::source::LineIndex;
use crate::Analysis;

/// One hint: where it goes (a byte offset) and its text.
#[derive(Debug, Clone, PartialEq)]
pub struct Hint {
    pub offset: usize,
    pub label: String,
    /// Tooltip text.
    pub detail: String,
}

const PLANET_KEYS: &[(Qty, &str)] = &[
    (Qty::SemiMajorAxis, "a"),
    (Qty::Mass, "M"),
    (Qty::MinMass, "M sin i"),
    (Qty::Radius, "R"),
    (Qty::Density, "ρ"),
    (Qty::Teq, "Teq"),
    (Qty::PredictedMass, "M predicted"),
    (Qty::Tsm, "TSM"),
    (Qty::Esm, "ESM"),
];

const STAR_KEYS: &[(Qty, &str)] = &[
    (Qty::Luminosity, "L"),
    (Qty::LogG, "log g"),
    (Qty::StarDensity, "ρ"),
    (Qty::HabitableInner, "HZ inner"),
    (Qty::HabitableOuter, "HZ outer"),
];

/// All hints whose offset lies in `range` (byte offsets). Every tooltip ends with `method`'s
/// line, and each body's label with its tag when there is one.
pub fn hints(a: &Analysis, src: &str, range: std::ops::Range<usize>, method: &Method) -> Vec<Hint> {
    let tooltip = |words: String| {
        let words = match method.estimate_note() {
            Some(note) => format!("{words}\n{note}"),
            None => words,
        };
        if method.line.is_empty() {
            words
        } else {
            format!("{words}\nuncertainties: {}", method.line)
        }
    };
    let tagged = |mut label: String| {
        if let Some(tag) = &method.tag {
            label.push_str(&format!(" ({tag})"));
        }
        label
    };
    let mut out = Vec::new();
    for (si, sys) in a.model.systems.iter().enumerate() {
        if (sys.span.end as usize) < range.start || (sys.span.start as usize) > range.end {
            continue;
        }
        for (bi, b) in sys.bodies.iter().enumerate() {
            let keys = match b.kind {
                crate::ast::BodyKind::Planet => PLANET_KEYS,
                crate::ast::BodyKind::Star => STAR_KEYS,
            };
            let mut parts = Vec::new();
            let mut first_order = false;
            for (qty, label) in keys {
                // A true mass makes the minimum mass redundant.
                if *qty == Qty::MinMass && result(a, si, bi, Qty::Mass).is_some() {
                    continue;
                }
                if let Some(q) = result(a, si, bi, *qty) {
                    if q.origin.is_computed() && q.value.is_finite() {
                        // A value first order cannot describe was sampled as `syz eval`
                        // samples; it says so itself.
                        let sampled = crate::derive::validity::was_sampled(q);
                        first_order |= !sampled;
                        // As `syz eval` shows it (a derived limit in three digits, or the
                        // range it lies in), and `M sin i < 7.96 Mearth`, not `= < ...`.
                        let value = crate::report::value_text(q);
                        let sep = if value.starts_with(['<', '>']) {
                            " "
                        } else {
                            " = "
                        };
                        parts.push(format!(
                            "{label}{sep}{value}{}",
                            if sampled { " (sampled)" } else { "" }
                        ));
                    }
                }
            }
            if !parts.is_empty() {
                if let Some(brace) = open_brace_after(src, b.name_span.end as usize) {
                    let offset = brace + 1;
                    if range.contains(&offset) || offset == range.end {
                        let joined = parts.join(" · ");
                        out.push(Hint {
                            offset,
                            label: if first_order { tagged(joined) } else { joined },
                            detail: tooltip(format!(
                                "derived for {} (hover a name for the full table)",
                                b.id
                            )),
                        });
                    }
                }
            }
            for d in &b.declared {
                let offset = d.span.end as usize;
                if !(range.contains(&offset) || offset == range.end) {
                    continue;
                }
                let Some(alt) = a.results.get(si).and_then(|r| r.alternative((bi, d.qty))) else {
                    continue;
                };
                out.push(Hint {
                    offset,
                    label: tagged(format!(
                        "derived {}",
                        shown(d.qty, alt.value, alt.below, alt.above, Form::Asymmetric)
                    )),
                    detail: tooltip(format!(
                        "by {} from other measurements of the system",
                        alt.rule
                    )),
                });
            }
        }
    }
    out.extend(unused_sources(a, src, range.clone()));
    out.extend(silenced_refusals(a, range));
    out.sort_by_key(|h| h.offset);
    out
}

/// "not used (silenced)" after each declaration refused by a rule whose finding is silenced:
/// with no diagnostic, the editor would otherwise show the value as if it were used.
fn silenced_refusals(a: &Analysis, range: std::ops::Range<usize>) -> Vec<Hint> {
    a.unused
        .iter()
        .filter(|u| u.silenced)
        .filter_map(|u| {
            let offset = u.span.end as usize;
            (range.contains(&offset) || offset == range.end).then(|| Hint {
                offset,
                label: format!("not used: [{}] (silenced)", u.rule.unwrap_or("?")),
                detail: format!(
                    "{}\nthis declaration is refused; its finding is silenced, so no diagnostic shows it",
                    u.why
                ),
            })
        })
        .collect()
}

/// "not used: ..." after each declaration of a quantity declared several times whose value
/// is not the one used, with the sentence of the choice as tooltip.
fn unused_sources(a: &Analysis, src: &str, range: std::ops::Range<usize>) -> Vec<Hint> {
    let lines = std::cell::OnceCell::new();
    let line = |offset: u32| {
        lines
            .get_or_init(|| LineIndex::new(src))
            .line_at(offset as usize)
            + 1
    };
    let mut out = Vec::new();
    for (si, sys) in a.model.systems.iter().enumerate() {
        if (sys.span.end as usize) < range.start || (sys.span.start as usize) > range.end {
            continue;
        }
        let Some(r) = a.results.get(si) else {
            continue;
        };
        for (bi, body) in r.bodies.iter().enumerate() {
            for q in body.quantities.iter().filter(|q| q.sources.len() > 1) {
                let used = q.sources.iter().find(|s| s.chosen);
                for s in q.sources.iter().filter(|s| !s.chosen) {
                    let offset = s.span.in_file(sys.span).end as usize;
                    if !(range.contains(&offset) || offset == range.end) {
                        continue;
                    }
                    let Some(why) = why_not_used(
                        q,
                        s,
                        used.map(|u| (u, line(u.span.in_file(sys.span).start))),
                    ) else {
                        continue;
                    };
                    let name = a.key_name(si, (bi, q.qty));
                    let sentence = q
                        .assumptions
                        .iter()
                        .find(|x| x.starts_with(&format!("{name}: ")))
                        .cloned()
                        .unwrap_or_default();
                    out.push(Hint {
                        offset,
                        label: format!("not used: {why}"),
                        detail: format!(
                            "{sentence}\nthe code action \"Use this source\" marks this one `preferred`"
                        ),
                    });
                }
            }
        }
    }
    out
}

/// Why source `s` of `q` is not the value used, given the one used and its line; `None`
/// when it is used (all measurements of a weighted mean are).
fn why_not_used(
    q: &QuantityResult,
    s: &SourceResult,
    used: Option<(&SourceResult, usize)>,
) -> Option<String> {
    let that =
        |(u, line): (&SourceResult, usize)| format!("[{}] (line {line})", u.citations.join(", "));
    let limit = s.form.is_limit();
    Some(match (q.choice?, used) {
        (Choice::WeightedMean, _) if limit => "limits are not averaged".to_string(),
        (Choice::WeightedMean, _) | (_, None) => return None,
        (Choice::Marked, Some(u)) => format!("{} is marked preferred", that(u)),
        (_, Some(u)) if limit && !u.0.form.is_limit() => {
            format!("{} is a measurement, this a limit", that(u))
        }
        (_, Some(u)) if limit => format!("{} is more constraining", that(u)),
        (Choice::Last, Some(u)) => format!("{} is the last measurement listed", that(u)),
        (Choice::MostPrecise, Some(u)) => format!("{} is more precise", that(u)),
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::source::FileId;

    #[test]
    fn body_hints_show_derived_values() {
        let src = include_str!("../../../examples/veyra.syz");
        let a = crate::analyze(FileId(0), src, &crate::Settings::linear());
        let h = hints(&a, src, 0..src.len(), &Method::default());
        let b = src.find("planet b orbits veyra {").unwrap() + "planet b orbits veyra {".len();
        let hb = h.iter().find(|x| x.offset == b).unwrap();
        assert!(hb.label.starts_with("a = 0.04"), "{}", hb.label);
        assert!(
            hb.label.contains("ρ = ") && hb.label.contains("g/cm^3"),
            "{}",
            hb.label
        );
        let star = src.find("star veyra {").unwrap() + "star veyra {".len();
        assert!(h
            .iter()
            .any(|x| x.offset == star && x.label.contains("log g = ")));
        assert!(hints(&a, src, 0..10, &Method::default()).is_empty());
        // The method of propagation is in every tooltip, and its tag in the body labels.
        let m = crate::settings::EditorSettings::new(None).method();
        let tagged = hints(&a, src, 0..src.len(), &m);
        assert_eq!(tagged.len(), h.len());
        assert!(tagged.iter().all(|x| x.detail.ends_with(&m.line)));
        let tb = tagged.iter().find(|x| x.offset == b).unwrap();
        assert_eq!(tb.label, format!("{} (first-order)", hb.label));
    }

    #[test]
    fn a_declaration_refused_by_a_silenced_rule_says_it_is_not_used() {
        let src = "system \"S\" {\n  star s {\n    mass = 1 ± 0.05 Msun\n    radius = -2 Rsun # allow(out-of-range): checking\n  }\n}\n";
        let a = crate::analyze(FileId(0), src, &crate::Settings::linear());
        assert!(a.diagnostics.is_empty(), "{:?}", a.diagnostics);
        let h = hints(&a, src, 0..src.len(), &Method::default());
        let end = src.find("-2 Rsun").unwrap() + "-2 Rsun".len();
        let x = h
            .iter()
            .find(|x| x.offset == end)
            .expect("hint after radius");
        assert_eq!(x.label, "not used: [out-of-range] (silenced)");
        assert!(x.detail.contains("greater than 0"), "{}", x.detail);
    }

    #[test]
    fn declared_value_that_can_be_derived_gets_a_hint() {
        let src = "system \"S\" {\n  star s { mass = 1.0 ± 0.05 Msun; radius = 1.0 ± 0.02 Rsun\n    log_g = 4.44 ± 0.05 }\n}\n";
        let a = crate::analyze(FileId(0), src, &crate::Settings::linear());
        let h = hints(&a, src, 0..src.len(), &Method::default());
        let end = src.find("4.44 ± 0.05").unwrap() + "4.44 ± 0.05".len();
        let x = h
            .iter()
            .find(|x| x.offset == end)
            .expect("hint after log_g");
        assert!(x.label.starts_with("derived 4.4"), "{}", x.label);
    }

    #[test]
    fn each_unused_source_says_why_and_names_the_one_used() {
        let src = "ref disc \"Invented A\"\nref followup \"Invented B\"\nsystem \"S\" {\n  star s { mass = 1 ± 0.05 Msun }\n  planet b orbits s {\n    period = 10.000 ± 0.001 d [disc]\n    period = 10.0021 ± 0.0002 d [followup]\n    period < 11 d [disc, followup]\n  }\n}\n";
        let unused = |src: &str, settings: &crate::Settings| -> Vec<(usize, String)> {
            let a = crate::analyze(FileId(0), src, settings);
            hints(&a, src, 0..src.len(), &Method::default())
                .into_iter()
                .filter(|h| h.label.starts_with("not used"))
                .map(|h| (h.offset, h.label))
                .collect()
        };
        let end = |needle: &str| src.find(needle).unwrap() + needle.len();
        assert_eq!(
            unused(src, &crate::Settings::linear()),
            [
                (
                    end("[disc]"),
                    "not used: [followup] (line 7) is more precise".to_string()
                ),
                (
                    end("[disc, followup]"),
                    "not used: [followup] (line 7) is a measurement, this a limit".to_string()
                )
            ]
        );
        let marked = src.replace("[disc]\n", "[disc] preferred\n");
        let h = unused(&marked, &crate::Settings::linear());
        assert_eq!(h.len(), 2, "{h:?}");
        assert_eq!(h[0].1, "not used: [disc] (line 6) is marked preferred");
        // A weighted mean uses every measurement: only the limit is left out.
        let mut mean = crate::Settings::linear();
        mean.options.source_choice = crate::derive::SourceChoice::WeightedMean;
        assert_eq!(
            unused(src, &mean),
            [(
                end("[disc, followup]"),
                "not used: limits are not averaged".to_string()
            )]
        );
        // The tooltip is the sentence of the choice.
        let a = crate::analyze(FileId(0), src, &crate::Settings::linear());
        let h = hints(&a, src, 0..src.len(), &Method::default());
        let first = h.iter().find(|h| h.offset == end("[disc]")).unwrap();
        assert!(
            first
                .detail
                .starts_with("b.period: 3 sources; chosen: the most precise"),
            "{}",
            first.detail
        );
    }
}
