//! Transit ephemerides: the mid-transit times that follow from a transit epoch and a
//! period, with their timing uncertainty.
//!
//! The n-th transit after the epoch T0 falls at `T_n = T0 + n P`, propagated in TDB (a
//! uniform scale; UTC is not, because of its leap seconds). Its standard uncertainty is
//! `sigma_n^2 = sigma_T0^2 + n^2 sigma_P^2`, which takes T0 and P as uncorrelated (linear
//! propagation, common practice). Each time is given back in the time system the epoch
//! was declared in and in UTC; see [`crate::time`] for what those conversions assume.
//!
//! First and fourth contact are mid-transit ∓ T14/2, with T14 the planet's
//! `transit_duration` (declared or derived). Their uncertainty is
//! `sqrt(sigma_n^2 + (sigma_T14 / 2)^2)`, the mid-time and the duration taken as
//! uncorrelated. From an observing site ([`Visibility`]), the star's altitude and airmass and
//! the Sun's altitude at those moments come from [`crate::sky`].

use crate::ast::BodyKind;
use crate::constants::DAY;
use crate::quantities::Qty;
use crate::time::{self, Place, Scale, TimeError, TimeSystem};
use crate::Analysis;

/// What a planet's ephemeris rests on.
#[derive(Debug, Clone, PartialEq)]
pub struct Ephemeris {
    /// The epoch in TDB, as a Julian date (clock at the declared place).
    pub t0_tdb: f64,
    /// The time system the epoch was declared in.
    pub system: TimeSystem,
    /// The epoch as declared (Julian date in `system`).
    pub t0_declared: f64,
    pub sigma_t0_days: f64,
    pub period_days: f64,
    pub sigma_period_days: f64,
    /// The total transit duration T14 and its standard uncertainty, days, where known.
    pub duration_days: Option<(f64, f64)>,
    /// Everything taken for granted, in words.
    pub assumptions: Vec<String>,
}

/// One predicted mid-transit.
#[derive(Debug, Clone, PartialEq)]
pub struct Transit {
    /// Number of periods after the epoch.
    pub n: i64,
    /// Julian date in the epoch's time system.
    pub jd: f64,
    /// Julian date in UTC (clock where the epoch's clock is).
    pub jd_utc: f64,
    /// ISO 8601 UTC timestamp, to the second.
    pub utc: String,
    /// Standard uncertainty, days.
    pub sigma_days: f64,
    /// First and fourth contact, where the duration is known.
    pub contacts: Option<Contacts>,
}

/// First (ingress) and fourth (egress) contact of one transit.
#[derive(Debug, Clone, PartialEq)]
pub struct Contacts {
    /// Julian dates in the epoch's time system.
    pub ingress_jd: f64,
    pub egress_jd: f64,
    /// Julian dates in UTC.
    pub ingress_jd_utc: f64,
    pub egress_jd_utc: f64,
    /// ISO 8601 UTC timestamps, to the second.
    pub ingress_utc: String,
    pub egress_utc: String,
    /// Standard uncertainty of either contact, days: sqrt(sigma_mid^2 + (sigma_T14/2)^2).
    pub sigma_days: f64,
}

/// A star's ICRS place, radians.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SkyPosition {
    pub ra: f64,
    pub dec: f64,
}

/// The sky at one moment of a transit, seen from a site.
#[derive(Debug, Clone, PartialEq)]
pub struct Moment {
    /// `ingress`, `mid` or `egress`.
    pub label: &'static str,
    pub star_altitude_deg: f64,
    /// Kasten & Young (1989) airmass; `None` below the horizon.
    pub airmass: Option<f64>,
    pub sun_altitude_deg: f64,
}

/// Whether one transit can be watched from a site.
#[derive(Debug, Clone, PartialEq)]
pub struct Visibility {
    /// Ingress, mid-transit and egress (mid-transit alone without a duration).
    pub moments: Vec<Moment>,
    /// Every moment in astronomical night with the star at or above the minimum altitude.
    pub observable: bool,
}

/// The Sun's altitude below which the night is astronomical, degrees (common practice).
pub const ASTRONOMICAL_NIGHT_DEG: f64 = -18.0;

impl Ephemeris {
    /// Read a planet's epoch and period from an analysis. Errors say what is missing.
    pub fn of(a: &Analysis, sys: usize, body: usize) -> Result<Ephemeris, String> {
        let s = a.model.systems.get(sys).ok_or("no such system")?;
        let b = s.bodies.get(body).ok_or("no such body")?;
        if b.kind != BodyKind::Planet {
            return Err(format!("'{}' is a star; an ephemeris is a planet's", b.id));
        }
        let res = a
            .results
            .get(sys)
            .and_then(|r| r.bodies.get(body))
            .ok_or("no results for this body")?;
        let epoch = res.get(Qty::TransitEpoch).ok_or_else(|| {
            if crate::report::written_in_file(a, sys, body, Qty::TransitEpoch) {
                return format!(
                    "the transit_epoch of '{}' is {}; `syz check` shows the line",
                    b.id,
                    crate::report::missing_text(a, sys, body, Qty::TransitEpoch)
                );
            }
            format!(
                "'{id}' declares no transit_epoch, and an ephemeris counts periods from one \
                 observed mid-transit time of the planet itself. Declare the time of one of \
                 {id}'s transits in `planet {id}`, as a Julian date with its time scale \
                 (`transit_epoch = JD ± UNCERTAINTY BJD_TDB`; see docs/timescales.md for the \
                 others) or as a UTC timestamp (`transit_epoch = \"YYYY-MM-DDThh:mm:ssZ\"`)",
                id = b.id
            )
        })?;
        let period = res
            .get(Qty::Period)
            .filter(|p| p.value.is_finite() && p.value > 0.0)
            .ok_or_else(|| {
                // Say why, as for the epoch: a period declared but refused (`0 d`) was called
                // "neither declared nor derivable".
                format!(
                    "the period of '{}' is {}",
                    b.id,
                    crate::report::missing_text(a, sys, body, Qty::Period)
                )
            })?;
        let mut assumptions = epoch.assumptions.clone();
        let unit = epoch.shown_unit().to_string();
        let system = match time::system_of_unit(&unit) {
            Some((sys, _)) => sys,
            None => TimeSystem::JD_UTC,
        };
        let t0_declared = epoch.value / DAY;
        let t0_tdb = time::convert(t0_declared, system.scale, Scale::Tdb)
            .map_err(|e| format!("transit_epoch of '{}': {e}", b.id))?;
        let mean = |lo: f64, hi: f64| (lo + hi) / 2.0;
        if (epoch.below - epoch.above).abs() > 1e-12 * epoch.value.abs()
            || (period.below - period.above).abs() > 1e-3 * period.above.max(period.below)
        {
            assumptions
                .push("an asymmetric uncertainty enters as the mean of its two sides".to_string());
        }
        if epoch.below == 0.0 && epoch.above == 0.0 {
            assumptions.push("the transit epoch has no stated uncertainty".to_string());
        }
        assumptions.push(
            "sigma_n^2 = sigma_T0^2 + n^2 sigma_P^2: the epoch and the period taken as uncorrelated"
                .to_string(),
        );
        for a in &period.assumptions {
            if !assumptions.contains(a) {
                assumptions.push(a.clone());
            }
        }
        let duration_days = res
            .get(Qty::TransitDuration)
            .filter(|d| d.value.is_finite() && d.value > 0.0)
            .map(|d| (d.value / DAY, mean(d.below, d.above) / DAY));
        match duration_days {
            Some(_) => assumptions.push(
                "first and fourth contact are mid-transit ∓ T14/2; their uncertainty is \
                 sqrt(sigma_mid^2 + (sigma_T14/2)^2), the mid-time and the duration taken as \
                 uncorrelated"
                    .to_string(),
            ),
            None => assumptions.push(format!(
                "no transit_duration of '{}' is declared or derivable: contact times are not given",
                b.id
            )),
        }
        Ok(Ephemeris {
            duration_days,
            t0_tdb,
            system,
            t0_declared,
            sigma_t0_days: mean(epoch.below, epoch.above) / DAY,
            period_days: period.value / DAY,
            sigma_period_days: mean(period.below, period.above) / DAY,
            assumptions,
        })
    }

    /// Timing uncertainty n periods from the epoch, days.
    pub fn sigma_at(&self, n: i64) -> f64 {
        let n = n as f64;
        (self.sigma_t0_days.powi(2) + n * n * self.sigma_period_days.powi(2)).sqrt()
    }

    /// The n-th transit after the epoch.
    pub fn transit(&self, n: i64) -> Result<Transit, TimeError> {
        let tdb = self.t0_tdb + n as f64 * self.period_days;
        let jd = time::convert(tdb, Scale::Tdb, self.system.scale)?;
        let jd_utc = time::convert(tdb, Scale::Tdb, Scale::Utc)?;
        let sigma_days = self.sigma_at(n);
        let contacts = match self.duration_days {
            Some((t14, sigma_t14)) => {
                let half = t14 / 2.0;
                let at = |t: f64| -> Result<(f64, f64, String), TimeError> {
                    let utc = time::convert(t, Scale::Tdb, Scale::Utc)?;
                    Ok((
                        time::convert(t, Scale::Tdb, self.system.scale)?,
                        utc,
                        time::iso(utc, Scale::Utc)?,
                    ))
                };
                let (ingress_jd, ingress_jd_utc, ingress_utc) = at(tdb - half)?;
                let (egress_jd, egress_jd_utc, egress_utc) = at(tdb + half)?;
                Some(Contacts {
                    ingress_jd,
                    egress_jd,
                    ingress_jd_utc,
                    egress_jd_utc,
                    ingress_utc,
                    egress_utc,
                    sigma_days: (sigma_days.powi(2) + (sigma_t14 / 2.0).powi(2)).sqrt(),
                })
            }
            None => None,
        };
        Ok(Transit {
            n,
            jd,
            jd_utc,
            utc: time::iso(jd_utc, Scale::Utc)?,
            sigma_days,
            contacts,
        })
    }

    /// The first `count` transits at or after the UTC Julian date `from`.
    pub fn upcoming(&self, from_jd_utc: f64, count: usize) -> Result<Vec<Transit>, String> {
        let from_tdb =
            time::convert(from_jd_utc, Scale::Utc, Scale::Tdb).map_err(|e| e.to_string())?;
        let first = ((from_tdb - self.t0_tdb) / self.period_days).ceil();
        if !first.is_finite() || first.abs() > 1e12 {
            // The date is fine (it converted); the period is too short to count orbits to it.
            return Err(format!(
                "a period of {} d would put about {} orbits between the epoch and this date, \
                 more than the 10^12 transit numbers are counted to; check the period's unit",
                crate::format::sig(self.period_days, 4),
                crate::format::sig(first.abs(), 2)
            ));
        }
        let first = first as i64;
        (0..count as i64)
            .map(|i| self.transit(first + i).map_err(|e| e.to_string()))
            .collect()
    }

    /// What could make the listed times mislead: the first listed transit whose uncertainty
    /// makes its orbit number doubtful (the ephemeris is lost), else the first whose
    /// uncertainty exceeds the transit's own duration (a window of one sigma may miss it).
    pub fn warnings(&self, transits: &[Transit]) -> Vec<String> {
        let quarter = self.period_days / 4.0;
        if let Some(t) = transits.iter().find(|t| t.sigma_days > quarter) {
            return vec![format!(
                "the ephemeris is lost from transit n = {} on: its uncertainty ({}) exceeds a \
                 quarter of the period (P/4 = {} d), so the two-sigma window spans a whole orbit and \
                 which orbit a transit belongs to cannot be told; these times (and whether \
                 they are observable) are not predictions: a new transit time or a better \
                 period is needed (common practice)",
                t.n,
                sigma_text(t.sigma_days),
                crate::format::sig(quarter, 3)
            )];
        }
        let Some((duration, _)) = self.duration_days else {
            return Vec::new();
        };
        transits
            .iter()
            .find(|t| t.sigma_days > duration)
            .map(|t| {
                format!(
                    "from transit n = {} on, the uncertainty of mid-transit ({}) exceeds the \
                     transit's own duration ({}): a window of one sigma either side may miss \
                     it; plan for several sigma or refine the ephemeris (common practice)",
                    t.n,
                    sigma_text(t.sigma_days),
                    sigma_text(duration)
                )
            })
            .into_iter()
            .collect()
    }

    /// What the listed times take for granted beyond the ephemeris itself.
    pub fn time_assumptions(&self, transits: &[Transit]) -> Vec<String> {
        let mut out = Vec::new();
        match self.system.place {
            Place::Earth => {}
            p => out.push(format!(
                "times stay at the {} clock, also in UTC: {}",
                if p == Place::Barycentre {
                    "barycentric"
                } else {
                    "heliocentric"
                },
                time::LIGHT_TIME_NOT_APPLIED
            )),
        }
        let last_leap = time::LEAP_SECONDS.last().map_or(0.0, |l| l.0);
        if transits.iter().any(|t| t.jd_utc > last_leap + 365.0) {
            out.push(time::NO_FUTURE_LEAP_SECONDS.to_string());
        }
        out
    }
}

/// A standard uncertainty of a time, in days, in the unit that reads best: minutes up to
/// two hours, hours up to two days, days beyond.
pub fn sigma_text(days: f64) -> String {
    let minutes = days * 24.0 * 60.0;
    if minutes < 120.0 {
        format!("{minutes:.1} min")
    } else if minutes < 48.0 * 60.0 {
        format!("{:.2} h", days * 24.0)
    } else {
        format!("{} d", crate::format::sig(days, 3))
    }
}

/// The ICRS place of a planet's host star, from its declared `right_ascension` and
/// `declination`. The error names what is missing and where to declare it.
pub fn sky_position(a: &Analysis, sys: usize, planet: usize) -> Result<SkyPosition, String> {
    let s = a.model.systems.get(sys).ok_or("no such system")?;
    let b = s.bodies.get(planet).ok_or("no such body")?;
    let host = b.orbits.ok_or_else(|| {
        format!(
            "'{}' orbits no declared star, so its sky position is unknown: the star's \
             right_ascension and declination give it",
            b.id
        )
    })?;
    let star = s.bodies.get(host).ok_or("no such star")?;
    let res = a
        .results
        .get(sys)
        .and_then(|r| r.bodies.get(host))
        .ok_or("no results for the host star")?;
    let ra = res.get(Qty::RightAscension).map(|q| q.value);
    let dec = res.get(Qty::Declination).map(|q| q.value);
    match (ra, dec) {
        (Some(ra), Some(dec)) if ra.is_finite() && dec.is_finite() => Ok(SkyPosition { ra, dec }),
        _ => {
            let missing: Vec<&str> = [("right_ascension", ra), ("declination", dec)]
                .iter()
                .filter(|(_, v)| v.is_none())
                .map(|(n, _)| *n)
                .collect();
            Err(format!(
                "a site needs the sky position of '{star}', which declares no {what}: add \
                 `right_ascension = \"hh:mm:ss.s\"` and `declination = \"±dd:mm:ss\"` (ICRS; \
                 or both in deg) to `star {star}`",
                star = star.id,
                what = missing.join(" and "),
            ))
        }
    }
}

impl SkyPosition {
    /// The star and the Sun at a transit's contacts (or at mid-transit alone), seen from
    /// `site`, and whether the whole transit falls in astronomical night with the star at
    /// or above `min_altitude_deg`.
    pub fn visibility(
        &self,
        site: &crate::sky::Site,
        min_altitude_deg: f64,
        t: &Transit,
    ) -> Result<Visibility, TimeError> {
        let times: Vec<(&'static str, f64)> = match &t.contacts {
            Some(c) => vec![
                ("ingress", c.ingress_jd_utc),
                ("mid", t.jd_utc),
                ("egress", c.egress_jd_utc),
            ],
            None => vec![("mid", t.jd_utc)],
        };
        let deg = std::f64::consts::PI / 180.0;
        let mut moments = Vec::with_capacity(times.len());
        for (label, jd_utc) in times {
            let tt = time::convert(jd_utc, Scale::Utc, Scale::Tt)?;
            let alt = site.star_altitude(self.ra, self.dec, jd_utc, tt);
            moments.push(Moment {
                label,
                star_altitude_deg: alt / deg,
                airmass: crate::sky::airmass(alt),
                sun_altitude_deg: site.sun_altitude(jd_utc, tt) / deg,
            });
        }
        let observable = moments.iter().all(|m| {
            m.star_altitude_deg >= min_altitude_deg && m.sun_altitude_deg < ASTRONOMICAL_NIGHT_DEG
        });
        Ok(Visibility {
            moments,
            observable,
        })
    }
}

/// What altitudes from a site take for granted, in words.
pub fn site_assumptions(system: TimeSystem, has_contacts: bool) -> Vec<String> {
    let mut out = vec![
        "the star's ICRS position is used as it is at every date: proper motion is not applied"
            .to_string(),
        "altitudes are geometric (no refraction), from sidereal time (IAU 2006, UT1 taken as \
         UTC) and the star precessed to the date (IAU 1976; nutation and aberration not \
         applied), good to about 1 arcminute; the Sun from the Astronomical Almanac's \
         low-precision formulae; airmass by Kasten & Young (1989)"
            .to_string(),
        "observable: the star at or above the minimum altitude and the Sun below -18 deg \
         (astronomical night) at ingress, mid-transit and egress; the sky between these \
         moments is not sampled"
            .to_string(),
    ];
    if !has_contacts {
        out.push("without a transit duration only mid-transit is checked".to_string());
    }
    if system.place != Place::Earth {
        out.push(
            "altitudes are for the listed UTC times, which stay at the epoch's clock: the \
             transit is seen at Earth up to 8.3 min earlier or later"
                .to_string(),
        );
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::source::{MemoryDb, SourceDb};

    fn analysis(src: &str) -> Analysis {
        let mut db = MemoryDb::new();
        let f = db.add("t.syz", src);
        crate::analyze(f, db.text(f), &crate::Settings::linear())
    }

    const SRC: &str = "system \"Ostrel\" {\n  star s { mass = 1 Msun; radius = 1 Rsun }\n  planet b orbits s {\n    period = 2.5 ± 0.0001 d\n    transit_epoch = 2460000.0 ± 0.0005 BJD_TDB\n  }\n}\n";

    #[test]
    fn uncertainty_grows_as_the_documented_law() {
        let a = analysis(SRC);
        let e = Ephemeris::of(&a, 0, 1).unwrap();
        assert_eq!(e.period_days, 2.5);
        for n in [0i64, 1, 10, 100, 1000, -40] {
            let t = e.transit(n).unwrap();
            // sigma_n^2 = sigma_0^2 + n^2 sigma_P^2.
            let expect = (0.0005f64.powi(2) + (n as f64 * 0.0001).powi(2)).sqrt();
            assert!((t.sigma_days - expect).abs() < 1e-15, "n={n}");
            assert!((t.jd - (2_460_000.0 + n as f64 * 2.5)).abs() < 1e-8);
        }
        // Far from the epoch the period's term dominates: linear growth.
        assert!((e.sigma_at(10_000) / e.sigma_at(5_000) - 2.0).abs() < 1e-3);
    }

    #[test]
    fn a_lost_ephemeris_and_a_window_wider_than_the_transit_are_said() {
        // P = 10 ± 0.2 d: after 141 orbits the uncertainty is 28 days, almost 3 periods.
        let lost = SRC.replace("2.5 ± 0.0001 d", "10 ± 0.2 d");
        let a = analysis(&lost);
        let e = Ephemeris::of(&a, 0, 1).unwrap();
        let near = e.upcoming(2_460_001.0, 1).unwrap();
        assert_eq!(near[0].n, 1);
        assert!(e.warnings(&near).is_empty(), "{:?}", e.warnings(&near));
        let far = e.upcoming(2_461_400.0, 3).unwrap();
        let w = e.warnings(&far);
        assert_eq!(w.len(), 1);
        assert!(
            w[0].starts_with("the ephemeris is lost from transit n = 141 on"),
            "{w:?}"
        );
        assert!(w[0].contains("28.2 d"), "{w:?}");
        // With a duration known, a sigma past it is said before the ephemeris is lost.
        let mut e = e;
        e.duration_days = Some((0.125, 0.001));
        let mid = e.upcoming(2_460_010.0, 1).unwrap();
        let w = e.warnings(&mid);
        assert!(
            w[0].contains("exceeds the transit's own duration (3.00 h)"),
            "{w:?}"
        );
        assert_eq!(sigma_text(0.001), "1.4 min");
        assert_eq!(sigma_text(0.5), "12.00 h");
        assert_eq!(sigma_text(28.2), "28.2 d");
    }

    #[test]
    fn upcoming_starts_at_the_first_transit_after_from() {
        let a = analysis(SRC);
        let e = Ephemeris::of(&a, 0, 1).unwrap();
        // TDB − UTC = 69.184 s (+ ~1 ms) in 2023; the epoch is 2460000.0 TDB.
        let from = 2_460_000.0 + 10.0 * 2.5 - 0.01;
        let list = e.upcoming(from, 3).unwrap();
        assert_eq!(list.iter().map(|t| t.n).collect::<Vec<_>>(), [10, 11, 12]);
        let t = &list[0];
        assert!(((t.jd - t.jd_utc) * DAY - 69.184).abs() < 0.01);
        let from_after = 2_460_025.0;
        assert_eq!(e.upcoming(from_after, 1).unwrap()[0].n, 11);
        assert!(e
            .time_assumptions(&list)
            .iter()
            .any(|s| s.contains("not applied")));
    }

    #[test]
    fn missing_epoch_is_a_clear_error() {
        let src = "system \"Ostrel\" {\n  star s { mass = 1 Msun }\n  planet b orbits s { period = 2.5 d }\n}\n";
        let a = analysis(src);
        let err = Ephemeris::of(&a, 0, 1).unwrap_err();
        assert!(err.contains("transit_epoch"), "{err}");
        assert!(err.contains("planet b"), "says where to declare it: {err}");
        // No number to paste: another planet's epoch would give a wrong ephemeris.
        assert!(!err.chars().any(|c| c.is_ascii_digit()), "{err}");
        assert!(Ephemeris::of(&a, 0, 0).is_err());
    }

    /// A period declared but refused says why (it was "neither declared nor derivable").
    #[test]
    fn a_refused_period_says_why() {
        let src = "system \"Ostrel\" {\n  star s { mass = 1 Msun }\n  planet b orbits s { period = 0 d; transit_epoch = 2460000.5 ± 0.001 BJD_TDB }\n}\n";
        let err = Ephemeris::of(&analysis(src), 0, 1).unwrap_err();
        assert!(err.contains("the period of 'b' is declared"), "{err}");
        assert!(err.contains("outside the valid range"), "{err}");
    }

    #[test]
    fn a_utc_timestamp_epoch_is_converted() {
        let src = "system \"Ostrel\" {\n  star s { mass = 1 Msun }\n  planet b orbits s {\n    period = 1 d\n    transit_epoch = \"2024-01-01T00:00:00Z\"\n  }\n}\n";
        let a = analysis(src);
        let e = Ephemeris::of(&a, 0, 1).unwrap();
        assert_eq!(e.system, TimeSystem::JD_UTC);
        let t = e.transit(3).unwrap();
        assert_eq!(t.utc, "2024-01-04T00:00:00Z");
        assert!(e.assumptions.iter().any(|s| s.contains("timestamp")));
        assert!(e
            .assumptions
            .iter()
            .any(|s| s.contains("no stated uncertainty")));
    }

    const SITED: &str = "system \"Ostrel\" {\n  star s { mass = 1 Msun; radius = 1 Rsun; right_ascension = \"13:25:23.3\"; declination = \"-12:02:24\" }\n  planet b orbits s {\n    period = 2.5 ± 0.0001 d\n    transit_epoch = 2460000.0 ± 0.0005 BJD_TDB\n    transit_duration = 2.4 ± 0.12 h\n  }\n}\n";

    #[test]
    fn contacts_are_half_the_duration_either_side_with_the_documented_uncertainty() {
        let a = analysis(SITED);
        let e = Ephemeris::of(&a, 0, 1).unwrap();
        let t = e.transit(4).unwrap();
        let c = t.contacts.clone().unwrap();
        assert!((t.jd - c.ingress_jd - 0.05).abs() < 1e-9);
        assert!((c.egress_jd - t.jd - 0.05).abs() < 1e-9);
        assert!((c.egress_jd_utc - c.ingress_jd_utc - 0.1).abs() < 1e-9);
        // sqrt(sigma_mid^2 + (sigma_T14 / 2)^2), 0.12 h = 0.005 d.
        let expect = (t.sigma_days.powi(2) + 0.0025f64.powi(2)).sqrt();
        assert!((c.sigma_days - expect).abs() < 1e-15);
        assert!(e.assumptions.iter().any(|s| s.contains("∓ T14/2")));
    }

    #[test]
    fn visibility_checks_every_contact() {
        let a = analysis(SITED);
        let e = Ephemeris::of(&a, 0, 1).unwrap();
        let pos = sky_position(&a, 0, 1).unwrap();
        let site = crate::sky::Site::parse("28.76,-17.88,2300").unwrap();
        let list = e.upcoming(2_460_000.0, 200).unwrap();
        let v: Vec<Visibility> = list
            .iter()
            .map(|t| pos.visibility(&site, 30.0, t).unwrap())
            .collect();
        assert!(v.iter().all(|v| v.moments.len() == 3));
        // Over 500 days some transits are seen and some are not.
        assert!(v.iter().any(|v| v.observable) && v.iter().any(|v| !v.observable));
        for v in &v {
            let ok = v
                .moments
                .iter()
                .all(|m| m.star_altitude_deg >= 30.0 && m.sun_altitude_deg < -18.0);
            assert_eq!(v.observable, ok);
            for m in &v.moments {
                assert_eq!(m.airmass.is_some(), m.star_altitude_deg >= 0.0);
            }
        }
        // A lower bar admits at least as many.
        let low = list
            .iter()
            .filter(|t| pos.visibility(&site, 10.0, t).unwrap().observable)
            .count();
        assert!(low >= v.iter().filter(|v| v.observable).count());
    }

    #[test]
    fn a_site_without_a_sky_position_names_what_is_missing() {
        let a = analysis(SRC);
        let err = sky_position(&a, 0, 1).unwrap_err();
        assert!(err.contains("right_ascension and declination"), "{err}");
        assert!(err.contains("star s"), "{err}");
        let half = SRC.replace("radius = 1 Rsun", "radius = 1 Rsun; ra = 10 deg");
        let err = sky_position(&analysis(&half), 0, 1).unwrap_err();
        assert!(err.contains("declares no declination:"), "{err}");
    }
}
