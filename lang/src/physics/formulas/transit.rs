//! Transit geometry after Winn (2010), "Transits and Occultations": depth and radius ratio
//! (no limb darkening), impact parameter and inclination (eq. 7), total and full durations
//! (eqs. 14–16), and the stellar mean density from the transit's `a/R*` and period
//! (Seager & Mallén-Ornelas 2003); and the inverse of the durations: the impact parameter,
//! `a/R*` and the stellar density from T14, T23, `k` and the period (Seager & Mallén-Ornelas
//! 2003, eqs. 7–9, for circular orbits; an eccentric orbit through Winn 2010 eq. 16).

use super::domain::{finite, finite_f64, is_eccentricity, is_positive, is_scaled_axis};
use super::typed::gravitational_constant;
use std::f64::consts::PI;
use uom::si::f64::{Angle, MassDensity, Ratio, Time};
use uom::si::ratio::ratio;

/// Transit depth from the radius ratio, `depth = k^2` (the occulted fraction of a uniform stellar
/// disc, no limb darkening; Winn 2010 sec. 2). `None` for a non-positive or non-finite `k`.
pub fn depth_from_radius_ratio(radius_ratio: f64) -> Option<f64> {
    if !(radius_ratio.is_finite() && radius_ratio > 0.0) {
        return None;
    }
    finite_f64(radius_ratio * radius_ratio)
}

/// Transit depth from the radius ratio and the impact parameter, without limb darkening: the
/// fraction of the star's disc the planet's disc covers at mid-transit, their overlap area
/// over pi at separation `b` (Mandel & Agol 2002, eq. 1). That is `k^2` while the planet's
/// disc lies wholly on the star's (`b <= 1 - k`), less on a grazing transit, and there is no
/// transit (`None`) once `b >= 1 + k`. `None` too for a non-positive or non-finite `k` or
/// a `b` that is not a number.
pub fn depth_from_radius_ratio_and_impact(radius_ratio: f64, impact: f64) -> Option<f64> {
    let full = depth_from_radius_ratio(radius_ratio)?;
    let b = impact.abs();
    if !b.is_finite() {
        return None;
    }
    if b <= 1.0 - radius_ratio {
        return Some(full);
    }
    let depth = crate::physics::lightcurve::uniform_blocked(radius_ratio, b);
    (depth > 0.0).then_some(depth).and_then(finite_f64)
}

/// Radius ratio from the transit depth, `k = Rp / R* = sqrt(depth)` (Winn 2010 sec. 2). This is
/// the no-limb-darkening approximation: a limb-darkened star makes a central transit deeper than
/// `k^2`, so this `k` is an estimate. `depth` is a fraction (84 ppm = 8.4e-5). `None` for a
/// depth outside `(0, 1]`.
pub fn radius_ratio_from_depth(depth: f64) -> Option<f64> {
    if !(depth.is_finite() && depth > 0.0 && depth <= 1.0) {
        return None;
    }
    finite_f64(depth.sqrt())
}

/// Radius ratio from the transit depth and the impact parameter, without limb darkening: the
/// depth is the fraction of the star's disc the planet's disc covers at mid-transit, their
/// overlap area over pi at separation `b` (Mandel & Agol 2002, eq. 1). While the planet's
/// disc lies wholly on the star's (`b <= 1 - k`) that is `k^2`, so `k = sqrt(depth)` as in
/// [`radius_ratio_from_depth`]; on a grazing transit (`b > 1 - k`) only part of the disc
/// covers the star, so the same depth needs a larger `k`, solved numerically. `None` for a
/// depth outside `(0, 1]` or a `b` that is not a number.
pub fn radius_ratio_from_depth_and_impact(depth: f64, impact: f64) -> Option<f64> {
    let k = radius_ratio_from_depth(depth)?;
    let b = impact.abs();
    if !b.is_finite() {
        return None;
    }
    if b <= 1.0 - k {
        return Some(k);
    }
    crate::physics::lightcurve::radius_ratio_for_depth(
        depth,
        b,
        crate::physics::lightcurve::LimbDarkening::NONE,
    )
}

/// Whether a transit of radius ratio `k` at impact parameter `b` is grazing: the planet's
/// disc is not wholly on the star's at mid-transit (`b > 1 - k`; Winn 2010 sec. 2.2), so
/// there is no second and third contact.
pub fn is_grazing(radius_ratio: f64, impact: f64) -> bool {
    impact.abs() > 1.0 - radius_ratio
}

/// An orbit's eccentricity with `e sin omega`, the eccentric term of Winn 2010 eqs. 7 and 16,
/// computed once for the formulas that use it (a transit duration needs it twice, the
/// transiting axis once per round): exactly 0 on a circular orbit without computing the sine
/// (most orbits in a catalogue, and every Monte Carlo sample of one).
#[derive(Debug, Clone, Copy)]
pub(super) struct Eccentric {
    e: f64,
    e_sin_omega: f64,
}

impl Eccentric {
    /// `None` for `e` outside `[0, 1)` or a non-finite `omega`.
    pub(super) fn of(e: f64, omega: Angle) -> Option<Eccentric> {
        if !(omega.value.is_finite() && is_eccentricity(e)) {
            return None;
        }
        let e_sin_omega = if e == 0.0 {
            0.0
        } else {
            e * omega.sin().get::<ratio>()
        };
        Some(Eccentric { e, e_sin_omega })
    }

    /// `1 + e sin omega`.
    fn one_plus_e_sin_omega(self) -> f64 {
        1.0 + self.e_sin_omega
    }

    /// `1 - e^2`.
    fn one_minus_e2(self) -> f64 {
        1.0 - self.e * self.e
    }
}

/// Star–planet distance at mid-transit in stellar radii,
/// `r / R* = (a / R*) (1 - e^2) / (1 + e sin omega)` (the eccentric factor of Winn 2010 eq. 7).
/// `None` for bad inputs or when `r / R* <= 1` (the planet would be inside the star at
/// conjunction).
fn conjunction_distance(a_over_rstar: f64, orbit: Eccentric) -> Option<f64> {
    if !is_scaled_axis(a_over_rstar) {
        return None;
    }
    let r = a_over_rstar * orbit.one_minus_e2() / orbit.one_plus_e_sin_omega();
    (r.is_finite() && r > 1.0).then_some(r)
}

/// Impact parameter from the inclination,
/// `b = (a / R*) cos i (1 - e^2) / (1 + e sin omega)` (Winn 2010 eq. 7).
///
/// The impact parameter is non-negative by convention, so `|cos i|` is used: `i` and
/// `180 deg - i` give the same `b`. `None` for a non-finite angle, `a/R* <= 1`, `e` outside
/// `[0, 1)`, or when the star–planet distance at conjunction is at most one stellar radius.
pub fn impact_from_inclination(
    inclination: Angle,
    a_over_rstar: f64,
    e: f64,
    omega: Angle,
) -> Option<f64> {
    if !inclination.value.is_finite() {
        return None;
    }
    let r = conjunction_distance(a_over_rstar, Eccentric::of(e, omega)?)?;
    // 90 deg converted to radians is not exactly pi/2, and its cosine is 6e-17, not 0: an
    // edge-on orbit would show an impact parameter of 1e-15 as if measured.
    let cos_i = inclination.cos().get::<ratio>().abs();
    let cos_i = if cos_i < 4.0 * f64::EPSILON {
        0.0
    } else {
        cos_i
    };
    finite_f64(r * cos_i)
}

/// Inclination from the impact parameter, inverting Winn 2010 eq. 7:
/// `cos i = b (1 + e sin omega) / ((a / R*) (1 - e^2))`, returned in `[0, 90 deg]`.
///
/// `None` for a negative `b`, `a/R* <= 1`, `e` outside `[0, 1)`, a star–planet distance at
/// conjunction of at most one stellar radius, or when no inclination gives this `b`
/// (`cos i > 1`: `b` exceeds that distance).
pub fn inclination_from_impact(
    impact: f64,
    a_over_rstar: f64,
    e: f64,
    omega: Angle,
) -> Option<Angle> {
    cos_inclination(impact, a_over_rstar, Eccentric::of(e, omega)?)
        .map(|c| Ratio::new::<ratio>(c).acos())
}

/// `sin i` of [`inclination_from_impact`] for an orbit whose eccentric term is already
/// computed, as `sqrt(1 - cos^2 i)` (the identity `sin(acos c) = sqrt(1 - c^2)` for `c` in
/// `[0, 1]`), without the inverse cosine and sine.
pub(super) fn sin_inclination_in_orbit(
    impact: f64,
    a_over_rstar: f64,
    orbit: Eccentric,
) -> Option<f64> {
    cos_inclination(impact, a_over_rstar, orbit).map(|c| (1.0 - c * c).max(0.0).sqrt())
}

fn cos_inclination(impact: f64, a_over_rstar: f64, orbit: Eccentric) -> Option<f64> {
    if !(impact.is_finite() && impact >= 0.0) {
        return None;
    }
    let cos_i = impact / conjunction_distance(a_over_rstar, orbit)?;
    (cos_i.is_finite() && cos_i <= 1.0).then_some(cos_i)
}

/// Shared body of Winn 2010 eqs. 14–16: `T = P/pi asin[(R*/a) sqrt(chord^2 - b^2) / sin i]`
/// times `sqrt(1 - e^2) / (1 + e sin omega)`, with `chord = 1 + k` or `1 - k`.
fn transit_duration(
    period: Time,
    a_over_rstar: f64,
    chord: f64,
    impact: f64,
    e: f64,
    omega: Angle,
) -> Option<Time> {
    if !is_positive(&period) {
        return None;
    }
    let orbit = Eccentric::of(e, omega)?;
    let cos_i = cos_inclination(impact, a_over_rstar, orbit)?;
    let sin_i = (1.0 - cos_i * cos_i).sqrt();
    let half_chord_sq = chord * chord - impact * impact;
    if !(half_chord_sq > 0.0 && sin_i > 0.0) {
        return None;
    }
    let arg = half_chord_sq.sqrt() / (a_over_rstar * sin_i);
    // arg > 1 means the planet would overlap the star for more than half an orbit: the
    // formula's geometry does not apply.
    if !(arg.is_finite() && arg <= 1.0) {
        return None;
    }
    let eccentric = orbit.one_minus_e2().sqrt() / orbit.one_plus_e_sin_omega();
    finite(period / PI * arg.asin() * eccentric)
}

/// Total transit duration T14 (first to fourth contact),
/// `T14 = P/pi asin[(R*/a) sqrt((1 + k)^2 - b^2) / sin i]` (Winn 2010 eq. 14), times the
/// eccentric factor `sqrt(1 - e^2) / (1 + e sin omega)` (Winn 2010 eq. 16, which treats the
/// star–planet distance as constant during the transit). `sin i` is obtained from `b` with
/// Winn 2010 eq. 7.
///
/// `None` when there is no transit (`b >= 1 + k`), for a non-positive period or `k`,
/// `a/R* <= 1`, `e` outside `[0, 1)`, a `b` no inclination can give, or when the asin argument
/// exceeds 1 (the planet would overlap the star for over half an orbit).
pub fn transit_duration_total(
    period: Time,
    a_over_rstar: f64,
    radius_ratio: f64,
    impact: f64,
    e: f64,
    omega: Angle,
) -> Option<Time> {
    if !(radius_ratio.is_finite() && radius_ratio > 0.0) {
        return None;
    }
    transit_duration(period, a_over_rstar, 1.0 + radius_ratio, impact, e, omega)
}

/// Full transit duration T23 (second to third contact, planet wholly inside the disc),
/// `T23 = P/pi asin[(R*/a) sqrt((1 - k)^2 - b^2) / sin i]` (Winn 2010 eq. 15), times the
/// eccentric factor of Winn 2010 eq. 16 (see [`transit_duration_total`]).
///
/// `None` when there is no full transit (a grazing transit, `b >= 1 - k`, or `k >= 1`), and for
/// the same bad inputs as [`transit_duration_total`].
pub fn transit_duration_full(
    period: Time,
    a_over_rstar: f64,
    radius_ratio: f64,
    impact: f64,
    e: f64,
    omega: Angle,
) -> Option<Time> {
    if !(radius_ratio.is_finite() && radius_ratio > 0.0 && radius_ratio < 1.0) {
        return None;
    }
    transit_duration(period, a_over_rstar, 1.0 - radius_ratio, impact, e, omega)
}

/// Stellar mean density from the transit's scaled semi-major axis and the period,
/// `rho* = 3 pi (a / R*)^3 / (G P^2)` (Seager & Mallén-Ornelas 2003 eq. 9 with `a/R*` in place
/// of its expression in the transit shape; Winn 2010 eq. 30 without the `k^3 rho_p` term).
/// Neglects the planet's mass: the result is an estimate biased high by the factor
/// `1 + Mp/M*`.
///
/// `None` for `a/R* <= 1` or a non-positive period.
pub fn stellar_density_from_transit(a_over_rstar: f64, period: Time) -> Option<MassDensity> {
    if !(is_scaled_axis(a_over_rstar) && is_positive(&period)) {
        return None;
    }
    finite(3.0 * PI * a_over_rstar.powi(3) / (gravitational_constant() * period * period))
}

/// `sin^2(pi T' / P)` of a transit duration `T` with the eccentric factor of Winn 2010 eq. 16
/// taken out, `T' = T (1 + e sin omega) / sqrt(1 - e^2)`: the duration the same chord would
/// take on a circular orbit, which is what Seager & Mallén-Ornelas (2003) write their
/// equations for. `None` unless `0 < pi T' / P <= pi / 2` (the range of the forward formula's
/// asin).
fn circular_sin2(duration: Time, period: Time, orbit: Eccentric) -> Option<f64> {
    if !(is_positive(&duration) && is_positive(&period)) {
        return None;
    }
    let factor = orbit.one_plus_e_sin_omega() / orbit.one_minus_e2().sqrt();
    let x = PI * (duration / period).get::<ratio>() * factor;
    (x.is_finite() && x > 0.0 && x <= PI / 2.0).then(|| x.sin().powi(2))
}

/// Impact parameter from the total and full transit durations and the radius ratio
/// (Seager & Mallén-Ornelas 2003 eq. 7, with their depth `Delta F = k^2`):
///
/// `b^2 = [(1 - k)^2 - r (1 + k)^2] / (1 - r)`, `r = sin^2(pi T23 / P) / sin^2(pi T14 / P)`.
///
/// Both durations are first taken to their circular-orbit equivalents (see
/// [`circular_sin2`]); the factor is the same for both, so `b` is what the engine's forward
/// formulas ([`transit_duration_total`], [`transit_duration_full`]) need to give these
/// durations. `None` unless `0 < k < 1` and `T23 < T14` (`r < 1`), or when `b^2 < 0` (the
/// durations are too close for this `k`: no impact parameter gives them).
pub fn impact_from_durations(
    period: Time,
    t14: Time,
    t23: Time,
    radius_ratio: f64,
    e: f64,
    omega: Angle,
) -> Option<f64> {
    let b_sq = impact_squared_from_durations(period, t14, t23, radius_ratio, e, omega)?;
    (b_sq >= 0.0).then(|| b_sq.sqrt()).and_then(finite_f64)
}

/// [`impact_from_durations`], with durations closer together than any impact parameter
/// gives (`b^2 < 0`: more central than a central transit) taken at `b = 0`, the nearest
/// geometry. For Monte Carlo draws of measured durations: a draw past that edge says the
/// transit is near central, and leaving it out would move the interval away from 0.
pub fn impact_from_durations_or_central(
    period: Time,
    t14: Time,
    t23: Time,
    radius_ratio: f64,
    e: f64,
    omega: Angle,
) -> Option<f64> {
    let b_sq = impact_squared_from_durations(period, t14, t23, radius_ratio, e, omega)?;
    finite_f64(b_sq.max(0.0).sqrt())
}

/// `b^2` of [`impact_from_durations`], negative where no impact parameter gives the
/// durations.
fn impact_squared_from_durations(
    period: Time,
    t14: Time,
    t23: Time,
    radius_ratio: f64,
    e: f64,
    omega: Angle,
) -> Option<f64> {
    if !(radius_ratio.is_finite() && radius_ratio > 0.0 && radius_ratio < 1.0) {
        return None;
    }
    let orbit = Eccentric::of(e, omega)?;
    let r = circular_sin2(t23, period, orbit)? / circular_sin2(t14, period, orbit)?;
    if !(r.is_finite() && r > 0.0 && r < 1.0) {
        return None;
    }
    finite_f64(((1.0 - radius_ratio).powi(2) - r * (1.0 + radius_ratio).powi(2)) / (1.0 - r))
}

/// Scaled semi-major axis from the total duration, the radius ratio and the impact parameter
/// (Seager & Mallén-Ornelas 2003 eq. 8 for a circular orbit):
///
/// `(a/R*)^2 = [(1 + k)^2 - b^2 (1 - sin^2(pi T14 / P))] / sin^2(pi T14 / P)`.
///
/// For an eccentric orbit, with `T14` taken to its circular equivalent (see
/// [`circular_sin2`]) and `rho_c = (1 - e^2) / (1 + e sin omega)` the star–planet distance at
/// conjunction in units of `a`, inverting Winn 2010 eqs. 7, 14 and 16 exactly gives
/// `(a/R*)^2 = [(1 + k)^2 - b^2] / sin^2(pi T14' / P) + b^2 / rho_c^2`, which is eq. 8 when
/// `e = 0`. `None` for `b >= 1 + k` (no transit), bad inputs, or a result `a/R* <= 1`.
pub fn scaled_axis_from_duration(
    period: Time,
    t14: Time,
    radius_ratio: f64,
    impact: f64,
    e: f64,
    omega: Angle,
) -> Option<f64> {
    if !(radius_ratio.is_finite() && radius_ratio > 0.0 && impact.is_finite() && impact >= 0.0) {
        return None;
    }
    let orbit = Eccentric::of(e, omega)?;
    let s14 = circular_sin2(t14, period, orbit)?;
    let chord_sq = (1.0 + radius_ratio).powi(2) - impact * impact;
    if chord_sq <= 0.0 {
        return None;
    }
    let rho_c = orbit.one_minus_e2() / orbit.one_plus_e_sin_omega();
    let a_sq = chord_sq / s14 + (impact / rho_c).powi(2);
    let a = a_sq.sqrt();
    is_scaled_axis(a).then_some(a)
}

/// Stellar mean density from the total duration, the radius ratio, the impact parameter and
/// the period: `a/R*` from [`scaled_axis_from_duration`] (Seager & Mallén-Ornelas 2003
/// eq. 8), then `rho* = 3 pi (a/R*)^3 / (G P^2)` ([`stellar_density_from_transit`]). This is
/// Seager & Mallén-Ornelas 2003 eq. 9, which gives `M*/R*^3 = 4 pi^2 (a/R*)^3 / (G P^2)`,
/// times `3 / (4 pi)` for the mean density. Neglects the planet's mass (Kepler's third law
/// with `M*` alone). `None` where [`scaled_axis_from_duration`] has no answer.
pub fn stellar_density_from_duration(
    period: Time,
    t14: Time,
    radius_ratio: f64,
    impact: f64,
    e: f64,
    omega: Angle,
) -> Option<MassDensity> {
    let a = scaled_axis_from_duration(period, t14, radius_ratio, impact, e, omega)?;
    stellar_density_from_transit(a, period)
}
