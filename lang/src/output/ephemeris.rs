//! Transit ephemerides: the mid-transit times that follow from a transit epoch and a
//! period, with their timing uncertainty.
//!
//! The n-th transit after the epoch T0 falls at `T_n = T0 + n P`, propagated in TDB (a
//! uniform scale; UTC is not, because of its leap seconds). Its standard uncertainty is
//! `sigma_n^2 = sigma_T0^2 + n^2 sigma_P^2`, which takes T0 and P as uncorrelated (linear
//! propagation, common practice). Each time is given back in the time system the epoch
//! was declared in and in UTC; see [`crate::time`] for what those conversions assume.

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
}

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
            .ok_or_else(|| format!("the period of '{}' is neither declared nor derivable", b.id))?;
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
        Ok(Ephemeris {
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
        Ok(Transit {
            n,
            jd,
            jd_utc,
            utc: time::iso(jd_utc, Scale::Utc)?,
            sigma_days: self.sigma_at(n),
        })
    }

    /// The first `count` transits at or after the UTC Julian date `from`.
    pub fn upcoming(&self, from_jd_utc: f64, count: usize) -> Result<Vec<Transit>, TimeError> {
        let from_tdb = time::convert(from_jd_utc, Scale::Utc, Scale::Tdb)?;
        let first = ((from_tdb - self.t0_tdb) / self.period_days).ceil();
        if !first.is_finite() || first.abs() > 1e12 {
            return Err(TimeError::OutOfRange(from_jd_utc));
        }
        let first = first as i64;
        (0..count as i64).map(|i| self.transit(first + i)).collect()
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
}
