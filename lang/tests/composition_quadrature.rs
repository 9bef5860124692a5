//! The composition classifier's quadrature (`syzygy::composition::classify_distributions`,
//! which linear propagation uses) against the engine's own sampling of the same measurements
//! (`syzygy::derive::value::draw`). It couples the physics library to the derivation engine,
//! so it lives here rather than beside either of them.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use syzygy::composition::{classify_distributions, classify_with, ClassBoundaries, TwoSidedNormal};
use syzygy::constants::{M_EARTH, R_EARTH, R_JUPITER};
use syzygy::derive::value::draw;
use syzygy::model::{Form, Measurement};

#[test]
fn quadrature_classes_match_many_samples() {
    // Reference: the sample classifier over 4 x 10^5 draws of the same two-sided normals,
    // drawn as the engine draws them (derive::value::draw, kept positive).
    let me = |x: f64| x * M_EARTH;
    let re = |x: f64| x * R_EARTH;
    let cases = [
        // (mass, below, above, radius, below, above), SI
        (me(5.0), me(0.8), me(0.8), re(1.6), re(0.1), re(0.1)), // rocky / iron-rich edge
        (me(3.0), me(1.5), me(2.5), re(1.9), re(0.2), re(0.4)), // spans three classes
        (me(0.5), me(0.4), me(0.4), re(0.9), re(0.3), re(0.2)), // truncated near zero
        (me(12.0), me(0.6), me(0.6), re(1.1), re(0.03), re(0.03)), // denser than iron
        (
            me(300.0),
            me(30.0),
            me(30.0),
            1.25 * R_JUPITER,
            re(0.8),
            re(0.8),
        ), // inflated edge
        (me(30.0), me(4.0), me(6.0), re(4.0), re(0.5), re(0.5)), // volatile / giant mass edge
    ];
    let b = ClassBoundaries::default();
    for (i, (m, ml, mh, r, rl, rh)) in cases.into_iter().enumerate() {
        let split = |v, lo, hi| Measurement {
            value: v,
            below: lo,
            above: hi,
            form: Form::Asymmetric,
        };
        let n = 400_000;
        let ms = draw(&split(m, ml, mh), 0.0, f64::INFINITY, n, 11 + i as u64);
        let rs = draw(&split(r, rl, rh), 0.0, f64::INFINITY, n, 97 + i as u64);
        let sampled = classify_with(&ms, &rs, &b);
        let quad = classify_distributions(
            TwoSidedNormal {
                value: m,
                below: ml,
                above: mh,
            },
            TwoSidedNormal {
                value: r,
                below: rl,
                above: rh,
            },
            &b,
        )
        .unwrap();
        let total: f64 = quad.probabilities.iter().map(|p| p.1).sum();
        assert!((total - 1.0).abs() < 1e-9, "case {i}: sums to {total}");
        for (class, p) in &quad.probabilities {
            let s = sampled.probability(*class).unwrap();
            // 4e5 samples: binomial sigma at most 8e-4 (3e-3 is about 4 sigma); the quadrature
            // error is far smaller.
            assert!(
                (p - s).abs() < 3e-3,
                "case {i} {class:?}: quadrature {p}, samples {s}"
            );
        }
        let se = sampled.fraction_extrapolated().unwrap();
        assert!(
            (quad.extrapolated - se).abs() < 3e-3,
            "case {i}: {} vs {se}",
            quad.extrapolated
        );
        assert_eq!(quad.most_probable(), sampled.most_probable(), "case {i}");
    }
}
