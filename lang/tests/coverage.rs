//! Do the reported 68 % intervals cover the truth 68 % of the time at low signal-to-noise,
//! in both propagation modes?
//!
//! A seeded simulation: one invented transiting planet with a radial-velocity amplitude
//! measured at about 2 sigma and a transit depth at about 1.5 sigma (K = 90 ± 43 m/s,
//! depth = 0.5 ± 0.33 %, stellar mass ± 10 %, stellar radius ± 8 %). Each simulated file
//! declares the true values plus normal noise of those widths; the truth is what the engine
//! derives from the noise-free file. Coverage is the share of all simulated experiments whose
//! interval `value - below .. value + above` holds the truth (frequentist coverage is over
//! every outcome of the experiment). About 8 % of the draws give a depth or an amplitude at
//! or below zero; such a file is refused with an error, so it gives no interval and counts as
//! not covered. An exact interval would miss there too, since the value then lies more than
//! 1.5 sigma below its truth. Counted over the usable files only, the shares are
//! higher (a radius about 78 %). That is the over-coverage of a positive quantity measured
//! near zero.
//!
//! Before values that first order cannot describe were sampled (`syzygy::derive::validity`),
//! first-order propagation covered a density's truth 78 % of the time here, with lower ends at
//! or below zero in 13 % of files.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use rand::{Rng, SeedableRng};
use rand_chacha::ChaCha8Rng;
use rand_distr::StandardNormal;
use syzygy::source::FileId;
use syzygy::{Options, Propagation, Settings};

const FILES: usize = 400;

struct Truth {
    star_mass: f64,
    star_radius: f64,
    rv: f64,
    depth: f64,
}

const TRUE: Truth = Truth {
    star_mass: 0.9,
    star_radius: 0.85,
    rv: 90.0,
    depth: 0.5,
};

fn file(t: &Truth, errors: bool) -> String {
    let e = |s: f64| {
        if errors {
            format!(" ± {s}")
        } else {
            String::new()
        }
    };
    format!(
        "system \"Faintra\" {{\n  star s {{ mass = {}{} Msun; radius = {}{} Rsun; teff = 5200 K }}\n  planet b orbits s {{\n    period = 4.2 d\n    rv_amplitude = {}{} m/s\n    transit_depth = {}{} %\n    impact = 0.3\n  }}\n}}\n",
        t.star_mass,
        e(0.09),
        t.star_radius,
        e(0.068),
        t.rv,
        e(43.0),
        t.depth,
        e(0.33)
    )
}

const WATCHED: [&str; 3] = ["mass", "radius", "density"];

/// (value, below, above) of the planet's mass, radius and density, SI.
fn planet_values(src: &str, options: &Options) -> Vec<(f64, f64, f64)> {
    let settings: Settings = options.clone().into();
    let a = syzygy::analyze(FileId(0), src, &settings);
    let sys = &a.model.systems[0];
    let (bi, _) = sys
        .bodies
        .iter()
        .enumerate()
        .find(|(_, b)| b.id == "b")
        .unwrap();
    let body = &a.results[0].bodies[bi];
    WATCHED
        .iter()
        .map(|name| {
            let q = body
                .quantities
                .iter()
                .find(|q| syzygy::quantities::def(q.qty).name == *name)
                .unwrap_or_else(|| panic!("no {name} in\n{src}"));
            (q.value, q.below, q.above)
        })
        .collect()
}

/// A measurement: the truth plus normal noise, rounded as a table would print it.
fn draw(rng: &mut ChaCha8Rng, truth: f64, sigma: f64) -> f64 {
    let z: f64 = rng.sample(StandardNormal);
    ((truth + sigma * z) * 1e4).round() / 1e4
}

fn coverage(propagation: Propagation) -> Vec<(f64, f64)> {
    let options = Options {
        propagation,
        samples: 2_000,
        ..Options::default()
    };
    let truth = planet_values(&file(&TRUE, false), &Options::linear());
    let mut rng = ChaCha8Rng::seed_from_u64(20_261_202);
    let mut covered = [0usize; 3];
    let mut at_or_below_zero = [0usize; 3];
    let mut unusable = 0;
    for _ in 0..FILES {
        let t = Truth {
            star_mass: draw(&mut rng, TRUE.star_mass, 0.09),
            star_radius: draw(&mut rng, TRUE.star_radius, 0.068),
            rv: draw(&mut rng, TRUE.rv, 43.0),
            depth: draw(&mut rng, TRUE.depth, 0.33),
        };
        if [t.star_mass, t.star_radius, t.rv, t.depth]
            .iter()
            .any(|v| *v <= 0.0)
        {
            // A measurement at or below zero: the file is refused with an error, so the
            // procedure gives no interval and this experiment counts as not covered (an exact
            // interval would miss here too: the value lies more than 1 sigma below a truth).
            let src = file(&t, true);
            let settings: Settings = options.clone().into();
            let a = syzygy::analyze(FileId(0), &src, &settings);
            assert!(
                a.diagnostics
                    .iter()
                    .any(|d| d.severity == syzygy::diagnostic::Severity::Error),
                "a measurement at or below zero was accepted:\n{src}"
            );
            unusable += 1;
            continue;
        }
        let got = planet_values(&file(&t, true), &options);
        for (i, ((v, lo, hi), (want, _, _))) in got.iter().zip(&truth).enumerate() {
            if v - lo <= *want && *want <= v + hi {
                covered[i] += 1;
            }
            if v - lo <= 0.0 {
                at_or_below_zero[i] += 1;
            }
        }
    }
    eprintln!("{propagation:?}: {unusable} of {FILES} measurements not positive");
    covered
        .iter()
        .zip(at_or_below_zero)
        .map(|(c, z)| (*c as f64 / FILES as f64, z as f64 / FILES as f64))
        .collect()
}

fn check(propagation: Propagation) {
    let got = coverage(propagation);
    eprintln!("{propagation:?}: coverage and share at or below zero: {got:?}");
    for (name, (share, nonpositive)) in WATCHED.iter().zip(&got) {
        // 68.27 % of a normal lies within one standard deviation; ± 5 % allows for 400 files
        // (binomial standard error 2.3 %). Measured with this seed: mass 64.5 %, radius
        // 70.3 % (first order) and 72.8 % (Monte Carlo), density 70.3 %; with 4,000 files:
        // mass 65.6 %, radius 70.7 % and 73.2 %, density 71.6 %. The Monte Carlo radius is
        // near the top of the band: a depth measured at 1.5 sigma is sampled as a normal
        // kept positive (the depth is known to be positive), which moves the intervals of
        // files whose depth came out low upwards, over the truth.
        let band = 0.6327..=0.7327;
        assert!(
            band.contains(share),
            "{propagation:?}: the {name} interval covered the truth in {:.1}% of {FILES} files",
            share * 100.0
        );
        assert_eq!(
            *nonpositive, 0.0,
            "{propagation:?}: a {name} interval reached zero or below"
        );
    }
}

#[test]
fn first_order_intervals_cover_the_truth_at_low_signal_to_noise() {
    check(Propagation::Linear);
}

#[test]
fn monte_carlo_intervals_cover_the_truth_at_low_signal_to_noise() {
    check(Propagation::MonteCarlo);
}
