//! The model curves (radial velocity, transit): the median of the draws over its band, with
//! the inputs and assumptions as a caption, each said once.

use super::svg::{wrap, Anchor, Frame, Scale, Svg, CAPTION_FONT, CAPTION_STEP, INK};
use super::{linear_range, AXIS_LIMIT};
use syzygy::plots::labels::Rect;
use syzygy::plots::{ticks, ModelCurve};

const WIDTH: f64 = 1100.0;
const PLOT: Rect = Rect {
    x0: 118.0,
    y0: 84.0,
    x1: 1070.0,
    y1: 520.0,
};
const BLUE: &str = "#1f5fa8";

pub(super) fn draw(
    c: &ModelCurve,
    title: &str,
    x_desc: &str,
    y_desc: &str,
    model: Option<&str>,
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
    let scale = b
        .high
        .iter()
        .chain(&b.low)
        .fold(0.0f64, |m, v| m.max(v.abs()));
    let has_band = b
        .high
        .iter()
        .zip(&b.low)
        .any(|(h, l)| (h - l).abs() > 1e-9 * scale);
    let mut lines: Vec<String> = Vec::new();
    lines.push(format!("Inputs: {}.", c.inputs.join("; ")));
    if let Some(m) = model {
        lines.push(format!("Model: {m}."));
    }
    lines.extend(
        c.assumptions
            .iter()
            .filter(|a| has_band || !a.starts_with("band:"))
            .map(|a| format!("Assumed: {a}.")),
    );
    let mut left_out: Vec<String> = c.left_out.clone();
    if clamped {
        left_out.push(format!(
            "model values beyond ±{AXIS_LIMIT:e} are drawn at the edge of the axis"
        ));
    }
    for l in &left_out {
        eprintln!("note: {l}");
    }
    lines.extend(left_out.iter().map(|l| format!("Left out: {l}.")));
    let caption: Vec<String> = lines
        .iter()
        .flat_map(|l| wrap(l, CAPTION_FONT, WIDTH - 40.0))
        .collect();
    let caption_top = PLOT.y1 + 72.0;
    let height = caption_top + CAPTION_STEP * caption.len() as f64 + 12.0;

    let frame = Frame {
        area: PLOT,
        x: Scale {
            lo: x0,
            hi: x1,
            log: false,
            from: PLOT.x0,
            to: PLOT.x1,
        },
        y: Scale {
            lo: y.start,
            hi: y.end,
            log: false,
            from: PLOT.y1,
            to: PLOT.y0,
        },
    };
    let mut svg = Svg::new();
    svg.text(
        WIDTH / 2.0,
        14.0,
        22.0,
        Anchor::Middle,
        title,
        INK,
        false,
        false,
    );
    frame.draw(
        &mut svg,
        &ticks::linear(x0, x1, 10),
        &ticks::linear(y.start, y.end, 8),
        x_desc,
        y_desc,
    );
    let mut poly: Vec<(f64, f64)> =
        b.x.iter()
            .zip(&b.high)
            .map(|(x, v)| frame.at((*x, on_axis(*v))))
            .collect();
    poly.extend(
        b.x.iter()
            .zip(&b.low)
            .rev()
            .map(|(x, v)| frame.at((*x, on_axis(*v)))),
    );
    svg.polygon(&poly, BLUE, 0.2);
    let median: Vec<(f64, f64)> =
        b.x.iter()
            .zip(&b.median)
            .map(|(x, v)| frame.at((*x, on_axis(*v))))
            .collect();
    svg.polyline(&median, BLUE, 2.2, "", 1.0);
    // The legend: one row between the title and the plot. A band of no width (the largest
    // signal a limit allows is one curve) gets no entry.
    let top = 50.0;
    let mut x = PLOT.x0;
    if has_band {
        svg.polygon(
            &[
                (x, top + 2.0),
                (x + 26.0, top + 2.0),
                (x + 26.0, top + 12.0),
                (x, top + 12.0),
            ],
            BLUE,
            0.2,
        );
        let r = svg.text(
            x + 34.0,
            top,
            13.0,
            Anchor::Start,
            "1σ band (16th–84th percentile of draws)",
            INK,
            false,
            false,
        );
        x = r.x1 + 28.0;
    }
    svg.polyline(&[(x, top + 7.0), (x + 26.0, top + 7.0)], BLUE, 2.2, "", 1.0);
    svg.text(
        x + 34.0,
        top,
        13.0,
        Anchor::Start,
        &match &c.upper_limit {
            Some(limit) => format!("largest signal {limit} allows ({})", c.label),
            None => format!("model of {} (median of draws)", c.label),
        },
        INK,
        false,
        false,
    );
    svg.caption(&caption, caption_top);
    Ok(svg.finish(WIDTH, height))
}
