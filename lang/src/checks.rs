//! The physics checker: what no real system allows, and what a planet can be made of.
//!
//! Runs on a finished [`Derivation`], reading full values (Monte Carlo samples where the
//! engine drew them; in linear mode, samples drawn here from each value's first-order
//! spread, seeded like everything else). Each check is one function; each rule is
//! documented with its physics and source in `docs/rules.md`.

use crate::ast::BodyKind;
use crate::composition::{self, CompositionClass};
use crate::constants::{M_JUPITER, M_SUN, R_EARTH};
use crate::derive::{display_unit, value, Derivation, Key};
use crate::diagnostic::{Diagnostic, Rule};
use crate::format::fixed;
use crate::formulas;
use crate::quantities::Qty;
use crate::source::Span;
use uom::si::f64::{Length, Mass, MassDensity};
use uom::si::length::meter;
use uom::si::mass::kilogram;
use uom::si::mass_density::kilogram_per_cubic_meter;

/// Probability from which a planet denser than iron is an error (the two-sided 3-sigma
/// fraction, 99.73 %, rounded; common practice).
pub const IRON_PROBABILITY: f64 = 0.997;
/// Probability from which a planet denser than iron is a warning: more likely than not by
/// far, though not yet established.
pub const IRON_WARNING_PROBABILITY: f64 = 0.90;
/// Deuterium-burning limit, about 13 Jupiter masses (Spiegel, Burrows & Milsom 2011; common practice).
pub const DEUTERIUM_LIMIT: f64 = 13.0 * M_JUPITER;
/// Hydrogen-burning limit, about 0.075 solar masses (common practice; Chabrier & Baraffe 2000).
pub const HYDROGEN_LIMIT: f64 = 0.075 * M_SUN;
/// Most samples used for composition classes.
const COMPOSITION_SAMPLES: usize = 2000;

/// What the checker found about one planet's composition: the `composition` object of the
/// JSON output, and a line of text for people.
#[derive(Debug, Clone, PartialEq)]
pub struct CompositionNote {
    pub body: usize,
    pub json: crate::report::json::Composition,
    pub text: String,
}

/// Run every check on one system.
pub fn run(d: &Derivation, diags: &mut Vec<Diagnostic>) -> Vec<CompositionNote> {
    let mut notes = Vec::new();
    for (bi, body) in d.sys.bodies.iter().enumerate() {
        match body.kind {
            BodyKind::Planet => {
                if let Some(n) = composition_check(d, bi, diags) {
                    notes.push(n);
                }
                object_class(d, bi, diags);
                size_and_orbit(d, bi, diags);
                implausible_planet(d, bi, diags);
                relation::compact_for_its_mass(d, bi, diags);
                relation::prediction_beyond_limit(d, bi, diags);
                transit_geometry(d, bi, diags);
                no_prediction(d, bi, diags);
                idle::idle_measurements(d, bi, diags);
            }
            BodyKind::Star => {
                plausible_star(d, bi, diags);
                habitable_zone_range(d, bi, diags);
            }
        }
    }
    exact::exact_measurements(d, diags);
    neglect::neglected_mass(d, diags);
    orbit_spacing(d, diags);
    notes
}

/// A value as a point for the checks: `None` for one that rests mostly on a declared limit
/// (a `mass < 60 Mjup`, or what follows from it), whose nominal is only the middle of the
/// range the limit leaves open: a check read it as a value ("a mass of 30.0 Mjup is above
/// the deuterium-burning limit", an orbit crossing at the middle of an eccentricity's
/// range) that the file never gave.
fn nominal(d: &Derivation, k: Key) -> Option<f64> {
    let v = d.value(k)?;
    let on_limit = v.budget(&d.inputs).first().is_some_and(|&(id, share)| {
        share >= crate::derive::validity::LIMIT_SHARE
            && d.inputs.get(id as usize).is_some_and(|i| i.limit.is_some())
    });
    Some(v.nominal).filter(|v| v.is_finite() && !on_limit)
}

/// Where to point a diagnostic about a body: the first of `qtys` it declares, else its name.
fn anchor(d: &Derivation, bi: usize, qtys: &[Qty]) -> Span {
    let Some(body) = d.sys.bodies.get(bi) else {
        return Span::default();
    };
    qtys.iter()
        .find_map(|q| body.get(*q).map(|decl| decl.span))
        .unwrap_or(body.name_span)
}

fn shown(q: Qty, si: f64) -> String {
    let unit = display_unit(q, si);
    format!("{} {unit}", crate::format::sig(unit.of(si), 3))
}

/// Samples of a value: the engine's, or drawn from its linear spread.
/// Class probabilities of a planet: from its aligned Monte Carlo samples when there are
/// some, else (linear propagation) by quadrature over its mass and radius, each taken as the
/// two-sided normal (median and 16th/84th percentiles) of its first-order uncertainties.
fn class_probabilities(
    d: &Derivation,
    bi: usize,
) -> Option<(composition::ClassProbabilities, &'static str)> {
    let (m, r) = (d.value((bi, Qty::Mass))?, d.value((bi, Qty::Radius))?);
    if let (Some(ms), Some(rs)) = (&m.samples, &r.samples) {
        // Classes are fractions of samples; the first COMPOSITION_SAMPLES aligned pairs
        // resolve them to 0.05%, enough for the 99.7% threshold, at a fraction of the cost.
        let n = ms.len().min(rs.len()).min(COMPOSITION_SAMPLES);
        let (ms, rs) = (ms.get(..n).unwrap_or(&[]), rs.get(..n).unwrap_or(&[]));
        return composition::ClassProbabilities::from_samples(&composition::classify(ms, rs))
            .map(|p| (p, "samples"));
    }
    let split = |v: &value::Value| {
        let (below, above) = v.linear_spread(&d.inputs);
        composition::TwoSidedNormal {
            value: v.nominal,
            below,
            above,
        }
    };
    composition::classify_distributions(
        split(m),
        split(r),
        &composition::ClassBoundaries::default(),
    )
    .map(|p| (p, "quadrature"))
}

fn composition_check(
    d: &Derivation,
    bi: usize,
    diags: &mut Vec<Diagnostic>,
) -> Option<CompositionNote> {
    let (summary, method) = class_probabilities(d, bi)?;
    let mass = nominal(d, (bi, Qty::Mass))?;
    let radius = nominal(d, (bi, Qty::Radius))?;
    let p_iron = summary.probability(composition::CompositionClass::DenserThanIron);
    if p_iron.is_finite() && p_iron >= IRON_WARNING_PROBABILITY {
        let certain = p_iron >= IRON_PROBABILITY;
        // The density of the mass and radius the classes were decided on (a declared
        // density that disagrees with them is another finding's matter).
        let density = mass / (4.0 / 3.0 * std::f64::consts::PI * radius.powi(3));
        // The same curve the classes were decided on: the iron fit, extrapolated where the
        // mass is outside its fitted range, and said so.
        let iron_curve = composition::radius_of_extrapolated(composition::Curve::PureIron, mass);
        let iron = iron_curve.map_or(f64::NAN, |p| {
            mass / (4.0 / 3.0 * std::f64::consts::PI * p.radius_m.powi(3))
        });
        let iron_r = iron_curve.map_or(f64::NAN, |p| p.radius_m / R_EARTH);
        let (fit_lo, fit_hi) = composition::Curve::PureIron.mass_range_earth();
        let extrapolated = if iron_curve.is_some_and(|p| p.extrapolated) {
            format!(
                " (the iron curve extrapolated beyond its fitted {}-{} Mearth)",
                crate::format::number(fit_lo),
                crate::format::number(fit_hi)
            )
        } else {
            String::new()
        };
        let mut diag = Diagnostic::new(
                Rule::DenserThanIron,
                anchor(d, bi, &[Qty::Radius, Qty::TransitDepth, Qty::RadiusRatio, Qty::Mass]),
                format!(
                    "{} is {}denser than pure iron: {} at {}, where a pure-iron body would have {} and a radius of {} Rearth{extrapolated} (probability {:.1}%)",
                    d.sys.bodies.get(bi).map_or("?", |b| b.id.as_str()),
                    if certain { "" } else { "probably " },
                    shown(Qty::Density, density),
                    shown(Qty::Mass, mass),
                    shown(Qty::Density, iron),
                    fixed(iron_r, 2),
                    p_iron * 100.0
                ),
            )
            .with_note("no composition is denser than pure iron at a given mass (Seager et al. 2007); the radius is likely too small or the mass too large")
            .with_help("check the transit depth and the stellar radius (a radius ratio from the wrong band or star), and the mass's unit");
        if !certain {
            diag.severity = crate::diagnostic::Severity::Warning;
            diag = diag.with_note(format!(
                "a warning from {:.0}% probability, an error from {:.1}%",
                IRON_WARNING_PROBABILITY * 100.0,
                IRON_PROBABILITY * 100.0
            ));
        }
        diags.push(diag);
    }
    let probs = &summary.probabilities;
    let best = summary.most_probable();
    let mut parts: Vec<(CompositionClass, f64)> =
        probs.iter().copied().filter(|(_, p)| *p >= 0.005).collect();
    parts.sort_by(|a, b| b.1.total_cmp(&a.1));
    let text = parts
        .iter()
        .map(|(c, p)| format!("{} {:.0}%", c.name(), p * 100.0))
        .collect::<Vec<_>>()
        .join(", ");
    let extrapolated = summary.extrapolated;
    // Giants are classed by mass and radius thresholds, not by the solid-planet curves, so
    // extrapolation is only worth saying for small planets; and not at all where no solid
    // class was given.
    let text = if best == Some(CompositionClass::OutsideModels) {
        format!("{text} ({})", CompositionClass::OutsideModels.description())
    } else if extrapolated > 0.5 && mass < composition::ClassBoundaries::default().giant_min_mass_kg
    {
        format!("{text} (curves extrapolated beyond their fitted masses)")
    } else {
        text
    };
    let _ = radius;
    Some(CompositionNote {
        body: bi,
        json: crate::report::json::Composition {
            most_probable: best.map(|c| c.name()),
            probabilities: crate::report::json::Pairs(
                probs.iter().map(|(class, p)| (class.name(), *p)).collect(),
            ),
            method,
            extrapolated_fraction: extrapolated,
            boundaries: "Seager et al. 2007 pure iron; Zeng et al. 2016 rocky (CMF 0) and CMF 0.5 mix; giant above 0.1 Mjup, inflated above 1.2 Rjup",
        },
        text,
    })
}

fn object_class(d: &Derivation, bi: usize, diags: &mut Vec<Diagnostic>) {
    let (mass, which) = match nominal(d, (bi, Qty::Mass)) {
        Some(m) => (m, "mass"),
        None => match nominal(d, (bi, Qty::MinMass)) {
            Some(m) => (m, "minimum mass"),
            None => return,
        },
    };
    let name = d.sys.bodies.get(bi).map_or("?", |b| b.id.as_str());
    let at = anchor(d, bi, &[Qty::Mass, Qty::MinMass, Qty::RvAmplitude]);
    if mass > HYDROGEN_LIMIT {
        diags.push(
            Diagnostic::new(
                Rule::StellarMassCompanion,
                at,
                format!("{name}'s {which} of {} Msun is above the hydrogen-burning limit (about 0.075 Msun): a star, not a planet", fixed(mass / M_SUN, 3)),
            )
            .with_help("declare it as a star, or check the radial-velocity amplitude and its unit"),
        );
    } else if mass > DEUTERIUM_LIMIT {
        diags.push(
            Diagnostic::new(
                Rule::AboveDeuteriumLimit,
                at,
                format!("{name}'s {which} of {} Mjup is above the deuterium-burning limit (about 13 Mjup): a brown dwarf rather than a planet", fixed(mass / M_JUPITER, 1)),
            )
            .with_note("the boundary is a convention of the trade (IAU working definition); objects near it are often listed in both classes"),
        );
    }
}

/// Largest planet radius not taken for a slip: the largest known planets, inflated hot
/// Jupiters, reach about 2 Rjup (from memory; common practice), and a young giant may be
/// somewhat larger.
pub const LARGEST_PLANET_RADIUS: f64 = 2.5 * crate::constants::R_JUPITER;
/// Least bulk density not taken for a slip, 0.01 g/cm^3 (SI): a third of the least dense
/// planets known, the "super-puffs" at about 0.03 g/cm^3 (Libby-Roberts et al. 2020, AJ 159,
/// 57: "densities below 0.1 g/cm^3"; the 0.03 from memory).
pub const LEAST_PLANET_DENSITY: f64 = 10.0;

/// A planet larger or less dense than any known: almost always a unit slip (a depth
/// without a unit read as a fraction, a mass in Mearth meant as Mjup, a radius in Rjup
/// meant as Rearth). A planet as large as its star is `larger-than-star` instead.
fn implausible_planet(d: &Derivation, bi: usize, diags: &mut Vec<Diagnostic>) {
    let Some(body) = d.sys.bodies.get(bi) else {
        return;
    };
    let name = body.id.as_str();
    let rp = nominal(d, (bi, Qty::Radius));
    let rs = body.orbits.and_then(|h| nominal(d, (h, Qty::StarRadius)));
    if let Some(rp) = rp.filter(|r| *r > LARGEST_PLANET_RADIUS && rs.is_none_or(|s| *r < s)) {
        // A depth written without a unit is a fraction: 0.5 is 50 %.
        let bare_depth = body.get(Qty::TransitDepth).is_some_and(|decl| {
            decl.written_unit.is_none()
                && matches!(&decl.content, crate::model::Content::Measured(m) if m.value >= 0.01)
        });
        let help = if bare_depth {
            "the transit depth has no unit, so it is read as a fraction (0.5 is 50 %): write `%` or `ppm` after it if that is what the paper gives"
        } else {
            "check the transit depth's unit (a fraction, %, or ppm), the stellar radius, and a declared radius's unit (Rjup for Rearth?)"
        };
        diags.push(
            Diagnostic::new(
                Rule::ImplausiblePlanet,
                anchor(d, bi, &[Qty::TransitDepth, Qty::RadiusRatio, Qty::Radius]),
                format!(
                    "{name}'s radius ({}) is larger than any known planet's: the largest reach about 2 Rjup",
                    shown(Qty::Radius, rp)
                ),
            )
            .with_help(help),
        );
    }
    if let Some(rho) = nominal(d, (bi, Qty::Density)).filter(|r| *r < LEAST_PLANET_DENSITY) {
        diags.push(
            Diagnostic::new(
                Rule::ImplausiblePlanet,
                anchor(d, bi, &[Qty::Mass, Qty::MinMass, Qty::Radius, Qty::TransitDepth]),
                format!(
                    "{name}'s density ({}) is lower than any known planet's: the least dense known are about 0.03 g/cm^3",
                    shown(Qty::Density, rho)
                ),
            )
            .with_help("check the mass's unit (a mass in Mearth meant as Mjup is 318 times too small) and the radius's (Rjup meant as Rearth)"),
        );
    }
}

fn size_and_orbit(d: &Derivation, bi: usize, diags: &mut Vec<Diagnostic>) {
    let Some(host) = d.sys.bodies.get(bi).and_then(|b| b.orbits) else {
        return;
    };
    let name = d.sys.bodies.get(bi).map_or("?", |b| b.id.as_str());
    let star = d.sys.bodies.get(host).map_or("?", |b| b.id.as_str());
    let rs = nominal(d, (host, Qty::StarRadius));
    let rp = nominal(d, (bi, Qty::Radius));
    if let (Some(rs), Some(rp)) = (rs, rp) {
        if rp >= rs {
            diags.push(
                Diagnostic::new(
                    Rule::LargerThanStar,
                    anchor(d, bi, &[Qty::Radius, Qty::RadiusRatio, Qty::TransitDepth]),
                    format!("{name}'s radius ({}) is at least the radius of {star} ({})", shown(Qty::Radius, rp), shown(Qty::StarRadius, rs)),
                )
                .with_help("a transit depth above 100% or a radius in the wrong unit (Rsun for Rjup?) gives this"),
            );
        }
    }
    let (Some(a), Some(rs)) = (nominal(d, (bi, Qty::SemiMajorAxis)), rs) else {
        return;
    };
    let e = nominal(d, (bi, Qty::Eccentricity)).unwrap_or(0.0);
    let q = a * (1.0 - e);
    if q <= rs + rp.unwrap_or(0.0) {
        diags.push(
            Diagnostic::new(
                Rule::PeriastronInsideStar,
                anchor(d, bi, &[Qty::Eccentricity, Qty::SemiMajorAxis, Qty::Period]),
                format!(
                    "{name}'s closest approach a(1 - e) = {} au lies inside {star} (R* + Rp = {} au)",
                    fixed(q / crate::constants::AU, 4),
                    fixed((rs + rp.unwrap_or(0.0)) / crate::constants::AU, 4)
                ),
            )
            .with_help("check the eccentricity and the period's unit"),
        );
        return;
    }
    let (Some(ms), Some(rho)) = (
        nominal(d, (host, Qty::StarMass)),
        nominal(d, (bi, Qty::Density)),
    ) else {
        return;
    };
    let Some(roche) = formulas::roche_limit_fluid(
        Mass::new::<kilogram>(ms),
        MassDensity::new::<kilogram_per_cubic_meter>(rho),
    )
    .map(|l: Length| l.get::<meter>()) else {
        return;
    };
    if q < roche {
        diags.push(
            Diagnostic::new(
                Rule::InsideRocheLimit,
                anchor(d, bi, &[Qty::Period, Qty::SemiMajorAxis]),
                format!(
                    "{name}'s periastron ({} au) lies inside the fluid-body Roche limit for its density ({} au): tides would tear it apart",
                    fixed(q / crate::constants::AU, 4),
                    fixed(roche / crate::constants::AU, 4)
                ),
            )
            .with_note("fluid Roche limit d = 2.44 R* (rho*/rho_p)^(1/3) (Roche; common practice)"),
        );
    }
}

fn transit_geometry(d: &Derivation, bi: usize, diags: &mut Vec<Diagnostic>) {
    let Some(body) = d.sys.bodies.get(bi) else {
        return;
    };
    if body.get(Qty::TransitDepth).is_none() && body.get(Qty::RadiusRatio).is_none() {
        return;
    }
    let (Some(b), Some(k)) = (
        nominal(d, (bi, Qty::Impact)),
        nominal(d, (bi, Qty::RadiusRatio)),
    ) else {
        // An inclination that gives no impact parameter at all (|cos i| too large) is
        // also no transit, but it shows up as a missing impact; report it when declared.
        if let (Some(_), None) = (body.get(Qty::Inclination), nominal(d, (bi, Qty::Impact))) {
            if nominal(d, (bi, Qty::ScaledAxis)).is_some() {
                diags.push(Diagnostic::new(
                    Rule::TransitGeometry,
                    anchor(d, bi, &[Qty::Inclination]),
                    format!(
                        "{}: a transit is declared, but this inclination gives no transit geometry",
                        body.id
                    ),
                ));
            }
        }
        return;
    };
    // k from the depth (or the depth from k) without the impact parameter, found before the
    // impact parameter was derived from other values: right only for a transit that is not
    // grazing. (A declared impact parameter is used by the rules that know about grazing.)
    let blind = [
        (
            Qty::RadiusRatio,
            "depth-radius-ratio",
            "k was taken as sqrt(depth)",
        ),
        (
            Qty::TransitDepth,
            "radius-ratio-depth",
            "the depth was taken as k^2",
        ),
    ]
    .into_iter()
    .find(|(q, rule, _)| d.rule_id((bi, *q)) == Some(*rule));
    if let (Some((_, _, how)), true) = (blind, b > 1.0 - k && b < 1.0 + k) {
        diags.push(
            Diagnostic::new(
                Rule::TransitGeometry,
                anchor(d, bi, &[Qty::TransitDepth, Qty::RadiusRatio]),
                format!(
                    "{}'s transit is grazing (b = {} exceeds 1 - k = {}), but {how}, which holds only when the planet's disc lies wholly on the star's: the impact parameter was derived only after it",
                    body.id,
                    crate::format::sig(b, 3),
                    crate::format::sig(1.0 - k, 3)
                ),
            )
            .with_help("declare the impact parameter (b), so that the covered fraction of the star's disc is used"),
        );
        if let Some(last) = diags.last_mut() {
            last.severity = crate::diagnostic::Severity::Warning;
        }
    }
    if b >= 1.0 + k {
        diags.push(
            Diagnostic::new(
                Rule::TransitGeometry,
                anchor(d, bi, &[Qty::Impact, Qty::Inclination]),
                format!(
                    "{} has a {} but its impact parameter b = {:.3} exceeds 1 + k = {:.3}: the planet never crosses the stellar disc",
                    body.id,
                    if body.get(Qty::TransitDepth).is_some() {
                        "transit depth"
                    } else {
                        "radius ratio from a transit"
                    },
                    b,
                    1.0 + k
                ),
            )
            .with_note("a transit needs b < 1 + Rp/R* (Winn 2010)")
            .with_help("check the inclination (90 deg is edge-on) or the impact parameter"),
        );
    }
}

fn orbit_spacing(d: &Derivation, diags: &mut Vec<Diagnostic>) {
    let sys = d.sys;
    // Each star's planets with their semi-major axes, gathered in one pass over the bodies
    // (a scan per star made a system of many stars quadratic).
    let mut by_host: Vec<Vec<(usize, f64)>> = vec![Vec::new(); sys.bodies.len()];
    for (i, b) in sys.bodies.iter().enumerate() {
        if let (Some(host), Some(a)) = (b.orbits, nominal(d, (i, Qty::SemiMajorAxis))) {
            if let Some(list) = by_host.get_mut(host) {
                list.push((i, a));
            }
        }
    }
    for (host, star) in sys.bodies.iter().enumerate() {
        if star.kind != BodyKind::Star {
            continue;
        }
        let Some(ms) = nominal(d, (host, Qty::StarMass)) else {
            continue;
        };
        let Some(planets) = by_host.get_mut(host) else {
            continue;
        };
        let mut planets = std::mem::take(planets);
        planets.sort_by(|a, b| a.1.total_cmp(&b.1));
        let many = planets.len() >= 3;
        for pair in planets.windows(2) {
            let [(i1, a1), (i2, a2)] = pair else { continue };
            let e1 = nominal(d, (*i1, Qty::Eccentricity)).unwrap_or(0.0);
            let e2 = nominal(d, (*i2, Qty::Eccentricity)).unwrap_or(0.0);
            let n1 = sys.bodies.get(*i1).map_or("?", |b| b.id.as_str());
            let n2 = sys.bodies.get(*i2).map_or("?", |b| b.id.as_str());
            if a1 * (1.0 + e1) >= a2 * (1.0 - e2) {
                diags.push(
                    Diagnostic::new(
                        Rule::CrossingOrbits,
                        anchor(d, *i2, &[Qty::Eccentricity, Qty::Period, Qty::SemiMajorAxis]),
                        format!(
                            "the orbits of {n1} and {n2} cross: {n1}'s apastron ({} au) lies beyond {n2}'s periastron ({} au)",
                            fixed(a1 * (1.0 + e1) / crate::constants::AU, 4),
                            fixed(a2 * (1.0 - e2) / crate::constants::AU, 4)
                        ),
                    )
                    .with_label(anchor(d, *i1, &[Qty::Eccentricity, Qty::Period, Qty::SemiMajorAxis]), format!("{n1}'s orbit"))
                    .with_note("crossing orbits are unstable on orbital time scales unless protected by a resonance"),
                );
                continue;
            }
            let mass =
                |i: usize| nominal(d, (i, Qty::Mass)).or_else(|| nominal(d, (i, Qty::MinMass)));
            let (Some(m1), Some(m2)) = (mass(*i1), mass(*i2)) else {
                continue;
            };
            let Some(delta) = formulas::spacing_in_mutual_hill_radii(
                Length::new::<meter>(*a1),
                Length::new::<meter>(*a2),
                Mass::new::<kilogram>(m1),
                Mass::new::<kilogram>(m2),
                Mass::new::<kilogram>(ms),
            ) else {
                continue;
            };
            if delta < formulas::HILL_STABLE_SPACING {
                let mut diag = Diagnostic::new(
                    Rule::UnstableSpacing,
                    anchor(d, *i2, &[Qty::Period, Qty::SemiMajorAxis]),
                    format!("{n1} and {n2} are {delta:.2} mutual Hill radii apart, closer than the 2 sqrt(3) = 3.46 that guarantees stability of two planets (Gladman 1993)"),
                )
                .with_label(anchor(d, *i1, &[Qty::Period, Qty::SemiMajorAxis]), format!("{n1}'s orbit"));
                if many {
                    diag = diag.with_note("systems of three or more planets usually need about 10 mutual Hill radii between neighbours to survive for billions of years (Chambers et al. 1996; common practice)");
                }
                diags.push(diag);
            }
        }
    }
}

/// Bounds that no main-sequence or evolved (non-degenerate) star crosses, from memory of
/// the ranges spanned by stellar atlases and dwarf tables (common practice): documented in
/// docs/rules.md.
pub const STAR_TEFF: (f64, f64) = (2_000.0, 60_000.0);
pub const STAR_MASS: (f64, f64) = (0.07 * M_SUN, 300.0 * M_SUN);
pub const STAR_LOG_G: (f64, f64) = (-1.0, 5.8);
/// From the smallest M dwarfs (about 0.08 Rsun) to the largest red supergiants (about 1,500
/// Rsun), with room either side: a radius in km written as Rsun (695,700 Rsun) or in Rearth
/// as Rsun lands far outside, with no mass needed to see it.
pub const STAR_RADIUS: (f64, f64) = (
    0.05 * crate::constants::R_SUN,
    2_500.0 * crate::constants::R_SUN,
);

/// The habitable-zone fits hold for 2600-7200 K only: outside, the zone is not derived, and
/// this says why.
fn habitable_zone_range(d: &Derivation, bi: usize, diags: &mut Vec<Diagnostic>) {
    let Some(t) = nominal(d, (bi, Qty::Teff)) else {
        return;
    };
    let (lo, hi) = formulas::HABITABLE_TEFF_RANGE;
    if (lo..=hi).contains(&t) {
        return;
    }
    let name = d.sys.bodies.get(bi).map_or("?", |b| b.id.as_str());
    diags.push(
        Diagnostic::new(
            Rule::NotDerivable,
            anchor(d, bi, &[Qty::Teff]),
            format!(
                "{name}'s habitable zone is not derived: Teff {} K lies outside {lo:.0}-{hi:.0} K, where the fits of Kopparapu et al. (2014) hold",
                fixed(t, 0)
            ),
        )
        .with_note("extrapolating the fits' polynomials beyond their range gives meaningless edges"),
    );
}

/// A planet with a radius but no mass whose radius does not tell a mass: say so, rather
/// than leave the predicted mass (and the metrics that use it) silently absent.
fn no_prediction(d: &Derivation, bi: usize, diags: &mut Vec<Diagnostic>) {
    if d.value((bi, Qty::Mass)).is_some() || d.value((bi, Qty::PredictedMass)).is_some() {
        return;
    }
    let Some(r) = nominal(d, (bi, Qty::Radius)) else {
        return;
    };
    let top = formulas::largest_invertible_radius_earth();
    let r_earth = r / R_EARTH;
    if r_earth < top {
        return;
    }
    let name = d.sys.bodies.get(bi).map_or("?", |b| b.id.as_str());
    diags.push(
        Diagnostic::new(
            Rule::NotDerivable,
            anchor(d, bi, &[Qty::Radius, Qty::TransitDepth, Qty::RadiusRatio]),
            format!(
                "no mass is predicted for {name}: its radius ({} Rearth) is above {top:.1} Rearth, where the mass-radius relation of Chen & Kipping (2017) does not tell a mass",
                fixed(r_earth, 1)
            ),
        )
        .with_note("giant planets from about 0.4 Jupiter masses to the brown-dwarf limit all have radii near 1 Rjup; a mass needs radial velocities (or transit timing)"),
    );
}

fn plausible_star(d: &Derivation, bi: usize, diags: &mut Vec<Diagnostic>) {
    let name = d.sys.bodies.get(bi).map_or("?", |b| b.id.as_str());
    let mut problems = Vec::new();
    if let Some(t) = nominal(d, (bi, Qty::Teff)) {
        if t < STAR_TEFF.0 || t > STAR_TEFF.1 {
            problems.push((
                Qty::Teff,
                format!(
                    "Teff {} K lies outside {:.0}–{:.0} K",
                    fixed(t, 0),
                    STAR_TEFF.0,
                    STAR_TEFF.1
                ),
            ));
        }
    }
    if let Some(m) = nominal(d, (bi, Qty::StarMass)) {
        if m < STAR_MASS.0 || m > STAR_MASS.1 {
            problems.push((
                Qty::StarMass,
                format!(
                    "mass {} Msun lies outside 0.07–300 Msun",
                    fixed(m / M_SUN, 3)
                ),
            ));
        }
    }
    if let Some(r) = nominal(d, (bi, Qty::StarRadius)) {
        if r < STAR_RADIUS.0 || r > STAR_RADIUS.1 {
            problems.push((
                Qty::StarRadius,
                format!(
                    "radius {} Rsun lies outside 0.05–2500 Rsun",
                    crate::format::sig(r / crate::constants::R_SUN, 3)
                ),
            ));
        }
    }
    // A radius or mass so far off that g itself overflows or underflows (a radius of
    // 1e-200 Rsun) leaves no log g among the values: it is computed here in logarithms.
    let log_g = nominal(d, (bi, Qty::LogG)).or_else(|| {
        let m = nominal(d, (bi, Qty::StarMass))?;
        let r = nominal(d, (bi, Qty::StarRadius))?;
        // log10 of G M / R^2 in cm/s^2 (the unit log g is given in).
        let g = (crate::constants::G * m).log10() - 2.0 * r.log10() + 2.0;
        (m > 0.0 && r > 0.0 && g.is_finite()).then_some(g)
    });
    if let Some(g) = log_g {
        if g < STAR_LOG_G.0 || g > STAR_LOG_G.1 {
            problems.push((
                Qty::LogG,
                format!(
                    "log g {} lies outside {:.1}–{:.1}: {}",
                    fixed(g, 2),
                    STAR_LOG_G.0,
                    STAR_LOG_G.1,
                    if g > STAR_LOG_G.1 {
                        "too dense for a non-degenerate star (a white dwarf has log g near 8)"
                    } else {
                        "less dense than the largest supergiants"
                    }
                ),
            ));
        }
    }
    if problems.is_empty() {
        return;
    }
    let first = problems.first().map(|p| p.0).unwrap_or(Qty::StarMass);
    let msg = problems
        .iter()
        .map(|p| p.1.clone())
        .collect::<Vec<_>>()
        .join("; ");
    diags.push(
        Diagnostic::new(
            Rule::ImplausibleStar,
            anchor(d, bi, &[first, Qty::StarMass, Qty::StarRadius]),
            format!("{name} is not a plausible star: {msg}"),
        )
        .with_help(implausible_star_help(d, bi, &problems)),
    );
}

/// What to check for an implausible star: a unit slip up the route of a derived value that
/// would make it plausible (a period in hours meant as days, seen through the mass from a
/// transit's density), else the inputs of the route; for declared values, their units.
fn implausible_star_help(d: &Derivation, bi: usize, problems: &[(Qty, String)]) -> String {
    let range = |q: Qty| match q {
        Qty::Teff => STAR_TEFF,
        Qty::StarMass => STAR_MASS,
        Qty::StarRadius => STAR_RADIUS,
        _ => STAR_LOG_G,
    };
    for (q, _) in problems {
        let (lo, hi) = range(*q);
        let found = d.plausible_readings((bi, *q), |x| x >= lo && x <= hi, "a plausible star");
        if let Some(help) = crate::derive::readings_help(&found) {
            return help;
        }
    }
    // Every implausible value derived: the measurements its route rests on are what to check.
    let derived: Option<Vec<String>> = problems
        .iter()
        .map(|(q, _)| d.route_words((bi, *q)))
        .collect();
    match derived.as_ref().and_then(|r| r.first()) {
        Some(route) => format!("{route}: check the units and sources of those measurements"),
        None => {
            "check the units: a radius in Rjup, km or au instead of Rsun, or a mass in Mjup, gives this"
                .to_string()
        }
    }
}

mod exact;
mod idle;
mod neglect;
mod relation;
#[cfg(test)]
mod tests;
