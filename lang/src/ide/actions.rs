//! Code actions: fixes from diagnostics (did-you-mean, a silencing comment) and rewrites of
//! the source (declare a derived value, convert a value to another unit, choose which of
//! several published values of a quantity is used).

use super::line_bounds;
use crate::ast::{self, ExprKind};
use crate::derive::{display_unit, Origin};
use crate::diagnostic::{Diagnostic, Rule};
use crate::model::{Content, Form};
use crate::quantities;
use crate::source::{line_break_of, Span};
use crate::Analysis;

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ActionKind {
    QuickFix,
    Rewrite,
}

#[derive(Debug, Clone, PartialEq)]
pub struct Action {
    pub title: String,
    pub kind: ActionKind,
    pub edits: Vec<(Span, String)>,
    pub preferred: bool,
    /// The index in `Analysis::diagnostics` of the diagnostic this fixes.
    pub fixes: Option<usize>,
}

fn overlaps(span: Span, range: &std::ops::Range<usize>) -> bool {
    (span.start as usize) <= range.end && range.start <= (span.end as usize)
}

/// The suggestion of a "did you mean 'X'?" help.
pub fn did_you_mean(d: &Diagnostic) -> Option<&str> {
    let h = d.help.as_deref()?;
    let rest = h.strip_prefix("did you mean '")?;
    rest.strip_suffix("'?")
}

/// Every action for the byte range (a cursor is an empty range).
pub fn actions(a: &Analysis, src: &str, range: std::ops::Range<usize>) -> Vec<Action> {
    let mut out = Vec::new();
    for (i, d) in a.diagnostics.iter().enumerate() {
        if !overlaps(d.span, &range) {
            continue;
        }
        if let Some(s) = did_you_mean(d) {
            out.push(Action {
                title: format!("Replace with '{s}'"),
                kind: ActionKind::QuickFix,
                edits: vec![(d.span, s.to_string())],
                preferred: true,
                fixes: Some(i),
            });
        } else if let Some(fix) = &d.fix {
            let written = src
                .get(fix.span.start as usize..fix.span.end as usize)
                .unwrap_or("");
            out.push(Action {
                title: if written.is_empty() {
                    format!("Add '{}'", fix.text.trim())
                } else {
                    format!("Write '{written}' as '{}'", fix.text)
                },
                kind: ActionKind::QuickFix,
                edits: vec![(fix.span, fix.text.clone())],
                preferred: true,
                fixes: Some(i),
            });
        }
        if d.rule != Rule::UnusedAllow && !d.rule.is_fixed() {
            out.push(silence(a, src, d, i));
        }
    }
    out.extend(declare_derived(a, src, range.start));
    out.extend(convert_units(a, src, range.start));
    out.extend(choose_source(a, src, range.start));
    out
}

fn silence(a: &Analysis, src: &str, d: &Diagnostic, i: usize) -> Action {
    let (start, end) = line_bounds(src, d.span.start as usize);
    let has_comment = a
        .ast
        .comments
        .iter()
        .any(|c| (c.span.start as usize) >= start && (c.span.start as usize) <= end);
    let comment = format!("# allow({}): reason", d.rule.id());
    let edit = if has_comment {
        let line = src.get(start..end).unwrap_or("");
        let indent: String = line.chars().take_while(|c| c.is_whitespace()).collect();
        (
            Span::new(a.file, start, start),
            format!("{indent}{comment}{}", line_break_of(src)),
        )
    } else {
        (Span::new(a.file, end, end), format!("  {comment}"))
    };
    Action {
        title: format!("Silence '{}' on this line", d.rule.id()),
        kind: ActionKind::QuickFix,
        edits: vec![edit],
        preferred: false,
        fixes: Some(i),
    }
}

/// The body (system and body index) whose declaration contains `offset`.
fn body_at(a: &Analysis, offset: usize) -> Option<(usize, usize)> {
    a.model.systems.iter().enumerate().find_map(|(si, s)| {
        s.bodies
            .iter()
            .position(|b| b.span.contains(offset))
            .map(|bi| (si, bi))
    })
}

/// Declare a derived value of the body at `offset` (for catalogue authors who want the
/// number in the file).
fn declare_derived(a: &Analysis, src: &str, offset: usize) -> Vec<Action> {
    let Some((si, bi)) = body_at(a, offset) else {
        return Vec::new();
    };
    let Some(body) = a.model.systems.get(si).and_then(|s| s.bodies.get(bi)) else {
        return Vec::new();
    };
    let end = body.span.end as usize;
    // The closing brace must be there (an unclosed body has nowhere to insert).
    if end == 0 || src.get(end - 1..end) != Some("}") {
        return Vec::new();
    }
    let close = end - 1;
    let (line_start, _) = line_bounds(src, close);
    let before_close = src.get(line_start..close).unwrap_or("");
    let one_line = !before_close.trim().is_empty();
    let header_line = line_bounds(src, body.name_span.start as usize).0;
    let base_indent: String = src
        .get(header_line..)
        .unwrap_or("")
        .chars()
        .take_while(|c| *c == ' ' || *c == '\t')
        .collect();
    let Some(res) = a.results.get(si).and_then(|r| r.bodies.get(bi)) else {
        return Vec::new();
    };
    let mut out = Vec::new();
    for q in &res.quantities {
        if q.origin != Origin::Derived || !q.value.is_finite() {
            continue;
        }
        let def = quantities::def(q.qty);
        let unit = display_unit(q.qty, q.value);
        let lit = crate::format::literal_text(unit.of(q.value), unit.of(q.below), unit.of(q.above));
        let value = match unit.suffix() {
            "" => lit,
            u => format!("{lit} {u}"),
        };
        let stmt = format!("{} = {value}", def.name);
        let edit = if one_line {
            (Span::new(a.file, close, close), format!("; {stmt} "))
        } else {
            (
                Span::new(a.file, line_start, line_start),
                format!("{base_indent}  {stmt}{}", line_break_of(src)),
            )
        };
        out.push(Action {
            title: format!("Declare {}.{} = {value} (derived)", body.id, def.name),
            kind: ActionKind::Rewrite,
            edits: vec![edit],
            preferred: false,
            fixes: None,
        });
    }
    out
}

/// The literal value of the property at `offset`, with its unit.
fn literal_prop_at(a: &Analysis, offset: usize) -> Option<(&ast::BodyDecl, &ast::Prop, Span)> {
    for sys in &a.ast.systems {
        for b in &sys.bodies {
            for p in &b.props {
                if !p.span.contains(offset) {
                    continue;
                }
                let ast::PropValue::Expr(e) = &p.value else {
                    return None;
                };
                let lit = match &e.kind {
                    ExprKind::Literal(l) => l,
                    ExprKind::Neg(x) => match &x.kind {
                        ExprKind::Literal(l) => l,
                        _ => return None,
                    },
                    _ => return None,
                };
                lit.unit.as_ref()?;
                return Some((b, p, e.span));
            }
        }
    }
    None
}

/// Convert a declared value to another unit of its dimension.
fn convert_units(a: &Analysis, _src: &str, offset: usize) -> Vec<Action> {
    let Some((b, p, span)) = literal_prop_at(a, offset) else {
        return Vec::new();
    };
    let Some(def) = quantities::find(b.kind, &p.name.name) else {
        return Vec::new();
    };
    let Some(m) = a.model.systems.iter().find_map(|s| {
        let body = s.bodies.iter().find(|x| x.name_span == b.name.span)?;
        let d = body.get(def.qty)?;
        match &d.content {
            Content::Measured(m) if d.name_span == p.name.span => {
                Some((*m, d.written_unit.clone()))
            }
            _ => None,
        }
    }) else {
        return Vec::new();
    };
    let (m, written) = m;
    let mut out = Vec::new();
    for (sym, name) in crate::units::units_for(def.dim) {
        if written.as_deref() == Some(sym.as_str())
            || name.starts_with("Julian date") != (def.qty == quantities::Qty::TransitEpoch)
            || !crate::units::takes_unit(def.display, &sym)
        {
            continue;
        }
        let Some(f) = crate::derive::DisplayUnit::parse(&sym)
            .map(|u| u.factor)
            .filter(|f| f.is_finite() && *f > 0.0)
        else {
            continue;
        };
        let lit = match m.form {
            Form::Exact | Form::UpperLimit | Form::LowerLimit => crate::format::number(m.value / f),
            _ => crate::format::converted_text(m.value / f, m.below / f, m.above / f),
        };
        out.push(Action {
            title: format!("Convert to {sym} ({name})"),
            kind: ActionKind::Rewrite,
            edits: vec![(span, format!("{lit} {sym}"))],
            preferred: false,
            fixes: None,
        });
    }
    out
}

/// On a declaration of a quantity declared more than once: use this one (mark it
/// `preferred` and unmark the others), or, on the one used because it is marked, let the
/// project file's policy choose (unmark it). The mark goes after the citations and any
/// `assumed`, one space apart, which is where the formatter puts it.
fn choose_source(a: &Analysis, src: &str, offset: usize) -> Vec<Action> {
    let Some((b, p)) = a.ast.systems.iter().find_map(|sys| {
        let b = sys.bodies.iter().find(|b| b.span.contains(offset))?;
        let p = b.props.iter().find(|p| p.span.contains(offset))?;
        Some((b, p))
    }) else {
        return Vec::new();
    };
    let Some(def) = quantities::find(b.kind, &p.name.name) else {
        return Vec::new();
    };
    let Some((si, bi, body)) = a.model.systems.iter().enumerate().find_map(|(si, s)| {
        let bi = s.bodies.iter().position(|x| x.name_span == b.name.span)?;
        Some((si, bi, s.bodies.get(bi)?))
    }) else {
        return Vec::new();
    };
    let all = body.sources(def.qty);
    if all.len() < 2 {
        return Vec::new();
    }
    let Some(this) = all.iter().find(|d| d.name_span == p.name.span) else {
        return Vec::new();
    };
    // A lower limit with no upper bound cannot be used: choosing it would leave the
    // quantity without a value for every derivation.
    if matches!(&this.content, crate::model::Content::Measured(m) if !m.can_be_sampled(def)) {
        return Vec::new();
    }
    // The marks on the declarations of this quantity, as written.
    let marks: Vec<(Span, Option<Span>)> = b
        .props
        .iter()
        .filter(|x| all.iter().any(|d| d.name_span == x.name.span))
        .map(|x| (x.name.span, x.preferred))
        .collect();
    let unmark = |mark: Span| {
        let start = src
            .get(..mark.start as usize)
            .map_or(mark.start as usize, |s| {
                s.trim_end_matches([' ', '\t']).len()
            });
        (Span::new(a.file, start, mark.end as usize), String::new())
    };
    let system_span = a.system_span(si);
    let used = super::result(a, si, bi, def.qty).is_some_and(|q| {
        q.sources
            .iter()
            .any(|s| s.chosen && s.span.in_file(system_span) == this.span)
    });
    let name = format!("{}.{}", body.id, def.name);
    let marked_here = p.preferred.is_some();
    if used && marked_here {
        return vec![Action {
            title: format!("Let the project policy choose for {name}"),
            kind: ActionKind::Rewrite,
            edits: marks.iter().filter_map(|(_, m)| m.map(unmark)).collect(),
            preferred: false,
            fixes: None,
        }];
    }
    if used {
        return Vec::new();
    }
    let mut edits: Vec<(Span, String)> = marks
        .iter()
        .filter(|(n, _)| *n != p.name.span)
        .filter_map(|(_, m)| m.map(unmark))
        .collect();
    if !marked_here {
        let end = p.span.end as usize;
        edits.push((Span::new(a.file, end, end), " preferred".to_string()));
    }
    let cites: Vec<&str> = this.citations.iter().map(|c| c.0.as_str()).collect();
    vec![Action {
        title: format!("Use this source for {name} ([{}])", cites.join(", ")),
        kind: ActionKind::Rewrite,
        edits,
        preferred: false,
        fixes: None,
    }]
}

/// Apply edits (non-overlapping byte spans) to a text.
pub fn apply_edits(src: &str, edits: &[(Span, String)]) -> String {
    let mut sorted: Vec<&(Span, String)> = edits.iter().collect();
    sorted.sort_by_key(|(s, _)| std::cmp::Reverse((s.start, s.end)));
    let mut out = src.to_string();
    for (s, t) in sorted {
        let (a, b) = (s.start as usize, s.end as usize);
        if a <= b && b <= out.len() && out.is_char_boundary(a) && out.is_char_boundary(b) {
            out.replace_range(a..b, t);
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::ide::result;
    use crate::source::FileId;

    fn run(src: &str, at: &str) -> (crate::Analysis, Vec<Action>) {
        let a = crate::analyze(FileId(0), src, &crate::Settings::linear());
        let off = src.find(at).unwrap();
        let acts = actions(&a, src, off..off);
        (a, acts)
    }

    const SRC: &str = "system \"S\" {\n  star s {\n    mass = 1.0 ± 0.05 Msun\n    radius = 1.0 ± 0.02 Rsun\n  }\n  planet b orbits s {\n    perod = 3 d\n    rv_amplitude = 30 ± 2 m/s\n  }\n}\n";

    #[test]
    fn did_you_mean_fix_makes_the_error_go_away() {
        let (_, acts) = run(SRC, "perod");
        let fix = acts
            .iter()
            .find(|x| x.title == "Replace with 'period'")
            .unwrap();
        let fixed = apply_edits(SRC, &fix.edits);
        let a = crate::analyze(FileId(0), &fixed, &crate::Settings::linear());
        assert!(!a.has_errors(), "{:?}", a.diagnostics);
    }

    #[test]
    fn the_fixes_of_slips_make_their_errors_go_away() {
        // Each slip, where the cursor is, the quick fix's title, and the line it leaves.
        for (slip, at, title, fixed_line) in [
            (
                "radius = 1.0 +/- 0.02 Rsun",
                "/-",
                "Write '+/-' as '±'",
                "radius = 1.0 ± 0.02 Rsun",
            ),
            (
                "radius = 1,0 ± 0.02 Rsun",
                ",0",
                "Write '1,0' as '1.0'",
                "radius = 1.0 ± 0.02 Rsun",
            ),
            (
                "radius = 1.0 +0.03 -0.02 Rsun",
                "+0.03",
                "Write '+0.03 -0.02' as '+0.03/-0.02'",
                "radius = 1.0 +0.03/-0.02 Rsun",
            ),
            (
                "radius = 1.00(2) Rsun",
                "(2)",
                "Write '1.00(2)' as '1.00 ± 0.02'",
                "radius = 1.00 ± 0.02 Rsun",
            ),
            (
                "radius = 1.0 ± 0.02\n",
                "1.0 ± 0.02\n",
                "Add 'Rsun'",
                "radius = 1.0 ± 0.02 Rsun",
            ),
        ] {
            let src = SRC.replace(
                "radius = 1.0 ± 0.02 Rsun\n",
                &format!("{}\n", slip.trim_end()),
            );
            let (_, acts) = run(&src, at);
            let fix = acts.iter().find(|x| x.title == title).unwrap_or_else(|| {
                panic!(
                    "{slip}: {:?}",
                    acts.iter().map(|a| &a.title).collect::<Vec<_>>()
                )
            });
            let fixed = apply_edits(&src, &fix.edits);
            assert!(fixed.contains(fixed_line), "{slip}: {fixed}");
            // Only the file's own slip (`perod`) is left, and the note that the planet's
            // radial-velocity amplitude, without a period, gives nothing.
            let a = crate::analyze(FileId(0), &fixed, &crate::Settings::linear());
            assert!(
                a.diagnostics
                    .iter()
                    .all(|d| matches!(d.rule, Rule::UnknownQuantity | Rule::NotDerivable)),
                "{slip}: {:?}",
                a.diagnostics
            );
        }
        // A unit's exponent: `m s-1` becomes `m s^-1`.
        let src = SRC.replace("30 ± 2 m/s", "30 ± 2 m s-1");
        let (_, acts) = run(&src, "s-1");
        let fix = acts
            .iter()
            .find(|x| x.title == "Write 's-1' as 's^-1'")
            .unwrap();
        let fixed = apply_edits(&src, &fix.edits);
        assert!(fixed.contains("rv_amplitude = 30 ± 2 m s^-1"), "{fixed}");
    }

    #[test]
    fn silencing_comment_silences() {
        let (_, acts) = run(SRC, "perod");
        let s = acts
            .iter()
            .find(|x| x.title.starts_with("Silence 'unknown-quantity'"))
            .unwrap();
        let fixed = apply_edits(SRC, &s.edits);
        assert!(
            fixed.contains("perod = 3 d  # allow(unknown-quantity): reason"),
            "{fixed}"
        );
        let a = crate::analyze(FileId(0), &fixed, &crate::Settings::linear());
        assert!(a
            .diagnostics
            .iter()
            .all(|d| d.rule != Rule::UnknownQuantity));
    }

    #[test]
    fn declare_a_derived_value() {
        let fixed_src = SRC.replace("perod", "period");
        let (_, acts) = run(&fixed_src, "rv_amplitude");
        let d = acts
            .iter()
            .find(|x| x.title.starts_with("Declare b.semi_major_axis = "))
            .unwrap();
        let out = apply_edits(&fixed_src, &d.edits);
        assert!(out.contains("    semi_major_axis = 0.04"), "{out}");
        let a = crate::analyze(FileId(0), &out, &crate::Settings::linear());
        assert!(!a.has_errors(), "{:?}", a.diagnostics);
        let q = result(&a, 0, 1, quantities::Qty::SemiMajorAxis).unwrap();
        assert_eq!(q.origin, Origin::Declared);
    }

    #[test]
    fn convert_keeps_the_value() {
        let (a0, acts) = run(SRC, "30 ± 2");
        let c = acts
            .iter()
            .find(|x| x.title.starts_with("Convert to km/s"))
            .unwrap();
        let out = apply_edits(SRC, &c.edits);
        assert!(out.contains("rv_amplitude = 0.03 ± 0.002 km/s"), "{out}");
        // An asymmetric value keeps its sides to six figures: what derives from it does not
        // move (rounding them to two digits moved a luminosity by 0.6 %).
        let src = SRC.replace("radius = 1.0 ± 0.02 Rsun", "radius = 0.88 +0.03/-0.02 Rsun");
        let (_, acts) = run(&src, "0.88");
        let r0 = crate::analyze(FileId(0), &src, &crate::Settings::linear());
        let c = titled(&acts, "Convert to Rearth").unwrap();
        let out = apply_edits(&src, &c.edits);
        assert!(out.contains("+3.27"), "{out}");
        let r1 = crate::analyze(FileId(0), &out, &crate::Settings::linear());
        let b = result(&r0, 0, 0, quantities::Qty::StarDensity).unwrap();
        let a = result(&r1, 0, 0, quantities::Qty::StarDensity).unwrap();
        assert!(
            (b.value / a.value - 1.0).abs() < 1e-4,
            "{} vs {}: {out}",
            b.value,
            a.value
        );
        assert!(
            (b.above / a.above - 1.0).abs() < 1e-3,
            "{} vs {}",
            b.above,
            a.above
        );
        let a = crate::analyze(FileId(0), &out, &crate::Settings::linear());
        let before = result(&a0, 0, 1, quantities::Qty::RvAmplitude).unwrap();
        let after = result(&a, 0, 1, quantities::Qty::RvAmplitude).unwrap();
        assert!((before.value - after.value).abs() < 1e-9 * before.value);
        assert!(!acts.iter().any(|x| x.title.starts_with("Convert to m/s ")));
    }

    const SOURCES: &str = "ref disc \"Invented A\"\nref followup \"Invented B\"\nref late \"Invented C\"\nsystem \"S\" {\n  star s { mass = 1 ± 0.05 Msun }\n  planet b orbits s {\n    period = 10.000 ± 0.001 d  [disc] preferred  # first\n    radius = 1 ± 0.1 Rjup\n    period = 10.0021 ± 0.0002 d [followup]\n    period = 10.003 ± 0.01 d    [late] assumed\n  }\n}\n";

    fn titled<'x>(acts: &'x [Action], start: &str) -> Option<&'x Action> {
        acts.iter().find(|x| x.title.starts_with(start))
    }

    #[test]
    fn use_this_source_moves_the_mark_and_stays_in_canonical_layout() {
        let (_, acts) = run(SOURCES, "10.0021");
        let act = titled(&acts, "Use this source").expect("offered on an unused declaration");
        assert_eq!(act.title, "Use this source for b.period ([followup])");
        assert_eq!(act.kind, ActionKind::Rewrite);
        let out = apply_edits(SOURCES, &act.edits);
        assert_eq!(
            out,
            SOURCES
                .replace("[disc] preferred  # first", "[disc]  # first")
                .replace("[followup]\n", "[followup] preferred\n")
        );
        // The formatter leaves the marks where the edit put them.
        let canonical = crate::layout::format_source(SOURCES).unwrap();
        let edited = apply_edits(
            &canonical,
            &run(&canonical, "10.0021")
                .1
                .into_iter()
                .find(|x| x.title.starts_with("Use this source"))
                .unwrap()
                .edits,
        );
        assert_eq!(crate::layout::format_source(&edited).unwrap(), edited);
        // The value used is now the one marked.
        let a = crate::analyze(FileId(0), &out, &crate::Settings::linear());
        assert!(!a.has_errors(), "{:?}", a.diagnostics);
        let q = result(&a, 0, 1, quantities::Qty::Period).unwrap();
        assert!((q.value / 86400.0 - 10.0021).abs() < 1e-9, "{}", q.value);
        assert_eq!(q.choice, Some(crate::derive::Choice::Marked));
    }

    #[test]
    fn a_lower_limit_that_cannot_be_used_is_not_offered_as_the_source() {
        let src = "ref ta \"A\"\nref tb \"B\"\nsystem \"S\" {\n  star s {\n    teff = 5700 ± 90 K [ta]\n    teff > 5500 K [tb]\n  }\n}\n";
        let (_, acts) = run(src, "5500");
        assert!(titled(&acts, "Use this source").is_none());
        // Marked by hand, its note sits on its own line and says how to use the measurement.
        let marked = src.replace("[tb]", "[tb] preferred");
        let a = crate::analyze(FileId(0), &marked, &crate::Settings::linear());
        let d = a
            .diagnostics
            .iter()
            .find(|d| d.rule == crate::diagnostic::Rule::NotDerivable)
            .unwrap();
        assert!(
            marked[d.span.range()].starts_with("teff > 5500"),
            "{}",
            &marked[d.span.range()]
        );
        assert!(
            d.help
                .as_deref()
                .unwrap_or("")
                .contains("take `preferred` off"),
            "{d:?}"
        );
    }

    #[test]
    fn a_mark_after_assumed_and_on_a_one_line_body() {
        let (_, acts) = run(SOURCES, "10.003");
        let out = apply_edits(SOURCES, &titled(&acts, "Use this source").unwrap().edits);
        assert!(out.contains("[late] assumed preferred\n"), "{out}");
        assert!(!out.contains("[disc] preferred"), "{out}");
        let one_line = "ref x \"X\"\nref y \"Y\"\nsystem \"S\" {\n  star s { teff = 5000 ± 100 K [x]; teff = 5100 ± 50 K [y] preferred }\n}\n";
        let (_, acts) = run(one_line, "5000");
        let out = apply_edits(one_line, &titled(&acts, "Use this source").unwrap().edits);
        assert!(
            out.contains("teff = 5000 ± 100 K [x] preferred; teff = 5100 ± 50 K [y] }"),
            "{out}"
        );
    }

    #[test]
    fn on_the_marked_one_the_policy_can_choose_again() {
        let (_, acts) = run(SOURCES, "10.000 ");
        assert!(titled(&acts, "Use this source").is_none(), "{acts:?}");
        let act = titled(&acts, "Let the project policy choose").unwrap();
        assert_eq!(act.title, "Let the project policy choose for b.period");
        let out = apply_edits(SOURCES, &act.edits);
        assert_eq!(out, SOURCES.replace("[disc] preferred", "[disc]"));
        let a = crate::analyze(FileId(0), &out, &crate::Settings::linear());
        let q = result(&a, 0, 1, quantities::Qty::Period).unwrap();
        assert_eq!(q.choice, Some(crate::derive::Choice::MostPrecise));
        // The one the policy chose is used already: nothing to offer there.
        let (_, acts) = run(&out, "10.0021");
        assert!(titled(&acts, "Use this source").is_none(), "{acts:?}");
        assert!(
            titled(&acts, "Let the project policy").is_none(),
            "{acts:?}"
        );
        assert!(titled(&run(&out, "10.000 ").1, "Use this source").is_some());
    }

    #[test]
    fn not_offered_on_a_quantity_declared_once() {
        let (_, acts) = run(SOURCES, "1 ± 0.1 Rjup");
        assert!(titled(&acts, "Use this source").is_none(), "{acts:?}");
        let once = SOURCES
            .replace("    period = 10.0021 ± 0.0002 d [followup]\n", "")
            .replace("    period = 10.003 ± 0.01 d    [late] assumed\n", "");
        let (_, acts) = run(&once, "10.000 ");
        assert!(
            titled(&acts, "Let the project policy").is_none(),
            "{acts:?}"
        );
        assert!(titled(&acts, "Use this source").is_none(), "{acts:?}");
    }
}
