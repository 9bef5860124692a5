use super::*;
use crate::diagnostic::Diagnostic;
use crate::parser::parse;

fn lower_text(src: &str) -> (Model, Vec<Diagnostic>) {
    let parsed = parse(FileId(0), src);
    let mut diags = parsed.diagnostics;
    let model = lower(FileId(0), &parsed.file, &mut diags);
    (model, diags)
}

fn messages(diags: &[Diagnostic]) -> Vec<&str> {
    diags.iter().map(|d| d.message.as_str()).collect()
}

#[test]
fn measurements_are_lowered_to_si() {
    // 1 au = 149 597 870 700 m exactly (IAU 2012 Resolution B2).
    let (m, diags) = lower_text(
        "system \"S\" {\n star s { mass = 1 Msun }\n planet b orbits s { semi_major_axis = 2 ± 0.1 au } }",
    );
    assert!(diags.is_empty(), "{diags:?}");
    let b = &m.systems[0].bodies[1];
    let Content::Measured(a) = &b.get(Qty::SemiMajorAxis).unwrap().content else {
        panic!("a measurement");
    };
    assert_eq!(a.value, 2.0 * 149_597_870_700.0);
    assert_eq!(a.below, 0.1 * 149_597_870_700.0);
    assert_eq!(a.form, Form::Symmetric);
    assert_eq!(b.orbits, Some(0));
}

#[test]
fn a_long_chain_of_bindings_resolves_once_each_in_order() {
    // Each binding uses the one before it twice; resolving by substitution would cost
    // 2^30 steps, resolving each binding once costs 31.
    let mut src = String::from("system \"S\" {\n let x0 = 1 Msun\n");
    for i in 1..=30 {
        src.push_str(&format!(" let x{i} = x{} + x{}\n", i - 1, i - 1));
    }
    src.push_str(" star s { mass = x30 / 1e9 }\n}\n");
    let (m, diags) = lower_text(&src);
    assert!(diags.is_empty(), "{diags:?}");
    let sys = &m.systems[0];
    let order: Vec<usize> = sys.let_order.iter().map(|id| id.index).collect();
    assert_eq!(order, (0..=30).collect::<Vec<_>>());
    assert!(sys.lets.iter().all(|l| l.dim == Some(Dimension::MASS)));
    let Content::Expr(e) = &sys.bodies[0].get(Qty::StarMass).unwrap().content else {
        panic!("an expression");
    };
    let mut bindings = Vec::new();
    e.walk(|n| {
        if let Node::Binding(id) = n.node {
            bindings.push(id);
        }
    });
    assert_eq!(
        bindings,
        vec![LetId {
            body: None,
            index: 30
        }]
    );
}

#[test]
fn bindings_may_be_used_before_they_are_written() {
    let (m, diags) =
        lower_text("system \"S\" {\n let a = b * 2\n let b = 1 Rsun\n star s { radius = a }\n}");
    assert!(diags.is_empty(), "{diags:?}");
    let order: Vec<usize> = m.systems[0].let_order.iter().map(|id| id.index).collect();
    assert_eq!(order, vec![1, 0]);
}

#[test]
fn a_cycle_of_bindings_is_reported_once_with_its_path() {
    let (m, diags) = lower_text(
        "system \"S\" {\n let x = y * 2\n let y = z\n let z = x + 1 Msun\n let w = y\n star s { mass = w }\n}",
    );
    let cycles: Vec<&str> = messages(&diags)
        .into_iter()
        .filter(|m| m.contains("defined in terms of itself"))
        .collect();
    assert_eq!(
        cycles,
        vec!["'x' is defined in terms of itself: x → y → z → x"]
    );
    assert_eq!(
        diags.len(),
        1,
        "nothing downstream of the cycle is reported again: {diags:?}"
    );
    let sys = &m.systems[0];
    assert!(sys.let_order.is_empty());
    assert!(sys.lets.iter().all(|l| l.value.is_none()));
    // The declared value that used the cycle is dropped, and the cycle says why.
    assert!(sys.bodies[0].get(Qty::StarMass).is_none());
}

#[test]
fn a_binding_that_uses_itself_is_reported() {
    let (_, diags) = lower_text("system \"S\" {\n star s { let k = k + 1\n mass = 1 Msun }\n}");
    assert_eq!(messages(&diags), vec!["'k' is defined in terms of itself"]);
    assert_eq!(diags[0].labels.len(), 1, "the binding is labelled");
}

#[test]
fn a_body_binding_shadows_the_system_binding() {
    let (m, diags) = lower_text(
        "system \"S\" {\n let r = 1 Rsun\n star s { let r = 2 Msun\n mass = r }\n star t { radius = r }\n}",
    );
    assert!(diags.is_empty(), "{diags:?}");
    let sys = &m.systems[0];
    let used = |bi: usize, q: Qty| {
        let Content::Expr(e) = &sys.bodies[bi].get(q).unwrap().content else {
            panic!("an expression");
        };
        match e.node {
            Node::Binding(id) => id,
            _ => panic!("a binding"),
        }
    };
    assert_eq!(
        used(0, Qty::StarMass),
        LetId {
            body: Some(0),
            index: 0
        }
    );
    assert_eq!(
        used(1, Qty::StarRadius),
        LetId {
            body: None,
            index: 0
        }
    );
}

#[test]
fn a_system_binding_cannot_see_a_body_binding() {
    let (_, diags) = lower_text(
        "system \"S\" {\n let total = k * 2\n star s { let k = 1 Msun\n mass = total }\n}",
    );
    assert_eq!(
        messages(&diags),
        vec!["'k' is neither a 'let' binding nor a constant"]
    );
}

#[test]
fn expression_dimensions_are_checked_against_the_quantity() {
    let (m, diags) = lower_text("system \"S\" {\n star s { mass = 2 Rsun * 3 }\n}");
    assert_eq!(
        messages(&diags),
        vec!["'mass' is a mass (kg), but this expression is a length (m)"]
    );
    assert!(m.systems[0].bodies[0].get(Qty::StarMass).is_none());
}

#[test]
fn literals_inside_expressions_are_converted_and_keep_their_uncertainty() {
    // 1 Rjup = 7.1492e7 m (IAU 2015 Resolution B3, equatorial).
    let (m, diags) = lower_text("system \"S\" {\n star s { mass = 1 Msun }\n planet b orbits s { radius = (1.0 ± 0.1 Rjup) * 2 }\n}");
    assert!(diags.is_empty(), "{diags:?}");
    let Content::Expr(e) = &m.systems[0].bodies[1].get(Qty::Radius).unwrap().content else {
        panic!("an expression");
    };
    let mut literal = None;
    e.walk(|n| {
        if let Node::Uncertain(l) = &n.node {
            literal = Some(l.clone());
        }
    });
    let l = literal.unwrap();
    assert_eq!(l.measurement.value, 7.1492e7);
    assert!((l.measurement.below - 7.1492e6).abs() < 1e-6);
    assert_eq!(l.written, "1 ± 0.1");
}

/// The one diagnostic of a planet property `prop` (a star `s` is its host).
fn only_diagnostic(prop: &str) -> Diagnostic {
    let src =
        format!("system \"S\" {{\n star s {{ mass = 1 Msun }}\n planet b orbits s {{ {prop} }} }}");
    let (_, diags) = lower_text(&src);
    assert_eq!(diags.len(), 1, "{prop}: {diags:?}");
    diags.into_iter().next().unwrap()
}

#[test]
fn several_uncertainties_are_combined_in_quadrature_with_a_note() {
    let (m, diags) = lower_text(
        "system \"S\" {\n star s { mass = 1 Msun }\n planet b orbits s { mass = 0.4 ± 0.03 ± 0.04 Mjup } }",
    );
    assert_eq!(diags.len(), 1, "{diags:?}");
    assert_eq!(diags[0].rule, Rule::CombinedUncertainty);
    assert_eq!(diags[0].severity, crate::diagnostic::Severity::Note);
    assert!(diags[0].message.contains("± 0.05 Mjup"), "{:?}", diags[0]);
    let Content::Measured(v) = &m.systems[0].bodies[1].get(Qty::Mass).unwrap().content else {
        panic!("a measurement");
    };
    // sqrt(0.03^2 + 0.04^2) = 0.05 exactly (a 3-4-5 triangle).
    let mjup = crate::constants::M_JUPITER;
    assert!((v.below / mjup - 0.05).abs() < 1e-12, "{}", v.below / mjup);
    assert_eq!(v.below, v.above);
    assert_eq!(v.form, Form::Symmetric);
    // In an expression too.
    let d = only_diagnostic("let k = 0.1 ± 0.03 ± 0.04\n radius_ratio = k");
    assert_eq!(d.rule, Rule::CombinedUncertainty);
}

#[test]
fn celsius_gets_the_value_in_kelvin() {
    let d = only_diagnostic("teq = 1500 ± 30 C");
    assert_eq!(d.rule, Rule::UnknownUnit);
    let help = d.help.unwrap();
    assert!(help.contains("`teq = 1773.15 ± 30 K`"), "{help}");
    assert!(!help.contains("'m'"), "{help}");
    // Fahrenheit: 212 °F = 373.15 K, and a spread of 9 °F is 5 K.
    let help = only_diagnostic("teq = 212 ± 9 degF").help.unwrap();
    assert!(help.contains("`teq = 373.15 ± 5 K`"), "{help}");
    // Not a temperature: no conversion, but no nonsense guess either.
    let d = only_diagnostic("period = 3 C");
    assert!(d.help.unwrap().contains("kelvin"));
}

#[test]
fn out_of_range_suggests_a_commonly_confused_unit() {
    let help = only_diagnostic("transit_depth = 1850 ± 100 %")
        .help
        .unwrap();
    assert!(help.contains("`transit_depth = 1850 ± 100 ppm`"), "{help}");
    let help = only_diagnostic("transit_depth = 1850").help.unwrap();
    assert!(help.contains("ppm"), "{help}");
    let help = only_diagnostic("inclination = 88 rad").help.unwrap();
    assert!(help.contains("`inclination = 88 deg`"), "{help}");
    // An eccentricity is no percentage, and nothing puts 1e9 % in range.
    assert_eq!(only_diagnostic("eccentricity = 1.3").help, None);
    assert_eq!(only_diagnostic("transit_depth = 1e12 %").help, None);
}

#[test]
fn abbreviations_that_are_not_names_point_to_the_quantity() {
    for (written, meant) in [
        ("inc = 88 deg", "inclination"),
        ("ecc = 0.1", "eccentricity"),
        ("w = 90 deg", "arg_periastron"),
        ("Tdur = 2.1 h", "transit_duration"),
    ] {
        let d = only_diagnostic(written);
        assert_eq!(d.rule, Rule::UnknownQuantity, "{written}");
        assert_eq!(
            d.help.as_deref(),
            Some(&*format!("did you mean '{meant}'?"))
        );
    }
    // The trade's symbols stay.
    let (_, diags) = lower_text(
        "system \"S\" {\n star s { mass = 1 Msun }\n planet b orbits s { i = 88 deg; e = 0.1; omega = 90 deg } }",
    );
    assert!(diags.is_empty(), "{diags:?}");
}

#[test]
fn a_missing_unit_is_added_to_the_value_as_written() {
    // The help is a fix to copy back: every digit and the uncertainty stay.
    for (written, fixed) in [
        (
            "transit_epoch = 2459000.123 ± 0.001",
            "`transit_epoch = 2459000.123 ± 0.001 BJD_TDB`",
        ),
        (
            "period = 3.5246871 +0.0000021/-0.0000019",
            "`period = 3.5246871 +0.0000021/-0.0000019 d`",
        ),
        (
            "inclination = 88.4 ± 0.2 ± 0.1",
            "`inclination = 88.4 ± 0.2 ± 0.1 deg`",
        ),
    ] {
        let d = only_diagnostic(written);
        assert_eq!(d.rule, Rule::UnitMismatch, "{written}");
        let help = d.help.unwrap_or_default();
        assert!(help.contains(fixed), "{written}: {help}");
    }
}

#[test]
fn a_percentage_uncertainty_before_a_unit_is_not_read_as_hundredths() {
    // `± 10% d` would make the whole measurement hundredths of a day (0.035 ± 0.1 d).
    let d = only_diagnostic("period = 3.5 ± 10% d");
    assert_eq!(d.rule, Rule::UnitMismatch);
    let help = d.help.unwrap_or_default();
    assert!(help.contains("`period = 3.5 ± 0.35 d`"), "{help}");
    assert_eq!(d.fix.map(|f| f.text).as_deref(), Some("3.5 ± 0.35 d"));
    let d = only_diagnostic("rv_amplitude = 40 ± 5 % m/s");
    assert!(d
        .help
        .unwrap_or_default()
        .contains("`rv_amplitude = 40 ± 2 m s^-1`"));
    // A fraction alone is a fraction.
    let (_, diags) = lower_text(
        "system \"S\" {\n star s { mass = 1 Msun }\n planet b orbits s { transit_depth = 0.5 ± 0.01 % } }",
    );
    assert!(diags.is_empty(), "{diags:?}");
}

#[test]
fn metres_per_second_written_as_per_millisecond_is_pointed_out() {
    let d = only_diagnostic("rv_amplitude = 55 ± 2 ms^-1");
    assert_eq!(d.rule, Rule::UnitMismatch);
    let help = d.help.unwrap_or_default();
    assert!(
        help.contains("millisecond") && help.contains("`rv_amplitude = 55 ± 2 m/s`"),
        "{help}"
    );
    // Another wrong unit of a speed gets the usual help.
    let help = only_diagnostic("rv_amplitude = 55 ± 2 kg")
        .help
        .unwrap_or_default();
    assert!(!help.contains("millisecond"), "{help}");
}

#[test]
fn catalogue_spellings_of_a_magnitude_point_to_the_quantity_and_its_body() {
    let on_star = |prop: &str| {
        let src = format!("system \"S\" {{\n star s {{ mass = 1 Msun; {prop} }} }}");
        let (_, diags) = lower_text(&src);
        assert_eq!(diags.len(), 1, "{prop}: {diags:?}");
        diags.into_iter().next().unwrap()
    };
    for (written, meant) in [
        ("Vmag = 10.2", "magnitude_v"),
        ("Ks_mag = 8.1", "magnitude_ks"),
        ("mag_J = 9", "magnitude_j"),
        ("Kmag = 8", "magnitude_ks"),
    ] {
        let d = on_star(written);
        assert_eq!(d.rule, Rule::UnknownQuantity, "{written}");
        assert_eq!(
            d.help.as_deref(),
            Some(&*format!("did you mean '{meant}'?")),
            "{written}"
        );
    }
    // Written on a planet: the star's quantity, and where it belongs.
    let d = only_diagnostic("Vmag = 10.2");
    assert_eq!(
        d.help.as_deref(),
        Some("did you mean 'magnitude_v'? It is a quantity of a star; declare it there")
    );
    // Not every word ending in "mag" is a band.
    assert_ne!(
        on_star("xmag = 3").help.as_deref(),
        Some("did you mean 'magnitude_v'?")
    );
}

#[test]
fn a_quantity_declared_by_several_cited_sources_keeps_every_declaration() {
    let (m, diags) = lower_text(
        "ref disc \"Invented A\"\nref followup \"Invented B\"\nsystem \"S\" {\n star s { mass = 1 Msun }\n planet b orbits s {\n  period = 10.000 ± 0.001 d [disc]\n  period = 10.0021 ± 0.0002 d [followup] preferred\n }\n}",
    );
    assert!(diags.is_empty(), "{diags:?}");
    let b = &m.systems[0].bodies[1];
    let all = b.sources(Qty::Period);
    assert_eq!(all.len(), 2);
    assert_eq!(all[0].citations[0].0, "disc");
    assert!(!all[0].preferred && all[1].preferred);
    // The first declaration stays the quantity's declaration.
    assert_eq!(b.get(Qty::Period).unwrap().citations[0].0, "disc");
}

#[test]
fn a_repeat_without_distinguishing_citations_is_still_a_duplicate() {
    for (first, second) in [
        ("period = 10 ± 1 d", "period = 11 ± 1 d"),
        ("period = 10 ± 1 d [disc]", "period = 11 ± 1 d [disc]"),
        ("period = 10 ± 1 d [disc]", "period = 11 ± 1 d"),
        // Several sources must each be a measured value.
        ("period = 10 ± 1 d [disc]", "period = 2 * 5 d [other]"),
    ] {
        let (m, diags) = lower_text(&format!(
            "ref disc \"Invented A\"\nref other \"Invented B\"\nsystem \"S\" {{\n star s {{ mass = 1 Msun }}\n planet b orbits s {{\n  {first}\n  {second}\n }}\n}}"
        ));
        assert_eq!(
            diags.iter().map(|d| d.rule).collect::<Vec<_>>(),
            [Rule::Duplicate],
            "{second}"
        );
        assert_eq!(m.systems[0].bodies[1].sources(Qty::Period).len(), 1);
    }
}

#[test]
fn a_second_preferred_mark_is_reported_and_the_first_kept() {
    let (m, diags) = lower_text(
        "ref a \"Invented A\"\nref c \"Invented C\"\nsystem \"S\" {\n star s { mass = 1 Msun }\n planet b orbits s {\n  period = 10 ± 1 d [a] preferred\n  period = 11 ± 1 d [c] preferred\n }\n}",
    );
    assert_eq!(
        messages(&diags),
        ["'period' of 'b' is marked preferred twice; the first mark is used"]
    );
    let all = m.systems[0].bodies[1].sources(Qty::Period);
    assert!(all[0].preferred && !all[1].preferred);
}

/// A body written with nothing in it is said (an imported star whose cells were all
/// empty passed `check` in silence), but not where its lines failed to parse: that error
/// says so already.
#[test]
fn an_empty_body_is_noted_unless_its_lines_failed_to_parse() {
    let notes = |src: &str| {
        let a = crate::analyze(FileId(0), src, &crate::Settings::linear());
        a.diagnostics
            .iter()
            .filter(|d| d.message.contains("declares no value"))
            .map(|d| d.message.clone())
            .collect::<Vec<_>>()
    };
    let empty = "system \"Orvane\" {\n  star orv {\n  }\n  planet b orbits orv { period = 3.1 d }\n  planet c orbits orv { period = 9.2 d }\n}\n";
    assert_eq!(
        notes(empty),
        ["star 'orv' declares no value, so nothing that needs the star (its 2 planets' semi-major axes, masses or temperatures) is derived"]
    );
    let broken = empty.replace("star orv {\n", "star orv {\n    = 1 Msun\n");
    assert_eq!(notes(&broken), Vec::<String>::new());
    let full = empty.replace("star orv {\n", "star orv {\n    mass = 1 Msun\n");
    assert_eq!(notes(&full), Vec::<String>::new());
}

/// A system is read with at most `MAX_SYSTEM_BODIES` bodies: each body past the bound is an
/// error of its own (the first with the note and the fix), a duplicate is still reported as
/// one, the bodies within the bound keep their values, and the next system is read whole.
#[test]
fn bodies_past_a_systems_bound_are_errors_each() {
    use crate::diagnostic::Rule;
    let n = limits::MAX_SYSTEM_BODIES;
    let mut src = String::from("system \"Crowd\" {\n");
    for i in 0..n + 3 {
        src.push_str(&format!(" star s{i} {{ mass = 0.5 Msun }}\n"));
    }
    src.push_str(
        " star s0 { mass = 0.6 Msun }\n}\nsystem \"Next\" {\n star t { mass = 1 Msun }\n}\n",
    );
    let (m, diags) = lower_text(&src);
    assert_eq!(m.systems[0].bodies.len(), n);
    assert_eq!(m.systems[1].bodies.len(), 1);
    let last = &m.systems[0].bodies[n - 1];
    assert_eq!(last.id, format!("s{}", n - 1));
    assert!(last.get(Qty::StarMass).is_some());
    let past: Vec<&Diagnostic> = diags
        .iter()
        .filter(|d| d.rule == Rule::TooManyBodies)
        .collect();
    assert_eq!(past.len(), 3, "{:?}", messages(&diags));
    assert_eq!(
        past[0].message,
        format!("star 's{n}' is not read: system \"Crowd\" already has {n} bodies, the most one system is read with")
    );
    assert!(past[0].help.is_some() && !past[0].notes.is_empty());
    assert!(past[1].help.is_none() && past[1].notes.is_empty());
    assert!(past[2].message.starts_with(&format!("star 's{}'", n + 2)));
    assert_eq!(
        diags.iter().filter(|d| d.rule == Rule::Duplicate).count(),
        1,
        "{:?}",
        messages(&diags)
    );
    assert!(Rule::TooManyBodies.is_fixed());
    // Named where it is not read (after `orbits`, in an expression), it is said to be
    // declared but not read, not missing.
    let n = limits::MAX_SYSTEM_BODIES;
    let mut src = String::from("system \"Crowd\" {\n");
    for i in 0..n {
        src.push_str(&format!(" star s{i} {{ mass = 0.5 Msun }}\n"));
    }
    src.push_str(" star late { mass = 0.7 Msun }\n}\nsystem \"Two\" {\n");
    for i in 0..n - 1 {
        src.push_str(&format!(" star s{i} {{ mass = 0.5 Msun }}\n"));
    }
    src.push_str(" planet b orbits late { period = 3 d; radius = late.radius * 0.1 }\n star late { radius = 1 Rsun }\n}\n");
    let (m, diags) = lower_text(&src);
    assert_eq!(m.systems[0].not_read.len(), 1);
    assert_eq!(
        m.systems[1].not_read.len(),
        1,
        "{:?}",
        m.systems[1].not_read
    );
    let named: Vec<&str> = diags
        .iter()
        .filter(|d| {
            d.rule == Rule::TooManyBodies
                && d.message.starts_with("'late' is declared but not read")
        })
        .map(|d| d.message.as_str())
        .collect();
    assert_eq!(named.len(), 2, "{:?}", messages(&diags));
    assert!(
        !diags.iter().any(|d| d.rule == Rule::UnknownBody),
        "{:?}",
        messages(&diags)
    );
}

/// A limit on a text (`spectral_type < "K1V"`) is refused: it was read as the text itself, the
/// `<` gone from every output.
#[test]
fn a_limit_on_text_is_refused() {
    let (m, diags) = lower_text("system \"S\" {\n star s { spectral_type < \"K1V\" }\n}\n");
    assert!(m.systems[0].bodies[0].get(Qty::SpectralType).is_none());
    assert_eq!(
        messages(&diags),
        ["a limit takes a single number with a unit, not text"]
    );
    assert_eq!(
        diags[0].help.as_deref(),
        Some("write `spectral_type = \"K1V\"`")
    );
}

/// A spectral type written without quotes is refused, and the help quotes what was written
/// (it said `"K0V"` whatever the star's type).
#[test]
fn an_unquoted_spectral_type_is_shown_in_quotes() {
    let (m, diags) = lower_text("system \"S\" {\n star s { spectral_type = K2V }\n}\n");
    assert!(m.systems[0].bodies[0].get(Qty::SpectralType).is_none());
    assert_eq!(messages(&diags), ["'spectral_type' takes text in quotes"]);
    assert_eq!(
        diags[0].help.as_deref(),
        Some("write `spectral_type = \"K2V\"`")
    );
}

/// A unit on a plain number: the help offers % and ppm only for a quantity written as a
/// fraction (a depth), not for a/R*, where a percentage means nothing.
#[test]
fn a_unit_on_a_plain_number_is_dropped_and_percent_offered_only_for_fractions() {
    let (_, diags) = lower_text(
        "system \"S\" {\n star s { mass = 1 Msun }\n planet b orbits s { a_rs = 9.5 Rsun; transit_depth = 0.5 Rsun }\n}\n",
    );
    let helps: Vec<&str> = diags.iter().filter_map(|d| d.help.as_deref()).collect();
    assert_eq!(
        helps,
        [
            "'scaled_semi_major_axis' is a plain number; drop the unit",
            "'transit_depth' is a plain number; drop the unit or use % or ppm",
        ],
        "{diags:?}"
    );
}

/// A UTC timestamp before 1972 is refused when the file is read (its seconds were not SI
/// seconds, so no time scale follows from it); `syz check` passed it, and only `ephemeris`
/// refused it later. 1972-01-01T00:00:00Z itself is taken.
#[test]
fn a_utc_epoch_before_1972_is_refused_when_read() {
    let (_, diags) = lower_text(
        "system \"A\" {\n star s { mass = 1 Msun }\n planet b orbits s { transit_epoch = \"1971-12-31T23:59:59Z\" }\n}\n",
    );
    assert!(
        messages(&diags)
            .iter()
            .any(|m| m.contains("UTC before 1972-01-01 is not supported")),
        "{diags:#?}"
    );
    let (model, diags) = lower_text(
        "system \"A\" {\n star s { mass = 1 Msun }\n planet b orbits s { transit_epoch = \"1972-01-01T00:00:00Z\" }\n}\n",
    );
    assert!(diags.is_empty(), "{diags:#?}");
    assert!(model.systems[0].bodies[1].get(Qty::TransitEpoch).is_some());
    // A Julian date in UTC the same (JD 2441317.5 is 1972-01-01T00:00 UTC, where the IERS
    // table of TAI - UTC starts at 10 s).
    let (_, diags) = lower_text(
        "system \"A\" {\n star s { mass = 1 Msun }\n planet b orbits s { transit_epoch = 2441317.4 ± 0.001 JD_UTC }\n}\n",
    );
    assert!(
        messages(&diags)
            .iter()
            .any(|m| m.contains("UTC before 1972-01-01 is not supported")),
        "{diags:#?}"
    );
    let (_, diags) = lower_text(
        "system \"A\" {\n star s { mass = 1 Msun }\n planet b orbits s { transit_epoch = 2441317.4 ± 0.001 BJD_TDB }\n}\n",
    );
    assert!(diags.is_empty(), "{diags:#?}");
    // A plain or heliocentric Julian date names no scale and is read as UTC: the same, with
    // a note that says how it was read (`check` passed them). A plain BJD is read as TDB.
    for (unit, refused) in [
        ("JD", true),
        ("HJD", true),
        ("BJD", false),
        ("JD_TT", false),
    ] {
        let (_, diags) = lower_text(&format!(
            "system \"A\" {{\n star s {{ mass = 1 Msun }}\n planet b orbits s {{ transit_epoch = 2441317.4 ± 0.001 {unit} }}\n}}\n"
        ));
        assert_eq!(diags.len(), usize::from(refused), "{unit}: {diags:#?}");
        if let Some(d) = diags.first() {
            assert!(d.message.contains("UTC before 1972-01-01"), "{d:?}");
            assert!(
                d.notes.iter().any(|n| n.contains("no time scale named")),
                "{d:?}"
            );
        }
    }
}

/// A repeat is matched with the earlier declaration that has its citations, whether that is
/// the first of the quantity or a later source (found through an index, so that thousands of
/// sources of one quantity are not each compared with every earlier one); a third
/// `preferred` mark names the first mark, which may be on a later source.
#[test]
fn a_repeat_names_the_earlier_declaration_with_its_citations() {
    let src = "ref a \"Invented A\"\nref c \"Invented C\"\nref d \"Invented D\"\nref e \"Invented E\"\nsystem \"S\" {\n star s { mass = 1 Msun }\n planet b orbits s {\n  period = 10 ± 1 d [a]\n  period = 11 ± 1 d [c] preferred\n  period = 12 ± 1 d [d]\n  period = 13 ± 1 d [c]\n  period = 14 ± 1 d [a]\n  period = 15 ± 1 d [c, a]\n  period = 16 ± 1 d [e] preferred\n  period = 17 ± 1 d\n }\n}";
    let (m, diags) = lower_text(src);
    let line_of = |at: crate::source::Span| src[..at.start as usize].lines().count();
    let found: Vec<(usize, &str, usize)> = diags
        .iter()
        .map(|d| {
            let l = &d.labels[0];
            (line_of(d.span), l.message.as_str(), line_of(l.span))
        })
        .collect();
    assert_eq!(
        found,
        [
            (11, "declared with the same citations here", 9),
            (12, "declared with the same citations here", 8),
            (14, "marked preferred here", 9),
            (15, "first declared here", 8),
        ],
        "{diags:#?}"
    );
    // Kept: every source with citations of its own; 16 [e] without its mark.
    let kept: Vec<f64> = m.systems[0].bodies[1]
        .sources(Qty::Period)
        .iter()
        .filter_map(|d| match &d.content {
            Content::Measured(x) => Some((x.value / 86_400.0).round()),
            _ => None,
        })
        .collect();
    assert_eq!(kept, [10.0, 11.0, 12.0, 15.0, 16.0]);
}

#[test]
fn a_power_written_without_a_caret_says_how_to_write_it() {
    // `g/cm3` is how some unit syntaxes write g/cm^3.
    let d = only_diagnostic("density = 1.4 g/cm3");
    assert_eq!(d.rule, Rule::UnknownUnit);
    assert_eq!(
        d.help.as_deref(),
        Some("a power is written with '^': 'cm^3'")
    );
    let d = only_diagnostic("surface_gravity = 9.8 m/s2");
    assert_eq!(
        d.help.as_deref(),
        Some("a power is written with '^': 's^2'")
    );
    // Digits after something that is not a unit are no power.
    let d = only_diagnostic("density = 1.4 g/qq3");
    assert!(!d.help.unwrap().contains("power"));
}

/// Bindings past a system's bound (`limits::MAX_SYSTEM_BINDINGS`, the system's own first,
/// then its bodies'): one error per scope, at its first such binding, with the count; a
/// body's binding is named in an error of its own, not buried among the system's.
#[test]
fn bindings_past_the_bound_get_one_error_per_scope() {
    let mut src = String::from("system \"Long\" {\n");
    for i in 0..1003 {
        src.push_str(&format!(" let x{i} = {i}\n"));
    }
    src.push_str(" star s {\n  let y = 2\n  mass = y * 1 Msun\n }\n}\n");
    let (_, diags) = lower_text(&src);
    let found: Vec<&str> = diags
        .iter()
        .filter(|d| d.rule == Rule::TooManyBindings)
        .map(|d| d.message.as_str())
        .collect();
    assert_eq!(found.len(), 2, "{found:#?}");
    assert!(
        found[0].starts_with(
            "let 'x1000' and the 2 bindings of system \"Long\" after it are not evaluated"
        ),
        "{}",
        found[0]
    );
    assert!(
        found[1].starts_with("let 'y' of star 's' is not evaluated"),
        "{}",
        found[1]
    );
}

/// An epoch with the published offset left off (BJD - 2457000, say) is a date in the
/// fifth millennium BC: refused with the offsets to add back, instead of read and refused
/// only by `ephemeris`. The first day of the year 1000 (JD 2086302.5, astropy's
/// `Time('1000-01-01').jd`) is read.
#[test]
fn an_epoch_with_its_offset_left_off_is_refused() {
    let src = |jd: &str| {
        format!(
            "system \"A\" {{\n star s {{ mass = 1 Msun }}\n planet b orbits s {{ transit_epoch = {jd} ± 0.0005 BJD_TDB }}\n}}\n"
        )
    };
    let (m, diags) = lower_text(&src("1234.5678"));
    let d = diags
        .iter()
        .find(|d| d.rule == Rule::InvalidValue)
        .expect("refused");
    assert!(
        d.message
            .contains("Julian date 1234.5678 is before the year 1000"),
        "{}",
        d.message
    );
    assert!(d.help.as_deref().is_some_and(|h| h.contains("2457000")));
    assert!(m.systems[0].bodies[1].get(Qty::TransitEpoch).is_none());
    let (m, diags) = lower_text(&src("2086302.5"));
    assert!(diags.is_empty(), "{diags:?}");
    assert!(m.systems[0].bodies[1].get(Qty::TransitEpoch).is_some());
    // A digit too many, past the year 9999; a huge number is written short.
    for (jd, said) in [
        (
            "24601234.567",
            "Julian date 24601234.567 is after the year 9999",
        ),
        ("1e300", "Julian date 1e300 is after the year 9999"),
    ] {
        let (m, diags) = lower_text(&src(jd));
        assert!(diags.iter().any(|d| d.message.contains(said)), "{diags:?}");
        assert!(m.systems[0].bodies[1].get(Qty::TransitEpoch).is_none());
    }
    // A Julian date read as UTC (`HJD`) gets the same help, not only the UTC range error.
    let (_, diags) = lower_text(&src("60123.4567").replace("BJD_TDB", "HJD"));
    let d = diags.first().expect("refused");
    assert!(d.message.contains("before the year 1000"), "{}", d.message);
    assert!(d.help.as_deref().is_some_and(|h| h.contains("2400000")));
}

#[test]
fn numbers_and_uncertainties_too_small_to_represent_are_refused() {
    // Below f64::MIN_POSITIVE a number keeps fewer digits than it shows: `1 ± 1e-320 %`
    // was shown as `1.00 ± 9.9e-321 %`.
    for (value, said) in [
        ("1 ± 1e-320 %", "this uncertainty is too small to represent"),
        (
            "1 +1e-320/-0.1 %",
            "this uncertainty is too small to represent",
        ),
        ("1e-320 %", "this number is too small to represent"),
        // Too small even for a subnormal: it read as 0, an exact value, without a word.
        ("1 ± 1e-400 %", "this uncertainty is too small to represent"),
        ("1e-400 %", "this number is too small to represent"),
    ] {
        let (_, diags) = lower_text(&format!(
            "system \"Umber\" {{ star s {{ mass = 1 Msun }}\n planet b orbits s {{ transit_depth = {value} }} }}"
        ));
        assert!(messages(&diags).contains(&said), "{value}: {diags:#?}");
    }
    let (_, diags) = lower_text(
        "system \"Umber\" { star s { mass = 1 Msun }\n planet b orbits s { transit_depth = 1 ± 1e-300 % } }",
    );
    assert!(diags.is_empty(), "{diags:#?}");
    // In solar masses as written, whatever it is in kilograms; and 0 written as 0 is 0.
    let (_, diags) =
        lower_text("system \"U\" { star s { mass = 1 ± 1e-400 Msun; teff = 5000 ± 0 K } }");
    assert_eq!(
        messages(&diags),
        ["this uncertainty is too small to represent"],
        "{diags:#?}"
    );
}
