//! `syz explain`: the derivation tree of one quantity down to the declared measurements,
//! its sources, its error budget with the input to improve first, and how precisely Monte
//! Carlo fixed it.

use super::{precision_text, provenance_text, refused_text, sources_text, value_text};
use crate::derive::QuantityResult;
use crate::Analysis;

/// The advice line under an error budget: the input to improve first. A value's own
/// measurement is never named as what drives it: a declared value gets its own sentence.
fn improve_line(a: &Analysis, si: usize, key: crate::derive::Key, q: &QuantityResult) -> String {
    let me = a.key_name(si, key);
    // A relation's intrinsic scatter is not a measurement: no observation reduces it.
    let scatter = |input: &str| input.ends_with(" scatter");
    let first = q.budget.iter().find(|(input, _)| *input != me);
    if let Some((top, _)) = first.filter(|(input, _)| scatter(input)) {
        let then = q
            .budget
            .iter()
            .find(|(input, _)| *input != me && !scatter(input))
            .map_or(String::new(), |(m, _)| {
                format!("; of the measurements, improve {m} first")
            });
        return format!(
            "  the largest part of its uncertainty is the relation's own scatter ({top}), which no measurement reduces{then}\n"
        );
    }
    match first {
        Some((top, _)) => format!("  to improve this value, improve {top} first\n"),
        None if q.origin.is_computed() => String::new(),
        None => format!(
            "  {me} is declared: its uncertainty is its own measurement's, and only a better \
             measurement of it improves it\n"
        ),
    }
}

/// The derivation tree of one quantity down to the declared measurements, then its error
/// budget: each independent input's share of the variance (first order), and how precisely
/// Monte Carlo fixed it.
pub fn explain_text(a: &Analysis, si: usize, key: crate::derive::Key) -> Option<String> {
    let res = a.results.get(si)?;
    let q = res.bodies.get(key.0)?.get(key.1)?;
    let mut out = String::new();
    for line in refused_text(a, si, key.0, key.1) {
        out.push_str(&format!("note: {line}\n\n"));
    }
    let mut seen = Vec::new();
    explain_node(a, si, key, "", "", &mut out, &mut seen);
    let sources = sources_text(q);
    if !sources.is_empty() {
        out.push_str(&format!("\n{} sources, in file order:\n", sources.len()));
        for s in sources {
            out.push_str(&format!("  - {s}\n"));
        }
    }
    if !q.budget.is_empty() {
        out.push_str("\nerror budget (share of the variance, first order):\n");
        let width = q.budget.iter().map(|b| b.0.len()).max().unwrap_or(0);
        for (input, share) in &q.budget {
            out.push_str(&format!("  {input:<width$}  {:>5.1} %\n", share * 100.0));
        }
        out.push_str(&improve_line(a, si, key, q));
    }
    if let Some(line) = precision_text(q) {
        out.push_str(&format!("\n{line}\n"));
    }
    let mut assumed = q.assumptions.clone();
    assumed.dedup();
    if !assumed.is_empty() {
        out.push_str("\nassumed:\n");
        for s in assumed {
            out.push_str(&format!("  - {s}\n"));
        }
    }
    for note in &q.notes {
        out.push_str(&format!("\nnote: {note}\n"));
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
    let label = a.key_name(si, key);
    let Some(q) = a
        .results
        .get(si)
        .and_then(|r| r.bodies.get(key.0))
        .and_then(|b| b.get(key.1))
    else {
        // An eccentric orbit's undeclared argument of periastron is an input, spread over a
        // full turn, but no reported value.
        let spread = key.1 == crate::quantities::Qty::ArgPeriastron
            && a.results.get(si).is_some_and(|r| {
                r.bodies.get(key.0).is_some_and(|b| {
                    b.quantities.iter().any(|q| {
                        q.assumptions
                            .iter()
                            .any(|s| s.as_str() == crate::derive::SPREAD_PERIASTRON)
                    })
                })
            });
        if spread {
            out.push_str(&format!(
                "{lead}{label}: not declared; {}\n",
                crate::derive::SPREAD_PERIASTRON
            ));
        } else {
            out.push_str(&format!("{lead}{label} (not available)\n"));
        }
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
