use super::*;
use std::cell::Cell;

thread_local! {
    /// How many values `plain_measurement` has read on this thread (each test has its own).
    static PLAIN_MEASUREMENTS: Cell<usize> = const { Cell::new(0) };
}

/// Called by `plain_measurement` each time it reads a value itself (test builds only).
pub(super) fn count_plain_measurement() {
    PLAIN_MEASUREMENTS.with(|n| n.set(n.get() + 1));
}

/// How many values of `src` the fast path read, rather than the chumsky grammar.
fn read_directly(src: &str) -> usize {
    let before = PLAIN_MEASUREMENTS.with(Cell::get);
    let _ = parse(FileId(0), src);
    PLAIN_MEASUREMENTS.with(Cell::get) - before
}
use crate::lexer::lex;

fn parse_ok(src: &str) -> File {
    let p = parse(FileId(0), src);
    assert!(
        p.diagnostics.is_empty(),
        "unexpected diagnostics: {:#?}",
        p.diagnostics
    );
    p.file
}

fn messages(src: &str) -> Vec<String> {
    parse(FileId(0), src)
        .diagnostics
        .into_iter()
        .map(|d| d.message)
        .collect()
}

const DEMO: &str = r#"
ref rv1 "Demo radial-velocity campaign (invented data)"
system "Veyra" {
  star veyra {
    mass     = 0.93 ± 0.04 Msun      [rv1]
    radius   = 0.88 +0.03/-0.02 Rsun [rv1, ph1]
    teff     = 5310 +- 80 K
    spectral_type = "K0V"
  }
  planet b orbits veyra {
    period = 3.52474 ± 0.00002 d; eccentricity < 0.08
    albedo = 0.3 assumed
    let twice = 2 * b.period
  }
}
"#;

#[test]
fn demo_parses_with_all_measurement_forms() {
    let f = parse_ok(DEMO);
    assert_eq!(f.refs.len(), 1);
    let sys = &f.systems[0];
    assert_eq!(sys.name, "Veyra");
    let star = &sys.bodies[0];
    assert_eq!(star.props.len(), 4);
    let ExprKind::Literal(m) = &match &star.props[0].value {
        PropValue::Expr(e) => e.clone(),
        PropValue::Text(..) => panic!("text"),
    }
    .kind
    else {
        panic!("not a literal")
    };
    assert_eq!(m.value, 0.93);
    assert!(matches!(m.uncertainty, Uncertainty::Symmetric(s, _) if s == 0.04));
    assert_eq!(
        m.unit.as_ref().map(|u| u.factors[0].symbol.name.as_str()),
        Some("Msun")
    );
    assert_eq!(star.props[1].citations.len(), 2);
    let PropValue::Expr(r) = &star.props[1].value else {
        panic!()
    };
    let ExprKind::Literal(r) = &r.kind else {
        panic!()
    };
    assert!(
        matches!(r.uncertainty, Uncertainty::Asymmetric { plus, minus, .. } if plus == 0.03 && minus == 0.02)
    );
    assert!(matches!(&star.props[3].value, PropValue::Text(t, _) if t == "K0V"));
    let planet = &sys.bodies[1];
    assert_eq!(
        planet.orbits.as_ref().map(|o| o.name.as_str()),
        Some("veyra")
    );
    assert_eq!(planet.props[1].relation, Relation::Below);
    assert!(planet.props[2].assumed.is_some());
    assert_eq!(planet.lets.len(), 1);
}

#[test]
fn unit_products_and_powers() {
    let f = parse_ok("system \"S\" { star s { density = 1.4 g/cm^3; x = 3 km s^-1 } }");
    let props = &f.systems[0].bodies[0].props;
    let PropValue::Expr(e) = &props[0].value else {
        panic!()
    };
    let ExprKind::Literal(l) = &e.kind else {
        panic!()
    };
    let u = l.unit.as_ref().map(|u| {
        u.factors
            .iter()
            .map(|f| (f.symbol.name.clone(), f.exponent))
            .collect::<Vec<_>>()
    });
    assert_eq!(u, Some(vec![("g".into(), 1), ("cm".into(), -3)]));
    let PropValue::Expr(e) = &props[1].value else {
        panic!()
    };
    let ExprKind::Literal(l) = &e.kind else {
        panic!()
    };
    assert_eq!(l.unit.as_ref().map(|u| u.factors[1].exponent), Some(-1));
}

#[test]
fn precedence_and_right_associative_power() {
    let f = parse_ok("system \"S\" { let x = 1 + 2 * 3 ^ 2 ^ 0.5 }");
    let e = &f.systems[0].lets[0].value;
    let ExprKind::Binary(BinOp::Add, _, rhs) = &e.kind else {
        panic!("{e:?}")
    };
    let ExprKind::Binary(BinOp::Mul, _, pow) = &rhs.kind else {
        panic!()
    };
    let ExprKind::Pow(_, exp) = &pow.kind else {
        panic!()
    };
    assert!(matches!(exp.kind, ExprKind::Pow(..)));
}

#[test]
fn one_mistake_does_not_hide_the_rest() {
    let src =
        "system \"S\" {\n star s {\n mass = = 1 Msun\n radius 1 Rsun\n teff = 5000 K\n }\n}\n";
    let p = parse(FileId(0), src);
    assert_eq!(p.diagnostics.len(), 2, "{:#?}", p.diagnostics);
    assert_eq!(
        p.file.systems[0].bodies[0]
            .props
            .last()
            .map(|p| p.name.name.as_str()),
        Some("teff")
    );
}

#[test]
fn missing_brace_is_reported_at_the_next_body() {
    let src =
        "system \"S\" {\n star s {\n mass = 1 Msun\n planet b orbits s {\n period = 3 d\n }\n}\n";
    let p = parse(FileId(0), src);
    assert!(p
        .diagnostics
        .iter()
        .any(|d| d.message.contains("not closed")));
    assert_eq!(p.file.systems[0].bodies.len(), 2);
}

#[test]
fn values_longer_than_the_token_limit_are_refused_whole() {
    // Each of these once overflowed the stack of a later stage (a tree as deep as the value
    // is long); now the value becomes one error node and the rest of the file goes on.
    for value in [
        "-".repeat(3000) + "1 Msun",
        "1".to_string() + &" * 1".repeat(1000) + " Msun",
        "1 Msun".to_string() + &"^1".repeat(1000),
        "1".to_string() + &" + 1".repeat(1000),
    ] {
        let src = format!("system \"S\" {{ star s {{ mass = {value}\n radius = 1 Rsun }} }}");
        let p = parse(FileId(0), &src);
        let long: Vec<&str> = p
            .diagnostics
            .iter()
            .map(|d| d.message.as_str())
            .filter(|m| m.contains("tokens long; the limit is 256"))
            .collect();
        assert_eq!(long.len(), 1, "{:?}", p.diagnostics);
        let props = &p.file.systems[0].bodies[0].props;
        assert_eq!(props.len(), 2, "the next property still parses");
        assert!(matches!(
            &props[0].value,
            PropValue::Expr(Expr {
                kind: ExprKind::Error,
                ..
            })
        ));
    }
    // At the limit a value still parses.
    let value = "1".to_string() + &" + 1".repeat(127);
    let src = format!("system \"S\" {{ star s {{ mass = {value} }} }}");
    assert!(parse(FileId(0), &src).diagnostics.is_empty());
}

#[test]
fn hostile_inputs_never_panic() {
    let deep = format!(
        "system \"S\" {{ let x = {}1{} }}",
        "(".repeat(5000),
        ")".repeat(5000)
    );
    assert!(messages(&deep).iter().any(|m| m.contains("nested")));
    for src in [
        "",
        "\u{0}\u{1}\u{2}",
        "system \"open",
        "system",
        "system \"S\" {",
        "system \"S\" { star s { mass = 1e999 Msun } }",
        "}}}}{{{{",
        "ref",
        "system \"S\" { star s { mass = 1 ± } }",
        "system \"S\" { star s { mass = (1 + } }",
        "system \"S\" { star s { mass = 1 Msun^x } }",
    ] {
        let _ = parse(FileId(0), src);
    }
}

#[test]
fn unterminated_string_is_named() {
    assert!(messages("ref a \"never closed\n")
        .iter()
        .any(|m| m.contains("unterminated")));
}

#[test]
fn direct_reading_of_plain_measurements_matches_the_grammar() {
    // The fast path and the chumsky grammar must build the same tree.
    for value in [
        "0.93 ± 0.04 Msun [rv1]",
        "0.88 +0.03/-0.02 Rsun [a, b,]",
        "1.4 g/cm^3",
        "3 km s^-1 assumed",
        "42 m^2 kg^-1/s^3",
        "\"K0V\" [x]",
        "5310 +- 80 K assumed [p]",
        "7",
        "6.2e-3 %",
        "0.40 ± 0.05 ± 0.02 Mjup [a]",
        "1 ± 0.1 ± 0.2 ± 0.3",
    ] {
        let src = format!("system \"S\" {{ star s {{ x = {value} }} }}");
        assert_eq!(read_directly(&src), 1, "{value}: the fast path declined it");
        let fast = parse(FileId(0), &src);
        assert!(
            fast.diagnostics.is_empty(),
            "{value}: {:?}",
            fast.diagnostics
        );
        // Force the grammar by wrapping the value so the fast path declines, then compare
        // the inner parts.
        let file = FileId(0);
        let toks: Vec<Token> = lex(&src)
            .into_iter()
            .filter(|t| t.kind != Tok::Comment)
            .collect();
        let start = toks.iter().position(|t| t.kind == Tok::Eq).unwrap() + 1;
        let end = toks.iter().rposition(|t| t.kind == Tok::RBrace).unwrap() - 1;
        let slice = &toks[start..end];
        let grammar = value_parser(&src, file);
        let eoi = slice.last().unwrap().end..slice.last().unwrap().end;
        let (out, errs) = grammar.parse_recovery(Stream::from_iter(
            eoi,
            slice.iter().map(|t| (t.kind, t.start..t.end)),
        ));
        assert!(errs.is_empty(), "{value}: {errs:?}");
        let out = out.unwrap();
        let prop = &fast.file.systems[0].bodies[0].props[0];
        assert_eq!(prop.value, out.value, "{value}");
        assert_eq!(prop.assumed, out.assumed, "{value}");
        assert_eq!(prop.citations, out.citations, "{value}");
    }
}

#[test]
fn the_fast_path_leaves_expressions_and_malformed_values_to_the_grammar() {
    for value in [
        "2 * 3 Msun",
        "s.mass",
        "(1.0) Msun",
        "-1 Msun",
        "sqrt(4) Rsun",
        "1 ±",
        "1 Msun^x",
        "1 Msun [",
        "1 Msun []",
        "\"K0V\" + 1",
    ] {
        let src = format!("system \"S\" {{ star s {{ x = {value} }} }}");
        assert_eq!(read_directly(&src), 0, "{value}: the fast path read it");
    }
}

#[test]
fn a_run_of_one_error_on_a_line_is_reported_once() {
    let src = format!("{}{}\n}}\n", "{".repeat(1000), "}".repeat(1000));
    let p = parse(FileId(0), &src);
    let msgs: Vec<&str> = p.diagnostics.iter().map(|d| d.message.as_str()).collect();
    assert_eq!(
        msgs,
        [
            "expected 'system' or 'ref', found '{'",
            "unmatched '}' (999 times in a row on this line)",
            "unmatched '}'",
        ]
    );
    // The merged error spans the whole run of braces.
    let run = &p.diagnostics[1].span;
    assert_eq!((run.start, run.end), (1001, 2000));
}

#[test]
fn old_mac_line_ends_separate_properties() {
    // Lone carriage returns end lines: two properties and a comment, not one comment line.
    let src =
        "# invented\rsystem \"S\" {\r  star s {\r    mass = 1 Msun\r    radius = 1 Rsun\r  }\r}\r";
    let f = parse_ok(src);
    assert_eq!(f.comments.len(), 1);
    assert_eq!(f.systems[0].bodies[0].props.len(), 2);
    let bad = "system \"S\" {\r  star s {\r    mass = = 1 Msun\r  }\r}\r";
    assert_eq!(messages(bad).len(), 1, "{:?}", messages(bad));
}

#[test]
fn parsing_stops_after_too_many_syntax_errors() {
    for src in [
        "a\n".repeat(5000),
        format!(
            "system \"S\" {{\n  star s {{\n{}",
            "    = 1 Msun\n".repeat(5000)
        ),
    ] {
        let p = parse(FileId(0), &src);
        assert_eq!(p.diagnostics.len(), MAX_SYNTAX_ERRORS + 1, "{src:.40}");
        let last = p.diagnostics.last().unwrap();
        assert!(
            last.message.contains("not read past this point"),
            "{}",
            last.message
        );
        // It stopped on the line after the last error counted.
        let line = |offset: u32| src[..offset as usize].matches('\n').count();
        let counted = &p.diagnostics[MAX_SYNTAX_ERRORS - 1];
        assert_eq!(line(last.span.start), line(counted.span.start) + 1);
        assert!(!p
            .diagnostics
            .iter()
            .any(|d| d.message.contains("never closed")));
    }
    // Runs of ';' cost one token, and a run of '}' is one error, however long.
    let p = parse(
        FileId(0),
        &format!("{}\n{}\n", ";".repeat(100_000), "}".repeat(5000)),
    );
    assert_eq!(p.diagnostics.len(), 1);
}

#[test]
fn several_symmetric_uncertainties_are_kept_as_written() {
    let f = parse_ok("system \"S\" { star s { mass = 0.40 ± 0.05 ± 0.02 Msun } }");
    let PropValue::Expr(e) = &f.systems[0].bodies[0].props[0].value else {
        panic!("not an expression");
    };
    let ExprKind::Literal(l) = &e.kind else {
        panic!("not a literal: {e:?}");
    };
    assert!(matches!(&l.uncertainty, Uncertainty::Quadrature(p, _) if p[..] == [0.05, 0.02]));
}

fn help_of(value: &str) -> Option<String> {
    let src = format!("system \"S\" {{ star s {{ x = {value} }} }}");
    let p = parse(FileId(0), &src);
    assert_eq!(p.diagnostics.len(), 1, "{value}: {:?}", p.diagnostics);
    p.diagnostics.into_iter().next().and_then(|d| d.help)
}

#[test]
fn swapped_asymmetric_uncertainty_gets_the_right_order_in_its_help() {
    let h = help_of("1.1 -0.03/+0.05 Rjup").unwrap();
    assert!(h.contains("`+0.05/-0.03`"), "{h}");
    assert!(h.contains("+above/-below"), "{h}");
}

#[test]
fn a_unit_before_the_uncertainty_gets_the_value_rewritten() {
    let h = help_of("1.2 Mjup ± 0.1").unwrap();
    assert!(h.contains("`1.2 ± 0.1 Mjup`"), "{h}");
    let h = help_of("1.2 km/s ± 0.1").unwrap();
    assert!(h.contains("`1.2 ± 0.1 km/s`"), "{h}");
    // A unit after each part: both parts before the one unit.
    let h = help_of("0.4 ± 0.05 Mjup ± 0.02 Mjup").unwrap();
    assert!(h.contains("`0.4 ± 0.05 ± 0.02 Mjup`"), "{h}");
    assert!(h.contains("quadrature"), "{h}");
    // A '±' elsewhere gets no such help.
    assert!(!help_of("± 0.1").unwrap_or_default().contains("goes after"));
}

#[test]
fn plus_slash_minus_and_a_decimal_comma_get_the_accepted_spelling() {
    let h = help_of("1.07 +/- 0.03 Msun").unwrap();
    assert!(h.contains("`+-`") && h.contains("`±`"), "{h}");
    assert!(h.contains("`1.07 ± 0.03`"), "the user's own numbers: {h}");
    let h = help_of("12,5 d").unwrap();
    assert!(h.contains("`12.5`"), "{h}");
    // Every decimal comma of the value is mended by the one fix (only the first was).
    let src = "system \"S\" { star s { teff = 5727,3 ± 10,2 K } }";
    let p = parse(FileId(0), src);
    let fix = p.diagnostics[0].fix.clone().expect("a fix");
    let mended = format!(
        "{}{}{}",
        &src[..fix.span.start as usize],
        fix.text,
        &src[fix.span.end as usize..]
    );
    assert_eq!(mended, "system \"S\" { star s { teff = 5727.3 ± 10.2 K } }");
    assert!(p.diagnostics[0].help.as_deref().unwrap().contains("all 2"));
    // A comma or a slash elsewhere gets neither help.
    assert!(!help_of("12, 5 d").unwrap_or_default().contains("decimal"));
    assert!(!help_of("1 + / 2").unwrap_or_default().contains("symmetric"));
}

#[test]
fn uncertainties_in_other_notations_are_errors_with_the_spelling_taken() {
    // Signs attached to their numbers: uncertainties, never silently a sum.
    let h = help_of("0.4 +0.1 -0.05").unwrap();
    assert!(h.contains("`0.4 +0.1/-0.05`"), "{h}");
    let h = help_of("1.1 -0.04 +0.05 Rsun").unwrap();
    assert!(h.contains("`1.1 +0.05/-0.04`"), "{h}");
    let h = help_of("-0.4 +0.1 -0.05").unwrap();
    assert!(h.contains("`-0.4 +0.1/-0.05`"), "{h}");
    // The concise notation, in the value's decimals.
    let h = help_of("1.1(5) Rsun").unwrap();
    assert!(h.contains("`1.1 ± 0.5`"), "{h}");
    let h = help_of("2459000.1234(12) BJD_TDB").unwrap();
    assert!(h.contains("`2459000.1234 ± 0.0012`"), "{h}");
    // An asymmetric uncertainty in parentheses, in either order.
    let h = help_of("92 (+6/-5) m/s").unwrap();
    assert!(h.contains("`92 +6/-5`"), "{h}");
    let h = help_of("92 (-5/+6) m/s").unwrap();
    assert!(h.contains("`92 +6/-5`"), "{h}");
    // As typeset in a paper, in either order, spaces or not: one error, and the braces do
    // not break the blocks around them (the one error is all `help_of` allows).
    for value in [
        "92^{+6}_{-5} m/s",
        "92_{-5}^{+6} m/s",
        "92 ^{ +6 } _{ -5 }",
        "92^{6}_{-5}",
    ] {
        let h = help_of(value).unwrap_or_default();
        assert!(h.contains("`92 +6/-5`"), "{value}: {h}");
    }
    let src =
        "system \"S\" {\n star s {\n  mass = 1.1^{+0.1}_{-0.2} Msun\n  radius = 1 Rsun\n }\n}\n";
    let p = parse(FileId(0), src);
    assert_eq!(p.diagnostics.len(), 1, "{:?}", p.diagnostics);
    let props = &p.file.systems[0].bodies[0].props;
    assert_eq!(props.len(), 2, "the property after it is read: {props:?}");
    // One signed number after the value: a lost `±`, not a difference (0.35) or a sum.
    for (value, help) in [
        ("0.4 -0.05", "`0.4 ± 0.05`"),
        ("0.4 +0.05 Rsun", "`0.4 ± 0.05`"),
        ("0.4 \u{2212}0.05", "`0.4 ± 0.05`"),
        ("-0.4 -0.05", "`-0.4 ± 0.05`"),
    ] {
        let h = help_of(value).unwrap_or_default();
        assert!(h.contains(help), "{value}: {h}");
    }
    // Two signed numbers of one sign, and a signed number after `± u`: the same slip.
    for (value, says) in [
        ("0.4 -0.05 -0.1", "reads as arithmetic"),
        ("0.4 +0.05 +0.1", "reads as arithmetic"),
        (
            "0.3 ± 0.05 -0.01",
            "after the uncertainty reads as a difference",
        ),
        ("0.3 ±0.05 +0.01", "after the uncertainty reads as a sum"),
        // After an asymmetric one too (it was silently a difference: 0.1 +0.1/-0.1).
        (
            "0.3 +0.1/-0.1 -0.2",
            "after the uncertainty reads as a difference",
        ),
        ("3 +0.1/-0.1 +0.5 d", "after the uncertainty reads as a sum"),
    ] {
        let src = format!("system \"S\" {{ star s {{ x = {value} }} }}");
        let d = parse(FileId(0), &src).diagnostics;
        assert!(
            d.len() == 1 && d[0].message.contains(says),
            "{value}: {d:?}"
        );
    }
    // A sum written as one is still a sum, and a call is still a call; so is a signed
    // number followed by an operator (spaced `+` and `-` included), or glued to the value.
    for value in [
        "0.4 + 0.1 - 0.05",
        "0.4 + 0.1",
        "sqrt(0.25)",
        "0.4 -0.05 * 2",
        "0.4-0.05",
        "0.3 -0.05 + 0.01",
        "0.3 -0.05 - 0.01",
        "0.3 ± 0.05 - 0.01",
        "0.3 ± 0.05 ± 0.01",
    ] {
        let src = format!("system \"S\" {{ star s {{ x = {value} }} }}");
        assert!(parse(FileId(0), &src).diagnostics.is_empty(), "{value}");
    }
}

#[test]
fn an_exponent_without_a_caret_gets_the_unit_rewritten() {
    let h = help_of("55 ± 2 km s-1").unwrap();
    assert!(h.contains("`s^-1`"), "{h}");
    let h = help_of("1.33 g cm-3").unwrap();
    assert!(h.contains("`cm^-3`"), "{h}");
    // `ms-1` means metres per second: `ms^-1` (per millisecond) would be another error.
    let h = help_of("45 ± 3 ms-1").unwrap();
    assert_eq!(
        h,
        "for metres per second write `m/s` (`ms` is the millisecond)"
    );
    // A subtraction of a name that is no unit, or with spaces, is left to the grammar.
    for value in ["2 * b.mass - 1", "x-1", "3 km - 1 km", "d-1"] {
        let src = format!("system \"S\" {{ star s {{ x = {value} }} }}");
        let p = parse(FileId(0), &src);
        assert!(
            p.diagnostics
                .iter()
                .all(|d| !d.message.contains("reads as a subtraction")),
            "{value}: {:?}",
            p.diagnostics
        );
    }
}

#[test]
fn concise_uncertainties_keep_the_value_decimals() {
    // `value(digits)`: the digits count in the value's last places (common practice).
    assert_eq!(
        super::notation::concise_uncertainty("1.1", "5").as_deref(),
        Some("0.5")
    );
    assert_eq!(
        super::notation::concise_uncertainty("1.1", "15").as_deref(),
        Some("1.5")
    );
    assert_eq!(
        super::notation::concise_uncertainty("152", "3").as_deref(),
        Some("3")
    );
    assert_eq!(
        super::notation::concise_uncertainty("0.00120", "7").as_deref(),
        Some("0.00007")
    );
    assert_eq!(super::notation::concise_uncertainty("1e3", "5"), None);
}

#[test]
fn two_properties_on_one_line_get_help_to_split_them() {
    let h = help_of("1 Msun radius = 1 Rsun").unwrap();
    assert!(
        h.contains("one property per line") && h.contains("`radius`"),
        "{h}"
    );
    // An '=' elsewhere gets no such help.
    assert!(!help_of("1 Msun = 2")
        .unwrap_or_default()
        .contains("one property per line"));
}

#[test]
fn a_reference_inside_a_system_is_told_where_it_goes() {
    let diags = parse(
        FileId(0),
        "system \"S\" {\n  ref disc \"An invented paper\"\n  star s { mass = 1 Msun }\n}\n",
    )
    .diagnostics;
    let d = diags
        .iter()
        .find(|d| d.message.contains("top of the file"))
        .unwrap_or_else(|| panic!("{diags:?}"));
    assert!(d
        .help
        .as_deref()
        .unwrap_or("")
        .contains("above the first `system`"));
    // The rest of the system is still read.
    assert_eq!(diags.len(), 1, "{diags:?}");
}

/// Found by the long fuzz run: a planet without `orbits` whose `{` stood on the next line
/// was accepted without a word, so formatting it (which puts the `{` on the name's line)
/// turned a clean file into one with a syntax error. Both layouts now say what is missing.
#[test]
fn a_planet_without_its_star_is_an_error_wherever_its_brace_is() {
    for src in [
        "system \"A\" {\n  star s { mass = 1 Msun }\n  planet p {\n    period = 3 d\n  }\n}\n",
        "system \"A\" {\n  star s { mass = 1 Msun }\n  planet p\n{\n    period = 3 d\n  }\n}\n",
        "system \"A\" {\n  star s { mass = 1 Msun }\n  planet p\n\n  {\n    period = 3 d\n  }\n}\n",
    ] {
        assert_eq!(
            messages(src),
            vec!["a planet must say which star it orbits".to_string()],
            "{src}"
        );
    }
    // With its star named, the brace may still stand on the next line.
    assert!(messages(
        "system \"A\" {\n  star s { mass = 1 Msun }\n  planet p orbits s\n{\n    period = 3 d\n  }\n}\n"
    )
    .is_empty());
}

#[test]
fn ratios_and_bracketed_names_get_the_quantity_meant() {
    let help = |line: &str| {
        let src = format!("system \"S\" {{\n star s {{\n  {line}\n }}\n}}\n");
        let p = parse(FileId(0), &src);
        p.diagnostics
            .into_iter()
            .find_map(|d| d.help)
            .unwrap_or_default()
    };
    assert!(help("Rp/Rs = 0.108 ± 0.001").contains("`radius_ratio = VALUE`"));
    assert!(help("Rp/R* = 0.108").contains("`radius_ratio = VALUE`"));
    assert!(help("a/Rs = 10.1").contains("`scaled_semi_major_axis = VALUE`"));
    assert!(help("[Fe/H] = 0.12 ± 0.05").contains("`metallicity = VALUE dex`"));
    // Another fraction keeps the generic help.
    assert!(help("x/y = 1").contains("write `x = VALUE UNIT`"));
}

#[test]
fn a_mark_written_twice_is_said_and_once_is_taken() {
    let m = messages("system \"S\" {\n star s {\n  radius = 0.85 ± 0.02 Rsun assumed assumed\n  mass = 1 Msun preferred [a] preferred\n }\n}\n");
    assert_eq!(
        m,
        [
            "`assumed` is written twice; once is enough",
            "`preferred` is written twice; once is enough"
        ]
    );
    // Once, before or after the citations, is fine.
    parse_ok("ref a \"A\"\nsystem \"S\" {\n star s {\n  radius = 0.85 ± 0.02 Rsun assumed [a]\n  mass = 1 Msun [a] preferred\n }\n}\n");
}

/// A symmetric and an asymmetric uncertainty on one value, in either order, is one error that
/// names both and says to keep one (it was read as arithmetic: a dimension error, or a list of
/// expected tokens).
#[test]
fn a_value_with_both_kinds_of_uncertainty_says_to_keep_one() {
    for (value, written) in [
        ("5000 ± 30 +40/-20 K", "`± 30 +40/-20`"),
        ("5000 +40/-20 ± 30 K", "`+40/-20 ± 30`"),
    ] {
        let src = format!("system \"A\" {{\n  star s {{ teff = {value} }}\n}}\n");
        let p = parse(FileId(0), &src);
        assert_eq!(p.diagnostics.len(), 1, "{value}: {:#?}", p.diagnostics);
        let d = &p.diagnostics[0];
        assert!(d.message.starts_with(written), "{}", d.message);
        assert!(d
            .message
            .contains("once symmetric (± 30) and once asymmetric (+40/-20)"));
        let help = d.help.as_deref().unwrap();
        assert!(help.contains("`5000 ± 30` or `5000 +40/-20`"), "{help}");
    }
    // Several symmetric ones stay one value.
    parse_ok("system \"A\" {\n  star s { teff = 5000 ± 30 ± 40 K }\n}\n");
    // Inside an expression too (it was arithmetic without a word); a sum stays a sum.
    let inside = "system \"A\" {\n  star s { let w = 0.1 * 3 ± 1 +1/-1 ± 2 }\n}\n";
    let p = parse(FileId(0), inside);
    assert_eq!(p.diagnostics.len(), 1, "{:#?}", p.diagnostics);
    assert!(p.diagnostics[0]
        .message
        .contains("gives the uncertainty twice"));
    parse_ok("system \"A\" {\n  star s { let w = 2 * 3 ± 1 + 1/2 }\n}\n");
    // More than one of either kind, and percentages: still one error, each term named, the
    // `%` kept in the help (it was a dimension error, or the help dropped the `%`).
    for (value, message, help) in [
        (
            "5000 ± 30 ± 20 +40/-20 K",
            "once symmetric (± 30 ± 20) and once asymmetric (+40/-20)",
            "`5000 ± 30 ± 20` or `5000 +40/-20`",
        ),
        (
            "5000 +40/-20 ± 1%",
            "once symmetric (± 1%) and once asymmetric (+40/-20)",
            "`5000 ± 1%` or `5000 +40/-20`",
        ),
        (
            "5000 ± 30 +1%/-2% K",
            "once symmetric (± 30) and once asymmetric (+1%/-2%)",
            "`5000 ± 30` or one asymmetric uncertainty in the value's unit (no `%`)",
        ),
        (
            "5000 +40/-20 +10/-10 K",
            "`+40/-20 +10/-10` gives 2 asymmetric uncertainties on one value",
            "keep one, as in `5000 +40/-20`",
        ),
        // Per cent inside an asymmetric one (it said "reads as a sum", and a help suggested it).
        (
            "5 +1%/-2%",
            "`%` inside an uncertainty is not read",
            "`5 +1/-2 %` if the value is in per cent; a relative uncertainty is written out in the value's unit: `5 +0.0500/-0.100`",
        ),
        (
            "5 +1%/-2% ± 3%",
            "once symmetric (± 3%) and once asymmetric (+1%/-2%)",
            "one asymmetric uncertainty in the value's unit (no `%`)",
        ),
    ] {
        let src = format!("system \"A\" {{\n  star s {{ teff = {value} }}\n}}\n");
        let p = parse(FileId(0), &src);
        assert_eq!(p.diagnostics.len(), 1, "{value}: {:#?}", p.diagnostics);
        let d = &p.diagnostics[0];
        assert!(d.message.contains(message), "{value}: {}", d.message);
        assert!(
            d.help.as_deref().unwrap().contains(help),
            "{value}: {:?}",
            d.help
        );
    }
}

#[test]
fn mixed_up_signs_in_an_uncertainty_are_named() {
    // Read as arithmetic, `+-0.05/-0.02 Rsun` was a division and said the dimension was
    // wrong (m^-1); `+0.1/--0.1 d` said it could not add a number and a frequency.
    for (value, fix) in [
        ("1.0 +-0.05/-0.02 Rsun", "`+0.05/-0.02`"),
        ("1.0 ± 0.05/-0.02 Rsun", "`+0.05/-0.02`"),
        ("3.0 +0.1/--0.1 d", "`+0.1/-0.1`"),
    ] {
        let src = format!("system \"Umber\" {{ star s {{ radius = {value} }} }}");
        let diags = parse(FileId(0), &src).diagnostics;
        let d = diags
            .iter()
            .find(|d| d.message.contains("the signs are mixed up"))
            .unwrap_or_else(|| panic!("{value}: {diags:#?}"));
        assert!(d.help.as_deref().unwrap_or("").contains(fix), "{d:?}");
    }
    // A correct asymmetric uncertainty is no slip.
    let diags = parse(
        FileId(0),
        "system \"U\" { star s { radius = 1.0 +0.05/-0.02 Rsun } }",
    )
    .diagnostics;
    assert!(diags.is_empty(), "{diags:#?}");
}
