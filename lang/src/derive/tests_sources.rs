//! Several published values of one quantity: under the project file's `weighted-mean`
//! choice only timings of one transit in one time scale are averaged, and findings quote
//! each source in the unit it was written in. Every system here is invented.

use crate::derive::{Choice, Options, SourceChoice};
use crate::quantities::Qty;
use crate::source::FileId;
use crate::{analyze, Analysis};

fn run(src: &str) -> Analysis {
    let options = Options {
        source_choice: SourceChoice::WeightedMean,
        ..Options::linear()
    };
    analyze(FileId(0), src, &options.into())
}

fn epoch(a: &Analysis) -> crate::derive::QuantityResult {
    let sys = a.model.systems.first().expect("a system");
    let bi = sys.body("b").expect("planet b");
    a.results
        .first()
        .and_then(|r| r.bodies.get(bi))
        .and_then(|b| b.get(Qty::TransitEpoch))
        .cloned()
        .expect("an epoch")
}

fn system(first: &str, second: &str) -> String {
    format!(
        r#"ref pa "Invented paper A"
ref pb "Invented paper B"
system "Gallant" {{
  star gallant {{
    mass = 0.9 +- 0.03 Msun
    radius = 0.9 +- 0.02 Rsun
    teff = 5300 +- 70 K
  }}
  planet b orbits gallant {{
    period = 4.0 +- 0.0001 d [pa]
    transit_epoch = {first} [pa]
    transit_epoch = {second} [pb]
  }}
}}
"#
    )
}

const DAY: f64 = 86_400.0;

#[test]
fn epochs_of_different_transits_are_not_averaged() {
    // 125 orbits apart: their mean, 2459250.1, lies half an orbit from any transit.
    let a = run(&system(
        "2459000.1000 +- 0.0005 BJD_TDB",
        "2459500.1000 +- 0.0004 BJD_TDB",
    ));
    let t = epoch(&a);
    assert_eq!(t.choice, Some(Choice::MostPrecise), "{t:?}");
    assert!(
        (t.value / DAY - 2_459_500.1).abs() < 1e-6,
        "{}",
        t.value / DAY
    );
    assert!(
        t.assumptions
            .iter()
            .any(|s| s.contains("epochs of different transits are not averaged")),
        "{:?}",
        t.assumptions
    );
}

#[test]
fn epochs_in_different_time_scales_are_not_averaged() {
    let a = run(&system(
        "2459000.1000 +- 0.0002 BJD_TDB",
        "2459000.0992 +- 0.0003 JD_UTC",
    ));
    let t = epoch(&a);
    assert_eq!(t.choice, Some(Choice::MostPrecise), "{t:?}");
    assert!(
        (t.value / DAY - 2_459_000.1).abs() < 1e-6,
        "{}",
        t.value / DAY
    );
    assert!(
        t.assumptions
            .iter()
            .any(|s| s
                .contains("different time systems (scale or reference point) are not averaged")),
        "{:?}",
        t.assumptions
    );
}

#[test]
fn timings_of_one_transit_in_one_scale_are_averaged() {
    // Equal weights: the mean is the midpoint, 2459000.1001 (inverse-variance weighting,
    // common practice).
    let a = run(&system(
        "2459000.1000 +- 0.0002 BJD_TDB",
        "2459000.1002 +- 0.0002 BJD_TDB",
    ));
    let t = epoch(&a);
    assert_eq!(t.choice, Some(Choice::WeightedMean), "{t:?}");
    assert!(
        (t.value / DAY - 2_459_000.100_1).abs() < 1e-7,
        "{}",
        t.value / DAY
    );
}

/// Two sources of a mass written in Mjup are quoted in Mjup, however small (a declared
/// 0.044 Mjup was shown as 14.0 Mearth).
#[test]
fn disagreeing_sources_are_quoted_in_the_unit_written() {
    let src = r#"ref pa "Invented paper A"
ref pb "Invented paper B"
system "Gallant" {
  star gallant {
    mass = 0.9 +- 0.03 Msun
  }
  planet b orbits gallant {
    period = 4.0 +- 0.0001 d
    mass = 0.044 +- 0.002 Mjup [pa]
    mass = 0.060 +- 0.002 Mjup [pb]
  }
}
"#;
    let a = analyze(FileId(0), src, &Options::linear().into());
    let d = a
        .diagnostics
        .iter()
        .find(|d| d.rule == crate::diagnostic::Rule::SourcesDisagree)
        .expect("a disagreement");
    assert!(d.message.contains("0.0440 ± 0.0020 Mjup"), "{}", d.message);
    assert!(d.message.contains("0.0600 ± 0.0020 Mjup"), "{}", d.message);
}

/// A finding quotes a declared value in the unit it was written in, and the value it is
/// compared with in that unit too: 0.0300 Mjup, not 9.53 Mearth.
#[test]
fn a_finding_quotes_a_declared_value_in_the_unit_written() {
    let src = r#"system "Gallant" {
  star gallant {
    mass = 1.0 +- 0.03 Msun
  }
  planet b orbits gallant {
    period = 4.2 +- 0.0001 d
    rv_amplitude = 12 +- 0.5 m/s
    mass = 0.0300 +- 0.0010 Mjup
  }
}
"#;
    let a = analyze(FileId(0), src, &Options::linear().into());
    let d = a
        .diagnostics
        .iter()
        .find(|d| d.rule == crate::diagnostic::Rule::Inconsistent)
        .expect("a finding");
    assert!(d.message.contains("0.0300 ± 0.0010 Mjup"), "{}", d.message);
    assert!(!d.message.contains("Mearth"), "{}", d.message);
}

/// `BJD` is read as `BJD_TDB`: two timings of one transit written each way are averaged; a
/// timing half a period away (a secondary eclipse entered by mistake) is not.
#[test]
fn one_time_system_however_written_is_averaged_and_half_a_period_is_not() {
    let a = run(&system(
        "2459000.1000 +- 0.0002 BJD",
        "2459000.1002 +- 0.0002 BJD_TDB",
    ));
    assert_eq!(epoch(&a).choice, Some(Choice::WeightedMean));
    let a = run(&system(
        "2459000.1000 +- 0.0002 BJD_TDB",
        "2459002.0999 +- 0.0002 BJD_TDB",
    ));
    assert_eq!(epoch(&a).choice, Some(Choice::MostPrecise));
}
