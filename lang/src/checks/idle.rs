//! A planet's measurements from which nothing is derived because its host star lacks an
//! input of every rule that would use them (a radial-velocity amplitude without the star's
//! mass): shown in the table as declared, they would otherwise leave the values they were
//! written for absent without a word. Only what the star lacks: partial data of a planet (a
//! radius without a mass) are common and said elsewhere, and a star declared with a mass
//! alone surprises nobody.

use crate::ast::BodyKind;
use crate::derive::rules::{predicts, RuleDef, Slot, RULES};
use crate::derive::{has_default, Derivation, Key};
use crate::diagnostic::{Diagnostic, Rule};
use crate::model::Content;
use crate::quantities::{self, Qty};

/// A note on each measured declaration of body `bi` that no derived value uses while a rule
/// that takes it lacks another input; it names the rule and what it lacks (the route that
/// lacks the fewest).
pub(super) fn idle_measurements(d: &Derivation, bi: usize, diags: &mut Vec<Diagnostic>) {
    let Some(body) = d.sys.bodies.get(bi) else {
        return;
    };
    let mut unsolved: Vec<(&RuleDef, Vec<&crate::model::Declared>)> = Vec::new();
    for decl in &body.declared {
        if matches!(decl.content, Content::Text(_))
            || d.feeds_a_route((bi, decl.qty))
            // A declaration without a value (a limit that cannot be sampled, an expression
            // with no value) is reported where it is refused.
            || d.value((bi, decl.qty)).is_none()
            || !for_deriving(decl.qty)
        {
            continue;
        }
        let Some((rule, lacking)) = waiting_route(d, bi, body.kind, decl.qty) else {
            // A rule that had every input but no solution for them: said once for the
            // rule, below.
            if let Some(rule) = d.unsolved_with((bi, decl.qty)) {
                match unsolved.iter_mut().find(|(r, _)| std::ptr::eq(*r, rule)) {
                    Some((_, decls)) => decls.push(decl),
                    None => unsolved.push((rule, vec![decl])),
                }
            }
            continue;
        };
        // A host star written with nothing in it has a note of its own, which says that
        // nothing resting on it is derived.
        let host = lacking.first().and_then(|k| d.sys.bodies.get(k.0));
        if host.is_some_and(|h| h.declared.is_empty() && h.refused.is_empty()) {
            continue;
        }
        let names: Vec<String> = lacking.iter().map(|k| d.key_name(*k)).collect();
        let listed = crate::text::and_list(&names);
        let first = names.first().cloned().unwrap_or_default();
        // Declared, but refused (a wrong unit) or unusable (a lower limit with no upper
        // end): the diagnostic there says why, and declaring it again is not the answer.
        let written = lacking.iter().any(|k| {
            d.sys
                .bodies
                .get(k.0)
                .is_some_and(|b| b.get(k.1).is_some() || b.refused.iter().any(|(q, _)| *q == k.1))
        });
        let plural = lacking.len() > 1;
        let (state, help) = if written {
            (
                if plural {
                    "are declared but could not all be used"
                } else {
                    "is declared but could not be used"
                },
                format!("see the finding on the declaration of {listed}, or declare measurements it can be derived from (`syz explain FILE {first}` lists the routes)"),
            )
        } else {
            (
                if plural { "have no value" } else { "has no value" },
                format!("declare {listed}, or measurements it can be derived from (`syz explain FILE {first}` lists the routes)"),
            )
        };
        diags.push(
            Diagnostic::new(
                Rule::NotDerivable,
                decl.span,
                format!(
                    "nothing is derived from {}: {rule} also needs {listed}, which {state}",
                    d.key_name((bi, decl.qty)),
                ),
            )
            .with_help(help),
        );
    }
    for (rule, decls) in unsolved {
        diags.push(unsolved_note(d, bi, rule, &decls));
    }
}

/// Whether a declared quantity is there to derive others from, so that nothing derived from
/// it means a missing input. A star's distance, parallax and magnitudes are also declared to
/// plan observations, where they are used without any rule, and an orbit's shape and the
/// atmosphere's parameters also serve the checks; a note on each would be noise.
fn for_deriving(q: Qty) -> bool {
    !matches!(
        q,
        Qty::Distance
            | Qty::Parallax
            | Qty::MagnitudeV
            | Qty::MagnitudeJ
            | Qty::MagnitudeH
            | Qty::MagnitudeKs
            | Qty::BolometricMagnitude
            | Qty::AbsoluteBolometricMagnitude
            | Qty::Metallicity
            | Qty::Age
            // Parameters with a default, which the physics checks read as well (an
            // eccentric orbit's apastron in the crossing-orbits check).
            | Qty::Eccentricity
            | Qty::ArgPeriastron
            | Qty::Albedo
            | Qty::Redistribution
            | Qty::MeanMolecularWeight
    )
}

/// The rule taking quantity `qty` of planet `bi` that lacks the fewest inputs, all of them
/// its host star's, with those inputs; `None` when no rule takes it, when every rule that
/// takes it has its inputs (the value went unused for another reason: a better route was
/// chosen), or lacks some of the planet's own.
fn waiting_route(
    d: &Derivation,
    bi: usize,
    kind: BodyKind,
    qty: quantities::Qty,
) -> Option<(&'static str, Vec<Key>)> {
    let has = |k: Key| d.value(k).is_some() || has_default(k.1);
    // The bodies a rule is applied to when it takes this quantity: the body itself, or for
    // a star's quantity in a planet's rule, each planet of the star.
    // Only for a star (a scan of the system's bodies, so not once per planet's measurement).
    let planets: Vec<usize> = if kind == BodyKind::Star {
        d.sys
            .bodies
            .iter()
            .enumerate()
            .filter(|(_, b)| b.orbits == Some(bi))
            .map(|(i, _)| i)
            .collect()
    } else {
        Vec::new()
    };
    let mut best: Option<(&'static str, Vec<Key>)> = None;
    for rule in RULES.iter().filter(|r| !predicts(r.id)) {
        let subjects: Vec<(usize, Option<usize>)> = match (kind, rule.output) {
            (BodyKind::Planet, Slot::Planet(_)) if rule.inputs.contains(&Slot::Planet(qty)) => {
                vec![(bi, d.sys.bodies.get(bi).and_then(|b| b.orbits))]
            }
            (BodyKind::Star, Slot::Star(_)) if rule.inputs.contains(&Slot::Star(qty)) => {
                vec![(bi, None)]
            }
            (BodyKind::Star, Slot::Planet(_)) if rule.inputs.contains(&Slot::Host(qty)) => {
                planets.iter().map(|&p| (p, Some(bi))).collect()
            }
            _ => continue,
        };
        for (subject, host) in subjects {
            let mut lacking = Vec::new();
            for slot in rule.inputs {
                let key = match *slot {
                    Slot::Planet(q) | Slot::Star(q) => Some((subject, q)),
                    Slot::Host(q) => host.map(|h| (h, q)),
                };
                match key {
                    Some(k) if has(k) => {}
                    Some(k) => lacking.push(k),
                    // A planet without a host star: the missing host is said elsewhere.
                    None => {}
                }
            }
            // Only what the host star lacks: a planet whose own data are partial (a radius
            // without a mass) is common and says so elsewhere; a star left without the mass,
            // radius or temperature its planets' rules need leaves their measurements idle.
            let host_only = lacking.iter().all(|k| Some(k.0) == host);
            if !lacking.is_empty()
                && host_only
                && best.as_ref().is_none_or(|(_, l)| lacking.len() < l.len())
            {
                best = Some((rule.id, lacking));
            }
        }
    }
    best
}

/// For a measurement of a quantity that cannot be negative whose interval reaches 0 (`K = 0 ±
/// 0.5 m/s`, a non-detection): how to declare it so that it bounds what follows from it.
fn non_detection_help(
    d: &Derivation,
    bi: usize,
    decls: &[&crate::model::Declared],
) -> Option<String> {
    decls.iter().find_map(|x| {
        let Content::Measured(m) = &x.content else {
            return None;
        };
        let def = quantities::def(x.qty);
        let from_zero = matches!(def.min, quantities::Bound::Inclusive(z) | quantities::Bound::Exclusive(z) if z == 0.0);
        if m.form.is_limit() || !from_zero || m.value < 0.0 || m.value > m.below {
            return None;
        }
        let unit = crate::derive::written_unit(x.written_unit.as_deref(), x.qty, m.value);
        let shown = crate::report::shown_in(m.value, m.below, m.above, m.form, unit);
        let bound = crate::report::shown_in(
            m.value + 2.0 * m.above,
            0.0,
            0.0,
            crate::model::Form::UpperLimit,
            unit,
        );
        Some(format!(
            "{} = {shown} is consistent with 0, no signal: declare a non-detection as an upper limit, such as `{} {bound}` (the value plus twice its uncertainty, one common convention; the bound the paper gives is better), and what follows from it is given as a limit",
            d.key_name((bi, x.qty)),
            def.name
        ))
    })
}

/// The note on measurements left unused by a rule that had every input but no solution for
/// them (the formula's domain excludes the values: T14, T23 and the depth that admit no
/// impact parameter), with a unit slip of one of its inputs that would give one.
fn unsolved_note(
    d: &Derivation,
    bi: usize,
    rule: &RuleDef,
    decls: &[&crate::model::Declared],
) -> Diagnostic {
    let names: Vec<String> = decls.iter().map(|x| d.key_name((bi, x.qty))).collect();
    let listed = crate::text::and_list(&names);
    let first = names.first().cloned().unwrap_or_default();
    let slips = d.solving_readings(bi, rule);
    let help = crate::derive::readings_help(&slips)
        .or_else(|| non_detection_help(d, bi, decls))
        .unwrap_or_else(|| {
        format!(
            "check {listed} and their units against the other inputs of {}; `syz explain FILE {first}` lists the routes",
            rule.id
        )
    });
    let mut diag = Diagnostic::new(
        Rule::NotDerivable,
        decls.first().map(|x| x.span).unwrap_or_default(),
        format!(
            "nothing is derived from {listed}: {} has no solution for the values as given (at their nominal values)",
            rule.id
        ),
    )
    .with_help(help)
    .with_note(format!("{}: {}", rule.id, rule.formula));
    for x in decls.iter().skip(1) {
        diag = diag.with_label(x.span, format!("{} is not used", d.key_name((bi, x.qty))));
    }
    diag
}
