//! Where a star and the Sun stand in an observer's sky: sexagesimal coordinates, sidereal
//! time, the Sun's place, altitude and airmass. Pure functions of numbers and text; the
//! caller supplies the time.
//!
//! The error budget is about one arcminute, enough to tell whether a transit can be seen:
//! - Greenwich mean sidereal time from the Earth rotation angle and the IAU 2006 polynomial
//!   (Capitaine, Wallace & Chapront 2003, A&A 412, 567, eq. 42; from memory), with UT1
//!   taken equal to UTC (|UT1 − UTC| < 0.9 s, at most 14 arcseconds of hour angle).
//! - The star's ICRS place carried to the mean equator and equinox of date by the IAU 1976
//!   precession angles ζ, z, θ (Lieske et al. 1977; from memory). Nutation (under 20
//!   arcseconds), annual aberration (under 21 arcseconds), proper motion and the frame bias
//!   between ICRS and J2000 are not applied.
//! - The Sun from the Astronomical Almanac's low-precision formulae for the Sun (good to
//!   about 1 arcminute between 1950 and 2050; from memory), geocentric.
//! - Altitude from hour angle and declination, sin h = sin φ sin δ + cos φ cos δ cos H,
//!   geometric: no refraction (which lifts a star by about 1 arcminute at 45° and 35 at the
//!   horizon).
//! - Airmass by Kasten & Young (1989, Applied Optics 28, 4735; from memory), which stays
//!   finite at the horizon.

use std::f64::consts::{PI, TAU};

/// Julian date of J2000.0 (2000-01-01 12:00 TT).
const J2000: f64 = 2_451_545.0;
const DEG: f64 = PI / 180.0;
const ARCSEC: f64 = DEG / 3600.0;

/// What is wrong with a sexagesimal coordinate.
#[derive(Debug, Clone, PartialEq)]
pub struct SexagesimalError(pub String);

impl std::fmt::Display for SexagesimalError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(&self.0)
    }
}

/// Read `[+|-]A:B:C` (or `A B C`; `A:B` and `A` alone are also taken), each of the minutes
/// and seconds below 60, into a signed value in units of A. The sign is read from the text,
/// so "-00:30:00" is −0.5.
fn sexagesimal(text: &str, what: &str) -> Result<(bool, f64), SexagesimalError> {
    let t = text.trim();
    let err = |m: String| Err(SexagesimalError(m));
    let (negative, body) = match t.strip_prefix('-').or_else(|| t.strip_prefix('−')) {
        Some(rest) => (true, rest),
        None => (false, t.strip_prefix('+').unwrap_or(t)),
    };
    let parts: Vec<&str> = if body.contains(':') {
        body.split(':').collect()
    } else {
        body.split_whitespace().collect()
    };
    if parts.is_empty() || parts.len() > 3 {
        return err(format!(
            "'{t}' is not a sexagesimal {what}: expected A:B:C, such as \"13:25:23.3\""
        ));
    }
    let mut total = 0.0;
    for (i, p) in parts.iter().enumerate() {
        let p = p.trim();
        let last = i + 1 == parts.len();
        let ok = !p.is_empty()
            && p.chars().all(|c| c.is_ascii_digit() || c == '.')
            && (last || !p.contains('.'));
        let v: f64 = match p.parse() {
            Ok(v) if ok => v,
            _ => {
                return err(format!(
                    "'{t}' is not a sexagesimal {what}: '{p}' is not a number{}",
                    if last {
                        ""
                    } else {
                        " (only the last field may have decimals)"
                    }
                ))
            }
        };
        if i > 0 && v >= 60.0 {
            let field = if i == 1 { "minutes" } else { "seconds" };
            return err(format!("'{t}': {field} must be below 60, not {p}"));
        }
        total += v / 60f64.powi(i as i32);
    }
    Ok((negative, if negative { -total } else { total }))
}

/// A right ascension written in hours, minutes and seconds of time ("13:25:23.3"), in
/// radians, in [0, 2π).
pub fn parse_right_ascension(text: &str) -> Result<f64, SexagesimalError> {
    let (negative, hours) = sexagesimal(text, "right ascension")?;
    if negative || hours >= 24.0 {
        return Err(SexagesimalError(format!(
            "'{}': a right ascension in hours lies from 0 up to (not including) 24",
            text.trim()
        )));
    }
    Ok(hours * 15.0 * DEG)
}

/// A declination written in degrees, arcminutes and arcseconds ("-12:02:24"), in radians.
pub fn parse_declination(text: &str) -> Result<f64, SexagesimalError> {
    let (_, deg) = sexagesimal(text, "declination")?;
    if deg.abs() > 90.0 {
        return Err(SexagesimalError(format!(
            "'{}': a declination lies from -90 to +90 degrees",
            text.trim()
        )));
    }
    Ok(deg * DEG)
}

/// Greenwich mean sidereal time, radians in [0, 2π), at a UT1 Julian date, with `jd_tt`
/// for the slow polynomial: the Earth rotation angle (IAU 2000 B1.8) plus the IAU 2006
/// polynomial in TT centuries (Capitaine et al. 2003, eq. 42; from memory).
pub fn gmst(jd_ut1: f64, jd_tt: f64) -> f64 {
    let du = jd_ut1 - J2000;
    let era = TAU * (0.779_057_273_264_0 + 0.002_737_811_911_354_48 * du + du.fract());
    let t = (jd_tt - J2000) / 36_525.0;
    let poly = 0.014_506
        + t * (4_612.156_534
            + t * (1.391_581_7 + t * (-0.000_000_44 + t * (-0.000_029_956 - t * 0.000_000_036_8))));
    (era + poly * ARCSEC).rem_euclid(TAU)
}

/// An ICRS (J2000) place carried to the mean equator and equinox of a TT Julian date by the
/// IAU 1976 precession (Lieske et al. 1977; from memory): (α, δ) in radians.
pub fn precess(ra: f64, dec: f64, jd_tt: f64) -> (f64, f64) {
    let t = (jd_tt - J2000) / 36_525.0;
    let zeta = (2306.2181 * t + 0.30188 * t * t + 0.017998 * t * t * t) * ARCSEC;
    let z = (2306.2181 * t + 1.09468 * t * t + 0.018203 * t * t * t) * ARCSEC;
    let theta = (2004.3109 * t - 0.42665 * t * t - 0.041833 * t * t * t) * ARCSEC;
    let a = (dec.cos() * (ra + zeta).sin())
        .atan2(theta.cos() * dec.cos() * (ra + zeta).cos() - theta.sin() * dec.sin());
    let sin_d = theta.sin() * dec.cos() * (ra + zeta).cos() + theta.cos() * dec.sin();
    ((a + z).rem_euclid(TAU), sin_d.clamp(-1.0, 1.0).asin())
}

/// The Sun's apparent geocentric (α, δ) of date, radians, at a TT Julian date: the
/// Astronomical Almanac's low-precision formulae for the Sun (from memory; about 1
/// arcminute between 1950 and 2050).
pub fn sun(jd_tt: f64) -> (f64, f64) {
    let n = jd_tt - J2000;
    let l = (280.460 + 0.985_647_4 * n) * DEG;
    let g = (357.528 + 0.985_600_3 * n) * DEG;
    let lambda = l + (1.915 * g.sin() + 0.020 * (2.0 * g).sin()) * DEG;
    let eps = (23.439 - 0.000_000_4 * n) * DEG;
    let ra = (eps.cos() * lambda.sin()).atan2(lambda.cos());
    let dec = (eps.sin() * lambda.sin()).clamp(-1.0, 1.0).asin();
    (ra.rem_euclid(TAU), dec)
}

/// Geometric altitude, radians, of a place (α, δ) of date seen from latitude φ at local
/// sidereal time `lst` (all radians): sin h = sin φ sin δ + cos φ cos δ cos H, H = lst − α.
pub fn altitude(ra: f64, dec: f64, latitude: f64, lst: f64) -> f64 {
    let h = lst - ra;
    (latitude.sin() * dec.sin() + latitude.cos() * dec.cos() * h.cos())
        .clamp(-1.0, 1.0)
        .asin()
}

/// Airmass at a geometric altitude (radians) by Kasten & Young (1989; from memory):
/// X = 1 / (cos z + 0.50572 (96.07995° − z)^−1.6364), z the zenith distance in degrees.
/// `None` below the horizon, where no airmass applies.
pub fn airmass(alt: f64) -> Option<f64> {
    if !(alt.is_finite() && alt >= 0.0) {
        return None;
    }
    let z = 90.0 - alt / DEG;
    Some(1.0 / ((z * DEG).cos() + 0.50572 * (96.07995 - z).powf(-1.6364)))
}

/// An observing site: geodetic latitude and east longitude in radians, elevation in metres.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct Site {
    pub latitude: f64,
    pub longitude: f64,
    pub elevation_m: f64,
}

impl Site {
    /// A site from degrees (east longitude positive), checked.
    pub fn from_degrees(lat: f64, lon: f64, elevation_m: f64) -> Result<Site, String> {
        if !(lat.is_finite() && (-90.0..=90.0).contains(&lat)) {
            return Err(format!(
                "latitude {}: expected -90 to 90 degrees",
                crate::format::sig(lat, 6)
            ));
        }
        if !(lon.is_finite() && (-180.0..=360.0).contains(&lon)) {
            return Err(format!(
                "longitude {}: expected -180 to 360 degrees, east positive",
                crate::format::sig(lon, 6)
            ));
        }
        if !(elevation_m.is_finite() && (-500.0..=10_000.0).contains(&elevation_m)) {
            return Err(format!(
                "elevation {} m: expected -500 to 10000 metres",
                crate::format::sig(elevation_m, 6)
            ));
        }
        Ok(Site {
            latitude: lat * DEG,
            longitude: lon * DEG,
            elevation_m,
        })
    }

    /// Read `LAT,LON[,ELEV_M]` (degrees, east longitude positive; metres).
    pub fn parse(text: &str) -> Result<Site, String> {
        let nums: Result<Vec<f64>, _> = text.split(',').map(|p| p.trim().parse::<f64>()).collect();
        match nums.as_deref() {
            Ok([lat, lon]) => Site::from_degrees(*lat, *lon, 0.0),
            Ok([lat, lon, elev]) => Site::from_degrees(*lat, *lon, *elev),
            _ => Err(format!(
                "'{text}': expected LAT,LON or LAT,LON,ELEVATION_M (degrees, east longitude positive; metres)"
            )),
        }
    }

    /// Local mean sidereal time, radians.
    pub fn lst(&self, jd_ut1: f64, jd_tt: f64) -> f64 {
        (gmst(jd_ut1, jd_tt) + self.longitude).rem_euclid(TAU)
    }

    /// Altitude (radians) of an ICRS place (radians) at a UTC Julian date, with its TT.
    pub fn star_altitude(&self, ra: f64, dec: f64, jd_utc: f64, jd_tt: f64) -> f64 {
        let (a, d) = precess(ra, dec, jd_tt);
        altitude(a, d, self.latitude, self.lst(jd_utc, jd_tt))
    }

    /// The Sun's altitude (radians) at a UTC Julian date, with its TT.
    pub fn sun_altitude(&self, jd_utc: f64, jd_tt: f64) -> f64 {
        let (a, d) = sun(jd_tt);
        altitude(a, d, self.latitude, self.lst(jd_utc, jd_tt))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn sexagesimal_forms_are_read() {
        let ra = parse_right_ascension("13:25:23.3").unwrap() / DEG;
        assert!((ra - 15.0 * (13.0 + 25.0 / 60.0 + 23.3 / 3600.0)).abs() < 1e-9);
        assert!((parse_right_ascension("0 0 0").unwrap()).abs() < 1e-15);
        let dec = parse_declination("-12:02:24").unwrap() / DEG;
        assert!((dec + (12.0 + 2.0 / 60.0 + 24.0 / 3600.0)).abs() < 1e-9);
        // The sign belongs to the whole angle, also when the degrees are zero.
        assert!((parse_declination("-00:30:00").unwrap() / DEG + 0.5).abs() < 1e-12);
        assert!((parse_declination("+00:30").unwrap() / DEG - 0.5).abs() < 1e-12);
        assert!((parse_declination("45").unwrap() / DEG - 45.0).abs() < 1e-12);
        assert!((parse_declination("−5:00:00").unwrap() / DEG + 5.0).abs() < 1e-12);
    }

    #[test]
    fn bad_sexagesimal_forms_say_why() {
        let e = |r: Result<f64, SexagesimalError>| r.unwrap_err().0;
        assert!(e(parse_right_ascension("13:60:00")).contains("minutes must be below 60"));
        assert!(e(parse_declination("10:20:60.0")).contains("seconds must be below 60"));
        assert!(e(parse_right_ascension("24:00:00")).contains("up to (not including) 24"));
        assert!(e(parse_right_ascension("-01:00:00")).contains("from 0"));
        assert!(e(parse_declination("91:00:00")).contains("-90 to +90"));
        assert!(e(parse_declination("12.5:30:00")).contains("only the last field"));
        assert!(e(parse_declination("12:xx:00")).contains("not a number"));
        assert!(e(parse_declination("1:2:3:4")).contains("expected A:B:C"));
        assert!(e(parse_declination("")).contains("expected A:B:C"));
        assert!(e(parse_declination("--1:00:00")).contains("not a number"));
    }

    #[test]
    fn sidereal_time_at_j2000() {
        // GMST at 2000-01-01 12:00 UT1 is 18h 41m 50.548s = 280.46062 deg (IAU 1982 and
        // IAU 2006 expressions agree there to well under a second; from memory).
        let g = gmst(J2000, J2000) / DEG;
        assert!((g - 280.460_618).abs() < 2e-4, "{g}");
    }

    #[test]
    fn precession_over_a_century_moves_the_equinox_by_about_1_4_degrees() {
        // General precession in longitude is 5028.8 arcsec per century (IAU 1976; from
        // memory): the J2000 equinox, seen in the frame of a century later, lies near
        // RA ζ + z ≈ 4613.7 arcsec and declination θ ≈ 2004.3 arcsec.
        let (a, d) = precess(0.0, 0.0, J2000 + 36_525.0);
        assert!(((a / ARCSEC) - 4613.7).abs() < 5.0, "{}", a / ARCSEC);
        assert!(((d / ARCSEC) - 2004.3).abs() < 2.0, "{}", d / ARCSEC);
    }

    #[test]
    fn airmass_is_one_at_the_zenith_and_finite_at_the_horizon() {
        assert!((airmass(PI / 2.0).unwrap() - 1.0).abs() < 1e-3);
        // Kasten & Young give about 38 at the horizon (from memory).
        let h = airmass(0.0).unwrap();
        assert!((37.0..39.0).contains(&h), "{h}");
        assert!((airmass(30.0 * DEG).unwrap() - 1.995).abs() < 0.01);
        assert_eq!(airmass(-0.01), None);
    }

    #[test]
    fn sites_are_read_and_checked() {
        let s = Site::parse("28.76,-17.88,2300").unwrap();
        assert!((s.latitude / DEG - 28.76).abs() < 1e-12);
        assert!((s.longitude / DEG + 17.88).abs() < 1e-12);
        assert_eq!(s.elevation_m, 2300.0);
        assert_eq!(Site::parse("10, 20").unwrap().elevation_m, 0.0);
        assert!(Site::parse("95,0").unwrap_err().contains("latitude"));
        assert!(Site::parse("10").unwrap_err().contains("LAT,LON"));
        assert!(Site::parse("10,x").is_err());
    }
}
