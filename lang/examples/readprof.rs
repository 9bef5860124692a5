//! The reader stage alone, run many times in one process, for profiling and for the
//! reader figures of docs/performance.md (not a test):
//! `cargo run --release -p syzygy --example readprof -- read 10` (also `lex`, `parse`, `lower`
//! (one parse lowered again and again), `parts`, `overlapped` (the parts with reading and
//! lowering on two threads),
//! `sizes` for the tree's node sizes, `mc` and `lin1` for one system's derivation). It
//! generates the same invented 10 MB catalogue as the `bench` example.
#[path = "common/catalogue.rs"]
mod catalogue;

use catalogue::{system, Gen};
use rand::SeedableRng;
use std::time::Instant;
use syzygy::source::FileId;

/// mimalloc, as `syz` uses, counting allocations and the bytes asked for (the `read`
/// stage prints them per pass).
struct Counting;
static ALLOCS: std::sync::atomic::AtomicU64 = std::sync::atomic::AtomicU64::new(0);
static BYTES: std::sync::atomic::AtomicU64 = std::sync::atomic::AtomicU64::new(0);
unsafe impl std::alloc::GlobalAlloc for Counting {
    unsafe fn alloc(&self, l: std::alloc::Layout) -> *mut u8 {
        ALLOCS.fetch_add(1, std::sync::atomic::Ordering::Relaxed);
        BYTES.fetch_add(l.size() as u64, std::sync::atomic::Ordering::Relaxed);
        mimalloc::MiMalloc.alloc(l)
    }
    unsafe fn dealloc(&self, p: *mut u8, l: std::alloc::Layout) {
        mimalloc::MiMalloc.dealloc(p, l)
    }
    unsafe fn realloc(&self, p: *mut u8, l: std::alloc::Layout, n: usize) -> *mut u8 {
        ALLOCS.fetch_add(1, std::sync::atomic::Ordering::Relaxed);
        BYTES.fetch_add(n as u64, std::sync::atomic::Ordering::Relaxed);
        mimalloc::MiMalloc.realloc(p, l, n)
    }
}
#[global_allocator]
static ALLOC: Counting = Counting;

fn main() {
    let mut rng = Gen::seed_from_u64(42);
    let (src, _) = catalogue::catalogue(10_000_000, &mut rng);
    let stage = std::env::args().nth(1).unwrap_or_default();
    if stage == "sizes" {
        sizes();
        return;
    }
    let runs: usize = std::env::args()
        .nth(2)
        .and_then(|s| s.parse().ok())
        .unwrap_or(10);
    // The `lower` stage lowers one parse of the file again and again.
    let parsed = (stage == "lower").then(|| syzygy::parser::parse(FileId(0), &src));
    let (a0, b0) = counts();
    let t = Instant::now();
    let mut passes = Vec::with_capacity(runs);
    for _ in 0..runs {
        let pass = Instant::now();
        match stage.as_str() {
            "mc" => {
                let one = system(0, &mut Gen::seed_from_u64(7));
                std::hint::black_box(
                    syzygy::analyze(FileId(0), &one, &syzygy::Settings::default())
                        .results
                        .len(),
                );
            }
            "lin1" => {
                let one = system(0, &mut Gen::seed_from_u64(7));
                std::hint::black_box(
                    syzygy::analyze(FileId(0), &one, &syzygy::Settings::linear())
                        .results
                        .len(),
                );
            }
            "lex" => {
                std::hint::black_box(syzygy::lexer::lex(&src).len());
            }
            "parts" => {
                // What `syz check` does with a file larger than a part: parts of 256 kB,
                // each parsed and lowered, then let go.
                let n: usize =
                    syzygy::parts::Parts::new(FileId(0), &src, syzygy::parts::PART_BYTES)
                        .map(|p| p.model.systems.len())
                        .sum();
                std::hint::black_box(n);
            }
            "overlapped" => {
                // The same parts, read on a thread of their own while the last one is
                // lowered (`Parts::read_parts`, what `syz check` does).
                let mut n = 0;
                syzygy::parts::Parts::new(FileId(0), &src, syzygy::parts::PART_BYTES)
                    .read_parts(|p| n += p.model.systems.len());
                std::hint::black_box(n);
            }
            "lower" => {
                if let Some(p) = &parsed {
                    let mut d = Vec::new();
                    std::hint::black_box(
                        syzygy::model::lower(FileId(0), &p.file, &mut d)
                            .systems
                            .len(),
                    );
                }
            }
            "parse" => {
                std::hint::black_box(syzygy::parser::parse(FileId(0), &src).diagnostics.len());
            }
            _ => {
                let p = syzygy::parser::parse(FileId(0), &src);
                let mut d = p.diagnostics;
                std::hint::black_box(
                    syzygy::model::lower(FileId(0), &p.file, &mut d)
                        .systems
                        .len(),
                );
            }
        }
        passes.push(pass.elapsed().as_secs_f64());
    }
    let s = t.elapsed().as_secs_f64() / runs as f64;
    passes.sort_by(f64::total_cmp);
    let fastest = passes.first().copied().unwrap_or(s);
    let median = passes.get(passes.len() / 2).copied().unwrap_or(s);
    println!(
        "{stage}: {:.1} ms, {:.1} MB/s (mean); median pass {:.1} ms, fastest {:.1} ms ({:.1} MB/s)",
        s * 1e3,
        src.len() as f64 / s / 1e6,
        median * 1e3,
        fastest * 1e3,
        src.len() as f64 / fastest / 1e6
    );
    let (a1, b1) = counts();
    println!(
        "  per pass: {:.2} M allocations, {:.0} MB asked for",
        (a1 - a0) as f64 / runs as f64 / 1e6,
        (b1 - b0) as f64 / runs as f64 / 1e6
    );
}

fn counts() -> (u64, u64) {
    use std::sync::atomic::Ordering::Relaxed;
    (ALLOCS.load(Relaxed), BYTES.load(Relaxed))
}
#[allow(dead_code)]
pub fn sizes() {
    use std::mem::size_of;
    println!("Prop {} Expr {} ExprKind {} Literal {} Uncertainty {} UnitExpr {} Ident {} Body {} Declared {} Content {}",
        size_of::<syzygy::ast::Prop>(), size_of::<syzygy::ast::Expr>(), size_of::<syzygy::ast::ExprKind>(),
        size_of::<syzygy::ast::Literal>(), size_of::<syzygy::ast::Uncertainty>(), size_of::<syzygy::ast::UnitExpr>(),
        size_of::<syzygy::ast::Ident>(), size_of::<syzygy::ast::BodyDecl>(), size_of::<syzygy::model::Declared>(), size_of::<syzygy::model::Content>());
}
