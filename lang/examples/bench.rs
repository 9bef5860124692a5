//! Throughput benchmark (not a test): `cargo run --release -p syzygy --example bench`.
//!
//! Generates an invented catalogue in memory and times each stage. Figures go to
//! docs/performance.md. It allocates with mimalloc, as `syz` does.

use rand::{Rng, SeedableRng};
use rand_chacha::ChaCha8Rng;
use std::fmt::Write;
use std::time::Instant;
use syzygy::source::FileId;
use syzygy::{analyze, Settings};

/// The generator of the invented catalogue: ChaCha8 with a fixed seed, so runs are
/// comparable.
type Gen = ChaCha8Rng;

/// One invented system with a transiting, RV-measured planet and an RV-only one.
fn system(i: usize, rng: &mut Gen) -> String {
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

fn time<T>(label: &str, bytes: usize, runs: usize, mut f: impl FnMut() -> T) -> f64 {
    let _ = f();
    let start = Instant::now();
    for _ in 0..runs {
        std::hint::black_box(f());
    }
    let secs = start.elapsed().as_secs_f64() / runs as f64;
    if bytes > 0 {
        println!(
            "{label:<48} {:>9.2} ms  {:>8.1} MB/s",
            secs * 1e3,
            bytes as f64 / secs / 1e6
        );
    } else {
        println!("{label:<48} {:>9.3} ms", secs * 1e3);
    }
    secs
}

#[global_allocator]
static ALLOC: mimalloc::MiMalloc = mimalloc::MiMalloc;

fn main() {
    let mut rng = Gen::seed_from_u64(42);
    let mut src = String::new();
    let mut n = 0;
    while src.len() < 10_000_000 {
        src.push_str(&system(n, &mut rng));
        n += 1;
    }
    let bytes = src.len();
    println!(
        "generated {:.1} MB: {n} systems, {} planets",
        bytes as f64 / 1e6,
        2 * n
    );
    time("lex", bytes, 5, || syzygy::lexer::lex(&src).len());
    time("lex + parse", bytes, 3, || {
        syzygy::parser::parse(FileId(0), &src).diagnostics.len()
    });
    time("parse + resolve + unit/range checks", bytes, 3, || {
        let p = syzygy::parser::parse(FileId(0), &src);
        let mut d = p.diagnostics;
        syzygy::model::lower(FileId(0), &p.file, &mut d)
            .systems
            .len()
    });
    let lin = time("full check, linear propagation", bytes, 1, || {
        analyze(FileId(0), &src, &Settings::linear())
            .diagnostics
            .len()
    });
    println!(
        "  = {:.1} us per planet (derivations and physics checks included)",
        lin / (2 * n) as f64 * 1e6
    );

    // One transiting, RV-measured planet (and its RV-only sibling) with 10^4 samples.
    let one = system(0, &mut Gen::seed_from_u64(7));
    let planets = 2.0;
    let mc = time("one system, Monte Carlo, 10^4 samples", 0, 20, || {
        analyze(FileId(0), &one, &Settings::default()).results.len()
    });
    println!("  = {:.2} ms per planet", mc / planets * 1e3);
    let lin1 = time("one system, linear", 0, 200, || {
        analyze(FileId(0), &one, &Settings::linear()).results.len()
    });
    println!("  = {:.1} us per planet", lin1 / planets * 1e6);
    // Rules fired for that system: every derived quantity is one rule evaluation per sample.
    let a = analyze(FileId(0), &one, &Settings::default());
    let derived = a
        .results
        .iter()
        .flat_map(|r| &r.bodies)
        .flat_map(|b| &b.quantities)
        .filter(|q| q.origin == syzygy::derive::Origin::Derived)
        .count();
    println!("  {derived} derived quantities: {:.1} ns per sample per rule (including candidates and checks)", mc / (derived as f64 * 1e4) * 1e9);
}
