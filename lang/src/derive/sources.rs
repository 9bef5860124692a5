//! Several published values of one quantity: which one feeds the derivations, and how.
//!
//! A body may declare a quantity more than once when each declaration cites its own
//! source (lowering refuses a repeat without distinguishing citations as `duplicate`).
//! Every declaration stays in the model and in the output; one value is used:
//!
//! - the declaration marked `preferred`, when there is one;
//! - else the project file's `[sources] choice`: `most-precise` (the default: the smallest
//!   standard uncertainty), `last` (the last measurement listed) or `weighted-mean`
//!   (the inverse-variance weighted mean of the measurements, its uncertainty scaled up by
//!   the Birge ratio sqrt(chi2 / (n - 1)) when that ratio exceeds 1: Birge 1932, Phys. Rev.
//!   40, 207; the scale-factor procedure of the Particle Data Group's reviews, "Introduction:
//!   averaging" section, here applied to all the measurements).
//!
//! An asymmetric uncertainty counts as its mean side, (below + above) / 2, for ranking and
//! weights. A limit is never averaged nor chosen while a measurement exists; it only takes
//! part in the disagreement check (`sources-disagree`). When only limits exist, the most
//! constraining is used (the smallest upper limit, else the largest lower limit). A value
//! without uncertainty, or marked `assumed`, is neither ranked nor weighted: it is used only
//! when no source has a stated uncertainty and is not assumed (see [`choose`]).

use crate::model::{Form, Measurement, System};
use crate::source::{LineIndex, Region};

/// The project file's policy for a quantity with several sources and none marked.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum SourceChoice {
    MostPrecise,
    Last,
    WeightedMean,
}

impl SourceChoice {
    pub fn parse(name: &str) -> Option<SourceChoice> {
        Some(match name {
            "most-precise" => SourceChoice::MostPrecise,
            "last" => SourceChoice::Last,
            "weighted-mean" => SourceChoice::WeightedMean,
            _ => return None,
        })
    }
}

/// How the value used was reached (the JSON field `choice`).
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Choice {
    Marked,
    MostPrecise,
    Last,
    WeightedMean,
}

impl Choice {
    pub fn as_str(self) -> &'static str {
        match self {
            Choice::Marked => "marked",
            Choice::MostPrecise => "most-precise",
            Choice::Last => "last",
            Choice::WeightedMean => "weighted-mean",
        }
    }
}

/// The value used for a quantity with several sources.
#[derive(Debug, Clone, PartialEq)]
pub struct Chosen {
    pub measurement: Measurement,
    /// The source used (index in file order); `None` for a weighted mean.
    pub index: Option<usize>,
    pub choice: Choice,
    /// For a weighted mean: what was combined and how.
    pub mean: Option<WeightedMean>,
    /// Why the source used could not be ranked by precision, when it could not (in the words
    /// of the choice's sentence).
    pub unranked: Option<&'static str>,
    /// Why the weighted mean the project file asks for was not taken, when it was not
    /// (transit epochs of different transits or time scales: see [`epochs_not_averaged`]).
    pub not_averaged: Option<&'static str>,
}

/// An inverse-variance weighted mean and its Birge ratio.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct WeightedMean {
    pub mean: f64,
    /// 1 / sqrt(sum of weights), before any scaling.
    pub sigma: f64,
    pub chi2: f64,
    /// sqrt(chi2 / (n - 1)).
    pub birge: f64,
    /// The uncertainty reported: `sigma`, times `birge` when `birge` exceeds 1.
    pub scaled_sigma: f64,
    pub n: usize,
}

/// How many earlier sources of one quantity each source is compared with for
/// `sources-disagree` (the value used first): a bound that keeps a quantity with thousands
/// of sources linear in their number.
pub const COMPARED_SOURCES: usize = 256;

/// Whether a source takes part in a weighted mean (and is ranked by precision): a
/// measurement, not a limit, with an uncertainty, not marked `assumed`.
pub fn ranked(m: &Measurement, assumed: bool) -> bool {
    !m.form.is_limit() && !assumed && standard(m) > 0.0
}

/// The standard uncertainty of a measurement: the mean of its two sides.
pub fn standard(m: &Measurement) -> f64 {
    (m.below + m.above) / 2.0
}

/// The weighted mean of `(value, standard uncertainty)` pairs, each uncertainty positive;
/// `None` for fewer than two.
pub fn weighted_mean(points: &[(f64, f64)]) -> Option<WeightedMean> {
    if points.len() < 2 || points.iter().any(|(_, s)| s.is_nan() || *s <= 0.0) {
        return None;
    }
    let weights: Vec<f64> = points.iter().map(|(_, s)| 1.0 / (s * s)).collect();
    let total: f64 = weights.iter().sum();
    let mean = points
        .iter()
        .zip(&weights)
        .map(|((x, _), w)| w * x)
        .sum::<f64>()
        / total;
    let chi2: f64 = points
        .iter()
        .zip(&weights)
        .map(|((x, _), w)| w * (x - mean).powi(2))
        .sum();
    let n = points.len();
    let sigma = 1.0 / total.sqrt();
    let birge = (chi2 / (n as f64 - 1.0)).sqrt();
    let scaled_sigma = if birge > 1.0 { sigma * birge } else { sigma };
    Some(WeightedMean {
        mean,
        sigma,
        chi2,
        birge,
        scaled_sigma,
        n,
    })
}

/// The value used among `sources` (file order), with `assumed[i]` whether source `i` is
/// marked `assumed`, and `marked` the one marked `preferred`.
///
/// Only a measurement with a stated uncertainty that is not an assumption is ranked or
/// averaged: a value without uncertainty has no known precision (it is not infinitely
/// precise), and an assumption is not a measurement. Such values are used only when no
/// source is ranked. All sources of one quantity share its unit, so the most precise is the
/// one with the smallest standard uncertainty (relative uncertainty would favour the larger
/// value, and means nothing for a quantity whose zero is arbitrary: an angle, a metallicity,
/// an epoch).
pub fn choose(
    sources: &[Measurement],
    assumed: &[bool],
    marked: Option<usize>,
    policy: SourceChoice,
) -> Option<Chosen> {
    let pick = |i: usize, choice: Choice| {
        sources.get(i).map(|m| Chosen {
            measurement: *m,
            index: Some(i),
            choice,
            mean: None,
            unranked: None,
            not_averaged: None,
        })
    };
    if let Some(i) = marked {
        return pick(i, Choice::Marked);
    }
    let measured: Vec<usize> = (0..sources.len())
        .filter(|&i| sources.get(i).is_some_and(|m| !m.form.is_limit()))
        .collect();
    // The measurements that can be ranked (not assumed, with an uncertainty), else those
    // not assumed (none with an uncertainty), else assumed ones with an uncertainty, else any.
    let is_assumed = |i: usize| assumed.get(i).copied().unwrap_or(false);
    let has_spread = |i: usize| sources.get(i).is_some_and(|m| standard(m) > 0.0);
    let where_ = |keep: &dyn Fn(usize) -> bool| -> Vec<usize> {
        measured.iter().copied().filter(|&i| keep(i)).collect()
    };
    // The measurements ranked and averaged (see [`ranked`]).
    let ranked = where_(&|i| sources.get(i).is_some_and(|m| ranked(m, is_assumed(i))));
    let tiers: [(Vec<usize>, Option<&'static str>); 4] = [
        (ranked.clone(), None),
        (
            where_(&|i| !is_assumed(i)),
            Some("the first measurement listed that is not assumed, as none states an uncertainty"),
        ),
        (where_(&has_spread), None),
        (
            measured.clone(),
            Some("the first listed, as every source is assumed and none states an uncertainty"),
        ),
    ];
    let (candidates, unranked) = tiers
        .into_iter()
        .find(|c| !c.0.is_empty())
        .unwrap_or_default();
    let most_precise = || {
        candidates
            .iter()
            .copied()
            .min_by(|&a, &b| {
                let s = |i: usize| sources.get(i).map_or(f64::INFINITY, standard);
                s(a).total_cmp(&s(b))
            })
            .and_then(|i| pick(i, Choice::MostPrecise))
            .map(|c| Chosen { unranked, ..c })
    };
    if measured.is_empty() {
        return most_constraining(sources).and_then(|i| pick(i, Choice::MostPrecise));
    }
    match policy {
        SourceChoice::MostPrecise => most_precise(),
        SourceChoice::Last => candidates.last().and_then(|&i| pick(i, Choice::Last)),
        SourceChoice::WeightedMean => {
            let points: Vec<(f64, f64)> = ranked
                .iter()
                .filter_map(|&i| sources.get(i))
                .map(|m| (m.value, standard(m)))
                .collect();
            match weighted_mean(&points) {
                Some(w) => Some(Chosen {
                    measurement: Measurement {
                        value: w.mean,
                        below: w.scaled_sigma,
                        above: w.scaled_sigma,
                        form: Form::Symmetric,
                    },
                    index: None,
                    choice: Choice::WeightedMean,
                    mean: Some(w),
                    unranked: None,
                    not_averaged: None,
                }),
                None => most_precise(),
            }
        }
    }
}

/// Why transit epochs may not be averaged as numbers, if they may not: a weighted mean of
/// the dates of different transits is a date between them, as likely as not half an orbit
/// from any transit, and dates in different time scales differ by the scales' offset (69 s
/// between UTC and TDB in 2017, up to 8.3 min more for a barycentric correction), which
/// averaging would hide. `scales` are the units as written, `period` the period in use (SI
/// seconds, the same as the epochs). Averaging several transits properly is a fit of the
/// linear ephemeris (common practice), which this choice does not do.
pub fn epochs_not_averaged(
    epochs: &[Measurement],
    scales: &[Option<&str>],
    period: Option<f64>,
) -> Option<&'static str> {
    // Compared as the time systems they name: `BJD` is read as `BJD_TDB`.
    let system = |u: &Option<&str>| u.and_then(crate::time::system_of_unit).map(|(s, _)| s);
    let first = scales.first().map(system);
    if scales.iter().any(|u| Some(system(u)) != first) {
        return Some(
            "transit epochs in different time systems (scale or reference point) are not averaged",
        );
    }
    let measured: Vec<f64> = epochs
        .iter()
        .filter(|m| !m.form.is_limit())
        .map(|m| m.value)
        .collect();
    let (lo, hi) = measured
        .iter()
        .fold((f64::INFINITY, f64::NEG_INFINITY), |(lo, hi), &v| {
            (lo.min(v), hi.max(v))
        });
    if measured.len() < 2 {
        return None;
    }
    match period.filter(|p| *p > 0.0 && p.is_finite()) {
        // Timings of one transit differ by minutes; a quarter of the period apart is
        // another event (a secondary eclipse sits half a period away).
        Some(p) if hi - lo < p / 4.0 => None,
        Some(_) => Some("transit epochs of different transits are not averaged (that needs a fit of the linear ephemeris)"),
        None => Some("transit epochs are not averaged without a declared period to tell whether they time the same transit"),
    }
}

/// The most constraining limit: the smallest upper limit, else the largest lower limit.
fn most_constraining(sources: &[Measurement]) -> Option<usize> {
    let of = |form: Form, better: fn(f64, f64) -> bool| {
        let mut best: Option<(usize, f64)> = None;
        for (i, m) in sources.iter().enumerate().filter(|(_, m)| m.form == form) {
            if best.is_none_or(|(_, v)| better(m.value, v)) {
                best = Some((i, m.value));
            }
        }
        best.map(|(i, _)| i)
    };
    of(Form::UpperLimit, |a, b| a < b).or_else(|| of(Form::LowerLimit, |a, b| a > b))
}

/// The 1-based line in the file of a declaration, which the sentence of the choice names.
/// Holds a line index only for texts that declare some quantity more than once.
#[derive(Debug, Default)]
pub struct Lines {
    index: Option<LineIndex>,
    /// The byte offset and 0-based line in the file where the indexed text starts.
    start: usize,
    first_line: usize,
}

impl Lines {
    /// The lines of `region` of `src` (the whole file, or the part of it read), indexed
    /// only if one of `systems` has a quantity declared more than once.
    pub fn new(src: &str, region: &Region, systems: &[System]) -> Lines {
        let several = systems
            .iter()
            .any(|s| s.bodies.iter().any(|b| !b.further.is_empty()));
        Lines {
            index: several.then(|| LineIndex::new(src.get(region.start..region.end).unwrap_or(""))),
            start: region.start,
            first_line: region.first_line,
        }
    }

    /// The 1-based line of `offset`; `None` when not indexed.
    pub fn line(&self, offset: u32) -> Option<usize> {
        let index = self.index.as_ref()?;
        Some(self.first_line + index.line_at((offset as usize).saturating_sub(self.start)) + 1)
    }
}

/// The sentence every output shows with the value used, for `name` (`b.period`) with
/// `cites[i]` the citations of source `i` (file order) and `lines[i]` its line.
pub fn words(
    name: &str,
    cites: &[Vec<String>],
    lines: &[Option<usize>],
    chosen: &Chosen,
    measurements: &[Measurement],
) -> String {
    let n = cites.len();
    let source = |i: usize| {
        let c = crate::text::citation_mark(cites.get(i).into_iter().flatten().map(String::as_str));
        match lines.get(i).copied().flatten() {
            Some(line) => format!("{c}, source {} of {n}, line {line}", i + 1),
            None => format!("{c}, source {} of {n}", i + 1),
        }
    };
    let how = match (chosen.choice, chosen.index, chosen.mean) {
        (_, None, Some(w)) => {
            let scale = if w.birge > 1.0 {
                format!(
                    "its uncertainty scaled up by the Birge ratio {:.3} (chi2 = {:.3} for {} degrees of freedom)",
                    w.birge,
                    w.chi2,
                    w.n - 1
                )
            } else {
                format!(
                    "Birge ratio {:.3}, not above 1, so its uncertainty is not scaled",
                    w.birge
                )
            };
            format!(
                "used: the inverse-variance weighted mean of {} measurements (asymmetric uncertainties weighted by their mean side; limits, values without an uncertainty and assumed values are not averaged), {scale}",
                w.n
            )
        }
        (Choice::Marked, Some(i), _) => format!("chosen: the one marked preferred ({})", source(i)),
        (Choice::Last, Some(i), _) if i + 1 < measurements.len() => format!(
            "chosen: the last measurement listed that states an uncertainty and is not assumed ({}); a later source is a limit, states no uncertainty or is assumed",
            source(i)
        ),
        (Choice::Last, Some(i), _) => {
            format!("chosen: the last measurement listed ({})", source(i))
        }
        (_, Some(i), _) if chosen.measurement.form.is_limit() => {
            let (which, other, side) = if chosen.measurement.form == Form::UpperLimit {
                ("the smallest upper limit", Form::LowerLimit, "lower")
            } else {
                ("the largest lower limit", Form::UpperLimit, "upper")
            };
            let unused = if measurements.iter().any(|m| m.form == other) {
                format!(
                    "; the {side} limit declared too bounds the other side and is not used (derivations take one limit, not the range between two)"
                )
            } else {
                String::new()
            };
            format!("chosen: {which}, the most constraining ({}){unused}", source(i))
        }
        (_, Some(i), _) if chosen.unranked.is_some() => format!(
            "chosen: {} ({})",
            chosen.unranked.unwrap_or_default(),
            source(i)
        ),
        (_, Some(i), _) if chosen.not_averaged.is_some() => format!(
            "{}; chosen: the most precise, by standard uncertainty ({})",
            chosen.not_averaged.unwrap_or_default(),
            source(i)
        ),
        (_, Some(i), _) => format!(
            "chosen: the most precise, by standard uncertainty ({})",
            source(i)
        ),
        (_, None, None) => "chosen: none".to_string(),
    };
    format!("{name}: {n} sources; {how}")
}

/// How two measurements `z` combined standard deviations apart ([`separation`]) differ, in
/// words that follow "a and b": `differ by 4.2 combined standard deviations`.
pub fn apart_words(z: f64, a: &Measurement, b: &Measurement) -> String {
    if z.is_finite() && (a.form.is_limit() || b.form.is_limit()) {
        format!("disagree: the measurement lies {z:.1} standard deviations past the limit")
    } else if z.is_finite() {
        format!("differ by {z:.1} combined standard deviations")
    } else if a.form.is_limit() && b.form.is_limit() {
        "exclude each other".to_string()
    } else {
        "differ, and neither gives an uncertainty".to_string()
    }
}

/// How far apart two declarations of one quantity are, in combined standard deviations:
/// two measurements by the sides that face each other, added in quadrature; a measurement
/// and a limit by how far the measurement lies on the wrong side of the limit, in its own
/// uncertainty on that side; two limits that exclude each other are infinitely apart.
/// `None` when the pair cannot disagree (a measurement within a limit, compatible limits).
pub fn separation(a: &Measurement, b: &Measurement) -> Option<f64> {
    let apart = |gap: f64, sigma: f64| {
        if gap <= 0.0 {
            None
        } else if sigma > 0.0 {
            Some(gap / sigma)
        } else {
            Some(f64::INFINITY)
        }
    };
    match (a.form, b.form) {
        (Form::UpperLimit, Form::LowerLimit) => apart(b.value - a.value, 0.0),
        (Form::LowerLimit, Form::UpperLimit) => apart(a.value - b.value, 0.0),
        (x, y) if x.is_limit() && y.is_limit() => None,
        (Form::UpperLimit, _) => apart(b.value - a.value, b.below),
        (Form::LowerLimit, _) => apart(a.value - b.value, b.above),
        (_, Form::UpperLimit | Form::LowerLimit) => separation(b, a),
        _ => {
            let (lo, hi) = if a.value <= b.value { (a, b) } else { (b, a) };
            let sigma = (lo.above.powi(2) + hi.below.powi(2)).sqrt();
            let gap = hi.value - lo.value;
            if gap == 0.0 {
                return None;
            }
            apart(gap, sigma)
        }
    }
}

/// Two transit epochs compare as the same ephemeris: `later` carried by the whole number of
/// orbits `n` (of `period`, its standard uncertainty adding `|n|` times in quadrature) that
/// brings it nearest to `earlier`. Two papers usually publish different transits; only
/// their distance from a whole number of periods can disagree. `n` is 0 without a period.
pub fn epoch_aligned(
    earlier: &Measurement,
    later: &Measurement,
    period: Option<&Measurement>,
) -> (Measurement, i64) {
    let Some(p) = period.filter(|p| p.value > 0.0 && p.value.is_finite() && !p.form.is_limit())
    else {
        return (*later, 0);
    };
    let orbits = ((earlier.value - later.value) / p.value).round();
    if orbits == 0.0 || !orbits.is_finite() || orbits.abs() > 1e9 {
        return (*later, 0);
    }
    let spread = orbits.abs() * standard(p);
    let widen = |s: f64| (s * s + spread * spread).sqrt();
    let moved = Measurement {
        value: later.value + orbits * p.value,
        below: widen(later.below),
        above: widen(later.above),
        form: if later.form.is_limit() {
            later.form
        } else {
            Form::Asymmetric
        },
    };
    (moved, orbits as i64)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn m(value: f64, s: f64) -> Measurement {
        Measurement {
            value,
            below: s,
            above: s,
            form: Form::Symmetric,
        }
    }

    /// The worked example of `tests/reference/make_sources_reference.py`, whose expected
    /// numbers numpy computed (recorded in `tests/reference/sources.json`).
    #[test]
    fn weighted_mean_and_birge_ratio_match_the_reference_script() {
        let text = include_str!("../../../tests/reference/sources.json");
        let r: serde_json::Value = serde_json::from_str(text).unwrap();
        for case in r["cases"].as_array().unwrap() {
            let points: Vec<(f64, f64)> = case["points"]
                .as_array()
                .unwrap()
                .iter()
                .map(|p| (p[0].as_f64().unwrap(), p[1].as_f64().unwrap()))
                .collect();
            let w = weighted_mean(&points).unwrap();
            let close = |a: f64, b: f64| (a - b).abs() <= 1e-9 * b.abs().max(1e-300);
            let name = case["name"].as_str().unwrap();
            assert!(
                close(w.mean, case["mean"].as_f64().unwrap()),
                "{name}: {w:?}"
            );
            assert!(
                close(w.sigma, case["sigma"].as_f64().unwrap()),
                "{name}: {w:?}"
            );
            assert!(
                close(w.chi2, case["chi2"].as_f64().unwrap()),
                "{name}: {w:?}"
            );
            assert!(
                close(w.birge, case["birge"].as_f64().unwrap()),
                "{name}: {w:?}"
            );
            assert!(
                close(w.scaled_sigma, case["scaled_sigma"].as_f64().unwrap()),
                "{name}: {w:?}"
            );
        }
    }

    #[test]
    fn each_policy_picks_its_source() {
        let s = [m(10.0, 0.001), m(10.0021, 0.0002), m(10.003, 0.01)];
        let c = |p| choose(&s, &[], None, p).unwrap();
        assert_eq!(c(SourceChoice::MostPrecise).index, Some(1));
        assert_eq!(c(SourceChoice::Last).index, Some(2));
        assert_eq!(c(SourceChoice::WeightedMean).index, None);
        let marked = choose(&s, &[], Some(0), SourceChoice::Last).unwrap();
        assert_eq!((marked.index, marked.choice), (Some(0), Choice::Marked));
    }

    #[test]
    fn limits_are_not_averaged_and_the_most_constraining_is_used_alone() {
        let upper = |v: f64| Measurement {
            value: v,
            below: 0.0,
            above: 0.0,
            form: Form::UpperLimit,
        };
        let s = [upper(0.3), m(0.1, 0.02), upper(0.2)];
        let w = choose(&s, &[], None, SourceChoice::WeightedMean).unwrap();
        // One measurement: nothing to average, it is used as it is.
        assert_eq!(w.index, Some(1));
        let only = [upper(0.3), upper(0.2)];
        let l = choose(&only, &[], None, SourceChoice::Last).unwrap();
        assert_eq!(l.index, Some(1));
        assert!(words("b.eccentricity", &[vec![], vec![]], &[], &l, &only)
            .contains("most constraining"));
        // An upper and a lower limit: the one used is named for what it is, and the other
        // is said to go unused.
        let lower = Measurement {
            form: Form::LowerLimit,
            ..upper(5.0)
        };
        let both = [lower, upper(30.0)];
        let c = choose(&both, &[], None, SourceChoice::MostPrecise).unwrap();
        let w = words("b.rv_amplitude", &[vec![], vec![]], &[], &c, &both);
        assert!(w.contains("chosen: the smallest upper limit"), "{w}");
        assert!(
            w.contains("the lower limit declared too bounds the other side and is not used"),
            "{w}"
        );
        let w = words("b.eccentricity", &[vec![], vec![]], &[], &l, &only);
        assert!(!w.contains("declared too"), "{w}");
    }

    #[test]
    fn the_last_measurement_is_named_as_the_last_that_states_an_uncertainty() {
        let m = |v: f64, s: f64| Measurement {
            value: v,
            below: s,
            above: s,
            form: Form::Symmetric,
        };
        let s = [m(5.0, 0.001), m(5.01, 0.01), m(5.0, 0.0)];
        let c = choose(&s, &[], None, SourceChoice::Last).unwrap();
        assert_eq!(c.index, Some(1));
        let w = words("b.period", &[vec![], vec![], vec![]], &[], &c, &s);
        assert!(
            w.contains("the last measurement listed that states an uncertainty"),
            "{w}"
        );
        let c = choose(&s[..2], &[], None, SourceChoice::Last).unwrap();
        let w = words("b.period", &[vec![], vec![]], &[], &c, &s[..2]);
        assert!(w.contains("chosen: the last measurement listed ("), "{w}");
    }

    #[test]
    fn separation_counts_the_facing_sides_and_limits() {
        // 10.000 ± 0.001 against 10.0021 ± 0.0002: 0.0021 / sqrt(0.001^2 + 0.0002^2) = 2.06.
        let z = separation(&m(10.0, 0.001), &m(10.0021, 0.0002)).unwrap();
        assert!((z - 0.0021 / (0.001f64.powi(2) + 0.0002f64.powi(2)).sqrt()).abs() < 1e-9);
        let upper = Measurement {
            value: 0.1,
            below: 0.0,
            above: 0.0,
            form: Form::UpperLimit,
        };
        assert_eq!(separation(&upper, &m(0.05, 0.01)), None);
        let z = separation(&m(0.2, 0.02), &upper).unwrap();
        assert!((z - 5.0).abs() < 1e-9, "{z}");
        let lower = Measurement {
            form: Form::LowerLimit,
            value: 0.3,
            ..upper
        };
        assert_eq!(separation(&upper, &lower), Some(f64::INFINITY));
    }

    #[test]
    fn asymmetric_uncertainties_weigh_by_their_mean_side() {
        let a = Measurement {
            value: 1.0,
            below: 0.1,
            above: 0.3,
            form: Form::Asymmetric,
        };
        let c = choose(&[a, m(2.0, 0.2)], &[], None, SourceChoice::WeightedMean).unwrap();
        // Equal standard uncertainties (0.2): the plain mean.
        assert!((c.measurement.value - 1.5).abs() < 1e-12, "{c:?}");
    }

    #[test]
    fn the_sentence_names_the_line_of_the_source_used() {
        let s = [m(10.0, 0.001), m(10.0021, 0.0002)];
        let c = choose(&s, &[], None, SourceChoice::MostPrecise).unwrap();
        let cites = [vec!["disc".to_string()], vec!["followup".to_string()]];
        assert_eq!(
            words("b.period", &cites, &[Some(6), Some(14)], &c, &[]),
            "b.period: 2 sources; chosen: the most precise, by standard uncertainty ([followup], source 2 of 2, line 14)"
        );
        assert!(words("b.period", &cites, &[], &c, &[]).ends_with("source 2 of 2)"));
    }

    #[test]
    fn the_most_precise_is_the_smallest_uncertainty_not_the_smallest_fraction() {
        // A metallicity near zero: 0.01 ± 0.02 dex is four times as precise as
        // -0.30 ± 0.10 dex, though its relative uncertainty is larger.
        let s = [m(0.01, 0.02), m(-0.30, 0.10)];
        assert_eq!(
            choose(&s, &[], None, SourceChoice::MostPrecise)
                .unwrap()
                .index,
            Some(0)
        );
        // Equal uncertainties: the first listed, not the larger value (a period alias at
        // twice the period has half the relative uncertainty).
        let s = [m(7.3, 0.01), m(14.6, 0.01)];
        assert_eq!(
            choose(&s, &[], None, SourceChoice::MostPrecise)
                .unwrap()
                .index,
            Some(0)
        );
    }

    #[test]
    fn values_without_uncertainty_and_assumptions_are_not_ranked_or_averaged() {
        let exact = Measurement {
            value: 0.99,
            below: 0.0,
            above: 0.0,
            form: Form::Exact,
        };
        let s = [m(0.92, 0.01), m(0.91, 0.01), exact];
        let c = choose(&s, &[], None, SourceChoice::MostPrecise).unwrap();
        assert_eq!(c.index, Some(0));
        let w = choose(&s, &[], None, SourceChoice::WeightedMean).unwrap();
        // The mean of the two measurements only (equal weights).
        assert!((w.measurement.value - 0.915).abs() < 1e-12, "{w:?}");
        assert_eq!(w.mean.unwrap().n, 2);
        // With the last policy, the last measurement with an uncertainty.
        assert_eq!(
            choose(&s, &[], None, SourceChoice::Last).unwrap().index,
            Some(1)
        );
        // An assumed value, even with an uncertainty, gives way to a measurement.
        let s = [m(0.3, 0.001), m(0.1, 0.01)];
        let c = choose(&s, &[true, false], None, SourceChoice::MostPrecise).unwrap();
        assert_eq!(c.index, Some(1));
        // Only values without uncertainty: the first listed, and the sentence says why.
        let s = [
            exact,
            Measurement {
                value: 1.0,
                ..exact
            },
        ];
        let c = choose(&s, &[], None, SourceChoice::MostPrecise).unwrap();
        assert_eq!(c.index, Some(0));
        assert!(words("s.radius", &[vec![], vec![]], &[], &c, &[]).contains(
            "the first measurement listed that is not assumed, as none states an uncertainty"
        ));
        // An assumption with an uncertainty and one without: the one with it, as the most
        // precise; a measurement without one beats an assumption with one, and says why.
        let s = [
            m(0.3, 0.1),
            Measurement {
                value: 0.32,
                ..exact
            },
        ];
        let c = choose(&s, &[true, true], None, SourceChoice::MostPrecise).unwrap();
        assert_eq!((c.index, c.unranked), (Some(0), None));
        let s = [
            m(5.0, 0.01),
            Measurement {
                value: 5.1,
                ..exact
            },
        ];
        let c = choose(&s, &[true, false], None, SourceChoice::MostPrecise).unwrap();
        assert_eq!(c.index, Some(1));
        assert!(words("b.period", &[vec![], vec![]], &[], &c, &[]).contains("not assumed"));
        // Only assumptions without uncertainty: the first, said so.
        let s = [
            exact,
            Measurement {
                value: 1.0,
                ..exact
            },
        ];
        let c = choose(&s, &[true, true], None, SourceChoice::MostPrecise).unwrap();
        assert_eq!(c.index, Some(0));
        assert!(
            words("s.radius", &[vec![], vec![]], &[], &c, &[]).contains("every source is assumed")
        );
    }

    #[test]
    fn epochs_whole_orbits_apart_are_the_same_ephemeris() {
        let p = m(7.3, 0.0001);
        // Two transits 10 orbits apart, each to 0.0002 d: no disagreement once carried.
        let (moved, n) = epoch_aligned(&m(2461000.1, 0.0002), &m(2461073.1, 0.0002), Some(&p));
        assert_eq!(n, -10);
        assert!((moved.value - 2461000.1).abs() < 1e-6, "{moved:?}");
        // sqrt(0.0002^2 + (10 x 0.0001)^2) = 0.00101980
        assert!((moved.below - 0.001_019_80).abs() < 1e-8, "{moved:?}");
        assert_eq!(separation(&m(2461000.1, 0.0002), &moved), None);
        // Half an orbit off stays half an orbit off; without a period nothing is carried.
        let (half, n) = epoch_aligned(&m(2461000.1, 0.0002), &m(2461003.75, 0.0002), Some(&p));
        assert_eq!(n, 0);
        assert_eq!(half.value, 2461003.75);
        assert_eq!(epoch_aligned(&m(1.0, 0.1), &m(30.0, 0.1), None).1, 0);
    }
}
