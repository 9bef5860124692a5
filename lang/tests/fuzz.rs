//! A structured, time-boxed fuzzer on stable Rust (cargo-fuzz needs a nightly toolchain).
//!
//! It mutates the demo and fixture files — deleting, duplicating and swapping byte ranges and
//! lines, inserting fragments of the language — and, one run in eight, generated inputs of
//! shapes mutation rarely reaches (chains of up to 300 bindings, some cyclic; values nested
//! or chained hundreds deep; up to four systems of up to 60 planets), and runs every stage on each mutant: lexer,
//! parser, checker (both propagation modes) and formatter. It asserts that nothing panics,
//! that diagnostics point inside the text, and that formatting is idempotent whenever it
//! succeeds. Run it with
//!
//! ```sh
//! FUZZ_SECONDS=20 cargo test -p syzygy --test fuzz -- --ignored --nocapture     # CI
//! FUZZ_SECONDS=1800 cargo test --release -p syzygy --test fuzz -- --ignored    # longer
//! ```
//!
//! `FUZZ_THREADS=N` runs N threads in one run (seeds `FUZZ_SEED` to `FUZZ_SEED + N - 1`), and
//! `FUZZ_RUNS=M` stops the run once M inputs are done. Each input's cost is reported as the
//! CPU time of its thread, so that a run beside other work still tells a slow input from a
//! wait for a core.
//!
//! A crash prints the seed and the mutant; add the mutant to `tests/fixtures/check/` as a
//! regression test.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use rand::{Rng as _, SeedableRng};
use rand_chacha::ChaCha8Rng;
use std::sync::atomic::{AtomicU64, Ordering};
use std::time::{Duration, Instant};
use syzygy::source::FileId;
use syzygy::{analyze, Options};

const FRAGMENTS: &[&str] = &[
    "{",
    "}",
    "(",
    ")",
    "[",
    "]",
    "±",
    "+-",
    "+0.1/-0.2",
    "<",
    ">",
    "=",
    ";",
    "\n",
    "#",
    "\"",
    "e999",
    "-",
    "^",
    "/",
    "*",
    "system",
    "star",
    "planet",
    "orbits",
    "let",
    "ref",
    "assumed",
    "Msun",
    "km s^-1",
    "b.mass",
    "sqrt(",
    "0",
    "1e-320",
    "M☉",
    "µas",
    "# allow(inconsistent): x\n",
    "\u{0}",
    "\u{feff}",
];

/// The fuzzer's generator: ChaCha8 seeded from `FUZZ_SEED`, the engine's own generator
/// family, so a seed printed on a crash replays the same mutants on any platform.
type Rng = ChaCha8Rng;

/// A uniform index below `n` (0 when `n` is 0, so empty inputs still mutate).
fn below(rng: &mut Rng, n: usize) -> usize {
    if n == 0 {
        0
    } else {
        rng.gen_range(0..n)
    }
}

fn corpus() -> Vec<String> {
    let root = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("..");
    let mut out = Vec::new();
    for dir in [
        "examples",
        "examples/broken",
        "examples/catalogue",
        "tests/fixtures/check",
    ] {
        if let Ok(rd) = std::fs::read_dir(root.join(dir)) {
            for e in rd.flatten() {
                if e.path().extension().is_some_and(|x| x == "syz") {
                    if let Ok(t) = std::fs::read_to_string(e.path()) {
                        out.push(t);
                    }
                }
            }
        }
    }
    out
}

fn mutate(src: &str, rng: &mut Rng) -> String {
    let mut b = src.as_bytes().to_vec();
    for _ in 0..=below(rng, 4) {
        let len = b.len();
        match below(rng, 5) {
            0 if len > 0 => {
                let s = below(rng, len);
                let e = (s + below(rng, 20)).min(len);
                b.drain(s..e);
            }
            1 if len > 0 => {
                let s = below(rng, len);
                let e = (s + below(rng, 40)).min(len);
                let piece = b[s..e].to_vec();
                let at = below(rng, b.len());
                b.splice(at..at, piece);
            }
            2 => {
                let f = FRAGMENTS[below(rng, FRAGMENTS.len())].as_bytes();
                let at = below(rng, len + 1);
                b.splice(at..at, f.iter().copied());
            }
            3 if len > 1 => {
                let (i, j) = (below(rng, len), below(rng, len));
                b.swap(i, j);
            }
            _ => {
                let at = below(rng, len + 1);
                b.insert(at.min(b.len()), rng.gen::<u8>());
            }
        }
    }
    String::from_utf8_lossy(&b).into_owned()
}

/// A structured input of a shape mutation rarely reaches: long or cyclic chains of bindings,
/// deep nesting and long operator runs in one value, many systems, many planets per system.
fn generate(rng: &mut Rng) -> String {
    let mut out = String::new();
    let systems = 1 + below(rng, 4);
    for si in 0..systems {
        out.push_str(&format!("system \"G{si}\" {{\n"));
        match below(rng, 4) {
            // A chain of bindings, each using earlier (or, sometimes, later) ones.
            0 => {
                let n = 1 + below(rng, 300);
                out.push_str("  let x0 = 1.0 ± 0.1 Msun\n");
                for i in 1..n {
                    let a = below(rng, i);
                    let b = if below(rng, 20) == 0 {
                        below(rng, n)
                    } else {
                        below(rng, i)
                    };
                    let op = ["+", "-", "*", "/"][below(rng, 4)];
                    let rhs = if op == "+" || op == "-" {
                        format!("x{a} {op} x{b}")
                    } else {
                        format!("x{a} {op} (x{b} / x{b})")
                    };
                    out.push_str(&format!("  let x{i} = {rhs}\n"));
                }
                out.push_str(&format!("  star s {{\n    mass = x{}\n  }}\n", n - 1));
            }
            // One deeply nested or very long value.
            1 => {
                let depth = below(rng, 120);
                let value = match below(rng, 4) {
                    0 => format!("{}1{} Msun", "(".repeat(depth), ")".repeat(depth)),
                    1 => format!("{}1 Msun", "-".repeat(below(rng, 600))),
                    2 => format!("1 Msun{}", "^1".repeat(below(rng, 600))),
                    _ => format!("1{} Msun", " * 1".repeat(below(rng, 600))),
                };
                out.push_str(&format!("  star s {{\n    mass = {value}\n  }}\n"));
            }
            // Many planets around one star.
            _ => {
                out.push_str(
                    "  star s {\n    mass = 1 ± 0.05 Msun\n    radius = 1 ± 0.02 Rsun\n  }\n",
                );
                for p in 0..below(rng, 60) {
                    out.push_str(&format!(
                        "  planet p{p} orbits s {{\n    period = {} ± 0.01 d\n    rv_amplitude = {} ± 1 m/s\n  }}\n",
                        3 + p * 5,
                        1 + below(rng, 100)
                    ));
                }
            }
        }
        out.push_str("}\n");
    }
    out
}

fn one(src: &str) {
    let _ = syzygy::lexer::lex(src);
    // Few samples: the paths are the same, and many more inputs get through.
    for options in [
        Options {
            samples: 32,
            ..Options::linear()
        },
        Options {
            samples: 32,
            ..Options::default()
        },
    ] {
        let settings: syzygy::Settings = options.into();
        let a = analyze(FileId(0), src, &settings);
        for d in &a.diagnostics {
            assert!(
                d.span.start <= d.span.end && d.span.end as usize <= src.len(),
                "span outside the text: {d:?}"
            );
        }
        // Read in parts of a few lines each, the file says the same (every fourth input,
        // first order only: a large file is read this way).
        if settings.options.propagation == syzygy::Propagation::Linear
            && src.len().is_multiple_of(4)
        {
            in_parts_says_the_same(src, &settings, &a);
        }
    }
    if let Ok(once) = syzygy::layout::format_source(src) {
        let twice = syzygy::layout::format_source(&once).expect("formatted text must format again");
        assert_eq!(once, twice, "formatting is not idempotent");
    }
}

fn in_parts_says_the_same(src: &str, settings: &syzygy::Settings, whole: &syzygy::Analysis) {
    let mut diagnostics = Vec::new();
    let mut systems = 0;
    for part in syzygy::parts::Parts::new(FileId(0), src, 64) {
        let a = syzygy::analyze_part(src, part, settings);
        systems += a.model.systems.len();
        diagnostics.extend(a.diagnostics);
    }
    assert_eq!(
        systems,
        whole.model.systems.len(),
        "systems differ when read in parts"
    );
    // Compared as printed (a value that is not a number is not equal to itself).
    assert_eq!(
        format!("{diagnostics:?}"),
        format!("{:?}", whole.diagnostics),
        "diagnostics differ when read in parts"
    );
}

/// CPU time of the calling thread: what one input cost, whatever else the machine was doing
/// (wall-clock time on a machine shared with builds measures waits for a core, not hangs).
fn thread_cpu_time() -> Duration {
    let mut t = libc::timespec {
        tv_sec: 0,
        tv_nsec: 0,
    };
    // SAFETY: `t` is a valid, writable timespec; CLOCK_THREAD_CPUTIME_ID is always available
    // on Linux.
    let rc = unsafe { libc::clock_gettime(libc::CLOCK_THREAD_CPUTIME_ID, &mut t) };
    assert_eq!(rc, 0, "clock_gettime failed");
    Duration::new(t.tv_sec as u64, t.tv_nsec as u32)
}

fn env_u64(name: &str, default: u64) -> u64 {
    std::env::var(name)
        .ok()
        .and_then(|s| s.parse().ok())
        .unwrap_or(default)
}

/// What one fuzzing thread did.
struct Tally {
    runs: u64,
    slowest_wall: Duration,
    slowest_cpu: Duration,
}

/// One thread of a run: its own generator (seeded `seed + thread`), stopping at the deadline
/// or once all threads together have done `target` inputs.
fn fuzz_thread(
    corpus: &[String],
    seed: u64,
    deadline: Instant,
    total: &AtomicU64,
    target: u64,
) -> Tally {
    let mut rng = Rng::seed_from_u64(seed);
    let mut tally = Tally {
        runs: 0,
        slowest_wall: Duration::ZERO,
        slowest_cpu: Duration::ZERO,
    };
    while Instant::now() < deadline && total.load(Ordering::Relaxed) < target {
        // One run in eight starts from a generated input instead of the corpus.
        let mutant = if below(&mut rng, 8) == 0 {
            let generated = generate(&mut rng);
            if below(&mut rng, 2) == 0 {
                generated
            } else {
                mutate(&generated, &mut rng)
            }
        } else {
            mutate(&corpus[below(&mut rng, corpus.len())], &mut rng)
        };
        let began = Instant::now();
        let cpu = thread_cpu_time();
        let result = std::panic::catch_unwind(|| one(&mutant));
        tally.slowest_cpu = tally.slowest_cpu.max(thread_cpu_time().saturating_sub(cpu));
        tally.slowest_wall = tally.slowest_wall.max(began.elapsed());
        if let Err(e) = result {
            eprintln!(
                "crash after {} runs (FUZZ_SEED={seed}); mutant:\n{mutant:?}",
                tally.runs
            );
            std::panic::resume_unwind(e);
        }
        tally.runs += 1;
        let all = total.fetch_add(1, Ordering::Relaxed) + 1;
        if all.is_multiple_of(100_000) {
            // Progress for long runs, so that a stopped run still says how far it got.
            eprintln!("fuzz: {all} inputs so far, no crash");
        }
    }
    tally
}

#[test]
#[ignore = "time-boxed fuzzing; run with --ignored (see the module doc)"]
fn fuzz_every_stage() {
    let seconds = env_u64("FUZZ_SECONDS", 20);
    let seed = env_u64("FUZZ_SEED", 0x5eed_5eed);
    let threads = env_u64("FUZZ_THREADS", 1).max(1);
    let target = env_u64("FUZZ_RUNS", u64::MAX);
    let corpus = corpus();
    assert!(!corpus.is_empty(), "no corpus found");
    let start = Instant::now();
    let deadline = start + Duration::from_secs(seconds);
    let total = AtomicU64::new(0);
    let tallies: Vec<Tally> = std::thread::scope(|scope| {
        let handles: Vec<_> = (0..threads)
            .map(|t| {
                let (corpus, total) = (&corpus, &total);
                scope.spawn(move || fuzz_thread(corpus, seed + t, deadline, total, target))
            })
            .collect();
        handles
            .into_iter()
            .map(|h| h.join().unwrap_or_else(|e| std::panic::resume_unwind(e)))
            .collect()
    });
    let runs: u64 = tallies.iter().map(|t| t.runs).sum();
    let wall = tallies
        .iter()
        .map(|t| t.slowest_wall)
        .max()
        .unwrap_or_default();
    let cpu = tallies
        .iter()
        .map(|t| t.slowest_cpu)
        .max()
        .unwrap_or_default();
    eprintln!(
        "fuzz: {runs} inputs in {:.0} s on {threads} thread(s) (seeds {seed}..{}), no crash; \
         slowest input {cpu:?} of CPU time ({wall:?} wall-clock)",
        start.elapsed().as_secs_f64(),
        seed + threads - 1
    );
    assert!(runs > 0);
}
