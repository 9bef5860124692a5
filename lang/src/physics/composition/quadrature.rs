//! Class probabilities without sampling: the mass and the radius read as independent
//! two-sided normals kept positive ([`TwoSidedNormal`], as the engine samples a measurement), integrated by
//! quadrature over the mass with the radius's distribution function at each class boundary
//! ([`classify_distributions`]). Deterministic; linear propagation uses it.

use super::classes::{boundary_parts_unchecked, solid_classes_apply};
use super::fits::{CLASSIFIED_MASS_RANGE_EARTH, SEAGER_MASS_RANGE_EARTH, ZENG_MASS_RANGE_EARTH};
use super::{ClassBoundaries, ClassProbabilities, CompositionClass};
use crate::constants::M_EARTH;

/// A measured value with a standard uncertainty below and above (SI), read as the engine
/// samples it: the value is the median and value - below, value + above the 16th and 84th
/// percentiles (two half-Gaussians joined at the value, each holding half the probability;
/// see `derive::value::draw`), kept positive.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct TwoSidedNormal {
    pub value: f64,
    pub below: f64,
    pub above: f64,
}

impl TwoSidedNormal {
    /// P(X <= x) without the positivity cut.
    fn cdf_untruncated(&self, x: f64) -> f64 {
        // Half the probability on each side of the median.
        let p = 0.5;
        // Standard normal CDF from the complementary error function.
        let phi = |z: f64| 0.5 * libm::erfc(-z / std::f64::consts::SQRT_2);
        if x <= self.value {
            if self.below > 0.0 {
                2.0 * p * phi((x - self.value) / self.below)
            } else if x < self.value {
                0.0
            } else {
                p
            }
        } else if self.above > 0.0 {
            p + (1.0 - p) * (2.0 * phi((x - self.value) / self.above) - 1.0)
        } else {
            1.0
        }
    }

    /// The distribution function of X kept positive (P(X <= x | X > 0)), which is what the
    /// engine samples: draws at or below zero are drawn again. `None` if nothing is positive.
    fn positive_cdf(&self) -> Option<impl Fn(f64) -> f64 + '_> {
        let at_zero = self.cdf_untruncated(0.0);
        let kept = 1.0 - at_zero;
        (kept > 0.0).then_some(move |x: f64| {
            if x <= 0.0 {
                0.0
            } else {
                ((self.cdf_untruncated(x) - at_zero) / kept).clamp(0.0, 1.0)
            }
        })
    }

    /// Quadrature nodes (value, weight) of the distribution kept positive, weights summing
    /// to one. Each half is cut into `per_side` equal steps in z out to 6 sigma, and also at
    /// every breakpoint (zero and the values where the integrand jumps); a node sits at the
    /// middle of each piece and weighs the piece's exact probability (normal CDF
    /// differences), so the jumps are integrated exactly. Empty if nothing is positive.
    fn nodes(&self, per_side: usize, breakpoints: &[f64]) -> Vec<(f64, f64)> {
        if self.below <= 0.0 && self.above <= 0.0 {
            return if self.value > 0.0 && self.value.is_finite() {
                vec![(self.value, 1.0)]
            } else {
                Vec::new()
            };
        }
        let phi = |z: f64| 0.5 * libm::erfc(-z / std::f64::consts::SQRT_2);
        let mut out = Vec::with_capacity(2 * per_side + 2 * breakpoints.len() + 2);
        // Half the probability on each side of the median; a side without width is a point.
        for (sign, sigma, share) in [(-1.0, self.below, 0.5), (1.0, self.above, 0.5)] {
            if sigma.is_nan() || sigma <= 0.0 {
                if self.value > 0.0 && self.value.is_finite() {
                    out.push((self.value, share));
                }
                continue;
            }
            let mut edges: Vec<f64> = (0..=per_side)
                .map(|k| 6.0 * k as f64 / per_side as f64)
                .collect();
            edges.extend(
                breakpoints
                    .iter()
                    .map(|b| sign * (b - self.value) / sigma)
                    .filter(|z| *z > 0.0 && *z < 6.0),
            );
            edges.sort_by(f64::total_cmp);
            let cdf: Vec<(f64, f64)> = edges.iter().map(|z| (*z, phi(*z))).collect();
            for pair in cdf.windows(2) {
                let [(a, pa), (b, pb)] = pair else { continue };
                let w = share * 2.0 * (pb - pa);
                let x = self.value + sign * sigma * (a + b) / 2.0;
                if x > 0.0 && x.is_finite() && w > 0.0 {
                    out.push((x, w));
                }
            }
        }
        let total: f64 = out.iter().map(|(_, w)| w).sum();
        if total > 0.0 {
            for n in &mut out {
                n.1 /= total;
            }
        }
        out
    }
}

/// Class probabilities for a planet whose mass and radius are independent two-sided normals, by
/// quadrature over the mass (about 80 nodes, cut at every mass where a class or the
/// extrapolation flag changes) with the radius's distribution function at each
/// mass's class boundaries: deterministic, and the same classes as sampling would find (a
/// test compares with 4 x 10^5 samples). `None` when either distribution has nothing
/// positive or the boundaries are invalid.
pub fn classify_distributions(
    mass_kg: TwoSidedNormal,
    radius_m: TwoSidedNormal,
    boundaries: &ClassBoundaries,
) -> Option<ClassProbabilities> {
    if !boundaries.is_valid() {
        return None;
    }
    let mut p = [0.0; CompositionClass::ALL.len()];
    let mut extrapolated = 0.0;
    let mut used = 0.0;
    let mut add = |class: CompositionClass, w: f64| {
        if let Some(slot) = CompositionClass::ALL
            .iter()
            .position(|c| *c == class)
            .and_then(|i| p.get_mut(i))
        {
            *slot += w;
        }
    };
    // Where the classes or the extrapolation flag jump as the mass crosses a value.
    let breakpoints = [
        0.0,
        SEAGER_MASS_RANGE_EARTH.0 * M_EARTH,
        SEAGER_MASS_RANGE_EARTH.1 * M_EARTH,
        ZENG_MASS_RANGE_EARTH.0 * M_EARTH,
        ZENG_MASS_RANGE_EARTH.1 * M_EARTH,
        CLASSIFIED_MASS_RANGE_EARTH.0 * M_EARTH,
        CLASSIFIED_MASS_RANGE_EARTH.1 * M_EARTH,
        boundaries.giant_min_mass_kg,
    ];
    let radius_cdf = radius_m.positive_cdf()?;
    for (m, w) in mass_kg.nodes(40, &breakpoints) {
        let Some((b, limit_cubed)) =
            boundary_parts_unchecked(m, boundaries.iron_rich_core_fraction)
        else {
            continue;
        };
        let f = &radius_cdf;
        let (floor, limit, ceiling) = (
            f(b.iron_floor_m),
            f(limit_cubed.cbrt()),
            f(b.rock_ceiling_m),
        );
        if !(floor.is_finite() && limit.is_finite() && ceiling.is_finite()) {
            return None;
        }
        used += w;
        if b.extrapolated {
            extrapolated += w;
        }
        // As the sampled path: outside the models' range the solid classes become
        // OutsideModels; denser-than-iron and the giants are kept.
        let solid = solid_classes_apply(m);
        let solid_or_outside = |class| {
            if solid {
                class
            } else {
                CompositionClass::OutsideModels
            }
        };
        add(CompositionClass::DenserThanIron, w * floor);
        add(
            solid_or_outside(CompositionClass::IronRich),
            w * (limit - floor).max(0.0),
        );
        add(
            solid_or_outside(CompositionClass::Rocky),
            w * (ceiling - limit).max(0.0),
        );
        let beyond = (1.0 - ceiling).max(0.0);
        if m < boundaries.giant_min_mass_kg {
            add(solid_or_outside(CompositionClass::VolatileRich), w * beyond);
        } else {
            let inflated_from = f(boundaries.inflated_min_radius_m.max(b.rock_ceiling_m));
            add(
                CompositionClass::GasGiant,
                w * (inflated_from - ceiling).max(0.0),
            );
            add(
                CompositionClass::InflatedGiant,
                w * (1.0 - inflated_from).max(0.0),
            );
        }
    }
    if used.is_nan() || used <= 0.0 {
        return None;
    }
    Some(ClassProbabilities {
        probabilities: CompositionClass::ALL
            .iter()
            .zip(p)
            // Below 1e-12 is rounding left over from 1 - F near 1, not a probability.
            .map(|(c, v)| (*c, if v / used < 1e-12 { 0.0 } else { v / used }))
            .collect(),
        extrapolated: extrapolated / used,
    })
}
