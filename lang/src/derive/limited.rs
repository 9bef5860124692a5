//! Derived values that rest mostly on one declared limit are given as limits themselves
//! (`rv_amplitude < 5 m/s` makes the mass `< X`), in both propagation modes.

use super::validity::{LIMITED, LIMIT_SHARE};
use super::*;

/// A value given as a limit: its key, its slope along its dominant limit, and that limit's
/// share of its variance.
type Limited = (Key, f64, f64);

impl<'m> Derivation<'m> {
    /// Derived values that rest mostly (at least [`LIMIT_SHARE`] of their first-order
    /// variance) on one declared limit are limits themselves: a mass from `rv_amplitude < 5
    /// m/s` is `mass < X`, not a two-sided interval spread over the range the limit leaves
    /// open. X is the value with that limit taken at the limit and the other inputs at their
    /// values, the usual way to carry a limit through a formula (common practice); whether
    /// it is an upper or a lower limit follows from the direction the value moves with the
    /// input. Applies in both propagation modes.
    pub(super) fn bound_where_limited(&mut self) {
        // The value's dominant limit first, then the other limits it rests on, pinned
        // together: each key with its slope and share along the dominant one.
        let mut by_limits: BTreeMap<Vec<(u32, bool)>, Vec<Limited>> = BTreeMap::new();
        // A value's share of its variance from relations' scatter (a prediction's own, or
        // that of a prediction it rests on: an amplitude from a predicted mass).
        let mut scattered: FxHashMap<Key, f64> = FxHashMap::default();
        let scatter: FxHashSet<u32> = self.widened.values().map(|w| w.input).collect();
        for (key, entry) in &self.entries {
            if !entry.origin.is_computed() || entry.value.grad.is_empty() {
                continue;
            }
            let mut budget = entry.value.budget(&self.inputs);
            // A relation's scatter is no measurement and bounds nothing: the limit's share is
            // counted among the measurements' variance (a mass predicted from a radius
            // `< 1.9 Rearth` is a limit however wide the relation).
            let share: f64 = budget
                .iter()
                .filter(|b| scatter.contains(&b.0))
                .map(|b| b.1)
                .sum();
            if share > 0.0 {
                budget.retain(|b| !scatter.contains(&b.0));
                if share < 1.0 {
                    budget.iter_mut().for_each(|b| b.1 /= 1.0 - share);
                }
                scattered.insert(*key, share);
            }
            let Some(&(id, share)) = budget.first() else {
                continue;
            };
            // A limit on an angle around a turn bounds no value at that limit: the value
            // need not move one way with it (a duration is shortest at 90 deg and longest at
            // 270 deg), so such a value keeps its interval over the range the limit leaves.
            let limit_of = |id: u32| {
                self.inputs
                    .get(id as usize)
                    .filter(|i| !i.periodic)
                    .and_then(|i| i.limit)
            };
            let slope_of = |id: u32| {
                entry
                    .value
                    .grad
                    .iter()
                    .find(|g| g.0 == id)
                    .map_or(0.0, |g| g.1)
            };
            // Whether taking input `id` at its limit bounds the value from above.
            let bounds_above = |id: u32| {
                limit_of(id).map(|(form, _)| (form == Form::UpperLimit) == (slope_of(id) > 0.0))
            };
            let slope = slope_of(id);
            let Some(above) = bounds_above(id) else {
                continue;
            };
            if share < LIMIT_SHARE || slope == 0.0 {
                continue;
            }
            // Other limits it rests on, however small their share, are taken at the end of
            // their range that bounds it from the same side (one left at the middle of its
            // range would move the bound: a minimum mass < 6.71 Mearth, not < 6.72): the limit itself, or for one that pulls the other way the
            // other end of its range (an eccentricity `< 0.2` at 0). Where that end is open
            // or makes the value vanish, there is no bound (see below).
            let mut set = vec![(id, false)];
            set.extend(
                budget
                    .iter()
                    .skip(1)
                    .filter_map(|&(other, _)| bounds_above(other).map(|b| (other, b != above))),
            );
            by_limits.entry(set).or_default().push((*key, slope, share));
        }
        let options = Options {
            propagation: Propagation::Linear,
            ..self.options.clone()
        };
        for (ids, keys) in by_limits {
            let limits: Vec<(&InputInfo, Form, f64, bool)> = ids
                .iter()
                .filter_map(|&(id, other_end)| {
                    let input = self.inputs.get(id as usize)?;
                    let (form, limit) = input.limit?;
                    Some((input, form, limit, other_end))
                })
                .collect();
            let Some(&(_, form, _, _)) = limits.first() else {
                continue;
            };
            let pinned = limits
                .iter()
                .map(|l| {
                    let at = if l.3 { PinAt::OtherEnd } else { PinAt::Limit };
                    (l.0.label.clone(), at)
                })
                .collect();
            let focus = self.cone(keys.iter().map(|k| &k.0));
            // Every limit at its other end: what bounds the value from the other side (an
            // albedo `< 0.3` taken at 0 bounds Teq from above), where that end is finite.
            let flipped = limits
                .iter()
                .map(|l| {
                    let at = if l.3 { PinAt::Limit } else { PinAt::OtherEnd };
                    (l.0.label.clone(), at)
                })
                .collect();
            let at_other_end = Derivation::run_pinned(
                self.sys,
                &options,
                self.lines,
                flipped,
                Some(focus.clone()),
            );
            let at_limit =
                Derivation::run_pinned(self.sys, &options, self.lines, pinned, Some(focus));
            let described: Vec<String> = limits
                .iter()
                .map(|(i, f, l, other_end)| {
                    let declared = format!("{} {}", i.label, self.limit_words(i, *f, *l));
                    if *other_end {
                        format!("{declared} at the other end of its range")
                    } else {
                        declared
                    }
                })
                .collect();
            let (first, rest) = described
                .split_first()
                .map_or(("", &[][..]), |(f, r)| (f.as_str(), r));
            let also = if rest.is_empty() {
                String::new()
            } else {
                format!(
                    ", with {} (the end that bounds it from that side)",
                    crate::text::and_list(rest)
                )
            };
            for (key, slope, share) in keys {
                let Some(v) = at_limit.value(key).map(|v| v.nominal) else {
                    continue;
                };
                // An open end, or one where the value vanishes (a scale height at an albedo
                // of 1, where Teq is 0), bounds nothing: the value keeps its interval.
                if !v.is_finite() || v == 0.0 {
                    continue;
                }
                // A limit that moves the value by under a part in a thousand over its whole
                // range (a planet's mass limit in Kepler's third law, beside exact period and
                // star mass) bounds nothing worth saying: "between 0.0385 au and 0.0385 au".
                // The value keeps its interval.
                let whole_range = at_other_end.value(key).map(|o| o.nominal);
                if whole_range.is_some_and(|o| o.is_finite() && (o - v).abs() <= 1e-3 * v.abs()) {
                    continue;
                }
                let upper = (form == Form::UpperLimit) == (slope > 0.0);
                let result = if upper {
                    Form::UpperLimit
                } else {
                    Form::LowerLimit
                };
                // The other side, when the other ends bound it there: a value that lies past
                // the limit's value on the side the limit leaves open.
                let other = at_other_end
                    .value(key)
                    .map(|o| o.nominal)
                    .filter(|o| o.is_finite() && *o != 0.0 && (*o > v) != upper && *o != v);
                let between = match other {
                    Some(o) => {
                        let unit = summary::display_unit(key.1, v);
                        // Three significant digits, as the range is shown (0.0220, 1055).
                        let shown = |x: f64| super::slips::three_digits(unit, x);
                        let (lo, hi) = if o < v { (o, v) } else { (v, o) };
                        format!(
                            "; taken at the other end of the range instead, it is {}, so it lies between {} and {}",
                            shown(o),
                            shown(lo),
                            shown(hi)
                        )
                    }
                    None => String::new(),
                };
                // What the other inputs' uncertainties would add is left out of the limit:
                // said when it is not negligible, so the bound is not read as a safe one.
                let rest = 100.0 - (share * 100.0).min(100.0);
                let mut unwidened = if rest >= 5.0 {
                    format!("; the uncertainties of the other inputs ({rest:.0}% of the variance) do not widen it")
                } else {
                    String::new()
                };
                if let Some(s) = scattered.get(&key).filter(|s| **s >= 0.05) {
                    unwidened.push_str(&format!(
                        "; it rests on a relation's mean at that limit, and the relation's scatter ({:.0}% of the variance) does not widen it: a planet there may lie above or below the mean",
                        s * 100.0
                    ));
                }
                let of = if scattered.contains_key(&key) {
                    "its measurements' variance"
                } else {
                    "its variance"
                };
                let words = format!(
                    "{} is {LIMITED}: {:.0}% of {of} comes from {first}, so it is given at that limit{also}, with the other inputs at their values (common practice){unwidened}{between}",
                    self.key_name(key),
                    (share * 100.0).min(100.0),
                );
                self.bounded.insert(key, (v, result, words, other));
            }
        }
    }

    /// A declared limit as people read it (`< 5 m/s`), its quantity from the input's label.
    fn limit_words(&self, input: &InputInfo, form: Form, limit: f64) -> String {
        let qty = input.label.split_once('.').and_then(|(body, name)| {
            let kind = self.sys.bodies.iter().find(|b| b.id == body)?.kind;
            quantities::find(kind, name).map(|d| d.qty)
        });
        match qty {
            Some(q) => {
                crate::report::shown_in(limit, 0.0, 0.0, form, summary::display_unit(q, limit))
            }
            None => format!(
                "{} {}",
                if form == Form::UpperLimit { "<" } else { ">" },
                crate::format::number(limit)
            ),
        }
    }
}
