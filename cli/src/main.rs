//! `syz`: the command line over the Syzygy core. Reads files, hands their text to the core,
//! renders what comes back. No language or physics logic lives here.

// Every module prints through `output`, so that a reader closing the pipe early never
// makes a command panic (see output.rs). These shadow the standard macros of that name.
macro_rules! print {
    ($($arg:tt)*) => { $crate::output::text(format_args!($($arg)*)) };
}
macro_rules! println {
    () => { $crate::output::line(format_args!("")) };
    ($($arg:tt)*) => { $crate::output::line(format_args!($($arg)*)) };
}
macro_rules! eprintln {
    () => { $crate::output::error_line(format_args!("")) };
    ($($arg:tt)*) => { $crate::output::error_line(format_args!($($arg)*)) };
}

mod check_cmd;
mod config_file;
mod csv_out;
mod diff_cmd;
mod ephemeris_cmd;
mod eval_cmd;
mod explain_cmd;
mod files;
mod fmt_cmd;
mod git;
mod import_cmd;
mod json_out;
mod output;
mod plot_cmd;
mod render;
mod sarif;
mod votable_out;

use clap::{Parser, Subcommand, ValueEnum};
use std::io::Write;
use std::path::PathBuf;
use std::process::ExitCode;
use syzygy::diagnostic::{Rule, Severity, SeverityOverride};
use syzygy::settings::Layer;
use syzygy::what_if::WhatIf;
use syzygy::Propagation;

// The derivation engine makes many small allocations per system; mimalloc serves them
// faster than the system allocator across threads (docs/performance.md).
#[global_allocator]
static ALLOCATOR: mimalloc::MiMalloc = mimalloc::MiMalloc;

#[derive(Parser)]
#[command(
    name = "syz",
    version,
    about = "Check and evaluate Syzygy descriptions of stars and their planets",
    long_about = "Syzygy reads *.syz files that declare stars, planets and their measurements \
                  (with units, uncertainties and citations), derives what follows from them \
                  (semi-major axes, masses, radii, densities, temperatures, ...) and flags unit \
                  and physics inconsistencies.",
    after_help = "Examples (from the top of the source tree):\n  \
                  syz check examples/veyra.syz        problems, with the offending line\n  \
                  syz eval examples/veyra.syz         every declared and derived quantity\n  \
                  syz explain examples/veyra.syz b.density\n\n\
                  Exit status: 0 done, nothing wrong; 1 a problem in the input (an error found by \
                  check or eval, a file fmt --check would change, a value the file does not let \
                  explain, plot or ephemeris compute, a change diff finds beyond its threshold); 2 the command could not do its job (a file \
                  that cannot be read, an invalid syzygy.toml, a wrong argument, output that cannot \
                  be written).\n\n\
                  The language: docs/language.md; `syz <command> --help` for each command."
)]
struct Cli {
    #[command(subcommand)]
    command: Command,
}

#[derive(Clone, Copy, PartialEq, Eq, ValueEnum)]
pub(crate) enum Format {
    Human,
    Json,
}

#[derive(Clone, Copy, PartialEq, Eq, ValueEnum)]
pub(crate) enum EvalFormat {
    /// Aligned text for people.
    Human,
    /// The JSON contract, full precision (see docs/json-output.md).
    Json,
    /// A table, one row per planet with its host star's values (see docs/table-output.md).
    Csv,
    /// The same table as an IVOA VOTable 1.4 document, with units and UCDs (see
    /// docs/table-output.md).
    Votable,
}

#[derive(Clone, Copy, PartialEq, Eq, ValueEnum)]
pub(crate) enum DiffFormat {
    /// Aligned text for people.
    Text,
    /// The diff's JSON contract (see docs/review.md).
    Json,
    /// A review comment: one table per system, most significant first.
    Markdown,
}

#[derive(Clone, Copy, PartialEq, Eq, ValueEnum)]
pub(crate) enum TableArg {
    /// One row per planet with its host star's values joined; every declared and derived value.
    Planets,
    /// One row per declared value, every source of a quantity declared several times included
    /// (which one is used, and the line it is on).
    Sources,
}

#[derive(Clone, Copy, PartialEq, Eq, ValueEnum)]
pub(crate) enum CheckFormat {
    /// Each problem with the lines it is on, for people.
    Human,
    /// Diagnostics and a summary for programs (see docs/json-output.md).
    Json,
    /// SARIF 2.1.0, for code-review and CI tools.
    Sarif,
}

#[derive(Clone, Copy, PartialEq, Eq, ValueEnum)]
enum PropagationArg {
    /// Monte Carlo sampling (default): handles asymmetric errors, limits and non-linearity.
    MonteCarlo,
    /// First-order propagation: fast, exact for linear formulas.
    Linear,
}

#[derive(clap::Args)]
struct EngineArgs {
    /// How uncertainties are propagated [default: monte-carlo, or as syzygy.toml says].
    #[arg(long, value_enum)]
    propagation: Option<PropagationArg>,
    /// Monte Carlo sample count, or `auto` to draw until every value is stable to the
    /// digits shown (JCGM 101:2008 7.9) [default: 10000, or as syzygy.toml says].
    #[arg(long, value_name = "N|auto", value_parser = syzygy::SampleCount::parse)]
    samples: Option<syzygy::SampleCount>,
    /// Seed of the Monte Carlo generator (the same seed gives the same numbers) [default: 1398364761].
    #[arg(long)]
    seed: Option<u64>,
    /// Declared and derived values further apart than this many combined sigma are reported [default: 3].
    #[arg(long, value_parser = parse_sigma)]
    sigma: Option<f64>,
    /// An inconsistency of more than this many combined sigma is an error, not a warning [default: 5].
    #[arg(long, value_parser = parse_sigma)]
    error_sigma: Option<f64>,
    /// Report this rule as an error (repeatable; see docs/rules.md for the ids).
    #[arg(long, value_name = "RULE", value_parser = parse_rule)]
    deny: Vec<Rule>,
    /// Report this rule as a warning (repeatable).
    #[arg(long, value_name = "RULE", value_parser = parse_rule)]
    warn: Vec<Rule>,
    /// Do not report this rule (repeatable).
    #[arg(long, value_name = "RULE", value_parser = parse_rule)]
    allow: Vec<Rule>,
    /// For this run only, use VALUE for a body's quantity in place of what the file declares
    /// (repeatable; the file is not changed). VALUE is written as in a file: `--set
    /// 'veyra.radius=0.80 ± 0.02 Rsun'`, a limit `--set 'b.eccentricity<0.1'`. Name the
    /// system when several have the body:
    /// `--set 'Veyra/b.period=3.5 ± 0.1 d'` (see docs/review.md).
    #[arg(
        long,
        value_name = "[SYSTEM/]BODY.QUANTITY=VALUE",
        value_parser = parse_set,
        global = true
    )]
    set: Vec<WhatIf>,
}

fn parse_set(s: &str) -> Result<WhatIf, String> {
    syzygy::what_if::parse(s)
}

fn parse_sigma(s: &str) -> Result<f64, String> {
    match s.parse::<f64>() {
        Ok(v) if v.is_finite() && v > 0.0 => Ok(v),
        _ => Err(format!(
            "expected a positive number of standard deviations, found '{s}'"
        )),
    }
}

fn parse_rule(s: &str) -> Result<Rule, String> {
    let rule = Rule::from_id(s).ok_or_else(|| {
        let ids: Vec<&str> = Rule::ALL.iter().map(|r| r.id()).collect();
        format!("unknown rule '{s}'; the rules are: {}", ids.join(", "))
    })?;
    if rule.is_fixed() {
        return Err(format!(
            "'{s}' cannot be changed: {}, so it is always an error",
            rule.why_fixed()
        ));
    }
    Ok(rule)
}

impl EngineArgs {
    /// The settings given explicitly, to lay over a project file.
    fn flags(&self) -> Layer {
        Layer {
            propagation: self.propagation.map(|p| match p {
                PropagationArg::MonteCarlo => Propagation::MonteCarlo,
                PropagationArg::Linear => Propagation::Linear,
            }),
            samples: self.samples,
            seed: self.seed,
            consistency_sigma: self.sigma,
            consistency_error_sigma: self.error_sigma,
            source_choice: None,
            reference_files: None,
            overrides: self.overrides(),
            what_if: self.set.clone(),
            site: None,
        }
    }

    fn overrides(&self) -> Vec<SeverityOverride> {
        let mut o = Vec::new();
        o.extend(self.warn.iter().map(|r| (*r, Some(Severity::Warning))));
        o.extend(self.deny.iter().map(|r| (*r, Some(Severity::Error))));
        o.extend(self.allow.iter().map(|r| (*r, None)));
        o
    }
}

#[derive(Subcommand)]
enum Command {
    /// Check files or folders (recursing into *.syz) and report problems.
    #[command(
        after_help = "Exit status: 0 no errors, 1 errors (or warnings, with --deny-warnings), 2 a file could not be read or syzygy.toml is invalid.\n\nExample:\n  syz check examples/veyra.syz examples/catalogue/\n  syz check examples/broken/      # wrong on purpose: every rule, exit 1\n  syz check --format json catalogue/ > report.json\n  syz check --format sarif catalogue/ > syzygy.sarif"
    )]
    Check {
        /// Files, or folders searched for *.syz files.
        #[arg(required = true)]
        paths: Vec<PathBuf>,
        #[arg(long, value_enum, default_value = "human")]
        format: CheckFormat,
        /// Exit with status 1 on warnings too.
        #[arg(long)]
        deny_warnings: bool,
        #[command(flatten)]
        engine: EngineArgs,
        #[command(flatten)]
        read: files::ReadArgs,
    },
    /// Print every system and body with its declared and derived quantities.
    #[command(
        after_help = "Each value shows its uncertainty to two significant digits, its rule and inputs, and what was assumed; JSON and CSV keep full precision.\n\nExample:\n  syz eval examples/veyra.syz\n  syz eval --format json --propagation linear examples/\n  syz eval --format csv --propagation linear catalogue/ > table.csv\n  syz eval --format votable --table sources catalogue/ > declared.vot"
    )]
    Eval {
        /// Files, or folders searched for *.syz files.
        #[arg(required = true)]
        paths: Vec<PathBuf>,
        #[arg(long, value_enum, default_value = "human")]
        format: EvalFormat,
        /// Which table `--format csv` and `--format votable` write [default: planets].
        #[arg(long, value_enum)]
        table: Option<TableArg>,
        /// With `--format json`: the same document on one line, without indentation (about
        /// half the bytes, for machines).
        #[arg(long)]
        compact: bool,
        #[command(flatten)]
        engine: EngineArgs,
        #[command(flatten)]
        read: files::ReadArgs,
    },
    /// Show how one quantity was derived, down to the measurements, with its error budget.
    #[command(after_help = "Example:\n  syz explain examples/veyra.syz b.density")]
    Explain {
        /// The *.syz file.
        file: PathBuf,
        /// [SYSTEM/]BODY.QUANTITY, for example `b.density`, `veyra.luminosity` or
        /// `Veyra/b.density` (the system, when several systems of the file have a body of
        /// that name).
        #[arg(value_name = "[SYSTEM/]BODY.QUANTITY")]
        target: String,
        /// The system, when several systems of the file have a body of that name.
        #[arg(long)]
        system: Option<String>,
        #[command(flatten)]
        engine: EngineArgs,
        #[command(flatten)]
        read: files::ReadArgs,
    },
    /// Compare two versions of a catalogue: declared values, derived values that moved
    /// (in combined standard deviations), composition classes and diagnostics.
    #[command(
        after_help = "Exit status: 0 nothing moved beyond the threshold; 1 something did (or a system, body or value appeared or went away); 2 a file or revision could not be read, or a wrong argument.\n\nBoth sides are derived with the new side's settings (syzygy.toml and the flags, the same seed), so an unchanged file shows no change. --set applies to the new side only.\n\nExample:\n  syz diff old-catalogue/ catalogue/\n  syz diff --against origin/main --format markdown catalogue/\n  syz diff examples/veyra.syz --set 'veyra.mass=0.85 ± 0.04 Msun'\n\nSee docs/review.md."
    )]
    Diff {
        /// OLD and NEW (two files or two folders); with --against, the paths to compare with
        /// the revision; one path with --set compares it with itself under the values set.
        #[arg(required = true, value_name = "PATH")]
        paths: Vec<PathBuf>,
        /// Compare the paths in the working tree with the same paths at this git revision.
        #[arg(long, value_name = "REV", allow_hyphen_values = true)]
        against: Option<String>,
        #[arg(long, value_enum, default_value = "text")]
        format: DiffFormat,
        /// Moves of at least this many combined standard deviations are listed.
        #[arg(long, value_name = "SIGMA", default_value = "1", value_parser = parse_sigma)]
        threshold: f64,
        /// List every change, however small.
        #[arg(long)]
        all: bool,
        #[command(flatten)]
        engine: EngineArgs,
        #[command(flatten)]
        read: files::ReadArgs,
    },
    /// Lay files out canonically (aligned `=`, units and citations; comments kept).
    #[command(
        after_help = "Prints the formatted text unless --write or --check is given; a file with a syntax error is left alone (exit 2).\n\nExample:\n  syz fmt --check examples/\n  syz fmt --write examples/veyra.syz"
    )]
    Fmt {
        /// Files, or folders searched for *.syz files.
        #[arg(required = true)]
        paths: Vec<PathBuf>,
        /// Rewrite the files in place.
        #[arg(long, conflicts_with = "check")]
        write: bool,
        /// List the files that would change and exit with status 1 if there are any.
        #[arg(long)]
        check: bool,
        #[command(flatten)]
        read: files::ReadArgs,
    },
    /// Run the language server on stdin and stdout (for editors; see docs/editors.md).
    #[command(after_help = "Example (an editor runs this for you):\n  syz lsp --stdio")]
    Lsp {
        /// Accepted for editors that pass it; stdio is the only transport.
        #[arg(long)]
        stdio: bool,
    },
    /// Draw a diagram as SVG: mass-radius, rv or transit.
    #[command(
        after_help = "Example:\n  syz plot mass-radius examples/ -o mass-radius.svg\n  syz plot transit examples/veyra.syz b -o transit.svg"
    )]
    Plot {
        #[command(subcommand)]
        plot: plot_cmd::Plot,
        #[command(flatten)]
        engine: EngineArgs,
        #[command(flatten)]
        read: files::ReadArgs,
    },
    /// Print a shell completion script (bash, zsh, fish, elvish or powershell).
    #[command(
        after_help = "Example:\n  syz completions bash > ~/.local/share/bash-completion/completions/syz\n  syz completions fish > ~/.config/fish/completions/syz.fish"
    )]
    Completions { shell: clap_complete::Shell },
    /// Import tables (CSV, VOTable) into one .syz file per system, under a mapping file (the
    /// table of declared values `syz eval --table sources` writes needs none).
    #[command(
        after_help = "Exit status: 0 everything imported; 1 some cells were not imported (each is named); 2 a table, the mapping or the output folder could not be used.\n\nExample:\n  syz import examples/tables/survey.csv --mapping examples/tables/survey.toml -o imported/\n\nThe mapping file: docs/import.md."
    )]
    Import {
        #[command(flatten)]
        args: import_cmd::Args,
    },
    /// List a planet's upcoming mid-transit times with their uncertainty.
    Ephemeris {
        #[command(flatten)]
        args: ephemeris_cmd::Args,
        #[command(flatten)]
        engine: EngineArgs,
        #[command(flatten)]
        read: files::ReadArgs,
    },
}

fn main() -> ExitCode {
    let cli = Cli::parse();
    let code = match cli.command {
        Command::Check {
            paths,
            format,
            deny_warnings,
            engine,
            read,
        } => check_cmd::run(&paths, format, deny_warnings, &engine.flags(), read),
        Command::Eval {
            paths,
            format,
            table,
            compact,
            engine,
            read,
        } => eval_cmd::run(&paths, format, table, compact, &engine.flags(), read),
        Command::Explain {
            file,
            target,
            system,
            engine,
            read,
        } => explain_cmd::run(&file, &target, system.as_deref(), &engine.flags(), read),
        Command::Diff {
            paths,
            against,
            format,
            threshold,
            all,
            engine,
            read,
        } => diff_cmd::run(
            &diff_cmd::Request {
                paths: &paths,
                against: against.as_deref(),
                format,
                options: syzygy::diff::DiffOptions { threshold, all },
            },
            &engine.flags(),
            read,
        ),
        Command::Fmt {
            paths,
            write,
            check,
            read,
        } => fmt_cmd::run(
            &paths,
            read,
            match (write, check) {
                (true, _) => fmt_cmd::Mode::Write,
                (_, true) => fmt_cmd::Mode::Check,
                _ => fmt_cmd::Mode::Print,
            },
        ),
        Command::Lsp { stdio: _ } => syzygy_lsp::run_stdio(),
        Command::Completions { shell } => {
            use clap::CommandFactory;
            let mut cmd = Cli::command();
            clap_complete::generate(shell, &mut cmd, "syz", &mut output::stdout());
            0
        }
        Command::Plot { plot, engine, read } => plot_cmd::run(&plot, &engine.flags(), read),
        Command::Import { args } => import_cmd::run(&args),
        Command::Ephemeris { args, engine, read } => {
            ephemeris_cmd::run(&args, &engine.flags(), read)
        }
    };
    // Buffered output is written now, so a failure to write it is reported.
    let _ = output::stdout().flush();
    ExitCode::from(code)
}
