//! The range a declared limit is drawn over: the quantity's valid range, except for angles
//! whose range holds more than the limit can mean (an argument of periastron's two turns, an
//! inclination past 90 deg), and the words that say which.

use super::*;
use crate::derive::summary::DisplayUnit;
use crate::quantities::QuantityDef;

/// The turn a limit on an argument of periastron is read within. On a circle a one-sided
/// limit bounds nothing without its other end, so `< 90 deg` is read as 0 to 90 deg, within
/// the turn 0 to 360 deg of common practice; a limit at or below 0 within -180 to 180 deg,
/// the other common convention (`> -30 deg` is -30 to 180 deg, `> 0 deg` 0 to 180 deg, not
/// the whole turn), and one below -180 deg within -360 to 0 deg.
pub(crate) fn turn_of_limit(form: Form, limit: f64) -> (f64, f64) {
    use std::f64::consts::{PI, TAU};
    let start = match form {
        Form::UpperLimit if limit > 0.0 => 0.0,
        Form::LowerLimit if limit > 0.0 => 0.0,
        _ if limit >= -PI => -PI,
        _ => -TAU,
    };
    (start, start + TAU)
}

/// Whether `m` is a limit on an inclination at or below 90 deg, read within 0 to 90 deg:
/// `inclination > 86 deg` means 86 to 90 deg, as i and 180 deg - i give the same transit and
/// radial velocities; over the whole valid range (to 180 deg) it would reach sin i = 0 and
/// an unbounded mass.
pub(super) fn folded_inclination(q: Qty, m: &Measurement) -> bool {
    q == Qty::Inclination && m.form.is_limit() && m.value <= std::f64::consts::FRAC_PI_2
}

/// The range the limit `m` of quantity `def` is drawn over (see the module's words).
pub(super) fn range(def: &QuantityDef, m: &Measurement) -> (f64, f64) {
    if def.qty == Qty::ArgPeriastron && m.form.is_limit() {
        turn_of_limit(m.form, m.value)
    } else if folded_inclination(def.qty, m) {
        (0.0, std::f64::consts::FRAC_PI_2)
    } else {
        def.limits()
    }
}

/// The assumption of a declared limit `label` (`b.inclination`), written `declared`
/// (`> 86 deg`), drawn over `(lo, hi)`.
pub(super) fn words(
    label: &str,
    declared: &str,
    m: &Measurement,
    (lo, hi): (f64, f64),
    def: &QuantityDef,
    unit: DisplayUnit,
) -> String {
    let shown = |x: f64| crate::report::shown_in(x, 0.0, 0.0, Form::Exact, unit);
    let (from, to) = if m.form == Form::UpperLimit {
        (lo, m.value)
    } else {
        (m.value, hi)
    };
    if folded_inclination(def.qty, m) {
        format!(
            "{label} {declared} sampled uniformly from {} to {}: an inclination and its supplement (180 deg - i) give the same transit and radial velocities, so a limit on it is read within 0 to 90 deg (common practice)",
            shown(from),
            shown(to),
        )
    } else if def.qty == Qty::ArgPeriastron {
        format!(
            "{label} {declared} sampled uniformly from {} to {}: a limit on an angle bounds nothing on a circle without its other end, so it is read within the turn {} to {} (common practice)",
            shown(from),
            shown(to),
            shown(lo),
            shown(hi),
        )
    } else {
        format!("{label} {declared} sampled uniformly within its physical range")
    }
}
