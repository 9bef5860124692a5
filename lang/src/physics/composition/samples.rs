//! Classifying paired Monte Carlo samples of a planet's mass and radius: the counts per class
//! in a [`CompositionSummary`], with the samples rejected or classified by extrapolation, and
//! why a set of samples could not be used ([`SampleProblem`]).
//!
//! # Samples
//!
//! Mass and radius samples are paired by index. A pair is *rejected* (not counted in any
//! class) if either value is non-finite or not positive. Mismatched slice lengths are an
//! input problem: no pair is used and the summary records the problem. With no usable
//! pair every probability is `None`.

use super::classes::classify_valid_point;
use super::{ClassBoundaries, CompositionClass};

/// Why a set of samples could not be used at all.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum SampleProblem {
    /// The mass and radius slices have different lengths, so samples cannot be paired.
    LengthMismatch {
        /// Number of mass samples.
        mass_len: usize,
        /// Number of radius samples.
        radius_len: usize,
    },
    /// The class boundaries are not usable (see [`ClassBoundaries::is_valid`]).
    InvalidBoundaries,
}

impl std::fmt::Display for SampleProblem {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            SampleProblem::LengthMismatch {
                mass_len,
                radius_len,
            } => write!(
                f,
                "{mass_len} mass samples but {radius_len} radius samples; samples must pair up"
            ),
            SampleProblem::InvalidBoundaries => write!(f, "invalid composition class boundaries"),
        }
    }
}

#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
struct ClassCounts {
    denser_than_iron: usize,
    iron_rich: usize,
    rocky: usize,
    volatile_rich: usize,
    gas_giant: usize,
    inflated_giant: usize,
    outside_models: usize,
}

impl ClassCounts {
    fn get(&self, class: CompositionClass) -> usize {
        match class {
            CompositionClass::DenserThanIron => self.denser_than_iron,
            CompositionClass::IronRich => self.iron_rich,
            CompositionClass::Rocky => self.rocky,
            CompositionClass::VolatileRich => self.volatile_rich,
            CompositionClass::GasGiant => self.gas_giant,
            CompositionClass::InflatedGiant => self.inflated_giant,
            CompositionClass::OutsideModels => self.outside_models,
        }
    }

    fn add(&mut self, class: CompositionClass) {
        let slot = match class {
            CompositionClass::DenserThanIron => &mut self.denser_than_iron,
            CompositionClass::IronRich => &mut self.iron_rich,
            CompositionClass::Rocky => &mut self.rocky,
            CompositionClass::VolatileRich => &mut self.volatile_rich,
            CompositionClass::GasGiant => &mut self.gas_giant,
            CompositionClass::InflatedGiant => &mut self.inflated_giant,
            CompositionClass::OutsideModels => &mut self.outside_models,
        };
        *slot += 1;
    }
}

/// Result of classifying Monte Carlo samples.
#[derive(Clone, Debug, PartialEq)]
pub struct CompositionSummary {
    counts: ClassCounts,
    /// Number of (mass, radius) pairs offered (0 on a length mismatch).
    pub n_pairs: usize,
    /// Pairs used (both values positive and finite).
    pub n_valid: usize,
    /// Pairs rejected (a value non-finite or not positive).
    pub n_rejected: usize,
    /// Valid pairs whose classification used a curve outside its fitted range.
    pub n_extrapolated: usize,
    /// Set when the samples could not be used at all.
    pub problem: Option<SampleProblem>,
    /// The boundaries the classes were computed with.
    pub boundaries: ClassBoundaries,
}

impl CompositionSummary {
    fn empty(problem: Option<SampleProblem>, boundaries: ClassBoundaries) -> Self {
        CompositionSummary {
            counts: ClassCounts::default(),
            n_pairs: 0,
            n_valid: 0,
            n_rejected: 0,
            n_extrapolated: 0,
            problem,
            boundaries,
        }
    }

    /// Number of valid samples in `class`.
    pub fn count(&self, class: CompositionClass) -> usize {
        self.counts.get(class)
    }

    /// Fraction of valid samples in `class`; `None` when no sample was usable.
    pub fn probability(&self, class: CompositionClass) -> Option<f64> {
        (self.n_valid > 0).then(|| self.counts.get(class) as f64 / self.n_valid as f64)
    }

    /// Every class with its probability, densest first; empty when no sample was usable.
    pub fn probabilities(&self) -> Vec<(CompositionClass, f64)> {
        CompositionClass::ALL
            .iter()
            .filter_map(|&c| self.probability(c).map(|p| (c, p)))
            .collect()
    }

    /// The class holding the most samples (ties go to the denser class); `None` when
    /// no sample was usable.
    pub fn most_probable(&self) -> Option<CompositionClass> {
        if self.n_valid == 0 {
            return None;
        }
        CompositionClass::ALL
            .iter()
            .copied()
            .rev()
            .max_by_key(|&c| self.counts.get(c))
    }

    /// Fraction of valid samples classified with an extrapolated curve; `None` when no
    /// sample was usable.
    pub fn fraction_extrapolated(&self) -> Option<f64> {
        (self.n_valid > 0).then(|| self.n_extrapolated as f64 / self.n_valid as f64)
    }
}

/// Classifies paired Monte Carlo samples with the default [`ClassBoundaries`].
pub fn classify(mass_samples_kg: &[f64], radius_samples_m: &[f64]) -> CompositionSummary {
    classify_with(
        mass_samples_kg,
        radius_samples_m,
        &ClassBoundaries::default(),
    )
}

/// Classifies paired Monte Carlo samples with the given boundaries. Never panics: a
/// length mismatch or invalid boundaries give a summary with `problem` set and no
/// probabilities; invalid pairs are counted in `n_rejected`.
pub fn classify_with(
    mass_samples_kg: &[f64],
    radius_samples_m: &[f64],
    boundaries: &ClassBoundaries,
) -> CompositionSummary {
    if mass_samples_kg.len() != radius_samples_m.len() {
        return CompositionSummary::empty(
            Some(SampleProblem::LengthMismatch {
                mass_len: mass_samples_kg.len(),
                radius_len: radius_samples_m.len(),
            }),
            *boundaries,
        );
    }
    if !boundaries.is_valid() {
        return CompositionSummary::empty(Some(SampleProblem::InvalidBoundaries), *boundaries);
    }
    let mut summary = CompositionSummary::empty(None, *boundaries);
    for (&m, &r) in mass_samples_kg.iter().zip(radius_samples_m) {
        summary.n_pairs += 1;
        match classify_valid_point(m, r, boundaries) {
            Some((class, extrapolated)) => {
                summary.n_valid += 1;
                summary.counts.add(class);
                if extrapolated {
                    summary.n_extrapolated += 1;
                }
            }
            None => summary.n_rejected += 1,
        }
    }
    summary
}
