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

mod config_file;
mod csv_out;
mod ephemeris_cmd;
mod files;
mod fmt_cmd;
mod json_out;
mod output;
mod plot_cmd;
mod render;
mod sarif;

use clap::{Parser, Subcommand, ValueEnum};
use std::io::Write;
use std::path::PathBuf;
use std::process::ExitCode;
use syzygy::diagnostic::{Rule, Severity, SeverityOverride};
use syzygy::settings::Layer;
use syzygy::{Options, Propagation, Settings};

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
                  and physics inconsistencies."
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
    Human,
    Json,
    /// A table, one row per body (see docs/csv-output.md).
    Csv,
}

#[derive(Clone, Copy, PartialEq, Eq, ValueEnum)]
pub(crate) enum CheckFormat {
    Human,
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
    /// Monte Carlo sample count [default: 10000, or as syzygy.toml says].
    #[arg(long, value_parser = clap::value_parser!(u32).range(1..=10_000_000))]
    samples: Option<u32>,
    /// Seed of the Monte Carlo generator (the same seed gives the same numbers) [default: 1398364761].
    #[arg(long)]
    seed: Option<u64>,
    /// Declared and derived values further apart than this many combined sigma are reported [default: 3].
    #[arg(long, value_parser = parse_sigma)]
    sigma: Option<f64>,
    /// Report this rule as an error (repeatable; see docs/rules.md for the ids).
    #[arg(long, value_name = "RULE", value_parser = parse_rule)]
    deny: Vec<Rule>,
    /// Report this rule as a warning (repeatable).
    #[arg(long, value_name = "RULE", value_parser = parse_rule)]
    warn: Vec<Rule>,
    /// Do not report this rule (repeatable).
    #[arg(long, value_name = "RULE", value_parser = parse_rule)]
    allow: Vec<Rule>,
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
    Rule::from_id(s).ok_or_else(|| {
        let ids: Vec<&str> = Rule::ALL.iter().map(|r| r.id()).collect();
        format!("unknown rule '{s}'; the rules are: {}", ids.join(", "))
    })
}

impl EngineArgs {
    /// The settings given explicitly, to lay over a project file.
    fn flags(&self) -> Layer {
        Layer {
            propagation: self.propagation.map(|p| match p {
                PropagationArg::MonteCarlo => Propagation::MonteCarlo,
                PropagationArg::Linear => Propagation::Linear,
            }),
            samples: self.samples.map(|n| n as usize),
            seed: self.seed,
            consistency_sigma: self.sigma,
            overrides: self.overrides(),
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
        after_help = "Example:\n  syz check examples/\n  syz check --format json catalogue/ > report.json\n  syz check --format sarif catalogue/ > syzygy.sarif"
    )]
    Check {
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
        after_help = "Example:\n  syz eval examples/veyra.syz\n  syz eval --format json --propagation linear examples/\n  syz eval --format csv --propagation linear catalogue/ > table.csv"
    )]
    Eval {
        #[arg(required = true)]
        paths: Vec<PathBuf>,
        #[arg(long, value_enum, default_value = "human")]
        format: EvalFormat,
        #[command(flatten)]
        engine: EngineArgs,
        #[command(flatten)]
        read: files::ReadArgs,
    },
    /// Show how one quantity was derived, down to the measurements, with its error budget.
    #[command(after_help = "Example:\n  syz explain examples/veyra.syz b.density")]
    Explain {
        file: PathBuf,
        /// BODY.QUANTITY, for example `b.density` or `veyra.luminosity`.
        target: String,
        /// The system, when several systems of the file have a body of that name.
        #[arg(long)]
        system: Option<String>,
        #[command(flatten)]
        engine: EngineArgs,
        #[command(flatten)]
        read: files::ReadArgs,
    },
    /// Lay files out canonically (aligned `=`, units and citations; comments kept).
    #[command(
        after_help = "Prints the formatted text unless --write or --check is given.\nExample:\n  syz fmt --check examples/\n  syz fmt --write examples/veyra.syz"
    )]
    Fmt {
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
        } => check(&paths, format, deny_warnings, &engine.flags(), read),
        Command::Eval {
            paths,
            format,
            engine,
            read,
        } => eval(&paths, format, &engine.flags(), read),
        Command::Explain {
            file,
            target,
            system,
            engine,
            read,
        } => explain(&file, &target, system.as_deref(), &engine.flags(), read),
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
        Command::Ephemeris { args, engine, read } => {
            ephemeris_cmd::run(&args, &engine.flags(), read)
        }
    };
    // Buffered output is written now, so a failure to write it is reported.
    let _ = output::stdout().flush();
    ExitCode::from(code)
}

fn check(
    paths: &[PathBuf],
    format: CheckFormat,
    deny_warnings: bool,
    flags: &Layer,
    read: files::ReadArgs,
) -> u8 {
    let Some((loaded, settings)) = load_with_settings(paths, flags, read) else {
        return 2;
    };
    let db = &loaded.db;
    let mut out = output::stdout();
    // Streamed like `eval`: each file's diagnostics are rendered (for people) or turned into
    // JSON or SARIF results on the worker that analysed it, and the analysis is dropped.
    let color = render::use_color();
    let mut counts = [0usize; 3];
    let mut rule_counts = vec![0usize; Rule::ALL.len()];
    let mut json_diags = Vec::new();
    let mut sarif_results = Vec::new();
    let mut not_shown = NotShown::default();
    let mut checked = 0usize;
    files::for_each_analysed(
        db,
        &settings,
        |a| {
            let kinds: Vec<(usize, Rule)> = a
                .diagnostics
                .iter()
                .map(|d| (d.severity as usize, d.rule))
                .collect();
            let mut text = String::new();
            let (mut json, mut sarif) = (Vec::new(), Vec::new());
            let (shown, left_out) = syzygy::shown::split(&a.diagnostics);
            match format {
                CheckFormat::Human => text = rendered_diagnostics(&a, db, color),
                CheckFormat::Json => json = syzygy::report::diagnostics_json(&a, db).0,
                CheckFormat::Sarif => {
                    let places = syzygy::source::Places::new(db, a.file);
                    sarif = shown.iter().map(|d| sarif::result(d, &places)).collect();
                }
            }
            (kinds, text, json, sarif, (a.file, left_out))
        },
        |(kinds, text, json, sarif, (file, left_out))| {
            checked += 1;
            not_shown.add(db, file, left_out);
            for (severity, rule) in kinds {
                if let Some(c) = counts.get_mut(severity) {
                    *c += 1;
                }
                if let Some(c) = Rule::ALL
                    .iter()
                    .position(|r| *r == rule)
                    .and_then(|i| rule_counts.get_mut(i))
                {
                    *c += 1;
                }
            }
            let _ = out.write_all(text.as_bytes());
            json_diags.extend(json);
            sarif_results.extend(sarif);
        },
    );
    let (notes, warnings, errors) = (counts[0], counts[1], counts[2]);
    // Counts per rule id, in the catalogue's order (the order of docs/rules.md).
    let per_rule: Vec<(&'static str, usize)> = Rule::ALL
        .iter()
        .zip(&rule_counts)
        .filter(|(_, n)| **n > 0)
        .map(|(r, n)| (r.id(), *n))
        .collect();
    match format {
        CheckFormat::Sarif => {
            let doc = sarif::log(&sarif_results, &loaded.errors, &not_shown.lines());
            let _ = writeln!(out, "{}", json_out::pretty(&doc));
        }
        CheckFormat::Json => {
            let doc = syzygy::report::json::CheckDocument {
                version: syzygy::report::JSON_VERSION,
                files: checked,
                diagnostics: &json_diags,
                diagnostics_not_shown: &not_shown.0,
                io_errors: &loaded.errors,
                summary: syzygy::report::json::Summary {
                    errors,
                    warnings,
                    notes,
                    rules: syzygy::report::json::Pairs(per_rule.clone()),
                },
            };
            let _ = writeln!(out, "{}", json_out::pretty(&doc));
        }
        CheckFormat::Human => {
            let _ = writeln!(
                out,
                "checked {} file{}: {} error{}, {} warning{}, {} note{}",
                checked,
                plural(checked),
                errors,
                plural(errors),
                warnings,
                plural(warnings),
                notes,
                plural(notes)
            );
            if !per_rule.is_empty() {
                let words: Vec<String> = per_rule
                    .iter()
                    .map(|(id, n)| format!("{id}: {n}"))
                    .collect();
                let _ = writeln!(out, "by rule: {}", words.join(", "));
            }
        }
    }
    files::report_io_errors(&loaded.errors);
    if !loaded.errors.is_empty() {
        2
    } else if errors > 0 || (deny_warnings && warnings > 0) {
        1
    } else {
        0
    }
}

/// Read the files named and find each one's settings (its `syzygy.toml` under the flags);
/// `None`, after saying why, when a project file is bad.
fn load_with_settings(
    paths: &[PathBuf],
    flags: &Layer,
    read: files::ReadArgs,
) -> Option<(files::Loaded, Vec<Settings>)> {
    let loaded = files::load(paths, read);
    match config_file::resolve(&loaded.db, flags) {
        Ok(settings) => Some((loaded, settings)),
        Err(e) => {
            files::report_io_errors(&loaded.errors);
            eprintln!("syz: error: {e}");
            None
        }
    }
}

/// Analyse every file and write `body` of each to `out` in file order, as it comes; the
/// files' diagnostics, rendered for people, go to standard error after all of it. Returns
/// whether any file has errors, and the first failure to make or write a body (later bodies
/// are not written after one).
fn stream_per_file(
    db: &syzygy::source::MemoryDb,
    settings: &[Settings],
    out: &mut impl Write,
    color: bool,
    body: impl Fn(&syzygy::Analysis) -> std::io::Result<Vec<u8>> + Sync,
) -> (bool, Option<std::io::Error>) {
    let mut errors = false;
    let mut failure = None;
    let mut rendered = String::new();
    files::for_each_analysed(
        db,
        settings,
        |a| {
            (
                a.has_errors(),
                body(&a),
                rendered_diagnostics(&a, db, color),
            )
        },
        |(bad, bytes, diags)| {
            errors |= bad;
            rendered.push_str(&diags);
            if failure.is_none() {
                failure = bytes.and_then(|b| out.write_all(&b)).err();
            }
        },
    );
    if failure.is_none() {
        failure = out.flush().err();
    }
    let _ = std::io::stderr().lock().write_all(rendered.as_bytes());
    (errors, failure)
}

/// The diagnostics shown of one file (`syzygy::shown`), rendered for people, then a line
/// counting the rest.
fn rendered_diagnostics(
    a: &syzygy::Analysis,
    db: &syzygy::source::MemoryDb,
    color: bool,
) -> String {
    use syzygy::source::SourceDb;
    let (shown, left_out) = syzygy::shown::split(&a.diagnostics);
    if shown.is_empty() {
        return String::new();
    }
    let index = syzygy::source::LineIndex::new(db.text(a.file));
    let mut out: String = shown
        .iter()
        .map(|d| render::diagnostic(db, &index, d, color))
        .collect();
    if left_out > 0 {
        out.push_str(&format!(
            "note: {}: {}\n",
            db.name(a.file),
            syzygy::shown::rest_words(left_out)
        ));
    }
    out
}

/// The files whose diagnostics were not all shown, with how many were left out.
#[derive(Default)]
struct NotShown(Vec<syzygy::report::json::NotShown>);

impl NotShown {
    fn add(&mut self, db: &syzygy::source::MemoryDb, file: syzygy::source::FileId, count: usize) {
        use syzygy::source::SourceDb;
        if count > 0 {
            self.0.push(syzygy::report::json::NotShown {
                file: db.name(file).to_string(),
                count,
            });
        }
    }

    fn lines(&self) -> Vec<String> {
        self.0
            .iter()
            .map(|n| format!("{}: {}", n.file, syzygy::shown::rest_words(n.count)))
            .collect()
    }
}

/// How the uncertainties shown were propagated, in words.
fn propagation_words(options: &Options) -> String {
    match options.propagation {
        Propagation::MonteCarlo => format!(
            "Monte Carlo, {} samples (seed {}); derived values are sample medians with 16th-84th percentile ranges",
            options.samples, options.seed
        ),
        Propagation::Linear => {
            "first order (linear) from the measurements' standard uncertainties".to_string()
        }
    }
}

fn plural(n: usize) -> &'static str {
    if n == 1 {
        ""
    } else {
        "s"
    }
}

fn eval(paths: &[PathBuf], format: EvalFormat, flags: &Layer, read: files::ReadArgs) -> u8 {
    let Some((loaded, settings)) = load_with_settings(paths, flags, read) else {
        return 2;
    };
    let options = settings.first().map_or_else(
        || Settings::resolve(None, flags).options,
        |s| s.options.clone(),
    );
    let db = &loaded.db;
    let mut out = output::stdout();
    let mut errors = false;
    // Every format is streamed: files are analysed in parallel batches, each analysis is
    // turned into its output on the worker and dropped, and the outputs are written in file
    // order, so memory does not grow with the number of files.
    match format {
        EvalFormat::Json => {
            let head = syzygy::report::json::EvalHead {
                version: syzygy::report::JSON_VERSION,
                options: syzygy::report::json::Options::new(&options),
            };
            let mut doc = json_out::Document::start(&mut out, &head);
            let mut diags = Vec::new();
            let mut not_shown = NotShown::default();
            files::for_each_analysed(
                db,
                &settings,
                |a| {
                    let systems: Vec<String> = syzygy::report::systems_json(&a, db)
                        .iter()
                        .map(json_out::pretty)
                        .collect();
                    let diagnostics = syzygy::report::diagnostics_json(&a, db);
                    (a.has_errors(), systems, diagnostics, a.file)
                },
                |(bad, systems, (d, left_out), file)| {
                    errors |= bad;
                    diags.extend(d);
                    not_shown.add(db, file, left_out);
                    for s in &systems {
                        doc.system(s);
                    }
                },
            );
            let tail = syzygy::report::json::EvalTail {
                diagnostics: &diags,
                diagnostics_not_shown: &not_shown.0,
                io_errors: &loaded.errors,
            };
            if let Err(e) = doc.finish(&tail) {
                // A reader that stops early (`| head`) is not an error of ours.
                if e.kind() != std::io::ErrorKind::BrokenPipe {
                    eprintln!("syz: error: writing the output failed: {e}");
                    return 2;
                }
            }
        }
        EvalFormat::Csv => {
            let header = csv_out::header()
                .map_err(std::io::Error::other)
                .and_then(|h| out.write_all(&h))
                .err();
            let (bad, failure) =
                stream_per_file(db, &settings, &mut out, render::stderr_color(), |a| {
                    csv_out::rows(a, db).map_err(std::io::Error::other)
                });
            errors |= bad;
            // A reader that stops early (`| head`) is not an error of ours.
            let failure = header.or(failure);
            if let Some(e) = failure.filter(|e| e.kind() != std::io::ErrorKind::BrokenPipe) {
                eprintln!("syz: error: writing the table failed: {e}");
                return 2;
            }
        }
        EvalFormat::Human => {
            let color = render::use_color() && render::stderr_color();
            let (bad, _) = stream_per_file(db, &settings, &mut out, color, |a| {
                Ok(syzygy::report::eval_text(a, db).into_bytes())
            });
            errors |= bad;
        }
    }
    files::report_io_errors(&loaded.errors);
    if !loaded.errors.is_empty() {
        2
    } else if errors {
        1
    } else {
        0
    }
}

fn explain(
    file: &std::path::Path,
    target: &str,
    system: Option<&str>,
    flags: &Layer,
    read: files::ReadArgs,
) -> u8 {
    let Some((body, qty)) = target.split_once('.') else {
        eprintln!("syz: expected BODY.QUANTITY, such as b.density, found '{target}'");
        return 2;
    };
    let loaded = files::load(&[file.to_path_buf()], read);
    if !loaded.errors.is_empty() {
        files::report_io_errors(&loaded.errors);
        return 2;
    }
    let settings = match config_file::resolve(&loaded.db, flags) {
        Ok(s) => s,
        Err(e) => {
            eprintln!("syz: error: {e}");
            return 2;
        }
    };
    let analyses = files::analyze_each(&loaded.db, &settings);
    let (Some(a), Some(Settings { options, .. })) = (analyses.first(), settings.first()) else {
        return 2;
    };
    let Some((si, bi)) = syzygy::report::find_body(a, system, body) else {
        eprintln!("syz: no body '{body}' in {}", file.display());
        return 2;
    };
    let kind = a
        .model
        .systems
        .get(si)
        .and_then(|s| s.bodies.get(bi))
        .map(|b| b.kind);
    let Some(def) = kind.and_then(|k| syzygy::quantities::find(k, qty)) else {
        eprintln!("syz: '{qty}' is not a quantity of '{body}'");
        return 2;
    };
    match syzygy::report::explain_text(a, si, (bi, def.qty)) {
        Some(text) => {
            print!("{text}");
            println!("\nuncertainties: {}", propagation_words(options));
            let bad = a
                .diagnostics
                .iter()
                .filter(|d| d.severity == Severity::Error)
                .count();
            if bad > 0 {
                eprintln!("note: the file has {bad} error(s); run `syz check` on it");
            }
            0
        }
        None => {
            eprintln!(
                "syz: {body}.{} is neither declared nor derivable from what the file declares",
                def.name
            );
            1
        }
    }
}
