//! Hover text (Markdown) for what is at an offset: a quantity, a body, a unit, a reference or
//! a binding.

use super::symbols::{self, Occurrence, Symbol};
use super::{result, shown, Method};
use crate::derive::{display_unit, Origin, QuantityResult};
use crate::model::Form;
use crate::quantities::{self, Qty};
use crate::source::Span;
use crate::Analysis;

/// Hover text and the span it describes. Hovers that show derived numbers end with
/// `method`'s line.
pub fn hover(
    a: &Analysis,
    occ: &[Occurrence],
    offset: usize,
    method: &Method,
) -> Option<(String, Span)> {
    let o = symbols::at(occ, offset)?;
    // Only a hover that shows numbers says how they were propagated.
    let with_method = |mut text: String, numbers: bool| {
        if numbers && !method.line.is_empty() {
            text.push_str(&format!("\n\n---\nuncertainties: {}\n", method.line));
        }
        text
    };
    let body_of = |si: usize, name: &str| {
        let bi = a.model.systems.get(si)?.body(name)?;
        a.results.get(si)?.bodies.get(bi)
    };
    let text = match &o.symbol {
        Symbol::Quantity { system, body, qty } => with_method(
            quantity(a, *system, body, *qty, method)?,
            body_of(*system, body)
                .is_some_and(|r| r.get(*qty).is_some_and(|q| has_number(q) && !q.unused())),
        ),
        Symbol::Body { system, name } => with_method(
            body_table(a, *system, name, method)?,
            body_of(*system, name).is_some_and(|r| r.quantities.iter().any(has_number)),
        ),
        Symbol::Unit(sym) => unit(sym),
        Symbol::Ref(id) => match a.model.reference(id) {
            Some(r) => match &r.shared {
                Some(at) => format!(
                    "**reference `{id}`** (shared, declared in {})\n\n{}",
                    at.place(),
                    r.text
                ),
                None => format!("**reference `{id}`**\n\n{}", r.text),
            },
            None => format!("**reference `{id}`** is not declared in this file"),
        },
        Symbol::Let { system, body, name } => binding(a, *system, body.as_deref(), name)?,
        Symbol::Builtin(name) => builtin(name),
    };
    Some((text, o.span))
}

/// Whether a result's uncertainty was propagated from others (a derived value or a declared
/// expression), so that it depends on the method of propagation.
/// Whether a result's interval comes from first-order propagation (derived, and not one of
/// the values first order cannot describe, which are sampled as `syz eval` would).
fn propagated(q: &QuantityResult) -> bool {
    has_number(q)
        && (q.origin == Origin::Derived || q.rule.is_some())
        && !crate::derive::validity::was_sampled(q)
}

/// Whether a result is a number (not a text such as a spectral type).
fn has_number(q: &QuantityResult) -> bool {
    q.text.is_none()
}

fn builtin(name: &str) -> String {
    match crate::model::constant(name) {
        Some((v, dim, what)) => format!(
            "**constant `{name}`** — {what}\n\n`{}` {}",
            crate::format::number(v),
            dim.si_unit()
        ),
        None => format!("**function `{name}`** (one argument)"),
    }
}

fn binding(a: &Analysis, si: usize, body: Option<&str>, name: &str) -> Option<String> {
    let sys = a.model.systems.get(si)?;
    let lets = match body {
        Some(b) => &sys.bodies.get(sys.body(b)?)?.lets,
        None => &sys.lets,
    };
    let l = lets.iter().find(|l| l.name == name)?;
    let dim = l.dim.map_or_else(
        || "unknown (see the diagnostics)".to_string(),
        |d| d.describe(),
    );
    let scope = body.map_or_else(
        || format!("system \"{}\"", sys.name),
        |b| format!("body `{b}`"),
    );
    Some(format!("**`let {name}`** in {scope}\n\ndimension: {dim}"))
}

/// The value in other common units of its dimension.
fn other_units(q: &QuantityResult) -> Vec<String> {
    let def = quantities::def(q.qty);
    let main = display_unit(q.qty, q.value);
    let mut out = Vec::new();
    // A plain number (an eccentricity, an impact parameter) is not a fraction: only a
    // quantity shown in %, ppt or ppm is offered in the others.
    if def.dim.is_none() && main.symbol == "1" {
        return out;
    }
    for (sym, name) in crate::units::units_for(def.dim) {
        // Logarithms are not scale factors: a fraction is never offered in them.
        if sym == main.symbol
            || name.starts_with("Julian date")
            || !crate::units::takes_unit(def.display, &sym)
        {
            continue;
        }
        let Some(unit) = crate::derive::DisplayUnit::parse(&sym) else {
            continue;
        };
        // Only units in which the value reads without an exponent: a star's mass in Earth
        // masses (3.1e5) says nothing the main unit does not.
        if !(1e-3..1e4).contains(&unit.of(q.value).abs()) {
            continue;
        }
        out.push(crate::report::value_text_in_unit(q, unit));
        if out.len() == 5 {
            break;
        }
    }
    if !def.dim.is_none()
        && main.symbol != def.dim.si_unit()
        && !out
            .iter()
            .any(|s| s.ends_with(&format!(" {}", def.dim.si_unit())))
    {
        let si = def.dim.si_unit();
        let unit = crate::derive::DisplayUnit {
            symbol: &si,
            factor: 1.0,
        };
        out.push(crate::report::value_text_in_unit(q, unit));
    }
    out
}

/// The hover of one quantity of one body; its numbers say when `syz eval` would propagate
/// otherwise than `method`.
pub fn quantity(a: &Analysis, si: usize, body: &str, qty: Qty, method: &Method) -> Option<String> {
    let sys = a.model.systems.get(si)?;
    let bi = sys.body(body)?;
    let def = quantities::def(qty);
    let mut out = format!("**{body}.{}** — {}\n\n", def.name, def.doc);
    let Some(q) = result(a, si, bi, qty) else {
        out.push_str(&format!(
            "dimension: {}\n\n{}",
            def.dim.describe(),
            crate::report::missing_text(a, si, bi, qty)
        ));
        return Some(out);
    };
    out.push_str(&format!(
        "`{}` ({})\n\n",
        crate::report::value_text(q),
        q.origin.as_str()
    ));
    for line in crate::report::refused_text(a, si, bi, qty) {
        out.push_str(&format!("**not used:** {line}\n\n"));
    }
    let alternative = a.results.get(si).and_then(|r| r.alternative((bi, qty)));
    if propagated(q) || alternative.is_some() {
        if let Some(note) = method.estimate_note() {
            out.push_str(&format!("*{note}*\n\n"));
        }
    }
    out.push_str(&format!("- dimension: {}\n", def.dim.describe()));
    if q.text.is_none() && q.value.is_finite() {
        let others = other_units(q);
        if !others.is_empty() {
            out.push_str(&format!("- also: {}\n", others.join(" · ")));
        }
    }
    out.push_str(&format!(
        "- origin: {}\n",
        crate::report::provenance_text(a, si, q)
    ));
    if let Some(f) = q.formula {
        out.push_str(&format!("- formula: `{f}`\n"));
    }
    let sources = crate::report::sources_text(q);
    if !sources.is_empty() {
        out.push_str(&format!("- {} sources:\n", sources.len()));
        for s in sources {
            out.push_str(&format!("  - `{s}`\n"));
        }
    }
    if let Some(alt) = alternative {
        let inputs: Vec<String> = alt.inputs.iter().map(|k| a.key_name(si, *k)).collect();
        out.push_str(&format!(
            "- derived from other measurements: `{}` by {} from {}\n",
            shown(qty, alt.value, alt.below, alt.above, Form::Asymmetric),
            alt.rule,
            inputs.join(", ")
        ));
    }
    for c in &q.citations {
        if let Some(r) = a.model.reference(c) {
            out.push_str(&format!("- [{c}] {}\n", r.text));
        }
    }
    if q.origin.is_computed() && !q.budget.is_empty() {
        out.push_str("\nerror budget (share of the variance):\n");
        for (input, share) in &q.budget {
            out.push_str(&format!("- {input}: {:.1} %\n", share * 100.0));
        }
    }
    if let Some(line) = crate::report::precision_text(q) {
        out.push_str(&format!("\n{line}\n"));
    }
    if !q.assumptions.is_empty() {
        out.push_str("\nassumed:\n");
        for s in &q.assumptions {
            out.push_str(&format!("- {s}\n"));
        }
    }
    for n in &q.notes {
        out.push_str(&format!("\nnote: {n}\n"));
    }
    Some(out)
}

/// The hover of a body: all its quantities in a table, under a line saying when `syz eval`
/// would propagate otherwise than `method`.
pub fn body_table(a: &Analysis, si: usize, name: &str, method: &Method) -> Option<String> {
    let sys = a.model.systems.get(si)?;
    let Some(bi) = sys.body(name) else {
        if sys.not_read.iter().any(|(n, _)| n == name) {
            return Some(crate::model::limits::not_read(&sys.name, name));
        }
        return Some(format!("no body `{name}` in system \"{}\"", sys.name));
    };
    let b = sys.bodies.get(bi)?;
    let host = b
        .orbits
        .and_then(|h| sys.bodies.get(h))
        .map(|h| format!(" orbiting `{}`", h.id))
        .unwrap_or_default();
    let mut out = format!(
        "**{} `{}`**{host} in system \"{}\"\n\n| quantity | value | origin |\n|---|---|---|\n",
        b.kind.as_str(),
        b.id,
        sys.name
    );
    if let Some(r) = a.results.get(si).and_then(|r| r.bodies.get(bi)) {
        if let Some(note) = method
            .estimate_note()
            .filter(|_| r.quantities.iter().any(propagated))
        {
            out = out.replacen("\n\n| quantity", &format!("\n\n*{note}*\n\n| quantity"), 1);
        }
        for q in &r.quantities {
            out.push_str(&format!(
                "| {} | {} | {} |\n",
                quantities::def(q.qty).name,
                crate::report::value_text(q).replace('|', "\\|"),
                q.origin.as_str()
            ));
        }
    }
    if let Some(c) = a.composition.get(&(si, b.id.clone())) {
        out.push_str(&format!("\ncomposition: {}\n", c.text));
    }
    Some(out)
}

/// The hover of a unit symbol: its name, value in SI and source.
pub fn unit(sym: &str) -> String {
    let Some((factor, def)) = crate::units::lookup(sym) else {
        return format!(
            "unknown unit `{sym}`{}",
            crate::units::suggest(sym)
                .map_or_else(String::new, |s| format!(" (did you mean `{s}`?)"))
        );
    };
    let prefixed = if def.symbol == sym || def.aliases.contains(&sym) {
        String::new()
    } else {
        format!(" (an SI prefix on `{}`)", def.symbol)
    };
    let value = crate::format::number(factor);
    // A dimensionless unit's SI unit is the number 1: `1 ppm = 1e-6 1` would read oddly.
    let definition = if def.symbol == "dex" {
        format!("`{sym}` counts powers of ten (a decimal logarithm of a ratio)")
    } else if def.dim.is_none() {
        format!("`1 {sym} = {value}` (a dimensionless ratio)")
    } else {
        format!(
            "`1 {sym} = {value} {}` ({})",
            def.dim.si_unit(),
            def.dim.describe()
        )
    };
    format!(
        "**`{sym}`** — {}{prefixed}\n\n{definition}\n\nsource: {}",
        def.name, def.source
    )
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::source::FileId;

    const VEYRA: &str = include_str!("../../../examples/veyra.syz");

    fn hover_at(needle: &str, nth: usize) -> String {
        hover_with(needle, nth, &Method::default())
    }

    fn hover_with(needle: &str, nth: usize, method: &Method) -> String {
        let a = crate::analyze(FileId(0), VEYRA, &crate::Settings::linear());
        let occ = symbols::occurrences(&a.ast);
        let off = VEYRA
            .match_indices(needle)
            .nth(nth)
            .map(|(i, _)| i)
            .unwrap();
        hover(&a, &occ, off, method)
            .map(|h| h.0)
            .unwrap_or_default()
    }

    #[test]
    fn hover_on_any_declaration_of_a_quantity_shows_every_source_and_the_one_used() {
        let src = "ref disc \"Invented A\"\nref followup \"Invented B\"\nsystem \"S\" {\n star s { mass = 1 ± 0.05 Msun }\n planet b orbits s {\n  period = 10.000 ± 0.001 d [disc]\n  period = 10.0021 ± 0.0002 d [followup]\n }\n}";
        let a = crate::analyze(FileId(0), src, &crate::Settings::linear());
        let occ = symbols::occurrences(&a.ast);
        for (off, _) in src.match_indices("period") {
            let h = hover(&a, &occ, off, &Method::default()).unwrap().0;
            assert!(h.contains("- 2 sources:"), "{h}");
            assert!(h.contains("`10.0000 ± 0.0010 d [disc]`"), "{h}");
            assert!(h.contains("[followup] (used)`"), "{h}");
            assert!(h.contains("chosen: the most precise"), "{h}");
            assert!(h.contains("([followup], source 2 of 2, line 7)"), "{h}");
        }
        // Marked: every declaration's hover says so, and names the marked one's line.
        let marked = src.replace("[disc]", "[disc] preferred");
        let a = crate::analyze(FileId(0), &marked, &crate::Settings::linear());
        let occ = symbols::occurrences(&a.ast);
        for (off, _) in marked.match_indices("period") {
            let h = hover(&a, &occ, off, &Method::default()).unwrap().0;
            assert!(h.contains("[disc] (used)`"), "{h}");
            assert!(
                h.contains("chosen: the one marked preferred ([disc], source 1 of 2, line 6)"),
                "{h}"
            );
        }
    }

    #[test]
    fn hovers_with_numbers_say_how_they_were_propagated() {
        let m = crate::settings::EditorSettings::new(None).method();
        for needle in ["period", "b orbits"] {
            let h = hover_with(needle, 0, &m);
            assert!(
                h.ends_with(&format!("uncertainties: {}\n", m.line)),
                "{needle}: {h}"
            );
        }
        let h = hover_with("Msun", 0, &m);
        assert!(
            !h.contains("uncertainties"),
            "a unit has no uncertainty: {h}"
        );
        assert!(!hover_at("period", 0).contains("uncertainties"));
    }

    #[test]
    fn a_first_order_estimate_says_so_beside_its_numbers() {
        // The editor propagates to first order; `syz eval` samples by default.
        let m = crate::settings::EditorSettings::new(None).method();
        let note = "*first-order estimate; `syz eval` samples (Monte Carlo): run it for the reported interval*";
        let src = "system \"S\" {\n star s { mass = 1 ± 0.1 Msun; radius = 1 ± 0.1 Rsun }\n planet b orbits s {\n  period = 3 ± 0.1 d\n  transit_depth = 1 ± 0.1 %\n  radius = sqrt(b.transit_depth) * s.radius\n }\n}\n";
        let a = crate::analyze(FileId(0), src, &crate::Settings::linear());
        let occ = symbols::occurrences(&a.ast);
        let at = |needle: &str, method: &Method| {
            let off = src.find(needle).unwrap();
            hover(&a, &occ, off, method).unwrap().0
        };
        // A declared expression is propagated from its inputs.
        let h = at("radius = sqrt", &m);
        let value = h.find("` (declared)").unwrap_or_else(|| panic!("{h}"));
        let place = h.find(note).unwrap_or_else(|| panic!("{h}"));
        assert!(place > value, "under the value: {h}");
        assert!(at("b orbits", &m).contains(note));
        // A declared measurement's uncertainty is its own: no note.
        assert!(!at("period", &m).contains(note));
        // When `syz eval` propagates as the editor does, nothing is added.
        let same = Method {
            line: "first-order propagation, as `syz eval` uses per syzygy.toml".to_string(),
            tag: None,
        };
        assert!(!at("radius = sqrt", &same).contains("estimate;"));
        assert!(!at("b orbits", &same).contains("estimate;"));
    }

    #[test]
    fn quantity_hover_has_meaning_value_and_provenance() {
        let h = hover_at("period", 0);
        assert!(h.contains("**b.period** — Orbital period."), "{h}");
        assert!(h.contains("3.524740 ± 0.000020 d"), "{h}");
        assert!(h.contains("a time (s)"), "{h}");
        assert!(h.contains("84.59376 ± 0.00048 h"), "other units: {h}");
        assert!(!h.contains("Myr"), "unreadably small: {h}");
        assert!(h.contains("[ph1] Demo photometry"), "{h}");
    }

    #[test]
    fn body_hover_lists_derived_quantities() {
        let h = hover_at("b orbits", 0);
        assert!(h.contains("| semi_major_axis |"), "{h}");
        assert!(h.contains("| derived |"), "{h}");
    }

    #[test]
    fn unit_hover_names_its_source() {
        let h = hover_at("Msun", 0);
        assert!(h.contains("nominal solar mass"), "{h}");
        assert!(h.contains("IAU 2015"), "{h}");
        assert!(unit("km").contains("1 km = 1000 m"));
    }

    #[test]
    fn a_dimensionless_unit_reads_as_a_ratio() {
        let h = unit("ppm");
        assert!(h.contains("`1 ppm = 1e-6` (a dimensionless ratio)"), "{h}");
        assert!(!h.contains("1e-6 1"), "{h}");
        assert!(unit("%").contains("`1 % = 0.01` (a dimensionless ratio)"));
        assert!(unit("dex").contains("powers of ten"), "{}", unit("dex"));
    }

    /// The hover at the `nth` match of `needle` in `src`, with the editor's method line.
    fn hover_in(src: &str, needle: &str) -> String {
        let a = crate::analyze(FileId(0), src, &crate::Settings::linear());
        let occ = symbols::occurrences(&a.ast);
        let off = src.find(needle).unwrap();
        let m = crate::settings::EditorSettings::new(None).method();
        hover(&a, &occ, off, &m).map(|h| h.0).unwrap_or_default()
    }

    const LIMITS: &str = "system \"S\" {\n star s { mass = 1 ± 0.1 Msun; radius = 1 ± 0.1 Rsun }\n planet b orbits s {\n  period = 3 ± 0.1 d\n  eccentricity = 0.2 ± 0.05\n  impact = 0.3 ± 0.1\n  mass > 0.5 Mjup\n  radius = sqrt(b.transit_depth) * s.radius\n }\n}\n";

    #[test]
    fn a_value_without_a_result_says_why_and_shows_no_method() {
        let h = hover_in(LIMITS, "mass > 0.5");
        assert!(h.contains("`> 0.5 Mjup` (declared)"), "{h}");
        assert!(h.contains("not used in derivations"), "{h}");
        assert!(!h.contains("not declared"), "{h}");
        assert!(!h.contains("uncertainties:"), "no numbers, no method: {h}");
        let h = hover_in(LIMITS, "radius = sqrt");
        assert!(h.contains("expression that could not be evaluated"), "{h}");
        assert!(h.contains("it needs b.transit_depth"), "{h}");
        assert!(!h.contains("uncertainties:"), "{h}");
        let h = hover_in(LIMITS, "transit_depth)");
        assert!(h.contains("not declared, and not derivable"), "{h}");
    }

    /// A derived limit that the other end of its input's range bounds too reads as a range,
    /// in its own unit and in the others (`> 0.00171 au` read as open-ended).
    #[test]
    fn a_limit_bounded_at_both_ends_is_a_range_in_every_unit() {
        let src = "system \"S\" {\n star s { mass = 0.85 ± 0.03 Msun }\n planet b orbits s {\n  period = 12.4 ± 0.001 d\n  rv_amplitude = 4.1 ± 0.3 m/s\n  eccentricity < 0.3\n }\n let h = b.hill_radius * 2\n}\n";
        let h = hover_in(src, "hill_radius");
        assert!(h.contains("0.00171 to 0.00249 au"), "{h}");
        assert!(!h.contains("> "), "{h}");
    }

    #[test]
    fn plain_numbers_are_not_offered_in_ppm() {
        for needle in ["eccentricity", "impact"] {
            let h = hover_in(LIMITS, needle);
            assert!(h.contains("- origin: declared"), "{needle}: {h}");
            assert!(!h.contains("ppm") && !h.contains(" %"), "{needle}: {h}");
        }
        // A depth is a fraction: its other units stay, those in which it reads without an
        // exponent (1.12 % is 11.2 ppt; 11200 ppm is left out).
        let h = hover_at("transit_depth", 0);
        assert!(h.contains("ppt") && !h.contains("ppm"), "{h}");
    }

    #[test]
    fn other_units_need_no_exponent() {
        // A star's mass is offered in Jupiter masses, not as 3.1e5 Earth masses.
        let h = hover_at("mass", 0);
        let also = h
            .lines()
            .find(|l| l.starts_with("- also: "))
            .expect("also line");
        assert!(also.contains("Mjup") && !also.contains("Mearth"), "{also}");
    }
}
