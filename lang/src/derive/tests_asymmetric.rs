//! First-order values resting on one asymmetric uncertainty take the exact distribution of
//! the first-order model ([`super::asymmetric`]), not a sample. Every system here is invented.

use crate::derive::validity::{SAMPLED, TWO_LINES};
use crate::derive::{Options, Propagation};
use crate::quantities::Qty;
use crate::source::FileId;
use crate::{analyze, Analysis};

const STAR: &str = r#"system "Tessaly" {
  star tessaly {
    mass   = 0.93 +- 0.04 Msun
    radius = 0.88 +0.03/-0.02 Rsun
    teff   = 5310 +- 80 K
  }
}
"#;

fn run(src: &str, options: Options) -> Analysis {
    analyze(FileId(0), src, &options.into())
}

fn luminosity(a: &Analysis) -> crate::derive::QuantityResult {
    a.results
        .first()
        .and_then(|r| r.bodies.first())
        .and_then(|b| b.get(Qty::Luminosity))
        .cloned()
        .expect("a luminosity")
}

#[test]
fn one_asymmetric_input_gives_the_exact_first_order_distribution() {
    let lin = luminosity(&run(STAR, Options::linear()));
    assert!(
        lin.assumptions.iter().any(|a| a.starts_with(TWO_LINES)),
        "{:?}",
        lin.assumptions
    );
    assert!(!lin.assumptions.iter().any(|a| a.starts_with(SAMPLED)));
    // Deterministic: no seed enters it.
    let other_seed = luminosity(&run(
        STAR,
        Options {
            seed: 7,
            ..Options::linear()
        },
    ));
    assert_eq!(
        (lin.value, lin.below, lin.above),
        (other_seed.value, other_seed.below, other_seed.above)
    );
    // A full Monte Carlo run of 2e5 draws agrees within a few per cent of the uncertainty
    // (L ~ R^2 T^4 is nearly linear over a 3 % radius: the second-order terms shift the
    // ends by about 1 % of the uncertainty).
    let mc = luminosity(&run(
        STAR,
        Options {
            propagation: Propagation::MonteCarlo,
            samples: 200_000,
            ..Options::linear()
        },
    ));
    let u = 0.5 * (mc.below + mc.above);
    for (what, a, b) in [
        ("median", lin.value, mc.value),
        (
            "16th percentile",
            lin.value - lin.below,
            mc.value - mc.below,
        ),
        (
            "84th percentile",
            lin.value + lin.above,
            mc.value + mc.above,
        ),
    ] {
        assert!((a - b).abs() < 0.04 * u, "{what}: {a} vs {b} (u {u})");
    }
    // The interval is asymmetric the way the radius is (less so: Teff is half the variance).
    assert!(lin.above > lin.below * 1.05, "{lin:?}");
}

#[test]
fn two_asymmetric_inputs_are_still_sampled() {
    let src = STAR.replace("5310 +- 80 K", "5310 +120/-60 K");
    let lin = luminosity(&run(&src, Options::linear()));
    assert!(
        lin.assumptions.iter().any(|a| a.starts_with(SAMPLED)),
        "{:?}",
        lin.assumptions
    );
}
