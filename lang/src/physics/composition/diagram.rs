//! What a mass–radius diagram draws ([`PLOTTED_CURVES`]) and where a planet sits among those
//! curves, in words ([`describe_position`]), for plots, hovers and reports.

use super::{classify_point, is_positive_finite, radius_of_extrapolated, ClassBoundaries, Curve};
use crate::constants::{M_EARTH, R_EARTH};

/// The curves a mass–radius diagram shows, densest first.
pub const PLOTTED_CURVES: [Curve; 4] = [
    Curve::PureIron,
    Curve::EARTH_LIKE,
    Curve::PureSilicate,
    Curve::PureWaterIce,
];

/// Where a planet of `mass_kg` and `radius_m` sits among the composition curves, in
/// words: the curves either side of it (or the one it lies beyond), how far it is from
/// the Earth-like rocky curve, and its class. For a hover or a report line; never panics.
pub fn describe_position(mass_kg: f64, radius_m: f64) -> String {
    if !is_positive_finite(mass_kg) || !is_positive_finite(radius_m) {
        return "no position: the mass and the radius must be positive numbers".to_string();
    }
    let me = mass_kg / M_EARTH;
    let re = radius_m / R_EARTH;
    let mut points: Vec<(Curve, f64, bool)> = PLOTTED_CURVES
        .iter()
        .filter_map(|c| {
            radius_of_extrapolated(*c, mass_kg).map(|p| (*c, p.radius_m / R_EARTH, p.extrapolated))
        })
        .collect();
    points.sort_by(|a, b| a.1.total_cmp(&b.1));
    let name = |c: &Curve| match c {
        Curve::Rocky { .. } => "Earth-like rock".to_string(),
        other => other.label(),
    };
    let below = points.iter().rev().find(|p| p.1 <= re);
    let above = points.iter().find(|p| p.1 > re);
    let place = match (below, above) {
        (Some(b), Some(a)) => format!(
            "between the {} ({:.2} R⊕) and {} ({:.2} R⊕) curves",
            name(&b.0),
            b.1,
            name(&a.0),
            a.1
        ),
        (None, Some(a)) => format!("below the {} curve ({:.2} R⊕)", name(&a.0), a.1),
        (Some(b), None) => format!("above the {} curve ({:.2} R⊕)", name(&b.0), b.1),
        (None, None) => "off every curve".to_string(),
    };
    let earth_like = points
        .iter()
        .find(|p| matches!(p.0, Curve::Rocky { .. }))
        .map(|p| {
            let pct = (re / p.1 - 1.0) * 100.0;
            format!(
                ", {:.0}% {} than Earth-like rock",
                pct.abs(),
                if pct >= 0.0 { "larger" } else { "smaller" }
            )
        })
        .unwrap_or_default();
    let extrapolated = if points.iter().any(|p| p.2) {
        " (curves extrapolated beyond their fitted masses)"
    } else {
        ""
    };
    let class = classify_point(mass_kg, radius_m, &ClassBoundaries::default())
        .map(|c| format!("; {}", c.description()))
        .unwrap_or_default();
    format!(
        "{} R⊕ at {} M⊕: {place}{earth_like}{extrapolated}{class}",
        crate::format::number((re * 100.0).round() / 100.0),
        crate::format::number((me * 100.0).round() / 100.0)
    )
}
