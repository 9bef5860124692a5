//! Input checks every formula applies before computing (positive, finite, an eccentricity in
//! `[0, 1)`, `sin i` in `(0, 1]`, `a/R*` above 1) and the guard that no NaN or infinity leaves
//! the formulas.

pub(super) fn is_positive<D>(q: &uom::si::Quantity<D, uom::si::SI<f64>, f64>) -> bool
where
    D: uom::si::Dimension + ?Sized,
{
    q.value.is_finite() && q.value > 0.0
}

pub(super) fn is_non_negative<D>(q: &uom::si::Quantity<D, uom::si::SI<f64>, f64>) -> bool
where
    D: uom::si::Dimension + ?Sized,
{
    q.value.is_finite() && q.value >= 0.0
}

/// `Some(q)` when the result is finite, so no NaN or infinity leaves the formulas.
pub(super) fn finite<D>(
    q: uom::si::Quantity<D, uom::si::SI<f64>, f64>,
) -> Option<uom::si::Quantity<D, uom::si::SI<f64>, f64>>
where
    D: uom::si::Dimension + ?Sized,
{
    q.value.is_finite().then_some(q)
}

pub(super) fn finite_f64(x: f64) -> Option<f64> {
    x.is_finite().then_some(x)
}

/// A bound eccentricity: finite and in `[0, 1)`.
pub(super) fn is_eccentricity(e: f64) -> bool {
    e.is_finite() && (0.0..1.0).contains(&e)
}

/// `sin i` in `(0, 1]`.
pub(super) fn is_sin_inclination(sin_i: f64) -> bool {
    sin_i.is_finite() && sin_i > 0.0 && sin_i <= 1.0
}

/// `a/R*` finite and above 1 (the orbit lies outside the star).
pub(super) fn is_scaled_axis(a_over_rstar: f64) -> bool {
    a_over_rstar.is_finite() && a_over_rstar > 1.0
}
