//! `syz plot`: SVG diagrams drawn from what the core computes ([`syzygy::plots`]). The only
//! file written is the one `-o` names.

use crate::files;
use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};
use std::path::{Path, PathBuf};
use syzygy::constants::{M_EARTH, R_EARTH};
use syzygy::lightcurve::LimbDarkening;
use syzygy::plots::{self, ModelCurve};
use syzygy::settings::Layer;
use syzygy::solar_system;

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
        /// Quadratic limb-darkening coefficients `u1,u2`. Default: u1 = 0.40, u2 = 0.25,
        /// typical of a Sun-like dwarf in a broad optical band (shown on the plot).
        #[arg(long, value_name = "U1,U2")]
        limb_darkening: Option<String>,
        #[arg(long)]
        system: Option<String>,
    },
}

fn err<E: std::fmt::Display>(e: E) -> String {
    e.to_string()
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
    let result = match plot {
        Plot::MassRadius { paths, .. } => mass_radius(paths, flags, read),
        Plot::Rv {
            file, body, system, ..
        } => one_planet(file, body, system.as_deref(), flags, read).and_then(|(a, si, bi)| {
            let c = plots::rv_curve(&a, si, bi)?;
            Ok(model_svg(
                &c,
                &format!("Radial velocity of {}'s star", c.label),
                "time from mid-transit (inferior conjunction) [days]",
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
            .map_err(Stop::from)
            .and_then(|ld| {
                let (a, si, bi) = one_planet(file, body, system.as_deref(), flags, read)?;
                let (c, used) = plots::transit_curve(&a, si, bi, ld)?;
                Ok(model_svg(
                    &c,
                    &format!("Transit of {}", c.label),
                    "time from mid-transit [hours]",
                    "relative flux",
                    Some(used),
                )?)
            }),
    };
    match result {
        Ok(svg) => match std::fs::write(out, svg) {
            Ok(()) => {
                eprintln!("wrote {}", out.display());
                0
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
    Ok(Some(LimbDarkening {
        u1: num(a)?,
        u2: num(b)?,
    }))
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

const PALETTE: [RGBColor; 4] = [
    RGBColor(120, 120, 130),
    RGBColor(166, 97, 26),
    RGBColor(200, 60, 50),
    RGBColor(40, 110, 190),
];
const DATA: RGBColor = RGBColor(20, 20, 20);
const FONT: &str = "sans-serif";

/// Break a long line into lines of at most `width` characters at spaces.
fn wrap(text: &str, width: usize) -> Vec<String> {
    let mut out = Vec::new();
    let mut line = String::new();
    for word in text.split(' ') {
        if !line.is_empty() && line.chars().count() + word.chars().count() + 1 > width {
            out.push(std::mem::take(&mut line));
        }
        if !line.is_empty() {
            line.push(' ');
        }
        line.push_str(word);
    }
    if !line.is_empty() {
        out.push(line);
    }
    out
}

fn notes(area: &DrawingArea<SVGBackend, Shift>, lines: &[String]) -> Result<(), String> {
    let mut y = 4;
    for l in lines.iter().flat_map(|l| wrap(l, 150)) {
        area.draw(&Text::new(l, (20, y), (FONT, 12).into_font().color(&BLACK)))
            .map_err(err)?;
        y += 15;
    }
    Ok(())
}

fn mass_radius(paths: &[PathBuf], flags: &Layer, read: files::ReadArgs) -> Result<String, Stop> {
    let loaded = files::load(paths, read);
    files::report_io_errors(&loaded.errors);
    let analyses = files::analyze_all(&loaded.db, flags).map_err(Stop::settings)?;
    let (points, mut left_out) = plots::mass_radius_points(&analyses);
    // Only what fits the diagram's widest axes is drawn; the rest is said.
    let (points, beyond): (Vec<_>, Vec<_>) = points
        .into_iter()
        .partition(|p| MASS_AXIS.contains(&p.mass) && RADIUS_AXIS.contains(&p.radius));
    let num = |v: f64| syzygy::format::number(v);
    let spans = format!(
        "it spans {}-{} Earth masses and {}-{} Earth radii",
        num(MASS_AXIS.start),
        num(MASS_AXIS.end),
        num(RADIUS_AXIS.start),
        num(RADIUS_AXIS.end)
    );
    let beyond: Vec<String> = beyond
        .iter()
        .map(|p| {
            let (m, r) = (num(p.mass), num(p.radius));
            format!(
                "{}: {m} Earth masses, {r} Earth radii: beyond the diagram ({spans})",
                p.label
            )
        })
        .collect();
    left_out.extend(beyond.iter().cloned());
    for l in &left_out {
        eprintln!("note: not plotted: {l}");
    }
    if points.is_empty() {
        return Err(Stop::from(
            "no planet with both a mass and a radius to plot",
        ));
    }
    // The axes cover every point and error bar, within the widest axes (log scales, so the
    // bounds must stay positive and finite).
    let finite_max = |v: f64, at_least: f64, axis: &std::ops::Range<f64>| {
        if v.is_finite() {
            at_least.max(v).min(axis.end)
        } else {
            axis.end
        }
    };
    let mut x_max: f64 = 1000.0;
    let mut y_max: f64 = 25.0;
    let (mut x_min, mut y_min) = (0.03f64, 0.3f64);
    for p in &points {
        x_max = finite_max(2.0 * (p.mass + p.mass_above), x_max, &MASS_AXIS);
        y_max = finite_max(1.5 * (p.radius + p.radius_above), y_max, &RADIUS_AXIS);
        x_min = x_min.min(0.5 * p.mass).max(MASS_AXIS.start);
        y_min = y_min.min(0.5 * p.radius).max(RADIUS_AXIS.start);
    }
    let mut lines = vec![
        "Curves: Seager, Kuchner, Hier-Majumder & Militzer 2007, ApJ 669, 1279; Zeng, Sasselov & Jacobsen 2016, ApJ 819, 127. Faint: extrapolated beyond the fitted mass range.".to_string(),
    ];
    lines.extend(
        points
            .iter()
            .map(|p| format!("{}: {}", p.label, p.position)),
    );
    // Planets with a mass and a radius that are not drawn are said on the figure too.
    lines.extend(beyond.iter().map(|l| format!("not plotted: {l}")));
    // Error bars: both ends inside the axes; a bar cut at an edge is said.
    let bars: Vec<(Bar, Bar)> = points
        .iter()
        .map(|p| {
            (
                Bar::new(p.mass, p.mass_below, p.mass_above, x_min..x_max),
                Bar::new(p.radius, p.radius_below, p.radius_above, y_min..y_max),
            )
        })
        .collect();
    for (p, (m, r)) in points.iter().zip(&bars) {
        for (cut, what) in [(m.cut, "mass"), (r.cut, "radius")] {
            if cut {
                let l = format!(
                    "{}: the {what} error bar reaches beyond the axis and is cut at its edge",
                    p.label
                );
                eprintln!("note: {l}");
                lines.push(l);
            }
        }
    }
    let note_h = 10 + 15 * lines.iter().map(|l| wrap(l, 150).len()).sum::<usize>() as u32;
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, (1000, 680 + note_h)).into_drawing_area();
        root.fill(&WHITE).map_err(err)?;
        let (top, bottom) = root.split_vertically(680);
        let mut chart = ChartBuilder::on(&top)
            .caption("Mass–radius diagram", (FONT, 26))
            .margin(18)
            .x_label_area_size(55)
            .y_label_area_size(65)
            .build_cartesian_2d((x_min..x_max).log_scale(), (y_min..y_max).log_scale())
            .map_err(err)?;
        chart
            .configure_mesh()
            .x_desc("planet mass [Earth masses, M⊕]")
            .y_desc("planet radius [Earth radii, R⊕]")
            .axis_desc_style((FONT, 18))
            .label_style((FONT, 14))
            .light_line_style(WHITE)
            .bold_line_style(RGBColor(225, 225, 225))
            .x_label_formatter(&|v| syzygy::format::number(*v))
            .y_label_formatter(&|v| syzygy::format::number(*v))
            .draw()
            .map_err(err)?;
        // Composition curves: strong inside the fitted mass range, faint outside.
        let upto = 60f64.min(x_max);
        for (trace, color) in syzygy::plots::composition_curves(x_min, upto, 200)
            .into_iter()
            .zip(PALETTE)
        {
            let pts = &trace.points;
            let fitted: Vec<(f64, f64)> = pts.iter().filter(|p| p.2).map(|p| (p.0, p.1)).collect();
            let (lo, _) = trace.curve.mass_range_earth();
            let (before, after): (Vec<_>, Vec<_>) = pts
                .iter()
                .filter(|p| !p.2)
                .map(|p| (p.0, p.1))
                .partition(|p| p.0 < lo);
            for side in [before, after] {
                chart
                    .draw_series(LineSeries::new(side, color.mix(0.35).stroke_width(1)))
                    .map_err(err)?;
            }
            chart
                .draw_series(LineSeries::new(fitted.clone(), color.stroke_width(2)))
                .map_err(err)?
                .label(trace.legend)
                .legend(move |(x, y)| {
                    PathElement::new(vec![(x, y), (x + 22, y)], color.stroke_width(2))
                });
            if let Some(&(m, r)) = fitted.last() {
                chart
                    .draw_series(std::iter::once(Text::new(
                        trace.short,
                        (m * 1.08, r),
                        (FONT, 13).into_font().color(&color),
                    )))
                    .map_err(err)?;
            }
        }
        // Solar System planets.
        let grey = RGBColor(90, 90, 90);
        chart
            .draw_series(solar_system::PLANETS.iter().map(|p| {
                Circle::new(
                    (p.mass_kg / M_EARTH, p.mean_radius_m / R_EARTH),
                    5,
                    grey.stroke_width(2),
                )
            }))
            .map_err(err)?
            .label("Solar System planets (NASA GSFC planetary fact sheets)")
            .legend(move |(x, y)| Circle::new((x + 11, y), 5, grey.stroke_width(2)));
        chart
            .draw_series(solar_system::PLANETS.iter().map(|p| {
                // Uranus and Venus sit just left of Neptune and Earth: label them on the left.
                let left = matches!(p.name, "Uranus" | "Venus");
                let (m, r) = (p.mass_kg / M_EARTH, p.mean_radius_m / R_EARTH);
                let font = (FONT, 12).into_font().color(&grey);
                if left {
                    Text::new(
                        p.name.to_string(),
                        (m / 1.12, r),
                        font.pos(Pos::new(HPos::Right, VPos::Center)),
                    )
                } else {
                    Text::new(p.name.to_string(), (m * 1.12, r * 1.04), font)
                }
            }))
            .map_err(err)?;
        // The planets from the files, with 1-sigma error bars.
        for (p, (m, r)) in points.iter().zip(&bars) {
            let bars = [
                vec![(m.low, p.radius), (m.high, p.radius)],
                vec![(p.mass, r.low), (p.mass, r.high)],
            ];
            chart
                .draw_series(
                    bars.into_iter()
                        .map(|b| PathElement::new(b, DATA.stroke_width(1))),
                )
                .map_err(err)?;
            chart
                .draw_series(std::iter::once(Text::new(
                    p.label.clone(),
                    (p.mass * 1.1, p.radius * 1.07),
                    (FONT, 13).into_font().color(&DATA),
                )))
                .map_err(err)?;
        }
        chart
            .draw_series(
                points
                    .iter()
                    .map(|p| Circle::new((p.mass, p.radius), 5, DATA.filled())),
            )
            .map_err(err)?
            .label("planets in the files (1σ error bars)")
            .legend(move |(x, y)| Circle::new((x + 11, y), 5, DATA.filled()));
        chart
            .configure_series_labels()
            .position(SeriesLabelPosition::UpperLeft)
            .background_style(WHITE.mix(0.9))
            .border_style(RGBColor(180, 180, 180))
            .label_font((FONT, 13))
            .draw()
            .map_err(err)?;
        notes(&bottom, &lines)?;
        root.present().map_err(err)?;
    }
    Ok(svg)
}

/// A 1-sigma error bar on one axis: its ends within the axis, and whether the upper end had
/// to be cut at the axis's edge.
struct Bar {
    low: f64,
    high: f64,
    cut: bool,
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
            cut: !(hi.is_finite() && hi <= axis.end),
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

fn model_svg(
    c: &ModelCurve,
    title: &str,
    x_desc: &str,
    y_desc: &str,
    ld: Option<LimbDarkening>,
) -> Result<String, String> {
    let b = &c.band;
    let x0 = b.x.first().copied().unwrap_or(0.0);
    let x1 = b.x.last().copied().unwrap_or(1.0);
    if !(x0.is_finite() && x1.is_finite() && x0 < x1 && (x1 - x0).is_finite()) {
        return Err(format!(
            "the time axis would run from {x0} to {x1}; check the period"
        ));
    }
    let values = b.low.iter().chain(&b.median).chain(&b.high).copied();
    let (y, clamped) = linear_range(values).ok_or("the model has no finite value to plot")?;
    let on_axis = |v: f64| v.clamp(y.start, y.end);
    let mut lines: Vec<String> = Vec::new();
    lines.push(format!("inputs: {}", c.inputs.join("; ")));
    if let Some(l) = ld {
        lines.push(format!(
            "limb darkening (quadratic, Mandel & Agol 2002): u1 = {}, u2 = {}",
            l.u1, l.u2
        ));
    }
    lines.extend(c.assumptions.iter().map(|a| format!("assumed: {a}")));
    let mut left_out: Vec<String> = c.left_out.clone();
    if clamped {
        left_out.push(format!(
            "model values beyond ±{AXIS_LIMIT:e} are drawn at the edge of the axis"
        ));
    }
    for l in &left_out {
        eprintln!("note: {l}");
    }
    lines.extend(left_out.iter().map(|l| format!("left out: {l}")));
    let note_rows: usize = lines.iter().map(|l| wrap(l, 150).len()).sum();
    let note_h = 10 + 15 * note_rows as u32;
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, (1000, 600 + note_h)).into_drawing_area();
        root.fill(&WHITE).map_err(err)?;
        let (top, bottom) = root.split_vertically(600);
        let mut chart = ChartBuilder::on(&top)
            .caption(title, (FONT, 24))
            .margin(18)
            .x_label_area_size(55)
            .y_label_area_size(85)
            .build_cartesian_2d(x0..x1, y.clone())
            .map_err(err)?;
        chart
            .configure_mesh()
            .x_desc(x_desc)
            .y_desc(y_desc)
            .axis_desc_style((FONT, 18))
            .label_style((FONT, 14))
            .light_line_style(RGBColor(235, 235, 235))
            .bold_line_style(RGBColor(215, 215, 215))
            .y_label_formatter(&|v| syzygy::format::number(*v))
            .draw()
            .map_err(err)?;
        let blue = RGBColor(40, 110, 190);
        let mut poly: Vec<(f64, f64)> =
            b.x.iter()
                .copied()
                .zip(b.high.iter().copied().map(on_axis))
                .collect();
        poly.extend(
            b.x.iter()
                .copied()
                .zip(b.low.iter().copied().map(on_axis))
                .rev(),
        );
        chart
            .draw_series(std::iter::once(Polygon::new(poly, blue.mix(0.22).filled())))
            .map_err(err)?
            .label("1σ band (16th–84th percentile of draws)")
            .legend(move |(x, y)| {
                Rectangle::new([(x, y - 5), (x + 22, y + 5)], blue.mix(0.22).filled())
            });
        chart
            .draw_series(LineSeries::new(
                b.x.iter()
                    .copied()
                    .zip(b.median.iter().copied().map(on_axis)),
                blue.stroke_width(2),
            ))
            .map_err(err)?
            .label(format!("model of {} (median of draws)", c.label))
            .legend(move |(x, y)| {
                PathElement::new(vec![(x, y), (x + 22, y)], blue.stroke_width(2))
            });
        chart
            .configure_series_labels()
            .position(SeriesLabelPosition::LowerRight)
            .background_style(WHITE.mix(0.9))
            .border_style(RGBColor(180, 180, 180))
            .label_font((FONT, 13))
            .draw()
            .map_err(err)?;
        notes(&bottom, &lines)?;
        root.present().map_err(err)?;
    }
    Ok(svg)
}
