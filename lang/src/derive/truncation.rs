//! A measurement whose uncertainty reaches past its quantity's valid range (an eccentricity
//! of `0.2 ± 0.3`, a weak amplitude of `1.5 ± 1.2 m/s`): its draws are kept inside the range
//! ([`super::value::draw`] draws again those that fall outside), so what is sampled is the
//! stated distribution truncated to the range, whose median is not the declared value. This
//! computes how much of the stated distribution lies outside and the truncated median, in
//! closed form, so that the note saying so gives the numbers.

use crate::model::{Form, Measurement};

/// The shares of a measurement's stated distribution below `lo` and above `hi`, and the
/// median of that distribution truncated to `[lo, hi]`. `v +a/-b` is the two-piece normal of
/// [`super::value::draw`] (median `v`, `b` below and `a` above); `None` for an exact value
/// or a limit, or when nothing lies outside.
pub fn truncation(m: &Measurement, lo: f64, hi: f64) -> Option<(f64, f64, f64)> {
    if !matches!(m.form, Form::Symmetric | Form::Asymmetric) {
        return None;
    }
    let v = m.value;
    // P(X < x) and P(X > x), strict: a side of zero width is a point mass at `v` (half the
    // probability), which lies inside a range that ends at `v` (`0 +0.1/-0` is an
    // eccentricity of 0 or more, none of it below 0).
    // `phi` takes the infinite ends of a range to 0 and 1.
    let less = |x: f64| match (x <= v, m.below > 0.0, m.above > 0.0) {
        (true, true, _) => phi((x - v) / m.below),
        (true, false, _) => 0.0,
        (false, _, true) => phi((x - v) / m.above),
        (false, _, false) => 1.0,
    };
    let more = |x: f64| match (x >= v, m.above > 0.0, m.below > 0.0) {
        (true, true, _) => 1.0 - phi((x - v) / m.above),
        (true, false, _) => 0.0,
        (false, _, true) => 1.0 - phi((x - v) / m.below),
        (false, _, false) => 1.0,
    };
    let (below, above) = (less(lo), more(hi));
    let outside = below + above;
    if !(outside > 0.0 && outside < 1.0) {
        return None;
    }
    // The truncated median: where the stated distribution function reaches halfway between
    // its values at the two ends of the range (at `v` itself where a side has no width).
    let target = below + 0.5 * (1.0 - outside);
    let median = if target < 0.5 && m.below > 0.0 {
        v + m.below * super::asymmetric::probit(target).unwrap_or(0.0)
    } else if target > 0.5 && m.above > 0.0 {
        v + m.above * super::asymmetric::probit(target).unwrap_or(0.0)
    } else {
        v
    };
    Some((below, above, median))
}

/// The standard normal distribution function.
fn phi(z: f64) -> f64 {
    0.5 * libm::erfc(-z / std::f64::consts::SQRT_2)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn m(value: f64, below: f64, above: f64) -> Measurement {
        Measurement {
            value,
            below,
            above,
            form: if below == above {
                Form::Symmetric
            } else {
                Form::Asymmetric
            },
        }
    }

    #[test]
    fn an_eccentricity_reaching_below_zero_is_truncated_with_its_median_moved() {
        // e = 0.2 ± 0.3 in [0, 1]: P(e < 0) = Phi(-2/3) = 0.2525 and P(e > 1) = 1 - Phi(8/3)
        // = 0.0038 (standard normal table); the truncated median solves
        // Phi((x - 0.2)/0.3) = 0.2525 + (1 - 0.2563)/2, i.e. x = 0.2 + 0.3 * 0.3163 = 0.2949.
        let (below, above, median) = truncation(&m(0.2, 0.3, 0.3), 0.0, 1.0).unwrap();
        assert!((below - 0.2525).abs() < 1e-4, "{below}");
        assert!((above - 0.0038).abs() < 1e-4, "{above}");
        assert!((median - 0.2949).abs() < 2e-4, "{median}");
    }

    #[test]
    fn the_closed_form_median_is_that_of_the_draws() {
        // The draws of `value::draw` (outside draws drawn again) have the median computed
        // here, asymmetric sides included.
        for meas in [m(0.2, 0.3, 0.3), m(0.3, 0.25, 0.4), m(0.05, 0.02, 0.09)] {
            let (_, _, median) = truncation(&meas, 0.0, 1.0).unwrap();
            let mut d = super::super::value::draw(&meas, 0.0, 1.0, 200_001, 7).to_vec();
            d.sort_by(f64::total_cmp);
            let drawn = d[100_000];
            assert!(
                (drawn - median).abs() < 0.01 * (meas.below + meas.above),
                "{meas:?}: {drawn} against {median}"
            );
        }
    }

    #[test]
    fn the_note_and_the_assumption_say_what_is_sampled() {
        use crate::quantities::Qty;
        let src = "system \"Quessa\" {\n  star q { mass = 0.90 ± 0.03 Msun; radius = 0.85 ± 0.03 Rsun }\n  planet b orbits q { period = 5.2 ± 0.001 d; rv_amplitude = 25 ± 3 m/s; eccentricity = 0.2 ± 0.3 }\n}\n";
        let mc = crate::analyze(crate::source::FileId(0), src, &crate::Settings::default());
        let notes: Vec<&str> = mc
            .diagnostics
            .iter()
            .filter(|d| d.rule == crate::diagnostic::Rule::Truncated)
            .map(|d| d.message.as_str())
            .collect();
        assert_eq!(
            notes,
            ["b.eccentricity = 0.20 ± 0.30 reaches outside the range it can take: 25.2% of its probability lies below 0 and 0.4% above 1; sampled values are kept inside the range, so their median is 0.30, not 0.20"]
        );
        // What rests on it says how the eccentricity was sampled.
        let min_mass = mc.results[0].bodies[1].get(Qty::MinMass).unwrap();
        assert!(
            min_mass
                .assumptions
                .iter()
                .any(|a| a.contains("sampled inside its valid range")
                    && a.contains("median is 0.30")),
            "{:?}",
            min_mass.assumptions
        );
        // A median moved by less than a tenth of the uncertainty is not noted: 0.05 ± 0.03
        // puts 4.8 % below 0 and moves the median by 0.07 of 0.03.
        let near = src.replace("0.2 ± 0.3", "0.05 ± 0.03");
        let a = crate::analyze(crate::source::FileId(0), &near, &crate::Settings::default());
        assert!(a
            .diagnostics
            .iter()
            .all(|d| d.rule != crate::diagnostic::Rule::Truncated));
    }

    #[test]
    fn a_side_of_zero_width_at_the_end_of_the_range_is_inside_it() {
        // `0 +0.1/-0`: an eccentricity of 0 or more, as papers publish e = 0; nothing of it
        // is below 0 (the lower half is the point 0, inside the range).
        assert!(truncation(&m(0.0, 0.0, 0.1), 0.0, 1.0).is_none());
        // `1.0 +0/-0.2` for an albedo in [0, 1]: nothing above 1 (and 3e-7 below 0).
        let (below, above, median) = truncation(&m(1.0, 0.2, 0.0), 0.0, 1.0).unwrap();
        assert!(above == 0.0 && below < 1e-6 && (median - 1.0).abs() < 1e-6);
        // Whereas `0 ± 0.1` puts half below 0, and the truncated median is
        // 0.1 * probit(0.75) = 0.0674 (standard normal table: probit(0.75) = 0.6745).
        let (below, _, median) = truncation(&m(0.0, 0.1, 0.1), 0.0, 1.0).unwrap();
        assert!((below - 0.5).abs() < 1e-12, "{below}");
        assert!((median - 0.06745).abs() < 1e-4, "{median}");
    }

    #[test]
    fn nothing_outside_or_nothing_to_truncate_gives_none() {
        // Far inside the range: the share outside underflows to nothing.
        assert!(truncation(&m(5.0, 0.001, 0.001), 0.0, f64::INFINITY).is_none());
        let exact = Measurement {
            value: 0.2,
            below: 0.0,
            above: 0.0,
            form: Form::Exact,
        };
        assert!(truncation(&exact, 0.0, 1.0).is_none());
    }
}
