//! Number formatting for people: a value with its uncertainty rounded the way the trade
//! writes it (two significant figures of the uncertainty, common practice), and plain
//! numbers with enough digits to read back.

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

/// `value ± u` or `value +above/-below`, rounded to the uncertainty. Falls back to
/// scientific notation with a shared exponent for very large or small values.
pub fn with_uncertainty(value: f64, below: f64, above: f64) -> String {
    if !value.is_finite() {
        return format!("{value}");
    }
    if !(below.is_finite() && above.is_finite()) {
        // An uncertainty that overflowed (an input's ± near the largest float) is said, not
        // dropped: the bare number would read as exact.
        return format!("{} (uncertainty not finite)", number(value));
    }
    let u = below.min(above);
    let u = if u > 0.0 { u } else { below.max(above) };
    if u <= 0.0 || !u.is_finite() {
        return number(value);
    }
    let scale = value.abs().max(u);
    if !(1e-3..1e6).contains(&scale) {
        let exp = scale.log10().floor() as i32;
        let f = 10f64.powi(exp);
        return format!(
            "({})e{exp}",
            with_uncertainty(value / f, below / f, above / f)
        );
    }
    let places = places_for(u).clamp(0, 12) as usize;
    let v = format!("{value:.places$}");
    let sym = ((above - below).abs() / above.max(below)) < 0.05;
    if sym {
        format!("{v} ± {:.places$}", (above + below) / 2.0)
    } else {
        format!("{v} +{above:.places$}/-{below:.places$}")
    }
}

/// A value with its uncertainty as the language writes a literal (`0.04425 ± 0.00063`,
/// `0.880 +0.030/-0.020`, `1.40e6 ± 0.13e6`): rounded like [`with_uncertainty`], but always
/// something the parser reads back. Exact values keep up to 6 significant figures.
pub fn literal_text(value: f64, below: f64, above: f64) -> String {
    let u = below.min(above);
    let u = if u > 0.0 { u } else { below.max(above) };
    if !value.is_finite() || u <= 0.0 || !u.is_finite() {
        return number(value);
    }
    let scale = value.abs().max(u);
    if !(1e-3..1e6).contains(&scale) {
        let exp = scale.log10().floor() as i32;
        let f = 10f64.powi(exp);
        let places = places_for(u / f).clamp(0, 12) as usize;
        let m = |v: f64| format!("{:.places$}e{exp}", v / f);
        return if ((above - below).abs() / above.max(below)) < 0.05 {
            format!("{} ± {}", m(value), m((above + below) / 2.0))
        } else {
            format!("{} +{}/-{}", m(value), m(above), m(below))
        };
    }
    with_uncertainty(value, below, above)
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
    use super::*;

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
        assert_eq!(
            with_uncertainty(0.044251, 0.00063, 0.00063),
            "0.04425 ± 0.00063"
        );
        assert_eq!(with_uncertainty(1044.3, 25.0, 25.0), "1044 ± 25");
        assert_eq!(with_uncertainty(0.88, 0.02, 0.03), "0.880 +0.030/-0.020");
        assert_eq!(with_uncertainty(1.4e6, 1.3e5, 1.3e5), "(1.40 ± 0.13)e6");
        assert_eq!(with_uncertainty(5.0, 0.0, 0.0), "5");
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
