//! Keplerian orbits in time: Kepler's equation, the star's radial-velocity curve and the
//! planet's projected separation from the star's centre.
//!
//! Conventions follow Winn (2010, "Transits and Occultations", eqs. 1–3 and 7): the
//! argument of periastron `omega` is that of the planet's orbit, the observer looks along
//! the line of sight, and mid-transit (inferior conjunction) falls at true anomaly
//! `f = pi/2 − omega`. With these, the star's radial velocity (positive away from the
//! observer) is `v = K [cos(f + omega) + e cos omega]`; on a circular orbit it falls
//! through zero at mid-transit (common practice).

use std::f64::consts::{PI, TAU};

/// The eccentric anomaly E solving Kepler's equation `M = E − e sin E` for mean anomaly
/// `m` (radians, any value) and eccentricity `0 <= e < 1`; `None` for an eccentricity
/// outside that range or a non-finite anomaly.
///
/// Newton's method from the starting guess `E0 = M + e sin M` (or `pi` for e > 0.8,
/// common practice), guarded by bisection on `[0, 2 pi)`, so it converges for every
/// eccentricity below one.
pub fn eccentric_anomaly(m: f64, e: f64) -> Option<f64> {
    if !(0.0..1.0).contains(&e) || !m.is_finite() {
        return None;
    }
    let turns = (m / TAU).floor();
    let m0 = m - turns * TAU; // in [0, 2 pi)
    let f = |x: f64| x - e * x.sin() - m0;
    // f is increasing on [0, 2 pi] with f(0) <= 0 <= f(2 pi).
    let (mut lo, mut hi) = (0.0, TAU);
    let mut x = if e > 0.8 { PI } else { m0 + e * m0.sin() };
    for _ in 0..100 {
        let fx = f(x);
        if fx.abs() < 1e-15 {
            break;
        }
        if fx < 0.0 {
            lo = x;
        } else {
            hi = x;
        }
        let step = fx / (1.0 - e * x.cos());
        let next = x - step;
        x = if next > lo && next < hi && step.is_finite() {
            next
        } else {
            (lo + hi) / 2.0
        };
        if (hi - lo) < 1e-15 {
            break;
        }
    }
    Some(x + turns * TAU)
}

/// True anomaly from the eccentric anomaly.
pub fn true_anomaly(ecc_anomaly: f64, e: f64) -> f64 {
    2.0 * (((1.0 + e) / (1.0 - e)).sqrt() * (ecc_anomaly / 2.0).tan()).atan()
}

/// Eccentric anomaly from the true anomaly.
pub fn eccentric_from_true(f: f64, e: f64) -> f64 {
    2.0 * (((1.0 - e) / (1.0 + e)).sqrt() * (f / 2.0).tan()).atan()
}

/// The shape and timing of an orbit.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Orbit {
    /// Period, any time unit (times below are in the same unit).
    pub period: f64,
    pub eccentricity: f64,
    /// Argument of periastron of the planet's orbit, radians.
    pub omega: f64,
    /// Time of mid-transit (inferior conjunction).
    pub t_conjunction: f64,
}

impl Orbit {
    /// The time of periastron passage before the conjunction.
    pub fn t_periastron(&self) -> f64 {
        let e = self.eccentricity;
        let f_c = PI / 2.0 - self.omega;
        let ecc = eccentric_from_true(f_c, e);
        let m_c = ecc - e * ecc.sin();
        self.t_conjunction - m_c / TAU * self.period
    }

    /// True anomaly at time `t`; `None` for an unusable orbit.
    pub fn true_anomaly_at(&self, t: f64) -> Option<f64> {
        if self.period.is_nan() || self.period <= 0.0 || !self.period.is_finite() {
            return None;
        }
        let m = TAU * (t - self.t_periastron()) / self.period;
        let ecc = eccentric_anomaly(m, self.eccentricity)?;
        Some(true_anomaly(ecc, self.eccentricity))
    }

    /// The star's radial velocity at `t` for semi-amplitude `k` (same unit out as in).
    pub fn radial_velocity(&self, t: f64, k: f64) -> Option<f64> {
        let f = self.true_anomaly_at(t)?;
        Some(k * ((f + self.omega).cos() + self.eccentricity * self.omega.cos()))
    }

    /// Projected star–planet separation at `t`, in units of the semi-major axis given
    /// as `a` (so pass a/R* to get stellar radii), and whether the planet is in front of
    /// the star (Winn 2010 eqs. 1–3). `inclination` in radians.
    pub fn sky_separation(&self, t: f64, a: f64, inclination: f64) -> Option<(f64, bool)> {
        let e = self.eccentricity;
        let f = self.true_anomaly_at(t)?;
        let r = a * (1.0 - e * e) / (1.0 + e * f.cos());
        let x = -r * (self.omega + f).cos();
        let y = -r * (self.omega + f).sin() * inclination.cos();
        let z = r * (self.omega + f).sin() * inclination.sin();
        Some(((x * x + y * y).sqrt(), z > 0.0))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn kepler_equation_known_solutions() {
        // Meeus, Astronomical Algorithms, ch. 30, example 30.a (from memory):
        // e = 0.100, M = 5 deg gives E = 5.554 589 deg.
        let e = eccentric_anomaly(5f64.to_radians(), 0.1).unwrap();
        assert!(
            (e.to_degrees() - 5.554_589).abs() < 1e-6,
            "{}",
            e.to_degrees()
        );
        // Closed forms: M = 0 and M = pi are fixed points for every e (E = M).
        for ecc in [0.0, 0.3, 0.9, 0.999] {
            assert!(eccentric_anomaly(0.0, ecc).unwrap().abs() < 1e-14);
            assert!((eccentric_anomaly(PI, ecc).unwrap() - PI).abs() < 1e-12);
        }
        // e = 0: E = M.
        assert!((eccentric_anomaly(1.234, 0.0).unwrap() - 1.234).abs() < 1e-14);
        assert!(eccentric_anomaly(1.0, 1.0).is_none());
        assert!(eccentric_anomaly(f64::NAN, 0.1).is_none());
    }

    #[test]
    fn kepler_round_trips() {
        for &e in &[0.0, 0.01, 0.2, 0.5, 0.8, 0.95, 0.999] {
            for i in -20..=40 {
                let m = f64::from(i) * 0.37;
                let ecc = eccentric_anomaly(m, e).unwrap();
                assert!((ecc - e * ecc.sin() - m).abs() < 1e-12, "e={e} M={m}");
                let f = true_anomaly(ecc, e);
                let back = eccentric_from_true(f, e);
                let wrapped = (back - ecc).rem_euclid(TAU);
                assert!(wrapped < 1e-9 || (TAU - wrapped) < 1e-9, "e={e} M={m}");
            }
        }
    }

    #[test]
    fn circular_rv_falls_through_zero_at_transit() {
        let o = Orbit {
            period: 10.0,
            eccentricity: 0.0,
            omega: PI / 2.0,
            t_conjunction: 3.0,
        };
        // v = -K sin(2 pi (t - Tc) / P) for a circular orbit (common practice).
        for i in 0..50 {
            let t = f64::from(i) * 0.3;
            let v = o.radial_velocity(t, 50.0).unwrap();
            let expect = -50.0 * (TAU * (t - 3.0) / 10.0).sin();
            assert!((v - expect).abs() < 1e-9, "{t}: {v} vs {expect}");
        }
        let (z, front) = o.sky_separation(3.0, 10.0, PI / 2.0).unwrap();
        assert!(z < 1e-9 && front);
        let (z, front) = o.sky_separation(8.0, 10.0, PI / 2.0).unwrap();
        assert!(z < 1e-9 && !front);
    }

    #[test]
    fn eccentric_rv_has_zero_mean_and_the_right_extremes() {
        // Over one period the time-average of v is zero, and its extremes are
        // K (1 + e cos w) and -K (1 - e cos w) (common practice).
        let o = Orbit {
            period: 1.0,
            eccentricity: 0.6,
            omega: 0.7,
            t_conjunction: 0.0,
        };
        let n = 200_000;
        let vs: Vec<f64> = (0..n)
            .map(|i| o.radial_velocity(f64::from(i) / f64::from(n), 1.0).unwrap())
            .collect();
        let mean = vs.iter().sum::<f64>() / f64::from(n);
        assert!(mean.abs() < 1e-6, "{mean}");
        let max = vs.iter().copied().fold(f64::MIN, f64::max);
        let min = vs.iter().copied().fold(f64::MAX, f64::min);
        assert!((max - (1.0 + 0.6 * 0.7f64.cos())).abs() < 1e-4);
        assert!((min + (1.0 - 0.6 * 0.7f64.cos())).abs() < 1e-4);
        // Conjunction is where the planet is in front, at true anomaly pi/2 - omega.
        let f = o.true_anomaly_at(0.0).unwrap();
        assert!((f - (PI / 2.0 - 0.7)).abs() < 1e-9);
    }
}
