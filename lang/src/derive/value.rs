//! Uncertain values and their propagation.
//!
//! A [`Value`] carries three views of one uncertain number at once:
//! - the nominal value (every function evaluated at the inputs' values),
//! - first-order sensitivities to every independent input (`grad`), which give linear
//!   propagation, keep results that share an input correlated, and yield error budgets,
//! - optionally, Monte Carlo samples as one flat array, aligned across all values of a
//!   system (sample `i` of every value comes from the same draw of the inputs).
//!
//! [`apply`] pushes a plain SI function through all three views.

use crate::model::{Form, Measurement};
use rand::{Rng, SeedableRng};
use rand_chacha::ChaCha8Rng;
use rand_distr::StandardNormal;
use std::sync::Arc;

/// An independent input: a declared measurement or an uncertain literal in an expression.
#[derive(Debug, Clone, PartialEq)]
pub struct InputInfo {
    pub label: String,
    /// Standard uncertainty below and above, SI. A limit is given its uniform-distribution
    /// standard deviation on both sides.
    pub below: f64,
    pub above: f64,
    /// What its distribution is, as far as first-order propagation is concerned.
    pub shape: Shape,
    /// For a declared limit: its form and the limit itself (SI).
    pub limit: Option<(crate::model::Form, f64)>,
    /// The share of its stated distribution outside its quantity's range (samples are kept
    /// inside, and no formula of the stated distribution describes them).
    pub outside: f64,
    /// Whether it is an angle (an argument of periastron, an inclination).
    pub angle: bool,
    /// Whether it is an angle around a whole turn (an argument of periastron): no value
    /// moves one way with it over its range, so a limit on it bounds no value at that limit.
    pub periodic: bool,
    /// Whether it is a measurement of a quantity with a true zero whose uncertainty is more
    /// than [`super::validity::WIDE_RELATIVE`] of its value: formulas with steep powers of it
    /// bend within that spread (see `Derivation::sample_where_doubtful`).
    pub wide: bool,
}

/// An input's distribution, as far as first-order propagation is concerned: only a normal
/// (or nearly normal) input is described well by its standard uncertainty.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Shape {
    /// Normal, or asymmetric by less than a factor of 1.5.
    Normal,
    /// Spread uniformly over a range: a limit, or an angle over a full turn.
    Uniform,
    /// Asymmetric by a factor of 1.5 or more.
    Skewed,
}

impl InputInfo {
    /// Whether its stated distribution lies inside its quantity's range: all but 1e-3 of it.
    pub fn inside(&self) -> bool {
        self.outside < 1e-3
    }

    fn sigma_for(&self, derivative: f64, side_above: bool) -> f64 {
        // A positive derivative maps the input's upper side onto the output's upper side.
        let up = (derivative >= 0.0) == side_above;
        derivative.abs() * if up { self.above } else { self.below }
    }
}

#[derive(Debug, Clone, PartialEq)]
pub struct Value {
    pub nominal: f64,
    /// Sparse sensitivities d(value)/d(input), sorted by input id.
    pub grad: Vec<(u32, f64)>,
    pub samples: Option<Arc<[f64]>>,
}

impl Value {
    /// The value without its dependence on input `id` (first order: the slope dropped).
    pub fn without(&self, id: u32) -> Value {
        Value {
            nominal: self.nominal,
            grad: self
                .grad
                .iter()
                .filter(|(i, _)| *i != id)
                .copied()
                .collect(),
            samples: None,
        }
    }

    pub fn exact(v: f64, n: usize) -> Value {
        Value {
            nominal: v,
            grad: Vec::new(),
            samples: (n > 0).then(|| std::iter::repeat_n(v, n).collect()),
        }
    }

    /// Linear (first-order) uncertainty below and above.
    pub fn linear_spread(&self, inputs: &[InputInfo]) -> (f64, f64) {
        let mut lo = 0.0;
        let mut hi = 0.0;
        for &(id, d) in &self.grad {
            if let Some(inp) = inputs.get(id as usize) {
                lo += inp.sigma_for(d, false).powi(2);
                hi += inp.sigma_for(d, true).powi(2);
            }
        }
        (lo.sqrt(), hi.sqrt())
    }

    /// Each input's share of the linear variance, largest first.
    pub fn budget(&self, inputs: &[InputInfo]) -> Vec<(u32, f64)> {
        let parts: Vec<(u32, f64)> = self
            .grad
            .iter()
            .filter_map(|&(id, d)| {
                let inp = inputs.get(id as usize)?;
                let s = d.abs() * (inp.below + inp.above) / 2.0;
                Some((id, s * s))
            })
            .collect();
        let total: f64 = parts.iter().map(|p| p.1).sum();
        if total <= 0.0 {
            return Vec::new();
        }
        let mut out: Vec<(u32, f64)> = parts.into_iter().map(|(id, v)| (id, v / total)).collect();
        out.sort_by(|a, b| b.1.total_cmp(&a.1).then(a.0.cmp(&b.0)));
        out
    }

    /// The standard deviation of `self - other`, counting shared inputs once.
    pub fn sigma_of_difference(&self, other: &Value, inputs: &[InputInfo]) -> f64 {
        let mut diff = self.grad.clone();
        diff.extend(other.grad.iter().map(|&(id, d)| (id, -d)));
        let diff = merge(diff);
        diff.iter()
            .filter_map(|&(id, d)| {
                let inp = inputs.get(id as usize)?;
                let s = d * (inp.below + inp.above) / 2.0;
                Some(s * s)
            })
            .sum::<f64>()
            .sqrt()
    }

    /// Median and the 16th and 84th percentiles of the finite samples, the fraction of
    /// samples that were finite, and how precisely the samples fix those three numbers.
    pub fn sample_summary(&self) -> Option<SampleSummary> {
        let s = self.samples.as_ref()?;
        // Order statistics are found on integer keys that sort as the floats do (the
        // `f64::total_cmp` order), which selection compares far faster than floats. Every
        // sample is converted (a loop without branches), and the samples that are not
        // finite are counted instead of left out: in that order they sit at the two ends
        // (negative NaN and -inf below every finite key, +inf and NaN above), so the
        // finite ones hold the ranks `first..first + n` and their order statistics are
        // selected there.
        let mut v: Vec<i64> = Vec::with_capacity(s.len());
        v.extend(s.iter().map(|x| order_key(*x)));
        let (least, most) = (order_key(f64::MIN), order_key(f64::MAX));
        let (first, after) = v.iter().fold((0usize, 0usize), |(lo, hi), &k| {
            (lo + usize::from(k < least), hi + usize::from(k > most))
        });
        let n = v.len() - first - after;
        if n == 0 {
            return None;
        }
        let finite = n as f64 / s.len() as f64;
        // The order statistic nearest each percentile, found by selection (O(n)) rather
        // than a full sort; with 10^4 samples the rounding is 0.005% of the distribution.
        let rank = |p: f64| ((p * (n - 1) as f64).round() as usize).min(n - 1);
        let centre = [P_LOW, 0.5, P_HIGH].map(rank);
        // Numerical precision: the order statistics `d = sqrt(n p (1 - p))` ranks either
        // side of each percentile's rank lie about one standard error of that percentile
        // away from it (the count of samples below a p-quantile is binomial(n, p)), so the
        // distance between them is two standard errors, whatever the distribution.
        let with_precision = n >= MIN_FOR_PRECISION;
        // For each percentile: its rank and the ranks either side.
        let around = |r: usize, p: f64| {
            let d = ((n as f64) * p * (1.0 - p)).sqrt().ceil() as usize;
            (r.saturating_sub(d), (r + d).min(n - 1))
        };
        let [r_low, r_median, r_high] = centre;
        let sides = [
            around(r_low, P_LOW),
            around(r_median, 0.5),
            around(r_high, P_HIGH),
        ];
        let mut wanted: Vec<usize> = centre.to_vec();
        if with_precision {
            wanted.extend(sides.iter().flat_map(|&(a, b)| [a, b]));
        }
        wanted.sort_unstable();
        wanted.dedup();
        let mut found = vec![0i64; wanted.len()];
        let in_all: Vec<usize> = wanted.iter().map(|r| r + first).collect();
        super::select::select_ranks(&mut v, &in_all, &mut found);
        let at = |r: usize| {
            let i = wanted.binary_search(&r).unwrap_or(0);
            from_order_key(found.get(i).copied().unwrap_or(0))
        };
        let [low, median, high] = centre.map(at);
        let precision = with_precision.then(|| {
            let [low, median, high] = sides.map(|(a, b)| (at(b) - at(a)).max(0.0));
            Precision {
                samples: n,
                low,
                median,
                high,
            }
        });
        Some(SampleSummary {
            median,
            low,
            high,
            finite,
            precision,
        })
    }
}

/// The 16th and 84th percentiles: the ends of a 68 % interval around the median.
pub const P_LOW: f64 = 0.158_655_253_931_457;
pub const P_HIGH: f64 = 0.841_344_746_068_543;

/// The fewest finite samples of which a numerical precision is stated: with fewer, the
/// order statistics either side of the 16th percentile run into the sample's end.
pub const MIN_FOR_PRECISION: usize = 100;

/// What the samples of one value say of it.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SampleSummary {
    pub median: f64,
    /// The 16th and 84th percentiles.
    pub low: f64,
    pub high: f64,
    /// The fraction of the samples that were finite (the rest had no value).
    pub finite: f64,
    /// How precisely the samples fix each number, when there are enough of them.
    pub precision: Option<Precision>,
}

/// The numerical precision of a Monte Carlo summary: for the lower end, median and upper
/// end, twice the standard error with which the samples fix them (SI). Drawing again with
/// another seed moves each by about half of this (one standard error). JCGM 101:2008 7.9
/// calls a result stable when twice the standard deviation of its estimates is within the
/// tolerance of the digits reported.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Precision {
    /// Finite samples the summary rests on.
    pub samples: usize,
    pub low: f64,
    pub median: f64,
    pub high: f64,
}

impl Precision {
    /// Whether the three numbers are fixed to half a unit of the second significant digit
    /// of the standard uncertainty `u` (JCGM 101:2008 7.9.2 with n_dig = 2).
    pub fn stable_for(&self, u: f64) -> bool {
        if !(u > 0.0 && u.is_finite()) {
            return true; // nothing uncertain to state digits of
        }
        let tolerance = 0.5 * 10f64.powi(u.log10().floor() as i32 - 1);
        self.low <= tolerance && self.median <= tolerance && self.high <= tolerance
    }
}

/// An integer whose order is the `f64::total_cmp` order of `x` (flip the magnitude bits of
/// negative numbers; the same transform the standard library's `total_cmp` applies).
pub(super) fn order_key(x: f64) -> i64 {
    flip_magnitude_if_negative(x.to_bits() as i64)
}

/// The inverse of [`order_key`] (the transform is its own inverse).
fn from_order_key(k: i64) -> f64 {
    f64::from_bits(flip_magnitude_if_negative(k) as u64)
}

fn flip_magnitude_if_negative(bits: i64) -> i64 {
    bits ^ ((((bits >> 63) as u64) >> 1) as i64)
}

fn merge(mut g: Vec<(u32, f64)>) -> Vec<(u32, f64)> {
    g.sort_by_key(|p| p.0);
    let mut out: Vec<(u32, f64)> = Vec::with_capacity(g.len());
    for (id, d) in g {
        match out.last_mut() {
            Some(last) if last.0 == id => last.1 += d,
            _ => out.push((id, d)),
        }
    }
    out.retain(|p| p.1 != 0.0 && p.1.is_finite());
    out
}

/// Push `f` (SI in, SI out) through the nominal values, the sensitivities and the samples.
/// `None` when `f` has no value at the nominal inputs.
pub fn apply<F: Fn(&[f64]) -> Option<f64>>(
    f: &F,
    args: &[&Value],
    inputs: &[InputInfo],
) -> Option<Value> {
    apply_drawing(f, f, args, inputs)
}

/// [`apply`], with `g` instead of `f` over the samples.
pub fn apply_drawing<F: Fn(&[f64]) -> Option<f64>, G: Fn(&[f64]) -> Option<f64>>(
    f: &F,
    g: &G,
    args: &[&Value],
    inputs: &[InputInfo],
) -> Option<Value> {
    let mut x: Vec<f64> = args.iter().map(|a| a.nominal).collect();
    let y = f(&x).filter(|v| v.is_finite())?;
    let mut grad = Vec::new();
    for (j, arg) in args.iter().enumerate() {
        if arg.grad.is_empty() {
            continue;
        }
        let xj = arg.nominal;
        let (lo, hi) = arg.linear_spread(inputs);
        let scale = if xj != 0.0 {
            xj.abs()
        } else {
            (lo + hi).max(1e-12)
        };
        let h = scale * 1e-6;
        let mut at = |v: f64| -> Option<f64> {
            let slot = x.get_mut(j)?;
            *slot = v;
            let r = f(&x).filter(|r| r.is_finite());
            if let Some(slot) = x.get_mut(j) {
                *slot = xj;
            }
            r
        };
        let d = match (at(xj + h), at(xj - h)) {
            (Some(p), Some(m)) => (p - m) / (2.0 * h),
            (Some(p), None) => (p - y) / h,
            (None, Some(m)) => (y - m) / h,
            (None, None) => 0.0,
        };
        grad.extend(arg.grad.iter().map(|&(id, g)| (id, g * d)));
    }
    let grad = merge(grad);
    let samples = sample_through(g, args);
    Some(Value {
        nominal: y,
        grad,
        samples,
    })
}

/// `f` over the samples of `args`, one sample of each at a time, into a new shared array
/// (`None` unless every argument has samples, all of one length). The common arities walk
/// the columns side by side (no per-sample gathering or bounds checks), and `f` is the
/// caller's own type, so a rule's formula is called directly.
fn sample_through<F: Fn(&[f64]) -> Option<f64>>(f: &F, args: &[&Value]) -> Option<Arc<[f64]>> {
    let cols: Vec<&[f64]> = args
        .iter()
        .map(|a| a.samples.as_deref())
        .collect::<Option<Vec<_>>>()?;
    let n = cols.first().map_or(0, |c| c.len());
    if cols.iter().any(|c| c.len() != n) {
        return None;
    }
    let g = |x: &[f64]| f(x).unwrap_or(f64::NAN);
    // Each arm is collected straight into the shared array: one allocation, no copy.
    Some(match cols.as_slice() {
        [a] => a.iter().map(|&x| g(&[x])).collect(),
        [a, b] => a.iter().zip(*b).map(|(&x, &y)| g(&[x, y])).collect(),
        [a, b, c] => a
            .iter()
            .zip(*b)
            .zip(*c)
            .map(|((&x, &y), &z)| g(&[x, y, z]))
            .collect(),
        [a, b, c, d] => a
            .iter()
            .zip(*b)
            .zip(*c)
            .zip(*d)
            .map(|(((&x, &y), &z), &w)| g(&[x, y, z, w]))
            .collect(),
        _ => {
            let mut buf = vec![0.0; args.len()];
            (0..n)
                .map(|i| {
                    for (b, c) in buf.iter_mut().zip(&cols) {
                        *b = c.get(i).copied().unwrap_or(f64::NAN);
                    }
                    g(&buf)
                })
                .collect()
        }
    })
}

/// A stable 64-bit hash (FNV-1a), so seeds do not depend on the platform or the run.
pub fn stable_hash(parts: &[&str], seed: u64) -> u64 {
    let mut h: u64 = 0xcbf2_9ce4_8422_2325 ^ seed;
    for p in parts {
        for b in p.bytes().chain(std::iter::once(0xff)) {
            h ^= u64::from(b);
            h = h.wrapping_mul(0x0100_0000_01b3);
        }
    }
    h
}

/// Draw `n` samples of a measurement, kept inside the physical range `[lo, hi]`.
///
/// A value `v +a/-b` is read as published values are meant: `v` is the median and `v - b`,
/// `v + a` the 16th and 84th percentiles. Samples are `v + u·a` for `u > 0` and `v + u·b`
/// for `u < 0`, with `u` a standard normal: the result is a piecewise-linear function of
/// one unit Gaussian (the "two straight lines" model of R. Barlow, "Asymmetric systematic
/// errors", arXiv:physics/0306138, 2003, sect. 2), so each side holds half the probability
/// and the percentiles are exactly the declared ones. (The split normal whose mode is `v`
/// puts `b/(a+b)` of the probability below it instead, so its median is not `v`.) A
/// symmetric error is the normal. Samples outside the range are redrawn, up to 100 times,
/// then clamped to the range. An upper limit is sampled uniformly between the range's
/// lower end and the limit; a lower limit uniformly between the limit and the range's upper
/// end. Callers do not pass limits without the needed finite end.
pub fn draw(m: &Measurement, lo: f64, hi: f64, n: usize, seed: u64) -> Arc<[f64]> {
    let mut rng = ChaCha8Rng::seed_from_u64(seed);
    let inside = |v: f64| v >= lo && v <= hi && v.is_finite();
    let clamp = |v: f64| {
        let c = v.clamp(lo, hi);
        if c.is_finite() {
            c
        } else {
            m.value
        }
    };
    match m.form {
        Form::Exact => std::iter::repeat_n(m.value, n).collect(),
        Form::UpperLimit => (0..n)
            .map(|_| lo + (m.value - lo) * rng.gen::<f64>())
            .collect(),
        Form::LowerLimit => (0..n)
            .map(|_| m.value + (hi - m.value) * rng.gen::<f64>())
            .collect(),
        Form::Symmetric | Form::Asymmetric => {
            let one = |rng: &mut ChaCha8Rng| {
                let u: f64 = rng.sample::<f64, _>(StandardNormal);
                m.value + u * if u < 0.0 { m.below } else { m.above }
            };
            (0..n)
                .map(|_| {
                    for _ in 0..100 {
                        let v = one(&mut rng);
                        if inside(v) {
                            return v;
                        }
                    }
                    clamp(one(&mut rng))
                })
                .collect()
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn input(label: &str, s: f64) -> InputInfo {
        InputInfo {
            label: label.into(),
            below: s,
            above: s,
            shape: Shape::Normal,
            limit: None,
            outside: 0.0,
            angle: false,
            periodic: false,
            wide: false,
        }
    }

    #[test]
    fn linear_product_matches_closed_form() {
        // For z = x*y with independent x, y: (sz/z)^2 = (sx/x)^2 + (sy/y)^2 (common practice).
        let inputs = vec![input("x", 0.1), input("y", 0.2)];
        let x = Value {
            nominal: 2.0,
            grad: vec![(0, 1.0)],
            samples: None,
        };
        let y = Value {
            nominal: 4.0,
            grad: vec![(1, 1.0)],
            samples: None,
        };
        let z = apply(&|v| Some(v[0] * v[1]), &[&x, &y], &inputs).unwrap();
        let (lo, hi) = z.linear_spread(&inputs);
        let expect = 8.0 * ((0.1f64 / 2.0).powi(2) + (0.2f64 / 4.0).powi(2)).sqrt();
        assert!((lo - expect).abs() < 1e-8 && (hi - expect).abs() < 1e-8);
        // x/x is exact: shared inputs cancel.
        let r = apply(&|v| Some(v[0] / v[1]), &[&x, &x], &inputs).unwrap();
        assert!(r.linear_spread(&inputs).0 < 1e-9);
    }

    #[test]
    fn asymmetric_values_are_medians_with_their_percentiles() {
        // Published `v +a/-b`: median v, 16th and 84th percentiles v - b and v + a
        // (common practice; the two-straight-lines model of Barlow 2003,
        // arXiv:physics/0306138, has exactly these).
        let m = Measurement {
            value: 10.0,
            below: 1.0,
            above: 3.0,
            form: Form::Asymmetric,
        };
        let s = draw(&m, f64::NEG_INFINITY, f64::INFINITY, 40_000, 7);
        let v = Value {
            nominal: 10.0,
            grad: Vec::new(),
            samples: Some(s.clone()),
        };
        let SampleSummary {
            median,
            low: p16,
            high: p84,
            ..
        } = v.sample_summary().unwrap();
        // Sampling error of a percentile with 40,000 draws: about 0.01 of a side's width.
        assert!((median - 10.0).abs() < 0.03, "{median}");
        assert!((p16 - 9.0).abs() < 0.03, "{p16}");
        assert!((p84 - 13.0).abs() < 0.08, "{p84}");
        let again = draw(&m, f64::NEG_INFINITY, f64::INFINITY, 40_000, 7);
        assert_eq!(s, again, "same seed, same samples");
    }

    #[test]
    fn samples_stay_in_range_and_limits_are_uniform() {
        let e = Measurement {
            value: 0.05,
            below: 0.1,
            above: 0.1,
            form: Form::Symmetric,
        };
        let s = draw(&e, 0.0, 1.0, 10_000, 1);
        assert!(s.iter().all(|v| (0.0..=1.0).contains(v)));
        let lim = Measurement {
            value: 0.08,
            below: 0.0,
            above: 0.0,
            form: Form::UpperLimit,
        };
        let u = draw(&lim, 0.0, 1.0, 20_000, 2);
        let mean = u.iter().sum::<f64>() / u.len() as f64;
        assert!((mean - 0.04).abs() < 0.001 && u.iter().all(|v| (0.0..=0.08).contains(v)));
    }

    /// The standard error of a sample p-quantile of n draws from a density f is
    /// sqrt(p (1 - p) / n) / f(q_p) (common practice: asymptotic normality of sample
    /// quantiles); for the unit normal, f(q_0.16) = phi(-1) = 0.2419707 and f(q_0.5) = phi(0) =
    /// 0.3989423.
    #[test]
    fn precision_is_twice_the_standard_error_of_each_end() {
        let unit = Measurement {
            value: 0.0,
            below: 1.0,
            above: 1.0,
            form: Form::Symmetric,
        };
        let sampled = |n: usize, seed: u64| {
            let samples = draw(&unit, f64::NEG_INFINITY, f64::INFINITY, n, seed);
            Value {
                nominal: 0.0,
                grad: vec![],
                samples: Some(samples),
            }
            .sample_summary()
            .unwrap()
        };
        let n = 10_000.0;
        let se_end = (P_LOW * (1.0 - P_LOW) / n).sqrt() / 0.241_970_7;
        let se_median = (0.25 / n).sqrt() / 0.398_942_3;
        let p = sampled(10_000, 11).precision.unwrap();
        assert_eq!(p.samples, 10_000);
        for (got, want) in [
            (p.low, 2.0 * se_end),
            (p.high, 2.0 * se_end),
            (p.median, 2.0 * se_median),
        ] {
            assert!((got / want - 1.0).abs() < 0.3, "{got} against {want}");
        }
        // And what it promises: over many seeds, the lower end scatters by about half
        // the stated precision (one standard error).
        let ends: Vec<(f64, f64)> = (0..300)
            .map(|seed| {
                let s = sampled(4_000, 1000 + seed);
                (s.low, s.precision.unwrap().low)
            })
            .collect();
        let mean = ends.iter().map(|e| e.0).sum::<f64>() / ends.len() as f64;
        let scatter = (ends.iter().map(|e| (e.0 - mean).powi(2)).sum::<f64>()
            / (ends.len() - 1) as f64)
            .sqrt();
        let stated = ends.iter().map(|e| e.1).sum::<f64>() / ends.len() as f64 / 2.0;
        assert!(
            (scatter / stated - 1.0).abs() < 0.2,
            "scatter {scatter} against stated {stated}"
        );
        // Few samples: no precision is claimed.
        let few = Value {
            nominal: 0.0,
            grad: vec![],
            samples: Some(Arc::from(vec![1.0, 2.0, 3.0])),
        };
        let s = few.sample_summary().unwrap();
        assert_eq!(
            (s.median, s.low, s.high, s.precision),
            (2.0, 1.0, 3.0, None)
        );
    }

    #[test]
    fn stable_means_within_half_the_second_digit() {
        // u = 0.034: digits shown to 0.001, tolerance 0.0005 (JCGM 101:2008 7.9.2, n_dig 2).
        let p = |w: f64| Precision {
            samples: 10_000,
            low: w,
            median: w,
            high: w,
        };
        assert!(p(0.00049).stable_for(0.034));
        assert!(!p(0.00051).stable_for(0.034));
        // u = 340: tolerance 5.
        assert!(p(4.9).stable_for(340.0) && !p(5.1).stable_for(340.0));
    }

    #[test]
    fn samples_without_a_value_are_left_out_of_the_summary() {
        // The same finite samples, alone and among samples of every kind that is not finite
        // (both signs of NaN and of infinity), give the same order statistics; the fraction
        // of finite samples counts the rest.
        let m = Measurement {
            value: 2.0,
            below: 0.5,
            above: 0.9,
            form: Form::Asymmetric,
        };
        // The summary of a value holding only these samples.
        let summary = |samples: Vec<f64>| {
            Value {
                nominal: 0.0,
                grad: vec![],
                samples: Some(Arc::from(samples)),
            }
            .sample_summary()
        };
        let finite = draw(&m, f64::NEG_INFINITY, f64::INFINITY, 3_000, 5);
        let alone = summary(finite.to_vec()).unwrap();
        let odd = [f64::NAN, -f64::NAN, f64::INFINITY, f64::NEG_INFINITY];
        let mut mixed: Vec<f64> = Vec::new();
        for (i, x) in finite.iter().enumerate() {
            if i % 7 == 0 {
                mixed.push(odd[i / 7 % 4]);
            }
            mixed.push(*x);
        }
        let among = summary(mixed.clone()).unwrap();
        assert_eq!(
            (among.median, among.low, among.high, among.precision),
            (alone.median, alone.low, alone.high, alone.precision)
        );
        assert_eq!(among.finite, 3_000.0 / mixed.len() as f64);
        assert_eq!(alone.finite, 1.0);
        // Nothing finite: no summary.
        assert!(summary(odd.to_vec()).is_none());
    }

    #[test]
    fn order_keys_sort_as_total_cmp() {
        // Reference: the standard library's total order on floats.
        let mut xs = vec![
            3.5, -0.0, 0.0, -2.25, 1e-310, -1e-310, 7e300, -7e300, 1.0, -1.0, 0.5,
        ];
        let mut keys: Vec<i64> = xs.iter().map(|x| order_key(*x)).collect();
        keys.sort();
        xs.sort_by(f64::total_cmp);
        let back: Vec<u64> = keys.iter().map(|k| from_order_key(*k).to_bits()).collect();
        assert_eq!(back, xs.iter().map(|x| x.to_bits()).collect::<Vec<_>>());
    }

    #[test]
    fn percentile_summary_of_normal_samples() {
        let m = Measurement {
            value: 5.0,
            below: 0.5,
            above: 0.5,
            form: Form::Symmetric,
        };
        let v = Value {
            nominal: 5.0,
            grad: vec![],
            samples: Some(draw(&m, f64::NEG_INFINITY, f64::INFINITY, 50_000, 3)),
        };
        let summary = v.sample_summary().unwrap();
        let (med, p16, p84) = (summary.median, summary.low, summary.high);
        assert!((med - 5.0).abs() < 0.01 && (p84 - p16 - 1.0).abs() < 0.02);
        assert_eq!(summary.finite, 1.0);
    }
}
