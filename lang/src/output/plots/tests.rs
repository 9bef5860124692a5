//! Unit tests of the plot models: curves, percentiles and what a plot leaves out.

use super::*;
use crate::source::{MemoryDb, SourceDb};

fn analysis(src: &str) -> Analysis {
    let mut db = MemoryDb::new();
    let f = db.add("t.syz", src);
    crate::analyze(f, db.text(f), &crate::Settings::default())
}

const SRC: &str = "system \"Ostrel\" {\n  star s { mass = 1 Msun; radius = 1 Rsun; teff = 5800 K }\n  planet b orbits s {\n    period = 4 ± 0.001 d\n    rv_amplitude = 60 ± 3 m/s\n    radius_ratio = 0.1 ± 0.002\n    impact = 0.3 ± 0.05\n  }\n}\n";

#[test]
fn an_upper_limit_on_k_is_drawn_at_the_limit_and_said_to_be_one() {
    // Not a detection: the curve is the largest signal the limit allows, K at 5 m/s.
    let src = SRC.replace("rv_amplitude = 60 ± 3 m/s", "rv_amplitude < 5 m/s");
    let c = rv_curve(&analysis(&src), 0, 1).unwrap();
    assert_eq!(c.upper_limit.as_deref(), Some("rv_amplitude < 5 m/s"));
    let most = c.band.median.iter().fold(0.0f64, |m, v| m.max(v.abs()));
    assert!((most - 5.0).abs() < 0.05, "{most}");
    assert!(c.assumptions.iter().any(|a| a.contains("not a detection")));
    assert!(!c
        .assumptions
        .iter()
        .any(|a| a.contains("sampled uniformly")));
    // A circular orbit spreads no orientation.
    assert!(!c
        .assumptions
        .iter()
        .any(|a| a.contains("periastron unknown")));
    // A measured K is a model of draws.
    assert_eq!(rv_curve(&analysis(SRC), 0, 1).unwrap().upper_limit, None);
}

#[test]
fn a_planet_left_out_says_which_mass_it_lacks() {
    // Without an RV amplitude there is no mass at all, not even a minimum one.
    let src = SRC.replace("    rv_amplitude = 60 ± 3 m/s\n", "");
    let (points, left_out) = mass_radius_points(&[analysis(&src)]);
    assert!(points.is_empty());
    assert_eq!(left_out, vec!["Ostrel b: no mass".to_string()]);
    // Without the impact parameter there is a minimum mass only.
    let src = SRC.replace("    impact = 0.3 ± 0.05\n", "");
    let (_, left_out) = mass_radius_points(&[analysis(&src)]);
    assert_eq!(
        left_out,
        vec!["Ostrel b: no true mass (a minimum mass is not plotted)".to_string()]
    );
}

#[test]
fn a_planet_whose_mass_is_a_limit_is_plotted_at_the_limit() {
    // `rv_amplitude < 5 m/s` makes the mass an upper limit: the planet is drawn at it,
    // marked as a limit, and its words say so.
    let src = SRC.replace("rv_amplitude = 60 ± 3 m/s", "rv_amplitude < 5 m/s");
    let (points, left_out) = mass_radius_points(&[analysis(&src)]);
    assert!(left_out.is_empty(), "{left_out:?}");
    let p = points.first().unwrap();
    assert_eq!(p.mass_limit, Some(crate::model::Form::UpperLimit));
    assert_eq!(p.radius_limit, None);
    assert_eq!((p.mass_below, p.mass_above), (0.0, 0.0));
    assert!(p.mass > 10.0 && p.mass < 30.0, "{}", p.mass);
    assert!(
        p.position.contains("the mass is an upper limit"),
        "{}",
        p.position
    );
}

#[test]
fn rv_curve_spans_one_orbit_with_amplitude_k() {
    let a = analysis(SRC);
    let c = rv_curve(&a, 0, 1).unwrap();
    let first = c.band.x.first().copied().unwrap();
    let last = c.band.x.last().copied().unwrap();
    assert!((last - first - 4.0).abs() < 1e-9);
    let max = c.band.median.iter().copied().fold(f64::MIN, f64::max);
    assert!((max - 60.0).abs() < 1.0, "{max}");
    assert!(c.band.low.iter().zip(&c.band.high).all(|(l, h)| l <= h));
    // Circular: the star recedes before mid-transit (v > 0 at t = -P/4).
    let quarter = c
        .band
        .x
        .iter()
        .position(|x| (*x + 1.0).abs() < 1e-9)
        .unwrap();
    assert!(c.band.median[quarter] > 55.0);
}

/// The largest second difference of `y`, over its half range: for a sine sampled at
/// `steps` per period it is (2 pi / steps)^2; a median that hops between draws has
/// kinks that make it many times larger.
fn roughness(y: &[f64]) -> f64 {
    let (lo, hi) = y
        .iter()
        .fold((f64::MAX, f64::MIN), |(l, h), v| (l.min(*v), h.max(*v)));
    let d2 = y
        .windows(3)
        .map(|w| (w[0] - 2.0 * w[1] + w[2]).abs())
        .fold(0.0, f64::max);
    d2 / ((hi - lo) / 2.0)
}

#[test]
fn rv_median_and_band_are_smooth_with_an_unknown_orientation() {
    // An eccentricity limit and no argument of periastron: every draw has its own
    // orientation, the case whose median once looked jagged.
    let src = SRC.replace("60 ± 3 m/s", "60 ± 3 m/s\n    eccentricity < 0.08");
    let c = rv_curve(&analysis(&src), 0, 1).unwrap();
    assert!(c.inputs.iter().any(|i| i == "arg_periastron not given"));
    let spread = c
        .assumptions
        .iter()
        .filter(|a| a.contains("0-360 deg"))
        .count();
    assert_eq!(spread, 1, "{:?}", c.assumptions);
    for (what, y) in [
        ("median", &c.band.median),
        ("low", &c.band.low),
        ("high", &c.band.high),
    ] {
        // The nearest-rank median of the same draws measured about 12 times a sine's.
        let sine = (2.0 * std::f64::consts::PI / f64::from(RV_STEPS)).powi(2);
        let r = roughness(y);
        assert!(r < 4.0 * sine, "{what}: roughness {r:e}, a sine's {sine:e}");
    }
}

#[test]
fn model_values_that_are_not_finite_are_left_out_and_said() {
    // An uncertainty near the largest float: with an eccentric orbit some velocities
    // overflow.
    let src = SRC.replace("60 ± 3 m/s", "12.5 ± 1e308 m/s\n    eccentricity < 0.3");
    let a = analysis(&src);
    let c = rv_curve(&a, 0, 1).unwrap();
    let b = &c.band;
    assert!(b
        .low
        .iter()
        .chain(&b.median)
        .chain(&b.high)
        .all(|v| v.is_finite()));
    assert!(
        c.left_out.iter().any(|l| l.contains("not finite numbers")),
        "{:?}",
        c.left_out
    );
    // An ordinary curve leaves nothing out.
    assert_eq!(
        rv_curve(&analysis(SRC), 0, 1).unwrap().left_out,
        Vec::<String>::new()
    );
}

/// With the depth declared, the curve dips by the depth whatever the limb darkening:
/// `k` is solved from the depth with the law the curve is drawn with (before, with
/// `k = sqrt(depth)`, the assumed law made the dip about 20 % deeper).
#[test]
fn transit_curve_from_a_depth_dips_by_that_depth() {
    let src = SRC.replace(
        "radius_ratio = 0.1 ± 0.002",
        "transit_depth = 1.00 ± 0.02 %",
    );
    let a = analysis(&src);
    for ld in [
        None,
        Some(LimbDarkening::NONE),
        Some(LimbDarkening { u1: 0.6, u2: 0.1 }),
    ] {
        let (c, used) = transit_curve(&a, 0, 1, ld).unwrap();
        let min = c.band.median.iter().copied().fold(f64::MAX, f64::min);
        // The median of 200 draws of a 1.00 ± 0.02 % depth, sampled near mid-transit.
        assert!(
            (1.0 - min - 0.0100).abs() < 0.0002,
            "{used:?}: {}",
            1.0 - min
        );
        // Without limb darkening k = sqrt(depth) is the model's own inverse; with it, k
        // is solved again. Either way the plot says its own limb darkening once.
        let limb_darkened = used != LimbDarkening::NONE;
        assert_eq!(
            c.assumptions
                .iter()
                .any(|s| s.starts_with("radius ratio solved from the transit depth")),
            limb_darkened,
            "{:?}",
            c.assumptions
        );
        assert!(
            !c.assumptions
                .iter()
                .any(|s| s.contains("limb darkening neglected")),
            "{:?}",
            c.assumptions
        );
        assert!(
            c.inputs.iter().any(|s| s.starts_with("transit_depth = ")),
            "{:?}",
            c.inputs
        );
    }
}

#[test]
fn transit_curve_depth_and_limb_darkening_are_shown() {
    let a = analysis(SRC);
    // None given: a uniform disc, as the engine reads a depth, and it says so.
    let (u, ld) = transit_curve(&a, 0, 1, None).unwrap();
    assert_eq!(ld, LimbDarkening::NONE);
    assert!(u
        .assumptions
        .iter()
        .any(|s| s.starts_with("no limb darkening")));
    let umin = u.band.median.iter().copied().fold(f64::MAX, f64::min);
    assert!((1.0 - umin - 0.01).abs() < 0.0005, "{umin}");
    // A declared radius ratio drawn limb-darkened: deeper than k^2 = 0.01 near the
    // centre, and not by much.
    let (c, _) = transit_curve(&a, 0, 1, Some(LimbDarkening::ASSUMED)).unwrap();
    let min = c.band.median.iter().copied().fold(f64::MAX, f64::min);
    assert!(1.0 - min > 0.0100 && 1.0 - min < 0.0135, "{min}");
    assert!(c.assumptions.iter().any(|s| s.contains("u1 = 0.4")));
    assert!(transit_curve(&a, 0, 1, Some(LimbDarkening { u1: 2.0, u2: 0.0 })).is_err());
    assert!(transit_curve(&a, 0, 0, None).is_err());
}
