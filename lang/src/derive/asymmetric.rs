//! The exact distribution of a first-order value that rests on one asymmetric uncertainty.
//!
//! A published `v +a/-b` is read as two half-normal lines, `v + a u` for `u > 0` and
//! `v + b u` for `u < 0`, `u` a standard normal (R. Barlow, "Asymmetric systematic errors",
//! arXiv:physics/0306138, 2003, sect. 2; the reading [`super::value::draw`] samples). A
//! derived value described to first order, `y = y0 + g (x - v) + n`, with `n` normal of
//! standard deviation `s` (every other input), then has the distribution of
//! `g D(u) + s w`, `w` another standard normal. (The engine takes the value's moves to the
//! input's two sides through its formulas, `y(v + a) - y0` and `y0 - y(v - b)`, in place of
//! `g a` and `g b`: exact for a monotone formula of that input alone; see
//! [`Derivation::two_lines_at_sides`], below.) Its distribution function follows in closed
//! form from Owen's T function (Owen 1956, Ann. Math. Statist. 27, 1075; the skew-normal
//! distribution function `Phi(k) - 2 T(k, alpha)` of Azzalini 1985): for `g > 0`, with
//! `sa = sqrt((g a)^2 + s^2)` and `sb = sqrt((g b)^2 + s^2)`,
//!
//! `F(t) = Phi(t/sa)/2 + Phi(t/sb)/2 - T(t/sa, g a / s) + T(t/sb, g b / s)`,
//!
//! (each half-line of `u` contributes `P(u > 0, g a u + s w <= t)`, a bivariate normal
//! probability with one limit at 0), and its density
//!
//! `f(t) = phi(t/sa) Phi(g a t / (s sa)) / sa + phi(t/sb) Phi(-g b t / (s sb)) / sb`.
//!
//! Its percentiles are found by Newton's method inside a bracket, to rounding level: no
//! sampling, no seed, no numerical noise, where the values it replaces were 4,000 draws of
//! the whole system. With `a = b` it is the normal of first order; with `s = 0`, the input's
//! own two lines mapped through `g`. A test compares both and the general case with
//! percentiles from a numerical integration in scipy (`tests/reference/two_lines.py`).

use std::f64::consts::SQRT_2;

use rustc_hash::{FxHashMap, FxHashSet};

use super::validity::{ratio_scale, ByInput, Rest, CURVATURE_LIMIT, SHARE_LIMIT};
use super::value::{self, InputInfo, Shape, Value};
use super::{Derivation, Key, Options, PinAt, Pins, Propagation};

pub(super) fn phi_cdf(z: f64) -> f64 {
    0.5 * libm::erfc(-z / SQRT_2)
}

pub(super) fn phi_pdf(z: f64) -> f64 {
    (-0.5 * z * z).exp() / (2.0 * std::f64::consts::PI).sqrt()
}

/// The spread of `g D(u) + s w` (see the module doc): `above` and `below` are the input's
/// sides, `g` the value's slope along it, `s` the standard deviation of the rest.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct TwoLines {
    /// The value's spread along the input on the side it rises (`g a` for `g > 0`) and falls.
    rise: f64,
    fall: f64,
    s: f64,
}

impl TwoLines {
    /// `None` where there is nothing to describe (no spread at all) or a number is not
    /// finite.
    pub fn new(g: f64, above: f64, below: f64, s: f64) -> Option<TwoLines> {
        // A negative slope maps the input's upper side onto the value's lower side.
        let (rise, fall) = if g >= 0.0 {
            (g * above, g * below)
        } else {
            (-g * below, -g * above)
        };
        let ok = |x: f64| x.is_finite() && x >= 0.0;
        (ok(rise) && ok(fall) && ok(s) && rise + fall + s > 0.0).then_some(TwoLines {
            rise,
            fall,
            s,
        })
    }

    /// `P(g D(u) + s w <= t)`.
    pub fn cdf(&self, t: f64) -> f64 {
        let (ra, rb, s) = (self.rise, self.fall, self.s);
        if s == 0.0 {
            return phi_cdf(t / if t >= 0.0 { ra } else { rb });
        }
        let (sa, sb) = (ra.hypot(s), rb.hypot(s));
        let (ha, hb) = (t / sa, t / sb);
        0.5 * phi_cdf(ha) + 0.5 * phi_cdf(hb) - owens_t::owens_t(ha, ra / s)
            + owens_t::owens_t(hb, rb / s)
    }

    /// The density of `g D(u) + s w` at `t`.
    pub fn pdf(&self, t: f64) -> f64 {
        let (ra, rb, s) = (self.rise, self.fall, self.s);
        if s == 0.0 {
            let side = if t >= 0.0 { ra } else { rb };
            return if side > 0.0 {
                phi_pdf(t / side) / side
            } else {
                0.0
            };
        }
        let (sa, sb) = (ra.hypot(s), rb.hypot(s));
        phi_pdf(t / sa) * phi_cdf(ra * t / (s * sa)) / sa
            + phi_pdf(t / sb) * phi_cdf(-rb * t / (s * sb)) / sb
    }

    /// The `p` quantile of `g D(u) + s w`, to rounding level; `None` for `p` outside (0, 1).
    pub fn quantile(&self, p: f64) -> Option<f64> {
        let (ra, rb, s) = (self.rise, self.fall, self.s);
        let z = probit(p)?;
        if s == 0.0 {
            // The input's own lines: exact.
            return Some(z * if z >= 0.0 { ra } else { rb });
        }
        // A bracket wide enough for any p (|z| < 8.3 reaches 1e-16 of either tail), and
        // Newton's method inside it from the guess of the side-wise first order.
        let wide = 9.0 * ra.max(rb).hypot(s);
        let start = z * if z >= 0.0 { ra.hypot(s) } else { rb.hypot(s) };
        Some(solve(
            |t| self.cdf(t),
            |t| self.pdf(t),
            p,
            -wide,
            wide,
            start,
        ))
    }
}

/// The standard normal quantile, to rounding level; `None` for `p` outside (0, 1).
pub fn probit(p: f64) -> Option<f64> {
    (p > 0.0 && p < 1.0).then(|| solve(phi_cdf, phi_pdf, p, -40.0, 40.0, 0.0))
}

/// The `t` in `[lo, hi]` where the increasing `cdf` reaches `p`: Newton's method with the
/// density `pdf`, from `start`, a step that would leave the bracket replaced by halving it.
pub(super) fn solve(
    cdf: impl Fn(f64) -> f64,
    pdf: impl Fn(f64) -> f64,
    p: f64,
    mut lo: f64,
    mut hi: f64,
    start: f64,
) -> f64 {
    let width = hi - lo;
    let mut t = start.clamp(lo, hi);
    for _ in 0..200 {
        let f = cdf(t) - p;
        if f == 0.0 {
            return t;
        }
        if f < 0.0 {
            lo = t;
        } else {
            hi = t;
        }
        let d = pdf(t);
        let newton = t - f / d;
        let next = if d > 0.0 && newton > lo && newton < hi {
            newton
        } else {
            0.5 * (lo + hi)
        };
        if (next - t).abs() <= 1e-15 * width.max(t.abs()) || hi - lo <= 1e-15 * width {
            return next;
        }
        t = next;
    }
    t
}

impl<'m> Derivation<'m> {
    /// The one input a value is doubted for, if it is doubted only for one strongly
    /// asymmetric input whose stated distribution lies inside its range: that input's id and
    /// the rest of the value's first-order spread: every other input, each by the mean of its
    /// two sides (as the error budget counts it), about the mean offset of the asymmetric
    /// ones among them, `g (a - b) / sqrt(2 pi)` for sides `+a/-b` read as two half-normal
    /// lines. (A small spread added to a wide one moves the sum's median by its mean, not
    /// its median: a transit depth of `+0.0002/-0.0001` beside a star's radius of
    /// `+8 %/-2 %` moved the planet's radius by 4 % of its uncertainty.) `None`
    /// when a second input is not normal and gives at least [`SHARE_LIMIT`] of the variance
    /// (two asymmetric inputs, a limit, an angle over a full turn), where only sampling
    /// describes the value.
    pub(super) fn one_skewed_input(&self, v: &Value) -> Option<(u32, Rest)> {
        self.one_input_and_rest(v, |_, input, share| {
            input.shape == Shape::Skewed && share >= SHARE_LIMIT
        })
    }

    /// The one input of `v` that `is_it` picks (given its id, description and share of the
    /// variance), with the rest of the value's first-order spread as
    /// [`Derivation::one_skewed_input`] counts it. `None` when `is_it` picks none or two, the
    /// picked input's stated distribution reaches past its range, or another input that is
    /// not normal gives at least [`SHARE_LIMIT`] of the variance.
    pub(super) fn one_input_and_rest(
        &self,
        v: &Value,
        is_it: impl Fn(u32, &InputInfo, f64) -> bool,
    ) -> Option<(u32, Rest)> {
        let shares: FxHashMap<u32, f64> = v.budget(&self.inputs).into_iter().collect();
        let mut picked: Option<u32> = None;
        let mut rest = 0.0;
        let mut shift = 0.0;
        for &(id, g) in &v.grad {
            let input = self.inputs.get(id as usize)?;
            if g == 0.0 {
                continue;
            }
            let share = shares.get(&id).copied().unwrap_or(0.0);
            if is_it(id, input, share) {
                if picked.is_some() || !input.inside() {
                    return None;
                }
                picked = Some(id);
            } else if input.shape != Shape::Normal && share >= SHARE_LIMIT {
                return None;
            } else {
                rest += (g * (input.below + input.above) / 2.0).powi(2);
                if input.shape != Shape::Uniform && input.limit.is_none() {
                    shift += g * (input.above - input.below) / (2.0 * std::f64::consts::PI).sqrt();
                }
            }
        }
        Some((
            picked?,
            Rest {
                sd: rest.sqrt(),
                shift,
            },
        ))
    }

    /// Values first order passed that rest on an asymmetric input moved in `up` and `down`
    /// ([`Derivation::at_sides`]), where their moves to the inputs' sides differ from what
    /// their slopes predict by more than [`CURVATURE_LIMIT`] of their uncertainty (a formula
    /// flat or turning at the value, as a duration at an argument of periastron of 90 deg
    /// is, which first order reads as no spread at all), each with why.
    pub(super) fn curved(
        &self,
        keys: &[Key],
        moved: &FxHashSet<u32>,
        [up, down]: &[Derivation<'m>; 2],
        shifts: &mut FxHashMap<Key, f64>,
    ) -> Vec<(Key, String)> {
        let mut out = Vec::new();
        for key in keys {
            let Some(e) = self.entries.get(key) else {
                continue;
            };
            let v = &e.value;
            let mut labels: Vec<&str> = Vec::new();
            let (mut lin_up, mut lin_down) = (0.0, 0.0);
            for &(id, g) in &v.grad {
                if let Some(input) = self.inputs.get(id as usize).filter(|_| moved.contains(&id)) {
                    lin_up += g * input.above;
                    lin_down -= g * input.below;
                    labels.push(input.label.as_str());
                }
            }
            let nominal = |d: &Derivation| d.entries.get(key).map(|e| e.value.nominal);
            let names = if labels.is_empty() {
                // Flat along them: its slope names none of them, so those of them it rests on
                // are named (all, if none is among the quantities it rests on).
                let all: Vec<&str> = moved
                    .iter()
                    .filter_map(|id| self.inputs.get(*id as usize))
                    .map(|i| i.label.as_str())
                    .collect();
                let own: FxHashSet<String> = e.deps.iter().map(|d| self.key_name(*d)).collect();
                let mine: Vec<&str> = all.iter().filter(|l| own.contains(**l)).copied().collect();
                let mut all = if mine.is_empty() { all } else { mine };
                all.sort_unstable();
                all.join(", ")
            } else {
                labels.join(", ")
            };
            let (Some(hi), Some(lo)) = (nominal(up), nominal(down)) else {
                out.push((*key, format!("it has no value at a side of {names}")));
                continue;
            };
            let (du, dd) = (hi - v.nominal, lo - v.nominal);
            let miss = (du - lin_up).abs().max((dd - lin_down).abs());
            // The second-order shift of its median these inputs give, `f'' s^2 / 2` for each
            // (half the sum of its two misses), summed over the groups by the caller: small
            // bends that all lower a value add up.
            *shifts.entry(*key).or_default() += 0.5 * ((du - lin_up) + (dd - lin_down));
            let (below, above) = v.linear_spread(&self.inputs);
            let sigma = below.max(above);
            if miss > CURVATURE_LIMIT * sigma && miss > 1e-9 * v.nominal.abs() {
                let how = if sigma > 0.0 {
                    format!(
                        "{:.0}% of its first-order uncertainty",
                        (100.0 * miss / sigma).min(999.0)
                    )
                } else {
                    "all of it, as its slope there is flat".to_string()
                };
                out.push((
                    *key,
                    format!("at the two sides of {names} it moves by other amounts than its slope predicts, by {how}"),
                ));
            }
        }
        out
    }

    /// The asymmetric inputs `skewed` in groups, no value resting on two inputs of one group
    /// (by its slopes), each group moved to its sides in runs of its own
    /// ([`Derivation::at_sides`]): a value's move in its group's runs is then its one
    /// input's, whatever other asymmetric inputs it rests on (a transit duration on the
    /// star's radius and the transit depth). Greedy colouring in input order; a system
    /// needing more than [`MOST_GROUPS`] groups (each costs two runs), or a value resting on
    /// more than [`MOST_IN_ONE`] asymmetric inputs, is moved as one group, where a value
    /// resting on two moved inputs is left to sampling.
    pub(super) fn side_groups(&self, skewed: &FxHashSet<u32>) -> Vec<FxHashSet<u32>> {
        let mut ids: Vec<u32> = skewed.iter().copied().collect();
        ids.sort_unstable();
        let mut conflicts: FxHashMap<u32, FxHashSet<u32>> = FxHashMap::default();
        for e in self.entries.values() {
            let on: Vec<u32> = e
                .value
                .grad
                .iter()
                .filter(|(id, g)| *g != 0.0 && skewed.contains(id))
                .map(|(id, _)| *id)
                .collect();
            if on.len() > MOST_IN_ONE {
                return vec![skewed.clone()];
            }
            for a in &on {
                conflicts
                    .entry(*a)
                    .or_default()
                    .extend(on.iter().filter(|b| *b != a));
            }
        }
        let mut group_of: FxHashMap<u32, usize> = FxHashMap::default();
        let mut groups: Vec<FxHashSet<u32>> = Vec::new();
        for id in ids {
            let taken: FxHashSet<usize> = conflicts
                .get(&id)
                .into_iter()
                .flatten()
                .filter_map(|other| group_of.get(other).copied())
                .collect();
            let g = (0..).find(|g| !taken.contains(g)).unwrap_or(0);
            if g >= MOST_GROUPS {
                return vec![skewed.clone()];
            }
            if g == groups.len() {
                groups.push(FxHashSet::default());
            }
            if let Some(set) = groups.get_mut(g) {
                set.insert(id);
            }
            group_of.insert(id, g);
        }
        groups
    }

    /// The system evaluated again, to first order, for the values of `focus`, with every
    /// input of `ids` at its value plus its uncertainty above, and once more at its value
    /// less its uncertainty below: two runs, however many inputs (a system of many planets
    /// each with an asymmetric input costs what one does).
    pub(super) fn at_sides(
        &self,
        ids: &FxHashSet<u32>,
        focus: &FxHashSet<Key>,
    ) -> [Derivation<'m>; 2] {
        let options = Options {
            propagation: Propagation::Linear,
            ..self.options.clone()
        };
        [PinAt::Above, PinAt::Below].map(|side| {
            let pins: Pins = ids
                .iter()
                .filter_map(|id| self.inputs.get(*id as usize))
                .map(|i| (i.label.clone(), side))
                .collect();
            Derivation::run_pinned(self.sys, &options, self.lines, pins, Some(focus.clone()))
        })
    }

    /// For values each doubted only for one input ([`Derivation::one_skewed_input`]), by
    /// input, each with the rest of its spread: their intervals with the input's two sides
    /// carried through the formulas exactly, from the runs `up` and `down` with the inputs
    /// `moved` at their sides ([`Derivation::at_sides`]). A value that moves monotonically
    /// through them is `y0 + (y(+) - y0) u` for `u > 0` and `y0 - (y(-) - y0) u` for `u < 0`
    /// along its input's two half-normal lines (exact for the input alone: a monotone formula
    /// carries its percentiles to the value's), plus the rest's normal spread
    /// ([`super::asymmetric`]). A value that also rests on another of the inputs moved, or
    /// that does not move monotonically, is left out (sampled).
    pub(super) fn two_lines_at_sides(
        &self,
        by_input: &ByInput,
        moved: &FxHashSet<u32>,
        sides: &[Derivation<'m>; 2],
    ) -> Vec<(Key, value::SampleSummary)> {
        self.two_lines_in(by_input, moved, sides, false)
    }

    /// [`Derivation::two_lines_at_sides`], in logarithms where `log` is set and the value and
    /// its two moves are positive: `ln y` is `ln y0` plus the input's two lines plus the
    /// rest's normal, relative to `y0`. Most formulas are products of powers, which are
    /// linear in logarithms, so the rest then scales with the value as it does in them (a
    /// scale height from `K = 3.1 +- 0.6 m/s`, 1/K, added its rest's spread linearly and put
    /// both ends 0.09 of the uncertainty from Monte Carlo's).
    pub(super) fn two_lines_in(
        &self,
        by_input: &ByInput,
        moved: &FxHashSet<u32>,
        [up, down]: &[Derivation<'m>; 2],
        log: bool,
    ) -> Vec<(Key, value::SampleSummary)> {
        let keys: Vec<(Key, Rest)> = by_input
            .iter()
            .flat_map(|(id, keys)| keys.iter().map(move |k| (*id, *k)))
            .filter(|(id, (key, _))| {
                // Moved by its own input alone.
                self.entries.get(key).is_some_and(|e| {
                    e.value
                        .grad
                        .iter()
                        .all(|(other, g)| other == id || *g == 0.0 || !moved.contains(other))
                })
            })
            .map(|(_, k)| k)
            .collect();
        let mut out = Vec::new();
        for (key, rest) in keys {
            let nominal = |d: &Derivation| d.entries.get(&key).map(|e| e.value.nominal);
            let (Some(y0), Some(hi), Some(lo)) = (nominal(self), nominal(up), nominal(down)) else {
                continue;
            };
            let in_logs = log && ratio_scale(key.1) && y0 > 0.0 && hi > 0.0 && lo > 0.0;
            let (du, dd, sd) = if in_logs {
                ((hi / y0).ln(), (lo / y0).ln(), rest.sd / y0)
            } else {
                (hi - y0, lo - y0, rest.sd)
            };
            let lines = if du >= 0.0 && dd <= 0.0 {
                TwoLines::new(1.0, du, -dd, sd)
            } else if du <= 0.0 && dd >= 0.0 {
                TwoLines::new(-1.0, -du, dd, sd)
            } else {
                None
            };
            let Some(d) = lines else { continue };
            let at = |p: f64| {
                d.quantile(p).map(|t| {
                    if in_logs {
                        y0 * (rest.shift / y0 + t).exp()
                    } else {
                        y0 + rest.shift + t
                    }
                })
            };
            if let (Some(median), Some(low), Some(high)) =
                (at(0.5), at(value::P_LOW), at(value::P_HIGH))
            {
                out.push((
                    key,
                    value::SampleSummary {
                        median,
                        low,
                        high,
                        finite: 1.0,
                        precision: None,
                    },
                ));
            }
        }
        out
    }
}

/// The most groups [`Derivation::side_groups`] moves separately.
const MOST_GROUPS: usize = 4;
/// The most asymmetric inputs one value may rest on for the inputs to be grouped.
const MOST_IN_ONE: usize = 8;

/// A reference file of percentiles from scipy (`tests/reference/make_*_reference.py`): the
/// probabilities and the cases, each with its quantiles at them.
#[cfg(test)]
pub(super) fn reference(text: &str) -> (Vec<f64>, Vec<serde_json::Value>) {
    let json: serde_json::Value = serde_json::from_str(text).expect("reference JSON");
    let ps = json["percentiles"]
        .as_array()
        .expect("percentiles")
        .iter()
        .filter_map(serde_json::Value::as_f64)
        .collect();
    let cases = json["cases"].as_array().expect("cases").clone();
    (ps, cases)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_normal_quantile_is_at_rounding_level() {
        // Phi(1) = 0.841344746068543 (any table of the normal distribution).
        let z = probit(0.841_344_746_068_543).unwrap();
        assert!((z - 1.0).abs() < 1e-12, "{z}");
        for p in [1e-12, 0.01, 0.3, 0.5, 0.7, 0.99, 1.0 - 1e-12] {
            let z = probit(p).unwrap();
            assert!((phi_cdf(z) - p).abs() < 1e-14 * p.max(1e-3), "{p} {z}");
        }
        assert_eq!(probit(0.0), None);
    }

    #[test]
    fn equal_sides_give_the_normal_and_no_rest_gives_the_input_lines() {
        // a = b: g D(u) + s w is normal of standard deviation sqrt((g a)^2 + s^2) = 5.
        let n = TwoLines::new(2.0, 1.5, 1.5, 4.0).unwrap();
        let z = probit(0.841_344_746_068_543).unwrap();
        assert!((n.quantile(0.841_344_746_068_543).unwrap() - 5.0 * z).abs() < 1e-12);
        assert!(n.quantile(0.5).unwrap().abs() < 1e-12);
        // s = 0: the percentiles are the input's sides times g; a negative g swaps them.
        let lines = TwoLines::new(-2.0, 3.0, 1.0, 0.0).unwrap();
        let hi = lines.quantile(0.841_344_746_068_543).unwrap();
        let lo = lines.quantile(0.158_655_253_931_457).unwrap();
        assert!(
            (hi - 2.0).abs() < 1e-9 && (lo + 6.0).abs() < 1e-9,
            "{lo} {hi}"
        );
    }

    /// Against percentiles integrated numerically with scipy (quad and brentq over the
    /// definition, not the closed form): tests/reference/make_two_lines_reference.py.
    #[test]
    fn percentiles_match_scipy_integration() {
        let (ps, cases) = reference(include_str!("../../../tests/reference/two_lines.json"));
        assert!(cases.len() >= 8);
        for case in &cases {
            let num = |k: &str| case[k].as_f64().expect("number");
            let d = TwoLines::new(num("g"), num("above"), num("below"), num("s")).expect("spread");
            let scale = (num("g").abs() * num("above").max(num("below"))).max(num("s"));
            for (p, want) in ps
                .iter()
                .zip(case["quantiles"].as_array().expect("quantiles"))
            {
                let want = want.as_f64().expect("number");
                let got = d.quantile(*p).expect("quantile");
                assert!(
                    (got - want).abs() < 1e-9 * scale,
                    "{case}: p {p}: {got} vs {want}"
                );
            }
        }
    }

    #[test]
    fn the_distribution_function_is_continuous_increasing_and_its_density_agrees() {
        let d = TwoLines::new(1.0, 3.0, 1.0, 0.7).unwrap();
        let mut last = 0.0;
        for i in -400..=400 {
            let t = f64::from(i) * 0.03;
            let f = d.cdf(t);
            assert!(f >= last - 1e-15, "{t}");
            last = f;
            // The density is the slope of the distribution function.
            let h = 1e-5;
            let slope = (d.cdf(t + h) - d.cdf(t - h)) / (2.0 * h);
            assert!((slope - d.pdf(t)).abs() < 1e-7, "{t}: {slope} {}", d.pdf(t));
        }
        assert!(d.cdf(-40.0) < 1e-12 && d.cdf(40.0) > 1.0 - 1e-12);
        // Half the probability on each side of the input's value when the rest is 0.
        let lines = TwoLines::new(1.0, 3.0, 1.0, 0.0).unwrap();
        assert!((lines.cdf(0.0) - 0.5).abs() < 1e-15);
    }
}
