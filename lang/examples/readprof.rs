//! Profiling aid (not committed): the reader stage only, many times.
use rand::{Rng, SeedableRng};
use rand_chacha::ChaCha8Rng;
use std::fmt::Write;
use std::time::Instant;
use syzygy::source::FileId;

#[global_allocator]
static ALLOC: mimalloc::MiMalloc = mimalloc::MiMalloc;

fn system(i: usize, rng: &mut ChaCha8Rng) -> String {
    let ms: f64 = rng.gen_range(0.5..1.4);
    let rs = ms.powf(0.8);
    let teff = 5772.0 * ms.powf(0.5);
    let p1: f64 = rng.gen_range(1.0..15.0);
    let p2 = p1 * rng.gen_range(3.0..8.0);
    let mut s = String::new();
    let _ = write!(
        s,
        "system \"Synthetic {i}\" {{\n  star s{i} {{\n    mass = {ms:.3} ± {:.3} Msun\n    radius = {rs:.3} +{:.3}/-{:.3} Rsun\n    teff = {teff:.0} ± 80 K\n  }}\n  planet b orbits s{i} {{\n    period = {p1:.5} ± 0.00003 d\n    rv_amplitude = {:.1} ± 1.5 m/s\n    transit_depth = {:.3} ± 0.02 %\n    impact = {:.2} ± 0.05\n    eccentricity < 0.1\n  }}\n  planet c orbits s{i} {{\n    period = {p2:.3} ± 0.05 d\n    rv_amplitude = {:.1} ± 1.0 m/s\n  }}\n}}\n",
        ms * 0.04, rs * 0.03, rs * 0.02,
        rng.gen_range(5.0..150.0), rng.gen_range(0.1..1.5), rng.gen_range(0.0..0.7), rng.gen_range(3.0..40.0),
    );
    s
}

fn main() {
    let mut rng = ChaCha8Rng::seed_from_u64(42);
    let mut src = String::new();
    let mut n = 0;
    while src.len() < 10_000_000 {
        src.push_str(&system(n, &mut rng));
        n += 1;
    }
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
                let one = system(0, &mut ChaCha8Rng::seed_from_u64(7));
                std::hint::black_box(
                    syzygy::analyze(FileId(0), &one, &syzygy::Settings::default())
                        .results
                        .len(),
                );
            }
            "lin1" => {
                let one = system(0, &mut ChaCha8Rng::seed_from_u64(7));
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
