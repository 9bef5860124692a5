use super::*;
use crate::derive::SystemResult;
use crate::diagnostic::Rule;
use proptest::prelude::*;

const HEADER: &str = "ref lab \"Invented laboratory numbers\"\n\n";

/// One invented system of a few shapes, each giving the engine and the checker something
/// to say: expressions with uncertain literals, citations, a silenced check, an
/// inconsistency with labels, crossing orbits, a spectral-type estimate and a text value,
/// an expression with no value.
fn system(shape: usize, i: usize) -> String {
    let d = i % 9;
    match shape % 6 {
        0 => format!(
            "system \"Marrow {i}\" {{\n  let boost = 1.{d} ± 0.05\n  star m{i} {{ mass = 0.9{d} ± 0.04 Msun [lab]; radius = 0.87 ± 0.02 Rsun; teff = 5150 ± 70 K }}\n  planet b orbits m{i} {{\n    period = {}.21 ± 0.001 d [lab]\n    rv_amplitude = 40 ± 2 m/s * boost\n    transit_depth = 0.9 ± 0.04 %\n    impact = 0.3 ± 0.05\n  }}\n  planet c orbits m{i} {{ period = 41.7 ± 0.3 d; rv_amplitude = 4.1 ± 0.6 m/s }}\n}}\n",
            3 + d
        ),
        1 => format!(
            "system \"Pellin {i}\" {{\n  star p{i} {{ mass = 0.8 ± 0.03 Msun; radius = 0.78 ± 0.02 Rsun; teff = 5000 ± 70 K }}\n  planet b orbits p{i} {{\n    period = 6.1 ± 0.001 d\n    mass = 1{d} ± 0.6 Mearth\n    radius = 1.1 ± 0.03 Rearth # allow(denser-than-iron): kept on purpose\n  }}\n}}\n"
        ),
        2 => format!(
            "system \"Quorra {i}\" {{\n  star q{i} {{ mass = 1.0 ± 0.02 Msun }}\n  planet b orbits q{i} {{\n    period = 365.25 ± 0.01 d\n    semi_major_axis = 1.{}3 ± 0.01 au [lab]\n  }}\n}}\n",
            d + 1
        ),
        3 => format!(
            "system \"Tangle {i}\" {{\n  star t{i} {{ mass = 1.0 ± 0.04 Msun }}\n  planet b orbits t{i} {{ period = 10 ± 0.01 d; eccentricity = 0.6 ± 0.02 }}\n  planet c orbits t{i} {{ period = 1{d} ± 0.01 d }}\n}}\n"
        ),
        4 => format!(
            "system \"Sable {i}\" {{\n  star s{i} {{ spectral_type = \"K{d}V\"; distance = 30 ± 1 pc }}\n  planet b orbits s{i} {{\n    period = 12 ± 0.01 d\n    rv_amplitude = {} ± 1 m/s\n    transit_epoch = 2460123.4567 ± 0.0004 BJD_TDB\n  }}\n}}\n",
            9 + d
        ),
        _ => format!(
            "system \"Wend {i}\" {{\n  let z = {d} - {d}\n  star w{i} {{ mass = 1.1 ± 0.05 Msun; radius = 1.2 ± 0.04 Rsun }}\n  planet b orbits w{i} {{\n    period = 12 ± 0.1 d\n    radius = (2 ± 0.1 Rearth) / z\n    rv_amplitude = 1.9 ± 0.05 km/s\n  }}\n}}\n"
        ),
    }
}

/// A document as the header and one chunk of text per system, so edits can aim at systems.
#[derive(Debug, Clone)]
struct Doc {
    header: String,
    systems: Vec<String>,
}

impl Doc {
    fn new(shapes: &[usize]) -> Doc {
        Doc {
            header: HEADER.to_string(),
            systems: shapes
                .iter()
                .enumerate()
                .map(|(i, s)| system(*s, i))
                .collect(),
        }
    }

    fn text(&self) -> String {
        let mut s = self.header.clone();
        for sys in &self.systems {
            s.push_str(sys);
            s.push('\n');
        }
        s
    }
}

fn linear() -> Settings {
    Settings::linear()
}

/// The reused analysis must be the fresh one in every part.
fn assert_same(got: &Analysis, want: &Analysis) {
    assert_eq!(got.diagnostics, want.diagnostics);
    // Debug text, because text-valued results hold NaN, which is never equal to itself.
    assert_eq!(format!("{:?}", got.results), format!("{:?}", want.results));
    assert_eq!(got.composition, want.composition);
    assert_eq!(format!("{:?}", got.model), format!("{:?}", want.model));
    assert_eq!(got.ast, want.ast);
    assert_eq!(got.file, want.file);
}

/// Analyse `src` reusing `previous`, check it against a fresh analysis, and return it.
fn step(src: &str, settings: &Settings, previous: Option<&Reusable>) -> (Analysis, Reusable) {
    let (got, keep) = analyze_reusing(FileId(0), src, settings, previous);
    let want = crate::analyze(FileId(0), src, settings);
    assert_same(&got, &want);
    (got, keep)
}

#[test]
fn the_generated_systems_say_something() {
    // The shapes are there to exercise reuse of every kind of output; make sure they do.
    let doc = Doc::new(&[0, 1, 2, 3, 4, 5]);
    let a = crate::analyze(FileId(0), &doc.text(), &linear());
    let rules: Vec<&str> = a.diagnostics.iter().map(|d| d.rule.id()).collect();
    for rule in ["inconsistent", "crossing-orbits", "invalid-value"] {
        assert!(rules.contains(&rule), "{rule} missing from {rules:?}");
    }
    assert!(
        !rules.contains(&"denser-than-iron"),
        "the allow silences it"
    );
    assert!(!rules.contains(&"unused-allow"), "{rules:?}");
    assert!(a.diagnostics.iter().any(|d| !d.labels.is_empty()));
    assert!(!a.composition.is_empty());
    let budgets: Vec<&str> = a
        .results
        .iter()
        .flat_map(|r| &r.bodies)
        .flat_map(|b| &b.quantities)
        .flat_map(|q| &q.budget)
        .map(|(label, _)| label.as_str())
        .collect();
    assert!(
        budgets.iter().any(|l| l.contains(": ") && l.contains('±')),
        "{budgets:?}"
    );
}

#[test]
fn an_edit_in_one_system_derives_only_that_system() {
    let mut doc = Doc::new(&[0, 1, 2, 3, 4, 5, 0, 2]);
    let (before, keep) = step(&doc.text(), &linear(), None);
    assert_eq!(keep.reused(), 0);
    assert_eq!(keep.systems(), 8);
    // Longer text in system 2: every system after it moves.
    doc.systems[2] = doc.systems[2].replace("365.25", "365.2500");
    let (a, keep) = step(&doc.text(), &linear(), Some(&keep));
    assert_eq!(keep.reused(), 7);
    // Systems that did not move and systems that moved share their results with the
    // previous analysis: results count their places from their system's start.
    assert!(Arc::ptr_eq(&before.results[1], &a.results[1]));
    assert!(Arc::ptr_eq(&before.results[3], &a.results[3]));
    let src = doc.text();
    // A moved system's results place its declarations in its own text.
    let sys = &a.model.systems[3];
    let period = crate::ide::result(&a, 3, 1, crate::quantities::Qty::Period).unwrap();
    let at = period.span.unwrap().in_file(sys.span);
    assert!(at.start > before.model.systems[3].span.start);
    assert!(
        src[at.range()].starts_with("period"),
        "{}",
        &src[at.range()]
    );
    // A moved system's diagnostic points at its own text.
    let labels =
        |d: &Diagnostic| -> Vec<&str> { d.labels.iter().map(|l| &src[l.span.range()]).collect() };
    let d = a
        .diagnostics
        .iter()
        .find(|d| d.rule == Rule::Inconsistent && labels(d).contains(&"1.83 ± 0.01 au"))
        .expect("the last system's inconsistency");
    assert_eq!(&src[d.span.range()], "1.0 ± 0.02 Msun");
    assert_eq!(labels(d), ["365.25 ± 0.01 d", "1.83 ± 0.01 au"]);
}

#[test]
fn a_system_whose_choice_of_source_names_a_line_is_reused_only_on_the_same_line() {
    let two = "system \"Brisk\" {\n  star k { mass = 1 ± 0.05 Msun }\n  planet b orbits k {\n    period = 10.000 ± 0.001 d [lab]\n    period = 10.0021 ± 0.0002 d [other]\n  }\n}\n";
    let header = format!("{HEADER}ref other \"Invented other numbers\"\n");
    let mut doc = Doc::new(&[2]);
    doc.header = header;
    doc.systems.push(two.to_string());
    let (a, keep) = step(&doc.text(), &linear(), None);
    let line_of = |a: &Analysis| {
        let q = crate::ide::result(a, 1, 1, crate::quantities::Qty::Period).unwrap();
        q.assumptions
            .iter()
            .find(|x| x.starts_with("b.period: 2 sources"))
            .cloned()
            .unwrap()
    };
    assert!(
        line_of(&a).ends_with("source 2 of 2, line 16)"),
        "{}",
        line_of(&a)
    );
    // Longer on the same line: reused.
    doc.systems[0] = doc.systems[0].replace("365.25", "365.2500");
    let (_, keep) = step(&doc.text(), &linear(), Some(&keep));
    assert_eq!(keep.reused(), 1);
    // A line more before it: derived afresh, with the new line (`step` compares).
    doc.systems[0] = doc.systems[0].replace("365.2500 ± 0.01 d\n", "365.25 ± 0.01 d\n\n");
    let (a, keep) = step(&doc.text(), &linear(), Some(&keep));
    assert_eq!(keep.reused(), 0);
    assert!(line_of(&a).ends_with("line 17)"), "{}", line_of(&a));
}

#[test]
fn a_silenced_diagnostic_of_a_reused_system_stays_silenced() {
    let mut doc = Doc::new(&[1, 0]);
    let (_, keep) = step(&doc.text(), &linear(), None);
    doc.systems[1] = doc.systems[1].replace("41.7", "42.7");
    let (a, keep) = step(&doc.text(), &linear(), Some(&keep));
    assert_eq!(keep.reused(), 1);
    let rules: Vec<Rule> = a.diagnostics.iter().map(|d| d.rule).collect();
    assert!(!rules.contains(&Rule::DenserThanIron), "{rules:?}");
    assert!(!rules.contains(&Rule::UnusedAllow), "{rules:?}");
    // Taking the comment away (an edit of that system) brings the diagnostic back.
    doc.systems[0] = doc.systems[0].replace("# allow", "# not an allow");
    let (a, keep) = step(&doc.text(), &linear(), Some(&keep));
    assert_eq!(keep.reused(), 1);
    assert!(a.diagnostics.iter().any(|d| d.rule == Rule::DenserThanIron));
}

#[test]
fn an_allow_outside_a_reused_system_applies_to_it() {
    // A comment on its own line covers the next line: the system's first line. The system
    // is reused, and the comment is reported as silencing nothing there, as fresh.
    let doc = Doc::new(&[2, 2]);
    let (_, keep) = step(&doc.text(), &linear(), None);
    let src = doc.text().replace(
        "system \"Quorra 1\"",
        "# allow(inconsistent): x\nsystem \"Quorra 1\"",
    );
    let (a, keep) = step(&src, &linear(), Some(&keep));
    assert_eq!(keep.reused(), 2);
    assert!(a.diagnostics.iter().any(|d| d.rule == Rule::UnusedAllow));
}

#[test]
fn systems_that_share_a_name_and_text_are_each_right() {
    let mut doc = Doc::new(&[2, 0]);
    doc.systems.insert(1, doc.systems[0].clone());
    let (a, keep) = step(&doc.text(), &linear(), None);
    assert!(a.diagnostics.iter().any(|d| d.rule == Rule::Duplicate));
    doc.systems[0] = doc.systems[0].replace("365.25", "365.26");
    let (_, keep) = step(&doc.text(), &linear(), Some(&keep));
    assert_eq!(keep.reused(), 2);
    // A third copy comes from either of the others.
    doc.systems.push(doc.systems[1].clone());
    let (_, keep) = step(&doc.text(), &linear(), Some(&keep));
    assert_eq!(keep.reused(), 4);
}

#[test]
fn removing_a_system_renumbers_the_composition_notes() {
    let mut doc = Doc::new(&[3, 0, 1]);
    let (before, keep) = step(&doc.text(), &linear(), None);
    assert!(before.composition.keys().any(|(si, _)| *si == 1));
    doc.systems.remove(0);
    let (a, keep) = step(&doc.text(), &linear(), Some(&keep));
    assert_eq!(keep.reused(), 2);
    assert!(a.composition.contains_key(&(0, "b".to_string())));
    assert!(a.composition.keys().all(|(si, _)| *si < 2));
}

#[test]
fn removing_a_reference_keeps_the_systems_that_cite_it() {
    // Systems 0 and 2 cite [lab]; without the ref they keep the citation as written (and an
    // unknown-ref error says it is missing), so nothing derived changes and all four are
    // reused.
    let mut doc = Doc::new(&[0, 3, 2, 3]);
    let (_, keep) = step(&doc.text(), &linear(), None);
    doc.header = "\n".to_string();
    let (a, keep) = step(&doc.text(), &linear(), Some(&keep));
    assert_eq!(keep.reused(), 4);
    assert!(a.diagnostics.iter().any(|d| d.rule == Rule::UnknownRef));
}

#[test]
fn other_options_or_another_file_reuse_nothing() {
    let doc = Doc::new(&[0, 2, 4]);
    let src = doc.text();
    let (_, keep) = step(&src, &linear(), None);
    let tighter = Settings::from(Options {
        consistency_sigma: 1.0,
        ..Options::linear()
    });
    let (_, other) = step(&src, &tighter, Some(&keep));
    assert_eq!(other.reused(), 0);
    let (_, other) = analyze_reusing(FileId(1), &src, &linear(), Some(&keep));
    assert_eq!(other.reused(), 0);
    let (_, same) = step(&src, &linear(), Some(&keep));
    assert_eq!(same.reused(), 3);
}

#[test]
fn other_severities_reuse_everything_and_apply_afresh() {
    let doc = Doc::new(&[0, 2, 4]);
    let src = doc.text();
    let (plain, keep) = step(&src, &linear(), None);
    let rule = plain.diagnostics.first().map(|d| d.rule).unwrap();
    assert_ne!(rule, Rule::Syntax, "{:?}", plain.diagnostics);
    let silenced = linear().then(&crate::settings::Layer {
        overrides: vec![(rule, None)],
        ..crate::settings::Layer::default()
    });
    let (a, other) = step(&src, &silenced, Some(&keep));
    assert_eq!(other.reused(), 3);
    assert!(a.diagnostics.iter().all(|d| d.rule != rule));
    assert!(a.diagnostics.len() < plain.diagnostics.len());
}

#[test]
fn monte_carlo_results_are_reused_exactly() {
    let mc = Settings::from(Options {
        samples: 200,
        ..Options::default()
    });
    let mut doc = Doc::new(&[0, 1, 4, 2]);
    let (_, keep) = step(&doc.text(), &mc, None);
    doc.systems.insert(0, system(3, 9));
    let (_, keep) = step(&doc.text(), &mc, Some(&keep));
    assert_eq!(keep.reused(), 4);
}

#[test]
fn outputs_with_spans_outside_their_system_are_not_kept() {
    let sys = Span::new(FileId(0), 10, 20);
    let out = |span: Span| SystemOutput {
        diagnostics: vec![Diagnostic::new(Rule::Inconsistent, span, "x")
            .with_label(Span::new(FileId(0), 12, 13), "y")],
        result: Arc::new(SystemResult {
            bodies: Vec::new(),
            alternatives: Vec::new(),
            adaptive: false,
        }),
        composition: Vec::new(),
    };
    assert!(inside(&mut out(Span::new(FileId(0), 10, 20)), sys));
    assert!(!inside(&mut out(Span::default()), sys));
    assert!(!inside(&mut out(Span::new(FileId(0), 5, 12)), sys));
    assert!(!inside(&mut out(Span::new(FileId(1), 12, 13)), sys));
    let mut o = out(Span::new(FileId(0), 14, 16));
    assert!(shift(&mut o, -4));
    assert_eq!(o.diagnostics[0].span, Span::new(FileId(0), 10, 12));
    assert_eq!(o.diagnostics[0].labels[0].span, Span::new(FileId(0), 8, 9));
    assert!(!shift(&mut o, -9));
}

#[test]
fn shifting_a_system_moves_every_span_of_it() {
    // Every span of a lowered system, moved with the text, is the span lowering gives.
    let doc = Doc::new(&[0, 1, 2, 3, 4, 5]);
    let src = doc.text();
    let pad = "\n# moved\n\n";
    let moved = format!("{pad}{src}");
    let a = crate::analyze(FileId(0), &src, &linear());
    let b = crate::analyze(FileId(0), &moved, &linear());
    for (x, y) in a.model.systems.iter().zip(&b.model.systems) {
        let mut x = x.clone();
        assert_ne!(format!("{x:?}"), format!("{y:?}"));
        assert!(shift(&mut x, pad.len() as i64));
        assert_eq!(format!("{x:?}"), format!("{y:?}"));
    }
}

/// One edit of a document.
#[derive(Debug, Clone)]
enum Edit {
    /// Change the n-th digit of a system.
    Digit(usize, usize),
    /// Insert blank and comment lines before a system.
    Gap(usize),
    /// Insert a comment line inside a system, after its first line.
    Comment(usize),
    /// Add or take away a silencing comment in a system.
    Allow(usize),
    Remove(usize),
    /// Put a copy of one system before another.
    Copy(usize, usize),
    /// Insert a new system of a shape.
    Add(usize, usize),
    /// Take the reference away, or bring it back.
    Ref,
    /// Insert a piece of syntax at a character of a system, or delete a run of characters.
    Raw(usize, usize, usize),
}

impl Edit {
    /// How many systems the edit may change (None: no bound, it may change any).
    fn touches(&self) -> Option<usize> {
        match self {
            Edit::Digit(..) | Edit::Comment(_) | Edit::Allow(_) | Edit::Add(..) => Some(1),
            Edit::Gap(_) | Edit::Remove(_) | Edit::Copy(..) => Some(0),
            Edit::Ref | Edit::Raw(..) => None,
        }
    }

    fn apply(&self, doc: &mut Doc) {
        let n = doc.systems.len();
        if n == 0 {
            if let Edit::Add(shape, i) = self {
                doc.systems.push(system(*shape, *i));
            }
            return;
        }
        match *self {
            Edit::Digit(k, nth) => {
                let s = &mut doc.systems[k % n];
                let digits: Vec<usize> = s
                    .char_indices()
                    .filter(|(_, c)| c.is_ascii_digit())
                    .map(|(i, _)| i)
                    .collect();
                if let Some(&at) = digits.get(nth % digits.len().max(1)) {
                    let d = s.as_bytes()[at] - b'0';
                    let new = ((d + 1) % 10).to_string();
                    s.replace_range(at..=at, &new);
                }
            }
            Edit::Gap(k) => doc.systems[k % n].insert_str(0, "\n# between systems\n\n"),
            Edit::Comment(k) => {
                let s = &mut doc.systems[k % n];
                if let Some(at) = s.find('\n') {
                    s.insert_str(at + 1, "  # a note\n");
                }
            }
            Edit::Allow(k) => {
                let s = &mut doc.systems[k % n];
                *s = if s.contains("# allow(") {
                    s.replace("# allow(", "# no allow(")
                } else {
                    s.replacen(
                        " }\n",
                        " } # allow(inconsistent, crossing-orbits): known\n",
                        1,
                    )
                };
            }
            Edit::Remove(k) => {
                doc.systems.remove(k % n);
            }
            Edit::Copy(from, to) => {
                let s = doc.systems[from % n].clone();
                doc.systems.insert(to % (n + 1), s);
            }
            Edit::Add(shape, i) => doc.systems.insert(i % (n + 1), system(shape, 100 + i)),
            Edit::Ref => {
                doc.header = if doc.header.is_empty() {
                    HEADER.to_string()
                } else {
                    String::new()
                };
            }
            Edit::Raw(k, at, what) => {
                let s = &mut doc.systems[k % n];
                let chars: Vec<usize> = s.char_indices().map(|(i, _)| i).collect();
                let i = at % chars.len().max(1);
                let Some(&from) = chars.get(i) else {
                    return;
                };
                let pieces = [
                    "{",
                    "}",
                    "\"",
                    "system \"X\" {",
                    "planet z orbits",
                    "± 1",
                    "\n",
                ];
                match pieces.get(what) {
                    Some(piece) => s.insert_str(from, piece),
                    None => {
                        let to = chars.get(i + 5).copied().unwrap_or(s.len());
                        s.replace_range(from..to, "");
                    }
                }
            }
        }
    }
}

fn edit() -> impl Strategy<Value = Edit> {
    let k = 0..16usize;
    prop_oneof![
        3 => (k.clone(), 0..200usize).prop_map(|(k, n)| Edit::Digit(k, n)),
        1 => k.clone().prop_map(Edit::Gap),
        1 => k.clone().prop_map(Edit::Comment),
        1 => k.clone().prop_map(Edit::Allow),
        1 => k.clone().prop_map(Edit::Remove),
        1 => (k.clone(), k.clone()).prop_map(|(a, b)| Edit::Copy(a, b)),
        1 => (0..6usize, k.clone()).prop_map(|(s, i)| Edit::Add(s, i)),
        1 => Just(Edit::Ref),
        1 => (k, 0..2000usize, 0..8usize).prop_map(|(k, a, w)| Edit::Raw(k, a, w)),
    ]
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 48, ..ProptestConfig::default() })]

    /// Random edits of random systems: the reused analysis is the fresh one after every
    /// edit, and while the text stays well formed, every system the edit did not touch is
    /// reused.
    #[test]
    fn reusing_gives_the_fresh_analysis(
        shapes in prop::collection::vec(0..6usize, 1..7),
        edits in prop::collection::vec(edit(), 1..6),
    ) {
        let mut doc = Doc::new(&shapes);
        let (_, mut keep) = step(&doc.text(), &linear(), None);
        let mut well_formed = true;
        for e in &edits {
            e.apply(&mut doc);
            let (a, next) = step(&doc.text(), &linear(), Some(&keep));
            keep = next;
            well_formed &= !matches!(e, Edit::Raw(..));
            if let (true, Some(touched)) = (well_formed, e.touches()) {
                let systems = a.model.systems.len();
                prop_assert!(
                    keep.reused() + touched >= systems,
                    "{e:?}: {} of {systems} reused", keep.reused()
                );
            }
        }
    }
}
