//! `syz plot`: SVG diagrams drawn from what the core computes ([`syzygy::plots`]). The only
//! file written is the one `-o` names.

mod mass_radius;
mod model;
mod svg;

use crate::files;
use std::path::{Path, PathBuf};
use syzygy::lightcurve::LimbDarkening;
use syzygy::plots;
use syzygy::settings::Layer;

#[derive(clap::Subcommand)]
pub enum Plot {
    /// Planets of one or many files on a log–log mass–radius diagram, with composition
    /// curves and the Solar System planets for reference.
    #[command(after_help = "Example:\n  syz plot mass-radius examples/ -o mass-radius.svg")]
    MassRadius {
        #[arg(required = true)]
        paths: Vec<PathBuf>,
        /// The SVG file to write.
        #[arg(short = 'o', long = "output", required = true)]
        output: PathBuf,
    },
    /// The star's model radial-velocity curve over one orbit, with its uncertainty band.
    #[command(after_help = "Example:\n  syz plot rv examples/veyra.syz b -o veyra-b-rv.svg")]
    Rv {
        file: PathBuf,
        body: String,
        #[arg(short = 'o', long = "output", required = true)]
        output: PathBuf,
        #[arg(long)]
        system: Option<String>,
    },
    /// The model transit light curve with quadratic limb darkening, with its band.
    #[command(
        after_help = "Example:\n  syz plot transit examples/veyra.syz b -o veyra-b-transit.svg --limb-darkening 0.45,0.2"
    )]
    Transit {
        file: PathBuf,
        body: String,
        #[arg(short = 'o', long = "output", required = true)]
        output: PathBuf,
        /// Quadratic limb-darkening coefficients `u1,u2` for your star and band. Default:
        /// none (a uniform disc, as the engine assumes when it reads a depth as k^2).
        #[arg(long, value_name = "U1,U2")]
        limb_darkening: Option<String>,
        #[arg(long)]
        system: Option<String>,
    },
}

pub fn run(plot: &Plot, flags: &Layer, read: files::ReadArgs) -> u8 {
    let out = match plot {
        Plot::MassRadius { output, .. }
        | Plot::Rv { output, .. }
        | Plot::Transit { output, .. } => output,
    };
    if !out
        .extension()
        .is_some_and(|e| e.eq_ignore_ascii_case("svg"))
    {
        eprintln!(
            "syz: {}: only SVG output is supported; name the file *.svg",
            out.display()
        );
        return 2;
    }
    // Files that could not be read: the diagram is drawn from the rest, and the exit status
    // is 2, as `check` and `eval` give for the same folder.
    let mut unread = false;
    // Errors in the files: what they hide is not drawn, so the drawing is said to be
    // incomplete (exit 0 all the same, as for `explain` and `ephemeris`: `check` is the
    // command that fails on them).
    let mut input_errors = 0;
    let result = match plot {
        Plot::MassRadius { paths, .. } => {
            mass_radius::draw(paths, flags, read).map(|(svg, io_errors, errors)| {
                unread = io_errors;
                input_errors = errors;
                svg
            })
        }
        Plot::Rv {
            file, body, system, ..
        } => one_planet(file, body, system.as_deref(), flags, read).and_then(|(a, si, bi)| {
            input_errors = a.error_count();
            let c = plots::rv_curve(&a, si, bi)?;
            // Inferior conjunction is a mid-transit only for a planet known to transit.
            let transits = a
                .model
                .systems
                .get(si)
                .and_then(|s| s.bodies.get(bi))
                .is_some_and(|b| b.declares_transit_quantity());
            let axis = if transits {
                "time from mid-transit (inferior conjunction) [days]"
            } else {
                "time from inferior conjunction [days]"
            };
            Ok(model::draw(
                &c,
                &format!("Radial velocity of {}'s star", c.label),
                axis,
                "stellar radial velocity [m/s]",
                None,
            )?)
        }),
        Plot::Transit {
            file,
            body,
            system,
            limb_darkening,
            ..
        } => parse_ld(limb_darkening.as_deref())
            .map_err(|message| Stop { code: 2, message })
            .and_then(|ld| {
                let (a, si, bi) = one_planet(file, body, system.as_deref(), flags, read)?;
                input_errors = a.error_count();
                let (c, _) = plots::transit_curve(&a, si, bi, ld)?;
                // The coefficients are among the assumptions, given or none.
                let model = if ld.is_some() {
                    "quadratic limb darkening (Mandel & Agol 2002)"
                } else {
                    "a uniform stellar disc (Mandel & Agol 2002, without limb darkening)"
                };
                Ok(model::draw(
                    &c,
                    &format!("Transit of {}", c.label),
                    "time from mid-transit [hours]",
                    "relative flux",
                    Some(model),
                )?)
            }),
    };
    let set: Vec<&str> = flags.what_if.iter().map(|w| w.written.as_str()).collect();
    let set = (!set.is_empty()).then(|| {
        format!(
            "drawn with values set on the command line (--set), not the files': {}",
            set.join("; ")
        )
    });
    match result.map(|svg| with_description(svg, set.as_deref())) {
        Ok(svg) => match std::fs::write(out, svg) {
            Ok(()) => {
                if let Some(words) = &set {
                    eprintln!("note: {words}");
                }
                eprintln!("wrote {}", out.display());
                if input_errors > 0 {
                    eprintln!(
                        "note: the input has {input_errors} error{}: what they hide is not drawn; run `syz check` on it",
                        if input_errors == 1 { "" } else { "s" }
                    );
                }
                if unread {
                    2
                } else {
                    0
                }
            }
            Err(e) => {
                eprintln!("syz: {}: {e}", out.display());
                2
            }
        },
        Err(stop) => {
            eprintln!("syz: {}", stop.message);
            stop.code
        }
    }
}

/// The drawing with `words` (if any) as its description, first inside the `<svg>` element,
/// so that a what-if drawing says so wherever it goes.
fn with_description(svg: String, words: Option<&str>) -> String {
    let Some(words) = words else { return svg };
    let Some(end) = svg
        .find("<svg")
        .and_then(|s| svg.get(s..)?.find('>').map(|e| s + e + 1))
    else {
        return svg;
    };
    let escaped = words
        .replace('&', "&amp;")
        .replace('<', "&lt;")
        .replace('>', "&gt;");
    let (head, tail) = svg.split_at(end);
    format!("{head}\n<desc>{escaped}</desc>{tail}")
}

/// Why no plot was drawn, with the exit status: 2 for settings that stop every command (a
/// bad project file), 1 for a plot that cannot be drawn from what the file declares.
struct Stop {
    code: u8,
    message: String,
}

impl Stop {
    fn settings(message: String) -> Stop {
        Stop {
            code: 2,
            message: format!("error: {message}"),
        }
    }
}

impl From<String> for Stop {
    fn from(message: String) -> Stop {
        Stop { code: 1, message }
    }
}

impl From<&str> for Stop {
    fn from(message: &str) -> Stop {
        Stop::from(message.to_string())
    }
}

fn parse_ld(text: Option<&str>) -> Result<Option<LimbDarkening>, String> {
    let Some(t) = text else { return Ok(None) };
    let parts: Vec<&str> = t.split(',').map(str::trim).collect();
    let [a, b] = parts.as_slice() else {
        return Err(format!(
            "--limb-darkening takes two numbers u1,u2 (e.g. 0.45,0.2), not '{t}'"
        ));
    };
    let num = |s: &str| {
        s.parse::<f64>()
            .map_err(|_| format!("--limb-darkening: '{s}' is not a number"))
    };
    let ld = LimbDarkening {
        u1: num(a)?,
        u2: num(b)?,
    };
    // An unphysical pair is the option's fault (exit 2), said before any file is read.
    if !ld.is_physical() {
        return Err(format!(
            "--limb-darkening {}, {}: unphysical (it needs u1 >= 0, u1 + u2 <= 1, u1 + 2 u2 >= 0)",
            syzygy::format::sig(ld.u1, 6),
            syzygy::format::sig(ld.u2, 6)
        ));
    }
    Ok(Some(ld))
}

fn one_planet(
    file: &Path,
    body: &str,
    system: Option<&str>,
    flags: &Layer,
    read: files::ReadArgs,
) -> Result<(syzygy::Analysis, usize, usize), Stop> {
    let one = files::one_body(file, system, body, flags, read).map_err(|(code, message)| Stop {
        code: code.max(1),
        message,
    })?;
    Ok((one.analysis, one.system, one.body))
}

/// A 1-sigma error bar on one axis: its ends within the axis, and whether an end had to be
/// cut at the axis's edge (the upper end past it, or the lower end below it: `5 ± 20` on a
/// logarithmic axis reaches below zero, and was drawn to the edge without a word).
struct Bar {
    low: f64,
    high: f64,
    /// The upper end cut (past the axis), and the lower end (below it).
    cut_high: bool,
    cut_low: bool,
}

impl Bar {
    fn new(value: f64, below: f64, above: f64, axis: std::ops::Range<f64>) -> Bar {
        let (lo, hi) = (value - below, value + above);
        Bar {
            low: if lo.is_finite() {
                lo.max(axis.start)
            } else {
                axis.start
            },
            high: if hi.is_finite() {
                hi.min(axis.end)
            } else {
                axis.end
            },
            cut_high: !(hi.is_finite() && hi <= axis.end),
            cut_low: !(lo.is_finite() && lo >= axis.start),
        }
    }
}

/// The widest mass axis of the diagram, in Earth masses (about 3 solar masses at the top:
/// no planet is near).
const MASS_AXIS: std::ops::Range<f64> = 1e-6..1e6;
/// The widest radius axis, in Earth radii (about 90 solar radii at the top).
const RADIUS_AXIS: std::ops::Range<f64> = 1e-3..1e4;

/// The largest magnitude a linear axis reaches; values beyond are drawn at its edge. Past it,
/// the differences of plotted values could overflow, and plotters' tick generation never
/// ends on an infinite range.
const AXIS_LIMIT: f64 = 1e300;

/// A linear axis range covering the finite `values` (each clamped to ±[`AXIS_LIMIT`]) with
/// 12% margins, and whether any value was clamped; `None` when none is finite.
fn linear_range(values: impl Iterator<Item = f64>) -> Option<(std::ops::Range<f64>, bool)> {
    let (mut lo, mut hi, mut clamped) = (f64::INFINITY, f64::NEG_INFINITY, false);
    for v in values.filter(|v| v.is_finite()) {
        let c = v.clamp(-AXIS_LIMIT, AXIS_LIMIT);
        clamped |= c != v;
        lo = lo.min(c);
        hi = hi.max(c);
    }
    if lo > hi {
        return None;
    }
    // At least a millionth of the values' size, so the margins survive rounding.
    let pad = ((hi - lo) * 0.12).max(1e-6 * hi.abs().max(lo.abs()).max(1.0));
    Some(((lo - pad)..(hi + pad), clamped))
}
