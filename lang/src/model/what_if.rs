//! What-if values: `--set [SYSTEM/]BODY.QUANTITY=VALUE` replaces (or adds) one declaration
//! for one run, without touching the file.
//!
//! The value is read by the language's own parser and lowering, as the property
//! `QUANTITY = VALUE` of a body of the target's kind, so it takes exactly what a file takes
//! for that quantity (a number with its uncertainty and unit, a limit, a text) and is
//! refused for the same reasons (unknown unit, wrong dimension, out of range). It may not
//! cite a reference (the command line has none) nor be an expression (its names would
//! have to be resolved in a file it is not part of).
//!
//! [`check`] finds, before anything is analysed, the one body each request names among
//! everything read, and says why when there is none or more than one; [`apply`] then puts
//! the lowered value into a lowered model, in place of every declaration of that quantity.
//! The value set carries the sentence that says so ([`SET_WORDS`]), which every derived
//! value that rests on it repeats in its assumptions; its origin is [`Origin::Set`].
//!
//! [`Origin::Set`]: crate::derive::Origin::Set

use super::{Body, Content, Declared, Model};
use crate::ast::BodyKind;
use crate::diagnostic::Severity;
use crate::quantities;
use crate::source::{FileId, Span};

/// The words every value set on the command line, and everything derived from it, carries.
pub const SET_WORDS: &str = "set on the command line (--set)";

/// One request as written: `[SYSTEM/]BODY.QUANTITY=VALUE`.
#[derive(Debug, Clone, PartialEq)]
pub struct WhatIf {
    /// The whole request, as given (for messages).
    pub written: String,
    /// The system's name, when given (everything before the last `/` of the target).
    pub system: Option<String>,
    pub body: String,
    pub quantity: String,
    /// The value, in the language's syntax.
    pub value: String,
}

impl WhatIf {
    /// The target as people read it: `Veyra/veyra.radius` or `veyra.radius`.
    pub fn target(&self) -> String {
        match &self.system {
            Some(s) => format!("{s}/{}.{}", self.body, self.quantity),
            None => format!("{}.{}", self.body, self.quantity),
        }
    }
}

/// Read a request. The target is everything before the first `=`, `<` or `>` (a limit may be
/// written as in a file, `b.eccentricity<0.1`, or after `=`, `b.eccentricity=<0.1`); in it, a
/// system name ends at the last `/`, and the body at the first `.` after it.
pub fn parse(written: &str) -> Result<WhatIf, String> {
    let form = "expected [SYSTEM/]BODY.QUANTITY=VALUE, such as 'b.period=3.5247 ± 0.0001 d' \
                (or a limit, 'b.eccentricity<0.1')";
    // The first `=`, `<` or `>` right after `.QUANTITY` (a system's name may hold any of them).
    let after_quantity = |i: usize| {
        let before = written.get(..i).unwrap_or("").trim_end();
        let name = before
            .rfind(|c: char| !(c.is_alphanumeric() || c == '_'))
            .map_or(0, |j| j + 1);
        name < before.len() && before.get(..name).is_some_and(|b| b.ends_with('.'))
    };
    let Some(at) = written
        .char_indices()
        .find(|&(i, c)| matches!(c, '=' | '<' | '>') && after_quantity(i))
        .map(|(i, _)| i)
    else {
        return Err(form.to_string());
    };
    let (target, value) = match written.get(at..at + 1) {
        // The relation of a limit is part of the value: `<0.1`.
        Some("<" | ">") => (
            written.get(..at).unwrap_or(""),
            written.get(at..).unwrap_or(""),
        ),
        _ => (
            written.get(..at).unwrap_or(""),
            written.get(at + 1..).unwrap_or(""),
        ),
    };
    let (system, rest) = match target.rsplit_once('/') {
        Some((s, r)) => (Some(s.trim().to_string()), r),
        None => (None, target),
    };
    let Some((body, quantity)) = rest.split_once('.') else {
        return Err(form.to_string());
    };
    let (body, quantity, value) = (body.trim(), quantity.trim(), value.trim());
    if body.is_empty() || quantity.is_empty() || system.as_deref() == Some("") {
        return Err(form.to_string());
    }
    if value.is_empty() {
        return Err(format!("no value after '=' ({form})"));
    }
    Ok(WhatIf {
        written: written.to_string(),
        system,
        body: body.to_string(),
        quantity: quantity.to_string(),
        value: value.to_string(),
    })
}

/// The value of `w` for a body of `kind`, lowered as a file's declaration would be (its
/// spans point into a text of its own; [`apply`] moves them); why not, in a sentence.
pub fn lower(w: &WhatIf, kind: BodyKind) -> Result<Declared, String> {
    let Some(def) = quantities::find(kind, &w.quantity) else {
        let names = quantities::table()
            .iter()
            .filter(|d| d.kind == kind)
            .map(|d| d.name);
        let meant = quantities::suggest(kind, &w.quantity)
            .or_else(|| crate::text::closest(&w.quantity, names));
        return Err(format!(
            "'{}' is not a quantity of a {}{}",
            w.quantity,
            kind.as_str(),
            meant.map_or_else(String::new, |m| format!("; did you mean '{m}'?"))
        ));
    };
    // The property as a file would write it, in a body of its own (a planet with a star to
    // orbit, as every planet needs).
    let body = match kind {
        BodyKind::Star => "star s {".to_string(),
        BodyKind::Planet => "star s {}\n  planet p orbits s {".to_string(),
    };
    // A limit is written with its relation in place of `=`: `--set 'b.eccentricity=< 0.1'`.
    let (relation, value) = match w.value.strip_prefix(['<', '>']) {
        Some(rest) => (w.value.get(..1).unwrap_or("="), rest),
        None => ("=", w.value.as_str()),
    };
    let src = format!(
        "system \"what-if\" {{\n  {body}\n    {} {relation} {value}\n  }}\n}}\n",
        def.name
    );
    let file = FileId(0);
    let parsed = crate::parser::parse(file, &src);
    let mut diags = parsed.diagnostics;
    let props: Vec<&crate::ast::Prop> = parsed
        .file
        .systems
        .iter()
        .flat_map(|s| &s.bodies)
        .flat_map(|b| &b.props)
        .collect();
    let refused = |diags: &[crate::diagnostic::Diagnostic]| {
        diags
            .iter()
            .find(|d| d.severity == Severity::Error)
            .map(|d| {
                // The help names the fix (`1.0 Msun`, `+-`), which the user types next.
                let help = d.help.as_ref().map_or(String::new(), |h| format!("; {h}"));
                format!("the value '{}' is refused: {}{help}", w.value, d.message)
            })
    };
    if let Some(e) = refused(&diags) {
        return Err(e);
    }
    let [prop] = props.as_slice() else {
        return Err(format!(
            "the value '{}' is not one value of '{}'",
            w.value, def.name
        ));
    };
    if !prop.citations.is_empty() {
        return Err(format!(
            "the value '{}' cites a reference; a value set on the command line cites none",
            w.value
        ));
    }
    let expression = || {
        format!(
            "the value '{}' is an expression; --set takes a measured value (a number with its \
             uncertainty and unit, or a limit) or a text",
            w.value
        )
    };
    // An expression naming other values (`b.period * 2`) would be resolved in the sandbox
    // this value is read in, whose bodies are not the file's: refused before that.
    let plain = |e: &crate::ast::Expr| match &e.kind {
        crate::ast::ExprKind::Literal(_) => true,
        crate::ast::ExprKind::Neg(inner) => matches!(inner.kind, crate::ast::ExprKind::Literal(_)),
        _ => false,
    };
    if let crate::ast::PropValue::Expr(e) = &prop.value {
        if !plain(e) {
            return Err(expression());
        }
    }
    let model = super::lower(file, &parsed.file, &mut diags);
    if let Some(e) = refused(&diags) {
        return Err(e);
    }
    let decl = model
        .systems
        .into_iter()
        .flat_map(|s| s.bodies)
        .flat_map(|b| b.declared)
        .next()
        .ok_or_else(|| format!("the value '{}' could not be read", w.value))?;
    if matches!(decl.content, Content::Expr(_)) {
        return Err(expression());
    }
    Ok(decl)
}

/// A system and body of some file, as [`check`] looks for targets among them.
#[derive(Debug, Clone, PartialEq)]
pub struct Outline {
    /// The file's name, for messages.
    pub file: String,
    pub system: String,
    pub bodies: Vec<(String, BodyKind)>,
    /// The ids of bodies declared past the system's bound, which are not read.
    pub not_read: Vec<String>,
}

impl Outline {
    /// The systems of a lowered model, for [`check`].
    pub fn of(model: &Model, file: &str) -> Vec<Outline> {
        model
            .systems
            .iter()
            .map(|s| Outline {
                file: file.to_string(),
                system: s.name.clone(),
                bodies: s.bodies.iter().map(|b| (b.id.clone(), b.kind)).collect(),
                not_read: s.not_read.iter().map(|(id, _)| id.clone()).collect(),
            })
            .collect()
    }
}

/// Check that every request names exactly one body of one system among `outlines`, a
/// quantity of that body once, and a value that body's quantity takes. The error is a
/// sentence about the first request that does not.
pub fn check(sets: &[WhatIf], outlines: &[Outline]) -> Result<(), String> {
    let mut targets: Vec<(&str, &str, &str, &str)> = Vec::new();
    for w in sets {
        let found: Vec<(&Outline, BodyKind)> = outlines
            .iter()
            .filter(|o| w.system.as_ref().is_none_or(|s| *s == o.system))
            .filter_map(|o| {
                let kind = o.bodies.iter().find(|(id, _)| *id == w.body)?.1;
                Some((o, kind))
            })
            .collect();
        let (o, kind) = match found.as_slice() {
            [one] => *one,
            [] => return Err(not_found(w, outlines)),
            several => {
                let mut places: Vec<String> = several
                    .iter()
                    .take(4)
                    .map(|(o, _)| format!("\"{}\" ({})", o.system, o.file))
                    .collect();
                if several.len() > 4 {
                    places.push(format!("and {} more", several.len() - 4));
                }
                let help = if w.system.is_some() {
                    "the same system is read from several files; name one file or folder only"
                        .to_string()
                } else {
                    format!(
                        "name the system: '{}/{}.{}=...'",
                        several.first().map_or("SYSTEM", |(o, _)| o.system.as_str()),
                        w.body,
                        w.quantity
                    )
                };
                return Err(format!(
                    "'{}' names a body of several systems: {}; {help}",
                    w.target(),
                    places.join(", ")
                ));
            }
        };
        let decl = lower(w, kind)?;
        let name = quantities::def(decl.qty).name;
        let key = (o.file.as_str(), o.system.as_str(), w.body.as_str(), name);
        if targets.contains(&key) {
            return Err(format!(
                "{}.{name} of system \"{}\" is set twice",
                w.body, o.system
            ));
        }
        targets.push(key);
    }
    Ok(())
}

fn not_found(w: &WhatIf, outlines: &[Outline]) -> String {
    if let Some(s) = &w.system {
        if !outlines.iter().any(|o| o.system == *s) {
            let meant = crate::text::closest(s, outlines.iter().map(|o| o.system.as_str()));
            return format!(
                "no system \"{s}\" in the files read{}",
                meant.map_or_else(String::new, |m| format!("; did you mean \"{m}\"?"))
            );
        }
    }
    let here = outlines
        .iter()
        .filter(|o| w.system.as_ref().is_none_or(|s| *s == o.system));
    if let Some(o) = here.clone().find(|o| o.not_read.contains(&w.body)) {
        return super::limits::not_read(&o.system, &w.body);
    }
    let bodies = here.flat_map(|o| o.bodies.iter().map(|(id, _)| id.as_str()));
    let meant = crate::text::closest(&w.body, bodies);
    format!(
        "no body '{}' in {}{}",
        w.body,
        w.system.as_ref().map_or_else(
            || "the files read".to_string(),
            |s| format!("system \"{s}\"")
        ),
        meant.map_or_else(String::new, |m| format!("; did you mean '{m}'?"))
    )
}

/// Put every request that names a body of `model` into it: the value set replaces every
/// declaration of its quantity (or is added, at the body's name, when there was none).
/// `src` is the text of the model's file, to quote the value replaced. A request that names
/// no body here is for another file; [`check`] has made sure each names one somewhere and
/// that its value is good (one that is not is left out here, and `check` says why).
pub fn apply(model: &mut Model, src: &str, sets: &[WhatIf]) {
    for w in sets {
        for sys in &mut model.systems {
            if w.system.as_ref().is_some_and(|s| *s != sys.name) {
                continue;
            }
            let Some(body) = sys.bodies.iter_mut().find(|b| b.id == w.body) else {
                continue;
            };
            if let Ok(decl) = lower(w, body.kind) {
                replace(body, src, w, decl);
            }
        }
    }
}

/// A value as written, with its alignment spaces collapsed.
fn words(written: &str) -> String {
    written.split_whitespace().collect::<Vec<_>>().join(" ")
}

fn replace(body: &mut Body, src: &str, w: &WhatIf, mut decl: Declared) {
    let qty = decl.qty;
    let name = quantities::def(qty).name;
    let written: Vec<(Span, String)> = body
        .sources(qty)
        .iter()
        .map(|d| {
            // A limit keeps its relation (`< 0.08`), which its value's place leaves out.
            let relation = match &d.content {
                Content::Measured(m) if m.form == super::Form::UpperLimit => "< ",
                Content::Measured(m) if m.form == super::Form::LowerLimit => "> ",
                _ => "",
            };
            let value = words(src.get(d.value_span.range()).unwrap_or("?"));
            (d.span, format!("{relation}{value}"))
        })
        .collect();
    let instead = match written.as_slice() {
        [] => "not declared in the file".to_string(),
        [(_, one)] => format!("in place of the file's {one}"),
        several => format!(
            "in place of the file's {}",
            several
                .iter()
                .map(|(_, v)| v.as_str())
                .collect::<Vec<_>>()
                .join(", ")
        ),
    };
    // Diagnostics about the value point at the declaration it replaces, else at the body.
    let at = written.first().map_or(body.name_span, |(s, _)| *s);
    decl.name_span = at;
    decl.span = at;
    decl.value_span = at;
    decl.preferred = false;
    decl.set = Some(format!(
        "{}.{name} {} {SET_WORDS}, {instead}",
        body.id,
        match w.value.strip_prefix(['<', '>']) {
            Some(rest) => format!("{} {}", w.value.get(..1).unwrap_or(""), rest.trim_start()),
            None => format!("= {}", w.value),
        }
    ));
    body.declared.retain(|d| d.qty != qty);
    body.further.retain(|d| d.qty != qty);
    body.declared.push(decl);
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn requests_name_a_system_only_when_asked() {
        let w = parse("veyra.radius = 0.80 ± 0.02 Rsun").unwrap();
        assert_eq!((w.system, w.body.as_str()), (None, "veyra"));
        assert_eq!(
            (w.quantity.as_str(), w.value.as_str()),
            ("radius", "0.80 ± 0.02 Rsun")
        );
        let w = parse("My/odd.system/b.mass=1 Mjup").unwrap();
        assert_eq!(w.system.as_deref(), Some("My/odd.system"));
        assert_eq!((w.body.as_str(), w.quantity.as_str()), ("b", "mass"));
        assert!(parse("b.mass").is_err());
        assert!(parse("bmass=1").is_err());
        assert!(parse("b.mass=").is_err());
        assert!(parse("/b.mass=1 Mjup").is_err());
    }

    #[test]
    fn values_are_read_as_a_file_reads_them() {
        let w = parse("b.mass=2 ± 0.1 Mjup").unwrap();
        let d = lower(&w, BodyKind::Planet).unwrap();
        let Content::Measured(m) = d.content else {
            panic!("{d:?}")
        };
        // IAU 2015 B3 nominal Jupiter mass parameter over CODATA 2018 G: 1.89813e27 kg.
        assert!((m.value / 1.898_13e27 - 2.0).abs() < 1e-4, "{m:?}");
        let wrong = lower(&parse("b.mass=2 Rjup").unwrap(), BodyKind::Planet).unwrap_err();
        assert!(wrong.contains("refused"), "{wrong}");
        // The refusal carries the diagnostic's help, which names the fix.
        let comma = lower(&parse("b.mass=1,5 Mjup").unwrap(), BodyKind::Planet).unwrap_err();
        assert!(comma.contains("`1.5`"), "{comma}");
        let bare = lower(&parse("b.mass=1.5").unwrap(), BodyKind::Planet).unwrap_err();
        assert!(bare.contains("add a unit: `mass = 1.5 Mjup`"), "{bare}");
        let unknown = lower(&parse("b.mas=2 Mjup").unwrap(), BodyKind::Planet).unwrap_err();
        assert!(unknown.contains("did you mean 'mass'"), "{unknown}");
        let cited = lower(&parse("b.mass=2 Mjup [x]").unwrap(), BodyKind::Planet).unwrap_err();
        assert!(cited.contains("cites"), "{cited}");
        let two = lower(
            &parse("b.mass=2 Mjup\n radius = 1 Rjup").unwrap(),
            BodyKind::Planet,
        )
        .unwrap_err();
        assert!(two.contains("not one value"), "{two}");
        // A limit, after `=` or as a file writes it; a system's name may hold `<` or `=`.
        for (written, form) in [
            ("b.eccentricity=< 0.1", crate::model::Form::UpperLimit),
            ("b.eccentricity<0.1", crate::model::Form::UpperLimit),
            ("b.eccentricity >0.1", crate::model::Form::LowerLimit),
            ("A<B=C/b.eccentricity< 0.1", crate::model::Form::UpperLimit),
        ] {
            let w = parse(written).unwrap();
            assert_eq!(
                (w.body.as_str(), w.quantity.as_str()),
                ("b", "eccentricity")
            );
            let limit = lower(&w, BodyKind::Planet).unwrap();
            let Content::Measured(m) = limit.content else {
                panic!("{limit:?}")
            };
            assert_eq!((m.value, m.form), (0.1, form), "{written}");
        }
        assert_eq!(
            parse("A<B=C/b.eccentricity< 0.1")
                .unwrap()
                .system
                .as_deref(),
            Some("A<B=C")
        );
        assert!(parse("b.eccentricity 0.1")
            .unwrap_err()
            .contains("or a limit, 'b.eccentricity<0.1'"));
        let t = lower(&parse("s.spectral_type=\"K1V\"").unwrap(), BodyKind::Star).unwrap();
        assert_eq!(t.content, Content::Text("K1V".into()));
        // An expression, with or without names of other values, is refused as one (not as
        // a body missing from the sandbox it is read in).
        for value in ["b.period*2", "s.period", "2 * 3 d"] {
            let e = lower(
                &parse(&format!("b.period={value}")).unwrap(),
                BodyKind::Planet,
            )
            .unwrap_err();
            assert!(e.contains("is an expression"), "{value}: {e}");
            assert!(!e.contains("what-if"), "{value}: {e}");
        }
    }

    #[test]
    fn targets_must_be_one_body() {
        let o = |sys: &str, file: &str| Outline {
            file: file.into(),
            system: sys.into(),
            bodies: vec![("s".into(), BodyKind::Star), ("b".into(), BodyKind::Planet)],
            not_read: vec!["late".into()],
        };
        let all = [o("A", "a.syz"), o("B", "b.syz")];
        let set = |t: &str| check(&[parse(t).unwrap()], &all);
        // A body past its system's bound is declared but not read, not missing.
        let e = set("A/late.mass=1 Msun").unwrap_err();
        assert!(
            e.contains("'late' is declared but not read: system \"A\""),
            "{e}"
        );
        let e = set("b.mass=1 Mjup").unwrap_err();
        assert!(
            e.contains("several systems") && e.contains("'A/b.mass=...'"),
            "{e}"
        );
        assert_eq!(set("A/b.mass=1 Mjup"), Ok(()));
        assert!(set("C/b.mass=1 Mjup")
            .unwrap_err()
            .contains("no system \"C\""));
        assert!(set("A/c.mass=1 Mjup").unwrap_err().contains("no body 'c'"));
        let twice = check(
            &[
                parse("A/b.mass=1 Mjup").unwrap(),
                parse("A/b.mass=2 Mjup").unwrap(),
            ],
            &all,
        );
        assert!(twice.unwrap_err().contains("set twice"));
    }
}
