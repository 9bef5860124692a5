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
/// A derived value to which inputs that are not normal contribute at least this share of
/// the first-order variance is sampled.
pub const SHARE_LIMIT: f64 = 0.05;
/// The most draws taken for those values: their interval ends are then good to about 2 %
/// of the uncertainty (the standard error of a 16th percentile of `n` normal draws is
/// sqrt(0.16 * 0.84 / n) / 0.24 standard deviations), and first-order mode stays quick
/// enough for an editor.
pub const MOST_SAMPLES: usize = 4_000;

/// How the assumption that a value was sampled begins.
pub const SAMPLED: &str = "sampled, not first-order";

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
    /// Derived values whose first-order interval cannot be trusted, each with why.
    pub(super) fn doubts(&self) -> FxHashMap<Key, String> {
        let mut out = FxHashMap::default();
        for (key, entry) in &self.entries {
            if entry.origin != Origin::Derived || entry.value.grad.is_empty() {
                continue;
            }
            let (lo, hi) = entry.value.linear_spread(&self.inputs);
            let size = entry.value.nominal.abs();
            let relative = lo.max(hi) / size.max(f64::MIN_POSITIVE);
            let mut why = Vec::new();
            if relative > RELATIVE_LIMIT {
                why.push(format!(
                    "its first-order uncertainty is {:.0}% of the value",
                    (relative * 100.0).min(999.0)
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
                    Shape::Normal => continue,
                    Shape::Uniform => "is spread uniformly (a limit or an unknown angle)",
                    Shape::Skewed => "has a strongly asymmetric uncertainty",
                };
                why.push(format!("{} {what}", input.label));
            }
            if !why.is_empty() {
                out.insert(*key, why.join("; "));
            }
        }
        out
    }

    /// In first-order mode, sample the system when some derived value cannot be described
    /// to first order: the doubted values take their intervals from the samples.
    pub(super) fn sample_where_doubtful(&mut self) {
        if self.options.propagation != Propagation::Linear {
            return;
        }
        let doubts = self.doubts();
        if doubts.is_empty() {
            return;
        }
        let options = Options {
            propagation: Propagation::MonteCarlo,
            samples: self.options.samples.min(MOST_SAMPLES),
            ..self.options.clone()
        };
        self.sampled = Some(Sampled {
            derivation: Box::new(Derivation::run(self.sys, &options, self.lines)),
            doubts,
        });
    }

    /// The Monte Carlo median and 16th and 84th percentiles standing in for a doubted
    /// value's first-order interval, with the sentence that says so.
    pub(super) fn sampled_instead(&self, key: Key) -> Option<((f64, f64, f64), String)> {
        let s = self.sampled.as_ref()?;
        let why = s.doubts.get(&key)?;
        let (median, p16, p84, _) = s.derivation.value(key)?.sample_summary()?;
        let words = format!(
            "{SAMPLED}: {why}, so this interval is the median and 16th-84th percentiles of {} Monte Carlo draws (seed {})",
            s.derivation.options.samples, s.derivation.options.seed
        );
        Some(((median, p16, p84), words))
    }
}
