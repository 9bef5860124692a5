//! [`Curve`]: the named mass–radius curves (pure iron, pure silicate, pure water ice, a
//! rocky planet of a given core mass fraction) with the label, source and fitted mass range a
//! plot or report needs, and radius look-ups on them.
//!
//! [`radius_of`] returns `None` outside a curve's fitted range (mass, and for the rocky
//! curve also CMF). [`radius_of_extrapolated`] always evaluates the formula for a
//! physically meaningful input and returns the radius with an `extrapolated` flag.

use super::fits::{
    zeng_radius_earth, SEAGER_IRON, SEAGER_MASS_RANGE_EARTH, SEAGER_SILICATE, SEAGER_WATER,
    ZENG_CMF_RANGE, ZENG_MASS_RANGE_EARTH,
};
use super::{in_range, is_positive_finite};
use crate::constants::{M_EARTH, R_EARTH};

/// A published mass–radius curve.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Curve {
    /// Pure iron (ε phase), Seager et al. (2007).
    PureIron,
    /// Pure silicate (MgSiO3 perovskite), Seager et al. (2007).
    PureSilicate,
    /// Pure water ice, Seager et al. (2007).
    PureWaterIce,
    /// Two-layer rocky planet of the given core (iron) mass fraction, Zeng et al. (2016).
    Rocky {
        /// Core mass fraction, 0–1 (fitted for 0–0.4).
        core_mass_fraction: f64,
    },
}

impl Curve {
    /// The Earth-like rocky curve, CMF 0.325 (Earth's core mass fraction, common practice).
    pub const EARTH_LIKE: Curve = Curve::Rocky {
        core_mass_fraction: 0.325,
    };

    /// Short machine-friendly name, e.g. `"pure-iron"`.
    pub fn name(&self) -> &'static str {
        match self {
            Curve::PureIron => "pure-iron",
            Curve::PureSilicate => "pure-silicate",
            Curve::PureWaterIce => "pure-water-ice",
            Curve::Rocky { .. } => "rocky-core-fraction",
        }
    }

    /// Human-readable label for a plot legend.
    pub fn label(&self) -> String {
        match self {
            Curve::PureIron => "100% iron (Fe, ε phase)".to_string(),
            Curve::PureSilicate => "100% silicate (MgSiO3 perovskite)".to_string(),
            Curve::PureWaterIce => "100% water ice".to_string(),
            Curve::Rocky { core_mass_fraction } => {
                format!("rocky, core mass fraction {core_mass_fraction:.2}")
            }
        }
    }

    /// Bibliographic source of the curve.
    pub fn source(&self) -> &'static str {
        match self {
            Curve::PureIron | Curve::PureSilicate | Curve::PureWaterIce => {
                "Seager, Kuchner, Hier-Majumder & Militzer 2007, ApJ 669, 1279 (fitted relation)"
            }
            Curve::Rocky { .. } => "Zeng, Sasselov & Jacobsen 2016, ApJ 819, 127",
        }
    }

    /// Mass range over which the curve was fitted, kg (inclusive).
    pub fn mass_range_kg(&self) -> (f64, f64) {
        let (lo, hi) = self.mass_range_earth();
        (lo * M_EARTH, hi * M_EARTH)
    }

    /// Mass range over which the curve was fitted, Earth masses (inclusive).
    pub fn mass_range_earth(&self) -> (f64, f64) {
        match self {
            Curve::PureIron | Curve::PureSilicate | Curve::PureWaterIce => SEAGER_MASS_RANGE_EARTH,
            Curve::Rocky { .. } => ZENG_MASS_RANGE_EARTH,
        }
    }

    /// Whether the curve's non-mass parameters are inside the fitted range
    /// (always true except for a rocky curve with CMF outside 0–0.4).
    pub fn parameters_in_fitted_range(&self) -> bool {
        match self {
            Curve::Rocky { core_mass_fraction } => in_range(*core_mass_fraction, ZENG_CMF_RANGE),
            _ => true,
        }
    }

    /// Whether `mass_kg` (and the curve's parameters) lie inside the fitted range.
    pub fn is_fitted_at(&self, mass_kg: f64) -> bool {
        is_positive_finite(mass_kg)
            && self.parameters_in_fitted_range()
            && in_range(mass_kg / M_EARTH, self.mass_range_earth())
    }

    /// Radius in Earth radii, or `None` if the input is not physically meaningful
    /// (mass not positive and finite, CMF outside 0–1).
    fn radius_earth_unchecked(&self, mass_earth: f64) -> Option<f64> {
        if !is_positive_finite(mass_earth) {
            return None;
        }
        let r = match self {
            Curve::PureIron => SEAGER_IRON.radius_earth(mass_earth),
            Curve::PureSilicate => SEAGER_SILICATE.radius_earth(mass_earth),
            Curve::PureWaterIce => SEAGER_WATER.radius_earth(mass_earth),
            Curve::Rocky { core_mass_fraction } => {
                if !in_range(*core_mass_fraction, (0.0, 1.0)) {
                    return None;
                }
                zeng_radius_earth(mass_earth, *core_mass_fraction)
            }
        };
        is_positive_finite(r).then_some(r)
    }
}

/// A radius read off a curve, with a flag saying whether the curve was used outside
/// its fitted range.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct CurveRadius {
    /// Radius, m.
    pub radius_m: f64,
    /// True if the mass (or the curve's CMF) lies outside the fitted range.
    pub extrapolated: bool,
}

/// Radius (m) of a planet of `mass_kg` on `curve`, or `None` if the mass (or the
/// curve's CMF) lies outside the fitted range or is not a positive finite number.
pub fn radius_of(curve: Curve, mass_kg: f64) -> Option<f64> {
    radius_of_extrapolated(curve, mass_kg)
        .filter(|point| !point.extrapolated)
        .map(|point| point.radius_m)
}

/// Radius (m) of a planet of `mass_kg` on `curve`, evaluated even outside the fitted
/// range, with `extrapolated` set in that case. `None` only for inputs where the
/// formula is meaningless: mass not positive and finite, or a CMF outside 0–1.
pub fn radius_of_extrapolated(curve: Curve, mass_kg: f64) -> Option<CurveRadius> {
    let radius_earth = curve.radius_earth_unchecked(mass_kg / M_EARTH)?;
    Some(CurveRadius {
        radius_m: radius_earth * R_EARTH,
        extrapolated: !curve.is_fitted_at(mass_kg),
    })
}

/// Radius (m) of a pure-iron planet of `mass_kg` (Seager et al. 2007), `None` outside
/// the fitted range.
pub fn iron_radius(mass_kg: f64) -> Option<f64> {
    radius_of(Curve::PureIron, mass_kg)
}

/// Mean density (kg/m^3) of a pure-iron planet of `mass_kg` (Seager et al. 2007),
/// `None` outside the fitted range. No real planet of this mass can be denser.
pub fn density_of_pure_iron_body(mass_kg: f64) -> Option<f64> {
    iron_radius(mass_kg).map(|r| mass_kg / sphere_volume(r))
}

pub(super) fn sphere_volume(radius_m: f64) -> f64 {
    4.0 / 3.0 * std::f64::consts::PI * radius_m.powi(3)
}
