//! Values resting on an orbit's unknown orientation are integrated over it in first-order
//! mode, with first order in the other inputs at each orientation ([`super::turn`]), not
//! sampled. Every system here is invented.

use crate::derive::tests_asymmetric::{agree_within, run, sampled_why};
use crate::derive::validity::{SAMPLED, TURN_KEPT};
use crate::derive::{Options, Propagation, QuantityResult};
use crate::quantities::Qty;
use crate::Analysis;

/// An eccentric transiting planet whose argument of periastron is not known.
const SYSTEM: &str = r#"system "Calder Reach" {
  star calder {
    mass   = 1.04 +- 0.05 Msun
    radius = 1.12 +- 0.04 Rsun
    teff   = 5850 +- 90 K
  }
  planet b orbits calder {
    period        = 6.873 +- 0.0004 d
    rv_amplitude  = 41 +- 4 m/s
    transit_depth = 0.0062 +- 0.0003
    impact        = 0.35 +- 0.08
    eccentricity  = 0.12 +- 0.04
  }
}
"#;

/// Monte Carlo with 4e5 draws: interval ends good to about 0.2 % of the uncertainty.
fn monte_carlo() -> Options {
    Options {
        propagation: Propagation::MonteCarlo,
        samples: 400_000,
        ..Options::linear()
    }
}

fn planet(a: &Analysis, q: Qty) -> QuantityResult {
    a.results
        .first()
        .and_then(|r| r.bodies.get(1))
        .and_then(|b| b.get(q))
        .cloned()
        .expect("a value")
}

#[test]
fn durations_and_inclination_over_every_orientation_agree_with_monte_carlo() {
    let lin = run(SYSTEM, Options::linear());
    let mc = run(SYSTEM, monte_carlo());
    for q in [
        Qty::Inclination,
        Qty::TransitDuration,
        Qty::TransitDurationFull,
    ] {
        let (l, m) = (planet(&lin, q), planet(&mc, q));
        assert!(
            l.assumptions.iter().any(|a| a.starts_with(TURN_KEPT)),
            "{q:?}: {:?}",
            l.assumptions
        );
        assert!(!l.assumptions.iter().any(|a| a.starts_with(SAMPLED)));
        // Measured: within 5 % of the uncertainty (first order in the other inputs at each
        // orientation is what is left out).
        agree_within(&l, &m, 0.06);
    }
    // Deterministic: no seed enters it.
    let again = run(
        SYSTEM,
        Options {
            seed: 5,
            ..Options::linear()
        },
    );
    let (a, b) = (
        planet(&lin, Qty::TransitDuration),
        planet(&again, Qty::TransitDuration),
    );
    assert_eq!((a.value, a.below, a.above), (b.value, b.below, b.above));
}

#[test]
fn an_eccentricity_reaching_below_zero_or_a_skewed_radius_is_sampled_and_says_why() {
    // 0.04 +- 0.04 has 16 % of its stated distribution below 0: kept inside when sampled,
    // not the normal first order would take at each orientation.
    let src = SYSTEM.replace("0.12 +- 0.04", "0.04 +- 0.04");
    let d = planet(&run(&src, Options::linear()), Qty::TransitDuration);
    let words = sampled_why(&d);
    assert!(
        words.contains("b.eccentricity reaches past its range"),
        "{words}"
    );
    // A strongly asymmetric stellar radius gives the durations a share of their variance
    // that one orientation hides behind the angle's own spread.
    let src = SYSTEM.replace("1.12 +- 0.04 Rsun", "1.12 +0.03/-0.08 Rsun");
    let d = planet(&run(&src, Options::linear()), Qty::TransitDuration);
    let words = sampled_why(&d);
    assert!(words.contains("strongly asymmetric"), "{words}");
}

/// An inclination from a loosely known, high eccentricity (0.64 +- 0.15) bends across the
/// eccentricity's two sides at many orientations: first order at each orientation put its
/// lower end 0.21 of the uncertainty from Monte Carlo's. It is sampled, and says why.
#[test]
fn a_value_bending_across_an_inputs_sides_is_sampled() {
    let src = r#"system "Sorrowmark" {
  star s { mass = 1.00 +- 0.10 Msun; radius = 1.00 +- 0.10 Rsun; teff = 5800 +- 80 K }
  planet b orbits s { period = 50.0 +- 0.001 d; transit_depth = 0.50 +- 0.01 %; impact = 0.70 +- 0.05; eccentricity = 0.64 +- 0.15 }
}
"#;
    let i = planet(&run(src, Options::linear()), Qty::Inclination);
    let words = sampled_why(&i);
    assert!(
        words.contains("bends across the two sides of b.eccentricity"),
        "{words}"
    );
}

/// A declared argument of periastron of 90 +- 60 deg: the durations are flat in it there, so
/// first order gave T14 = 3.67 +- 0.22 h where Monte Carlo gives 4.00 +0.98/-0.37 h. An angle
/// measured to worse than 5 deg has its sides checked like an asymmetric input's, and the
/// durations are sampled, agreeing with Monte Carlo; a well measured one (90 +- 3 deg) keeps
/// first order.
#[test]
fn a_loosely_measured_angle_is_checked_at_its_sides() {
    let src = r#"system "Quellmoor" {
  star q { mass = 1.00 +- 0.05 Msun; radius = 1.00 +- 0.04 Rsun; teff = 5800 +- 80 K }
  planet b orbits q { period = 30.0 +- 0.001 d; transit_depth = 0.50 +- 0.01 %; impact = 0.40 +- 0.05; eccentricity = 0.40 +- 0.03; arg_periastron = 90 +- 60 deg }
}
"#;
    let lin = planet(&run(src, Options::linear()), Qty::TransitDuration);
    assert!(
        lin.assumptions
            .iter()
            .any(|a| a.starts_with(SAMPLED) && a.contains("b.arg_periastron")),
        "{:?}",
        lin.assumptions
    );
    // The upper side about 2.6 times the lower (Monte Carlo of 4e5 draws: +0.98/-0.37 h).
    assert!(lin.above > 2.0 * lin.below, "{} {}", lin.below, lin.above);
    let tight = src.replace("90 +- 60 deg", "90 +- 3 deg");
    let lin = planet(&run(&tight, Options::linear()), Qty::TransitDuration);
    assert!(
        !lin.assumptions.iter().any(|a| a.starts_with(SAMPLED)),
        "{:?}",
        lin.assumptions
    );
}

/// The run over every orientation takes 64 (2k + 1) columns for k inputs: a value resting on
/// more inputs than fit in the 4,000 draws it replaces (an impact parameter written as a sum
/// of 40 uncertain literals) is sampled instead, and says why.
#[test]
fn a_value_on_very_many_inputs_is_sampled_not_integrated() {
    let terms = vec!["(0.01 +- 0.001)"; 40].join(" + ");
    let src = format!(
        r#"system "Manifold Reach" {{
  star m {{ mass = 1.0 +- 0.05 Msun; radius = 1.0 +- 0.03 Rsun; teff = 5800 +- 80 K }}
  planet b orbits m {{ period = 8.0 +- 0.001 d; transit_depth = 0.5 +- 0.01 %; impact = {terms}; eccentricity = 0.15 +- 0.03 }}
}}
"#
    );
    let i = planet(&run(&src, Options::linear()), Qty::Inclination);
    assert!(
        sampled_why(&i).contains("more inputs than the run over every orientation takes"),
        "{:?}",
        i.assumptions
    );
}

/// An eccentric transiting planet whose argument of periastron is known only as a limit.
fn omega_system(omega: &str) -> String {
    format!(
        r#"system "Tessaly" {{
  star tess {{
    mass   = 0.95 +- 0.04 Msun
    radius = 0.92 +- 0.03 Rsun
    teff   = 5600 +- 80 K
  }}
  planet b orbits tess {{
    period        = 5.2 +- 0.001 d
    transit_depth = 4000 +- 100 ppm
    impact        = 0.3 +- 0.05
    eccentricity  = 0.3 +- 0.03
    arg_periastron {omega}
  }}
}}
"#
    )
}

#[test]
fn a_limit_on_the_argument_of_periastron_is_read_within_one_turn_and_bounds_nothing() {
    use crate::model::Form;
    // The duration at one orientation, every input at its value.
    let at = |deg: f64| {
        let a = run(&omega_system(&format!("= {deg} deg")), Options::linear());
        planet(&a, Qty::TransitDuration).value
    };
    let (at_0, at_45, at_90) = (at(0.0), at(45.0), at(90.0));
    // Winn (2010, eq. 16): durations scale as sqrt(1 - e^2) / (1 + e sin omega), so the
    // duration at 0 deg is about (1 + e) = 1.3 times that at 90 deg (the inclination also
    // moves a little with omega at a fixed impact parameter).
    assert!(((at_0 / at_90) / 1.3 - 1.0).abs() < 0.02, "{at_0} {at_90}");
    for options in [Options::linear(), Options::default()] {
        let a = run(&omega_system("< 90 deg"), options.clone());
        let t = planet(&a, Qty::TransitDuration);
        // Shortest at 90 deg and longest at 0 deg: the limit is no bound at 90 deg (it was
        // given as `< 2.21 h`, the shortest duration, in both modes).
        assert_eq!(t.form, Form::Asymmetric, "{options:?}: {t:?}");
        // Omega uniform over 0-90 deg and the duration monotone in it there: its median is
        // the duration at 45 deg, the other inputs' spread small beside it.
        assert!(
            (t.value / at_45 - 1.0).abs() < 0.01,
            "{} vs {at_45}",
            t.value
        );
        assert!(t.value - t.below > at_90 * 0.97 && t.value + t.above < at_0 * 1.03);
        assert!(t.below > 0.0 && t.above > 0.0);
        let w = planet(&a, Qty::ArgPeriastron);
        assert!(
            w.assumptions
                .iter()
                .any(|s| s.contains("sampled uniformly from 0 deg to 90 deg")),
            "{:?}",
            w.assumptions
        );
    }
}

#[test]
fn a_limit_on_an_angle_takes_the_turn_its_convention_implies() {
    use crate::derive::limit_range::turn_of_limit;
    use crate::model::Form;
    use std::f64::consts::{PI, TAU};
    let deg = PI / 180.0;
    assert_eq!(turn_of_limit(Form::UpperLimit, 90.0 * deg), (0.0, TAU));
    assert_eq!(turn_of_limit(Form::LowerLimit, 300.0 * deg), (0.0, TAU));
    // At or below 0: the turn -180 to 180 deg (`> 0 deg` read in 0 to 360 deg would be
    // the whole turn).
    assert_eq!(turn_of_limit(Form::LowerLimit, 0.0), (-PI, PI));
    assert_eq!(turn_of_limit(Form::UpperLimit, 0.0), (-PI, PI));
    assert_eq!(turn_of_limit(Form::LowerLimit, -30.0 * deg), (-PI, PI));
    assert_eq!(turn_of_limit(Form::UpperLimit, -200.0 * deg), (-TAU, 0.0));
}

/// Two durations and a depth whose draws often lie closer together than any impact
/// parameter gives: those draws are taken at b = 0 (not left out), as in the numpy
/// reference `tests/reference/make_edge_reference.py` (Seager & Mallén-Ornelas 2003 eq. 7).
#[test]
fn draws_of_durations_past_a_central_transit_are_taken_at_b_0() {
    let json: serde_json::Value =
        serde_json::from_str(include_str!("../../../tests/reference/edge.json")).unwrap();
    let reference = |which: &str| -> Vec<f64> {
        json[which]
            .as_array()
            .unwrap()
            .iter()
            .map(|v| v.as_f64().unwrap())
            .collect()
    };
    let (want, left_out) = (reference("at_edge"), reference("left_out"));
    let src = r#"system "Hythe" {
  star hyt { mass = 0.85 +- 0.04 Msun; radius = 0.80 +- 0.03 Rsun; teff = 5100 +- 80 K }
  planet b orbits hyt { period = 5.0 +- 0.0001 d; transit_depth = 0.5 +- 0.02 %; transit_duration = 2.4 +- 0.05 h; transit_duration_full = 2.0 +- 0.05 h }
}
"#;
    let mc = run(src, monte_carlo());
    let b = planet(&mc, Qty::Impact);
    let got = [b.value - b.below, b.value, b.value + b.above];
    let sigma = want[2] - want[0];
    for (g, w) in got.iter().zip(&want) {
        assert!((g - w).abs() < 0.01 * sigma, "{got:?} vs {want:?}");
    }
    // Left out, the lower end would be far higher: the test can tell the two apart.
    assert!(left_out[0] - want[0] > 0.3 * sigma);
    // The share said, against the reference's (4e5 draws: a standard error of 0.05 %).
    let share = json["share_past_edge"].as_f64().unwrap() * 100.0;
    let said: f64 = b
        .assumptions
        .iter()
        .find_map(|a| {
            a.strip_prefix("b^2 < 0 in ")?
                .split('%')
                .next()?
                .parse()
                .ok()
        })
        .expect("the share of draws taken at b = 0");
    assert!((said - share).abs() < 0.3, "{said} vs {share}");
    // The inclination follows from it, bent where b folds at 0: in first-order mode it is
    // sampled too (its first-order interval, 88.25 ± 0.70 deg, missed the upper end by 0.4
    // of its uncertainty), and agrees with the reference to the precision of 4000 draws.
    let want_i = reference("inclination_deg");
    let sigma_i = want_i[2] - want_i[0];
    let lin = run(src, Options::linear());
    for (a, within) in [(&mc, 0.01), (&lin, 0.08)] {
        let i = planet(a, Qty::Inclination);
        let deg = |x: f64| x.to_degrees();
        let got = [deg(i.value - i.below), deg(i.value), deg(i.value + i.above)];
        for (g, w) in got.iter().zip(&want_i) {
            assert!((g - w).abs() < within * sigma_i, "{got:?} vs {want_i:?}");
        }
    }
    // First-order mode samples it, and says the same.
    let b = planet(&lin, Qty::Impact);
    assert!(
        b.assumptions
            .iter()
            .any(|a| a.starts_with(SAMPLED) && a.contains("taken at b = 0")),
        "{:?}",
        b.assumptions
    );
}

/// A limit on the argument of periastron whose range is centred where a duration is flat in
/// the angle (`< 180 deg`: -180 to 180 deg, centred on 0; `< 0 deg`: centred on -90 deg):
/// first order there saw no spread (7.46 ± 0.42 h for `< 0 deg` where Monte Carlo gives
/// 6.0 +1.3/-1.4 h); such values are sampled, and agree with Monte Carlo.
#[test]
fn a_value_on_an_angle_limit_is_sampled_wherever_its_slope_is_taken() {
    for limit in ["< 180 deg", "< 0 deg", "> 0 deg"] {
        let src = omega_system(limit);
        let lin = run(&src, Options::linear());
        let mc = run(&src, monte_carlo());
        let (l, m) = (
            planet(&lin, Qty::TransitDuration),
            planet(&mc, Qty::TransitDuration),
        );
        assert!(
            l.assumptions
                .iter()
                .any(|a| a.starts_with(SAMPLED) && a.contains("is a limit on an angle")),
            "{limit}: {:?}",
            l.assumptions
        );
        // 0.08 of the full width: 0.16 of the mean side.
        agree_within(&l, &m, 0.16);
    }
}

/// A radius ratio solved from the depth and an impact parameter whose upper side reaches
/// the grazing region within two standard uncertainties (`b = 0.91 ± 0.05`, Rp/R* = 0.032:
/// 12 % of the draws graze) is sampled, and agrees with Monte Carlo; at one, its upper end
/// was 0.39 of the uncertainty short.
#[test]
fn a_transit_that_may_graze_within_two_sigma_is_sampled() {
    let src = r#"system "Grazen" {
  star g { mass = 0.9 +- 0.03 Msun; radius = 0.85 +- 0.02 Rsun; teff = 5300 +- 70 K }
  planet b orbits g { period = 4.2 +- 0.0001 d; transit_depth = 0.1 +- 0.005 %; impact = 0.91 +- 0.05 }
}
"#;
    let lin = run(src, Options::linear());
    let mc = run(src, monte_carlo());
    let (l, m) = (
        planet(&lin, Qty::RadiusRatio),
        planet(&mc, Qty::RadiusRatio),
    );
    assert!(
        l.assumptions
            .iter()
            .any(|a| a.starts_with(SAMPLED) && a.contains("may be grazing")),
        "{:?}",
        l.assumptions
    );
    // 0.08 of the full width: 0.16 of the mean side.
    agree_within(&l, &m, 0.16);
}

/// The note on a measurement reaching past its range says what each mode does with it:
/// Monte Carlo keeps every draw inside; first order samples only the values resting on it.
#[test]
fn a_truncated_note_says_what_each_mode_does() {
    let src = r#"system "Tarn" {
  star t { mass = 0.9 +- 0.03 Msun; radius = 0.85 +- 0.02 Rsun }
  planet b orbits t { period = 4.2 +- 0.0001 d; transit_depth = 0.5 +- 0.02 %; impact = 0.02 +- 0.2 }
}
"#;
    let said = |options: Options| -> String {
        run(src, options)
            .diagnostics
            .iter()
            .find(|d| d.rule == crate::diagnostic::Rule::Truncated)
            .map(|d| d.message.clone())
            .expect("a truncated note")
    };
    let lin = said(Options::linear());
    assert!(
        lin.contains("values that take much of their variance from it are sampled"),
        "{lin}"
    );
    let mc = said(Options::default());
    assert!(
        mc.contains("sampled values are kept inside the range"),
        "{mc}"
    );
}

/// The truncation of an asymmetric measurement is weighed on the side its median moves to:
/// `4 +1/-6 m/s` has Phi(-4/6) = 25 % of it below 0 and its median moves up to
/// 4 + probit(0.626) = 4.32 m/s, a third of its upper side (a twentieth of the lower, which
/// hid it). `7 +1/-318 Mearth` (a lower error in the wrong unit) moves to 7.66.
#[test]
fn an_asymmetric_measurement_reaching_past_its_range_is_noted() {
    let src = r#"system "Wrenfold" {
  star w { mass = 0.9 +- 0.04 Msun; radius = 0.85 +- 0.03 Rsun; teff = 5300 +- 80 K }
  planet b orbits w { period = 8.0 +- 0.001 d; rv_amplitude = 4 +1/-6 m/s }
  planet c orbits w { period = 11.3 +- 0.1 d; mass = 7 +1/-318 Mearth; radius = 2.1 +- 0.1 Rearth }
}
"#;
    let notes: Vec<String> = run(src, Options::default())
        .diagnostics
        .iter()
        .filter(|d| d.rule == crate::diagnostic::Rule::Truncated)
        .map(|d| d.message.clone())
        .collect();
    assert_eq!(notes.len(), 2, "{notes:?}");
    assert!(
        notes
            .iter()
            .any(|n| n.contains("b.rv_amplitude") && n.contains("median is 4.3")),
        "{notes:?}"
    );
    assert!(
        notes
            .iter()
            .any(|n| n.contains("c.mass") && n.contains("median is 7.7")),
        "{notes:?}"
    );
}

/// A limit on an inclination is read within 0 to 90 deg: `> 86 deg` is 86 to 90 deg, as i
/// and 180 deg - i give the same transit and radial velocities. Over the whole valid range
/// (to 180 deg) it reached sin i = 0: the mass lay "between 0.169 and 2.36e39 Mjup".
#[test]
fn a_limit_on_an_inclination_is_read_within_0_to_90_deg() {
    use crate::model::Form;
    let src = r#"system "Radi" {
  star r { mass = 1 +- 0.05 Msun; radius = 1 +- 0.03 Rsun }
  planet b orbits r { period = 5 +- 0.001 d; inclination > 86 deg; rv_amplitude = 20 +- 2 m/s }
}
"#;
    for options in [Options::linear(), Options::default()] {
        let a = run(src, options);
        let (m, min) = (planet(&a, Qty::Mass), planet(&a, Qty::MinMass));
        // sin 86 deg = 0.99756: the true mass is the minimum mass to 0.25 % at most.
        assert!(
            m.value >= min.value && m.value <= min.value / 0.99756,
            "{m:?} {min:?}"
        );
        assert!(
            !m.assumptions.iter().any(|s| s.contains("lies between")),
            "{:?}",
            m.assumptions
        );
        let b = planet(&a, Qty::Impact);
        assert_eq!(b.form, Form::UpperLimit, "{b:?}");
        let i = planet(&a, Qty::Inclination);
        assert!(
            i.assumptions
                .iter()
                .any(|s| s.contains("sampled uniformly from 86 deg to 90 deg")),
            "{:?}",
            i.assumptions
        );
    }
}
