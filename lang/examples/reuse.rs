//! Re-analysis benchmark (not a test): `cargo run --release -p syzygy --example reuse`.
//!
//! The language server's case: a file of 125 invented systems of one star and eight planets
//! (1,000 planets) analysed afresh, then again after a one-character edit in one system,
//! reusing the other systems' work. Linear propagation, as in the editor. Figures go to
//! docs/performance.md.

use std::fmt::Write;
use std::time::{Duration, Instant};
use syzygy::source::FileId;
use syzygy::{analyze, analyze_reusing, Settings};

fn generated() -> String {
    let mut s = String::from("ref bench \"Benchmark data (invented)\"\n");
    for i in 0..125 {
        let m = 0.6 + (i % 8) as f64 * 0.05;
        let _ = writeln!(
            s,
            "system \"Lattice {i}\" {{\n  star l{i} {{ mass = {m:.2} ± 0.03 Msun [bench]; radius = {m:.2} ± 0.02 Rsun; teff = {} ± 70 K }}",
            4700 + (i % 11) * 50
        );
        for p in 0..8 {
            let _ = writeln!(
                s,
                "  planet p{p} orbits l{i} {{\n    period = {:.4} ± 0.0004 d\n    rv_amplitude = {:.1} ± 0.7 m/s\n    transit_depth = {:.3} ± 0.01 %\n    impact = 0.25 ± 0.05\n  }}",
                1.8 * 2f64.powi(p),
                25.0 / (p + 1) as f64,
                0.25 + 0.04 * p as f64
            );
        }
        s.push_str("}\n");
    }
    s
}

fn median(mut v: Vec<Duration>) -> Duration {
    v.sort();
    v.get(v.len() / 2).copied().unwrap_or_default()
}

fn main() {
    let text = generated();
    let opts = Settings::linear();
    let runs = 21;
    let fresh = median(
        (0..runs)
            .map(|_| {
                let t = Instant::now();
                let a = analyze(FileId(0), &text, &opts);
                let elapsed = t.elapsed();
                drop(std::hint::black_box(a));
                elapsed
            })
            .collect(),
    );
    let parse = median(
        (0..runs)
            .map(|_| {
                let t = Instant::now();
                let p = syzygy::parser::parse(FileId(0), &text);
                let mut d = p.diagnostics;
                std::hint::black_box(syzygy::model::lower(FileId(0), &p.file, &mut d));
                t.elapsed()
            })
            .collect(),
    );
    // In system 60 of 125, as typing would: replace one digit of a period (nothing moves),
    // or insert a digit and delete it again (the 64 systems after it move).
    let at = text
        .match_indices("period = ")
        .nth(60 * 8 + 3)
        .map_or(0, |(i, _)| i + "period = ".len());
    let edit = |r: usize, t: &mut String, moving: bool| match (moving, r % 2) {
        (false, 0) => t.replace_range(at..at + 1, "4"),
        (false, _) => t.replace_range(at..at + 1, "3"),
        (true, 0) => t.insert(at, '1'),
        (true, _) => t.replace_range(at..at + 1, ""),
    };
    let mut figures = Vec::new();
    for moving in [false, true] {
        let (_, mut keep) = analyze_reusing(FileId(0), &text, &opts, None);
        let mut edited = text.clone();
        let mut times = Vec::new();
        for r in 0..runs {
            edit(r, &mut edited, moving);
            let t = Instant::now();
            let (a, next) = analyze_reusing(FileId(0), &edited, &opts, Some(&keep));
            times.push(t.elapsed());
            // Freeing the analysis is left out, as the language server frees the replaced
            // one on another thread.
            drop(std::hint::black_box(a));
            keep = next;
        }
        figures.push((median(times), keep.reused()));
    }
    println!(
        "{} bytes, 125 systems, 1,000 planets (linear propagation; medians of {runs})",
        text.len()
    );
    println!(
        "full analysis:                   {:>8.2} ms",
        fresh.as_secs_f64() * 1e3
    );
    println!(
        "parse and lower only:            {:>8.2} ms",
        parse.as_secs_f64() * 1e3
    );
    for ((t, reused), what) in figures.iter().zip(["replaced", "inserted or deleted"]) {
        println!(
            "one character {what:<20} {:>8.2} ms ({reused} of 125 systems reused)",
            t.as_secs_f64() * 1e3
        );
    }
}
