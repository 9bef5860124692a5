//! Several published transit epochs under the project file's `weighted-mean` choice: only
//! timings of one transit in one time scale are averaged. Every system here is invented.

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
            .any(|s| s.contains("different time scales are not averaged")),
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
