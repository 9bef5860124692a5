//! One system's bodies and values as Syzygy text, laid out as `syz fmt` lays it out.

use super::build::{string_literal, Body, SystemText};
use super::names::file_stem;
use crate::ast::BodyKind;
use crate::quantities::QuantityDef;
use std::collections::{BTreeSet, HashMap};
use std::fmt::Write;

/// The file of one system: its references, then its stars and planets in table order, each
/// quantity in the order of the quantity table. `hosts` holds each planet's host id.
pub(crate) fn system_text(
    name: &str,
    bodies: &[Body],
    hosts: &[Option<String>],
    constants: &[(BodyKind, &'static QuantityDef, String)],
    ref_texts: &HashMap<String, String>,
    table: &str,
) -> SystemText {
    let mut out = String::new();
    let _ = writeln!(
        out,
        "# Imported by `syz import` from {}.",
        table.replace(['\n', '\r'], " ")
    );
    let cited: BTreeSet<&String> = bodies
        .iter()
        .flat_map(|b| b.decls.iter().flat_map(|d| d.refs.iter()))
        .collect();
    for id in &cited {
        let text = ref_texts.get(*id).map_or("", |t| t.as_str());
        let _ = writeln!(out, "ref {id} {}", string_literal(text));
    }
    let _ = writeln!(out, "\nsystem {} {{", string_literal(name));
    let order = |kind: BodyKind| {
        bodies
            .iter()
            .zip(hosts)
            .filter(move |(b, _)| b.kind == kind)
    };
    let mut first = true;
    for (body, host) in order(BodyKind::Star).chain(order(BodyKind::Planet)) {
        if !first {
            out.push('\n');
        }
        first = false;
        if !body.id.eq_ignore_ascii_case(&body.table_name) {
            let _ = writeln!(out, "  # {} in the table", string_literal(&body.table_name));
        }
        match (body.kind, host) {
            (BodyKind::Planet, Some(h)) => {
                let _ = writeln!(out, "  planet {} orbits {h} {{", body.id);
            }
            (kind, _) => {
                let _ = writeln!(out, "  {} {} {{", kind.as_str(), body.id);
            }
        }
        let mut decls: Vec<_> = body.decls.iter().collect();
        decls.sort_by_key(|d| d.def.qty);
        for d in decls {
            let refs = if d.refs.is_empty() {
                String::new()
            } else {
                let ids: Vec<&str> = d.refs.iter().map(|s| s.as_str()).collect();
                format!(" [{}]", ids.join(", "))
            };
            let _ = writeln!(out, "    {} {} {}{refs}", d.def.name, d.op, d.text);
        }
        for (kind, def, text) in constants {
            if *kind == body.kind && !body.decls.iter().any(|d| d.def.qty == def.qty) {
                let _ = writeln!(out, "    {} = {text}", def.name);
            }
        }
        out.push_str("  }\n");
    }
    out.push_str("}\n");
    let text = crate::layout::format_source(&out).unwrap_or(out);
    SystemText {
        system: name.to_string(),
        stem: file_stem(name),
        text,
    }
}
