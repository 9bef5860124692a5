//! Values derived with a planet's mass neglected (Kepler's third law with the star's mass
//! alone, a star's density from a transit's a/R*) where the planet is heavy enough for that
//! to move them by a good part of their uncertainty: a brown-dwarf companion of 6 % of its
//! star's mass put the star's density 2 of its uncertainties high, with only the generic
//! assumption to say so.

use super::anchor;
use crate::ast::BodyKind;
use crate::derive::{Derivation, Key};
use crate::diagnostic::{Diagnostic, Rule};
use crate::quantities::{self, Qty};

/// The rules that neglect the planet's mass, each with the power of `1 + Mp/M*` its value
/// is off by: an axis goes as the total mass to the 1/3, a period to the -1/2, a star's
/// mass from the orbit and a star's density from a/R* as the total mass itself.
const NEGLECTING: &[(&str, f64)] = &[
    ("kepler-third-law-light-planet", 1.0 / 3.0),
    ("kepler-period-light-planet", 0.5),
    ("kepler-stellar-mass-light-planet", 1.0),
    ("stellar-density-from-transit", 1.0),
    ("stellar-density-from-duration", 1.0),
];

/// The share of a value's relative uncertainty from which the neglect is reported: a third,
/// where the value's interval is visibly shifted (at a tenth it would fire for every
/// hot Jupiter measured to a per cent).
const NEGLECT_SHARE: f64 = 1.0 / 3.0;

pub(super) fn neglected_mass(d: &Derivation, diags: &mut Vec<Diagnostic>) {
    let mut keys: Vec<Key> = d.keys().collect();
    keys.sort();
    for key in keys {
        let Some((rule, inputs)) = d.derived_by(key) else {
            continue;
        };
        let Some(&(_, power)) = NEGLECTING.iter().find(|(id, _)| *id == rule) else {
            continue;
        };
        let planet = inputs.iter().map(|k| k.0).find(|b| {
            d.sys
                .bodies
                .get(*b)
                .is_some_and(|body| body.kind == BodyKind::Planet)
        });
        let Some(pi) = planet else { continue };
        let Some(host) = d.sys.bodies.get(pi).and_then(|b| b.orbits) else {
            continue;
        };
        let mass = d
            .value((pi, Qty::Mass))
            .or_else(|| d.value((pi, Qty::MinMass)))
            .map(|v| v.nominal);
        let (Some(mp), Some(ms)) = (mass, d.value((host, Qty::StarMass)).map(|v| v.nominal)) else {
            continue;
        };
        let Some(v) = d.value(key) else { continue };
        let q = mp / ms;
        let shift = power * q;
        let (below, above) = v.linear_spread(&d.inputs);
        let relative = 0.5 * (below + above) / v.nominal.abs();
        if !(q.is_finite() && shift > 1e-3 && shift > NEGLECT_SHARE * relative) {
            continue;
        }
        let name = |b: usize| d.sys.bodies.get(b).map_or("?", |b| b.id.as_str());
        let planet_name = name(pi);
        diags.push(
            Diagnostic::new(
                Rule::MassNeglected,
                anchor(d, pi, &[Qty::Mass, Qty::RvAmplitude, Qty::MinMass]),
                format!(
                    "{}.{} was derived with {planet_name}'s mass neglected ({rule}), but {planet_name} is {:.1}% of its star's mass: that moves it by about {:.1}%, {:.1} times its relative uncertainty",
                    name(key.0),
                    quantities::def(key.1).name,
                    100.0 * q,
                    100.0 * shift,
                    shift / relative.max(f64::MIN_POSITIVE)
                ),
            )
            .with_note("the full relation needs the planet's mass, which was not known where this value was derived")
            .with_help("declare the star's mass, so that the star's values come from it and not from the planet's orbit with its mass left out"),
        );
    }
}
