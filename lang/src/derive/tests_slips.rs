//! Unit slips named in an inconsistency's help: the declared value's own unit, or the unit of
//! a measurement further up the route that disagrees. Every system here is invented.

use crate::derive::Options;
use crate::diagnostic::Rule;
use crate::source::FileId;
use crate::{analyze, Analysis};

fn run(src: &str) -> Analysis {
    analyze(FileId(0), src, &Options::linear().into())
}

/// The help of every `inconsistent` finding.
fn helps(a: &Analysis) -> Vec<String> {
    a.diagnostics
        .iter()
        .filter(|d| d.rule == Rule::Inconsistent)
        .map(|d| d.help.clone().unwrap_or_default())
        .collect()
}

const EVRIN: &str = "system \"Evrin\" {
  star a { mass = 0.95 ± 0.04 Msun; radius = 0.91 ± 0.03 Rsun; teff = 5500 ± 80 K }
  planet b orbits a { period = 4.1 ± 0.001 d; semi_major_axis = 0.0475 ± 0.0008 au }
  planet c orbits a { period = 6.2 ± 0.001 d; transit_depth = 0.12 ± 0.005 %; radius = 3.4 ± 0.2 Rearth }
}";

#[test]
fn a_consistent_system_has_nothing_to_name() {
    // Kepler's third law: 4.1 d around 0.95 Msun is about 0.048 au (common practice: 1 yr at
    // 1 au around 1 Msun, a ∝ P^(2/3) M^(1/3)); sqrt(0.0012) 0.91 Rsun is 3.44 Rearth.
    let a = run(EVRIN);
    assert!(helps(&a).is_empty(), "{:#?}", a.diagnostics);
}

#[test]
fn a_period_in_hours_is_found_through_the_star() {
    // 4.1 h for 4.1 d: the period enters the star's mass from Kepler's third law squared
    // (576 times too large), and its density from a/R* and P (576 times too).
    let a = run(&EVRIN.replace("period = 4.1 ± 0.001 d", "period = 4.1 ± 0.001 h"));
    let found = helps(&a);
    assert!(!found.is_empty(), "{:#?}", a.diagnostics);
    for h in &found {
        assert!(
            h.contains("was b.period written in h where d was meant?"),
            "{found:#?}"
        );
    }
}

#[test]
fn a_depth_as_a_fraction_meant_as_percent_is_found_through_the_radius() {
    // 0.12 for 0.12 %: the radius ratio is 10 times too large, the radius 34 Rearth.
    let a = run(&EVRIN.replace("0.12 ± 0.005 %", "0.12 ± 0.005"));
    let found = helps(&a);
    assert_eq!(found.len(), 1, "{:#?}", a.diagnostics);
    assert!(
        found[0].contains("was c.transit_depth written as a fraction where % was meant?"),
        "{}",
        found[0]
    );
    // The declared radius read in Rjup fits as well (38 Rearth against 34 ± 1.3): both are
    // named, the value's own unit first.
    assert!(
        found[0].starts_with("Read in Rjup instead of Rearth")
            && found[0].contains(" Or, read in % "),
        "{}",
        found[0]
    );
}

#[test]
fn a_mass_in_earth_masses_meant_as_jupiter_masses_falls_below_the_minimum_mass() {
    // K = 120 m/s at 4.1 d around 1 Msun is a minimum mass of about 0.95 Mjup (common
    // practice: 1 Mjup on a 1 yr orbit of 1 Msun gives 28.4 m/s, and K scales as P^(-1/3),
    // so 127 m/s at 4.1 d).
    let src = "system \"Dovan\" {
  star s { mass = 1.0 ± 0.04 Msun; radius = 1.0 ± 0.03 Rsun }
  planet b orbits s { period = 4.1 ± 0.001 d; rv_amplitude = 120 ± 5 m/s; mass = 1.05 ± 0.05 Mearth }
}";
    let a = run(src);
    let found = helps(&a);
    assert!(
        found
            .iter()
            .any(|h| h.contains("was it written in Mearth where Mjup was meant?")),
        "{found:#?}"
    );
    // The amplitude in km/s meant as m/s makes the minimum mass about 1000 times too large,
    // near the ratio of Msun to Mjup; but the mass was written in Mearth, so no unit of the
    // mass is named.
    let a = run(&src.replace("120 ± 5 m/s", "120 ± 5 km/s"));
    let found = helps(&a);
    assert!(!found.is_empty(), "{:#?}", a.diagnostics);
    assert!(found.iter().all(|h| !h.contains("Msun")), "{found:#?}");
}

/// Every finding of `rule`.
fn findings(a: &Analysis, rule: Rule) -> Vec<&crate::diagnostic::Diagnostic> {
    a.diagnostics.iter().filter(|d| d.rule == rule).collect()
}

/// The help of every finding of `rule`.
fn helps_of(a: &Analysis, rule: Rule) -> Vec<String> {
    a.diagnostics
        .iter()
        .filter(|d| d.rule == rule)
        .map(|d| d.help.clone().unwrap_or_default())
        .collect()
}

#[test]
fn an_implausible_star_from_a_period_in_hours_names_the_period() {
    // The star's mass comes only from the transit's density, 3 pi (a/R*)^3 / (G P^2)
    // (Seager & Mallén-Ornelas 2003 eq. 9): a period of 4.2 h for 4.2 d makes it 576 times
    // too large (608 Msun), and the help names the period, not the star's units.
    let src = "system \"Brisk\" {
  star s { radius = 0.97 ± 0.03 Rsun; teff = 5700 ± 100 K }
  planet b orbits s { period = 4.2 ± 0.0001 h; a_rs = 11.5 ± 0.3 }
}";
    let a = run(src);
    let found = helps_of(&a, Rule::ImplausibleStar);
    assert_eq!(found.len(), 1, "{:#?}", a.diagnostics);
    assert!(
        found[0].contains("was b.period written in h where d was meant?"),
        "{}",
        found[0]
    );
    // A star whose mass was declared keeps the help about its own units.
    let declared = "system \"Brisk\" {\n  star s { mass = 600 Msun; radius = 0.97 Rsun }\n}";
    let found = helps_of(&run(declared), Rule::ImplausibleStar);
    assert!(found[0].starts_with("check the units"), "{found:?}");
}

#[test]
fn durations_with_no_solution_are_said_once_and_a_long_one_is_read_in_hours() {
    // T14 and T23 so close (3.9 h and 3.8 h) that with k = sqrt(0.3 %) no impact parameter
    // gives them (Seager & Mallén-Ornelas 2003 eq. 7: b^2 < 0): one note names both, and no
    // unit is suggested, since no duration is longer than a transit can last.
    let src = "system \"Lumen\" {
  star s { radius = 0.90 ± 0.03 Rsun; mass = 1.0 ± 0.05 Msun }
  planet c orbits s {
    period = 11.0 ± 0.001 d
    transit_depth = 0.3 ± 0.02 %
    transit_duration = 3.9 ± 0.05 h
    transit_duration_full = 3.8 ± 0.05 h
  }
}";
    let a = run(src);
    let notes = findings(&a, Rule::NotDerivable);
    assert_eq!(notes.len(), 1, "{:#?}", a.diagnostics);
    assert_eq!(
        notes[0].message,
        "nothing is derived from c.transit_duration and c.transit_duration_full: impact-from-durations has no solution for the values as given (at their nominal values)"
    );
    assert!(notes[0].help.as_deref().unwrap_or("").starts_with("check "));
    // A total duration of 2.9 d on a 5.1 d orbit is no transit; 2.9 h is.
    let long = src
        .replace("3.9 ± 0.05 h", "2.9 ± 0.03 d")
        .replace("3.8 ± 0.05 h", "2.3 ± 0.03 h")
        .replace("11.0 ± 0.001 d", "5.1 ± 0.001 d")
        .replace("0.3 ± 0.02 %", "1.0 ± 0.02 %");
    let found = helps_of(&run(&long), Rule::NotDerivable);
    assert!(
        found
            .iter()
            .any(|h| h.contains("was c.transit_duration written in d where h was meant?")),
        "{found:#?}"
    );
}

#[test]
fn two_transits_that_disagree_on_the_star_are_one_finding() {
    // Two planets' a/R* give the star two densities (2.00 and 1.15 g/cm^3); the star's mass
    // filled from one and compared with Kepler's law through the other would say the same
    // again.
    let src = "system \"Lumen\" {
  star s { radius = 0.90 ± 0.03 Rsun }
  planet b orbits s { period = 5.1 ± 0.0001 d; a_rs = 14.0 ± 0.4 }
  planet c orbits s { period = 9.0 ± 0.0001 d; a_rs = 17.0 ± 0.4 }
}";
    let a = run(src);
    let found = findings(&a, Rule::Inconsistent);
    assert_eq!(found.len(), 1, "{:#?}", a.diagnostics);
    assert!(
        found[0].message.starts_with("s.density = "),
        "{}",
        found[0].message
    );
}

#[test]
fn a_declared_value_compared_with_a_route_is_not_called_idle() {
    // a/R* = 0.8 (inside the star) gives the star no density, but the value is compared with
    // a/R* from Kepler's law (about 18): the disagreement says what became of it, and no
    // note calls it unused.
    let src = "system \"Gorm\" {
  star s { mass = 1 ± 0.05 Msun; radius = 1 ± 0.03 Rsun }
  planet c orbits s { period = 9 ± 0.001 d; a_rs = 0.8 ± 0.05 }
}";
    let a = run(src);
    assert_eq!(
        helps_of(&a, Rule::Inconsistent).len(),
        1,
        "{:#?}",
        a.diagnostics
    );
    assert!(
        helps_of(&a, Rule::NotDerivable).is_empty(),
        "{:#?}",
        a.diagnostics
    );
}

#[test]
fn a_transiting_planet_s_mass_is_bounded_by_its_minimum_mass() {
    // K = 3.2 m/s at 3.5 d around 0.93 Msun: Mp sin i = 7.24 Mearth (the exact solution of
    // the mass function). The planet transits, so i is near 90 deg: with a/R* about 10.8
    // (Kepler's law) and k = sqrt(700 ppm), cos i <= (1 + k)/(a/R*) (Winn 2010 eq. 7 with
    // b <= 1 + k), sin i >= 0.995, and the mass is at most about 7.3 Mearth. A declared
    // 10 Mjup is 318 times that: a unit slip, named.
    let src = "system \"Hask\" {
  star s { mass = 0.93 ± 0.04 Msun; radius = 0.88 ± 0.03 Rsun }
  planet b orbits s {
    period = 3.5 ± 0.0001 d
    rv_amplitude = 3.2 ± 0.3 m/s
    mass = 10 ± 1 Mjup
    transit_depth = 700 ± 30 ppm
  }
}";
    let a = run(src);
    let found = findings(&a, Rule::Inconsistent);
    assert_eq!(found.len(), 1, "{:#?}", a.diagnostics);
    assert!(
        found[0]
            .message
            .contains("the most a transiting orbit allows"),
        "{}",
        found[0].message
    );
    assert!(
        found[0]
            .help
            .as_deref()
            .unwrap_or("")
            .contains("was it written in Mjup where Mearth was meant?"),
        "{:?}",
        found[0].help
    );
    // 7.5 ± 0.5 Mearth fits the bound; without the transit nothing bounds the mass.
    for fine in [
        src.replace("10 ± 1 Mjup", "7.5 ± 0.5 Mearth"),
        src.replace("    transit_depth = 700 ± 30 ppm\n", ""),
    ] {
        let a = run(&fine);
        assert!(
            helps_of(&a, Rule::Inconsistent).is_empty(),
            "{:#?}",
            a.diagnostics
        );
    }
}

#[test]
fn a_minor_limit_is_taken_at_the_end_that_bounds_the_value() {
    // K < 2.1 m/s bounds the minimum mass from above; an eccentricity < 0.1 holds about 0.1 %
    // of its variance and lowers it (Mp sin i ∝ K sqrt(1 - e^2)), so the bound is at e = 0:
    // the same as with a circular orbit. Left at the middle of its range (e = 0.05), it
    // gave < 6.81 Mearth instead of < 6.82.
    let circular = "system \"Corrow\" {
  star a { mass = 0.85 ± 0.03 Msun; radius = 0.82 ± 0.02 Rsun }
  planet b orbits a { period = 12.4 ± 0.001 d; rv_amplitude < 2.1 m/s }
}";
    let eccentric = circular.replace("< 2.1 m/s", "< 2.1 m/s; eccentricity < 0.1");
    let bound = |src: &str| {
        let a = run(src);
        let sys = a.model.systems.first().expect("system");
        let q = a.results[0].bodies[sys.body("b").expect("b")]
            .get(crate::quantities::Qty::MinMass)
            .cloned()
            .expect("a minimum mass");
        assert_eq!(q.form, crate::model::Form::UpperLimit);
        q.value
    };
    let (c, e) = (bound(circular), bound(&eccentric));
    assert!((e / c - 1.0).abs() < 1e-12, "{e} against {c}");
}

#[test]
fn an_amplitude_in_km_s_is_found_behind_a_minimum_mass_above_the_mass() {
    // 5.0 km/s for 5.0 m/s: the minimum mass (45 Mjup) exceeds the declared 0.044 Mjup, and
    // read in m/s the amplitude gives 0.044 Mjup (Mp sin i ∝ K).
    let src = "system \"Quorra\" {
  star q { mass = 0.95 ± 0.02 Msun }
  planet b orbits q { period = 6.3 ± 0.0001 d; rv_amplitude = 5.0 ± 0.3 km/s; mass = 0.044 ± 0.004 Mjup }
}";
    let found = helps_of(&run(src), Rule::Inconsistent);
    assert_eq!(found.len(), 1, "{found:#?}");
    assert!(
        found[0].contains("was b.rv_amplitude written in km/s where m/s was meant?"),
        "{}",
        found[0]
    );
}

#[test]
fn a_grazing_transit_does_not_bound_the_mass_by_the_depth_alone() {
    // Invented grazing companion: M* = R* = 0.3 (solar units), P = 0.25 d, a true radius
    // ratio of 0.343 at b = 1.33 (i = 69.9 deg) shows only 424 ppm. Its 40 Mjup is 6 % above
    // the minimum mass: allowed, since sin 69.9 deg = 0.94, though sqrt(424 ppm) = 0.021
    // would put the grazing inclination at 74 deg.
    let src = "system \"Brisel\" {
  star s { mass = 0.300 ± 0.003 Msun; radius = 0.300 ± 0.003 Rsun }
  planet b orbits s { period = 0.25 ± 0.00001 d; transit_depth = 424 ± 20 ppm; rv_amplitude = 24974 ± 120 m/s; mass = 40.0 ± 0.2 Mjup }
}";
    let a = run(src);
    assert!(
        findings(&a, Rule::Inconsistent)
            .iter()
            .all(|d| !d.message.contains("the most a transiting orbit allows")),
        "{:#?}",
        a.diagnostics
    );
}

#[test]
fn durations_out_of_order_are_one_finding_not_also_idle() {
    // T23 = 3.0 h above T14 = 2.9 h: the order finding says so; that the durations then
    // admit no impact parameter is the same matter, not a second note.
    let src = "system \"Dorrel\" {
  star s { radius = 0.90 ± 0.03 Rsun; mass = 1.0 ± 0.05 Msun }
  planet c orbits s { period = 5.0 ± 0.001 d; transit_depth = 1.0 ± 0.02 %; transit_duration = 2.9 ± 0.02 h; transit_duration_full = 3.0 ± 0.02 h }
}";
    let a = run(src);
    assert_eq!(
        findings(&a, Rule::Inconsistent).len(),
        1,
        "{:#?}",
        a.diagnostics
    );
    assert!(
        findings(&a, Rule::NotDerivable).is_empty(),
        "{:#?}",
        a.diagnostics
    );
}

#[test]
fn a_radius_above_the_depth_s_says_the_transit_may_graze() {
    // 424 ppm gives k = 0.021 if the transit is not grazing; a declared radius of 1 Rjup
    // before 0.3 Rsun (k = 0.34) is what a grazing transit at b = 1.33 shows (invented). The
    // finding stays (no impact parameter tells), with a note that says so; a declared radius
    // below sqrt(depth) R* gets no such note, since no geometry makes a depth larger than k^2.
    let src = "system \"Brisel\" {
  star s { mass = 0.300 ± 0.003 Msun; radius = 0.300 ± 0.003 Rsun }
  planet b orbits s { period = 0.25 ± 0.00001 d; transit_depth = 424 ± 20 ppm; radius = 1.0 ± 0.03 Rjup }
}";
    let grazing = |src: &str| -> bool {
        let a = run(src);
        let found = findings(&a, Rule::Inconsistent);
        assert_eq!(found.len(), 1, "{:#?}", a.diagnostics);
        found[0]
            .notes
            .iter()
            .any(|n| n.contains("takes the transit as not grazing"))
    };
    assert!(grazing(src));
    assert!(!grazing(
        &src.replace("1.0 ± 0.03 Rjup", "0.5 ± 0.03 Rearth")
    ));
}

/// A velocity amplitude of `0 ± 0.5 m/s` (a non-detection) has no minimum mass at its
/// value: the note says how to declare it so that it bounds the mass, and `explain` names
/// the route that had every input first.
#[test]
fn a_non_detection_written_as_zero_is_pointed_to_a_limit() {
    let src = "system \"Zerrow\" {
  star s { mass = 0.8 ± 0.03 Msun; radius = 0.75 ± 0.02 Rsun; teff = 4800 ± 70 K }
  planet b orbits s { period = 2.5 ± 0.0001 d; rv_amplitude = 0 ± 0.5 m/s }
}";
    let a = run(src);
    let found = helps_of(&a, Rule::NotDerivable);
    assert!(
        found
            .iter()
            .any(|h| h.contains("consistent with 0") && h.contains("`rv_amplitude < 1 m/s`")),
        "{found:#?}"
    );
    let why = crate::report::missing_text(&a, 0, 1, crate::quantities::Qty::MinMass);
    assert!(
        why.contains("rv-minimum-mass has every input but gives no value")
            && why.contains("; otherwise it follows by projected-mass"),
        "{why}"
    );
    // Declared as that limit, the mass is a limit.
    let limited = run(&src.replace("= 0 ± 0.5 m/s", "< 1 m/s"));
    assert!(helps_of(&limited, Rule::NotDerivable).is_empty());
    let m = limited.results[0].bodies[1]
        .get(crate::quantities::Qty::MinMass)
        .cloned()
        .expect("a minimum mass");
    assert_eq!(m.form, crate::model::Form::UpperLimit);
    // A measurement well away from 0 gets no such advice.
    let far = run(&src.replace("= 0 ± 0.5 m/s", "= 1e9 ± 1 m/s"));
    assert!(!helps_of(&far, Rule::NotDerivable)
        .iter()
        .any(|h| h.contains("consistent with 0")));
}

/// Radii too absurd for g to be represented (1e-200 and 1e200 Rsun) are still found
/// implausible (log g computed in logarithms), and no derived value that cannot be 0 is
/// shown as 0 after underflowing.
#[test]
fn absurd_radii_are_implausible_and_underflow_is_no_value() {
    let src = "system \"Nib\" {
  star n { mass = 1 ± 0.05 Msun; radius = 1e-200 ± 1e-201 Rsun; teff = 5000 ± 50 K }
  planet b orbits n { period = 10 ± 0.01 d; transit_depth = 0.1 ± 0.01 % }
}
system \"Vast\" {
  star v { mass = 1 ± 0.05 Msun; radius = 1e200 ± 1e199 Rsun; teff = 5000 ± 50 K }
  planet b orbits v { period = 10 ± 0.01 d }
}";
    let a = run(src);
    let found = findings(&a, Rule::ImplausibleStar);
    assert_eq!(found.len(), 2, "{:#?}", a.diagnostics);
    assert!(
        found[0].message.contains("log g 404.44"),
        "{}",
        found[0].message
    );
    assert!(
        found[1].message.contains("log g -395.56"),
        "{}",
        found[1].message
    );
    for r in &a.results {
        for body in &r.bodies {
            for q in body.quantities.iter() {
                let from_zero = matches!(
                    crate::quantities::def(q.qty).min,
                    crate::quantities::Bound::Exclusive(z) if z == 0.0
                );
                assert!(!(from_zero && q.value == 0.0), "{:?} is 0", q.qty);
            }
        }
    }
}
