//! Why a value has no value, or not the one declared: a quantity neither declared nor
//! derivable (with the routes that would derive it), or declarations the analysis could not
//! use (with the diagnostics, or the silenced findings, that say why).

use crate::ast::BodyKind;
use crate::quantities::{self, Qty};
use crate::Analysis;

/// The property of body `bi` of system `si` that declares `qty`, as written.
fn declaration(a: &Analysis, si: usize, bi: usize, qty: Qty) -> Option<&crate::ast::Prop> {
    let sys = a.model.systems.get(si)?;
    let body = sys.bodies.get(bi)?;
    a.ast
        .systems
        .iter()
        .filter(|s| s.name_span == sys.name_span)
        .flat_map(|s| &s.bodies)
        .find(|b| b.span == body.span)?
        .props
        .iter()
        .find(|p| quantities::find(body.kind, &p.name.name).is_some_and(|d| d.qty == qty))
}

/// Whether the file declares `qty` on body `bi` of system `si`, readable or not.
pub fn written_in_file(a: &Analysis, si: usize, bi: usize, qty: Qty) -> bool {
    declaration(a, si, bi, qty).is_some()
}

/// Why a quantity has no value, in a sentence: not declared and not derivable, or declared
/// in a way that could not be used, with what the diagnostics on the declaration say.
pub fn missing_text(a: &Analysis, si: usize, bi: usize, qty: Qty) -> String {
    use crate::ast::{ExprKind, PropValue, Relation};
    let Some(p) = declaration(a, si, bi, qty) else {
        return match routes_missing(a, si, bi, qty) {
            Some(routes) => {
                format!("not declared, and not derivable from what the file declares: {routes}")
            }
            None => "not declared, and no rule derives it".to_string(),
        };
    };
    let mut why: Vec<String> = a
        .diagnostics
        .iter()
        .filter(|d| {
            d.span.file == p.span.file && d.span.start >= p.span.start && d.span.end <= p.span.end
        })
        .map(|d| match d.notes.first() {
            Some(n) => format!("{}: {n}", d.message),
            None => d.message.clone(),
        })
        .collect();
    if why.is_empty() {
        // Its finding silenced: still say why.
        why.extend(
            a.unused
                .iter()
                .filter(|u| u.span == p.span)
                .map(|u| format!("{}; this finding is silenced", u.why)),
        );
    }
    let limit = match p.relation {
        Relation::Below => Some(("an upper limit", "<")),
        Relation::Above => Some(("a lower limit", ">")),
        Relation::Equal => None,
    };
    let what = match (&p.value, limit) {
        (PropValue::Expr(e), Some((kind, sign))) => match &e.kind {
            ExprKind::Literal(l) => {
                let unit = l.unit.as_ref().map(crate::units::unit_text);
                format!(
                    "declared as {kind} (`{sign} {}{}`), a limit not used for derivation",
                    crate::format::number(l.value),
                    unit.map_or_else(String::new, |u| format!(" {u}"))
                )
            }
            _ => format!("declared as {kind}, a limit not used for derivation"),
        },
        (PropValue::Expr(e), None)
            if !matches!(e.kind, ExprKind::Literal(_))
                && !matches!(&e.kind, ExprKind::Neg(x) if matches!(x.kind, ExprKind::Literal(_))) =>
        {
            "declared by an expression that could not be evaluated".to_string()
        }
        _ => "declared, but the value could not be used".to_string(),
    };
    if why.is_empty() {
        what
    } else {
        format!("{what} ({})", why.join("; "))
    }
}

/// The routes that derive `qty` of body `bi`, each with the inputs it still lacks, fewest
/// lacking first (at most three): what a user could declare to get the value. `None` when no
/// rule derives the quantity for this kind of body.
fn routes_missing(a: &Analysis, si: usize, bi: usize, qty: Qty) -> Option<String> {
    use crate::derive::rules::{predicts, Slot, RULES};
    let sys = a.model.systems.get(si)?;
    let body = sys.bodies.get(bi)?;
    let result = |b: usize, q: Qty| a.results.get(si)?.bodies.get(b)?.get(q);
    // A declared lower limit the derivations cannot use is no value either.
    let has = |b: usize, q: Qty| result(b, q).is_some_and(|r| !r.unused());
    let mut routes: Vec<(usize, u8, String)> = Vec::new();
    // Rules with every input that still gave no value (outside their formula's domain).
    let mut failed: Vec<String> = Vec::new();
    for rule in RULES.iter().filter(|r| !predicts(r.id)) {
        let output = match (rule.output, body.kind) {
            (Slot::Planet(q), BodyKind::Planet) | (Slot::Star(q), BodyKind::Star) => q,
            _ => continue,
        };
        if output != qty {
            continue;
        }
        // Each input's body: this one, or for a planet's rule its host star (a planet without
        // a host star cannot use the rule at all: the host is what it lacks).
        let mut inputs = Vec::new();
        let mut lacking = Vec::new();
        for slot in rule.inputs {
            let (b, q) = match *slot {
                Slot::Planet(q) | Slot::Star(q) => (Some(bi), q),
                Slot::Host(q) => (body.orbits, q),
            };
            let name = match b {
                Some(b) => a.key_name(si, (b, q)),
                None => format!("the host star's {}", quantities::def(q).name),
            };
            if !b.is_some_and(|b| has(b, q) || crate::derive::has_default(q)) {
                let unusable = b.and_then(|b| result(b, q)).is_some_and(|r| r.unused());
                lacking.push(if unusable {
                    format!("{name} (a lower limit, which cannot be used)")
                } else {
                    name.clone()
                });
            }
            inputs.push(name);
        }
        if lacking.is_empty() {
            failed.push(rule.id.to_string());
            continue;
        }
        let text = format!(
            "{} from {}, of which {} {} no value",
            rule.id,
            crate::text::and_list(&inputs),
            crate::text::and_list(&lacking),
            if lacking.len() == 1 { "has" } else { "have" }
        );
        routes.push((lacking.len(), rule.tier, text));
    }
    // The rules that had every input come first: what to look at is their inputs' values.
    let failed_text = (!failed.is_empty()).then(|| {
        let value = |q: Qty| result(bi, q).map(|r| r.value);
        let grazing = matches!(
            (value(Qty::RadiusRatio), value(Qty::Impact)),
            (Some(k), Some(b)) if crate::physics::formulas::is_grazing(k, b)
        );
        let why = if qty == Qty::TransitDurationFull && grazing {
            ": the transit is grazing (b > 1 - k), so there is no second and third contact"
        } else {
            " (outside the formula's domain)"
        };
        let (has, gives) = if failed.len() == 1 {
            ("has", "gives")
        } else {
            ("have", "give")
        };
        format!(
            "{} {has} every input but {gives} no value at these inputs{why}",
            crate::text::and_list(&failed)
        )
    });
    if routes.is_empty() {
        return failed_text;
    }
    routes.sort_by(|x, y| (x.0, x.1).cmp(&(y.0, y.1)).then_with(|| x.2.cmp(&y.2)));
    let shown: Vec<String> = routes.into_iter().take(3).map(|r| r.2).collect();
    let follows = format!(
        "{} {}",
        if shown.len() == 1 {
            "it follows by"
        } else {
            "it follows by any of"
        },
        shown.join("; ")
    );
    Some(match failed_text {
        Some(f) => format!("{f}; otherwise {follows}"),
        None => follows,
    })
}

/// The declarations of `qty` of body `bi` that could not be used, one sentence each (empty
/// when none): shown wherever the value in use (a default, another source) stands in for them.
pub fn refused_text(a: &Analysis, si: usize, bi: usize, qty: Qty) -> Vec<String> {
    let Some(kind) = a
        .model
        .systems
        .get(si)
        .and_then(|s| s.bodies.get(bi))
        .map(|b| b.kind)
    else {
        return Vec::new();
    };
    a.unused_in(si)
        .iter()
        .filter(|u| u.body == Some(bi))
        .filter(|u| {
            u.quantity
                .as_deref()
                .and_then(|n| quantities::find(kind, n))
                .is_some_and(|d| d.qty == qty)
        })
        .map(|u| {
            let rule = u.rule.map(|r| format!("[{r}] ")).unwrap_or_default();
            let silenced = if u.silenced {
                "; this finding is silenced"
            } else {
                ""
            };
            format!(
                "`{}` is declared but not used: {rule}{}{silenced}",
                u.text, u.why
            )
        })
        .collect()
}
