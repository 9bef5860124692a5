//! The data behind the diagrams: planets on the mass–radius plane, a model radial-velocity
//! curve and a model transit light curve, each with its uncertainty band. Pure: front ends
//! draw what these functions return.
//!
//! Bands come from Monte Carlo draws of the model's inputs as reported (value and the
//! uncertainty on each side, limits sampled uniformly within their range), drawn
//! independently of each other, so correlations between the inputs are ignored; the curve
//! is the pointwise median of the draws and the band spans their 16th to 84th percentiles.

use crate::constants::{DAY, M_EARTH, R_EARTH};
use crate::derive::{value, Origin, QuantityResult};
use crate::lightcurve::{self, LimbDarkening};
use crate::model::Measurement;
use crate::orbit::Orbit;
use crate::quantities::{self, Qty};
use crate::Analysis;

pub mod labels;
pub mod ticks;

/// One planet on the mass–radius diagram, in Earth units.
#[derive(Debug, Clone, PartialEq)]
pub struct PlanetPoint {
    /// `System body`, e.g. `Veyra b`.
    pub label: String,
    /// The system's name, and which system of which file it is: planets with the same
    /// `group` share a marker.
    pub system: String,
    pub group: usize,
    pub mass: f64,
    pub mass_below: f64,
    pub mass_above: f64,
    pub radius: f64,
    pub radius_below: f64,
    pub radius_above: f64,
    /// Where it sits in words ([`crate::composition::describe_position`]).
    pub position: String,
    /// When the mass or the radius is only a limit (upper or lower): the point sits at the
    /// limit and an arrow points the way the value may lie.
    pub mass_limit: Option<crate::model::Form>,
    pub radius_limit: Option<crate::model::Form>,
}

/// Every planet of the analyses that has a mass and a radius; the others are listed with
/// the reason they are left out.
pub fn mass_radius_points(analyses: &[Analysis]) -> (Vec<PlanetPoint>, Vec<String>) {
    let mut points = Vec::new();
    let mut left_out = Vec::new();
    let mut group = 0;
    for a in analyses {
        for (sys, res) in a.model.systems.iter().zip(&a.results) {
            let before = points.len();
            for (b, r) in sys.bodies.iter().zip(&res.bodies) {
                if b.kind != crate::ast::BodyKind::Planet {
                    continue;
                }
                let label = format!("{} {}", sys.name, b.id);
                let (Some(m), Some(rad)) = (r.get(Qty::Mass), r.get(Qty::Radius)) else {
                    let missing = if r.get(Qty::Radius).is_none() {
                        "no radius"
                    } else if r.get(Qty::MinMass).is_some() {
                        "no true mass (a minimum mass is not plotted)"
                    } else {
                        "no mass"
                    };
                    left_out.push(format!("{label}: {missing}"));
                    continue;
                };
                if !(m.value.is_finite() && rad.value.is_finite()) {
                    left_out.push(format!(
                        "{label}: the mass or the radius is not a finite number"
                    ));
                    continue;
                }
                points.push(PlanetPoint {
                    label,
                    system: sys.name.clone(),
                    group,
                    mass: m.value / M_EARTH,
                    mass_below: m.below / M_EARTH,
                    mass_above: m.above / M_EARTH,
                    radius: rad.value / R_EARTH,
                    radius_below: rad.below / R_EARTH,
                    radius_above: rad.above / R_EARTH,
                    position: {
                        let mut words = crate::composition::describe_position(m.value, rad.value);
                        for (q, what) in [(m, "mass"), (rad, "radius")] {
                            let kind = match q.form {
                                crate::model::Form::UpperLimit => "an upper",
                                crate::model::Form::LowerLimit => "a lower",
                                _ => continue,
                            };
                            words.push_str(&format!(
                                "; the {what} is {kind} limit: the point is at the limit, not at a measured value"
                            ));
                        }
                        words
                    },
                    mass_limit: m.form.is_limit().then_some(m.form),
                    radius_limit: rad.form.is_limit().then_some(rad.form),
                });
            }
            if points.len() > before {
                group += 1;
            }
        }
    }
    (points, left_out)
}

/// One composition curve of the mass–radius diagram, sampled for drawing.
#[derive(Debug, Clone)]
pub struct CurveTrace {
    pub curve: crate::composition::Curve,
    /// The legend entry: what the curve is, and its published source.
    pub legend: String,
    /// A word or two to write at the curve's end.
    pub short: &'static str,
    /// (mass in Earth masses, radius in Earth radii, inside the fit's mass range).
    pub points: Vec<(f64, f64, bool)>,
}

/// The diagram's composition curves ([`crate::composition::PLOTTED_CURVES`]) from `m_min` to
/// `m_max` Earth masses, `n` + 1 points each, evenly spaced in log mass. Points outside a
/// fit's mass range are kept, marked, so a plot can draw them faint.
pub fn composition_curves(m_min: f64, m_max: f64, n: u32) -> Vec<CurveTrace> {
    use crate::composition::{radius_of_extrapolated, Curve, PLOTTED_CURVES};
    PLOTTED_CURVES
        .iter()
        .map(|curve| {
            let (lo, hi) = curve.mass_range_earth();
            let points = (0..=n)
                .filter_map(|i| {
                    let m = m_min * (m_max / m_min).powf(f64::from(i) / f64::from(n));
                    let r = radius_of_extrapolated(*curve, m * M_EARTH)?;
                    Some((m, r.radius_m / R_EARTH, m >= lo && m <= hi))
                })
                .collect();
            let (label, source, short) = match curve {
                Curve::Rocky { .. } => (
                    "Earth-like rock (32.5% iron core)".to_string(),
                    "Zeng et al. 2016",
                    "Earth-like",
                ),
                Curve::PureIron => (curve.label(), "Seager et al. 2007", "iron"),
                Curve::PureSilicate => (curve.label(), "Seager et al. 2007", "silicate"),
                Curve::PureWaterIce => (curve.label(), "Seager et al. 2007", "water ice"),
            };
            CurveTrace {
                curve: *curve,
                legend: format!("{label} — {source}"),
                short,
                points,
            }
        })
        .collect()
}

/// A model curve with its band: `x`, median, 16th and 84th percentiles.
#[derive(Debug, Clone, PartialEq)]
pub struct Band {
    pub x: Vec<f64>,
    pub median: Vec<f64>,
    pub low: Vec<f64>,
    pub high: Vec<f64>,
}

/// A model curve and what it assumed.
#[derive(Debug, Clone, PartialEq)]
pub struct ModelCurve {
    /// `System body`.
    pub label: String,
    pub band: Band,
    /// The inputs used, as `name = value` lines for the plot.
    pub inputs: Vec<String>,
    pub assumptions: Vec<String>,
    /// What the curve leaves out and why (model values that are not finite numbers).
    pub left_out: Vec<String>,
    /// For a curve drawn at an upper limit rather than from a measurement: the limit, as
    /// the legend says it (`rv_amplitude < 3.1 m/s`).
    pub upper_limit: Option<String>,
}

const DRAWS_RV: usize = 1000;
const DRAWS_TRANSIT: usize = 200;
/// Times per orbit at which the radial-velocity model is computed.
const RV_STEPS: u32 = 480;
/// Times across the transit window at which the light curve is computed.
const TRANSIT_STEPS: u32 = 400;

struct Inputs<'a> {
    a: &'a Analysis,
    sys: usize,
    body: usize,
    label: String,
    assumptions: Vec<String>,
    shown: Vec<String>,
}

impl<'a> Inputs<'a> {
    fn new(a: &'a Analysis, sys: usize, body: usize) -> Result<Inputs<'a>, String> {
        let s = a.model.systems.get(sys).ok_or("no such system")?;
        let b = s.bodies.get(body).ok_or("no such body")?;
        if b.kind != crate::ast::BodyKind::Planet {
            return Err(format!("'{}' is a star; this model is a planet's", b.id));
        }
        Ok(Inputs {
            a,
            sys,
            body,
            label: format!("{} {}", s.name, b.id),
            assumptions: Vec::new(),
            shown: Vec::new(),
        })
    }

    fn result(&self, q: Qty) -> Option<&'a QuantityResult> {
        self.a.results.get(self.sys)?.bodies.get(self.body)?.get(q)
    }

    fn nominal(&self, q: Qty) -> f64 {
        self.result(q).map_or(f64::NAN, |r| r.value)
    }

    /// `n` draws of a quantity (SI), or an error naming what is missing.
    fn draws(&mut self, q: Qty, n: usize, seed: u64) -> Result<Vec<f64>, String> {
        let def = quantities::def(q);
        // A circular orbit (declared so, or by default) has no orientation to spread.
        let circular = self.result(Qty::Eccentricity).is_none_or(|e| {
            e.value == 0.0 && e.below == 0.0 && e.above == 0.0 && !e.form.is_limit()
        });
        if q == Qty::ArgPeriastron && self.result(q).is_none() && !circular {
            // The engine spreads an unknown orientation over a full turn (see
            // `derive::Derivation`); the model curves do the same.
            let words = crate::derive::SPREAD_PERIASTRON.to_string();
            if !self.assumptions.contains(&words) {
                self.assumptions.push(words);
            }
            // The assumption says how it is spread; the inputs only say it is not given.
            self.shown.push("arg_periastron not given".to_string());
            let turn = 2.0 * std::f64::consts::PI;
            let m = Measurement {
                value: turn,
                below: 0.0,
                above: 0.0,
                form: crate::model::Form::UpperLimit,
            };
            return Ok(value::draw(&m, 0.0, turn, n, seed).to_vec());
        }
        if let Some(r) = self.result(q).filter(|r| r.unused()) {
            return Err(format!(
                "'{}' is declared only as a lower limit ({}), which has no upper bound to draw up to; give a measurement or an upper limit",
                def.name,
                crate::report::value_text(r)
            ));
        }
        let Some(r) = self.result(q).filter(|r| r.value.is_finite()) else {
            // A default no derived value happened to use (an eccentricity on a planet whose
            // other values do not need one) is still the engine's default.
            let (v, words) = crate::derive::default_of(q)
                .ok_or_else(|| format!("'{}' is neither declared nor derivable", def.name))?;
            if !self.assumptions.iter().any(|a| a == words) {
                self.assumptions.push(words.to_string());
            }
            let unit = crate::derive::display_unit(q, v);
            self.shown.push(format!(
                "{} = {} (default)",
                def.name,
                crate::report::shown_in(v, 0.0, 0.0, crate::model::Form::Exact, unit)
            ));
            return Ok(vec![v; n]);
        };
        for a in &r.assumptions {
            if !self.assumptions.contains(a) {
                self.assumptions.push(a.clone());
            }
        }
        let shown = crate::report::value_text(r);
        let sep = if shown.starts_with(['<', '>']) {
            " "
        } else {
            " = "
        };
        let origin = if r.origin == Origin::Default {
            " (default)"
        } else {
            ""
        };
        self.shown.push(format!("{}{sep}{shown}{origin}", def.name));
        let m = Measurement {
            value: r.value,
            below: r.below,
            above: r.above,
            form: r.form,
        };
        let (lo, hi) = def.limits();
        let exact = r.below == 0.0 && r.above == 0.0 && !r.form.is_limit();
        if exact {
            return Ok(vec![r.value; n]);
        }
        Ok(value::draw(&m, lo, hi, n, seed).to_vec())
    }
}

/// The median and the 16th and 84th percentiles of the finite values, each a weighted mean
/// of the order statistics near it rather than one of them: the weights are a Gaussian in
/// rank with the spread of the sample quantile itself, sqrt(p (1 − p) / (n + 1)) (a kernel
/// quantile estimator in the manner of Harrell & Davis 1982, common practice). A curve made
/// of single order statistics jumps from one draw's curve to another's at every time and
/// looks jagged; the weighted one is smooth, and as accurate.
fn percentiles(mut v: Vec<f64>) -> Option<(f64, f64, f64)> {
    v.retain(|x| x.is_finite());
    if v.is_empty() {
        return None;
    }
    v.sort_by(f64::total_cmp);
    let n = v.len() as f64;
    let q = |p: f64| {
        let spread = (p * (1.0 - p) / (n + 1.0)).sqrt();
        // Ranks beyond four spreads weigh less than 1e-3 of the centre: left out.
        let lo = (((p - 4.0 * spread) * n).floor().max(0.0)) as usize;
        let hi = ((((p + 4.0 * spread) * n).ceil()) as usize).min(v.len());
        let (mut sum, mut weights) = (0.0, 0.0);
        for (i, x) in v.iter().enumerate().take(hi).skip(lo) {
            let u = (i as f64 + 0.5) / n;
            let w = (-0.5 * ((u - p) / spread).powi(2)).exp();
            sum += w * x;
            weights += w;
        }
        if weights > 0.0 && sum.is_finite() {
            sum / weights
        } else {
            let i = ((n - 1.0) * p).round() as usize;
            v.get(i).copied().unwrap_or(f64::NAN)
        }
    };
    Some((q(0.5), q(0.158_655), q(0.841_345)))
}

/// The band over `x` of the values `per_point` gives from `draws` draws, and what it left
/// out (values that are not finite numbers, and draws the model had no value for).
fn band(
    x: Vec<f64>,
    draws: usize,
    per_point: impl Fn(f64) -> Vec<f64>,
) -> Result<(Band, Vec<String>), String> {
    let mut b = Band {
        x: Vec::with_capacity(x.len()),
        median: Vec::new(),
        low: Vec::new(),
        high: Vec::new(),
    };
    let (mut computed, mut no_value, mut not_finite, mut empty) = (0usize, 0, 0, 0);
    for xi in x {
        let values = per_point(xi);
        computed += draws;
        no_value += draws.saturating_sub(values.len());
        not_finite += values.iter().filter(|v| !v.is_finite()).count();
        match percentiles(values) {
            Some((m, lo, hi)) => {
                b.x.push(xi);
                b.median.push(m);
                b.low.push(lo);
                b.high.push(hi);
            }
            None => empty += 1,
        }
    }
    if b.x.is_empty() {
        return Err("the model has no finite value for these inputs".to_string());
    }
    let mut left_out = Vec::new();
    if not_finite > 0 {
        left_out.push(format!(
            "{not_finite} of {computed} model values (draws × times) are not finite numbers and are left out of the band"
        ));
    }
    if no_value > 0 {
        left_out.push(format!(
            "for {no_value} of {computed} draws × times the model has no value; they are left out of the band"
        ));
    }
    if empty > 0 {
        left_out.push(format!(
            "{empty} times with no finite model value are left out of the curve"
        ));
    }
    Ok((b, left_out))
}

const BAND_WORDS: &str = "band: 16th–84th percentiles of Monte Carlo draws of the inputs, drawn independently (correlations between them ignored); curve: their median";

/// The star's radial velocity (m/s) over one orbit, against time from mid-transit
/// (inferior conjunction) in days, from −P/2 to +P/2.
pub fn rv_curve(a: &Analysis, sys: usize, body: usize) -> Result<ModelCurve, String> {
    let mut inp = Inputs::new(a, sys, body)?;
    let n = DRAWS_RV;
    let mut k = inp.draws(Qty::RvAmplitude, n, 11)?;
    // An upper limit on K is no detection: the curve is the largest signal the limit
    // allows, K at the limit, not the median of draws spread below it.
    let limit = inp
        .result(Qty::RvAmplitude)
        .filter(|r| r.form == crate::model::Form::UpperLimit)
        .map(|r| r.value);
    if let Some(most) = limit {
        k = vec![most; n];
        // It is drawn at the limit, not sampled below it.
        inp.assumptions
            .retain(|a| !(a.contains("rv_amplitude <") && a.contains("sampled uniformly")));
        inp.assumptions.push(format!(
            "rv_amplitude < {} m/s is an upper limit, not a detection: the curve is the largest signal it allows (K at the limit); any smaller one fits as well",
            crate::format::number(most)
        ));
    }
    // The period only scales the time axis: its nominal value is used.
    let period = inp
        .draws(Qty::Period, 1, 12)
        .map(|_| inp.nominal(Qty::Period))?
        / DAY;
    let e = inp.draws(Qty::Eccentricity, n, 13)?;
    let w = inp.draws(Qty::ArgPeriastron, n, 14)?;
    let orbits: Vec<(Orbit, f64)> = (0..n)
        .filter_map(|i| {
            Some((
                Orbit {
                    period,
                    eccentricity: *e.get(i)?,
                    omega: *w.get(i)?,
                    t_conjunction: 0.0,
                },
                *k.get(i)?,
            ))
        })
        .collect();
    // 480 steps per orbit: a circular orbit's curve turns by 0.75 deg per step, so the
    // straight segments between samples are not seen at any size a slide shows.
    let xs: Vec<f64> = (0..=RV_STEPS)
        .map(|i| period * (f64::from(i) / f64::from(RV_STEPS) - 0.5))
        .collect();
    let (band, left_out) = band(xs, n, |t| {
        orbits
            .iter()
            .filter_map(|(o, k)| o.radial_velocity(t, *k))
            .collect()
    })?;
    let mut assumptions = inp.assumptions;
    assumptions.push(
        "Keplerian orbit, Kepler's equation solved for each time; systemic velocity 0".to_string(),
    );
    assumptions.push(BAND_WORDS.to_string());
    Ok(ModelCurve {
        label: inp.label,
        band,
        inputs: inp.shown,
        assumptions,
        left_out,
        upper_limit: limit.map(|k| format!("rv_amplitude < {} m/s", crate::format::number(k))),
    })
}

/// The star's relative flux around one transit against time from mid-transit in hours,
/// with quadratic limb darkening when given (none otherwise, as the engine assumes).
pub fn transit_curve(
    a: &Analysis,
    sys: usize,
    body: usize,
    limb: Option<LimbDarkening>,
) -> Result<(ModelCurve, LimbDarkening), String> {
    let ld = limb.unwrap_or(LimbDarkening::NONE);
    if !ld.is_physical() {
        return Err(format!(
            "limb darkening u1 = {}, u2 = {} is unphysical (it needs u1 >= 0, u1 + u2 <= 1, u1 + 2 u2 >= 0)",
            crate::format::sig(ld.u1, 6),
            crate::format::sig(ld.u2, 6)
        ));
    }
    let mut inp = Inputs::new(a, sys, body)?;
    let n = DRAWS_TRANSIT;
    // A radius ratio the engine read from the depth as k = sqrt(depth) (no limb darkening)
    // would make this limb-darkened curve deeper than the depth; it is solved again from the
    // depth with the law drawn here instead, so the dip is the depth.
    let from_depth = inp.result(Qty::RadiusRatio).is_some_and(|r| {
        matches!(
            r.rule,
            Some("depth-radius-ratio" | "depth-impact-radius-ratio")
        )
    });
    let k_or_depth = if from_depth {
        inp.draws(Qty::TransitDepth, n, 21)?
    } else {
        inp.draws(Qty::RadiusRatio, n, 21)?
    };
    let ars = inp.draws(Qty::ScaledAxis, n, 22)?;
    let b = inp.draws(Qty::Impact, n, 23)?;
    // A planet whose impact parameter puts it clear of the star's disc does not transit: a
    // flat line titled "Transit of ..." would say it does.
    let (b0, k0) = (inp.nominal(Qty::Impact), inp.nominal(Qty::RadiusRatio));
    if b0 >= 1.0 + k0 {
        return Err(format!(
            "{} does not transit: its impact parameter ({}) is at least 1 + Rp/R* ({}), so the planet passes clear of the star's disc",
            inp.label,
            crate::format::sig(b0, 3),
            crate::format::sig(1.0 + k0, 3)
        ));
    }
    let k: Vec<f64> = if from_depth {
        // Without limb darkening the inverse is k = sqrt(depth), as the engine reads it:
        // nothing more to say.
        if ld != LimbDarkening::NONE {
            inp.assumptions.push(format!(
            "radius ratio solved from the transit depth at mid-transit (separation b) with this limb darkening, by inverting the model numerically; sqrt(depth) = {} assumes none",
            crate::format::sig(inp.nominal(Qty::RadiusRatio), 4)
        ));
        }
        k_or_depth
            .iter()
            .zip(&b)
            .map(|(d, b)| lightcurve::radius_ratio_for_depth(*d, *b, ld).unwrap_or(f64::NAN))
            .collect()
    } else {
        k_or_depth
    };
    let e = inp.draws(Qty::Eccentricity, n, 24)?;
    let w = inp.draws(Qty::ArgPeriastron, n, 25)?;
    let period = inp
        .draws(Qty::Period, 1, 26)
        .map(|_| inp.nominal(Qty::Period))?
        / DAY;
    struct Draw {
        orbit: Orbit,
        k: f64,
        ars: f64,
        inc: f64,
    }
    let draws: Vec<Draw> = (0..n)
        .filter_map(|i| {
            let (e, w, ars, b) = (*e.get(i)?, *w.get(i)?, *ars.get(i)?, *b.get(i)?);
            let k = k.get(i).copied().filter(|k| k.is_finite())?;
            // Winn 2010 eq. 7.
            let cos_i = b * (1.0 + e * w.sin()) / (ars * (1.0 - e * e));
            (cos_i.abs() <= 1.0).then(|| Draw {
                orbit: Orbit {
                    period,
                    eccentricity: e,
                    omega: w,
                    t_conjunction: 0.0,
                },
                k,
                ars,
                inc: cos_i.acos(),
            })
        })
        .collect();
    // Window: 0.75 total durations either side, from the reported duration if any.
    let half = inp
        .result(Qty::TransitDuration)
        .map(|d| 0.75 * d.value / DAY)
        .filter(|h| h.is_finite() && *h > 0.0)
        .unwrap_or(0.05 * period);
    let xs: Vec<f64> = (0..=TRANSIT_STEPS)
        .map(|i| half * (2.0 * f64::from(i) / f64::from(TRANSIT_STEPS) - 1.0))
        .collect();
    let (band, left_out) = band(xs, draws.len(), |t| {
        draws
            .iter()
            .filter_map(|d| {
                let (z, front) = d.orbit.sky_separation(t, d.ars, d.inc)?;
                Some(if front {
                    lightcurve::relative_flux(d.k, z, ld)
                } else {
                    1.0
                })
            })
            .collect()
    })?;
    let band = Band {
        x: band.x.iter().map(|x| x * 24.0).collect(),
        ..band
    };
    let mut assumptions = inp.assumptions;
    assumptions.push(match limb {
        Some(l) => format!(
            "quadratic limb darkening u1 = {}, u2 = {} (given)",
            l.u1, l.u2
        ),
        None => LimbDarkening::NONE_BASIS.to_string(),
    });
    assumptions.push(
        "dark planet; no ellipsoidal, reflected or thermal light; no exposure-time smearing"
            .to_string(),
    );
    assumptions.push(BAND_WORDS.to_string());
    Ok((
        ModelCurve {
            label: inp.label,
            band,
            inputs: inp.shown,
            assumptions,
            left_out,
            upper_limit: None,
        },
        ld,
    ))
}

#[cfg(test)]
mod tests;
