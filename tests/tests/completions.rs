//! `syz completions SHELL` mentions every subcommand, and every command's `--help` shows an
//! example.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use syzygy_e2e::{run, stdout};

const COMMANDS: &[&str] = &[
    "check",
    "eval",
    "explain",
    "fmt",
    "lsp",
    "plot",
    "ephemeris",
    "import",
    "completions",
];

#[test]
fn completions_mention_every_subcommand() {
    for shell in ["bash", "zsh", "fish"] {
        let o = run(&["completions", shell]);
        assert_eq!(o.status.code(), Some(0), "{shell}");
        let text = stdout(&o);
        for c in COMMANDS {
            assert!(text.contains(c), "{shell} completions lack {c}");
        }
    }
    assert_eq!(run(&["completions", "tcsh-ish"]).status.code(), Some(2));
}

#[test]
fn every_command_help_has_an_example() {
    for c in COMMANDS {
        let text = stdout(&run(&[c, "--help"]));
        assert!(
            text.contains("Example"),
            "`syz {c} --help` has no example:\n{text}"
        );
    }
}
