//! Expressions and `let` bindings on the real binary: files that once hung `syz`, aborted it
//! with a stack overflow, or dropped a declared value without a word.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use std::path::{Path, PathBuf};
use syzygy_e2e::{run, scratch, stdout, Scratch};

/// A file in a scratch folder (removed when the first of the pair is dropped).
fn file(dir: &str, name: &str, text: &str) -> (Scratch, PathBuf) {
    let d = scratch(dir);
    let p = d.join(name);
    std::fs::write(&p, text).unwrap();
    (d, p)
}

/// `check`, `eval` and `fmt --check` end normally (no abort, no panic) with the given check
/// status, and `check` says `expect`.
fn ends_normally(path: &Path, check_status: i32, expect: &str) {
    let p = path.to_str().unwrap();
    let o = run(&["check", "--propagation", "linear", p]);
    assert_eq!(o.status.code(), Some(check_status), "{}", stdout(&o));
    assert!(stdout(&o).contains(expect), "{}", stdout(&o));
    for args in [
        vec!["eval", "--propagation", "linear", p],
        vec!["fmt", "--check", p],
    ] {
        let o = run(&args);
        let code = o.status.code();
        assert!(
            matches!(code, Some(0..=2)),
            "{args:?} ended with {code:?} (signal or panic)"
        );
    }
}

#[test]
fn a_chain_of_doubling_bindings_is_evaluated_once_per_binding() {
    // 30 lines, each doubling the one before: exponential when substituted (it hung), linear now.
    let mut src = String::from("system \"A\" {\n  let x0 = 1 Msun\n");
    for i in 1..=30 {
        src.push_str(&format!("  let x{i} = x{} + x{}\n", i - 1, i - 1));
    }
    src.push_str("  star s {\n    mass = x30 / 1073741824\n  }\n}\n");
    let (_dir, p) = file("expr-chain", "chain.syz", &src);
    ends_normally(&p, 0, "0 errors");
    let o = run(&["eval", "--propagation", "linear", p.to_str().unwrap()]);
    assert!(stdout(&o).contains("mass  1 Msun"), "{}", stdout(&o));
}

#[test]
fn values_that_overflowed_the_stack_are_refused_with_a_message() {
    let cases = [
        ("minus", "-".repeat(30_000) + "1 Msun"),
        (
            "times-one",
            "1".to_string() + &" * 1".repeat(10_000) + " Msun",
        ),
        ("power", "1 Msun".to_string() + &"^1".repeat(100_000)),
        (
            "unit-ratio",
            "1 Msun".to_string() + &" * m / m".repeat(100_000),
        ),
        ("long-sum", "1".to_string() + &" + 1".repeat(1_000_000)),
    ];
    for (name, value) in cases {
        let src = format!("system \"A\" {{ star s {{ mass = {value} }} }}\n");
        let (_dir, p) = file("expr-deep", &format!("{name}.syz"), &src);
        ends_normally(&p, 1, "tokens long; the limit is 256");
    }
}

#[test]
fn declared_expressions_that_cannot_be_evaluated_are_reported() {
    let cases = [
        (
            "self",
            "system \"A\" {\n  star s {\n    mass = s.mass * 2\n  }\n}\n",
            "s.mass is defined in terms of itself",
        ),
        (
            "cycle",
            "system \"A\" {\n  let x = y\n  let y = x\n  star s {\n    mass = x\n  }\n}\n",
            "'x' is defined in terms of itself: x → y → x",
        ),
        (
            "missing",
            "system \"A\" {\n  star s {\n    mass = 1 Msun\n  }\n  planet b orbits s {\n    period = 3 d\n  }\n  planet c orbits s {\n    period = 5 d\n    impact = b.impact\n  }\n}\n",
            "it needs b.impact, which is neither declared nor derivable",
        ),
    ];
    for (name, src, expect) in cases {
        let (_dir, p) = file("expr-unevaluated", &format!("{name}.syz"), src);
        ends_normally(&p, 1, expect);
    }
}
