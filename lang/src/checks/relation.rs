//! Planets set against the mean mass-radius relation of Chen & Kipping (2017): a giant far
//! more compact than any planet of its mass (the composition curves are fitted up to 20
//! Mearth, and the iron curve extrapolated far beyond does not rule it out), and a
//! prediction from the relation that a declared limit the derivations cannot use
//! contradicts.

use super::{anchor, nominal, shown};
use crate::constants::{M_EARTH, R_EARTH};
use crate::derive::Derivation;
use crate::diagnostic::{Diagnostic, Rule};
use crate::formulas;
use crate::model::{Content, Form};
use crate::quantities::Qty;

/// How many of the relation's intrinsic scatters (in log10 R) below the relation a planet's
/// radius must lie, with its own uncertainty, to be taken for a slip: at 5 no planet of the
/// population is expected there (a normal's one-sided 5-sigma tail is 3e-7; common
/// practice), while a unit slip lands far beyond it (5.2 Mjup at 0.21 Rjup is 9 of them).
const COMPACT_SCATTERS: f64 = 5.0;

/// Above this mass (Earth masses) the composition curves are extrapolated (their fits stop
/// there), and `denser-than-iron` rests on the iron curve's extrapolation alone.
const MODELS_TOP_EARTH: f64 = 20.0;

/// A planet heavier than the composition models reach and far smaller than planets of its
/// mass are: its radius, even at its upper end, more than [`COMPACT_SCATTERS`] scatters of
/// the relation below it. Almost always a slip: a mass in Mjup meant as Mearth (318 times
/// too heavy), or a radius in Rearth meant as Rjup.
pub(super) fn compact_for_its_mass(d: &Derivation, bi: usize, diags: &mut Vec<Diagnostic>) {
    let (Some(mass), Some(radius)) = (nominal(d, (bi, Qty::Mass)), nominal(d, (bi, Qty::Radius)))
    else {
        return;
    };
    let Some(v) = d.value((bi, Qty::Radius)) else {
        return;
    };
    let (_, above) = v.linear_spread(&d.inputs);
    let m_earth = mass / M_EARTH;
    if m_earth <= MODELS_TOP_EARTH {
        return;
    }
    let Some((r_pred, branch)) = formulas::predicted_radius_earth(m_earth) else {
        return;
    };
    let below_by = (r_pred * R_EARTH / (radius + above)).log10() / branch.sigma;
    if below_by.is_nan() || below_by <= COMPACT_SCATTERS {
        return;
    }
    let Some(body) = d.sys.bodies.get(bi) else {
        return;
    };
    // A radius from a transit depth: the depth's unit (ppm written for %) and the star's
    // radius are as likely as the mass's unit.
    let help = if body.get(Qty::Radius).is_some() {
        "check the mass's unit (a mass in Mjup meant as Mearth is 318 times too heavy) and the radius's (Rearth meant as Rjup is 11 times too small)"
    } else {
        "check the transit depth's unit (ppm written where % was meant makes the radius 100 times too small), the star's radius, and the mass's unit (Mjup meant as Mearth is 318 times too heavy)"
    };
    diags.push(
        Diagnostic::new(
            Rule::ImplausiblePlanet,
            anchor(d, bi, &[Qty::Radius, Qty::TransitDepth, Qty::RadiusRatio, Qty::Mass]),
            format!(
                "{}'s radius ({}) is far smaller than planets of its mass ({}) have: the mass-radius relation of Chen & Kipping (2017) puts them at {}, and this radius, even at its upper end, is {:.0} times the relation's scatter ({} dex) below it",
                body.id,
                shown(Qty::Radius, radius),
                shown(Qty::Mass, mass),
                shown(Qty::Radius, r_pred * R_EARTH),
                below_by,
                branch.sigma
            ),
        )
        .with_note("the composition curves are fitted up to 20 Mearth; extrapolated this far, the iron curve does not rule this radius out, but no planet of the population lies here")
        .with_help(help),
    );
}

/// How many of the relation's scatters (in log10) a declared lower limit must lie above the
/// prediction for the two to contradict each other: 3, where a normal's one-sided tail is
/// 0.13 % (common practice).
const LIMIT_SCATTERS: f64 = 3.0;

/// A mass (or radius) predicted from the relation that a declared lower limit the
/// derivations cannot use (`mass > 1 Mjup` has no upper end to sample to) lies more than
/// [`LIMIT_SCATTERS`] of the relation's scatters above: the prediction is for a typical
/// planet of the other quantity, and this one is not typical, or the limit or the radius is
/// in the wrong unit.
pub(super) fn prediction_beyond_limit(d: &Derivation, bi: usize, diags: &mut Vec<Diagnostic>) {
    let Some(body) = d.sys.bodies.get(bi) else {
        return;
    };
    for (declared, predicted, from) in [
        (Qty::Mass, Qty::PredictedMass, "radius"),
        (Qty::Radius, Qty::PredictedRadius, "mass"),
    ] {
        let Some(decl) = body.get(declared) else {
            continue;
        };
        let Content::Measured(m) = &decl.content else {
            continue;
        };
        if m.form != Form::LowerLimit {
            continue;
        }
        let Some(mid) = d.value((bi, predicted)).map(|v| v.nominal) else {
            continue;
        };
        // The relation's scatter in log10 of the predicted quantity, on the branch of the
        // mass the prediction rests on (or gives): sigma in log R, sigma / s in log M.
        let mass = match declared {
            Qty::Mass => Some(mid),
            _ => nominal(d, (bi, Qty::Mass)).or_else(|| nominal(d, (bi, Qty::MinMass))),
        };
        let Some((_, branch)) = mass.and_then(|m| formulas::predicted_radius_earth(m / M_EARTH))
        else {
            continue;
        };
        let scatter = if declared == Qty::Mass {
            branch.sigma / branch.s.abs()
        } else {
            branch.sigma
        };
        let above_by = (m.value / mid).log10() / scatter;
        if above_by.is_nan() || above_by <= LIMIT_SCATTERS {
            continue;
        }
        let what = crate::quantities::def(declared).name;
        diags.push(
            Diagnostic::new(
                Rule::Inconsistent,
                decl.span,
                format!(
                    "{}'s {what} predicted from its {from} ({}) lies {above_by:.1} times the relation's scatter ({scatter:.3} dex) below its declared lower limit ({what} > {})",
                    body.id,
                    shown(declared, mid),
                    shown(declared, m.value)
                ),
            )
            .with_note("the prediction is the mean mass-radius relation of Chen & Kipping (2017) for a typical planet; it does not know the limit, which the derivations cannot use (it has no upper end)")
            .with_help(format!("check the limit's unit and the {from}'s; if both hold, this planet is far from the relation and its predicted {what} should not be used")),
        );
    }
}
