//! Time scales, Julian dates and calendar timestamps.
//!
//! This module owns what a transit epoch *means*: the time scale a Julian date counts in
//! (UTC, TAI, TT, TDB), the place its clock sits (at Earth, at the Sun's centre, at the
//! Solar System barycentre), conversions between the scales, and ISO 8601 timestamps.
//! Everything is a pure function of numbers and text; "now" is the caller's business.
//! The conventions and their sources are written up in `docs/timescales.md`.
//!
//! Conversions (all through TT):
//! - UTC → TAI: add TAI−UTC from the leap-second table ([`LEAP_SECONDS`]), 10 s in 1972
//!   to 37 s since 2017-01-01. UTC before 1972 (when UTC seconds were not SI seconds) is
//!   refused. Dates after the table's last entry assume no further leap second.
//! - TT = TAI + 32.184 s (exact, by definition; IAU 1991 Recommendation IV).
//! - TDB − TT ≈ 0.001657 s sin g + 0.000014 s sin 2g, g = 357.53° + 0.98560028° (JD − 2451545.0)
//!   (the periodic term as given in the Explanatory Supplement to the Astronomical Almanac
//!   and USNO Circular 179, Kaplan 2005, eq. 2.6; from memory), good to about 10 µs.
//!
//! A Julian date is carried as one `f64` of days: near JD 2.46e6 that resolves about 40 µs,
//! far below the timing precision of any transit.
//!
//! The place of the clock (the "B" of BJD, the "H" of HJD) cannot be changed without the
//! star's sky coordinates and the Earth's orbit, which this module does not use: moving a time between Earth and
//! the barycentre is a light-travel-time correction of up to ±8.3 min (1 au / c = 499 s).
//! Conversions here change the scale only and say so ([`LIGHT_TIME_NOT_APPLIED`]).

use crate::constants::DAY;
use std::fmt;

/// Julian date of the J2000.0 epoch, 2000-01-01T12:00:00 TT (IAU 1976 / 2000, common practice).
pub const J2000_JD: f64 = 2_451_545.0;

/// Julian date of the Unix epoch 1970-01-01T00:00:00 UTC (common practice).
pub const UNIX_EPOCH_JD: f64 = 2_440_587.5;

/// TT − TAI, seconds (exact by definition; IAU 1991 Recommendation IV).
pub const TT_MINUS_TAI: f64 = 32.184;

/// Light-travel time across one astronomical unit, seconds (au / c; IAU 2012 B2, SI 2019):
/// the largest barycentric correction for a star in the ecliptic.
pub const AU_LIGHT_TIME_S: f64 = crate::constants::AU / crate::constants::C;

/// The words shown whenever a time is moved between time scales without moving its clock.
pub const LIGHT_TIME_NOT_APPLIED: &str = "the light-travel-time (barycentric) correction, up to ±8.3 min, is not applied: only the time scale is converted";

/// A time scale: how the seconds are counted.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Scale {
    /// Coordinated Universal Time (civil time, with leap seconds).
    Utc,
    /// International Atomic Time.
    Tai,
    /// Terrestrial Time.
    Tt,
    /// Barycentric Dynamical Time.
    Tdb,
}

impl Scale {
    pub fn as_str(self) -> &'static str {
        match self {
            Scale::Utc => "UTC",
            Scale::Tai => "TAI",
            Scale::Tt => "TT",
            Scale::Tdb => "TDB",
        }
    }
}

/// Where the clock of a Julian date sits.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Place {
    /// At Earth (a plain JD).
    Earth,
    /// At the Sun's centre (HJD).
    Heliocentre,
    /// At the Solar System barycentre (BJD).
    Barycentre,
}

impl Place {
    pub fn prefix(self) -> &'static str {
        match self {
            Place::Earth => "JD",
            Place::Heliocentre => "HJD",
            Place::Barycentre => "BJD",
        }
    }
}

/// The time system of a Julian date: its scale and the place of its clock.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct TimeSystem {
    pub scale: Scale,
    pub place: Place,
}

impl TimeSystem {
    pub const BJD_TDB: TimeSystem = TimeSystem {
        scale: Scale::Tdb,
        place: Place::Barycentre,
    };
    pub const JD_UTC: TimeSystem = TimeSystem {
        scale: Scale::Utc,
        place: Place::Earth,
    };

    /// The unit symbol, e.g. `BJD_TDB`.
    pub fn symbol(self) -> String {
        format!("{}_{}", self.place.prefix(), self.scale.as_str())
    }
}

/// The time system a Julian-date unit symbol names, with the assumption made when the
/// symbol leaves the scale unsaid. `None` for a symbol that is not a Julian-date unit.
pub fn system_of_unit(symbol: &str) -> Option<(TimeSystem, Option<&'static str>)> {
    let (place, scale) = symbol.split_once('_').unwrap_or((symbol, ""));
    let place = match place {
        "JD" => Place::Earth,
        "HJD" => Place::Heliocentre,
        "BJD" => Place::Barycentre,
        _ => return None,
    };
    let (scale, assumed) = match (scale, place) {
        ("UTC", _) => (Scale::Utc, None),
        ("TAI", _) => (Scale::Tai, None),
        ("TT", _) => (Scale::Tt, None),
        ("TDB", _) => (Scale::Tdb, None),
        // Barycentric dates are TDB by modern convention (common practice); older
        // heliocentric and plain dates were mostly UTC (common practice).
        ("", Place::Barycentre) => (
            Scale::Tdb,
            Some("BJD with no time scale named is read as BJD_TDB (common practice)"),
        ),
        ("", Place::Heliocentre) => (
            Scale::Utc,
            Some("HJD with no time scale named is read as HJD_UTC (common practice)"),
        ),
        ("", Place::Earth) => (
            Scale::Utc,
            Some("JD with no time scale named is read as JD_UTC"),
        ),
        _ => return None,
    };
    Some((TimeSystem { scale, place }, assumed))
}

/// Every Julian-date unit symbol, for the unit registry.
pub const JD_UNITS: &[&str] = &[
    "BJD_TDB", "BJD_TT", "BJD_UTC", "BJD", "JD_UTC", "JD_TAI", "JD_TT", "JD_TDB", "JD", "HJD_UTC",
    "HJD_TT", "HJD_TDB", "HJD",
];

/// Why a time could not be converted or read.
#[derive(Debug, Clone, PartialEq)]
pub enum TimeError {
    /// UTC before 1972-01-01, when its seconds were not SI seconds.
    UtcBefore1972,
    /// A Julian date that is not a finite number in a sensible range.
    OutOfRange(f64),
    /// A timestamp that does not follow the accepted ISO 8601 form.
    BadTimestamp(String),
}

impl fmt::Display for TimeError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            TimeError::UtcBefore1972 => write!(
                f,
                "UTC before 1972-01-01 is not supported (its seconds were not SI seconds); give the time in TT or TDB"
            ),
            TimeError::OutOfRange(jd) => write!(
                f,
                "Julian date {} is outside the supported range (years 1000 to 9999)",
                if jd.abs() < 1e12 {
                    jd.to_string()
                } else {
                    format!("{jd:.3e}")
                }
            ),
            TimeError::BadTimestamp(why) => write!(f, "{why}"),
        }
    }
}

/// (Julian date at 0h UTC of the day from which it holds, TAI − UTC in seconds): the IERS
/// leap-second list (Bulletin C). Checked entry by entry against the IERS `leap-seconds.list`
/// "updated through IERS Bulletin C", file expiring 28 June 2026 (a test holds its values),
/// and against the IERS `Leap_Second.dat` updated through Bulletin C 56: no leap second
/// after 2017-01-01 was announced up to that expiry.
pub const LEAP_SECONDS: &[(f64, f64)] = &[
    (2_441_317.5, 10.0), // 1972-01-01
    (2_441_499.5, 11.0), // 1972-07-01
    (2_441_683.5, 12.0), // 1973-01-01
    (2_442_048.5, 13.0), // 1974-01-01
    (2_442_413.5, 14.0), // 1975-01-01
    (2_442_778.5, 15.0), // 1976-01-01
    (2_443_144.5, 16.0), // 1977-01-01
    (2_443_509.5, 17.0), // 1978-01-01
    (2_443_874.5, 18.0), // 1979-01-01
    (2_444_239.5, 19.0), // 1980-01-01
    (2_444_786.5, 20.0), // 1981-07-01
    (2_445_151.5, 21.0), // 1982-07-01
    (2_445_516.5, 22.0), // 1983-07-01
    (2_446_247.5, 23.0), // 1985-07-01
    (2_447_161.5, 24.0), // 1988-01-01
    (2_447_892.5, 25.0), // 1990-01-01
    (2_448_257.5, 26.0), // 1991-01-01
    (2_448_804.5, 27.0), // 1992-07-01
    (2_449_169.5, 28.0), // 1993-07-01
    (2_449_534.5, 29.0), // 1994-07-01
    (2_450_083.5, 30.0), // 1996-01-01
    (2_450_630.5, 31.0), // 1997-07-01
    (2_451_179.5, 32.0), // 1999-01-01
    (2_453_736.5, 33.0), // 2006-01-01
    (2_454_832.5, 34.0), // 2009-01-01
    (2_456_109.5, 35.0), // 2012-07-01
    (2_457_204.5, 36.0), // 2015-07-01
    (2_457_754.5, 37.0), // 2017-01-01
];

/// Words for dates past the table's end.
pub const NO_FUTURE_LEAP_SECONDS: &str =
    "no leap second after 2017-01-01 is known to the table; later UTC times assume TAI − UTC = 37 s";

/// The first Julian date of the supported range: 1000-01-01T00:00 in the proleptic Gregorian
/// calendar (astropy's `Time('1000-01-01').jd` gives the same).
pub const FIRST_JD: f64 = 2_086_302.5;
/// The Julian date just past the supported range: 10000-01-01T00:00.
pub const END_JD: f64 = 5_373_484.5;

fn check_range(jd: f64) -> Result<(), TimeError> {
    // Years 1000 to 9999 whole, in the proleptic Gregorian calendar the timestamps are read
    // in: JD 2086302.5 (1000-01-01T00:00) up to 5373484.5 (10000-01-01T00:00). The bounds were
    // the Julian calendar's at the start (five days late) and cut half a day off the end.
    if jd.is_finite() && (FIRST_JD..END_JD).contains(&jd) {
        Ok(())
    } else {
        Err(TimeError::OutOfRange(jd))
    }
}

/// TAI − UTC in seconds at a UTC Julian date.
pub fn tai_minus_utc(jd_utc: f64) -> Result<f64, TimeError> {
    check_range(jd_utc)?;
    LEAP_SECONDS
        .iter()
        .rev()
        .find(|(start, _)| jd_utc >= *start)
        .map(|(_, d)| *d)
        .ok_or(TimeError::UtcBefore1972)
}

/// TDB − TT in seconds (periodic term; see the module docs).
pub fn tdb_minus_tt(jd_tt: f64) -> f64 {
    let g = (357.53 + 0.985_600_28 * (jd_tt - J2000_JD)).to_radians();
    0.001_657 * g.sin() + 0.000_014 * (2.0 * g).sin()
}

/// A Julian date in `scale` converted to TT.
pub fn to_tt(jd: f64, scale: Scale) -> Result<f64, TimeError> {
    check_range(jd)?;
    Ok(match scale {
        Scale::Tt => jd,
        Scale::Tai => jd + TT_MINUS_TAI / DAY,
        Scale::Utc => jd + (tai_minus_utc(jd)? + TT_MINUS_TAI) / DAY,
        // The periodic term changes by under 1e-9 s over its own size, so evaluating it
        // at TDB instead of TT is exact to far below a microsecond.
        Scale::Tdb => jd - tdb_minus_tt(jd) / DAY,
    })
}

/// A TT Julian date converted to `scale`.
pub fn from_tt(jd_tt: f64, scale: Scale) -> Result<f64, TimeError> {
    check_range(jd_tt)?;
    Ok(match scale {
        Scale::Tt => jd_tt,
        Scale::Tai => jd_tt - TT_MINUS_TAI / DAY,
        Scale::Tdb => jd_tt + tdb_minus_tt(jd_tt) / DAY,
        Scale::Utc => {
            let tai = jd_tt - TT_MINUS_TAI / DAY;
            // The step of each table entry happens at UTC `start`, i.e. at TAI
            // `start + new offset`.
            let offset = LEAP_SECONDS
                .iter()
                .rev()
                .find(|(start, d)| tai >= start + d / DAY)
                .map(|(_, d)| *d)
                .ok_or(TimeError::UtcBefore1972)?;
            tai - offset / DAY
        }
    })
}

/// A Julian date moved from one scale to another (the clock's place unchanged).
pub fn convert(jd: f64, from: Scale, to: Scale) -> Result<f64, TimeError> {
    if from == to {
        check_range(jd)?;
        return Ok(jd);
    }
    from_tt(to_tt(jd, from)?, to)
}

/// A calendar date and time of day (proleptic Gregorian calendar).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Calendar {
    pub year: i32,
    pub month: u32,
    pub day: u32,
    pub hour: u32,
    pub minute: u32,
    pub second: f64,
}

/// Julian date of a Gregorian calendar date and time (Meeus, Astronomical Algorithms,
/// ch. 7, from memory). The seconds may be 60 (a leap second): the result is then the
/// start of the next day, as a Julian date cannot name a leap second.
pub fn julian_date(c: &Calendar) -> f64 {
    let (mut y, mut m) = (i64::from(c.year), i64::from(c.month));
    if m <= 2 {
        y -= 1;
        m += 12;
    }
    let a = y.div_euclid(100);
    let b = 2 - a + a.div_euclid(4);
    let day_number = (365.25 * (y + 4716) as f64).floor() + (30.6001 * (m + 1) as f64).floor();
    let frac = (f64::from(c.hour) * 3600.0 + f64::from(c.minute) * 60.0 + c.second) / DAY;
    day_number + f64::from(c.day) + b as f64 - 1524.5 + frac
}

/// The Gregorian calendar date and time of a Julian date (Meeus ch. 7, from memory),
/// with seconds rounded to `places` decimals (carrying into minutes, hours and days).
pub fn calendar(jd: f64, places: u32) -> Result<Calendar, TimeError> {
    check_range(jd)?;
    let scale = 10f64.powi(places as i32);
    // Round the time of day first so 59.9996 s never shows as 60.000.
    let total = ((jd + 0.5) * DAY * scale).round() / scale;
    let days = (total / DAY).floor();
    let sec_of_day = total - days * DAY;
    let z = days as i64;
    let alpha = ((z as f64 - 1_867_216.25) / 36_524.25).floor() as i64;
    let a = z + 1 + alpha - alpha.div_euclid(4);
    let b = a + 1524;
    let c = ((b as f64 - 122.1) / 365.25).floor() as i64;
    let d = (365.25 * c as f64).floor() as i64;
    let e = ((b - d) as f64 / 30.6001).floor() as i64;
    let day = b - d - (30.6001 * e as f64).floor() as i64;
    let month = if e < 14 { e - 1 } else { e - 13 };
    let year = if month > 2 { c - 4716 } else { c - 4715 };
    let hour = (sec_of_day / 3600.0).floor();
    let minute = ((sec_of_day - hour * 3600.0) / 60.0).floor();
    let second = sec_of_day - hour * 3600.0 - minute * 60.0;
    Ok(Calendar {
        year: i32::try_from(year).map_err(|_| TimeError::OutOfRange(jd))?,
        month: u32::try_from(month).map_err(|_| TimeError::OutOfRange(jd))?,
        day: u32::try_from(day).map_err(|_| TimeError::OutOfRange(jd))?,
        hour: hour as u32,
        minute: minute as u32,
        second: second.max(0.0),
    })
}

/// A Julian date as an ISO 8601 timestamp to the second, with the scale's suffix
/// (`Z` for UTC, ` TT`, ` TDB`, ` TAI` otherwise): `2026-03-14T05:12:07Z`.
pub fn iso(jd: f64, scale: Scale) -> Result<String, TimeError> {
    let c = calendar(jd, 0)?;
    let suffix = match scale {
        Scale::Utc => "Z".to_string(),
        s => format!(" {}", s.as_str()),
    };
    Ok(format!(
        "{:04}-{:02}-{:02}T{:02}:{:02}:{:02}{suffix}",
        c.year, c.month, c.day, c.hour, c.minute, c.second as u32
    ))
}

/// Read an ISO 8601 UTC timestamp into a UTC Julian date.
///
/// Accepted: `YYYY-MM-DD`, or `YYYY-MM-DDThh:mm[:ss[.fff]]` followed by `Z` or an offset
/// `+hh:mm` / `-hh:mm` (a space may stand for the `T`). A date alone means 00:00 UTC. A
/// time of day without a zone is refused: it would be a local time of unknown offset.
pub fn parse_iso(text: &str) -> Result<f64, TimeError> {
    let bad = |why: &str| {
        TimeError::BadTimestamp(format!(
            "'{text}' is not an ISO 8601 UTC timestamp: {why}; write e.g. 2026-03-14T05:12:00Z"
        ))
    };
    let t = text.trim();
    let (date, rest) = match t.find(['T', ' ']) {
        Some(i) => (t.get(..i).unwrap_or(""), t.get(i + 1..)),
        None => (t, None),
    };
    let mut parts = date.splitn(3, '-');
    let num = |s: Option<&str>, len: usize, what: &str| -> Result<u32, TimeError> {
        let s = s.ok_or_else(|| bad(&format!("the {what} is missing")))?;
        if s.len() != len || !s.bytes().all(|b| b.is_ascii_digit()) {
            return Err(bad(&format!("the {what} must have {len} digits")));
        }
        s.parse::<u32>().map_err(|_| bad(&format!("bad {what}")))
    };
    let year = num(parts.next(), 4, "year")?;
    let month = num(parts.next(), 2, "month")?;
    let day = num(parts.next(), 2, "day")?;
    if !(1..=12).contains(&month) || day < 1 || day > days_in_month(year, month) {
        return Err(bad("there is no such calendar date"));
    }
    let (mut hour, mut minute, mut second, mut offset_min) = (0u32, 0u32, 0.0f64, 0i64);
    if let Some(rest) = rest {
        let (clock, zone) = match rest.find(['Z', 'z', '+', '-']) {
            Some(i) => (rest.get(..i).unwrap_or(""), rest.get(i..).unwrap_or("")),
            None => {
                return Err(bad(
                    "a time of day needs a zone: Z for UTC, or an offset such as +02:00",
                ))
            }
        };
        let mut c = clock.splitn(3, ':');
        hour = num(c.next(), 2, "hour")?;
        minute = num(c.next(), 2, "minute")?;
        if let Some(s) = c.next() {
            let whole = s.split('.').next().unwrap_or("");
            if whole.len() != 2 || !s.bytes().all(|b| b.is_ascii_digit() || b == b'.') {
                return Err(bad("the seconds must be written ss or ss.fff"));
            }
            second = s.parse::<f64>().map_err(|_| bad("bad seconds"))?;
        }
        if hour > 23 || minute > 59 || second >= 61.0 {
            return Err(bad("the time of day is out of range"));
        }
        if second >= 60.0 {
            // 23:59:60 on a day that ends with a leap second: a Julian date in UTC has no
            // number for it (it was read as the next day's 00:00:00, one second late).
            return Err(TimeError::BadTimestamp(format!(
                "'{text}' has second 60: a leap second, which exists only at 23:59:60 UTC on \
                 a day that ends with one, and which a Julian date in UTC has no number for; \
                 give the second before or after it (or, for a transit epoch in a file, the \
                 instant as a Julian date in TAI or TT: JD_TAI, JD_TT)"
            )));
        }
        if zone != "Z" && zone != "z" {
            let sign = if zone.starts_with('-') { -1 } else { 1 };
            let mut z = zone.get(1..).unwrap_or("").splitn(2, ':');
            let oh = num(z.next(), 2, "offset hours")?;
            let om = num(z.next(), 2, "offset minutes")?;
            if oh > 14 || om > 59 {
                return Err(bad("the offset is out of range"));
            }
            offset_min = sign * i64::from(oh * 60 + om);
        }
    }
    let jd = julian_date(&Calendar {
        year: i32::try_from(year).map_err(|_| bad("bad year"))?,
        month,
        day,
        hour,
        minute,
        second,
    }) - offset_min as f64 * 60.0 / DAY;
    check_range(jd)?;
    Ok(jd)
}

fn days_in_month(year: u32, month: u32) -> u32 {
    match month {
        4 | 6 | 9 | 11 => 30,
        2 if (year.is_multiple_of(4) && !year.is_multiple_of(100)) || year.is_multiple_of(400) => {
            29
        }
        2 => 28,
        _ => 31,
    }
}

/// A UTC Julian date from seconds since the Unix epoch (which counts no leap seconds,
/// as a UTC Julian date does not).
pub fn jd_from_unix(seconds: f64) -> f64 {
    UNIX_EPOCH_JD + seconds / DAY
}

#[cfg(test)]
mod tests {
    use super::*;

    fn close(a: f64, b: f64, tol_s: f64) -> bool {
        ((a - b) * DAY).abs() <= tol_s
    }

    #[test]
    fn leap_seconds_match_the_iers_list() {
        // IERS leap-seconds.list ("updated through IERS Bulletin C", expires 28 June 2026):
        // seconds since 1900-01-01 0h (NTP origin, JD 2415020.5) and TAI - UTC, every entry.
        const IERS: [(u64, f64); 28] = [
            (2_272_060_800, 10.0),
            (2_287_785_600, 11.0),
            (2_303_683_200, 12.0),
            (2_335_219_200, 13.0),
            (2_366_755_200, 14.0),
            (2_398_291_200, 15.0),
            (2_429_913_600, 16.0),
            (2_461_449_600, 17.0),
            (2_492_985_600, 18.0),
            (2_524_521_600, 19.0),
            (2_571_782_400, 20.0),
            (2_603_318_400, 21.0),
            (2_634_854_400, 22.0),
            (2_698_012_800, 23.0),
            (2_776_982_400, 24.0),
            (2_840_140_800, 25.0),
            (2_871_676_800, 26.0),
            (2_918_937_600, 27.0),
            (2_950_473_600, 28.0),
            (2_982_009_600, 29.0),
            (3_029_443_200, 30.0),
            (3_076_704_000, 31.0),
            (3_124_137_600, 32.0),
            (3_345_062_400, 33.0),
            (3_439_756_800, 34.0),
            (3_550_089_600, 35.0),
            (3_644_697_600, 36.0),
            (3_692_217_600, 37.0),
        ];
        assert_eq!(LEAP_SECONDS.len(), IERS.len());
        for ((jd, step), (ntp, iers_step)) in LEAP_SECONDS.iter().zip(IERS) {
            assert_eq!(*jd, 2_415_020.5 + (ntp / 86_400) as f64, "{ntp}");
            assert_eq!(ntp % 86_400, 0);
            assert_eq!(*step, iers_step, "{ntp}");
        }
    }

    #[test]
    fn j2000_is_jd_2451545_tt() {
        // J2000.0 = JD 2451545.0 TT = 2000-01-01T12:00:00 TT (IAU; common practice).
        let jd = julian_date(&Calendar {
            year: 2000,
            month: 1,
            day: 1,
            hour: 12,
            minute: 0,
            second: 0.0,
        });
        assert_eq!(jd, 2_451_545.0);
        let c = calendar(2_451_545.0, 3).unwrap();
        assert_eq!(
            (c.year, c.month, c.day, c.hour, c.minute),
            (2000, 1, 1, 12, 0)
        );
        assert_eq!(
            iso(2_451_545.0, Scale::Tt).unwrap(),
            "2000-01-01T12:00:00 TT"
        );
    }

    #[test]
    fn known_julian_dates() {
        // Meeus, Astronomical Algorithms, ch. 7 examples (from memory):
        // 1957-10-04.81 = JD 2436116.31; 1987-01-27.0 = JD 2446822.5; 1600-01-01 = 2305447.5.
        let jd = julian_date(&Calendar {
            year: 1957,
            month: 10,
            day: 4,
            hour: 19,
            minute: 26,
            second: 24.0,
        });
        assert!((jd - 2_436_116.31).abs() < 1e-9, "{jd}");
        assert_eq!(parse_iso("1987-01-27").unwrap(), 2_446_822.5);
        assert_eq!(parse_iso("1600-01-01").unwrap(), 2_305_447.5);
        // Unix epoch: 1970-01-01T00:00Z = JD 2440587.5 (common practice).
        assert_eq!(parse_iso("1970-01-01T00:00:00Z").unwrap(), UNIX_EPOCH_JD);
    }

    #[test]
    fn calendar_round_trip() {
        for text in [
            "2026-03-14T05:12:00Z",
            "2024-02-29T23:59:59Z",
            "1999-12-31T00:00:01Z",
            "2100-03-01T12:34:56Z",
        ] {
            let jd = parse_iso(text).unwrap();
            assert_eq!(iso(jd, Scale::Utc).unwrap(), text);
        }
        assert!(close(
            parse_iso("2026-03-14T07:12:00+02:00").unwrap(),
            parse_iso("2026-03-14T05:12:00Z").unwrap(),
            1e-4
        ));
    }

    #[test]
    fn bad_timestamps_are_errors() {
        for text in [
            "2026-02-30",
            "2026-3-14",
            "2026-03-14T05:12",
            "yesterday",
            "2026-13-01T00:00Z",
            "2026-03-14T25:00:00Z",
            // A leap second has no Julian date in UTC (read as the next day, 1 s late).
            "2016-12-31T23:59:60Z",
            "2020-05-05T12:00:60.5Z",
        ] {
            assert!(parse_iso(text).is_err(), "{text} accepted");
        }
    }

    /// The range is years 1000 to 9999 whole (it started five days late and ended half a day
    /// early), counted from JD 2451544.5 = 2000-01-01 00:00 (Meeus, Astronomical Algorithms,
    /// ch. 7) in Gregorian days: 400 years are 146,097 days, and 1000-1199 hold 48 leap years.
    #[test]
    fn the_range_holds_years_1000_to_9999_whole() {
        let first = parse_iso("1000-01-01").unwrap();
        let last = parse_iso("9999-12-31T23:59:59Z").unwrap();
        assert_eq!(
            first,
            2_451_544.5 - 146_097.0 * 2.0 - (200.0 * 365.0 + 48.0)
        );
        assert!(check_range(first - 1e-6).is_err());
        assert!((last - (2_451_544.5 + 146_097.0 * 20.0 - 1.0 / DAY)).abs() < 1e-8);
        assert!(check_range(2_451_544.5 + 146_097.0 * 20.0).is_err());
    }

    #[test]
    fn tt_minus_utc_since_2017_is_69_184_s() {
        // TAI − UTC = 37 s since 2017-01-01 (IERS Bulletin C), so TT − UTC = 69.184 s.
        let utc = parse_iso("2020-06-01T00:00:00Z").unwrap();
        let tt = convert(utc, Scale::Utc, Scale::Tt).unwrap();
        assert!(((tt - utc) * DAY - 69.184).abs() < 1e-4);
        // Before the 2016-12-31 leap second: 36 s, TT − UTC = 68.184 s.
        let utc = parse_iso("2016-12-31T12:00:00Z").unwrap();
        let tt = convert(utc, Scale::Utc, Scale::Tt).unwrap();
        assert!(((tt - utc) * DAY - 68.184).abs() < 1e-4);
        // 1972-01-01: TAI − UTC = 10 s (the start of the table).
        assert_eq!(tai_minus_utc(2_441_317.5).unwrap(), 10.0);
        assert_eq!(tai_minus_utc(2_441_317.4), Err(TimeError::UtcBefore1972));
    }

    #[test]
    fn j2000_in_utc() {
        // J2000.0 (2000-01-01T12:00:00 TT) is 2000-01-01T11:58:55.816 UTC
        // (TAI − UTC = 32 s then; common practice).
        let utc = convert(J2000_JD, Scale::Tt, Scale::Utc).unwrap();
        let c = calendar(utc, 3).unwrap();
        assert_eq!((c.hour, c.minute), (11, 58));
        assert!((c.second - 55.816).abs() < 1e-3, "{}", c.second);
    }

    #[test]
    fn tdb_minus_tt_stays_within_2_ms_and_round_trips() {
        // The periodic term's amplitude is 1.657 ms (Explanatory Supplement; from memory).
        let mut max: f64 = 0.0;
        for i in 0..400 {
            let jd = J2000_JD + f64::from(i) * 0.93;
            max = max.max(tdb_minus_tt(jd).abs());
            let tdb = convert(jd, Scale::Tt, Scale::Tdb).unwrap();
            assert!(close(
                convert(tdb, Scale::Tdb, Scale::Tt).unwrap(),
                jd,
                1e-6
            ));
        }
        assert!(max > 0.00165 && max < 0.00168, "{max}");
    }

    #[test]
    fn utc_round_trip_across_leap_seconds() {
        for text in [
            "2016-12-31T23:59:30Z",
            "2017-01-01T00:00:30Z",
            "1980-06-01T00:00:00Z",
            "2030-01-01T00:00:00Z",
        ] {
            let utc = parse_iso(text).unwrap();
            let tdb = convert(utc, Scale::Utc, Scale::Tdb).unwrap();
            let back = convert(tdb, Scale::Tdb, Scale::Utc).unwrap();
            assert!(close(back, utc, 1e-4), "{text}");
        }
    }

    #[test]
    fn unit_symbols_name_their_systems() {
        assert_eq!(system_of_unit("BJD_TDB"), Some((TimeSystem::BJD_TDB, None)));
        assert_eq!(system_of_unit("JD_UTC"), Some((TimeSystem::JD_UTC, None)));
        let (sys, assumed) = system_of_unit("JD").unwrap();
        assert_eq!(sys, TimeSystem::JD_UTC);
        assert!(assumed.is_some());
        assert_eq!(system_of_unit("BJD").unwrap().0, TimeSystem::BJD_TDB);
        assert_eq!(system_of_unit("d"), None);
        assert_eq!(system_of_unit("JD_XYZ"), None);
        for u in JD_UNITS {
            assert!(system_of_unit(u).is_some(), "{u}");
        }
        // au / c = 499.005 s (IAU 2012 B2, SI 2019): the ±8.3 min quoted.
        assert!((AU_LIGHT_TIME_S - 499.004_784).abs() < 1e-5);
    }
}

#[cfg(test)]
mod reference {
    use super::*;

    /// UTC timestamps converted by astropy.time (ERFA), recorded in
    /// `tests/reference/beyond.json` by `make_beyond_reference.py`.
    #[test]
    fn matches_astropy_time() {
        let json: serde_json::Value =
            serde_json::from_str(include_str!("../../../tests/reference/beyond.json")).unwrap();
        let cases = json["timescales"].as_array().unwrap();
        assert!(cases.len() >= 5);
        for c in cases {
            let utc = parse_iso(c["utc"].as_str().unwrap()).unwrap();
            let tt = convert(utc, Scale::Utc, Scale::Tt).unwrap();
            let want_tt = c["jd_tt"].as_f64().unwrap();
            // f64 Julian dates resolve ~40 µs; allow 0.2 ms.
            assert!(
                ((tt - want_tt) * DAY).abs() < 2e-4,
                "{c}: {}",
                (tt - want_tt) * DAY
            );
            // TDB − TT: two-term series against astropy's full series, within 30 µs.
            let want = c["tdb_minus_tt_s"].as_f64().unwrap();
            assert!(
                (tdb_minus_tt(tt) - want).abs() < 3e-5,
                "{c}: {}",
                tdb_minus_tt(tt)
            );
        }
    }
}
