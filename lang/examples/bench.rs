//! Throughput benchmark (not a test): `cargo run --release -p syzygy --example bench`.
//!
//! Generates an invented catalogue in memory and times each stage. Figures go to
//! docs/performance.md. It allocates with mimalloc, as `syz` does.

#[path = "common/catalogue.rs"]
mod catalogue;

use catalogue::{system, Gen};
use rand::SeedableRng;
use std::time::Instant;
use syzygy::source::FileId;
use syzygy::{analyze, Settings};

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
    let (src, n) = catalogue::catalogue(10_000_000, &mut rng);
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
    // What `syz check` does with a file this size: parts of 256 kB, the next parts read on
    // a thread of their own while this one is resolved and checked.
    time(
        "the same in parts, overlapped (as syz check)",
        bytes,
        3,
        || {
            let mut n = 0;
            syzygy::parts::Parts::new(FileId(0), &src, syzygy::parts::PART_BYTES)
                .read_parts(|p| n += p.model.systems.len() + p.diagnostics.len());
            n
        },
    );
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
