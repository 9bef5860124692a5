//! The flux of a star while a dark planet crosses it, for a uniform and for a quadratically
//! limb-darkened stellar disk.
//!
//! Geometry: the star has unit radius, the planet radius `p` (= Rp/R*), their centres
//! are `z` apart (in stellar radii). Mandel & Agol (2002, ApJ 580, L171) give the blocked
//! fraction of a uniform disk in closed form (their eq. 1) — [`uniform_blocked`]. For the
//! quadratic law `I(mu) = 1 − u1 (1 − mu) − u2 (1 − mu)^2` (their section 4) this module
//! evaluates the same occultation integral, the intensity-weighted overlap area, by
//! Gauss–Legendre quadrature instead of their closed form in elliptic integrals:
//!
//!   blocked = [ ∫_0^1 I(r) dA(r) ] / [ ∫_0^1 I(r) 2 pi r dr ],
//!
//! where A(r) is the overlap of the planet's disk with the star-centred disk of radius r.
//! Integrating by parts and changing to mu = sqrt(1 − r²) leaves a polynomial dI/dmu times
//! the continuous A, split at the overlap's kinks, which quadrature handles to ~1e-9.

use std::f64::consts::PI;
use std::sync::OnceLock;

/// Quadratic limb-darkening coefficients.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct LimbDarkening {
    pub u1: f64,
    pub u2: f64,
}

impl LimbDarkening {
    pub const NONE: LimbDarkening = LimbDarkening { u1: 0.0, u2: 0.0 };

    /// A limb-darkened law of roughly a Sun-like dwarf in a broad optical band (from
    /// memory; not fitted to any star or band): what the tests draw with. Nothing uses it
    /// unless asked: without given coefficients the star's disc is uniform, as the engine
    /// assumes when it reads a depth as k^2.
    pub const ASSUMED: LimbDarkening = LimbDarkening { u1: 0.40, u2: 0.25 };
    /// The words for a plot drawn without given coefficients.
    pub const NONE_BASIS: &'static str = "no limb darkening (a uniform stellar disc, as the engine assumes when it reads the depth as k^2): give --limb-darkening u1,u2 for your star and band";

    /// Intensity relative to the disk centre at `mu` (cosine of the emergent angle).
    pub fn intensity(&self, mu: f64) -> f64 {
        let x = 1.0 - mu;
        1.0 - self.u1 * x - self.u2 * x * x
    }

    /// Whether the law stays positive everywhere and does not brighten towards the limb:
    /// u1 + u2 <= 1, u1 >= 0, u1 + 2 u2 >= 0 (Kipping 2013, MNRAS 435, 2152; from memory).
    pub fn is_physical(&self) -> bool {
        self.u1.is_finite()
            && self.u2.is_finite()
            && self.u1 + self.u2 <= 1.0
            && self.u1 >= 0.0
            && self.u1 + 2.0 * self.u2 >= 0.0
    }

    /// Total disk flux in units of the central intensity times the area of a unit
    /// circle: ∫ I 2 pi r dr / pi = 1 − u1/3 − u2/6 (closed form of the quadratic law).
    pub fn disk_flux(&self) -> f64 {
        1.0 - self.u1 / 3.0 - self.u2 / 6.0
    }
}

/// Area of overlap of two disks of radii `r` and `p` whose centres are `z` apart.
pub fn overlap_area(r: f64, p: f64, z: f64) -> f64 {
    if r <= 0.0 || p <= 0.0 {
        return 0.0;
    }
    if z >= r + p {
        return 0.0;
    }
    if z <= (r - p).abs() {
        let m = r.min(p);
        return PI * m * m;
    }
    let k0 = ((p * p + z * z - r * r) / (2.0 * p * z))
        .clamp(-1.0, 1.0)
        .acos();
    let k1 = ((r * r + z * z - p * p) / (2.0 * r * z))
        .clamp(-1.0, 1.0)
        .acos();
    let s = (4.0 * z * z * r * r - (r * r + z * z - p * p).powi(2)).max(0.0);
    p * p * k0 + r * r * k1 - 0.5 * s.sqrt()
}

/// Fraction of a uniform disk's flux hidden by the planet (Mandel & Agol 2002, eq. 1).
pub fn uniform_blocked(p: f64, z: f64) -> f64 {
    overlap_area(1.0, p, z.abs()) / PI
}

/// Gauss–Legendre nodes and weights on [-1, 1] (Newton on the Legendre polynomial;
/// common practice).
fn gauss_legendre() -> &'static [(f64, f64)] {
    static NODES: OnceLock<Vec<(f64, f64)>> = OnceLock::new();
    NODES.get_or_init(|| {
        let n = 48usize;
        let mut out = Vec::with_capacity(n);
        for i in 0..n {
            let mut x = (PI * (i as f64 + 0.75) / (n as f64 + 0.5)).cos();
            let mut dp = 1.0;
            for _ in 0..100 {
                let (mut p0, mut p1) = (1.0, x);
                for k in 2..=n {
                    let kf = k as f64;
                    let p2 = ((2.0 * kf - 1.0) * x * p1 - (kf - 1.0) * p0) / kf;
                    p0 = p1;
                    p1 = p2;
                }
                dp = n as f64 * (x * p1 - p0) / (x * x - 1.0);
                let dx = p1 / dp;
                x -= dx;
                if dx.abs() < 1e-15 {
                    break;
                }
            }
            out.push((x, 2.0 / ((1.0 - x * x) * dp * dp)));
        }
        out
    })
}

fn integrate(f: &dyn Fn(f64) -> f64, a: f64, b: f64) -> f64 {
    if b <= a {
        return 0.0;
    }
    let (mid, half) = ((a + b) / 2.0, (b - a) / 2.0);
    gauss_legendre()
        .iter()
        .map(|(x, w)| w * f(mid + half * x))
        .sum::<f64>()
        * half
}

/// Fraction of the star's flux hidden by a planet of radius ratio `p` at separation `z`,
/// for quadratic limb darkening. With `LimbDarkening::NONE` this equals
/// [`uniform_blocked`].
pub fn blocked(p: f64, z: f64, ld: LimbDarkening) -> f64 {
    let z = z.abs();
    if p.is_nan() || p <= 0.0 || !z.is_finite() || z >= 1.0 + p {
        return 0.0;
    }
    // ∫_0^1 I dA = I(r=1) A(1) − ∫_0^1 A(r) I'(r) dr
    //            = I(mu=0) A(1) + ∫_0^1 A(sqrt(1 − mu²)) dI/dmu dmu.
    let a1 = overlap_area(1.0, p, z);
    let di_dmu = |mu: f64| ld.u1 + 2.0 * ld.u2 * (1.0 - mu);
    let g = |mu: f64| overlap_area((1.0 - mu * mu).max(0.0).sqrt(), p, z) * di_dmu(mu);
    // Kinks of A(r) sit at r = |z − p| and r = z + p.
    let mut cuts = vec![0.0, 1.0];
    for r in [(z - p).abs(), z + p] {
        if r > 0.0 && r < 1.0 {
            cuts.push((1.0 - r * r).sqrt());
        }
    }
    cuts.sort_by(f64::total_cmp);
    let integral: f64 = cuts
        .windows(2)
        .map(|w| match (w.first(), w.get(1)) {
            (Some(&a), Some(&b)) => integrate(&g, a, b),
            _ => 0.0,
        })
        .sum();
    let hidden = ld.intensity(0.0) * a1 + integral;
    (hidden / (PI * ld.disk_flux())).clamp(0.0, 1.0)
}

/// Relative flux (1 out of transit) of the star at separation `z`.
pub fn relative_flux(p: f64, z: f64, ld: LimbDarkening) -> f64 {
    1.0 - blocked(p, z, ld)
}

/// Most steps of [`radius_ratio_for_depth`].
const INVERSION_STEPS: usize = 200;

/// The radius ratio whose transit is `depth` deep at separation `z` (the mid-transit
/// separation, `z = b`) for this limb darkening: the inverse of [`blocked`] in `p`, solved
/// numerically, so a model drawn with this `k` and law dips by exactly `depth`.
///
/// Start: the small-planet approximation of Mandel & Agol (2002, section 5),
/// `depth = k^2 I(mu) / (1 - u1/3 - u2/6)` with `mu = sqrt(1 - z^2)` (the intensity under the
/// planet over the disk's mean; for the quadratic law their `4 Omega` is `1 - u1/3 - u2/6`).
/// Then a bracketed secant (regula falsi, Illinois variant; common practice) on
/// `blocked(p, z) - depth`, which increases with `p` (a larger disk at the same centre hides a
/// superset of the star), until the depth matches to 1e-12 (relative) or after
/// [`INVERSION_STEPS`] steps. `None` for a depth outside `(0, 1]`, a bad `z`, an unphysical
/// law, or no solution (a depth that no planet at this `z` reaches).
pub fn radius_ratio_for_depth(depth: f64, z: f64, ld: LimbDarkening) -> Option<f64> {
    if !(depth.is_finite() && depth > 0.0 && depth <= 1.0 && z.is_finite() && ld.is_physical()) {
        return None;
    }
    let z = z.abs();
    let f = |p: f64| blocked(p, z, ld) - depth;
    let mu = (1.0 - z * z).max(0.0).sqrt();
    let under = ld.intensity(mu);
    let start = if under > 0.0 {
        (depth * ld.disk_flux() / under).sqrt()
    } else {
        depth.sqrt()
    };
    // Bracket the root: f(lo) < 0 <= f(hi). A planet of radius 1 + z hides the whole star.
    let most = 1.0 + z + 1e-9;
    let (mut lo, mut hi) = (0.0_f64, start.min(most));
    let (mut f_lo, mut f_hi) = (-depth, f(hi));
    let mut grow = 0;
    while f_hi < 0.0 {
        if hi >= most || grow > 64 {
            return None;
        }
        (lo, f_lo) = (hi, f_hi);
        hi = (hi * 1.5).min(most);
        f_hi = f(hi);
        grow += 1;
    }
    let tolerance = 1e-12 * depth;
    let mut side = 0i8;
    for _ in 0..INVERSION_STEPS {
        let p = (lo * f_hi - hi * f_lo) / (f_hi - f_lo);
        let p = if p.is_finite() && p > lo && p < hi {
            p
        } else {
            0.5 * (lo + hi)
        };
        let fp = f(p);
        if fp.abs() <= tolerance || hi - lo <= 1e-15 * hi {
            return Some(p);
        }
        if fp < 0.0 {
            (lo, f_lo) = (p, fp);
            if side == -1 {
                f_hi *= 0.5;
            }
            side = -1;
        } else {
            (hi, f_hi) = (p, fp);
            if side == 1 {
                f_lo *= 0.5;
            }
            side = 1;
        }
    }
    None
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn radius_ratio_for_depth_inverts_the_model() {
        for ld in [
            LimbDarkening::NONE,
            LimbDarkening::ASSUMED,
            LimbDarkening { u1: 0.6, u2: 0.1 },
        ] {
            for depth in [1e-4, 0.005, 0.01, 0.05] {
                for z in [0.0, 0.4, 0.8, 0.95] {
                    let k = radius_ratio_for_depth(depth, z, ld).expect("k");
                    let back = blocked(k, z, ld);
                    assert!(
                        (back / depth - 1.0).abs() < 1e-9,
                        "{ld:?} {depth} {z}: {back}"
                    );
                }
            }
        }
        // Without limb darkening a planet wholly inside the disk has k = sqrt(depth).
        let k = radius_ratio_for_depth(0.01, 0.3, LimbDarkening::NONE).expect("k");
        assert!((k - 0.1).abs() < 1e-12, "{k}");
        // With the assumed law a central transit 1% deep needs a smaller planet: the
        // small-planet approximation (Mandel & Agol 2002 sec. 5) gives
        // k = sqrt(0.01 (1 - 0.40/3 - 0.25/6)) = 0.0908, the finite planet a little less.
        let k = radius_ratio_for_depth(0.01, 0.0, LimbDarkening::ASSUMED).expect("k");
        assert!((k / 0.090_83 - 1.0).abs() < 5e-3, "{k}");
        // At z = 3 only a body over twice the star's size reaches the limb at all; a depth of
        // zero is no transit; an unphysical law has no answer.
        let k = radius_ratio_for_depth(0.01, 3.0, LimbDarkening::ASSUMED).expect("k");
        assert!(k > 2.0 && (blocked(k, 3.0, LimbDarkening::ASSUMED) / 0.01 - 1.0).abs() < 1e-9);
        assert!(radius_ratio_for_depth(0.0, 0.0, LimbDarkening::NONE).is_none());
        assert!(radius_ratio_for_depth(0.01, 0.0, LimbDarkening { u1: 2.0, u2: 0.0 }).is_none());
    }

    #[test]
    fn uniform_disk_limits() {
        // Mandel & Agol 2002 eq. 1: lambda = p^2 when the planet is fully inside the disk,
        // 0 outside, 1 when it covers the star.
        for p in [0.01, 0.1, 0.3] {
            assert!((uniform_blocked(p, 0.0) - p * p).abs() < 1e-15);
            assert!((uniform_blocked(p, 1.0 - p - 1e-9) - p * p).abs() < 1e-12);
            assert_eq!(uniform_blocked(p, 1.0 + p), 0.0);
        }
        assert_eq!(uniform_blocked(1.5, 0.2), 1.0);
        // Half a planet on the limb of a large star: about p^2/2 (small-p limit).
        let p: f64 = 0.001;
        assert!((uniform_blocked(p, 1.0) / (p * p) - 0.5).abs() < 1e-3);
    }

    #[test]
    fn overlap_of_equal_unit_disks_at_unit_distance() {
        // Two unit circles one radius apart overlap in 2 pi/3 − sqrt(3)/2 (common practice).
        let a = overlap_area(1.0, 1.0, 1.0);
        assert!((a - (2.0 * PI / 3.0 - 3f64.sqrt() / 2.0)).abs() < 1e-12);
    }

    #[test]
    fn zero_limb_darkening_is_the_uniform_closed_form() {
        for p in [0.02, 0.1, 0.25] {
            for i in 0..=60 {
                let z = f64::from(i) * (1.0 + p) / 60.0;
                let q = blocked(p, z, LimbDarkening::NONE);
                let u = uniform_blocked(p, z);
                assert!((q - u).abs() < 1e-9, "p={p} z={z}: {q} vs {u}");
            }
        }
    }

    #[test]
    fn flux_is_conserved() {
        // A planet that covers the whole star hides all of its flux, whatever the law.
        for ld in [
            LimbDarkening::NONE,
            LimbDarkening::ASSUMED,
            LimbDarkening { u1: 0.9, u2: 0.1 },
        ] {
            assert!((blocked(1.3, 0.2, ld) - 1.0).abs() < 1e-9);
            // And the disk flux integral matches 1 − u1/3 − u2/6.
            let numeric = 2.0
                * integrate(
                    &|r: f64| ld.intensity((1.0 - r * r).max(0.0).sqrt()) * r,
                    0.0,
                    1.0,
                );
            assert!((numeric - ld.disk_flux()).abs() < 1e-4, "{numeric}");
        }
    }

    #[test]
    fn small_planet_limit() {
        // Mandel & Agol 2002 section 5: for p << 1 the hidden fraction is
        // p^2 I(mu(z)) / (1 − u1/3 − u2/6) (intensity under the planet over the mean).
        let ld = LimbDarkening { u1: 0.45, u2: 0.2 };
        let p = 0.005;
        for z in [0.0, 0.3, 0.6, 0.9] {
            let mu = (1.0f64 - z * z).sqrt();
            let expect = p * p * ld.intensity(mu) / ld.disk_flux();
            let got = blocked(p, z, ld);
            assert!(
                (got / expect - 1.0).abs() < 2e-3,
                "z={z}: {got} vs {expect}"
            );
        }
    }

    #[test]
    fn limb_darkening_deepens_the_centre_and_keeps_the_ingress() {
        let p = 0.1;
        let centre = blocked(p, 0.0, LimbDarkening::ASSUMED);
        assert!(centre > p * p);
        assert_eq!(blocked(p, 1.0 + p, LimbDarkening::ASSUMED), 0.0);
        assert!(blocked(p, 1.0, LimbDarkening::ASSUMED) < uniform_blocked(p, 1.0));
        assert!(LimbDarkening::ASSUMED.is_physical());
        assert!(!LimbDarkening { u1: 1.2, u2: 0.3 }.is_physical());
    }
}

#[cfg(test)]
mod reference {
    use super::*;

    /// Brute-force polar-grid integrals of the limb-darkened disk computed with numpy
    /// (`tests/reference/make_beyond_reference.py`, output in `beyond.json`).
    #[test]
    fn matches_numpy_grid_integration() {
        let json: serde_json::Value =
            serde_json::from_str(include_str!("../../../tests/reference/beyond.json")).unwrap();
        let cases = json["light_curve"].as_array().unwrap();
        assert!(cases.len() >= 5);
        for c in cases {
            let f = |k: &str| c[k].as_f64().unwrap();
            let ld = LimbDarkening {
                u1: f("u1"),
                u2: f("u2"),
            };
            let got = blocked(f("p"), f("z"), ld);
            let want = f("blocked");
            // The grid's edge error is a few 1e-6 of the flux.
            assert!((got - want).abs() < 2e-5, "{c}: {got}");
        }
    }
}
