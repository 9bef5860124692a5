//! The composition classes and where their boundaries lie: [`CompositionClass`], the
//! thresholds ([`ClassBoundaries`]), the boundary radii at a mass, the class of one (mass,
//! radius) point, and [`ClassProbabilities`], the result of classifying a planet however the
//! probabilities were found.
//!
//! # Composition classes and their boundaries
//!
//! At each sample's mass the classifier evaluates three radii (see [`boundary_radii`]):
//!
//! 1. **iron floor** — Seager et al. (2007) pure Fe(ε). The paper notes that the minimum
//!    plausible size of a planet of given mass is that of a pure-iron planet.
//! 2. **rock ceiling** — Zeng et al. (2016) with CMF = 0: a planet of pure silicate
//!    mantle, calibrated on the real Earth. The Seager MgSiO3 curve is *not* used as the
//!    ceiling: it assumes perovskite throughout, which is denser than the low-pressure
//!    silicates of small planets, and places Mars above "pure silicate".
//! 3. **iron-rich limit** — a planet with core mass fraction `x` (default 0.5), built by
//!    volume-additive mixing of the two end members at the same total mass:
//!    `R_x^3 = x R_floor^3 + (1 − x) R_ceiling^3`. Inside 1–8 M⊕ this reproduces Zeng's
//!    own CMF dependence to about 2% (tested), while inheriting the iron curve's correct
//!    small-mass behaviour; Zeng's formula itself is not used for CMF = 0.5 because that
//!    exceeds its stated CMF range and, extrapolated to Mars's mass, would put Mars near
//!    CMF 0.5.
//!
//! Why CMF 0.5: Earth's core is about 32% of its mass (common practice) and rocky
//! planets fitted with Zeng's relation cluster at CMF 0.26 ± 0.07 (Zeng et al. 2016
//! abstract), while Mercury's is about 0.7 (from memory). 0.5 sits clearly between
//! the Earth-like and the Mercury-like.
//!
//! Classes, tested in this order for a sample (mass `M`, radius `R`):
//!
//! | class                    | condition |
//! |--------------------------|-----------|
//! | `DenserThanIron`         | `R < iron floor` — physically implausible |
//! | `IronRich`               | `R < iron-rich limit` |
//! | `Rocky`                  | `R ≤ rock ceiling` |
//! | `VolatileRich`           | above the ceiling and `M < giant_min_mass` (default 0.1 M_J ≈ 32 M⊕): needs water and/or a gas envelope |
//! | `GasGiant`               | above the ceiling, `M ≥ giant_min_mass`, `R ≤ inflated_min_radius` (default 1.2 R_J) |
//! | `InflatedGiant`          | above the ceiling, `M ≥ giant_min_mass`, `R > inflated_min_radius` |
//!
//! Why 0.1 M_J: it lies between the ice giants (Neptune ≈ 0.054 M_J) and Saturn
//! (≈ 0.30 M_J), where hydrogen and helium start to dominate the mass (common
//! practice). Why 1.2 R_J: evolved (Gyr-old), weakly irradiated hydrogen–helium planets
//! of any mass stay below about 1.1–1.2 R_J in standard cooling models (from memory),
//! so a larger radius needs extra heating or youth. Both thresholds, and the CMF of the
//! iron-rich limit, are fields of [`ClassBoundaries`] and are reported with every
//! summary.
//!
//! # Extrapolation and the models' range
//!
//! The classifier evaluates the curves with [`radius_of_extrapolated`](super::radius_of_extrapolated):
//! the Seager iron curve outside 0.01–20 M⊕ and the Zeng ceiling outside 1–8 M⊕ are
//! power laws of the published form. A sample is counted as *extrapolated* when its mass lies
//! outside 1–8 M⊕ (where both curves are inside their fitted ranges); the summary reports
//! that fraction.
//!
//! The solid-planet classes (`IronRich`, `Rocky`, `VolatileRich`) are given only for masses
//! of 0.05–20 M⊕ (`CLASSIFIED_MASS_RANGE_EARTH`): above 20 M⊕ the Seager fits are not
//! claimed, and below about Mercury's mass the extrapolated ceiling grows too large (its
//! density falls below that of real rock), so the iron-rich limit rises with it and a
//! Moon-like body would be called iron-rich. A sample outside that range that would have
//! fallen in one of those classes is `OutsideModels` instead. Two classes are still given
//! there: `DenserThanIron`, a plausibility bound (the iron fit tends to iron's zero-pressure
//! density at small mass, and its extrapolation above 20 M⊕ gives smaller radii than the
//! fit's trend, so it errs towards not calling a planet denser than iron; the check says
//! when the curve was extrapolated), and the giant classes, which are decided by the mass
//! and radius thresholds: the solid curves only decide that a giant lies above the rock
//! ceiling.

use super::fits::{
    zeng_radius_earth_from_ln, CLASSIFIED_MASS_RANGE_EARTH, SEAGER_IRON, SEAGER_MASS_RANGE_EARTH,
    ZENG_MASS_RANGE_EARTH,
};
use super::{in_range, is_positive_finite, CompositionSummary};
use crate::constants::{M_EARTH, M_JUPITER, R_EARTH, R_JUPITER};

/// Bulk-composition class of a planet, from its position in the mass–radius plane.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub enum CompositionClass {
    /// Smaller than a pure-iron planet of the same mass: physically implausible.
    DenserThanIron,
    /// Between pure iron and the iron-rich limit (CMF 0.5 by default).
    IronRich,
    /// Between the iron-rich limit and the pure-silicate rock ceiling.
    Rocky,
    /// Above the rock ceiling and below the giant mass threshold: needs water or gas.
    VolatileRich,
    /// At or above the giant mass threshold, radius up to the inflation threshold.
    GasGiant,
    /// At or above the giant mass threshold, radius above the inflation threshold.
    InflatedGiant,
    /// A mass outside the range where the solid-planet curves are used (0.05–20 M⊕), and
    /// neither denser than iron nor a giant: no class is given.
    OutsideModels,
}

impl CompositionClass {
    /// All classes, from densest to least dense.
    /// All classes, from densest to least dense, then [`CompositionClass::OutsideModels`].
    pub const ALL: [CompositionClass; 7] = [
        CompositionClass::DenserThanIron,
        CompositionClass::IronRich,
        CompositionClass::Rocky,
        CompositionClass::VolatileRich,
        CompositionClass::GasGiant,
        CompositionClass::InflatedGiant,
        CompositionClass::OutsideModels,
    ];

    /// Short machine-friendly name, e.g. `"iron-rich"`.
    pub fn name(&self) -> &'static str {
        match self {
            CompositionClass::DenserThanIron => "denser-than-iron",
            CompositionClass::IronRich => "iron-rich",
            CompositionClass::Rocky => "rocky",
            CompositionClass::VolatileRich => "volatile-rich",
            CompositionClass::GasGiant => "gas-giant",
            CompositionClass::InflatedGiant => "inflated-giant",
            CompositionClass::OutsideModels => "outside-models-range",
        }
    }

    /// One-line description suitable for a report.
    pub fn description(&self) -> &'static str {
        match self {
            CompositionClass::DenserThanIron => {
                "denser than pure iron at this mass (physically implausible)"
            }
            CompositionClass::IronRich => "iron-rich (more iron than the iron-rich limit)",
            CompositionClass::Rocky => "rocky (iron core and silicate mantle)",
            CompositionClass::VolatileRich => {
                "less dense than pure rock: needs water or a gas envelope"
            }
            CompositionClass::GasGiant => "gas giant",
            CompositionClass::InflatedGiant => "inflated gas giant (radius above cold models)",
            CompositionClass::OutsideModels => {
                "outside the models' range: the interior models that tell iron, rock and water apart stop at 0.05 and 20 Earth masses, and short of a giant's mass or radius this body is given no class"
            }
        }
    }
}

/// The thresholds that define the composition classes. Every summary carries the
/// boundaries it was computed with.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct ClassBoundaries {
    /// Core mass fraction of the iron-rich limit (0 < x < 1). Default 0.5.
    pub iron_rich_core_fraction: f64,
    /// Minimum mass of a gas giant, kg. Default 0.1 M_J.
    pub giant_min_mass_kg: f64,
    /// Radius above which a giant counts as inflated, m. Default 1.2 R_J.
    pub inflated_min_radius_m: f64,
}

impl Default for ClassBoundaries {
    fn default() -> Self {
        ClassBoundaries {
            iron_rich_core_fraction: 0.5,
            giant_min_mass_kg: 0.1 * M_JUPITER,
            inflated_min_radius_m: 1.2 * R_JUPITER,
        }
    }
}

impl ClassBoundaries {
    /// Whether all thresholds are usable (finite, positive, CMF strictly between 0 and 1).
    pub fn is_valid(&self) -> bool {
        self.iron_rich_core_fraction.is_finite()
            && self.iron_rich_core_fraction > 0.0
            && self.iron_rich_core_fraction < 1.0
            && is_positive_finite(self.giant_min_mass_kg)
            && is_positive_finite(self.inflated_min_radius_m)
    }
}

/// The three solid-planet boundary radii at one mass (all in m).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct BoundaryRadii {
    /// Pure-iron radius (Seager et al. 2007).
    pub iron_floor_m: f64,
    /// Radius of the iron-rich limit (volume mixing of floor and ceiling).
    pub iron_rich_limit_m: f64,
    /// Pure-silicate rock ceiling (Zeng et al. 2016, CMF 0).
    pub rock_ceiling_m: f64,
    /// True if any of the curves was used outside its fitted range.
    pub extrapolated: bool,
}

/// The solid-planet boundary radii at `mass_kg`, evaluated with extrapolation where
/// needed (flagged). `None` if the mass is not positive and finite or the boundaries
/// are invalid.
pub fn boundary_radii(mass_kg: f64, boundaries: &ClassBoundaries) -> Option<BoundaryRadii> {
    let (b, limit_cubed) = boundary_parts(mass_kg, boundaries)?;
    Some(BoundaryRadii {
        iron_rich_limit_m: limit_cubed.cbrt(),
        ..b
    })
}

/// The boundaries at one mass, with the iron-rich limit left as its cube (how it is defined),
/// so that classifying a sample needs no cube root.
fn boundary_parts(mass_kg: f64, boundaries: &ClassBoundaries) -> Option<(BoundaryRadii, f64)> {
    if !boundaries.is_valid() {
        return None;
    }
    boundary_parts_unchecked(mass_kg, boundaries.iron_rich_core_fraction)
}

/// [`boundary_parts`] for boundaries already known to be valid: the pure-iron floor and the
/// CMF 0 rocky ceiling from one logarithm of the mass, as
/// [`radius_of_extrapolated`](super::radius_of_extrapolated) gives them (a test checks the two
/// agree). Called once per sample by the classifier.
pub(super) fn boundary_parts_unchecked(
    mass_kg: f64,
    iron_rich_core_fraction: f64,
) -> Option<(BoundaryRadii, f64)> {
    let mass_earth = mass_kg / M_EARTH;
    if !is_positive_finite(mass_earth) {
        return None;
    }
    let ln_m = mass_earth.ln();
    let floor_m = SEAGER_IRON.radius_earth_from_ln(ln_m) * R_EARTH;
    let rock_m = zeng_radius_earth_from_ln(ln_m, 0.0) * R_EARTH;
    if !(is_positive_finite(floor_m) && is_positive_finite(rock_m)) {
        return None;
    }
    // The CMF 0 curve's parameters are inside Zeng's fitted range, so only the mass decides.
    let extrapolated = !in_range(mass_earth, SEAGER_MASS_RANGE_EARTH)
        || !in_range(mass_earth, ZENG_MASS_RANGE_EARTH);
    // Guard: keep the ceiling at or above the floor at any extrapolated mass.
    let ceiling_m = rock_m.max(floor_m);
    let x = iron_rich_core_fraction;
    let limit_cubed = x * floor_m.powi(3) + (1.0 - x) * ceiling_m.powi(3);
    Some((
        BoundaryRadii {
            iron_floor_m: floor_m,
            iron_rich_limit_m: f64::NAN,
            rock_ceiling_m: ceiling_m,
            extrapolated,
        },
        limit_cubed,
    ))
}

/// Class of a single (mass, radius) point, or `None` if either value is not positive
/// and finite or the boundaries are invalid.
pub fn classify_point(
    mass_kg: f64,
    radius_m: f64,
    boundaries: &ClassBoundaries,
) -> Option<CompositionClass> {
    classify_point_flagged(mass_kg, radius_m, boundaries).map(|(class, _)| class)
}

fn classify_point_flagged(
    mass_kg: f64,
    radius_m: f64,
    boundaries: &ClassBoundaries,
) -> Option<(CompositionClass, bool)> {
    if !(is_positive_finite(radius_m) && boundaries.is_valid()) {
        return None;
    }
    classify_valid_point(mass_kg, radius_m, boundaries)
}

/// [`classify_point_flagged`] for boundaries already known to be valid.
pub(super) fn classify_valid_point(
    mass_kg: f64,
    radius_m: f64,
    boundaries: &ClassBoundaries,
) -> Option<(CompositionClass, bool)> {
    if !is_positive_finite(radius_m) {
        return None;
    }
    let (b, limit_cubed) = boundary_parts_unchecked(mass_kg, boundaries.iron_rich_core_fraction)?;
    let class = if radius_m < b.iron_floor_m {
        CompositionClass::DenserThanIron
    } else if radius_m.powi(3) < limit_cubed {
        CompositionClass::IronRich
    } else if radius_m <= b.rock_ceiling_m {
        CompositionClass::Rocky
    } else if mass_kg < boundaries.giant_min_mass_kg {
        CompositionClass::VolatileRich
    } else if radius_m <= boundaries.inflated_min_radius_m {
        CompositionClass::GasGiant
    } else {
        CompositionClass::InflatedGiant
    };
    let class = match class {
        CompositionClass::IronRich | CompositionClass::Rocky | CompositionClass::VolatileRich
            if !solid_classes_apply(mass_kg) =>
        {
            CompositionClass::OutsideModels
        }
        other => other,
    };
    Some((class, b.extrapolated))
}

/// Whether the solid-planet classes are given at this mass (see the module docs).
pub(super) fn solid_classes_apply(mass_kg: f64) -> bool {
    in_range(mass_kg / M_EARTH, CLASSIFIED_MASS_RANGE_EARTH)
}

/// Class probabilities of a planet, however they were found (counted samples, or
/// quadrature over the uncertainty distributions).
#[derive(Clone, Debug, PartialEq)]
pub struct ClassProbabilities {
    /// Every class with its probability, densest first.
    pub probabilities: Vec<(CompositionClass, f64)>,
    /// Probability that the classification used a curve outside its fitted range.
    pub extrapolated: f64,
}

impl ClassProbabilities {
    /// The probabilities of a sample summary; `None` when no sample was usable.
    pub fn from_samples(summary: &CompositionSummary) -> Option<ClassProbabilities> {
        let probabilities = summary.probabilities();
        if probabilities.is_empty() {
            return None;
        }
        Some(ClassProbabilities {
            probabilities,
            extrapolated: summary.fraction_extrapolated().unwrap_or(0.0),
        })
    }

    pub fn probability(&self, class: CompositionClass) -> f64 {
        self.probabilities
            .iter()
            .find(|(c, _)| *c == class)
            .map_or(0.0, |(_, p)| *p)
    }

    /// The most probable class (ties go to the denser class).
    pub fn most_probable(&self) -> Option<CompositionClass> {
        self.probabilities
            .iter()
            .rev()
            .max_by(|a, b| a.1.total_cmp(&b.1))
            .map(|(c, _)| *c)
    }
}
