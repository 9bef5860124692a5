//! Declarations the analysis could not use, with why.
//!
//! A value the file declares can be refused (a wrong unit, a value outside its quantity's
//! range, an unknown quantity, a repeat without its own source, a body declared twice) or
//! come out without a value (an expression with no finite value). Each such refusal is a
//! diagnostic, but a diagnostic can be silenced (`--allow`, `# allow(...)`, `[rules]` in
//! `syzygy.toml`), and then the value would vanish from every output without a word. This
//! module lists every such declaration, with the rule and message that say why, before the
//! silencing applies, so that the outputs can still show it (and whether its finding was
//! silenced).

use crate::ast;
use crate::derive::SystemResult;
use crate::diagnostic::{Diagnostic, Severity};
use crate::model::Model;
use crate::source::Span;
use std::sync::Arc;

/// One declaration the analysis did not use.
#[derive(Debug, Clone, PartialEq)]
pub struct Unused {
    /// The system's index in the model.
    pub system: usize,
    /// The body's index in the system; `None` for a whole body that was not used (a body
    /// declared twice in one system).
    pub body: Option<usize>,
    /// The body's identifier as written.
    pub body_id: String,
    /// The quantity's name as written; `None` for a whole body.
    pub quantity: Option<String>,
    /// The declaration as written, on one line (shortened when long).
    pub text: String,
    pub span: Span,
    /// The rule id that says why, and its message; `None` when no diagnostic says why.
    pub rule: Option<&'static str>,
    pub why: String,
    /// Whether that rule's finding is silenced in this analysis (so it is not reported).
    pub silenced: bool,
    /// Whether a silencing comment in the file did it (else `--allow` or `[rules]`).
    pub in_source: bool,
    /// Where that finding is: the declaration, or the binding its value uses.
    pub why_at: Span,
}

/// The longest declaration text kept, in characters.
const TEXT_CHARS: usize = 80;

/// Every declaration of `ast` the model or the derivation did not use, with the diagnostic
/// (from `diags`, before silencing) that says why. Cheap when nothing was refused: every
/// refusal comes with a diagnostic, so a file without diagnostics is not walked.
pub fn collect(
    src: &str,
    ast: &ast::File,
    model: &Model,
    results: &[Arc<SystemResult>],
    diags: &[Diagnostic],
) -> Vec<Unused> {
    let mut out = Vec::new();
    if diags.is_empty() {
        return out;
    }
    let reasons = Reasons::new(diags);
    for (si, (s, sys)) in ast.systems.iter().zip(&model.systems).enumerate() {
        if s.name_span != sys.name_span {
            continue;
        }
        let result = results.get(si);
        // The model's bodies are the file's, in order, less those declared twice.
        let mut next = 0;
        for b in &s.bodies {
            let Some((bi, body)) = sys
                .bodies
                .get(next)
                .filter(|m| m.span == b.span)
                .map(|m| (next, m))
            else {
                let (rule, why) = reasons.of(b.span);
                out.push(Unused {
                    system: si,
                    body: None,
                    body_id: b.name.name.to_string(),
                    quantity: None,
                    text: format!("{} {}", b.kind.as_str(), b.name.name),
                    span: b.span,
                    rule,
                    why,
                    silenced: false,
                    in_source: false,
                    why_at: b.span,
                });
                continue;
            };
            next += 1;
            let mut used: Vec<u32> = body
                .declared
                .iter()
                .chain(&body.further)
                .map(|d| d.span.start)
                .collect();
            used.sort_unstable();
            let values = result.and_then(|r| r.bodies.get(bi));
            for p in &b.props {
                let kept = used.binary_search(&p.span.start).is_ok();
                // A declaration kept by the model can still end without a value (an
                // expression with none); the first of a quantity is the one that would show.
                let valued = || {
                    body.declared
                        .iter()
                        .find(|d| d.span == p.span)
                        .is_none_or(|d| values.is_none_or(|v| v.get(d.qty).is_some()))
                };
                // Replaced by a value set on the command line (`--set`), whose assumption
                // names every declaration it stands in for: not a declaration refused.
                let replaced = || {
                    crate::quantities::find(b.kind, &p.name.name).is_some_and(|def| {
                        body.declared
                            .iter()
                            .any(|d| d.qty == def.qty && d.set.is_some())
                    })
                };
                if (kept && valued()) || replaced() {
                    continue;
                }
                let (mut rule, mut why) = reasons.of(p.span);
                let mut why_at = p.span;
                if rule.is_none() {
                    // Nothing said on the line itself: a binding it uses has no value.
                    if let Some((name, at)) = failed_binding(p, b, s, &reasons) {
                        (rule, why) = reasons.of(at);
                        why = format!("it uses `{name}`, which has no value: {why}");
                        why_at = at;
                    }
                }
                out.push(Unused {
                    system: si,
                    body: Some(bi),
                    body_id: b.name.name.to_string(),
                    quantity: Some(p.name.name.to_string()),
                    text: one_line(src.get(p.span.range()).unwrap_or_default()),
                    span: p.span,
                    rule,
                    why,
                    silenced: false,
                    in_source: false,
                    why_at,
                });
            }
        }
    }
    out
}

/// The first binding (`let`, of the body or the system) that the value of `p` names and that
/// a diagnostic says has no value: its name and the span of its declaration.
fn failed_binding<'a>(
    p: &'a ast::Prop,
    body: &'a ast::BodyDecl,
    sys: &'a ast::SystemDecl,
    reasons: &Reasons,
) -> Option<(&'a str, Span)> {
    let ast::PropValue::Expr(e) = &p.value else {
        return None;
    };
    let mut names = Vec::new();
    let mut stack = vec![e];
    // Bounded by the expression's size; the parser bounds its depth.
    while let Some(x) = stack.pop() {
        match &x.kind {
            ast::ExprKind::Name(id) => names.push(id.name.as_str()),
            ast::ExprKind::Neg(a) => stack.push(a),
            ast::ExprKind::Binary(_, a, b) | ast::ExprKind::Pow(a, b) => {
                stack.push(a);
                stack.push(b);
            }
            ast::ExprKind::Call(_, args) => stack.extend(args.iter()),
            _ => {}
        }
    }
    names.into_iter().find_map(|name| {
        let l = body
            .lets
            .iter()
            .chain(&sys.lets)
            .find(|l| l.name.name == name)?;
        reasons.of(l.span).0.map(|_| (name, l.span))
    })
}

/// Mark those of `unused` whose finding is not among `shown` (the diagnostics after
/// silencing and severity overrides) as silenced.
pub fn mark_silenced(unused: &mut [Unused], shown: &[Diagnostic]) {
    missing_from(unused, shown, |u, missing| u.silenced = missing);
}

/// Mark those of `unused` whose finding is not among `after_comments` (the diagnostics after
/// the silencing comments, before the settings' overrides) as silenced in the source.
pub fn mark_in_source(unused: &mut [Unused], after_comments: &[Diagnostic]) {
    missing_from(unused, after_comments, |u, missing| u.in_source = missing);
}

/// Call `set` with each of `unused` and whether its finding is missing from `diags`.
fn missing_from(unused: &mut [Unused], shown: &[Diagnostic], set: impl Fn(&mut Unused, bool)) {
    if unused.is_empty() {
        return;
    }
    let mut places: Vec<(u32, u32, &str)> = shown
        .iter()
        .map(|d| (d.span.start, d.span.end, d.rule.id()))
        .collect();
    places.sort_unstable();
    for u in unused {
        let at = u.why_at;
        let from = places.partition_point(|p| p.0 < at.start);
        let inside = places
            .get(from..)
            .unwrap_or_default()
            .iter()
            .take_while(|p| p.0 < at.end.max(at.start + 1))
            .filter(|p| p.1 <= at.end);
        let mut inside = inside;
        let missing = u.rule.is_some_and(|id| !inside.any(|p| p.2 == id));
        set(u, missing);
    }
}

/// The diagnostics by where they start, to find the one inside a declaration.
struct Reasons<'a> {
    by_start: Vec<&'a Diagnostic>,
}

impl<'a> Reasons<'a> {
    fn new(diags: &'a [Diagnostic]) -> Reasons<'a> {
        let mut by_start: Vec<&Diagnostic> = diags.iter().collect();
        by_start.sort_by_key(|d| (d.span.start, d.span.end));
        Reasons { by_start }
    }

    /// The rule and message of the diagnostic inside `span` that says why it was not used:
    /// the first error there, else the first diagnostic.
    fn of(&self, span: Span) -> (Option<&'static str>, String) {
        let from = self.by_start.partition_point(|d| d.span.start < span.start);
        let inside = || {
            self.by_start
                .get(from..)
                .unwrap_or_default()
                .iter()
                .take_while(|d| d.span.start < span.end.max(span.start + 1))
                .filter(|d| d.span.file == span.file && d.span.end <= span.end)
        };
        match inside()
            .find(|d| d.severity == Severity::Error)
            .or_else(|| inside().next())
        {
            Some(d) => (Some(d.rule.id()), d.message.clone()),
            None => (None, "it could not be used".to_string()),
        }
    }
}

/// `text` on one line, its runs of white space made single spaces, shortened to
/// [`TEXT_CHARS`] characters with an ellipsis.
fn one_line(text: &str) -> String {
    let words: Vec<&str> = text.split_whitespace().collect();
    let line = words.join(" ");
    if line.chars().count() <= TEXT_CHARS {
        return line;
    }
    let mut short: String = line.chars().take(TEXT_CHARS - 1).collect();
    short.push('…');
    short
}

#[cfg(test)]
mod tests {
    use crate::derive::{Options, Propagation};
    use crate::diagnostic::Rule;
    use crate::settings::Settings;
    use crate::source::FileId;
    use crate::{analyze, Analysis};

    fn run(src: &str, allow: &[Rule]) -> Analysis {
        let settings = Settings {
            options: Options {
                propagation: Propagation::Linear,
                ..Options::default()
            },
            overrides: allow.iter().map(|r| (*r, None)).collect(),
            ..Settings::default()
        };
        analyze(FileId(0), src, &settings)
    }

    /// (body, quantity, rule, silenced) of each declaration not used.
    fn listed(a: &Analysis) -> Vec<(String, Option<String>, Option<&'static str>, bool)> {
        a.unused
            .iter()
            .map(|u| (u.body_id.clone(), u.quantity.clone(), u.rule, u.silenced))
            .collect()
    }

    const FILE: &str = "ref a \"Invented A\"
system \"Tessaly\" {
  star tess {
    mass = 0.9 ± 0.03 Msun
    radius = -3 Rsun
    colour = 3
    teff = sqrt(-1) * 5000 K
  }
  planet b orbits tess {
    period = 7.3 ± 0.01 d [a]
    period = 7.5 ± 0.01 d [a]
    rv_amplitude = 30 ± 3 km # allow(unit-mismatch): testing
  }
  planet b orbits tess { period = 9 d }
}
";

    #[test]
    fn every_refused_declaration_is_listed_with_its_rule() {
        let a = run(FILE, &[]);
        let s = |x: &str| x.to_string();
        assert_eq!(
            listed(&a),
            vec![
                (s("tess"), Some(s("radius")), Some("out-of-range"), false),
                (
                    s("tess"),
                    Some(s("colour")),
                    Some("unknown-quantity"),
                    false
                ),
                (s("tess"), Some(s("teff")), Some("invalid-value"), false),
                (s("b"), Some(s("period")), Some("duplicate"), false),
                // Silenced by its comment: still listed, and said to be silenced.
                (s("b"), Some(s("rv_amplitude")), Some("unit-mismatch"), true),
                (s("b"), None, Some("duplicate"), false),
            ]
        );
        let radius = a.unused.first().unwrap();
        assert_eq!(radius.text, "radius = -3 Rsun");
        assert!(radius.why.contains("greater than 0"), "{}", radius.why);
        assert_eq!(a.unused.last().unwrap().text, "planet b");
    }

    #[test]
    fn silencing_a_rule_hides_the_finding_not_the_declaration() {
        let a = run(
            FILE,
            &[Rule::OutOfRange, Rule::Duplicate, Rule::InvalidValue],
        );
        assert!(a.diagnostics.iter().all(|d| !matches!(
            d.rule,
            Rule::OutOfRange | Rule::Duplicate | Rule::InvalidValue
        )));
        let silenced: Vec<_> = listed(&a).into_iter().filter(|u| u.3).collect();
        assert_eq!(silenced.len(), 5, "{:?}", listed(&a));
        assert_eq!(a.unused.len(), 6);
        // The text output lists each, and says it is silenced.
        let mut db = crate::source::MemoryDb::new();
        assert_eq!(db.add("t.syz", FILE), a.file);
        let text = crate::report::eval_text(&a, &db);
        assert_eq!(text.matches("not used: ").count(), 6, "{text}");
        assert!(text
            .contains("not used: `radius = -3 Rsun` (line 5): [out-of-range] the value -3 Rsun"));
        assert_eq!(text.matches("this finding is silenced").count(), 5);
    }

    #[test]
    fn a_default_standing_in_for_a_refused_value_says_so() {
        let src = "system \"T\" {\n star s { mass = 0.9 ± 0.03 Msun }\n planet b orbits s {\n  period = 6.1 ± 0.01 d\n  rv_amplitude = 30 ± 3 m/s\n  eccentricity = 1.5 # allow(out-of-range): testing\n }\n}\n";
        let a = run(src, &[]);
        let key = (1, crate::quantities::Qty::Eccentricity);
        let text = crate::report::explain_text(&a, 0, key).unwrap();
        assert!(
            text.starts_with("note: `eccentricity = 1.5` is declared but not used: [out-of-range]"),
            "{text}"
        );
        assert!(text.contains("this finding is silenced"), "{text}");
        let hover =
            crate::ide::hover::quantity(&a, 0, "b", key.1, &crate::ide::Method::default()).unwrap();
        assert!(
            hover.contains("**not used:** `eccentricity = 1.5`"),
            "{hover}"
        );
    }

    #[test]
    fn a_value_refused_for_its_binding_names_the_binding_and_its_rule() {
        let src = "system \"P\" {\n  let bad = 1 / 0\n  star s { mass = 0.9 ± 0.03 Msun }\n  planet b orbits s {\n    period = 6.1 ± 0.01 d\n    albedo = bad\n  }\n}\n";
        let a = run(src, &[]);
        let u = a
            .unused
            .iter()
            .find(|u| u.quantity.as_deref() == Some("albedo"))
            .unwrap();
        assert_eq!(
            (u.rule, u.silenced),
            (Some("invalid-value"), false),
            "{u:?}"
        );
        assert!(
            u.why.starts_with("it uses `bad`, which has no value: "),
            "{}",
            u.why
        );
        let a = run(src, &[Rule::InvalidValue]);
        let u = a
            .unused
            .iter()
            .find(|u| u.quantity.as_deref() == Some("albedo"))
            .unwrap();
        assert!(u.silenced, "{u:?}");
    }

    #[test]
    fn a_clean_file_lists_nothing() {
        let a = run(
            "system \"S\" { star s { mass = 1 Msun }\n planet p orbits s { period = 3 d } }",
            &[],
        );
        assert!(a.unused.is_empty(), "{:?}", a.unused);
    }
}

#[cfg(test)]
mod tests_set {
    use crate::settings::Settings;
    use crate::source::FileId;

    /// Declarations replaced by a value set on the command line are not listed as refused,
    /// whether or not the file has an unrelated error (they were listed as "it could not be
    /// used" when it had one); the set value's assumption names them.
    #[test]
    fn declarations_replaced_by_set_are_not_refused() {
        let src = "ref a \"Avrel 2030 (invented)\"\nref b \"Brisko 2031 (invented)\"\nsystem \"Yarrow\" {\n  star y { mass = 0.9 ± 0.04 Msun; radius = 0.9 ± 0.03 Rsun }\n  planet b orbits y {\n    period = 5.0 ± 0.001 d [a]\n    period = 5.01 ± 0.01 d [b]\n    radius_ratio = 0.10 ± 0.002\n    transit_depth = 1.30 ± 0.03 %\n  }\n}\n";
        let settings = Settings {
            what_if: vec![crate::model::what_if::parse("b.period=5.5 ± 0.1 d").unwrap()],
            ..Settings::linear()
        };
        let a = crate::analyze(FileId(0), src, &settings);
        // The radius ratio and depth disagree: the file has a finding of its own.
        assert!(!a.diagnostics.is_empty());
        assert!(
            !a.unused
                .iter()
                .any(|u| u.quantity.as_deref() == Some("period")),
            "{:?}",
            a.unused
        );
        let period = a.results[0].bodies[1]
            .get(crate::quantities::Qty::Period)
            .cloned()
            .unwrap();
        assert!(
            period
                .assumptions
                .iter()
                .any(|s| s.contains("in place of the file's 5.0 ± 0.001 d, 5.01 ± 0.01 d")),
            "{:?}",
            period.assumptions
        );
    }
}
