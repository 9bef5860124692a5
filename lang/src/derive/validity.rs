//! Where first-order propagation can be trusted, and sampling where it cannot.
//!
//! First-order propagation describes a derived value by its derivatives at the inputs'
//! values and the inputs' standard uncertainties. That is exact for linear functions of
//! normal inputs and good while the function is nearly linear over the inputs' spread
//! (JCGM 100:2008, the GUM, 5.1.2; JCGM 101:2008, its Monte Carlo supplement, 5.7 and 8,
//! for when it is not). It fails, in ways that reach papers, when
//! - an input is not close to normal: a limit, an angle spread over a full turn, a strongly
//!   asymmetric interval (its standard uncertainty no longer says where the probability
//!   is); or
//! - the derived value's uncertainty is a large fraction of the value: products and powers
//!   of such values are skewed, and a symmetric first-order interval reaches zero or below
//!   for quantities that cannot be negative (a planet's density at low signal-to-noise).
//!
//! In first-order mode the engine finds those derived values ([`Derivation::doubts`]) and
//! gives them Monte Carlo intervals instead, saying so in each value's assumptions; every
//! other value keeps its first-order interval.

use super::value::Shape;
use super::*;

/// A derived value whose first-order uncertainty (either side) is more than this fraction
/// of the value is sampled: beyond it the second-order terms of a product or power shift
/// the interval ends by more than a tenth of the uncertainty (common practice: the first-
/// order formula for `x^n` misses the `n(n-1)/2 (s/x)^2` term).
pub const RELATIVE_LIMIT: f64 = 0.25;
/// A value whose moves to an asymmetric input's two sides differ from its slope's prediction
/// by more than this fraction of its uncertainty is sampled: the second-order term first
/// order leaves out shifts its interval ends by that much (the same tenth as
/// [`RELATIVE_LIMIT`] allows).
pub const CURVATURE_LIMIT: f64 = 0.1;
/// An angle measured with a standard uncertainty above this (radians: 5 deg) has its sides
/// checked like an asymmetric input's ([`Derivation::sample_where_doubtful`]): over it a
/// sine departs from its tangent by up to 0.4 % of its amplitude, and at a flat point
/// (an argument of periastron of 90 deg) that departure is all the spread there is.
pub const WIDE_ANGLE: f64 = 5.0 * std::f64::consts::PI / 180.0;

/// A measurement whose standard uncertainty is more than this fraction of its value (on a
/// quantity with a true zero) has the values resting on it checked at its two sides, as an
/// asymmetric input's are: a power `x^n` of it bends within that spread, and its interval
/// ends move by about `|n - 1| s / 2` of the uncertainty for a relative uncertainty `s`
/// (the second-order term `n (n - 1)/2 s^2` over the first-order `n s`), a tenth
/// ([`CURVATURE_LIMIT`]) at 5 % for the steepest power the rules take (a density's `R^-3`).
/// A scale height (`1/Mp`) from a mass known to 20 % passed [`RELATIVE_LIMIT`] and had its
/// upper end a quarter of its uncertainty short.
pub const WIDE_RELATIVE: f64 = 0.05;

/// The share of an input's stated distribution outside its quantity's range beyond which
/// first order, which takes the stated normal, does not describe it: samples are kept inside
/// the range (an impact parameter of 0.02 +- 0.2 has 46 % of it below 0, and an inclination
/// from it was 0.94 of its uncertainty from Monte Carlo's); at 3 % the kept distribution's
/// 16th percentile moves by a tenth of its uncertainty (the tenth [`CURVATURE_LIMIT`]
/// allows).
pub const OUTSIDE_LIMIT: f64 = 0.03;

/// A derived value to which inputs that are not normal contribute at least this share of
/// the first-order variance is sampled.
pub const SHARE_LIMIT: f64 = 0.05;
/// The most draws taken for those values: their interval ends are then good to about 2 %
/// of the uncertainty (the standard error of a 16th percentile of `n` normal draws is
/// sqrt(0.16 * 0.84 / n) / 0.24 standard deviations), and first-order mode stays quick
/// enough for an editor.
pub const MOST_SAMPLES: usize = 4_000;

/// Whether a quantity is measured from a true zero (it cannot be negative: a mass, a
/// radius, a flux, a duration). Only for those does an uncertainty that is a large fraction
/// of the value mean a skewed distribution ([`RELATIVE_LIMIT`]); a quantity on a scale with
/// no physical zero (a position in the habitable zone, a magnitude, a logarithm such as
/// log g) can sit near 0 with no skew at all, and its relative uncertainty says nothing.
pub fn ratio_scale(q: Qty) -> bool {
    use quantities::Bound;
    // An inclination is measured from 0, but what matters is its distance from 90 deg (edge
    // on): 88.2 ± 0.7 deg is a small fraction of its value and still bends as an impact
    // parameter near 0 folds it at 90 deg.
    if q == Qty::Inclination {
        return false;
    }
    match quantities::def(q).min {
        Bound::Inclusive(m) | Bound::Exclusive(m) => m >= 0.0,
        Bound::None => false,
    }
}

/// How many standard uncertainties above an impact parameter the grazing region must
/// start for first order to be trusted with the radius ratio solved from it (see
/// `Derivation::may_graze`): beyond 2, fewer than 2.3 % of its draws graze.
const GRAZING_SIGMAS: f64 = 2.0;

/// A derived value resting on a declared limit for at least this share of its first-order
/// variance is given as a limit (see [`Derivation::bound_where_limited`]).
pub const LIMIT_SHARE: f64 = 0.5;

/// The derived values first order cannot describe ([`Derivation::doubts`]).
struct Doubted {
    /// Each with why, in words.
    why: FxHashMap<Key, String>,
    /// Those doubted only for asymmetric inputs.
    only_skew: FxHashSet<Key>,
    /// Those doubted only for inputs that are not normal (asymmetric, limits, spread angles,
    /// reaching past their range): a value resting on one of them takes those inputs' shares
    /// into its own budget, so it is doubted for them itself where they matter to it.
    by_inputs: FxHashSet<Key>,
    /// Those doubted only for the size of their uncertainty.
    only_size: FxHashSet<Key>,
    /// Those doubted only for one angle spread over a full turn (an orbit's unknown
    /// orientation), with that input (the width it gives them aside).
    only_turn: FxHashMap<Key, u32>,
}

/// Values the exact path may take, by the one asymmetric input each is doubted for, each with
/// the rest of its spread ([`Rest`]).
pub(super) type ByInput = BTreeMap<u32, Vec<(Key, Rest)>>;

/// The rest of a value's first-order spread beside its one asymmetric input: a normal of
/// standard deviation `sd` about `shift`, the mean offset of the small asymmetric inputs
/// folded into it (see [`Derivation::one_skewed_input`]).
#[derive(Debug, Clone, Copy, PartialEq)]
pub(super) struct Rest {
    pub sd: f64,
    pub shift: f64,
}

/// How the assumption that a value was given as a limit begins.
pub const LIMITED: &str = "a limit, not an interval";

/// How the assumption that a value was sampled begins.
pub const SAMPLED: &str = "sampled, not first-order";

/// How the assumption that a value's interval keeps an asymmetric input's two sides begins.
pub const TWO_LINES: &str = "first order with an asymmetric input's distribution kept";

/// How the assumption that a value's interval carries a wide measurement's two sides
/// through the formulas begins (see [`WIDE_RELATIVE`]).
pub const WIDE_KEPT: &str = "first order with a wide measurement's two sides carried exactly";

/// How the assumption that a prediction's interval keeps its relation's log-normal scatter
/// begins (see [`super::scatter`]).
pub const SCATTER_KEPT: &str = "first order with the relation's log-normal scatter kept";

/// How the assumption that a value's interval was integrated over an orbit's unknown
/// orientation begins (see [`super::turn`]).
pub const TURN_KEPT: &str = "first order at every orientation of the orbit";

/// Whether an assumption says how one value's interval was found in place of first order
/// (sampled, or a distribution kept exactly): a note of that value, not of the system.
pub fn is_interval_note(a: &str) -> bool {
    [SAMPLED, TWO_LINES, WIDE_KEPT, SCATTER_KEPT, TURN_KEPT]
        .iter()
        .any(|p| a.starts_with(p))
}

/// Whether a value of a first-order analysis was sampled instead (see the module doc).
pub fn was_sampled(q: &QuantityResult) -> bool {
    q.assumptions.iter().any(|a| a.starts_with(SAMPLED))
}

/// Monte Carlo results for the values first-order propagation cannot describe.
pub(super) struct Sampled<'m> {
    pub derivation: Box<Derivation<'m>>,
    /// Each doubted value with why, in words.
    pub doubts: FxHashMap<Key, String>,
}

impl<'m> Derivation<'m> {
    /// Derived values whose first-order interval cannot be trusted, each with why, and which
    /// of them have one reason of a kind an exact path may answer.
    fn doubts(&self) -> Doubted {
        let mut out = FxHashMap::default();
        let mut only_skew = FxHashSet::default();
        let mut by_inputs = FxHashSet::default();
        let mut only_size = FxHashSet::default();
        let mut only_turn = FxHashMap::default();
        let grazing = self.may_graze();
        for (key, entry) in &self.entries {
            if !self.is_computed(*key, entry) || self.bounded.contains_key(key) {
                continue;
            }
            let on_angle_limit = self.angle_limit_under(*key, entry);
            if entry.value.grad.is_empty() && on_angle_limit.is_none() {
                continue;
            }
            let (lo, hi) = entry.value.linear_spread(&self.inputs);
            let size = entry.value.nominal.abs();
            let relative = lo.max(hi) / size.max(f64::MIN_POSITIVE);
            let mut why = Vec::new();
            let mut skew_only = true;
            // Doubted only for its inputs' shapes (see `Doubted::by_inputs`).
            let mut by_shape = true;
            let mut uniform = Vec::new();
            let too_wide = relative > RELATIVE_LIMIT && ratio_scale(key.1);
            if too_wide {
                skew_only = false;
                by_shape = false;
                why.push(if relative < 10.0 {
                    format!(
                        "its first-order uncertainty is {:.0}% of the value",
                        relative * 100.0
                    )
                } else {
                    "its first-order uncertainty is more than ten times the value".to_string()
                });
            }
            if self.near_branch_end(*key) {
                skew_only = false;
                by_shape = false;
                why.push(super::scatter::BRANCH_END.to_string());
            }
            if let Some(k) = grazing
                .iter()
                .find(|k| **k == *key || entry.deps.contains(k))
            {
                skew_only = false;
                by_shape = false;
                why.push(format!(
                    "the transit may be grazing within the uncertainty of {}.impact, where the depth no longer fixes Rp/R* alone (first order sees no slope along b short of it)",
                    self.sys.bodies.get(k.0).map_or("?", |b| b.id.as_str())
                ));
            }
            if let Some(label) = on_angle_limit {
                // At the middle of the range a limit leaves (`< 180 deg`: -90 deg), a
                // duration's slope along the angle is 0, so first order sees no spread at all.
                skew_only = false;
                by_shape = false;
                why.push(format!(
                    "{label} is a limit on an angle: the value need not move one way with it over the range the limit leaves, and first order sees only its slope at the middle of that range"
                ));
            }
            for (id, share) in entry.value.budget(&self.inputs) {
                let Some(input) = self.inputs.get(id as usize) else {
                    continue;
                };
                if share < SHARE_LIMIT {
                    continue;
                }
                let what = match input.shape {
                    Shape::Normal if input.outside > OUTSIDE_LIMIT => {
                        skew_only = false;
                        "reaches past its range (its samples are kept inside it)"
                    }
                    Shape::Normal => continue,
                    Shape::Uniform => {
                        skew_only = false;
                        uniform.push((id, input.limit.is_none()));
                        if input.limit.is_none() {
                            "is not known: spread uniformly over a full turn"
                        } else {
                            "is a limit, spread uniformly over the range it leaves open"
                        }
                    }
                    Shape::Skewed => "has a strongly asymmetric uncertainty",
                };
                why.push(format!("{} {what}", input.label));
            }
            if !why.is_empty() {
                if by_shape {
                    by_inputs.insert(*key);
                }
                if skew_only {
                    only_skew.insert(*key);
                } else if too_wide && why.len() == 1 {
                    only_size.insert(*key);
                } else if let [(id, true)] = uniform.as_slice() {
                    // An unknown orientation (no declared limit) alone, or with a width that
                    // is its own: the rest of the spread is within the limit.
                    let rest_narrow = || {
                        let (lo, hi) = entry.value.without(*id).linear_spread(&self.inputs);
                        lo.max(hi) <= RELATIVE_LIMIT * size
                    };
                    if why.len() == 1 || (why.len() == 2 && too_wide && rest_narrow()) {
                        only_turn.insert(*key, *id);
                    }
                }
                out.insert(*key, why.join("; "));
            }
        }
        Doubted {
            why: out,
            only_skew,
            by_inputs,
            only_size,
            only_turn,
        }
    }

    /// The radius ratios solved from a transit's depth and impact parameter where the impact
    /// parameter's upper side reaches the grazing region, `b + 2 sigma > 1 - Rp/R*` (2 % of
    /// its draws or more graze): short of it the depth gives `(Rp/R*)^2` whatever `b`, so
    /// first order sees no slope along `b` and no spread from it, while past it `Rp/R*` grows
    /// fast (a kink no slope describes). At one sigma, `b = 0.91 ± 0.05` with Rp/R* = 0.032
    /// (12 % of the draws grazing) was not caught, and its upper end was 0.39 of the
    /// uncertainty short.
    fn may_graze(&self) -> Vec<Key> {
        let mut out = Vec::new();
        for (bi, _) in self.sys.bodies.iter().enumerate() {
            let ratio = (bi, Qty::RadiusRatio);
            let Some(k) = self.entries.get(&ratio) else {
                continue;
            };
            let solved = k
                .rule
                .and_then(|r| RULES.get(r))
                .is_some_and(|r| r.id == "depth-impact-radius-ratio");
            let Some(b) = self.entries.get(&(bi, Qty::Impact)) else {
                continue;
            };
            let (_, above) = b.value.linear_spread(&self.inputs);
            let edge = 1.0 - k.value.nominal;
            if solved && b.value.nominal < edge && b.value.nominal + GRAZING_SIGMAS * above > edge {
                out.push(ratio);
            }
        }
        out
    }

    /// Whether a value is computed from others: derived or predicted by a rule, or declared
    /// as an expression (`radius = k * s.radius` propagates `k` and `s.radius` as a rule
    /// would, and first order may describe it as badly).
    fn is_computed(&self, key: Key, entry: &Entry) -> bool {
        entry.origin.is_computed()
            || (entry.rule.is_none()
                && self
                    .sys
                    .bodies
                    .get(key.0)
                    .and_then(|b| b.get(key.1))
                    .is_some_and(|d| matches!(d.content, Content::Expr(_))))
    }

    /// The label of the limit on an angle around a turn (an argument of periastron declared
    /// `< 180 deg`) that the value at `key` rests on, if any: found through the value's
    /// dependencies, as its slope along the angle may be 0 where first order takes it.
    fn angle_limit_under(&self, key: Key, entry: &Entry) -> Option<&str> {
        entry
            .deps
            .iter()
            .filter(|d| **d != key && d.1 == Qty::ArgPeriastron)
            .filter_map(|d| self.entries.get(d))
            .flat_map(|e| e.value.grad.iter())
            .filter_map(|(id, _)| self.inputs.get(*id as usize))
            .find(|i| i.periodic && i.limit.is_some())
            .map(|i| i.label.as_str())
    }

    /// Values whose size says nothing about how well first order describes them (see
    /// [`ratio_scale`]) are doubted when a value they rest on is: its skew passes on.
    fn inherit_doubts(&self, doubts: &mut FxHashMap<Key, String>) {
        let mut inherited = Vec::new();
        for (key, entry) in &self.entries {
            if ratio_scale(key.1)
                || doubts.contains_key(key)
                || !self.is_computed(*key, entry)
                || self.bounded.contains_key(key)
            {
                continue;
            }
            let mut from: Vec<&Key> = entry
                .deps
                .iter()
                .filter(|d| *d != key && doubts.contains_key(d))
                .collect();
            from.sort();
            if let Some(first) = from.first() {
                inherited.push((
                    *key,
                    format!(
                        "it rests on {}, which first order cannot describe",
                        self.key_name(**first)
                    ),
                ));
            }
        }
        doubts.extend(inherited);
    }

    /// `keys` and every key their values rest on.
    pub(super) fn cone<'k>(&self, keys: impl Iterator<Item = &'k Key>) -> FxHashSet<Key> {
        let mut out = FxHashSet::default();
        for k in keys {
            out.insert(*k);
            if let Some(e) = self.entries.get(k) {
                out.extend(e.deps.iter().copied());
            }
        }
        out
    }

    /// Of the values doubted only for an asymmetric input (`only_skew`), those the exact
    /// path may take, by their input with the rest of their spread
    /// ([`Derivation::one_skewed_input`]), and why each of the others is sampled all the
    /// same (it rests on a value in `doubts` for another reason, or its input reaches past
    /// its range).
    fn exact_candidates(
        &self,
        doubts: &FxHashMap<Key, String>,
        only_skew: &FxHashSet<Key>,
        by_inputs: &FxHashSet<Key>,
    ) -> (ByInput, FxHashMap<Key, String>) {
        let sampled_otherwise: FxHashSet<Key> = doubts
            .keys()
            .filter(|k| !by_inputs.contains(k))
            .copied()
            .collect();
        let mut by_input: ByInput = BTreeMap::new();
        let mut not_exact: FxHashMap<Key, String> = FxHashMap::default();
        for key in only_skew {
            let Some(e) = self.entries.get(key) else {
                continue;
            };
            if let Some(d) = e
                .deps
                .iter()
                .filter(|d| *d != key && sampled_otherwise.contains(d))
                .min()
            {
                not_exact.insert(
                    *key,
                    format!(
                        "it rests on {}, sampled for another reason",
                        self.key_name(*d)
                    ),
                );
                continue;
            }
            match self.one_skewed_input(&e.value) {
                Some((id, rest)) => by_input.entry(id).or_default().push((*key, rest)),
                None => {
                    let outside: Vec<&str> = e
                        .value
                        .grad
                        .iter()
                        .filter_map(|(id, _)| self.inputs.get(*id as usize))
                        .filter(|i| i.shape == Shape::Skewed && !i.inside())
                        .map(|i| i.label.as_str())
                        .collect();
                    if !outside.is_empty() {
                        not_exact.insert(
                            *key,
                            format!(
                                "the stated distribution of {} reaches past its range",
                                outside.join(", ")
                            ),
                        );
                    }
                }
            }
        }
        (by_input, not_exact)
    }

    /// In first-order mode, sample the system when some derived value cannot be described
    /// to first order: the doubted values take their intervals from the samples.
    pub(super) fn sample_where_doubtful(&mut self) {
        if self.options.propagation != Propagation::Linear {
            return;
        }
        let Doubted {
            why: mut doubts,
            only_skew,
            by_inputs,
            only_size,
            only_turn,
        } = self.doubts();
        // The inputs whose two sides the values are checked at: the strongly asymmetric
        // ones, angles measured loosely enough for their sines to bend within their
        // uncertainty (a duration at an argument of periastron of 90 +- 60 deg, flat there to
        // first order, spans 0.4 h to 1 h of Monte Carlo's), and measurements reaching past
        // their range (a duration is flat in an impact parameter of 0.02 +- 0.2 at its value,
        // so takes no share of its variance from it, yet its samples kept above 0 shorten
        // it: 0.4 of its uncertainty), and measurements whose uncertainty is a large part of
        // their value (see `WIDE_RELATIVE`).
        let shaped: FxHashSet<u32> = (0u32..)
            .zip(&self.inputs)
            .filter(|(_, i)| {
                i.shape == Shape::Skewed
                    || (i.shape == Shape::Normal
                        && ((i.angle && 0.5 * (i.below + i.above) > WIDE_ANGLE)
                            || i.outside > OUTSIDE_LIMIT))
            })
            .map(|(id, _)| id)
            .collect();
        // The wide ones are moved in groups of their own: a value flat in an angle at its
        // value (a duration at an argument of periastron of 90 deg) has no slope to keep the
        // angle out of a wide input's group, and its bend would be put down to that input.
        let wide: FxHashSet<u32> = (0u32..)
            .zip(&self.inputs)
            .filter(|(id, i)| i.wide && !shaped.contains(id))
            .map(|(id, _)| id)
            .collect();
        let skewed: FxHashSet<u32> = shaped.union(&wide).copied().collect();
        if doubts.is_empty() && skewed.is_empty() {
            return;
        }
        self.inherit_doubts(&mut doubts);
        // Why each value is doubted, before the exact paths take some (see the end).
        let first_why = doubts.clone();
        // A prediction doubted only for its relation's wide scatter takes that scatter's
        // log-normal exactly: no sampling for it.
        let not_widened = self.scatter_exactly(&mut doubts, &only_size);
        // A value doubted only for an orbit's unknown orientation is integrated over it.
        let not_turned = self.turn_exactly(&mut doubts, &only_turn, &by_inputs);
        // A value doubted only for one asymmetric input, and resting on no value sampled
        // for another reason, takes that input's two sides through its formulas exactly:
        // no sampling for it.
        let (by_input, mut not_exact) = self.exact_candidates(&doubts, &only_skew, &by_inputs);
        not_exact.extend(not_widened);
        not_exact.extend(not_turned);
        // The values first order passed, where the system has an asymmetric input: checked
        // at its sides for a curvature first order misses. Every such value, not only those
        // whose slopes name the input: at a flat point (a duration at an argument of
        // periastron of 90 deg) the slope is 0 and names nothing.
        let checked: Vec<Key> = if skewed.is_empty() {
            Vec::new()
        } else {
            self.entries
                .iter()
                .filter(|(k, e)| {
                    !doubts.contains_key(k)
                        && !self.bounded.contains_key(k)
                        && self.is_computed(**k, e)
                })
                .map(|(k, _)| *k)
                .collect()
        };
        if !by_input.is_empty() || !checked.is_empty() {
            let focus = self.cone(by_input.values().flatten().map(|(k, _)| k).chain(&checked));
            // Each group of inputs no value rests on two of is moved in runs of its own, so
            // that a value's move there is its one input's.
            let mut exact = Vec::new();
            let mut curved: Vec<(Key, String)> = Vec::new();
            let mut wide_carried: Vec<Key> = Vec::new();
            let mut shifts: FxHashMap<Key, f64> = FxHashMap::default();
            let groups = self.side_groups(&shaped);
            for group in groups.into_iter().chain(self.side_groups(&wide)) {
                let sides = self.at_sides(&group, &focus);
                let in_group: ByInput = by_input
                    .iter()
                    .filter(|(id, _)| group.contains(id))
                    .map(|(id, keys)| (*id, keys.clone()))
                    .collect();
                exact.extend(self.two_lines_at_sides(&in_group, &group, &sides));
                // The exact path's values too, at the sides of the other groups' inputs
                // (their own input's sides are the exact path's).
                let mut here = checked.clone();
                here.extend(
                    by_input
                        .iter()
                        .filter(|(id, _)| !group.contains(id))
                        .flat_map(|(_, keys)| keys.iter().map(|(k, _)| *k)),
                );
                let mut bent = self.curved(&here, &group, &sides, &mut shifts);
                // A value bent along one wide measurement alone (see `WIDE_RELATIVE`) takes
                // its two sides through the formulas exactly, as a value on one asymmetric
                // input does: a normal is two half-normal lines of one width.
                let mut on_wide: ByInput = BTreeMap::new();
                for (key, _) in &bent {
                    let Some(e) = self.entries.get(key) else {
                        continue;
                    };
                    let one = self.one_input_and_rest(&e.value, |id, input, _| {
                        input.wide && input.shape == Shape::Normal && group.contains(&id)
                    });
                    // Another checked input under it may give it a small share (an impact
                    // parameter's under a scale height, through sin i): its own group's
                    // runs check the value's bend along it (see `wide_carried` below).
                    let shares: FxHashMap<u32, f64> =
                        e.value.budget(&self.inputs).into_iter().collect();
                    let small = |o: &u32| shares.get(o).copied().unwrap_or(0.0) < SHARE_LIMIT;
                    if let Some((id, rest)) = one.filter(|(id, _)| {
                        (e.value.grad.iter())
                            .all(|(o, g)| o == id || *g == 0.0 || !skewed.contains(o) || small(o))
                    }) {
                        on_wide.entry(id).or_default().push((*key, rest));
                    }
                }
                for (key, summary) in self.two_lines_in(&on_wide, &group, &sides, true) {
                    if let Some(i) = bent.iter().position(|(k, _)| *k == key) {
                        let (_, why) = bent.swap_remove(i);
                        let words = format!("{WIDE_KEPT}: {why}, so this interval is the median and 16th-84th percentiles of the value with that measurement at its two standard uncertainties carried through the formulas exactly (a monotone formula carries a normal's percentiles to the value's) and the other inputs' first-order spread added; not sampled");
                        self.two_lines.insert(key, (summary, words));
                        wide_carried.push(key);
                    }
                }
                for (key, why) in bent {
                    if !curved.iter().any(|(k, _)| *k == key) {
                        curved.push((key, why));
                    }
                }
            }
            // Bends each under the limit along several inputs that all move the median one
            // way: together they may pass it (a duration at e = 0.5 +- 0.06 and
            // omega = -30 deg, flat in e there, and b = 0.3 +- 0.06: 0.08 of its uncertainty
            // each, 0.12 together).
            let mut keys: Vec<Key> = shifts.keys().copied().collect();
            keys.sort();
            for key in keys {
                let done = curved.iter().any(|(k, _)| *k == key)
                    || wide_carried.contains(&key)
                    || exact.iter().any(|(k, _)| *k == key);
                let (Some(e), Some(shift)) = (self.entries.get(&key), shifts.get(&key)) else {
                    continue;
                };
                let (below, above) = e.value.linear_spread(&self.inputs);
                let sigma = below.max(above);
                if !done
                    && shift.abs() > CURVATURE_LIMIT * sigma
                    && shift.abs() > 1e-9 * e.value.nominal.abs()
                {
                    curved.push((
                        key,
                        format!(
                            "its bends at the sides of several inputs together move its median by {:.0}% of its first-order uncertainty",
                            (100.0 * shift.abs() / sigma).min(999.0)
                        ),
                    ));
                }
            }
            exact.retain(|(k, _)| !curved.iter().any(|(c, _)| c == k));
            // A value carried along its wide measurement but found bent along another
            // checked input in that input's runs is sampled after all.
            for key in wide_carried {
                if curved.iter().any(|(c, _)| *c == key) {
                    self.two_lines.remove(&key);
                }
            }
            let resolved: FxHashSet<Key> = exact.iter().map(|(k, _)| *k).collect();
            for key in by_input.values().flatten().map(|(k, _)| *k) {
                if !resolved.contains(&key) {
                    not_exact.insert(
                        key,
                        "it does not move one way across the input's two sides, or rests on another asymmetric input too".to_string(),
                    );
                }
            }
            for (key, summary) in exact {
                if let Some(why) = doubts.remove(&key) {
                    let words = format!("{TWO_LINES}: {why}, so this interval is the median and 16th-84th percentiles of the value with that input at its two sides carried through the formulas exactly (its distribution read as two half-normal lines, Barlow 2003) and the other inputs' first-order spread added; not sampled");
                    self.two_lines.insert(key, (summary, words));
                }
            }
            doubts.extend(curved);
        }
        // A value given an exact interval that rests on a value found to need sampling only
        // afterwards (at an input's sides) is sampled too: its exact path took that value's
        // first-order interval for granted. Until nothing changes: each such value can stand
        // in the way of another.
        loop {
            let undone: Vec<(Key, Key)> = self
                .two_lines
                .keys()
                .filter_map(|k| {
                    let e = self.entries.get(k)?;
                    let d = e
                        .deps
                        .iter()
                        .filter(|d| {
                            *d != k
                                && doubts.contains_key(d)
                                && (self.widened.contains_key(k) || !by_inputs.contains(d))
                        })
                        .min()?;
                    Some((*k, *d))
                })
                .collect();
            if undone.is_empty() {
                break;
            }
            for (key, dep) in undone {
                self.two_lines.remove(&key);
                let why = first_why
                    .get(&key)
                    .cloned()
                    .unwrap_or_else(|| "a value it rests on is sampled".to_string());
                not_exact.insert(
                    key,
                    format!(
                        "it rests on {}, which first order cannot describe",
                        self.key_name(dep)
                    ),
                );
                doubts.insert(key, why);
            }
        }
        // Say why the exact path was not taken, where it was not.
        for (key, why_not) in not_exact {
            if let Some(why) = doubts.get_mut(&key) {
                why.push_str(&format!(" (not carried exactly: {why_not})"));
            }
        }
        if doubts.is_empty() {
            return;
        }
        let options = Options {
            propagation: Propagation::MonteCarlo,
            samples: self.options.samples.min(MOST_SAMPLES),
            ..self.options.clone()
        };
        let focus = self.cone(doubts.keys());
        self.sampled = Some(Sampled {
            derivation: Box::new(Derivation::run_pinned(
                self.sys,
                &options,
                self.lines,
                Default::default(),
                Some(focus),
            )),
            doubts,
        });
    }

    /// The Monte Carlo median and 16th and 84th percentiles standing in for a doubted
    /// value's first-order interval, with the sentence that says so.
    pub(super) fn sampled_instead(&self, key: Key) -> Option<(value::SampleSummary, String)> {
        if let Some(exact) = self.two_lines.get(&key) {
            return Some(exact.clone());
        }
        let s = self.sampled.as_ref()?;
        let why = s.doubts.get(&key)?;
        let summary = s.derivation.value(key)?.sample_summary()?;
        // Draws taken at the edge of a formula's domain, said as Monte Carlo says them.
        let edge = s
            .derivation
            .entries
            .get(&key)
            .and_then(|e| {
                e.assumptions
                    .iter()
                    .find(|a| a.contains(super::rounds::EDGE_TAKEN))
            })
            .map_or(String::new(), |a| format!("; {a}"));
        let words = format!(
            "{SAMPLED}: {why}, so this interval is the median and 16th-84th percentiles of {} Monte Carlo draws (seed {}){edge}",
            s.derivation.options.samples, s.derivation.options.seed
        );
        Some((summary, words))
    }
}
