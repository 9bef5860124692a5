use super::*;
use crate::model::Form;

/// Hand-computed: a move up from 1.00 (+0.30/-0.10) to 1.50 (+0.20/-0.40) is measured by the
/// old value's upper side and the new value's lower side: sqrt(0.3² + 0.4²) = 0.5, so the
/// shift is 0.5 / 0.5 = +1.0. A move down from 1.00 (+0.30/-0.10) to 0.50 (+0.20/-0.40) is
/// measured by the other two sides: sqrt(0.1² + 0.2²) = 0.2236..., so -0.5 / 0.2236 = -2.236.
#[test]
fn shifts_use_the_sides_that_face_each_other() {
    let up = shift((1.0, 0.1, 0.3), (1.5, 0.4, 0.2)).unwrap();
    assert!((up - 1.0).abs() < 1e-12, "{up}");
    let down = shift((1.0, 0.1, 0.3), (0.5, 0.4, 0.2)).unwrap();
    // 0.5 / sqrt(0.05) = 2.2360679...
    assert!((down + 2.236_067_977).abs() < 1e-8, "{down}");
    // Symmetric: 3 ± 0.3 to 3.8 ± 0.4 is 0.8 / 0.5 = 1.6 sigma.
    let sym = shift((3.0, 0.3, 0.3), (3.8, 0.4, 0.4)).unwrap();
    assert!((sym - 1.6).abs() < 1e-12, "{sym}");
    assert_eq!(shift((2.0, 0.1, 0.1), (2.0, 0.5, 0.5)), Some(0.0));
    // Exact values that differ have no shift.
    assert_eq!(shift((2.0, 0.0, 0.0), (3.0, 0.0, 0.0)), None);
}

fn value(name: &'static str, origin: Origin, v: f64, s: f64) -> ValueSnapshot {
    ValueSnapshot {
        name,
        origin,
        value: v,
        below: s,
        above: s,
        form: if s > 0.0 {
            Form::Symmetric
        } else {
            Form::Exact
        },
        shown: format!("{v} ± {s}"),
        unit: String::new(),
        factor: 1.0,
        citations: Vec::new(),
        sources: Vec::new(),
        assumptions: Vec::new(),
    }
}

fn system(name: &str, values: Vec<ValueSnapshot>, class: Option<&'static str>) -> SystemSnapshot {
    SystemSnapshot {
        name: Some(name.into()),
        file: format!("{}.syz", name.to_lowercase()),
        bodies: vec![BodySnapshot {
            id: "b".into(),
            kind: "planet",
            values,
            class,
        }],
        diagnostics: Vec::new(),
        refs: Vec::new(),
    }
}

#[test]
fn the_threshold_decides_what_is_listed_and_declared_changes_always_are() {
    let old = [
        system(
            "A",
            vec![
                value("period", Origin::Declared, 3.0, 0.3),
                value("mass", Origin::Derived, 10.0, 1.0),
                value("radius", Origin::Derived, 5.0, 1.0),
            ],
            Some("rocky"),
        ),
        system("Gone", vec![], None),
    ];
    let new = [
        system(
            "A",
            vec![
                value("period", Origin::Declared, 3.1, 0.3),
                value("mass", Origin::Derived, 13.0, 1.0),
                value("radius", Origin::Derived, 5.5, 1.0),
                value("density", Origin::Derived, 1.0, 0.1),
            ],
            Some("water-world"),
        ),
        system("New", vec![], None),
    ];
    let diff = compare(
        &old,
        &new,
        DiffOptions {
            threshold: 1.0,
            all: false,
        },
    );
    assert!(diff.significant());
    let names: Vec<String> = diff.systems.iter().map(SystemDiff::title).collect();
    assert_eq!(names.len(), 3, "{names:?}");
    let a = diff
        .systems
        .iter()
        .find(|s| s.name.as_deref() == Some("A"))
        .unwrap();
    let listed: Vec<(ChangeKind, Option<&str>)> =
        a.changes.iter().map(|c| (c.kind, c.quantity)).collect();
    // mass: 3 / sqrt(2) = 2.12 sigma, listed; radius: 0.5 / sqrt(2) = 0.35, not listed;
    // period: declared, listed though within the threshold (0.1 / sqrt(0.18) = 0.24).
    assert!(
        listed.contains(&(ChangeKind::DerivedChanged, Some("mass"))),
        "{listed:?}"
    );
    assert!(!listed.iter().any(|l| l.1 == Some("radius")), "{listed:?}");
    assert!(listed.contains(&(ChangeKind::DeclaredChanged, Some("period"))));
    assert!(listed.contains(&(ChangeKind::DerivedAdded, Some("density"))));
    assert!(listed.contains(&(ChangeKind::ClassChanged, None)));
    let mass = a
        .changes
        .iter()
        .find(|c| c.quantity == Some("mass"))
        .unwrap();
    assert!((mass.shift.unwrap() - 3.0 / 2f64.sqrt()).abs() < 1e-12);
    let period = a
        .changes
        .iter()
        .find(|c| c.quantity == Some("period"))
        .unwrap();
    assert!(!period.significant);
    assert_eq!(diff.changes_not_listed, 1);
    let all = compare(
        &old,
        &new,
        DiffOptions {
            threshold: 1.0,
            all: true,
        },
    );
    assert_eq!(all.changes_not_listed, 0);
    // The same on both sides: nothing.
    let same = compare(
        &old,
        &old,
        DiffOptions {
            threshold: 1.0,
            all: true,
        },
    );
    assert!(same.systems.is_empty() && !same.significant());
}

/// A value whose interval came out symmetric in one version and barely asymmetric in the
/// other is still measured in sigma: 1.505 ± 0.072 to 1.453 (+0.070/-0.068) is a small move,
/// not an unmeasurable change (found comparing a catalogue with a stellar mass changed).
#[test]
fn a_symmetric_and_an_asymmetric_interval_compare_in_sigma() {
    let old = [system(
        "A",
        vec![value(
            "transit_duration_full",
            Origin::Derived,
            1.505,
            0.072,
        )],
        None,
    )];
    let mut moved = value("transit_duration_full", Origin::Derived, 1.453, 0.069);
    moved.below = 0.068;
    moved.above = 0.070;
    moved.form = Form::Asymmetric;
    let new = [system("A", vec![moved], None)];
    let diff = compare(
        &old,
        &new,
        DiffOptions {
            threshold: 1.0,
            all: true,
        },
    );
    let change = &diff.systems[0].changes[0];
    // Moved down: sqrt(0.072² + 0.070²) = 0.1004..., so -0.052 / 0.1004 = -0.518 sigma.
    let s = change.shift.expect("a shift in sigma");
    assert!((s + 0.052 / 0.072f64.hypot(0.070)).abs() < 1e-9, "{s}");
    assert!(!change.significant);
}

/// A source added beside the one used changes no number shown; the change says what was
/// added, and a source taken away is said too.
#[test]
fn sources_added_and_removed_are_named() {
    let one = ValueSnapshot {
        citations: vec!["a".into()],
        ..value("period", Origin::Declared, 10.0021, 0.0002)
    };
    let two = ValueSnapshot {
        sources: vec![
            "10.0021 ± 0.0002 [a] (used)".into(),
            "10.003 ± 0.001 [b]".into(),
        ],
        ..one.clone()
    };
    let options = DiffOptions {
        threshold: 1.0,
        all: false,
    };
    let c = value_change(Some("b"), Some(&one), Some(&two), options).unwrap();
    assert_eq!(c.kind, ChangeKind::DeclaredChanged);
    assert_eq!(c.notes, vec!["source added: 10.003 ± 0.001 [b]"]);
    let back = value_change(Some("b"), Some(&two), Some(&one), options).unwrap();
    assert_eq!(back.notes, vec!["source removed: 10.003 ± 0.001 [b]"]);
    // One declaration on each side: the change itself shows both numbers; only the
    // citation, which it does not show, is named.
    let other = ValueSnapshot {
        shown: "10.1 ± 0.0002".into(),
        ..value("period", Origin::Declared, 10.1, 0.0002)
    };
    let c = value_change(Some("b"), Some(&one), Some(&other), options).unwrap();
    assert_eq!(c.notes, vec!["citations changed: [a] → (no citation)"]);
    // Nothing changed, nothing said.
    assert!(value_change(Some("b"), Some(&two), Some(&two), options).is_none());
    // The `preferred` mark moved to the other source: the same two sources, another used.
    let moved = ValueSnapshot {
        sources: vec![
            "10.0021 ± 0.0002 [a]".into(),
            "10.003 ± 0.001 [b] (used)".into(),
        ],
        ..value("period", Origin::Declared, 10.003, 0.001)
    };
    let c = value_change(Some("b"), Some(&two), Some(&moved), options).unwrap();
    assert_eq!(
        c.notes,
        vec!["source used: 10.0021 ± 0.0002 [a] → 10.003 ± 0.001 [b]"]
    );
}

/// A derived limit has no uncertainty: one that moved only below the digits shown (its
/// inputs' rounding noise, e.g. a period edited in its seventh digit) is not significant,
/// while one whose shown value moved is; a declared limit that changed always is.
#[test]
fn a_derived_limit_counts_when_its_shown_value_moves() {
    let limit = |origin: Origin, v: f64, shown: &str| ValueSnapshot {
        form: Form::LowerLimit,
        shown: shown.to_string(),
        ..value("hill_radius", origin, v, 0.0)
    };
    let options = DiffOptions {
        threshold: 1.0,
        all: false,
    };
    let run = |o: ValueSnapshot, n: ValueSnapshot| {
        compare(
            &[system("A", vec![o], None)],
            &[system("A", vec![n], None)],
            options,
        )
    };
    let noise = run(
        limit(Origin::Derived, 0.002_100_000, "> 0.0021 au"),
        limit(Origin::Derived, 0.002_100_000_5, "> 0.0021 au"),
    );
    assert!(!noise.significant(), "{noise:?}");
    let moved = run(
        limit(Origin::Derived, 0.0021, "> 0.0021 au"),
        limit(Origin::Derived, 0.0025, "> 0.0025 au"),
    );
    assert!(moved.significant());
    let declared = run(
        limit(Origin::Declared, 0.002_100_000, "> 0.0021 au"),
        limit(Origin::Declared, 0.002_100_000_5, "> 0.0021 au"),
    );
    assert!(declared.significant());
    // A limit that changed direction at the same number moved, whatever the digits.
    let flipped = run(
        limit(Origin::Derived, 774.0, "> 774 K"),
        ValueSnapshot {
            form: Form::UpperLimit,
            ..limit(Origin::Derived, 774.0, "< 774 K")
        },
    );
    assert!(flipped.significant(), "{flipped:?}");
    // A predicted limit is judged as a derived one.
    let predicted = run(
        limit(Origin::Predicted, 3.713_37, "< 3.71 Rearth"),
        limit(Origin::Predicted, 3.713_38, "< 3.71 Rearth"),
    );
    assert!(!predicted.significant(), "{predicted:?}");
}

/// A declared value whose number stayed but whose citation or origin changed says what
/// changed, instead of showing `X → X` alone.
#[test]
fn a_citation_or_origin_change_is_named() {
    let mut old = value("mass", Origin::Declared, 0.9, 0.03);
    old.citations = vec!["a".into()];
    let mut new = old.clone();
    new.citations = vec!["b".into()];
    new.origin = Origin::Assumed;
    let diff = compare(
        &[system("A", vec![old], None)],
        &[system("A", vec![new], None)],
        DiffOptions {
            threshold: 1.0,
            all: false,
        },
    );
    let notes = &diff.systems[0].changes[0].notes;
    assert!(
        notes.contains(&"citations changed: [a] → [b]".to_string()),
        "{notes:?}"
    );
    assert!(
        notes.contains(&"origin changed: declared → assumed".to_string()),
        "{notes:?}"
    );
}

/// A line added with a value refused by a silenced rule is a change (it had no diagnostic
/// to compare, and the comparison found nothing).
#[test]
fn a_new_refused_declaration_with_its_finding_silenced_is_a_change() {
    let base = "system \"T\" {\n star s { mass = 0.9 ± 0.03 Msun }\n planet b orbits s {\n  period = 6.1 ± 0.01 d\n";
    let old = format!("{base} }}\n}}\n");
    let new = format!("{base}  eccentricity = 1.5 # allow(out-of-range): kept\n }}\n}}\n");
    let settings = crate::Settings::linear();
    let snap = |src: &str| {
        let a = crate::analyze(crate::source::FileId(0), src, &settings);
        snapshot(&a, "t.syz")
    };
    let diff = compare(
        &snap(&old),
        &snap(&new),
        DiffOptions {
            threshold: 1.0,
            all: false,
        },
    );
    assert!(diff.significant(), "{diff:?}");
    let change = &diff.systems[0].changes[0];
    assert_eq!(change.kind, ChangeKind::DiagnosticAdded);
    assert!(
        change
            .new
            .as_deref()
            .unwrap()
            .contains("`eccentricity = 1.5` of b is not used"),
        "{change:?}"
    );
}

/// A system copied into a second file: the first file's copy is matched with the old one
/// (unchanged, nothing listed) and only the copy is added; taking the copy away again is
/// one removal.
#[test]
fn a_system_copied_into_a_second_file_is_one_addition() {
    let one = system(
        "Wendle",
        vec![value("period", Origin::Declared, 3.0, 0.3)],
        None,
    );
    let mut copy = one.clone();
    copy.file = "copy.syz".into();
    let options = DiffOptions {
        threshold: 1.0,
        all: false,
    };
    let d = compare(
        std::slice::from_ref(&one),
        &[one.clone(), copy.clone()],
        options,
    );
    let statuses: Vec<(SystemStatus, Option<&str>)> = d
        .systems
        .iter()
        .map(|s| (s.status, s.new_file.as_deref().or(s.old_file.as_deref())))
        .collect();
    assert_eq!(statuses, [(SystemStatus::Added, Some("copy.syz"))], "{d:?}");
    assert_eq!(d.systems_compared, 1);
    let back = compare(&[one.clone(), copy], std::slice::from_ref(&one), options);
    let statuses: Vec<(SystemStatus, Option<&str>)> = back
        .systems
        .iter()
        .map(|s| (s.status, s.new_file.as_deref().or(s.old_file.as_deref())))
        .collect();
    assert_eq!(
        statuses,
        [(SystemStatus::Removed, Some("copy.syz"))],
        "{back:?}"
    );
}

/// A corrected citation is listed though no number moves: a reference whose text changed,
/// one added and one removed.
#[test]
fn a_changed_reference_text_is_listed() {
    let file = |refs: &[(&str, &str)]| SystemSnapshot {
        name: None,
        file: "x.syz".into(),
        bodies: Vec::new(),
        diagnostics: Vec::new(),
        refs: refs
            .iter()
            .map(|(i, t)| (i.to_string(), t.to_string()))
            .collect(),
    };
    let old = [file(&[("p1", "Invented paper 2030"), ("p2", "Gone")])];
    let new = [file(&[("p1", "Invented paper 2031"), ("p3", "New")])];
    let options = DiffOptions {
        threshold: 1.0,
        all: false,
    };
    let d = compare(&old, &new, options);
    assert!(d.significant());
    let kinds: Vec<(ChangeKind, Option<&str>, Option<&str>)> = d
        .systems
        .iter()
        .flat_map(|s| &s.changes)
        .map(|c| (c.kind, c.old.as_deref(), c.new.as_deref()))
        .collect();
    assert_eq!(
        kinds,
        [
            (
                ChangeKind::ReferenceChanged,
                Some("p1 \"Invented paper 2030\""),
                Some("p1 \"Invented paper 2031\"")
            ),
            (ChangeKind::ReferenceAdded, None, Some("p3 \"New\"")),
            (ChangeKind::ReferenceRemoved, Some("p2 \"Gone\""), None),
        ]
    );
    assert!(!compare(&old, &old, options).significant());
}

/// A planet newly declared eccentric, with no argument of periastron: the default 90 deg
/// reported before is now spread over a full turn, not "no longer derived".
#[test]
fn a_default_argument_of_periastron_now_spread_is_said_so() {
    let omega = value(
        "arg_periastron",
        Origin::Default,
        std::f64::consts::FRAC_PI_2,
        0.0,
    );
    let mut inclination = value("inclination", Origin::Derived, 1.5, 0.01);
    inclination.assumptions = vec![crate::derive::SPREAD_PERIASTRON.to_string()];
    let old = [system(
        "Wendle",
        vec![omega, value("inclination", Origin::Derived, 1.5, 0.01)],
        None,
    )];
    let new = [system("Wendle", vec![inclination], None)];
    let options = DiffOptions {
        threshold: 1.0,
        all: true,
    };
    let d = compare(&old, &new, options);
    let c = d
        .systems
        .iter()
        .flat_map(|s| &s.changes)
        .find(|c| c.quantity == Some("arg_periastron"))
        .expect("a change of the argument of periastron");
    assert_eq!(c.kind, ChangeKind::DerivedChanged);
    assert_eq!(c.new.as_deref(), Some("spread uniformly over 0-360 deg"));
}

/// A name written twice in one file: the same file on both sides compares as unchanged
/// (the second of one side was paired with the first of the other), and an edit of the
/// second is its own.
#[test]
fn a_name_written_twice_in_one_file_pairs_each_with_its_own() {
    let first = system(
        "Cardell",
        vec![value("period", Origin::Declared, 3.5, 0.001)],
        None,
    );
    let second = system(
        "Cardell",
        vec![value("period", Origin::Declared, 7.5, 0.001)],
        None,
    );
    let options = DiffOptions {
        threshold: 1.0,
        all: false,
    };
    let side = [first.clone(), second.clone()];
    let same = compare(&side, &side, options);
    assert!(!same.significant(), "{same:?}");
    assert_eq!(same.systems_compared, 2);
    let edited = system(
        "Cardell",
        vec![value("period", Origin::Declared, 9.5, 0.001)],
        None,
    );
    let d = compare(&side, &[first, edited], options);
    let moved: Vec<(Option<&str>, Option<&str>)> = d
        .systems
        .iter()
        .flat_map(|s| &s.changes)
        .map(|c| (c.old.as_deref(), c.new.as_deref()))
        .collect();
    assert_eq!(moved, [(Some("7.5 ± 0.001"), Some("9.5 ± 0.001"))]);
}

/// A file renamed with its references: nothing is added or removed outside its systems.
#[test]
fn references_of_a_renamed_file_are_not_added_and_removed() {
    let file = |name: &str| SystemSnapshot {
        name: None,
        file: name.into(),
        bodies: Vec::new(),
        diagnostics: Vec::new(),
        refs: vec![("p1".into(), "Invented paper 2030".into())],
    };
    let options = DiffOptions {
        threshold: 1.0,
        all: true,
    };
    let d = compare(&[file("p.syz")], &[file("r.syz")], options);
    assert!(d.systems.is_empty(), "{d:?}");
    assert!(!d.significant());
}
