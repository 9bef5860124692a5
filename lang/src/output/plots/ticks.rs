//! Axis ticks and their labels: steps of 1, 2 or 5 times a power of ten on linear axes,
//! written with the decimals the step needs and no more; on logarithmic axes every power of
//! ten, with 2 and 5 (or every integer multiple) labelled where the axis has room.

use super::labels::text_size;

/// One tick of an axis; minor ticks have no label.
#[derive(Debug, Clone, PartialEq)]
pub struct Tick {
    pub value: f64,
    pub label: Option<String>,
}

/// Gap kept between neighbouring tick labels, in pixels.
const LABEL_GAP: f64 = 10.0;

/// A tick label: `−` (U+2212, as typeset) for negatives, `0` never signed.
fn signed(text: String) -> String {
    match text.strip_prefix('-') {
        Some(rest) if rest.chars().any(|c| c.is_ascii_digit() && c != '0') => {
            format!("\u{2212}{rest}")
        }
        Some(rest) => rest.to_string(),
        None => text,
    }
}

/// The step of 1, 2 or 5 × 10^k that gives at most `max_count` ticks over `span`.
fn nice_step(span: f64, max_count: usize) -> f64 {
    let raw = span / max_count.max(1) as f64;
    let k = raw.log10().floor();
    let base = 10f64.powf(k);
    [1.0, 2.0, 5.0, 10.0]
        .into_iter()
        .map(|m| m * base)
        .find(|s| *s >= raw * (1.0 - 1e-9))
        .unwrap_or(10.0 * base)
}

/// Ticks of a linear axis from `lo` to `hi`, at most `max_count` of them, every one
/// labelled with the same number of decimals.
pub fn linear(lo: f64, hi: f64, max_count: usize) -> Vec<Tick> {
    let span = hi - lo;
    if !(lo.is_finite() && hi.is_finite() && span > 0.0 && span.is_finite()) {
        return Vec::new();
    }
    let step = nice_step(span, max_count);
    let decimals = (-step.log10().floor()).clamp(0.0, 12.0) as usize;
    let first = (lo / step).ceil();
    let last = (hi / step).floor();
    if !(first.is_finite() && last.is_finite()) || last - first > 1000.0 {
        return Vec::new();
    }
    let mut ticks = Vec::new();
    let mut i = first;
    while i <= last {
        let v = i * step;
        ticks.push(Tick {
            value: v,
            label: Some(signed(format!("{v:.decimals$}"))),
        });
        i += 1.0;
    }
    ticks
}

/// Ticks of a logarithmic axis from `lo` to `hi` (both positive) drawn over `pixels`, with
/// labels of `font_px`: powers of ten always labelled (every other one, or fewer, if even
/// they do not fit), 2 and 5 labelled if their labels fit side by side, then every integer
/// multiple; unlabelled minor ticks at the other integer multiples.
pub fn logarithmic(lo: f64, hi: f64, pixels: f64, font_px: f64, vertical: bool) -> Vec<Tick> {
    if !(lo > 0.0 && hi > lo && hi.is_finite() && pixels > 0.0) {
        return Vec::new();
    }
    let decades = hi.log10() - lo.log10();
    let per_decade = pixels / decades;
    let (k0, k1) = (lo.log10().floor() as i32, hi.log10().ceil() as i32);
    if k1 - k0 > 400 {
        return Vec::new();
    }
    let label_of = |v: f64| crate::format::number(v);
    // The room a label needs along the axis: its width, or its height on a vertical axis.
    let room = |v: f64| {
        let (w, h) = text_size(&label_of(v), font_px);
        if vertical {
            h + LABEL_GAP / 2.0
        } else {
            w + LABEL_GAP
        }
    };
    let widest = |ms: &[f64]| {
        (k0..=k1)
            .flat_map(|k| ms.iter().map(move |m| m * 10f64.powi(k)))
            .filter(|v| *v >= lo && *v <= hi)
            .map(room)
            .fold(0.0, f64::max)
    };
    let px = |a: f64, b: f64| per_decade * (b / a).log10();
    // The smallest gap between neighbouring labelled ticks of each choice.
    let choices: [(&[f64], f64); 3] = [
        (
            &[1.0, 2.0, 3.0, 4.0, 5.0, 6.0, 7.0, 8.0, 9.0],
            px(9.0, 10.0),
        ),
        (&[1.0, 2.0, 5.0], px(1.0, 2.0).min(px(5.0, 10.0))),
        (&[1.0], per_decade),
    ];
    let labelled: &[f64] = choices
        .iter()
        .find(|(ms, gap)| widest(ms) <= *gap)
        .map_or(&[1.0], |(ms, _)| ms);
    // When even the powers of ten crowd, label every n-th.
    let every = if labelled.len() == 1 {
        (widest(&[1.0]) / per_decade).ceil().max(1.0) as i32
    } else {
        1
    };
    let mut ticks = Vec::new();
    for k in k0..=k1 {
        for m in 1..=9 {
            let v = crate::format::number(f64::from(m) * 10f64.powi(k))
                .parse::<f64>()
                .unwrap_or(f64::from(m) * 10f64.powi(k));
            if v < lo * (1.0 - 1e-9) || v > hi * (1.0 + 1e-9) {
                continue;
            }
            let shown = labelled.contains(&f64::from(m)) && (m != 1 || k.rem_euclid(every) == 0);
            ticks.push(Tick {
                value: v,
                label: shown.then(|| label_of(v)),
            });
        }
    }
    ticks
}

#[cfg(test)]
mod tests {
    use super::*;

    fn labels(t: &[Tick]) -> Vec<&str> {
        t.iter().filter_map(|t| t.label.as_deref()).collect()
    }

    #[test]
    fn linear_ticks_carry_only_the_decimals_their_step_needs() {
        assert_eq!(
            labels(&linear(-70.0, 70.0, 8)),
            [
                "\u{2212}60",
                "\u{2212}40",
                "\u{2212}20",
                "0",
                "20",
                "40",
                "60"
            ]
        );
        assert_eq!(
            labels(&linear(-1.9, 1.9, 8)),
            [
                "\u{2212}1.5",
                "\u{2212}1.0",
                "\u{2212}0.5",
                "0.0",
                "0.5",
                "1.0",
                "1.5"
            ]
        );
        assert_eq!(
            labels(&linear(0.9855, 1.0015, 8)),
            ["0.986", "0.988", "0.990", "0.992", "0.994", "0.996", "0.998", "1.000"]
        );
        assert!(linear(1.0, 1.0, 5).is_empty());
        assert!(linear(0.0, f64::INFINITY, 5).is_empty());
    }

    #[test]
    fn a_short_log_axis_labels_1_2_5_and_a_long_one_only_decades() {
        // 0.3 to 25 Earth radii on 600 px: room for 1-2-5.
        let t = logarithmic(0.3, 25.0, 600.0, 14.0, true);
        assert_eq!(labels(&t), ["0.5", "1", "2", "5", "10", "20"]);
        assert!(t.iter().any(|t| t.value == 0.3 && t.label.is_none()));
        // 0.03 to 1000 Earth masses on 800 px, horizontal labels: 1-2-5 still fits; on
        // 500 px only the powers of ten do.
        let t = logarithmic(0.03, 1000.0, 800.0, 14.0, false);
        assert_eq!(
            labels(&t),
            [
                "0.05", "0.1", "0.2", "0.5", "1", "2", "5", "10", "20", "50", "100", "200", "500",
                "1000"
            ]
        );
        let t = logarithmic(0.03, 1000.0, 500.0, 14.0, false);
        assert_eq!(labels(&t), ["0.1", "1", "10", "100", "1000"]);
        assert_eq!(t.iter().filter(|t| t.label.is_none()).count(), 39);
        // Twelve decades on 300 px: every third power of ten.
        let t = logarithmic(1e-6, 1e6, 300.0, 14.0, false);
        assert_eq!(labels(&t), ["1e-6", "0.001", "1", "1000", "1e6"]);
        // A fraction of a decade on a long axis: every integer multiple.
        let t = logarithmic(2.0, 9.0, 800.0, 14.0, false);
        assert_eq!(labels(&t), ["2", "3", "4", "5", "6", "7", "8", "9"]);
        assert!(logarithmic(0.0, 1.0, 100.0, 14.0, false).is_empty());
    }
}
