//! The reader stage alone, run many times in one process, for profiling and for the
//! reader figures of docs/performance.md (not a test):
//! `cargo run --release -p syzygy --example readprof -- read 10` (also `lex`, `parse`,
//! `sizes` for the tree's node sizes, `mc` and `lin1` for one system's derivation). It
//! generates the same invented 10 MB catalogue as the `bench` example.
#[path = "common/catalogue.rs"]
mod catalogue;

use catalogue::{system, Gen};
use rand::SeedableRng;
use std::time::Instant;
use syzygy::source::FileId;

#[global_allocator]
static ALLOC: mimalloc::MiMalloc = mimalloc::MiMalloc;

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
    let t = Instant::now();
    for _ in 0..runs {
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
    }
    let s = t.elapsed().as_secs_f64() / runs as f64;
    println!(
        "{stage}: {:.1} ms, {:.1} MB/s",
        s * 1e3,
        src.len() as f64 / s / 1e6
    );
}
#[allow(dead_code)]
pub fn sizes() {
    use std::mem::size_of;
    println!("Prop {} Expr {} ExprKind {} Literal {} Uncertainty {} UnitExpr {} Ident {} Body {} Declared {} Content {}",
        size_of::<syzygy::ast::Prop>(), size_of::<syzygy::ast::Expr>(), size_of::<syzygy::ast::ExprKind>(),
        size_of::<syzygy::ast::Literal>(), size_of::<syzygy::ast::Uncertainty>(), size_of::<syzygy::ast::UnitExpr>(),
        size_of::<syzygy::ast::Ident>(), size_of::<syzygy::ast::BodyDecl>(), size_of::<syzygy::model::Declared>(), size_of::<syzygy::model::Content>());
}
