//! The first-order distribution of a value that rests on an orbit's unknown orientation.
//!
//! An eccentric orbit whose argument of periastron is not known has it spread uniformly over
//! a full turn (`inputs.rs`). A value that depends on it (a transit's durations, the
//! inclination from the impact parameter, through `(1 - e^2) / (1 + e sin omega)`) is then
//! far from normal, and first order's slope at one orientation says nothing of it. Held at
//! one orientation `omega`, though, the value is as well described to first order as any:
//! normal, with mean `f(omega)` and standard deviation `s(omega)` from every other input.
//! Over the uniform orientation its distribution is the mixture
//!
//! `F(t) = (1 / 2 pi) int Phi((t - f(omega)) / s(omega)) d omega`,
//!
//! the integral of a smooth periodic function, which the trapezoid rule on [`NODES`] equally
//! spaced orientations integrates with an error that falls geometrically with their number
//! (Trefethen & Weideman 2014, "The exponentially convergent trapezoidal rule", SIAM Review
//! 56, 385), once neighbouring nodes are closer in `f` than the spread `s`
//! ([`Mixture::resolved`]; a value that is not is sampled).
//!
//! `f` and `s` at the nodes come from one run of the engine over columns, as Monte Carlo runs
//! it, but with deterministic columns in place of draws ([`Grid`]): the orientation at the
//! nodes, every other input at its value, and, in two blocks of its own, each input the
//! values rest on moved to its value plus and less its standard uncertainty: half their
//! difference is its first-order move at each node, and half their sum less the value its
//! curvature, which must stay within a tenth of the value's spread (the test
//! `Derivation::curved` in `asymmetric.rs` applies at one orientation). A system of `k` such
//! inputs costs `NODES (2k + 1)` evaluations, a fraction of the 4,000 draws it replaces, and
//! the result has no seed and no sampling noise. The percentiles are found by Newton's method
//! inside a bracket.

use std::collections::BTreeMap;
use std::sync::Arc;

use rustc_hash::{FxHashMap, FxHashSet};

use super::asymmetric::{phi_cdf, phi_pdf, probit, solve};
use super::validity::{
    ratio_scale, CURVATURE_LIMIT, MOST_SAMPLES, OUTSIDE_LIMIT, RELATIVE_LIMIT, SHARE_LIMIT,
    TURN_KEPT,
};
use super::value::{SampleSummary, Shape, P_HIGH, P_LOW};
use super::{Derivation, Key, Options, Propagation};

/// Equally spaced orientations the integral is taken at.
pub const NODES: usize = 64;

/// The orientation of node `j`, radians: the nodes sit half a step from 0.
fn node(j: usize) -> f64 {
    2.0 * std::f64::consts::PI * (j as f64 + 0.5) / NODES as f64
}

/// Deterministic columns for a run over an angle's nodes (see the module doc).
#[derive(Debug, Clone)]
pub(super) struct Grid {
    /// The label of the angle's input.
    angle: String,
    /// The inputs moved, each to its value plus and then less its step (SI), in two blocks
    /// of [`NODES`] columns of its own after the first.
    moved: Vec<(String, f64)>,
}

impl Grid {
    /// The length of every column.
    pub fn len(&self) -> usize {
        NODES * (1 + 2 * self.moved.len())
    }

    /// The column of the input labelled `label`, whose value is `nominal`.
    pub fn column(&self, label: &str, nominal: f64) -> Arc<[f64]> {
        let n = self.len();
        if label == self.angle {
            return (0..n).map(|i| node(i % NODES)).collect();
        }
        match self.moved.iter().position(|(l, _)| l == label) {
            Some(m) => {
                let step = self.moved.get(m).map_or(0.0, |m| m.1);
                (0..n)
                    .map(|i| match i / NODES {
                        b if b == 2 * m + 1 => nominal + step,
                        b if b == 2 * m + 2 => nominal - step,
                        _ => nominal,
                    })
                    .collect()
            }
            None => std::iter::repeat_n(nominal, n).collect(),
        }
    }
}

/// An equal mixture of normals: the value's distribution over the nodes.
#[derive(Debug, Clone, PartialEq)]
pub struct Mixture {
    f: Vec<f64>,
    s: Vec<f64>,
}

impl Mixture {
    /// The normals of means `f` and standard deviations `s`, one per node. `None` where the
    /// two differ in length, are empty, or hold a number that is not finite (the value has
    /// no value at some orientation) or a negative spread.
    pub fn new(f: Vec<f64>, s: Vec<f64>) -> Option<Mixture> {
        let ok = !f.is_empty()
            && f.len() == s.len()
            && f.iter().all(|v| v.is_finite())
            && s.iter().all(|v| v.is_finite() && *v >= 0.0);
        ok.then_some(Mixture { f, s })
    }

    /// Whether neighbouring nodes (the last beside the first: the nodes go round a turn)
    /// differ in mean by no more than the narrower one's spread, so that the trapezoid rule
    /// resolves the integrand.
    pub fn resolved(&self) -> bool {
        let n = self.f.len();
        (0..n).all(|j| {
            let k = (j + 1) % n;
            let at = |v: &[f64], i: usize| v.get(i).copied().unwrap_or(f64::NAN);
            (at(&self.f, k) - at(&self.f, j)).abs() <= at(&self.s, j).min(at(&self.s, k))
        })
    }

    pub fn cdf(&self, t: f64) -> f64 {
        let sum: f64 = self
            .f
            .iter()
            .zip(&self.s)
            .map(|(f, s)| {
                if *s > 0.0 {
                    phi_cdf((t - f) / s)
                } else if t >= *f {
                    1.0
                } else {
                    0.0
                }
            })
            .sum();
        sum / self.f.len() as f64
    }

    pub fn pdf(&self, t: f64) -> f64 {
        let sum: f64 = self
            .f
            .iter()
            .zip(&self.s)
            .filter(|(_, s)| **s > 0.0)
            .map(|(f, s)| phi_pdf((t - f) / s) / s)
            .sum();
        sum / self.f.len() as f64
    }

    /// The `p` quantile; `None` for `p` outside (0, 1).
    pub fn quantile(&self, p: f64) -> Option<f64> {
        let z = probit(p)?;
        let n = self.f.len() as f64;
        let mean = self.f.iter().sum::<f64>() / n;
        let var = self
            .f
            .iter()
            .zip(&self.s)
            .map(|(f, s)| (f - mean).powi(2) + s * s)
            .sum::<f64>()
            / n;
        let lo = self
            .f
            .iter()
            .zip(&self.s)
            .map(|(f, s)| f - 10.0 * s)
            .fold(f64::INFINITY, f64::min);
        let hi = self
            .f
            .iter()
            .zip(&self.s)
            .map(|(f, s)| f + 10.0 * s)
            .fold(f64::NEG_INFINITY, f64::max);
        Some(solve(
            |t| self.cdf(t),
            |t| self.pdf(t),
            p,
            lo,
            hi,
            mean + z * var.sqrt(),
        ))
    }
}

impl Derivation<'_> {
    /// Of the values doubted only for an orbit's unknown orientation (`only_turn`, each with
    /// that angle's input), those the integral over it describes (the module doc) leave
    /// `doubts` with their interval recorded beside the other exact ones. Returns why each
    /// other such value is sampled all the same.
    /// A value it rests on that is doubted only for inputs that are not normal (`by_inputs`)
    /// does not stand in the way: the value's own budget gives those inputs less than
    /// [`SHARE_LIMIT`] of its variance, or it would be doubted for them too.
    pub(super) fn turn_exactly(
        &mut self,
        doubts: &mut FxHashMap<Key, String>,
        only_turn: &FxHashMap<Key, u32>,
        by_inputs: &FxHashSet<Key>,
    ) -> FxHashMap<Key, String> {
        let mut not_exact = FxHashMap::default();
        // Each angle in a run of its own: a value resting on two would need both.
        let mut by_angle: BTreeMap<u32, Vec<Key>> = BTreeMap::new();
        for (key, angle) in only_turn {
            let Some(e) = self.entries.get(key) else {
                continue;
            };
            let other = e.deps.iter().filter(|d| *d != key).find(|d| {
                doubts.contains_key(d)
                    && !by_inputs.contains(d)
                    && only_turn.get(d).is_none_or(|a| a != angle)
            });
            match other {
                Some(d) => {
                    not_exact.insert(
                        *key,
                        format!(
                            "it rests on {}, which first order cannot describe",
                            self.key_name(*d)
                        ),
                    );
                }
                None => by_angle.entry(*angle).or_default().push(*key),
            }
        }
        for (angle, mut keys) in by_angle {
            keys.sort();
            for (key, result) in self.over_turn(angle, &keys) {
                match result {
                    Ok(summary) => {
                        if let Some(why) = doubts.remove(&key) {
                            let words = format!(
                                "{TURN_KEPT}: {why}, so this interval is the median and 16th-84th percentiles of the value over every orientation ({NODES} equally spaced arguments of periastron), with the other inputs' first-order spread at each; not sampled"
                            );
                            self.two_lines.insert(key, (summary, words));
                        }
                    }
                    Err(why_not) => {
                        not_exact.insert(key, why_not);
                    }
                }
            }
        }
        not_exact
    }

    /// The intervals of `keys` over the full turn of the angle input `angle`, from one run
    /// over the [`Grid`]'s columns, or why each cannot be had.
    fn over_turn(&self, angle: u32, keys: &[Key]) -> Vec<(Key, Result<SampleSummary, String>)> {
        let Some(angle_label) = self.inputs.get(angle as usize).map(|i| i.label.clone()) else {
            return Vec::new();
        };
        // Every input the values rest on but the angle, each with its standard uncertainty.
        let mut moved: BTreeMap<u32, f64> = BTreeMap::new();
        for key in keys {
            for (id, _) in self.entries.get(key).map_or(&[][..], |e| &e.value.grad) {
                let sigma = self
                    .inputs
                    .get(*id as usize)
                    .map_or(0.0, |i| 0.5 * (i.below + i.above));
                if *id != angle && sigma > 0.0 {
                    moved.insert(*id, sigma);
                }
            }
        }
        let inputs: Vec<&super::value::InputInfo> = moved
            .keys()
            .filter_map(|id| self.inputs.get(*id as usize))
            .collect();
        let grid = Grid {
            angle: angle_label,
            moved: inputs
                .iter()
                .zip(moved.values())
                .map(|(i, sigma)| (i.label.clone(), *sigma))
                .collect(),
        };
        let n = grid.len();
        // Never more columns than the draws it replaces: values resting on very many inputs
        // (an expression of hundreds of uncertain literals) are sampled instead.
        if n > MOST_SAMPLES {
            return keys
                .iter()
                .map(|k| {
                    (
                        *k,
                        Err(format!(
                            "it rests on more inputs than the run over every orientation takes ({})",
                            (MOST_SAMPLES / NODES - 1) / 2
                        )),
                    )
                })
                .collect();
        }
        let options = Options {
            propagation: Propagation::MonteCarlo,
            samples: n,
            adaptive: false,
            ..self.options.clone()
        };
        let moved_count = grid.moved.len();
        let run = Derivation::run_drawing(
            self.sys,
            &options,
            self.lines,
            Default::default(),
            Some(self.cone(keys.iter())),
            true,
            Some(grid),
        );
        let too_large = run.n() != n;
        keys.iter()
            .map(|key| {
                let col = run
                    .entries
                    .get(key)
                    .and_then(|e| e.value.samples.clone())
                    .filter(|c| c.len() == n && !too_large);
                let Some(col) = col else {
                    return (*key, Err("its system is too large for the run over every orientation".to_string()));
                };
                let at = |i: usize| col.get(i).copied().unwrap_or(f64::NAN);
                let f: Vec<f64> = (0..NODES).map(at).collect();
                // Input `m` at its two sides, at node `j`: half the difference is its move
                // per standard uncertainty (its first-order share: the square is its
                // variance), half the sum less the value its curvature.
                let sides = |m: usize, j: usize| {
                    (
                        at((2 * m + 1) * NODES + j),
                        at((2 * m + 2) * NODES + j),
                    )
                };
                let var = |m: usize, j: usize| {
                    let (up, down) = sides(m, j);
                    (0.5 * (up - down)).powi(2)
                };
                let s: Vec<f64> = (0..NODES)
                    .map(|j| (0..moved_count).map(|m| var(m, j)).sum::<f64>().sqrt())
                    .collect();
                // A side with no value (an eccentricity pushed past 1).
                if let Some((m, _)) = inputs.iter().enumerate().find(|(m, _)| {
                    (0..NODES).any(|j| {
                        let (up, down) = sides(*m, j);
                        !(up.is_finite() && down.is_finite())
                    })
                }) {
                    let input = inputs.get(m);
                    let label = input.map_or("?", |i| i.label.as_str());
                    let why = if input.is_some_and(|i| i.outside > OUTSIDE_LIMIT) {
                        format!("the stated distribution of {label} reaches past its range")
                    } else {
                        format!("it has no value at a side of {label} at some orientations")
                    };
                    return (*key, Err(why));
                }
                // First order at each orientation: the value's moves to an input's two
                // sides must match its slope there, as `Derivation::curved` asks of values at
                // one orientation (an inclination from an eccentricity of 0.64 +- 0.15 bends
                // within it). Over the turn, in the root mean square: the mixture's ends are
                // made of many orientations.
                let mean_square = |g: &dyn Fn(usize) -> f64| {
                    ((0..NODES).map(|j| g(j).powi(2)).sum::<f64>() / NODES as f64).sqrt()
                };
                let spread = mean_square(&|j| s.get(j).copied().unwrap_or(0.0));
                if let Some((m, _)) = inputs.iter().enumerate().find(|(m, _)| {
                    let bend = mean_square(&|j| {
                        let (up, down) = sides(*m, j);
                        0.5 * (up + down) - at(j)
                    });
                    bend > CURVATURE_LIMIT * spread && bend > 1e-9 * spread.max(f64::MIN_POSITIVE)
                }) {
                    let label = inputs.get(m).map_or("?", |i| i.label.as_str());
                    return (
                        *key,
                        Err(format!(
                            "at some orientations it bends across the two sides of {label} by more than a tenth of its first-order spread"
                        )),
                    );
                }
                // At each orientation the rest is taken as normal, so its inputs must be
                // close to normal where they give a share of its variance over the turn (the
                // test of `validity::SHARE_LIMIT`, which at one orientation the angle's own
                // spread hides): not a limit, not strongly asymmetric, and not kept inside
                // its range for more than `validity::OUTSIDE_LIMIT` of it (an eccentricity of
                // 0.04 +- 0.04 has 16 % below 0).
                let total: f64 = s.iter().map(|v| v * v).sum();
                let not_normal: Vec<String> = inputs
                    .iter()
                    .enumerate()
                    .filter(|(m, _)| {
                        (0..NODES).map(|j| var(*m, j)).sum::<f64>() >= SHARE_LIMIT * total
                    })
                    .filter_map(|(_, i)| match i.shape {
                        Shape::Uniform if i.limit.is_some() => Some(format!(
                            "{} is a limit, spread uniformly over its range",
                            i.label
                        )),
                        Shape::Uniform => Some(format!(
                            "{} is not known: spread uniformly over a full turn",
                            i.label
                        )),
                        Shape::Skewed => {
                            Some(format!("{} has a strongly asymmetric uncertainty", i.label))
                        }
                        Shape::Normal if i.outside > OUTSIDE_LIMIT => Some(format!(
                            "the stated distribution of {} reaches past its range",
                            i.label
                        )),
                        Shape::Normal => None,
                    })
                    .collect();
                if !not_normal.is_empty() {
                    return (*key, Err(not_normal.join("; ")));
                }
                // First order of the rest at each orientation, as at one (the test of
                // `validity::RELATIVE_LIMIT`).
                if ratio_scale(key.1)
                    && f.iter().zip(&s).any(|(f, s)| *s > RELATIVE_LIMIT * f.abs())
                {
                    return (
                        *key,
                        Err(format!(
                            "the rest of its spread is more than {:.0}% of it at some orientations",
                            RELATIVE_LIMIT * 100.0
                        )),
                    );
                }
                let result = match Mixture::new(f, s) {
                    None => Err("it has no value at some orientations".to_string()),
                    Some(m) if !m.resolved() => Err(format!(
                        "it changes with the orientation faster than {NODES} orientations resolve against the rest of its spread"
                    )),
                    Some(m) => match (m.quantile(0.5), m.quantile(P_LOW), m.quantile(P_HIGH)) {
                        (Some(median), Some(low), Some(high)) => Ok(SampleSummary {
                            median,
                            low,
                            high,
                            finite: 1.0,
                            precision: None,
                        }),
                        _ => Err("its percentiles were not found".to_string()),
                    },
                };
                (*key, result)
            })
            .collect()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn one_node_of_no_spread_is_its_value_and_equal_normals_are_that_normal() {
        // Normals all alike: the mixture is that normal.
        let m = Mixture::new(vec![2.0; 8], vec![0.5; 8]).unwrap();
        assert!((m.quantile(P_HIGH).unwrap() - 2.5).abs() < 1e-12);
        assert!((m.quantile(0.5).unwrap() - 2.0).abs() < 1e-12);
        assert!(Mixture::new(vec![1.0, f64::NAN], vec![0.1, 0.1]).is_none());
    }

    /// The arcsine law: over a uniform angle, `f = cos(omega)` has the distribution
    /// function `F(t) = 1 - acos(t) / pi` (any table of the arcsine distribution), so its
    /// 84th percentile is `cos(pi (1 - 0.8413))`; with a small normal spread added the
    /// mixture tends to it.
    #[test]
    fn a_uniform_angle_through_a_cosine_gives_the_arcsine_law() {
        let f: Vec<f64> = (0..NODES).map(|j| node(j).cos()).collect();
        // Neighbours differ by up to 2 pi / 64 = 0.098: a spread of 0.1 resolves them.
        let m = Mixture::new(f, vec![0.1; NODES]).unwrap();
        assert!(m.resolved());
        // The arcsine law convolved with N(0, 0.1^2), by a fine sum (10^5 angles, 801 points
        // of the normal) as the reference.
        let fine = |t: f64| {
            let n = 100_000;
            let mut sum = 0.0;
            for i in 0..n {
                let w = 2.0 * std::f64::consts::PI * (i as f64 + 0.5) / n as f64;
                sum += phi_cdf((t - w.cos()) / 0.1);
            }
            sum / n as f64
        };
        for p in [P_LOW, 0.5, P_HIGH] {
            let t = m.quantile(p).unwrap();
            assert!((fine(t) - p).abs() < 1e-6, "{p}: {t} {}", fine(t));
        }
        // Without the spread, the nodes do not resolve it.
        let bare = Mixture::new(
            (0..NODES).map(|j| node(j).cos()).collect(),
            vec![0.01; NODES],
        )
        .unwrap();
        assert!(!bare.resolved());
    }

    #[test]
    fn a_grid_moves_one_input_per_block_and_turns_the_angle() {
        let g = Grid {
            angle: "b.arg_periastron".into(),
            moved: vec![("b.period".into(), 0.5), ("s.mass".into(), 2.0)],
        };
        assert_eq!(g.len(), 5 * NODES);
        let angle = g.column("b.arg_periastron", 3.0);
        assert!((angle[0] - node(0)).abs() < 1e-15 && (angle[NODES + 5] - node(5)).abs() < 1e-15);
        let mass = g.column("s.mass", 10.0);
        assert_eq!(
            (mass[0], mass[NODES], mass[3 * NODES + 3], mass[4 * NODES]),
            (10.0, 10.0, 12.0, 8.0)
        );
        let other = g.column("s.teff", 5000.0);
        assert!(other.iter().all(|v| *v == 5000.0));
    }
}
