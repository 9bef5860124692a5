//! Property tests: no input makes the core panic, and valid systems never put a NaN or an
//! infinity into the output.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use proptest::prelude::*;
use syzygy::source::{FileId, MemoryDb};
use syzygy::{analyze, Options};

fn fast() -> Options {
    Options {
        samples: 64,
        ..Options::default()
    }
}

/// Fragments of the language, to build inputs that get deep into the parser and checker.
fn fragment() -> impl Strategy<Value = &'static str> {
    prop::sample::select(vec![
        "system",
        "\"S\"",
        "{",
        "}",
        "star",
        "planet",
        "orbits",
        "s",
        "b",
        "ref",
        "r",
        "\"t\"",
        "let",
        "x",
        "=",
        "<",
        ">",
        "mass",
        "radius",
        "period",
        "teff",
        "eccentricity",
        "inclination",
        "1.5",
        "0",
        "-2",
        "1e308",
        "1e999",
        "±",
        "+-",
        "+0.1/-0.2",
        "Msun",
        "Rjup",
        "d",
        "km/s",
        "%",
        "deg",
        "(",
        ")",
        "[r]",
        "assumed",
        "*",
        "/",
        "^",
        "sqrt(",
        "b.mass",
        "s.radius",
        ";",
        "\n",
        ",",
        ".",
        "#c\n",
        "\"",
        "☉",
        "\u{0}",
    ])
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 300, .. ProptestConfig::default() })]

    #[test]
    fn arbitrary_text_never_panics(s in "\\PC{0,300}") {
        let _ = analyze(FileId(0), &s, &fast().into());
    }

    #[test]
    fn token_soup_never_panics(parts in prop::collection::vec(fragment(), 0..80)) {
        let src = parts.join(" ");
        let a = analyze(FileId(0), &src, &fast().into());
        // Every diagnostic points inside the text.
        for d in &a.diagnostics {
            prop_assert!(d.span.end as usize <= src.len());
            prop_assert!(d.span.start <= d.span.end);
        }
    }

    #[test]
    fn valid_systems_give_finite_output(
        ms in 0.1f64..3.0, rs in 0.1f64..5.0, teff in 2500f64..9000.0,
        p in 0.3f64..2000.0, k in 0.5f64..500.0, depth in 0.0001f64..0.05, b in 0.0f64..0.9,
        e in 0.0f64..0.6, err in 0.001f64..0.2,
    ) {
        let src = format!(
            "system \"P\" {{\n star s {{ mass = {ms} ± {} Msun; radius = {rs} ± {} Rsun; teff = {teff} ± {} K }}\n planet b orbits s {{ period = {p} ± {} d; rv_amplitude = {k} ± {} m/s; transit_depth = {depth} ± {}; impact = {b} ± {}; eccentricity = {e} ± {} }}\n}}\n",
            ms * err, rs * err, teff * err, p * err * 0.01, k * err, depth * err, 0.05, e * err + 0.001
        );
        for options in [Options::linear(), fast()] {
            let a = analyze(FileId(0), &src, &options.into());
            let mut db = MemoryDb::new();
            db.add("p.syz", src.clone());
            let json = serde_json::to_string(&syzygy::report::systems_json(&a, &db)).unwrap();
            for field in ["\"value\":null", "\"below\":null", "\"above\":null"] {
                prop_assert!(!json.contains(field), "{json}");
            }
            for body in &a.results[0].bodies {
                for q in &body.quantities {
                    if q.text.is_none() {
                        prop_assert!(q.value.is_finite() && q.below.is_finite() && q.above.is_finite(), "{q:?}");
                        prop_assert!(q.below >= 0.0 && q.above >= 0.0, "{q:?}");
                    }
                }
            }
        }
    }
}

#[test]
fn a_ten_megabyte_file_is_handled() {
    // Stars only, linear propagation: this test is about size, not physics.
    let block = "system \"Bulk\" {\n  star s { mass = 1.0 ± 0.1 Msun; radius = 1.0 ± 0.1 Rsun; teff = 5800 ± 80 K }\n}\n";
    let n = 10_000_000 / block.len() + 1;
    let src = block.repeat(n);
    assert!(src.len() >= 10_000_000);
    let a = analyze(FileId(0), &src, &syzygy::Settings::linear());
    assert_eq!(a.model.systems.len(), n);
    // The same system name repeated is reported, once per repeat, and nothing else.
    assert!(a
        .diagnostics
        .iter()
        .all(|d| d.rule == syzygy::diagnostic::Rule::Duplicate));
}
