//! The exact first-order distribution of a prediction widened by its relation's scatter.
//!
//! A value predicted from a mass-radius relation is `y = A 10^(sigma z)`
//! (`Derivation::with_relation_scatter`): `A` the relation's mean at the inputs, described to
//! first order (normal, mean `a0`, standard deviation `sA`), and `z` a standard normal of its
//! own, the relation's intrinsic scatter of `sigma` dex (log-normal, as the relation's
//! authors fit it). Where the scatter is wide (0.146 dex on the Neptunian branch of
//! Chen & Kipping 2017, a factor 1.4), `y` is far from normal and first order's symmetric
//! interval misplaces both ends; sampling the whole system for it was the old remedy.
//!
//! With `x = y / a0`, `rho = sA / a0` and `c = sigma ln 10`, the distribution function is
//! one integral over either factor:
//!
//! `F(x) = E_a[Phi(ln(x / (1 + rho a)) / c)] = E_z[Phi((x e^(-c z) - 1) / rho)]`,
//!
//! `a` and `z` standard normal (a non-positive `A` lies below every positive `x`). It is
//! computed by Gauss-Hermite quadrature over the factor with the smaller relative spread, so
//! that the integrand changes by at most one standard deviation of its argument per
//! standard deviation of the variable integrated over: a smooth integrand, on which the
//! rule of [`NODES`] nodes is exact to about 1e-12 (the test checks it against the
//! closed form `E[Phi(b + s Z)] = Phi(b / sqrt(1 + s^2))`, Owen 1980, "A table of normal
//! integrals", 10,010.8). Its percentiles are found by Newton's method inside a bracket, and
//! agree with scipy's adaptive integration to 1e-8 of the value or better: no sampling, no
//! seed, no numerical noise, where the values it replaces were 4,000 draws of the system.

use std::sync::OnceLock;

use rustc_hash::{FxHashMap, FxHashSet};

use super::asymmetric::{phi_cdf, phi_pdf, probit, solve};
use super::validity::{RELATIVE_LIMIT, SCATTER_KEPT};
use super::value::{SampleSummary, Value, P_HIGH, P_LOW};
use super::Key;

/// A prediction widened by its relation's scatter, as [`super::Derivation`] records it.
#[derive(Debug, Clone, Copy, PartialEq)]
pub(super) struct Widened {
    /// The scatter's input (a unit normal).
    pub input: u32,
    /// The scatter in log10 of the predicted value.
    pub sigma_dex: f64,
    /// The masses (kg) of the relation's branch the prediction was made on: a mass spread
    /// across its ends meets the branch's kink, which first order does not describe.
    pub from: f64,
    pub to: f64,
    /// The mass the prediction rests on, where it is not the prediction itself (a radius
    /// predicted from a mass).
    pub mass: Option<super::Key>,
}

/// Why a prediction near an end of its relation's branch is sampled.
pub(super) const BRANCH_END: &str = "the mass it is predicted at is within three standard deviations of an end of the relation's branch or range, where the relation bends or stops";

/// A value's first-order standard deviation, its two sides averaged in square.
fn spread(v: &Value, inputs: &[super::value::InputInfo]) -> f64 {
    let (lo, hi) = v.linear_spread(inputs);
    ((lo * lo + hi * hi) / 2.0).sqrt()
}

/// Nodes of the Gauss-Hermite rule (even: the rule's halves mirror each other).
pub const NODES: usize = 40;
const _: () = assert!(NODES.is_multiple_of(2));

/// The nodes and weights of the `NODES`-point Gauss-Hermite rule for the standard normal
/// weight (`E[f(Z)] ~ sum w_k f(x_k)`, the weights summing to 1): the physicists' rule
/// found by Newton's method on the orthonormal Hermite recurrence (Golub & Welsch 1969 give
/// the same nodes as eigenvalues; Press et al., "Numerical Recipes", 3rd ed., 4.6.2, the
/// starting guesses), scaled by sqrt(2) and 1/sqrt(pi).
fn rule() -> &'static ([f64; NODES], [f64; NODES]) {
    static RULE: OnceLock<([f64; NODES], [f64; NODES])> = OnceLock::new();
    RULE.get_or_init(|| {
        let n = NODES;
        let nf = n as f64;
        let pim4 = std::f64::consts::PI.powf(-0.25);
        // The physicists' nodes from the largest down, each with its weight; the guesses
        // use the nodes found before.
        let mut found: Vec<(f64, f64)> = Vec::with_capacity(n.div_ceil(2));
        let mut z = 0.0;
        for i in 0..n.div_ceil(2) {
            let before = |k: usize| found.get(i - k).map_or(0.0, |f| f.0);
            z = match i {
                0 => (2.0 * nf + 1.0).sqrt() - 1.85575 * (2.0 * nf + 1.0).powf(-0.16667),
                1 => z - 1.14 * nf.powf(0.426) / z,
                2 => 1.86 * z - 0.86 * before(2),
                3 => 1.91 * z - 0.91 * before(2),
                _ => 2.0 * z - before(2),
            };
            let mut slope = 1.0;
            for _ in 0..100 {
                // The orthonormal Hermite functions' recurrence up to degree n.
                let (mut p1, mut p2) = (pim4, 0.0);
                for j in 1..=n {
                    let jf = j as f64;
                    let p3 = p2;
                    p2 = p1;
                    p1 = z * (2.0 / jf).sqrt() * p2 - ((jf - 1.0) / jf).sqrt() * p3;
                }
                slope = (2.0 * nf).sqrt() * p2;
                let step = p1 / slope;
                z -= step;
                if step.abs() <= 1e-15 * z.abs().max(1.0) {
                    break;
                }
            }
            found.push((z, 2.0 / (slope * slope) / std::f64::consts::PI.sqrt()));
        }
        // Both halves (n is even: no node at 0), scaled to the standard normal.
        let mut x = [0.0; NODES];
        let mut w = [0.0; NODES];
        let nodes = found
            .iter()
            .copied()
            .chain(found.iter().rev().map(|&(z, wt)| (-z, wt)));
        for ((xs, ws), (z, wt)) in x.iter_mut().zip(w.iter_mut()).zip(nodes) {
            *xs = z * std::f64::consts::SQRT_2;
            *ws = wt;
        }
        (x, w)
    })
}

/// `E[f(Z)]` for a standard normal `Z`, by the Gauss-Hermite rule.
fn expect(f: impl Fn(f64) -> f64) -> f64 {
    let (x, w) = rule();
    x.iter().zip(w).map(|(x, w)| w * f(*x)).sum()
}

/// The distribution of `y / a0 = (1 + rho a) e^(c z)` (see the module doc).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Scattered {
    /// The relative first-order spread of the relation's mean, `sA / a0`.
    rho: f64,
    /// The scatter in natural logarithm, `sigma ln 10`.
    c: f64,
}

impl Scattered {
    /// `rel_rest` is `sA / a0`, `sigma_dex` the relation's scatter in log10. `None` where the
    /// scatter is not positive or a number is not finite.
    pub fn new(rel_rest: f64, sigma_dex: f64) -> Option<Scattered> {
        let c = sigma_dex * std::f64::consts::LN_10;
        (rel_rest.is_finite() && rel_rest >= 0.0 && c.is_finite() && c > 0.0)
            .then_some(Scattered { rho: rel_rest, c })
    }

    /// Whether the integral runs over the relation's mean (its spread is the smaller).
    fn over_mean(&self) -> bool {
        self.rho <= self.c
    }

    /// `P(y / a0 <= x)`.
    pub fn cdf(&self, x: f64) -> f64 {
        let (rho, c) = (self.rho, self.c);
        if self.over_mean() && x > 0.0 {
            expect(|a| {
                let mean = 1.0 + rho * a;
                if mean <= 0.0 {
                    1.0
                } else {
                    phi_cdf((x / mean).ln() / c)
                }
            })
        } else if rho > 0.0 {
            expect(|z| phi_cdf((x * (-c * z).exp() - 1.0) / rho))
        } else {
            // No spread of the mean and x <= 0: y is positive.
            0.0
        }
    }

    /// The density of `y / a0` at `x`.
    pub fn pdf(&self, x: f64) -> f64 {
        let (rho, c) = (self.rho, self.c);
        if self.over_mean() {
            if x <= 0.0 {
                return 0.0;
            }
            expect(|a| {
                let mean = 1.0 + rho * a;
                if mean <= 0.0 {
                    0.0
                } else {
                    phi_pdf((x / mean).ln() / c) / (c * x)
                }
            })
        } else {
            expect(|z| {
                let shrink = (-c * z).exp();
                phi_pdf((x * shrink - 1.0) / rho) * shrink / rho
            })
        }
    }

    /// The `p` quantile of `y / a0`; `None` for `p` outside (0, 1).
    pub fn quantile(&self, p: f64) -> Option<f64> {
        let z = probit(p)?;
        let wide = self.rho.hypot(self.c);
        // The log-normal of the combined spread as the start; a bracket from below every
        // value to far above (|z| < 9 holds all but 1e-18 of either factor).
        let hi = (9.0 * self.c).exp() * (1.0 + 9.0 * self.rho);
        let lo = if self.over_mean() {
            0.0
        } else {
            -9.0 * self.rho * (9.0 * self.c).exp()
        };
        Some(solve(
            |x| self.cdf(x),
            |x| self.pdf(x),
            p,
            lo,
            hi,
            (z * wide).exp(),
        ))
    }
}

impl super::Derivation<'_> {
    /// Of the values doubted only for the size of their uncertainty (`only_size`), the
    /// predictions widened by a relation's scatter ([`Widened`]) whose rest first order
    /// describes take their exact distribution (the module doc): each leaves `doubts` with
    /// its interval recorded beside the other exact ones. Returns why each other such
    /// prediction is sampled all the same.
    pub(super) fn scatter_exactly(
        &mut self,
        doubts: &mut FxHashMap<Key, String>,
        only_size: &FxHashSet<Key>,
    ) -> FxHashMap<Key, String> {
        let mut keys: Vec<Key> = only_size
            .iter()
            .filter(|k| self.widened.contains_key(k))
            .copied()
            .collect();
        keys.sort();
        let mut not_exact = FxHashMap::default();
        for key in keys {
            match self.scattered_interval(key, doubts) {
                Ok((summary, sigma)) => {
                    if let Some(why) = doubts.remove(&key) {
                        let words = format!(
                            "{SCATTER_KEPT}: {why}, so this interval is the median and 16th-84th percentiles of the prediction with the relation's scatter of {} dex taken as the log-normal it is and the first-order spread of the rest added, integrated numerically (Gauss-Hermite quadrature); not sampled",
                            crate::format::sig(sigma, 3)
                        );
                        self.two_lines.insert(key, (summary, words));
                    }
                }
                Err(why_not) => {
                    not_exact.insert(key, why_not);
                }
            }
        }
        not_exact
    }

    /// The relative first-order spread of the widened prediction `key` without its
    /// relation's scatter: the spread of the relation's mean at the inputs.
    fn rest_of_prediction(&self, key: Key) -> Option<f64> {
        let (w, e) = (self.widened.get(&key)?, self.entries.get(&key)?);
        let rest = e.value.without(w.input);
        Some(spread(&rest, &self.inputs) / e.value.nominal)
    }

    /// Whether the mass a widened prediction is made at (the mass it rests on, or the
    /// predicted mass without the relation's scatter) lies within three standard deviations
    /// of an end of the relation's branch or range: there the relation bends or stops, which
    /// first order does not describe.
    pub(super) fn near_branch_end(&self, key: Key) -> bool {
        let (Some(w), Some(e)) = (self.widened.get(&key), self.entries.get(&key)) else {
            return false;
        };
        let (m0, sm) = match w.mass.and_then(|k| self.entries.get(&k)) {
            Some(m) => (m.value.nominal, spread(&m.value, &self.inputs)),
            None => (
                e.value.nominal,
                spread(&e.value.without(w.input), &self.inputs),
            ),
        };
        !(m0 - 3.0 * sm >= w.from && m0 + 3.0 * sm < w.to)
    }

    /// The exact median and percentiles of the widened prediction `key`, with its scatter in
    /// dex, or why first order cannot describe the rest of its spread.
    fn scattered_interval(
        &self,
        key: Key,
        doubts: &FxHashMap<Key, String>,
    ) -> Result<(SampleSummary, f64), String> {
        let (Some(w), Some(e)) = (self.widened.get(&key), self.entries.get(&key)) else {
            return Err("its relation's scatter was not found".to_string());
        };
        if let Some(d) = e
            .deps
            .iter()
            .filter(|d| **d != key && doubts.contains_key(d))
            .min()
        {
            return Err(format!(
                "it rests on {}, which first order cannot describe",
                self.key_name(*d)
            ));
        }
        let v0 = e.value.nominal;
        let rho = self.rest_of_prediction(key).unwrap_or(f64::INFINITY);
        if !(v0 > 0.0 && rho <= RELATIVE_LIMIT) {
            return Err(format!(
                "the rest of its spread is {:.0}% of it, too wide for first order",
                (rho * 100.0).min(999.0)
            ));
        }
        if self.near_branch_end(key) {
            return Err(BRANCH_END.to_string());
        }
        let d = Scattered::new(rho, w.sigma_dex).ok_or("its scatter is not positive")?;
        let at = |p: f64| d.quantile(p).map(|x| v0 * x);
        match (at(0.5), at(P_LOW), at(P_HIGH)) {
            (Some(median), Some(low), Some(high)) => Ok((
                SampleSummary {
                    median,
                    low,
                    high,
                    finite: 1.0,
                    precision: None,
                },
                w.sigma_dex,
            )),
            _ => Err("its percentiles were not found".to_string()),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_rule_integrates_normal_moments_and_a_normal_integral() {
        // E[Z^2k] = (2k - 1)!! (any table of the normal distribution's moments).
        let moments = [1.0, 1.0, 3.0, 15.0, 105.0, 945.0];
        for (k, want) in moments.iter().enumerate() {
            let got = expect(|z| z.powi(2 * k as i32));
            assert!((got - want).abs() < 1e-12 * want, "E[Z^{}] = {got}", 2 * k);
        }
        assert!(expect(|z| z.powi(3)).abs() < 1e-12);
        // E[Phi(b + s Z)] = Phi(b / sqrt(1 + s^2)) (Owen 1980, 10,010.8): the integrand this
        // module meets, with s up to 1.
        for s in [0.1, 0.5, 1.0] {
            for b in [-2.5, -1.0, 0.0, 0.3, 1.7] {
                let got = expect(|z| phi_cdf(b + s * z));
                let want = phi_cdf(b / (1.0 + s * s).sqrt());
                assert!((got - want).abs() < 1e-12, "s {s} b {b}: {got} vs {want}");
            }
        }
    }

    #[test]
    fn no_spread_of_the_mean_gives_the_log_normal() {
        // rho = 0: y / a0 = 10^(sigma z), whose p quantile is 10^(sigma probit(p)).
        let d = Scattered::new(0.0, 0.146).unwrap();
        for p in [0.158_655_253_931_457, 0.5, 0.841_344_746_068_543] {
            let want = 10f64.powf(0.146 * probit(p).unwrap());
            let got = d.quantile(p).unwrap();
            assert!((got - want).abs() < 1e-12, "{p}: {got} vs {want}");
        }
    }

    #[test]
    fn the_distribution_function_is_increasing_and_its_density_agrees() {
        for (rho, sigma) in [(0.1, 0.146), (0.24, 0.04), (0.2, 0.08)] {
            let d = Scattered::new(rho, sigma).unwrap();
            let mut last = 0.0;
            for i in 1..400 {
                let x = f64::from(i) * 0.006;
                let f = d.cdf(x);
                assert!(f >= last - 1e-14, "{rho} {sigma} {x}");
                last = f;
                let h = 1e-6;
                let slope = (d.cdf(x + h) - d.cdf(x - h)) / (2.0 * h);
                assert!(
                    (slope - d.pdf(x)).abs() < 1e-6 * d.pdf(x).max(1.0),
                    "{rho} {sigma} {x}: {slope} {}",
                    d.pdf(x)
                );
            }
        }
    }

    /// Against percentiles from scipy's adaptive integration of the distribution function
    /// (Gauss-Kronrod over the whole line, not this module's fixed rule; numpy's 10^7 draws
    /// agree with it to their noise):
    /// tests/reference/make_scatter_reference.py.
    #[test]
    fn percentiles_match_scipy_integration() {
        let (ps, cases) = super::super::asymmetric::reference(include_str!(
            "../../../tests/reference/scatter.json"
        ));
        assert!(cases.len() >= 6);
        for case in &cases {
            let num = |k: &str| case[k].as_f64().expect("number");
            let d = Scattered::new(num("rho"), num("sigma_dex")).expect("spread");
            for (p, want) in ps
                .iter()
                .zip(case["quantiles"].as_array().expect("quantiles"))
            {
                let want = want.as_f64().expect("number");
                let got = d.quantile(*p).expect("quantile");
                assert!(
                    (got - want).abs() < 1e-7 * want.abs().max(1e-3),
                    "{case}: p {p}: {got} vs {want}"
                );
            }
        }
    }
}
