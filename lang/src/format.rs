//! Number formatting for people: the one place that decides how many digits a shown
//! number has. Every front end (text `eval`, `explain`, hover, inlay hints, the CSV display
//! columns, plot captions) goes through [`with_uncertainty`] for a measured value and
//! [`number`] for an exact one; the JSON output keeps full precision and does not.
//!
//! The rule for a value with an uncertainty (common practice; the Particle Data Group's
//! rounding rule, Review of Particle Physics, Introduction §5.3, is a published variant that
//! keeps one digit when the uncertainty's leading digits are 355 to 949 — we always keep two):
//!
//! 1. the uncertainty is rounded to two significant digits (the smaller side of an
//!    asymmetric one; the larger side is given to the same decimal place);
//! 2. the value is rounded to the same decimal place;
//! 3. the numbers are written plainly (`0.04424 ± 0.00064`, `1044 ± 25`, `4870 ± 270`)
//!    when the value lies in [1e-3, 1e6) and the last digit kept is at the tens place or
//!    finer, so at most one zero stands in for a digit; otherwise in scientific notation
//!    with one shared exponent, written the way the language reads a literal
//!    (`3.92e5 ± 0.37e5`, `3.92e5 +0.37e5/-0.32e5`), so that a shown value can be pasted
//!    back into a file.

/// A plain number: up to 6 significant figures, scientific notation outside [1e-3, 1e6).
pub fn number(v: f64) -> String {
    if !v.is_finite() {
        return format!("{v}");
    }
    if v == 0.0 {
        return "0".to_string();
    }
    let a = v.abs();
    if !(1e-3..1e6).contains(&a) {
        let s = format!("{v:.5e}");
        return trim_exponent(&s);
    }
    let digits = (5 - a.log10().floor() as i32).clamp(0, 12) as usize;
    trim_zeros(&format!("{v:.digits$}"))
}

/// A number to `n` significant figures (for messages).
pub fn sig(v: f64, n: usize) -> String {
    if !v.is_finite() || v == 0.0 {
        return number(v);
    }
    let a = v.abs();
    if !(1e-3..1e6).contains(&a) {
        return trim_exponent(&format!("{v:.*e}", n.saturating_sub(1)));
    }
    let digits = (n as i32 - 1 - a.log10().floor() as i32).clamp(0, 12) as usize;
    format!("{v:.digits$}")
}

/// A number to `n` significant figures with every one of them shown (`1.0e-5`, not `1e-5`,
/// beside `1.2e-5`): for figures read side by side.
pub fn sig_all(v: f64, n: usize) -> String {
    if !v.is_finite() || v == 0.0 {
        return number(v);
    }
    let a = v.abs();
    if !(1e-3..1e6).contains(&a) {
        return format!("{v:.*e}", n.saturating_sub(1));
    }
    sig(v, n)
}

/// `v` with `decimals` digits after the point, as a message shows a number it compares
/// with a threshold; a magnitude past 10^6, one too small to show in those decimals, or
/// one not finite in four significant figures instead, so that an absurd input never
/// becomes a number of hundreds of digits, nor a zero.
pub fn fixed(v: f64, decimals: usize) -> String {
    let smallest = 0.5 * 10f64.powi(-(decimals.min(20) as i32));
    if v.is_finite() && v.abs() < 1e6 && (v == 0.0 || v.abs() >= smallest) {
        format!("{v:.decimals$}")
    } else {
        sig(v, 4)
    }
}

fn trim_zeros(s: &str) -> String {
    if s.contains('.') {
        s.trim_end_matches('0').trim_end_matches('.').to_string()
    } else {
        s.to_string()
    }
}

fn trim_exponent(s: &str) -> String {
    match s.split_once('e') {
        Some((m, e)) => format!("{}e{}", trim_zeros(m), e),
        None => s.to_string(),
    }
}

/// Decimal places that show two significant figures of `u`.
fn places_for(u: f64) -> i32 {
    if u <= 0.0 || !u.is_finite() {
        return 6;
    }
    1 - u.log10().floor() as i32
}

/// The power of ten of the last digit kept for an uncertainty `u` (> 0, finite): its second
/// significant digit, after rounding (0.0996 rounds to 0.10, not 0.100).
fn last_digit(u: f64) -> i32 {
    let last = u.log10().floor() as i32 - 1;
    if (u / 10f64.powi(last)).round() >= 100.0 {
        last + 1
    } else {
        last
    }
}

/// Whether an asymmetric uncertainty is shown as one `±`: its sides differ by less than 5%,
/// or are the same once rounded.
fn symmetric(below: f64, above: f64, below_text: &str, above_text: &str) -> bool {
    ((above - below).abs() / above.max(below)) < 0.05 || below_text == above_text
}

/// A value with its uncertainty rounded by the rule in the module comment, or `None` when
/// there is no usable uncertainty (the value is exact, or a side is not finite).
fn rounded(value: f64, below: f64, above: f64) -> Option<String> {
    if !(value.is_finite() && below.is_finite() && above.is_finite()) {
        return None;
    }
    let u = below.min(above);
    let u = if u > 0.0 { u } else { below.max(above) };
    if u <= 0.0 {
        return None;
    }
    // Each part in its own significant digits: for the cases the one rounding cannot serve.
    let own_digits = || {
        let (lo, hi) = (sig(below, 2), sig(above, 2));
        Some(if lo == hi {
            format!("{} ± {hi}", sig(value, 3))
        } else {
            format!("{} +{hi}/-{lo}", sig(value, 3))
        })
    };
    // A side many orders of magnitude smaller than the other (`0 +1e-300/-0.5`) would set the
    // digits of the whole (hundreds of them), and one near the smallest float would make the
    // rounding step 0 (`± 1e-320`).
    if u < 1e-12 * below.max(above) {
        return own_digits();
    }
    let last = last_digit(u);
    let step = 10f64.powi(last);
    if !(step > 0.0 && step.is_finite()) {
        return own_digits();
    }
    let value_r = (value / step).round() * step;
    if value_r == 0.0 && value != 0.0 {
        // An uncertainty far larger than the value would round the value itself to 0
        // (`3 ± 1e300` as `0.0e300 ± 1.0e300`): each is shown in its own digits instead.
        return own_digits();
    }
    let scale = value_r.abs().max(u);
    let plain = (-15..=1).contains(&last) && (1e-3..1e6).contains(&scale);
    let (exp, places) = if plain {
        (0, (-last).max(0) as usize)
    } else {
        // The exponent of the larger of value and uncertainty, after rounding (99960 ± 1500
        // is 1.00e5 ± 0.02e5, not 10.00e4).
        let exp = scale.log10().floor() as i32;
        (exp, (exp - last).clamp(0, 17) as usize)
    };
    let f = 10f64.powi(exp);
    let num = |x: f64| {
        let m = if plain && last > 0 {
            // Rounded to tens: Rust's formatting would keep the units digit.
            format!("{:.0}", (x / step).round() * step)
        } else {
            format!("{:.places$}", x / f)
        };
        if plain {
            m
        } else {
            format!("{m}e{exp}")
        }
    };
    let (lo, hi) = (num(below), num(above));
    Some(if symmetric(below, above, &lo, &hi) {
        format!("{} ± {}", num(value), num((above + below) / 2.0))
    } else {
        format!("{} +{hi}/-{lo}", num(value))
    })
}

/// `value ± u` or `value +above/-below`, rounded to the uncertainty (see the module comment):
/// `0.04424 ± 0.00064`, `288 +27/-24`, `3.92e5 ± 0.37e5`. An exact value is a plain
/// [`number`].
pub fn with_uncertainty(value: f64, below: f64, above: f64) -> String {
    if !value.is_finite() {
        return format!("{value}");
    }
    if !(below.is_finite() && above.is_finite()) {
        // An uncertainty that overflowed (an input's ± near the largest float) is said, not
        // dropped: the bare number would read as exact.
        return format!("{} (uncertainty not finite)", number(value));
    }
    rounded(value, below, above).unwrap_or_else(|| number(value))
}

/// A value with its uncertainty as the language writes a literal (`0.04425 ± 0.00063`,
/// `0.880 +0.030/-0.020`, `1.40e6 ± 0.13e6`): the text of [`with_uncertainty`], which the
/// parser reads back. Exact values keep up to 6 significant figures.
pub fn literal_text(value: f64, below: f64, above: f64) -> String {
    rounded(value, below, above).unwrap_or_else(|| number(value))
}

/// A value with its uncertainty written for a conversion of the user's own measurement (the
/// editor's "Convert to"): six significant figures of the value and of each side, so
/// the converted literal stands for the same numbers (a rounding to the uncertainty's second
/// digit moved values derived from an asymmetric one by half a per cent). A side is merged
/// into `±` only when both read the same.
pub fn converted_text(value: f64, below: f64, above: f64) -> String {
    if !(below.is_finite() && above.is_finite()) || (below == 0.0 && above == 0.0) {
        return number(value);
    }
    let (lo, hi) = (number(below), number(above));
    if lo == hi {
        format!("{} ± {hi}", number(value))
    } else {
        format!("{} +{hi}/-{lo}", number(value))
    }
}

/// A Julian date with its uncertainty in days: fixed decimals (two significant figures of
/// the uncertainty, at least 4 and at most 8 places), never scientific notation.
pub fn julian_date(jd: f64, below: f64, above: f64) -> String {
    if !jd.is_finite() {
        return format!("{jd}");
    }
    let u = below.max(above);
    let places = if u > 0.0 && u.is_finite() {
        places_for(below.min(above).max(u * 1e-3)).clamp(4, 8) as usize
    } else {
        5
    };
    let v = format!("{jd:.places$}");
    if u <= 0.0 || !u.is_finite() {
        return v;
    }
    if ((above - below).abs() / u) < 0.05 {
        format!("{v} ± {:.places$}", (above + below) / 2.0)
    } else {
        format!("{v} +{above:.places$}/-{below:.places$}")
    }
}

#[cfg(test)]
mod tests {
    #[test]
    fn every_significant_figure_is_shown() {
        assert_eq!(super::sig_all(1.0e-5, 2), "1.0e-5");
        assert_eq!(super::sig_all(1.23e-5, 2), "1.2e-5");
        assert_eq!(super::sig_all(0.010, 2), "0.010");
        assert_eq!(super::sig_all(2.0e7, 2), "2.0e7");
    }

    use super::*;

    #[test]
    fn a_number_in_a_message_is_never_hundreds_of_digits_nor_a_false_zero() {
        assert_eq!(fixed(0.0407, 4), "0.0407");
        assert_eq!(fixed(5772.0, 0), "5772");
        assert_eq!(fixed(0.0, 3), "0.000");
        assert_eq!(fixed(1e30, 0), "1e30");
        assert_eq!(fixed(12_345_678.9, 3), "1.235e7");
        assert_eq!(fixed(1.23e-6, 0), "1.23e-6");
        assert_eq!(fixed(1e-30, 3), "1e-30");
        assert_eq!(fixed(f64::INFINITY, 2), sig(f64::INFINITY, 4));
    }

    #[test]
    fn an_uncertainty_that_is_not_finite_is_said() {
        assert_eq!(
            with_uncertainty(28.3, f64::INFINITY, f64::INFINITY),
            "28.3 (uncertainty not finite)"
        );
        assert_eq!(
            with_uncertainty(2.0, 0.1, f64::NAN),
            "2 (uncertainty not finite)"
        );
        assert_eq!(with_uncertainty(2.0, 0.0, 0.0), "2");
    }

    #[test]
    fn literal_text_reads_back() {
        assert_eq!(
            literal_text(0.044251, 0.00063, 0.00063),
            "0.04425 ± 0.00063"
        );
        assert_eq!(literal_text(1.4e6, 1.3e5, 1.3e5), "1.40e6 ± 0.13e6");
        assert_eq!(
            literal_text(2.0e-5, 1.0e-6, 3.0e-6),
            "2.00e-5 +0.30e-5/-0.10e-5"
        );
        assert_eq!(literal_text(5.0, 0.0, 0.0), "5");
        for text in [
            literal_text(1.4e6, 1.3e5, 1.3e5),
            literal_text(2.0e-5, 1.0e-6, 3.0e-6),
        ] {
            let src = format!("system \"S\" {{ star s {{ mass = {text} Msun }} }}");
            let p = crate::parser::parse(crate::source::FileId(0), &src);
            assert!(p.diagnostics.is_empty(), "{text}: {:?}", p.diagnostics);
        }
    }

    #[test]
    fn plain_numbers() {
        assert_eq!(number(3.52474), "3.52474");
        assert_eq!(number(0.5), "0.5");
        assert_eq!(number(1.0e30), "1e30");
        assert_eq!(number(12345.678), "12345.7");
        assert_eq!(number(0.0), "0");
        assert_eq!(sig(49.5419, 3), "49.5");
        assert_eq!(sig(0.0123456, 2), "0.012");
        assert_eq!(sig(1.23e8, 3), "1.23e8");
    }

    #[test]
    fn rounded_to_the_uncertainty() {
        // (value, below, above, shown)
        let cases = [
            (0.044251, 0.00063, 0.00063, "0.04425 ± 0.00063"),
            (1044.3, 25.0, 25.0, "1044 ± 25"),
            (0.88, 0.02, 0.03, "0.880 +0.030/-0.020"),
            (1.4e6, 1.3e5, 1.3e5, "1.40e6 ± 0.13e6"),
            (5.0, 0.0, 0.0, "5"),
            (5310.0, 80.0, 80.0, "5310 ± 80"),
            // An uncertainty so large the value would round to 0: each in its own digits.
            (3.0, 1e300, 1e300, "3.00 ± 1e300"),
            // A side of 1e-300 beside one of 0.5 would set hundreds of digits, and one near
            // the smallest float a rounding step of 0 (which printed NaN): each in its own.
            (0.0, 0.5, 1e-300, "0 +1e-300/-0.50"),
            (-0.0, 1e-320, 1e-320, "0 ± 1e-320"),
            (0.01, 2.0, 2.0, "0.0100 ± 2.0"),
            (288.4, 24.0, 27.0, "288 +27/-24"),
            // An insolation in W/m^2 and a star's mass in Earth masses: six digits each
            // before, of which only two or three meant anything.
            (391_626.0, 32_495.0, 36_731.0, "3.92e5 +0.37e5/-0.32e5"),
            (309_640.0, 13_318.0, 13_318.0, "3.10e5 ± 0.13e5"),
            // Rounded to tens, one zero stands in for a digit; beyond that, an exponent.
            (2087.0, 163.0, 163.0, "2090 ± 160"),
            (4870.0, 268.3, 268.3, "4870 ± 270"),
            (14_544.0, 1219.0, 1354.0, "1.45e4 +0.14e4/-0.12e4"),
            (59_221.0, 7077.0, 5559.0, "5.92e4 +0.56e4/-0.71e4"),
            // Rounding that carries into a new digit keeps two significant digits, and a
            // value that rounds up to the next power of ten takes its exponent.
            (1.2345, 0.0996, 0.0996, "1.23 ± 0.10"),
            (99_960.0, 1500.0, 1500.0, "1.000e5 ± 0.015e5"),
            // Small values; an uncertainty larger than the value.
            (1.234e-4, 1.2e-5, 1.2e-5, "1.23e-4 ± 0.12e-4"),
            (0.00651, 0.00034, 0.00031, "0.00651 +0.00031/-0.00034"),
            (30.0, 18.0, 32.0, "30 +32/-18"),
            // Sides that round to the same text are one ±.
            (10.0, 1.04, 1.0, "10.0 ± 1.0"),
        ];
        for (value, below, above, shown) in cases {
            assert_eq!(with_uncertainty(value, below, above), shown, "{value}");
        }
    }

    #[test]
    fn every_shown_digit_is_significant() {
        // Over many magnitudes: the uncertainty shown has exactly two significant digits
        // (and at most one zero after them standing in for a digit), and the value is given
        // to the same decimal place.
        for exp in -8..12 {
            for m in [1.0, 1.234, 3.55, 9.5, 9.96] {
                let u = m * 10f64.powi(exp);
                let value = 7.77 * u * 10f64.powi(exp % 4);
                if value < 0.5 * 10f64.powi(last_digit(u)) {
                    continue; // would round to 0: shown in its own digits (tested above)
                }
                let text = with_uncertainty(value, u, u);
                let (v, e) = text.split_once(" ± ").unwrap();
                let digits = |s: &str| -> String {
                    let m = s.split('e').next().unwrap();
                    m.chars().filter(char::is_ascii_digit).collect::<String>()
                };
                let ud = digits(e);
                let ud = ud.trim_start_matches('0');
                let kept = if !e.contains('.') && ud.len() == 3 {
                    ud.strip_suffix('0').unwrap_or(ud)
                } else {
                    ud
                };
                assert_eq!(kept.len(), 2, "{text}");
                let decimals = |s: &str| {
                    s.split('e')
                        .next()
                        .unwrap()
                        .split_once('.')
                        .map_or(0, |x| x.1.len())
                };
                assert_eq!(decimals(v), decimals(e), "{text}");
                assert_eq!(v.contains('e'), e.contains('e'), "{text}");
                let back: f64 = v.parse().unwrap();
                assert!(
                    (back - value).abs() <= u * 0.051,
                    "{text} for {value} ± {u}"
                );
            }
        }
    }

    #[test]
    fn julian_dates_keep_their_digits() {
        assert_eq!(
            julian_date(2_460_123.456_7, 0.0004, 0.0004),
            "2460123.45670 ± 0.00040"
        );
        assert_eq!(julian_date(2_460_123.456_7, 0.0, 0.0), "2460123.45670");
    }
}
