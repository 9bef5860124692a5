//! Unit slips behind an inconsistency: a declared value that differs from the derived one by
//! the ratio of two units its quantity is commonly written in (a planet's mass written in
//! Mearth where Mjup was meant is 318 times too small). The finding then names the two
//! units, which says more than "check the units". A ratio alone is not enough: the value
//! must have been written in the unit the slip would have used (an amplitude in km/s meant
//! as m/s makes a mass about 1000 times too large, near Msun/Mjup, though no mass was written
//! in either), and the ratio must hold within 5 %.

use super::rules::{RuleDef, RULES};
use super::{Derivation, DisplayUnit, Key, SortedSet, Value};
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
        (("Msun", M_SUN), ("Mearth", M_EARTH)),
    ];
    const RADIUS: &[Pair] = &[
        (("Rjup", R_JUPITER), ("Rearth", R_EARTH)),
        (("Rsun", R_SUN), ("Rjup", R_JUPITER)),
        (("Rsun", R_SUN), ("Rearth", R_EARTH)),
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
        // A star's mass and radius are read in a planet's units only one way (see
        // [`readings`]).
        Qty::Mass | Qty::MinMass | Qty::StarMass => MASS,
        Qty::Radius | Qty::StarRadius => RADIUS,
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
        // A plain number is written as a fraction, not in one.
        let written = match self.written {
            "a fraction" => "as a fraction".to_string(),
            unit => format!("in {unit}"),
        };
        format!("was it written {written} where {} was meant?", self.meant)
    }
}

/// The other readings of a value of `q` written in `written` (`None`: a plain number): for
/// each pair of `q`'s units that holds the unit written, the value read in the other.
pub(super) fn readings(q: Qty, written: Option<&str>) -> Vec<Reading> {
    let mut out = Vec::new();
    // A star's mass or radius written in a planet's unit may have been meant in the Sun's,
    // and a planet's written in the Sun's in a planet's; the other way round would make a
    // brown dwarf of the star, or a star of the planet, which no slip explains.
    let solar = |u: &str| u == "Msun" || u == "Rsun";
    let meant_ok = |meant: &str| match q {
        Qty::StarMass | Qty::StarRadius => solar(meant),
        Qty::Mass | Qty::MinMass | Qty::Radius => !solar(meant),
        _ => true,
    };
    for &((big, big_si), (small, small_si)) in pairs(q) {
        if written_in(written, small_si) && meant_ok(big) {
            out.push(Reading {
                factor: big_si / small_si,
                written: small,
                meant: big,
            });
        } else if written_in(written, big_si) && meant_ok(small) {
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

/// The help that names the readings found (each `read in ... instead of ...: was it
/// written in ...?`), as one sentence each; `None` when there are none.
pub(crate) fn readings_help(found: &[String]) -> Option<String> {
    (!found.is_empty()).then(|| crate::text::sentence_case(&found.join(" Or, ")))
}

/// Whether `x` and `derived` agree to within 5 % (the test of a slip where the
/// uncertainties say nothing better).
pub(super) fn within_ratio(x: f64, derived: f64) -> bool {
    (x / derived).ln().abs() < WITHIN.ln()
}

/// Whether `x`, a reading of one side, fits `o`, the other side's value, with `sigma` the
/// combined standard deviation at `x`: within `threshold` of it (or 5 %) when the two should
/// be equal (`order` `None`); on the right side of it and within a factor of 10 when one may
/// not exceed the other (`Some(true)`: `x` may not exceed `o`), since any large enough unit
/// would pass the order alone.
fn fits(x: f64, o: f64, sigma: f64, threshold: f64, order: Option<bool>) -> bool {
    match order {
        None => (x - o).abs() <= threshold * sigma || within_ratio(x, o),
        Some(true) => x <= o + threshold * sigma && x >= o / 10.0,
        Some(false) => x >= o - threshold * sigma && x <= o * 10.0,
    }
}

/// `x` (SI) in `unit` to three significant digits, with the unit unless a plain number.
pub(super) fn three_digits(unit: DisplayUnit, x: f64) -> String {
    let n = crate::format::sig(unit.of(x), 3);
    if unit.symbol == "1" {
        n
    } else {
        format!("{n} {unit}")
    }
}

/// How many rules deep a unit slip is traced up a route.
pub(super) const REEVALUATE_DEPTH: usize = 8;

impl<'m> Derivation<'m> {
    /// Each declared measurement among `leaves` read in the other unit of a common pair, with
    /// the value `rule` on `inputs` then gives (`None` where it gives none): what every search
    /// for a unit slip up a route tries.
    fn leaf_readings<'k>(
        &'k self,
        rule: usize,
        inputs: &'k [Key],
        leaves: impl IntoIterator<Item = Key> + 'k,
    ) -> impl Iterator<Item = (Key, Reading, Option<f64>)> + 'k {
        leaves.into_iter().flat_map(move |leaf| {
            // A leaf with no declaration of its own (a default) has no unit to have slipped.
            let found = self
                .declaration_used(leaf)
                .map_or_else(Vec::new, |d| readings(leaf.1, d.written_unit.as_deref()));
            found.into_iter().map(move |r| {
                let x = self.reevaluate(rule, inputs, leaf, r.factor, 0);
                (leaf, r, x)
            })
        })
    }

    /// For a rule of body `bi` that had every input but no solution: each declared transit
    /// duration of a quarter of the period or more (longer than any transit lasts) that, read
    /// in the smaller unit of a common pair, gives it one (a total transit duration written
    /// in days where hours were meant), in words. Other inputs are not read otherwise: for
    /// durations that merely contradict each other, some reading of some input nearly
    /// always gives a solution, and naming it would mislead.
    pub fn solving_readings(&self, bi: usize, rule: &RuleDef) -> Vec<String> {
        let Some((ri, ins)) = self.no_solution.iter().find(|(ri, ins)| {
            RULES.get(*ri).is_some_and(|r| std::ptr::eq(r, rule)) && ins.iter().any(|k| k.0 == bi)
        }) else {
            return Vec::new();
        };
        let period = ins
            .iter()
            .find(|k| k.1 == Qty::Period)
            .and_then(|k| self.entries.get(k))
            .map(|e| e.value.nominal);
        let too_long = |leaf: &Key| {
            matches!(leaf.1, Qty::TransitDuration | Qty::TransitDurationFull)
                && self.entries.get(leaf).is_some_and(|e| {
                    e.rule.is_none() && period.is_some_and(|p| e.value.nominal >= p / 4.0)
                })
        };
        let leaves: Vec<Key> = ins.iter().copied().filter(too_long).collect();
        self.leaf_readings(*ri, ins, leaves)
            .filter(|(_, r, x)| r.factor < 1.0 && x.is_some())
            .map(|(leaf, r, _)| {
                let name = self.key_name(leaf);
                format!(
                    "read in {} instead of {} {}, {name} gives {} a solution: {}",
                    r.meant,
                    r.written,
                    r.change(),
                    rule.id,
                    r.question().replacen("it", &name, 1)
                )
            })
            .collect()
    }

    /// `brisk.mass is derived (mass-from-density) from b.period, b.scaled_semi_major_axis
    /// and brisk.radius`: the rule of a derived value and the measurements it rests on, when
    /// one of them is another body's (a value from the body's own measurements points at
    /// their units).
    pub fn route_words(&self, key: Key) -> Option<String> {
        let e = self.entries.get(&key)?;
        let rule = RULES.get(e.rule?)?;
        let deps = self.declared_deps(&e.deps);
        if deps.iter().all(|k| k.0 == key.0) {
            return None;
        }
        let names: Vec<String> = deps.iter().map(|k| self.key_name(*k)).collect();
        Some(format!(
            "{} is derived ({}) from {}",
            self.key_name(key),
            rule.id,
            crate::text::and_list(&names)
        ))
    }

    /// For a derived value `key` that a check finds implausible: each declared measurement
    /// up its route that, read in the other unit of a common pair, would make it plausible
    /// (`ok`, on the SI value), in words (`fits` names what it would then be); empty when
    /// the value is declared or no reading helps.
    pub fn plausible_readings(
        &self,
        key: Key,
        ok: impl Fn(f64) -> bool,
        fits: &str,
    ) -> Vec<String> {
        let Some(e) = self.entries.get(&key) else {
            return Vec::new();
        };
        let Some(rule) = e.rule else {
            return Vec::new();
        };
        let leaves: Vec<Key> = self.declared_deps(&e.deps).iter().copied().collect();
        self.leaf_readings(rule, &e.inputs, leaves)
            .filter_map(|(leaf, r, x)| x.filter(|x| ok(*x)).map(|x| (leaf, r, x)))
            .map(|(leaf, r, x)| {
                let shown = three_digits(super::display_unit(key.1, x), x);
                upstream_slip(&self.key_name(leaf), &r, &shown, fits)
            })
            .collect()
    }

    /// The unit help for declared `k` (value `declared`) against `other`: a unit slip of
    /// the declaration, read in the other unit of a common pair, after which the two would
    /// fit (see [`super::slips`]). `order`: `None` when the two should be equal; `Some(true)`
    /// when the declared value may not exceed `other` (a true mass below its minimum mass is
    /// the other way round: `Some(false)`), and then it must also come within a factor of
    /// 10 of it, since any large enough unit would pass the order alone.
    pub(super) fn slip(
        &self,
        k: Key,
        declared: &Value,
        other: &Value,
        order: Option<bool>,
    ) -> Option<String> {
        let written = self.declaration_used(k)?.written_unit.as_deref();
        let (d, o) = (declared.nominal, other.nominal);
        let (sd, so) = (self.spread(declared), self.spread(other));
        let threshold = self.options.consistency_sigma;
        unit_slip(k.1, written, d, |x| {
            fits(x, o, (sd * x / d).hypot(so), threshold, order)
        })
    }

    /// A value's first-order standard uncertainty, the mean of its two sides.
    fn spread(&self, v: &Value) -> f64 {
        let (lo, hi) = v.linear_spread(&self.inputs);
        (lo + hi) / 2.0
    }

    /// A unit slip further up a route: one declared measurement `route` rests on (and
    /// `other` does not), read in the other unit of a common pair, makes the route, evaluated
    /// again through its rules, fit `other` (a period in hours meant as days, seen only
    /// through the star's mass from Kepler's third law: 576 times off).
    /// `order`: `None` when the route's value and `other` should be equal; `Some(true)` when
    /// the route's value may not exceed `other` (a minimum mass against a declared true
    /// mass), `Some(false)` when it may not fall below it; then the reading must also bring
    /// it within a factor of 10, as for a declared value.
    pub(super) fn upstream_slip(
        &self,
        route: (usize, &[Key], &Value, &SortedSet<Key>),
        other: (&Value, &SortedSet<Key>, &str),
        unit: DisplayUnit,
        order: Option<bool>,
    ) -> Vec<String> {
        let (rule, inputs, value, deps) = route;
        let (target, other_deps, other_name) = other;
        let (sv, st) = (self.spread(value), self.spread(target));
        let threshold = self.options.consistency_sigma;
        let leaves: Vec<Key> = self
            .declared_deps(deps)
            .iter()
            .copied()
            .filter(|k| !other_deps.contains(k))
            .collect();
        self.leaf_readings(rule, inputs, leaves)
            .filter_map(|(leaf, r, x)| {
                let x = x?;
                let sigma = (sv * x / value.nominal).abs().hypot(st);
                fits(x, target.nominal, sigma, threshold, order).then(|| {
                    upstream_slip(&self.key_name(leaf), &r, &three_digits(unit, x), other_name)
                })
            })
            .collect()
    }

    /// `rule` on `inputs` again, with declared `leaf` multiplied by `factor` wherever the
    /// inputs rest on it (through their own rules, at most [`REEVALUATE_DEPTH`] deep).
    fn reevaluate(
        &self,
        rule: usize,
        inputs: &[Key],
        leaf: Key,
        factor: f64,
        depth: usize,
    ) -> Option<f64> {
        if depth > REEVALUATE_DEPTH {
            return None;
        }
        let args = inputs
            .iter()
            .map(|k| {
                let e = self.entries.get(k)?;
                if *k == leaf {
                    Some(e.value.nominal * factor)
                } else if !e.deps.contains(&leaf) {
                    Some(e.value.nominal)
                } else {
                    self.reevaluate(e.rule?, &e.inputs, leaf, factor, depth + 1)
                }
            })
            .collect::<Option<Vec<f64>>>()?;
        (RULES.get(rule)?.eval)(&args).filter(|v| v.is_finite())
    }
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
            .contains("written as a fraction where % was meant"));
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
