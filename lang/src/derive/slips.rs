//! Unit slips behind an inconsistency: a declared value that differs from the derived one by
//! the ratio of two units its quantity is commonly written in (a planet's mass written in
//! Mearth where Mjup was meant is 318 times too small). The finding then names the two
//! units, which says more than "check the units".

use crate::constants::{AU, M_EARTH, M_JUPITER, M_SUN, R_EARTH, R_JUPITER, R_SUN};
use crate::quantities::Qty;

/// Pairs of units a quantity is written in, larger first, with their ratio (SI).
fn pairs(q: Qty) -> &'static [(&'static str, &'static str, f64)] {
    const MASS: &[(&str, &str, f64)] = &[
        ("Mjup", "Mearth", M_JUPITER / M_EARTH),
        ("Msun", "Mjup", M_SUN / M_JUPITER),
        ("Msun", "Mearth", M_SUN / M_EARTH),
    ];
    const RADIUS: &[(&str, &str, f64)] = &[
        ("Rjup", "Rearth", R_JUPITER / R_EARTH),
        ("Rsun", "Rjup", R_SUN / R_JUPITER),
        ("Rsun", "Rearth", R_SUN / R_EARTH),
    ];
    const AXIS: &[(&str, &str, f64)] = &[("au", "Rsun", AU / R_SUN), ("au", "km", AU / 1e3)];
    const PERIOD: &[(&str, &str, f64)] = &[("d", "h", 24.0), ("yr", "d", 365.25)];
    const SPEED: &[(&str, &str, f64)] = &[("km/s", "m/s", 1e3)];
    const DEPTH: &[(&str, &str, f64)] = &[("%", "ppm", 1e4), ("a fraction", "%", 100.0)];
    match q {
        Qty::Mass | Qty::MinMass | Qty::StarMass => MASS,
        Qty::Radius | Qty::StarRadius => RADIUS,
        Qty::SemiMajorAxis => AXIS,
        Qty::Period => PERIOD,
        Qty::RvAmplitude => SPEED,
        Qty::TransitDepth => DEPTH,
        _ => &[],
    }
}

/// When `declared / derived` is within 10 % of the ratio of two units of `q`, the words that
/// say which unit was probably written for which.
pub(super) fn unit_slip(q: Qty, declared: f64, derived: f64) -> Option<String> {
    let r = declared / derived;
    if !(r.is_finite() && r > 0.0) {
        return None;
    }
    pairs(q).iter().find_map(|&(big, small, f)| {
        let near = |x: f64| (x / f).ln().abs() < 1.1f64.ln();
        let times = crate::format::sig(f, 3);
        if near(1.0 / r) {
            Some(format!(
                "the declared value is {times} times smaller than the derived one, the ratio of {big} to {small}: was it written in {small} where {big} was meant?"
            ))
        } else if near(r) {
            Some(format!(
                "the declared value is {times} times larger than the derived one, the ratio of {big} to {small}: was it written in {big} where {small} was meant?"
            ))
        } else {
            None
        }
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_ratios_of_common_units_are_named() {
        // A mass written as 1.05 Mearth for a planet of about 1.05 Mjup (the IAU 2015 B3
        // nominal masses: Mjup / Mearth = 317.83).
        let m = unit_slip(Qty::Mass, 1.05 * M_EARTH, 1.02 * M_JUPITER).unwrap();
        assert!(
            m.contains("318 times smaller") && m.contains("written in Mearth where Mjup was meant"),
            "{m}"
        );
        // A radius in Rjup meant as Rearth: 11.2 times too large.
        let m = unit_slip(Qty::Radius, 2.1 * R_JUPITER, 2.0 * R_EARTH).unwrap();
        assert!(
            m.contains("11.2 times larger") && m.contains("written in Rjup where Rearth was meant"),
            "{m}"
        );
        // An amplitude in km/s meant as m/s.
        assert!(unit_slip(Qty::RvAmplitude, 25e3, 24.0)
            .unwrap()
            .contains("km/s where m/s"));
        // A plain disagreement of a factor of two names no unit.
        assert!(unit_slip(Qty::Mass, 2.0 * M_JUPITER, M_JUPITER).is_none());
        assert!(unit_slip(Qty::Teq, 1000.0, 10.0).is_none());
    }
}
