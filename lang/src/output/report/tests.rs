//! Tests of the text and JSON reports.

use super::*;
use crate::source::FileId;

const SRC: &str = "system \"S\" {\n star s { mass = 1 ± 0.05 Msun; radius = 1 ± 0.02 Rsun }\n planet b orbits s {\n  period = 3 ± 0.001 d\n  transit_depth = 1 ± 0.04 %\n }\n}\n";

fn explain(qty: Qty) -> String {
    let a = crate::analyze(FileId(0), SRC, &crate::Settings::linear());
    explain_text(&a, 0, (1, qty)).unwrap()
}

#[test]
fn the_precision_line_points_to_auto_only_where_auto_was_not_used() {
    // At 10^4 samples some values of this system are not stable to two digits.
    let a = crate::analyze(FileId(0), SRC, &crate::Settings::default());
    let q = &a.results[0].bodies[1].quantities;
    assert!(q.iter().any(|q| !q.stable()), "{q:?}");
    let fixed = precision_line(q, false).unwrap();
    assert!(
        fixed.ends_with("; --samples auto draws until they are)"),
        "{fixed}"
    );
    // After `--samples auto` reached its most, pointing to it would send the user round.
    let auto = precision_line(q, true).unwrap();
    assert!(
        auto.ends_with("; --samples auto stopped at the most samples it draws for this system)"),
        "{auto}"
    );
}

#[test]
fn explain_lists_every_source_of_a_value() {
    let src = "ref a \"Invented A\"\nref b \"Invented B\"\nsystem \"S\" {\n star s { mass = 1 ± 0.05 Msun }\n planet b orbits s {\n  period = 3 ± 0.01 d [a]\n  period = 3.002 ± 0.001 d [b]\n }\n}\n";
    let a = crate::analyze(FileId(0), src, &crate::Settings::linear());
    let text = explain_text(&a, 0, (1, Qty::Period)).unwrap();
    assert!(
            text.contains("2 sources, in file order:\n  - 3.000 ± 0.010 d [a]\n  - 3.0020 ± 0.0010 d [b] (used)\n"),
            "{text}"
        );
}

#[test]
fn a_grazing_transit_says_so_and_why_it_has_no_full_duration() {
    let src = "system \"S\" {\n star s { mass = 1.1 ± 0.04 Msun; radius = 1.2 ± 0.03 Rsun }\n planet b orbits s {\n  period = 3.9 ± 0.0002 d\n  transit_depth = 0.8 ± 0.05 %\n  impact = 1.02 ± 0.02\n }\n}\n";
    let a = crate::analyze(FileId(0), src, &crate::Settings::linear());
    let k = a.results[0].bodies[1].get(Qty::RadiusRatio).unwrap();
    assert_eq!(k.rule, Some("depth-impact-radius-ratio"));
    assert!(
        k.notes.iter().any(|n| n.starts_with("grazing transit")),
        "{:?}",
        k.notes
    );
    let why = missing_text(&a, 0, 1, Qty::TransitDurationFull);
    assert!(why.contains("the transit is grazing"), "{why}");
    assert!(!why.contains("no rule derives it"), "{why}");
}

#[test]
fn a_declared_radius_ratio_on_a_grazing_orbit_predicts_the_covered_fraction() {
    // k = 0.1 at b = 0.98 covers 0.616 % of a uniform star (Mandel & Agol 2002 eq. 1,
    // evaluated with numpy), where k^2 would say 1 %.
    let src = "system \"S\" {\n star s { mass = 1 ± 0.03 Msun; radius = 1 ± 0.02 Rsun }\n planet b orbits s {\n  period = 3 ± 0.0001 d\n  radius_ratio = 0.1 ± 0.002\n  impact = 0.98 ± 0.02\n }\n}\n";
    let a = crate::analyze(FileId(0), src, &crate::Settings::linear());
    let depth = a.results[0].bodies[1].get(Qty::TransitDepth).unwrap();
    assert_eq!(depth.rule, Some("radius-ratio-impact-depth"));
    assert!((depth.value - 0.006163).abs() < 2e-5, "{}", depth.value);
    assert!(
        depth.notes.iter().any(|n| n.contains("less than k^2")),
        "{:?}",
        depth.notes
    );
    // The declared k is not said to be solved from the depth.
    let k = a.results[0].bodies[1].get(Qty::RadiusRatio).unwrap();
    assert!(
        k.notes.iter().all(|n| !n.contains("solved from the depth")),
        "{:?}",
        k.notes
    );
    // Past 1 + k: no depth at all, and no grazing note, only the geometry error.
    let none = src.replace("0.98 ± 0.02", "1.2 ± 0.02");
    let a = crate::analyze(FileId(0), &none, &crate::Settings::linear());
    assert!(a.results[0].bodies[1].get(Qty::TransitDepth).is_none());
    let k = a.results[0].bodies[1].get(Qty::RadiusRatio).unwrap();
    assert!(
        k.notes.iter().all(|n| !n.contains("grazing")),
        "{:?}",
        k.notes
    );
    assert!(a
        .diagnostics
        .iter()
        .any(|d| d.message.contains("never crosses")));
}

#[test]
fn a_tsm_whose_radius_spans_a_bin_edge_says_the_metric_jumps_there() {
    // Kempton et al. 2018, Table 1 (values from memory, as in `tsm_scale_factor`): the
    // scale factor is 0.190 below 1.5 Rearth and 1.26 from there, so a radius of
    // 1.5 ± 0.05 Rearth gives a metric with two peaks.
    let src = |r: &str| {
        format!("system \"S\" {{\n star s {{ mass = 0.4 ± 0.02 Msun; radius = 0.4 ± 0.01 Rsun; teff = 3500 ± 50 K; magnitude_j = 9.5 ± 0.02 mag }}\n planet c orbits s {{\n  period = 5 ± 0.0001 d\n  radius = {r} Rearth\n  mass = 3 ± 0.5 Mearth\n }}\n}}\n")
    };
    let note = |r: &str, settings: &crate::Settings| {
        let a = crate::analyze(FileId(0), &src(r), settings);
        let tsm = a.results[0].bodies[1].get(Qty::Tsm).unwrap().clone();
        tsm.notes.into_iter().find(|n| n.contains("spans the edge"))
    };
    for settings in [crate::Settings::linear(), crate::Settings::default()] {
        let n = note("1.5 ± 0.05", &settings).expect("a note at the edge");
        assert!(
            n.contains("at 1.5 Rearth (scale factor 0.19 below, 1.26 above)"),
            "{n}"
        );
        assert!(note("2.0 ± 0.05", &settings).is_none());
    }
}

#[test]
fn a_star_near_the_end_of_the_habitable_zone_fits_says_so_once() {
    // Kopparapu et al. (2014): the fits hold for Teff 2600-7200 K; 7180 ± 60 K reaches
    // past it, which first order would otherwise extrapolate without a word.
    let src = |t: &str| {
        format!("system \"S\" {{\n star s {{ mass = 1.5 ± 0.05 Msun; radius = 1.6 ± 0.05 Rsun; teff = {t} K }}\n planet b orbits s {{ period = 300 ± 1 d }}\n}}\n")
    };
    for settings in [crate::Settings::linear(), crate::Settings::default()] {
        let a = crate::analyze(FileId(0), &src("7180 ± 60"), &settings);
        let notes: Vec<&String> = a.results[0].bodies[0]
            .quantities
            .iter()
            .flat_map(|q| &q.notes)
            .filter(|n| n.contains("where the fits of Kopparapu et al. (2014) end"))
            .collect();
        assert_eq!(notes.len(), 1, "{notes:?}");
        assert!(notes[0].contains("reaches past 7200 K"), "{}", notes[0]);
        let a = crate::analyze(FileId(0), &src("6500 ± 60"), &settings);
        assert!(a.results[0].bodies[0]
            .quantities
            .iter()
            .flat_map(|q| &q.notes)
            .all(|n| !n.contains("where the fits of Kopparapu")));
    }
}

#[test]
fn a_value_without_a_route_says_what_each_route_lacks() {
    // An RV-only planet: the minimum mass follows, the true mass needs the inclination.
    let src = "system \"S\" {\n star s { mass = 1 ± 0.05 Msun }\n planet b orbits s { period = 4.2 d; rv_amplitude = 55 ± 2 m/s }\n planet c { period = 9 d }\n}\n";
    let a = crate::analyze(FileId(0), src, &crate::Settings::linear());
    let why = missing_text(&a, 0, 1, Qty::Mass);
    assert!(
        why.starts_with(
            "not declared, and not derivable from what the file declares: it follows by"
        ),
        "{why}"
    );
    assert!(
            why.contains("from b.rv_amplitude, b.period, s.mass, b.eccentricity and b.inclination, of which b.inclination has no value"),
            "{why}"
        );
    // Inputs the engine has defaults for (albedo, heat redistribution) are not lacking.
    let why = missing_text(&a, 0, 1, Qty::Teq);
    assert!(
        why.contains("of which s.teff and s.radius have no value"),
        "{why}"
    );
    // A planet without a host star: the host is what its routes lack.
    let why = missing_text(&a, 0, 2, Qty::SemiMajorAxis);
    assert!(why.contains("the host star's mass"), "{why}");
    // A quantity no rule derives.
    let why = missing_text(&a, 0, 0, Qty::MagnitudeV);
    assert_eq!(why, "not declared, and no rule derives it");
}

#[test]
fn a_declared_value_is_never_its_own_driver() {
    let e = explain(Qty::TransitDepth);
    assert!(!e.contains("improve b.transit_depth"), "{e}");
    assert!(e.contains("b.transit_depth is declared"), "{e}");
    // A derived value still names its largest input.
    let e = explain(Qty::RadiusRatio);
    assert!(
        e.contains("to improve this value, improve b.transit_depth first"),
        "{e}"
    );
}

#[test]
fn monte_carlo_values_say_how_precise_their_samples_are() {
    let mc = crate::analyze(FileId(0), SRC, &crate::Options::default().into());
    let e = explain_text(&mc, 0, (1, Qty::RadiusRatio)).unwrap();
    let line = e
        .lines()
        .find(|l| l.starts_with("Monte Carlo precision (10000 samples"))
        .unwrap_or_else(|| panic!("{e}"));
    assert!(
        line.contains("lower end ±") && line.contains("upper end ±"),
        "{line}"
    );
    // First order: a value not from samples says nothing of the kind.
    assert!(!explain(Qty::RadiusRatio).contains("Monte Carlo precision"));
    // The text report: one line per body with sampled values.
    let text = eval_text(&mc, &crate::source::MemoryDb::new());
    assert_eq!(
        text.matches("Monte Carlo precision: 10000 samples").count(),
        2,
        "{text}"
    );
}

/// The unit of each `quantity` row of a text report.
fn units_of(text: &str, quantity: &str) -> Vec<String> {
    text.lines()
        .filter(|l| l.trim_start().starts_with(&format!("{quantity} ")))
        .map(|l| {
            let value = l
                .split("  ")
                .map(str::trim)
                .find(|p| !p.is_empty() && *p != quantity);
            value.unwrap().rsplit(' ').next().unwrap().to_string()
        })
        .collect()
}

#[test]
fn one_unit_per_quantity_in_a_table() {
    // An Earth-mass planet close in (Hill radius about 6e4 km, mass in Earth masses on
    // its own) and a Jupiter far out (Hill radius 0.3 au, mass in Jupiter masses).
    let src = "system \"S\" {\n star s { mass = 1 ± 0.05 Msun; radius = 1 ± 0.02 Rsun; teff = 5800 ± 50 K }\n planet b orbits s { period = 3 ± 0.001 d; mass = 3 ± 0.3 Mearth }\n planet c orbits s { period = 4000 ± 10 d; mass = 1 ± 0.1 Mjup }\n planet d orbits s { period = 400 ± 10 d; min_mass = 0.5 ± 0.1 Mjup }\n}\n";
    let a = crate::analyze(FileId(0), src, &crate::Settings::linear());
    // Each value alone would be shown in its own unit...
    let alone: Vec<&str> = a.results[0]
        .bodies
        .iter()
        .filter_map(|b| b.get(Qty::HillRadius))
        .map(|q| q.shown_unit().symbol)
        .collect();
    assert_eq!(alone, ["km", "au", "au"]);
    // ...but the table has one unit per quantity, mass and minimum mass together.
    let mut db = crate::source::MemoryDb::new();
    db.add("s.syz", src);
    let text = eval_text(&a, &db);
    assert_eq!(units_of(&text, "hill_radius"), ["au", "au", "au"], "{text}");
    let masses = [units_of(&text, "mass"), units_of(&text, "min_mass")].concat();
    assert_eq!(masses, ["Msun", "Mjup", "Mjup", "Mjup"], "{text}");
}

/// An eccentric orbit's undeclared argument of periastron is an input spread over a full
/// turn: `explain` says so instead of calling it "not available".
#[test]
fn explain_names_a_spread_argument_of_periastron() {
    let src = SRC.replace(
        "  transit_depth = 1 ± 0.04 %\n",
        "  transit_depth = 1 ± 0.04 %\n  impact = 0.3 ± 0.05\n  eccentricity = 0.2 ± 0.05\n",
    );
    let a = crate::analyze(FileId(0), &src, &crate::Settings::linear());
    let e = explain_text(&a, 0, (1, Qty::Inclination)).unwrap();
    assert!(
        e.contains("b.arg_periastron: not declared; argument of periastron unknown: spread uniformly over 0-360 deg (default)"),
        "{e}"
    );
    assert!(!e.contains("not available"), "{e}");
}
