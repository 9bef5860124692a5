//! The mass–radius diagram: planets of the files, one marker (shape and colour) per system,
//! among the composition curves and the Solar System planets. Labels go where they overlap
//! nothing ([`syzygy::plots::labels`]); what does not fit on the figure is in the text
//! output, which also holds each planet's position among the curves in words.

use super::svg::{wrap, Anchor, Frame, Scale, Shape, Svg, CAPTION_FONT, CAPTION_STEP, INK};
use super::{Bar, Stop, MASS_AXIS, RADIUS_AXIS};
use crate::files;
use std::path::PathBuf;
use syzygy::composition::Curve;
use syzygy::constants::{M_EARTH, R_EARTH};
use syzygy::model::Form;
use syzygy::plots::labels::{self, text_size, Rect, Request};
use syzygy::plots::{self, PlanetPoint};
use syzygy::settings::Layer;
use syzygy::solar_system;

const WIDTH: f64 = 1200.0;
const PLOT: Rect = Rect {
    x0: 96.0,
    y0: 58.0,
    x1: 826.0,
    y1: 628.0,
};
const LEGEND_X: f64 = 852.0;
const LEGEND_WIDTH: f64 = WIDTH - LEGEND_X - 14.0;
const LABEL_FONT: f64 = 12.0;
const LEGEND_FONT: f64 = 13.0;
const MARKER: f64 = 5.0;

/// Marker colours for systems, chosen to stay apart for the common colour-vision
/// deficiencies (after Okabe & Ito's set, common practice); yellow is left out, too pale on
/// white.
const SYSTEM_COLOURS: [&str; 7] = [
    "#0072b2", "#d55e00", "#009e73", "#cc79a7", "#e69f00", "#56b4e9", "#000000",
];
/// How many systems get a marker of their own; the rest share a small grey dot.
const STYLED_SYSTEMS: usize = 20;
const OTHER_COLOUR: &str = "#9a9a9a";

/// The style of the composition curves: a colour and a dash pattern each, so a curve is
/// told apart in grey print and by readers who do not see its colour.
fn curve_style(c: &Curve) -> (&'static str, &'static str) {
    match c {
        Curve::PureIron => ("#2f4858", "9 4"),
        Curve::Rocky { .. } => ("#6a4c93", ""),
        Curve::PureSilicate => ("#7d8c2a", "9 3 2 3"),
        Curve::PureWaterIce => ("#1f8a9e", "2 3"),
    }
}

/// Marker shape and colour of the `group`-th system.
fn system_style(group: usize) -> (Shape, &'static str, f64) {
    if group >= STYLED_SYSTEMS {
        return (Shape::Circle, OTHER_COLOUR, 3.0);
    }
    let shape = Shape::ALL
        .get(group % Shape::ALL.len())
        .copied()
        .unwrap_or(Shape::Circle);
    let colour = SYSTEM_COLOURS
        .get(group % SYSTEM_COLOURS.len())
        .copied()
        .unwrap_or(INK);
    (shape, colour, MARKER)
}

fn colour_name(c: &str) -> &'static str {
    match c {
        "#0072b2" => "blue",
        "#d55e00" => "vermilion",
        "#009e73" => "green",
        "#cc79a7" => "pink",
        "#e69f00" => "orange",
        "#56b4e9" => "sky-blue",
        "#000000" => "black",
        _ => "grey",
    }
}

pub(super) fn draw(
    paths: &[PathBuf],
    flags: &Layer,
    read: files::ReadArgs,
) -> Result<(String, bool, usize), Stop> {
    let loaded = files::load(paths, read);
    files::report_io_errors(&loaded.errors);
    let analyses = files::analyze_all(&loaded, flags).map_err(Stop::settings)?;
    let errors = analyses.iter().map(syzygy::Analysis::error_count).sum();
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
    left_out.extend(beyond.iter().map(|p| {
        format!(
            "{}: {} Earth masses, {} Earth radii: beyond the diagram ({spans})",
            p.label,
            num(p.mass),
            num(p.radius)
        )
    }));
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
        // Down to the lower end of each error bar that stays positive (a logarithmic axis
        // cannot show one that does not: that bar is cut at the edge, and said to be).
        let low = |v: f64, below: f64| {
            let end = v - below;
            if end > 0.0 {
                0.8 * end
            } else {
                0.5 * v
            }
        };
        x_min = x_min.min(low(p.mass, p.mass_below)).max(MASS_AXIS.start);
        y_min = y_min
            .min(low(p.radius, p.radius_below))
            .max(RADIUS_AXIS.start);
    }
    let bars: Vec<(Bar, Bar)> = points
        .iter()
        .map(|p| {
            (
                Bar::new(p.mass, p.mass_below, p.mass_above, x_min..x_max),
                Bar::new(p.radius, p.radius_below, p.radius_above, y_min..y_max),
            )
        })
        .collect();
    let mut cut = 0;
    for (p, (m, r)) in points.iter().zip(&bars) {
        let sides = [
            (m, "mass", p.mass - p.mass_below),
            (r, "radius", p.radius - p.radius_below),
        ];
        for (bar, what, low_end) in sides {
            // The lower end is cut where it is not positive (a logarithmic axis cannot show
            // it); else where it falls below the widest axis, as the upper end can exceed it.
            let below_zero = bar.cut_low && low_end <= 0.0;
            let beyond = bar.cut_high || (bar.cut_low && !below_zero);
            if beyond || below_zero {
                cut += 1;
                let reach = match (beyond, below_zero) {
                    (true, true) => "reaches beyond the axis, and below zero,",
                    (true, false) => "reaches beyond the axis",
                    _ => "reaches below zero, which a logarithmic axis cannot show,",
                };
                eprintln!(
                    "note: {}: the {what} error bar {reach} and is cut at its edge",
                    p.label
                );
            }
        }
    }
    let frame = Frame {
        area: PLOT,
        x: Scale {
            lo: x_min,
            hi: x_max,
            log: true,
            from: PLOT.x0,
            to: PLOT.x1,
        },
        y: Scale {
            lo: y_min,
            hi: y_max,
            log: true,
            from: PLOT.y1,
            to: PLOT.y0,
        },
    };
    let mut body = Svg::new();
    let xt = plots::ticks::logarithmic(x_min, x_max, PLOT.x1 - PLOT.x0, 14.0, false);
    let yt = plots::ticks::logarithmic(y_min, y_max, PLOT.y1 - PLOT.y0, 14.0, true);
    frame.draw(
        &mut body,
        &xt,
        &yt,
        "planet mass [Earth masses, M⊕]",
        "planet radius [Earth radii, R⊕]",
    );

    // What the labels must keep clear of, and the labels, in order: curve names and Solar
    // System names first (they are few and always wanted), then the planets.
    let mut obstacles: Vec<Rect> = Vec::new();
    // Drawn lines no label may be crossed by: the curves and the error bars.
    let mut lines: Vec<labels::Segment> = Vec::new();
    let mut requests: Vec<Request> = Vec::new();
    let mut texts: Vec<(String, &'static str, f64)> = Vec::new();
    let inside = |(x, y): (f64, f64)| Rect::around(x, y, 0.0).inside(&PLOT);

    // Composition curves: strong inside the fitted mass range, faint outside.
    let upto = 60f64.min(x_max);
    let traces = plots::composition_curves(x_min, upto, 200);
    for trace in &traces {
        let (colour, dash) = curve_style(&trace.curve);
        let (lo, _) = trace.curve.mass_range_earth();
        let clip = |pts: Vec<(f64, f64)>| -> Vec<(f64, f64)> {
            pts.into_iter()
                .filter(|p| p.1 >= y_min && p.1 <= y_max)
                .map(|p| frame.at(p))
                .collect()
        };
        let fitted = clip(
            trace
                .points
                .iter()
                .filter(|p| p.2)
                .map(|p| (p.0, p.1))
                .collect(),
        );
        let (before, after): (Vec<_>, Vec<_>) = trace
            .points
            .iter()
            .filter(|p| !p.2)
            .map(|p| (p.0, p.1))
            .partition(|p| p.0 < lo);
        for side in [before, after] {
            let side = clip(side);
            lines.extend(side.iter().copied().zip(side.iter().copied().skip(1)));
            body.polyline(&side, colour, 1.4, dash, 0.4);
        }
        lines.extend(fitted.iter().copied().zip(fitted.iter().copied().skip(1)));
        body.polyline(&fitted, colour, 2.2, dash, 1.0);
        if let Some(&(x, y)) = fitted.last() {
            let (w, h) = text_size(trace.short, LABEL_FONT);
            requests.push(Request {
                x,
                y,
                radius: 2.0,
                width: w,
                height: h,
            });
            texts.push((trace.short.to_string(), colour, LABEL_FONT));
        }
    }
    // Solar System planets: open grey circles.
    let grey = "#707070";
    for p in solar_system::PLANETS {
        let at = frame.at((p.mass_kg / M_EARTH, p.mean_radius_m / R_EARTH));
        if !inside(at) {
            continue;
        }
        body.marker(Shape::Circle, at.0, at.1, 4.5, "none", grey);
        obstacles.push(Rect::around(at.0, at.1, 5.0));
        let (w, h) = text_size(p.name, LABEL_FONT);
        requests.push(Request {
            x: at.0,
            y: at.1,
            radius: 5.0,
            width: w,
            height: h,
        });
        texts.push((p.name.to_string(), grey, LABEL_FONT));
    }
    let fixed = requests.len();
    // The planets of the files, with 1-sigma error bars.
    let at: Vec<(f64, f64)> = points
        .iter()
        .map(|p| frame.at((p.mass, p.radius)))
        .collect();
    let mut arrows: Vec<Rect> = Vec::new();
    for ((p, (m, r)), &(x, y)) in points.iter().zip(&bars).zip(&at) {
        let (_, colour, _) = system_style(p.group);
        let (mx0, mx1) = (frame.x.at(m.low), frame.x.at(m.high));
        let (ry0, ry1) = (frame.y.at(r.low), frame.y.at(r.high));
        // A limit is an arrow from the point the way the value may lie (28 px), not a bar.
        let mut arrow = |body: &mut Svg, limit: Form, horizontal: bool| {
            let sign = if limit == Form::UpperLimit { -1.0 } else { 1.0 };
            let (dx, dy) = if horizontal {
                (sign, 0.0)
            } else {
                (0.0, -sign)
            };
            let tip = (x + 28.0 * dx, y + 28.0 * dy);
            body.polyline(&[(x, y), tip], colour, 1.3, "", 0.9);
            // Labels keep clear of the arrow.
            arrows.push(Rect {
                x0: x.min(tip.0) - 4.0,
                y0: y.min(tip.1) - 4.0,
                x1: x.max(tip.0) + 4.0,
                y1: y.max(tip.1) + 4.0,
            });
            let back = (tip.0 - 6.0 * dx, tip.1 - 6.0 * dy);
            let side = (4.0 * dy, 4.0 * dx);
            body.polyline(
                &[
                    (back.0 + side.0, back.1 + side.1),
                    tip,
                    (back.0 - side.0, back.1 - side.1),
                ],
                colour,
                1.3,
                "",
                0.9,
            );
        };
        match p.mass_limit {
            Some(limit) => arrow(&mut body, limit, true),
            None => {
                lines.push(((mx0, y), (mx1, y)));
                body.polyline(&[(mx0, y), (mx1, y)], colour, 1.1, "", 0.7);
            }
        }
        match p.radius_limit {
            Some(limit) => arrow(&mut body, limit, false),
            None => {
                lines.push(((x, ry0), (x, ry1)));
                body.polyline(&[(x, ry0), (x, ry1)], colour, 1.1, "", 0.7);
            }
        }
    }
    obstacles.extend(arrows);
    for (p, &(x, y)) in points.iter().zip(&at) {
        let (shape, colour, size) = system_style(p.group);
        body.marker(shape, x, y, size, colour, "#ffffff");
        obstacles.push(Rect::around(x, y, size + 0.5));
        let (w, h) = text_size(&p.label, LABEL_FONT);
        requests.push(Request {
            x,
            y,
            radius: size + 0.5,
            width: w,
            height: h,
        });
        texts.push((p.label.clone(), INK, LABEL_FONT));
    }
    let placed = labels::place(PLOT, &obstacles, &lines, &requests, fixed);
    let mut unlabelled: Vec<&str> = Vec::new();
    for (i, (spot, (text, colour, size))) in placed.iter().zip(&texts).enumerate() {
        match spot {
            Some(s) => {
                if let Some((a, b)) = s.leader {
                    body.polyline(&[a, b], "#8a8a8a", 0.8, "", 1.0);
                }
                body.text(
                    s.rect.x0,
                    s.rect.y0,
                    *size,
                    Anchor::Start,
                    text,
                    colour,
                    false,
                    true,
                );
            }
            None if i >= fixed => unlabelled.push(text),
            None => {}
        }
    }

    // The legend, right of the plot.
    let mut y = PLOT.y0;
    let heading = |svg: &mut Svg, y: &mut f64, t: &str| {
        svg.text(LEGEND_X, *y, 14.0, Anchor::Start, t, INK, true, false);
        *y += 22.0;
    };
    let text_x = LEGEND_X + 34.0;
    let line_width = LEGEND_WIDTH - 34.0;
    let entry = |svg: &mut Svg, y: &mut f64, t: &str| {
        for l in wrap(t, LEGEND_FONT, line_width) {
            svg.text(
                text_x,
                *y,
                LEGEND_FONT,
                Anchor::Start,
                &l,
                INK,
                false,
                false,
            );
            *y += 16.0;
        }
        *y += 4.0;
    };
    // Curves and the Solar System: two columns under the plot, one line per entry (each
    // fits in a column, so the legend's words stay whole).
    let mut key_y = PLOT.y1 + 62.0;
    let key_x = |i: usize| {
        if i.is_multiple_of(2) {
            20.0
        } else {
            WIDTH / 2.0 + 10.0
        }
    };
    for (i, trace) in traces.iter().enumerate() {
        let (colour, dash) = curve_style(&trace.curve);
        let (x, mid) = (key_x(i), key_y + LEGEND_FONT / 2.0);
        body.polyline(&[(x, mid), (x + 26.0, mid)], colour, 2.2, dash, 1.0);
        body.text(
            x + 34.0,
            key_y,
            LEGEND_FONT,
            Anchor::Start,
            &trace.legend,
            INK,
            false,
            false,
        );
        if !i.is_multiple_of(2) {
            key_y += 20.0;
        }
    }
    let x = key_x(traces.len());
    body.marker(
        Shape::Circle,
        x + 13.0,
        key_y + LEGEND_FONT / 2.0,
        4.5,
        "none",
        grey,
    );
    body.text(
        x + 34.0,
        key_y,
        LEGEND_FONT,
        Anchor::Start,
        "Solar System planets (NASA GSFC planetary fact sheets)",
        INK,
        false,
        false,
    );
    key_y += 20.0;
    let mut systems: Vec<(usize, &str, usize)> = Vec::new();
    for p in &points {
        match systems.last_mut() {
            Some((g, _, count)) if *g == p.group => *count += 1,
            _ => systems.push((p.group, &p.system, 1)),
        }
    }
    heading(&mut body, &mut y, "planets in the files (1σ error bars)");
    let shown_systems = systems.iter().take(STYLED_SYSTEMS);
    for (g, name, _) in shown_systems {
        let (shape, colour, size) = system_style(*g);
        body.marker(
            shape,
            LEGEND_X + 13.0,
            y + LEGEND_FONT / 2.0,
            size,
            colour,
            "#ffffff",
        );
        let name = if name.chars().count() > 40 {
            format!("{}…", name.chars().take(39).collect::<String>())
        } else {
            name.to_string()
        };
        entry(&mut body, &mut y, &name);
    }
    if systems.len() > STYLED_SYSTEMS {
        let rest = systems.len() - STYLED_SYSTEMS;
        body.marker(
            Shape::Circle,
            LEGEND_X + 13.0,
            y + LEGEND_FONT / 2.0,
            3.0,
            OTHER_COLOUR,
            "#ffffff",
        );
        entry(
            &mut body,
            &mut y,
            &format!("{rest} more systems (named in the text output)"),
        );
    }

    // The caption: what the figure assumes, and counts of what it could not show.
    let mut caption = vec![
        "Curves: Seager, Kuchner, Hier-Majumder & Militzer 2007, ApJ 669, 1279; Zeng, Sasselov & Jacobsen 2016, ApJ 819, 127. Faint: extrapolated beyond the fitted mass range.".to_string(),
    ];
    let mut counts = vec![
        "Each planet's position among the curves, in words: the command's text output.".to_string(),
    ];
    if points
        .iter()
        .any(|p| p.mass_limit.is_some() || p.radius_limit.is_some())
    {
        caption.push("Arrows: a mass or radius that is only a limit, drawn at the limit and pointing the way the value may lie.".to_string());
    }
    let plural = |n: usize, one: &str, many: &str| {
        if n == 1 {
            format!("1 {one}")
        } else {
            format!("{n} {many}")
        }
    };
    if !unlabelled.is_empty() {
        counts.push(format!(
            "{} for lack of room (named in the text output).",
            plural(
                unlabelled.len(),
                "label is not drawn",
                "labels are not drawn"
            )
        ));
    }
    if cut > 0 {
        counts.push(format!(
            "{} cut at the edge of the diagram (reaching beyond its axis, or below zero).",
            plural(cut, "error bar is", "error bars are")
        ));
    }
    if !beyond.is_empty() {
        counts.push(format!(
            "{} beyond the diagram, not drawn (named in the text output).",
            plural(beyond.len(), "planet lies", "planets lie")
        ));
    }
    if errors > 0 {
        counts.push(format!(
            "The input has {}: what {} hide is not drawn (see syz check).",
            plural(errors, "error", "errors"),
            if errors == 1 { "it" } else { "they" }
        ));
    }
    caption.push(counts.join(" "));
    let caption_lines: Vec<String> = caption
        .iter()
        .flat_map(|c| wrap(c, CAPTION_FONT, WIDTH - 40.0))
        .collect();
    let caption_top = key_y + 10.0;
    let height = (caption_top + CAPTION_STEP * caption_lines.len() as f64 + 12.0).max(y + 10.0);

    body.text(
        WIDTH / 2.0,
        14.0,
        24.0,
        Anchor::Middle,
        "Mass–radius diagram",
        INK,
        false,
        false,
    );
    body.caption(&caption_lines, caption_top);
    let svg_text = body.finish(WIDTH, height);

    // The text output: every planet drawn, its marker and where it sits.
    print_planets(&points, &systems, &unlabelled);
    if !unlabelled.is_empty() {
        eprintln!(
            "note: no room on the figure for the labels of {}; their markers are drawn",
            unlabelled.join(", ")
        );
    }
    Ok((svg_text, !loaded.errors.is_empty(), errors))
}

fn print_planets(points: &[PlanetPoint], systems: &[(usize, &str, usize)], unlabelled: &[&str]) {
    println!(
        "Mass–radius diagram: {} of {}",
        plural_s(points.len(), "planet"),
        plural_s(systems.len(), "system")
    );
    for (g, name, _) in systems {
        let (shape, colour, _) = system_style(*g);
        let marker = if *g >= STYLED_SYSTEMS {
            "small grey dot".to_string()
        } else {
            format!("{} {}", colour_name(colour), shape.name())
        };
        println!("{name} ({marker}):");
        for p in points.iter().filter(|p| p.group == *g) {
            let note = if unlabelled.contains(&p.label.as_str()) {
                " [label not drawn: no room]"
            } else {
                ""
            };
            println!("  {}{note}: {}", p.label, p.position);
        }
    }
}

fn plural_s(n: usize, what: &str) -> String {
    if n == 1 {
        format!("1 {what}")
    } else {
        format!("{n} {what}s")
    }
}
