//! Star and Sun altitudes from an observing site against astropy's, recorded by
//! tests/reference/make_site_reference.py into tests/reference/site.json (astropy 8.0.2,
//! bundled IERS-B table, no refraction).
//!
//! Tolerance: 2 arcminutes on altitudes, the budget the sky module documents (precession by
//! IAU 1976 without nutation, under 20 arcseconds; no aberration, under 21; the Sun's
//! low-precision formulae, about 1 arcminute; UT1 taken as UTC, under 14 arcseconds), with
//! room to spare; 20 arcseconds on Greenwich mean sidereal time, which differs from astropy's
//! only by UT1 − UTC (under 0.9 s of time, 13.5 arcseconds).

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use syzygy::sky::{gmst, Site};
use syzygy::time::{convert, Scale};

const ARCMIN: f64 = 1.0 / 60.0;

fn record() -> serde_json::Value {
    serde_json::from_str(include_str!("../../tests/reference/site.json")).unwrap()
}

#[test]
fn altitudes_agree_with_astropy_within_two_arcminutes() {
    let r = record();
    let deg = std::f64::consts::PI / 180.0;
    let site = &r["site"];
    let site = Site::from_degrees(
        site["latitude_deg"].as_f64().unwrap(),
        site["longitude_deg"].as_f64().unwrap(),
        site["elevation_m"].as_f64().unwrap(),
    )
    .unwrap();
    let ra = r["star"]["ra_deg"].as_f64().unwrap() * deg;
    let dec = r["star"]["dec_deg"].as_f64().unwrap() * deg;
    let rows = r["rows"].as_array().unwrap();
    assert!(rows.len() >= 5);
    let (mut worst_star, mut worst_sun, mut worst_gmst) = (0f64, 0f64, 0f64);
    for row in rows {
        let jd = row["jd_utc"].as_f64().unwrap();
        let tt = convert(jd, Scale::Utc, Scale::Tt).unwrap();
        let star = site.star_altitude(ra, dec, jd, tt) / deg;
        let sun = site.sun_altitude(jd, tt) / deg;
        let g = gmst(jd, tt) / deg;
        let d_star = (star - row["star_altitude_deg"].as_f64().unwrap()).abs();
        let d_sun = (sun - row["sun_altitude_deg"].as_f64().unwrap()).abs();
        let d_g = ((g - row["gmst_deg"].as_f64().unwrap() + 540.0).rem_euclid(360.0) - 180.0).abs();
        worst_star = worst_star.max(d_star);
        worst_sun = worst_sun.max(d_sun);
        worst_gmst = worst_gmst.max(d_g);
        assert!(
            d_star < 2.0 * ARCMIN,
            "{}: star off by {:.2} arcmin",
            row["utc"],
            d_star * 60.0
        );
        assert!(
            d_sun < 2.0 * ARCMIN,
            "{}: Sun off by {:.2} arcmin",
            row["utc"],
            d_sun * 60.0
        );
        assert!(
            d_g < 20.0 / 3600.0,
            "{}: GMST off by {:.1} arcsec",
            row["utc"],
            d_g * 3600.0
        );
    }
    // Printed with --nocapture, for the docs' figure.
    println!(
        "worst: star {:.2} arcmin, Sun {:.2} arcmin, GMST {:.1} arcsec",
        worst_star * 60.0,
        worst_sun * 60.0,
        worst_gmst * 3600.0
    );
}

fn analyse(src: &str) -> syzygy::Analysis {
    let mut db = syzygy::source::MemoryDb::new();
    let f = db.add("t.syz", src);
    syzygy::analyze(f, src, &syzygy::Settings::linear())
}

#[test]
fn sky_positions_are_declared_in_degrees_or_sexagesimal_text() {
    use syzygy::quantities::Qty;
    let a = analyse(
        "system \"Ostrel\" {\n  star s { right_ascension = \"13:25:23.3\"; declination = \"-00:30:00\" }\n  star t { ra = 201.3472 deg; dec = -12.04 deg }\n}\n",
    );
    assert!(a.diagnostics.is_empty(), "{:?}", a.diagnostics);
    let deg = std::f64::consts::PI / 180.0;
    let s = &a.results[0].bodies[0];
    let ra = s.get(Qty::RightAscension).unwrap().value / deg;
    assert!(
        (ra - 15.0 * (13.0 + 25.0 / 60.0 + 23.3 / 3600.0)).abs() < 1e-9,
        "{ra}"
    );
    assert!((s.get(Qty::Declination).unwrap().value / deg + 0.5).abs() < 1e-12);
    let t = &a.results[0].bodies[1];
    assert!((t.get(Qty::Declination).unwrap().value / deg + 12.04).abs() < 1e-12);
}

#[test]
fn a_bad_sky_position_is_an_invalid_value_that_says_why() {
    let a = analyse(
        "system \"Ostrel\" {\n  star s { right_ascension = \"13:61:00\"; declination = 95 deg }\n}\n",
    );
    let msgs: Vec<String> = a
        .diagnostics
        .iter()
        .map(|d| format!("{} {}", d.rule.id(), d.message))
        .collect();
    assert!(
        msgs.iter()
            .any(|m| m.starts_with("invalid-value") && m.contains("minutes must be below 60")),
        "{msgs:?}"
    );
    assert!(msgs.iter().any(|m| m.contains("declination")), "{msgs:?}");
}
