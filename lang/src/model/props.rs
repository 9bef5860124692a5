//! A body's properties lowered: each declaration's value checked against its quantity, and
//! repeats sorted into further sources of a quantity or duplicates.

use super::{resolve, value, Cites, Content, Declared};
use crate::ast;
use crate::diagnostic::{Diagnostic, Rule};
use crate::quantities::{self, Qty};
use crate::source::Span;
use rustc_hash::FxHashMap;

/// A body's declarations: the first of each quantity, and further sources of them.
pub(super) struct Props {
    pub first: Vec<Declared>,
    pub further: Vec<Declared>,
    /// See [`super::Body::refused`].
    pub refused: Vec<(Qty, Span)>,
}

/// The citation ids written on a property, sorted: what tells two sources apart.
fn cited(p: &ast::Prop) -> Vec<&str> {
    let mut ids: Vec<&str> = p.citations.iter().map(|c| c.name.as_str()).collect();
    ids.sort_unstable();
    ids.dedup();
    ids
}

/// Where a quantity was written and the references it cites.
type Written<'a> = (Span, Vec<&'a str>);

pub(super) fn lower(
    b: &ast::BodyDecl,
    bi: usize,
    citing: &Cites,
    resolver: &resolve::Resolver,
    diags: &mut Vec<Diagnostic>,
) -> Props {
    // At most one declaration per property: sized once rather than grown by doubling.
    let mut out: Vec<Declared> = Vec::with_capacity(b.props.len());
    let mut further: Vec<Declared> = Vec::new();
    let mut refused: Vec<(Qty, Span)> = Vec::new();
    // Every quantity written, even one whose value was refused, with its citations: a
    // repeat that cites nothing, or the same sources as an earlier one, is a duplicate
    // whether or not the first could be read. The first of each quantity in one flat list
    // (a body declares a few dozen quantities at most, which a scan finds soonest); further
    // sources by quantity and citations, since a curator's file may give one quantity
    // thousands of sources, which a scan per source would make quadratic.
    let mut seen: Vec<(Qty, Written)> = Vec::with_capacity(b.props.len());
    let mut later: FxHashMap<(Qty, Vec<&str>), Span> = FxHashMap::default();
    // Where each quantity is marked `preferred` first.
    let mut marked: Vec<(Qty, Span)> = Vec::new();
    for p in &b.props {
        let Some(def) = quantities::find(b.kind, &p.name.name) else {
            diags.push(value::unknown_quantity(b.kind, &p.name));
            continue;
        };
        let cites = cited(p);
        if let Some((_, first)) = seen.iter().find(|(q, _)| *q == def.qty) {
            let key = (def.qty, cites);
            let same = if first.1 == key.1 {
                Some(first.0)
            } else {
                later.get(&key).copied()
            };
            if key.1.is_empty() || same.is_some() {
                let (at, words) = match same {
                    Some(s) if !key.1.is_empty() => (s, "declared with the same citations here"),
                    _ => (first.0, "first declared here"),
                };
                diags.push(
                    Diagnostic::new(
                        Rule::Duplicate,
                        p.name.span,
                        format!("'{}' of '{}' is declared twice", def.name, b.name.name),
                    )
                    .with_label(at, words)
                    .with_help(
                        "to keep several published values of one quantity, cite each one's own source: `name = value [ref]`",
                    ),
                );
                continue;
            }
            later.insert(key, p.name.span);
        } else {
            seen.push((def.qty, (p.name.span, cites)));
        }
        let mut citations = Vec::new();
        for c in &p.citations {
            let shared = citing.shared;
            if citing.known.contains(c.name.as_str()) || shared.get(&c.name).is_some() {
                citations.push((c.name.to_string(), c.span));
            } else {
                let mut d = Diagnostic::new(
                    Rule::UnknownRef,
                    c.span,
                    if shared.is_empty() {
                        format!("no reference '{}' is declared in this file", c.name)
                    } else {
                        format!(
                            "no reference '{}' is declared in this file or in the shared references ({})",
                            c.name,
                            shared.file_names()
                        )
                    },
                );
                let ids = citing
                    .refs
                    .iter()
                    .map(|r| r.id.as_str())
                    .chain(shared.iter().map(|r| r.id.as_str()));
                d = match citing.hints.closest(&c.name, ids) {
                    Some(s) => d.with_help(format!("did you mean '{s}'?")),
                    None => d.with_help(format!(
                        "declare it at the top of the file: ref {} \"...\"",
                        c.name
                    )),
                };
                diags.push(d);
                // Still recorded: the value keeps the citation it was written with (the
                // error above says the reference is missing).
                citations.push((c.name.to_string(), c.span));
            }
        }
        let resolve =
            |e: &ast::Expr, diags: &mut Vec<Diagnostic>| resolver.declared(e, bi, def, diags);
        let Some((content, written_unit)) = value::lower_value(def, p, &resolve, diags) else {
            refused.push((def.qty, p.span));
            continue;
        };
        let timestamp = match (&p.value, &content) {
            (ast::PropValue::Text(t, _), Content::Measured(_)) => Some(t.clone()),
            _ => None,
        };
        let decl = Declared {
            qty: def.qty,
            name_span: p.name.span,
            span: p.span,
            value_span: p.value.span(),
            content,
            assumed: p.assumed.is_some(),
            preferred: p.preferred.is_some(),
            citations,
            written_unit,
            timestamp,
            set: None,
        };
        let Some(first) = out.iter().find(|d| d.qty == def.qty) else {
            if decl.preferred {
                marked.push((def.qty, decl.name_span));
            }
            out.push(decl);
            continue;
        };
        let measured = |d: &Declared| matches!(d.content, Content::Measured(_));
        if !(measured(first) && measured(&decl)) {
            diags.push(
                Diagnostic::new(
                    Rule::Duplicate,
                    p.name.span,
                    format!("'{}' of '{}' is declared twice", def.name, b.name.name),
                )
                .with_label(first.name_span, "first declared here")
                .with_note("several sources of one quantity must each be a measured value (a number, its uncertainty and unit, or a limit), not an expression or text"),
            );
            continue;
        }
        if decl.preferred {
            if let Some((_, other)) = marked.iter().find(|(q, _)| *q == def.qty) {
                diags.push(
                    Diagnostic::new(
                        Rule::Duplicate,
                        p.preferred.unwrap_or(p.name.span),
                        format!(
                            "'{}' of '{}' is marked preferred twice; the first mark is used",
                            def.name, b.name.name
                        ),
                    )
                    .with_label(*other, "marked preferred here"),
                );
                further.push(Declared {
                    preferred: false,
                    ..decl
                });
                continue;
            }
            marked.push((def.qty, decl.name_span));
        }
        further.push(decl);
    }
    // A quantity refused here but read from another declaration is not missing.
    // The first refused declaration of each quantity (at most one per quantity, so the
    // list of those kept stays short).
    let mut kept: Vec<Qty> = Vec::new();
    refused.retain(|(q, _)| {
        let keep = !out.iter().any(|d| d.qty == *q) && !kept.contains(q);
        if keep {
            kept.push(*q);
        }
        keep
    });
    Props {
        first: out,
        further,
        refused,
    }
}
