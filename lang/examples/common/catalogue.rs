//! The invented catalogue the `bench` and `readprof` examples read: the same systems, from
//! the same seeded generator, so their figures are comparable.

use rand::Rng;
use rand_chacha::ChaCha8Rng;
use std::fmt::Write;

/// The generator of the invented catalogue: ChaCha8 with a fixed seed, so runs are
/// comparable.
pub type Gen = ChaCha8Rng;

/// One invented system with a transiting, RV-measured planet and an RV-only one.
pub fn system(i: usize, rng: &mut Gen) -> String {
    let ms: f64 = rng.gen_range(0.5..1.4);
    let rs = ms.powf(0.8);
    let teff = 5772.0 * ms.powf(0.5);
    let p1: f64 = rng.gen_range(1.0..15.0);
    let p2 = p1 * rng.gen_range(3.0..8.0);
    let mut s = String::new();
    let _ = write!(
        s,
        "system \"Synthetic {i}\" {{\n  star s{i} {{\n    mass = {ms:.3} ± {:.3} Msun\n    radius = {rs:.3} +{:.3}/-{:.3} Rsun\n    teff = {teff:.0} ± 80 K\n  }}\n  planet b orbits s{i} {{\n    period = {p1:.5} ± 0.00003 d\n    rv_amplitude = {:.1} ± 1.5 m/s\n    transit_depth = {:.3} ± 0.02 %\n    impact = {:.2} ± 0.05\n    eccentricity < 0.1\n  }}\n  planet c orbits s{i} {{\n    period = {p2:.3} ± 0.05 d\n    rv_amplitude = {:.1} ± 1.0 m/s\n  }}\n}}\n",
        ms * 0.04,
        rs * 0.03,
        rs * 0.02,
        rng.gen_range(5.0..150.0),
        rng.gen_range(0.1..1.5),
        rng.gen_range(0.0..0.7),
        rng.gen_range(3.0..40.0),
    );
    s
}

/// Invented systems appended until the text reaches `bytes`, and their number.
pub fn catalogue(bytes: usize, rng: &mut Gen) -> (String, usize) {
    let mut src = String::new();
    let mut n = 0;
    while src.len() < bytes {
        src.push_str(&system(n, rng));
        n += 1;
    }
    (src, n)
}
