//! Unit slips behind an inconsistency: a declared value that differs from the derived one by
//! the ratio of two units its quantity is commonly written in (a planet's mass written in
//! Mearth where Mjup was meant is 318 times too small). The finding then names the two
//! units, which says more than "check the units". A ratio alone is not enough: the value
//! must have been written in the unit the slip would have used (an amplitude in km/s meant
//! as m/s makes a mass about 1000 times too large, near Msun/Mjup, though no mass was written
//! in either), and the ratio must hold within 5 %.

use crate::constants::{AU, DAY, M_EARTH, M_JUPITER, M_SUN, R_EARTH, R_JUPITER, R_SUN};
use crate::quantities::Qty;

/// The ratio must hold within this factor.
const WITHIN: f64 = 1.05;

/// Pairs of units a quantity is written in, larger first, each with its size in SI (`None`
/// for a plain number, which has no unit written).
type Pair = ((&'static str, f64), (&'static str, f64));

fn pairs(q: Qty) -> &'static [Pair] {
    const HOUR: f64 = 3600.0;
    const MASS: &[Pair] = &[
        (("Mjup", M_JUPITER), ("Mearth", M_EARTH)),
        (("Msun", M_SUN), ("Mjup", M_JUPITER)),
    ];
    const RADIUS: &[Pair] = &[
        (("Rjup", R_JUPITER), ("Rearth", R_EARTH)),
        (("Rsun", R_SUN), ("Rjup", R_JUPITER)),
    ];
    const AXIS: &[Pair] = &[(("au", AU), ("Rsun", R_SUN)), (("au", AU), ("km", 1e3))];
    const PERIOD: &[Pair] = &[
        (("d", DAY), ("h", HOUR)),
        (("yr", 365.25 * DAY), ("d", DAY)),
    ];
    const DURATION: &[Pair] = &[(("d", DAY), ("h", HOUR)), (("h", HOUR), ("min", 60.0))];
    const SPEED: &[Pair] = &[(("km/s", 1e3), ("m/s", 1.0))];
    const DEPTH: &[Pair] = &[
        (("%", 1e-2), ("ppm", 1e-6)),
        (("a fraction", 1.0), ("%", 1e-2)),
    ];
    match q {
        // A star's mass and radius are written in solar units; a planet's unit read as the
        // star's would make a brown dwarf of it, which no slip explains.
        Qty::Mass | Qty::MinMass => MASS,
        Qty::Radius => RADIUS,
        Qty::SemiMajorAxis => AXIS,
        Qty::Period => PERIOD,
        Qty::TransitDuration | Qty::TransitDurationFull => DURATION,
        Qty::RvAmplitude => SPEED,
        Qty::TransitDepth => DEPTH,
        _ => &[],
    }
}

/// Whether a value written in `written` (`None`: a plain number) was written in a unit of
/// size `si` ("a fraction" is a plain number, or one written with the unit `1`).
fn written_in(written: Option<&str>, si: f64) -> bool {
    let size = match written.map(str::trim) {
        None | Some("") => 1.0,
        Some(text) => match crate::units::parse_unit_text(text) {
            Some(u) => u.factor,
            None => return false,
        },
    };
    (size / si - 1.0).abs() < 1e-9
}

/// Another reading of a value: multiply it by `factor` to read it in `meant` instead of
/// `written`.
#[derive(Debug, Clone, Copy)]
pub(super) struct Reading {
    pub factor: f64,
    pub written: &'static str,
    pub meant: &'static str,
}

impl Reading {
    /// `(318 times larger)`.
    fn change(&self) -> String {
        let (times, way) = if self.factor >= 1.0 {
            (self.factor, "larger")
        } else {
            (1.0 / self.factor, "smaller")
        };
        format!("({} times {way})", crate::format::sig(times, 3))
    }

    /// `was it written in Mearth where Mjup was meant?`
    fn question(&self) -> String {
        format!(
            "was it written in {} where {} was meant?",
            self.written, self.meant
        )
    }
}

/// The other readings of a value of `q` written in `written` (`None`: a plain number): for
/// each pair of `q`'s units that holds the unit written, the value read in the other.
pub(super) fn readings(q: Qty, written: Option<&str>) -> Vec<Reading> {
    let mut out = Vec::new();
    for &((big, big_si), (small, small_si)) in pairs(q) {
        if written_in(written, small_si) {
            out.push(Reading {
                factor: big_si / small_si,
                written: small,
                meant: big,
            });
        } else if written_in(written, big_si) {
            out.push(Reading {
                factor: small_si / big_si,
                written: big,
                meant: small,
            });
        }
    }
    out
}

/// When `declared`, written (in `written`) in one unit of a pair of `q`'s, would fit the
/// derived value (`fits`) had it been written in the other unit, the words that say which
/// unit was probably written for which.
pub(super) fn unit_slip(
    q: Qty,
    written: Option<&str>,
    declared: f64,
    fits: impl Fn(f64) -> bool,
) -> Option<String> {
    if !(declared.is_finite() && declared > 0.0) {
        return None;
    }
    let r = readings(q, written)
        .into_iter()
        .find(|r| fits(declared * r.factor))?;
    Some(format!(
        "read in {} instead of {} {}, the declared value fits the derived one: {}",
        r.meant,
        r.written,
        r.change(),
        r.question()
    ))
}

/// The words for a measurement `name` upstream of a route whose value, with the measurement
/// read as `r`, becomes `shown` and fits what it is compared with (`other`).
pub(super) fn upstream_slip(name: &str, r: &Reading, shown: &str, other: &str) -> String {
    format!(
        "read in {} instead of {} {}, {name} makes this route give {shown}, which fits {other}: {}",
        r.meant,
        r.written,
        r.change(),
        r.question().replacen("it", name, 1)
    )
}

/// Whether `x` and `derived` agree to within 5 % (the test of a slip where the
/// uncertainties say nothing better).
pub(super) fn within_ratio(x: f64, derived: f64) -> bool {
    (x / derived).ln().abs() < WITHIN.ln()
}

#[cfg(test)]
mod tests {
    use super::*;

    fn near(derived: f64) -> impl Fn(f64) -> bool {
        move |x| within_ratio(x, derived)
    }

    #[test]
    fn the_ratios_of_common_units_are_named() {
        // A mass written as 1.05 Mearth for a planet of about 1.05 Mjup (the IAU 2015 B3
        // nominal masses: Mjup / Mearth = 317.83).
        let m = unit_slip(
            Qty::Mass,
            Some("Mearth"),
            1.05 * M_EARTH,
            near(1.02 * M_JUPITER),
        )
        .unwrap();
        assert!(
            m.contains("318 times larger") && m.contains("written in Mearth where Mjup was meant"),
            "{m}"
        );
        // A radius in Rjup meant as Rearth: 11.2 times too large.
        let m = unit_slip(
            Qty::Radius,
            Some("Rjup"),
            2.05 * R_JUPITER,
            near(2.0 * R_EARTH),
        )
        .unwrap();
        assert!(
            m.contains("11.2 times smaller")
                && m.contains("written in Rjup where Rearth was meant"),
            "{m}"
        );
        // An amplitude in km/s meant as m/s, in either spelling of the unit.
        for unit in ["km/s", "km s^-1"] {
            assert!(unit_slip(Qty::RvAmplitude, Some(unit), 25e3, near(24.0))
                .unwrap()
                .contains("km/s where m/s"));
        }
        // A transit duration in minutes meant as hours; a depth as a fraction meant as %.
        assert!(unit_slip(
            Qty::TransitDuration,
            Some("min"),
            2.5 * 60.0,
            near(2.5 * 3600.0)
        )
        .unwrap()
        .contains("written in min where h was meant"));
        assert!(unit_slip(Qty::TransitDepth, None, 0.8, near(0.008))
            .unwrap()
            .contains("written in a fraction where % was meant"));
        // A plain disagreement of a factor of two names no unit.
        assert!(unit_slip(Qty::Mass, Some("Mjup"), 2.0 * M_JUPITER, near(M_JUPITER)).is_none());
        assert!(unit_slip(Qty::Teq, Some("K"), 1000.0, near(10.0)).is_none());
    }

    #[test]
    fn the_ratio_alone_is_not_enough() {
        // 1000 times the derived mass is near Msun/Mjup (1047.6), but a mass written in
        // Mearth was written in neither unit: an amplitude in km/s, not the mass, is the
        // likely slip.
        assert!(unit_slip(Qty::Mass, Some("Mearth"), 1047.0 * M_EARTH, near(M_EARTH)).is_none());
        // Written in Msun, it is named.
        assert!(unit_slip(Qty::Mass, Some("Msun"), M_SUN, near(M_JUPITER)).is_some());
        // 7 % off the ratio is more than a slip of units explains.
        assert!(unit_slip(Qty::Mass, Some("Mearth"), M_EARTH, near(1.07 * M_JUPITER)).is_none());
        assert!(unit_slip(Qty::Mass, Some("Mearth"), M_EARTH, near(1.04 * M_JUPITER)).is_some());
        // An unreadable unit names nothing.
        assert!(unit_slip(Qty::Mass, Some("M??"), M_EARTH, near(M_JUPITER)).is_none());
    }
}
