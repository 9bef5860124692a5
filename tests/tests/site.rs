//! End-to-end tests of `syz ephemeris --site`, `--observable` and the `[site]` table, on the
//! invented example examples/orrin.syz.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use syzygy_e2e::{run, scratch, stderr, stdout};

const SITE: &[&str] = &[
    "ephemeris",
    "examples/orrin.syz",
    "b",
    "--from",
    "2027-03-01",
    "--count",
    "12",
    "--site",
    "28.76,-17.88,2300",
    "--format",
    "json",
];

fn json(args: &[&str]) -> serde_json::Value {
    let o = run(args);
    assert!(o.status.success(), "{}", stderr(&o));
    serde_json::from_str(&stdout(&o)).unwrap()
}

#[test]
fn a_site_gives_contacts_altitudes_and_whether_each_transit_is_seen() {
    let v = json(SITE);
    assert!((v["site"]["longitude_deg"].as_f64().unwrap() + 17.88).abs() < 1e-9);
    assert_eq!(v["site"]["min_altitude_deg"].as_f64(), Some(30.0));
    let ts = v["transits"].as_array().unwrap();
    assert_eq!(ts.len(), 12);
    let mut seen = 0;
    for t in ts {
        let c = &t["contacts"];
        let mid = t["jd"].as_f64().unwrap();
        let (i, e) = (
            c["ingress_jd"].as_f64().unwrap(),
            c["egress_jd"].as_f64().unwrap(),
        );
        assert!((mid - i - (e - mid)).abs() < 1e-9, "contacts are symmetric");
        // A hot Jupiter's T14 lies between one and five hours.
        assert!((1.0 / 24.0..5.0 / 24.0).contains(&(e - i)), "{}", e - i);
        assert!(c["sigma_days"].as_f64().unwrap() >= t["sigma_days"].as_f64().unwrap());
        let vis = &t["visibility"];
        let moments = vis["moments"].as_array().unwrap();
        let at: Vec<&str> = moments.iter().map(|m| m["at"].as_str().unwrap()).collect();
        assert_eq!(at, ["ingress", "mid", "egress"]);
        let ok = moments.iter().all(|m| {
            m["star_altitude_deg"].as_f64().unwrap() >= 30.0
                && m["sun_altitude_deg"].as_f64().unwrap() < -18.0
        });
        assert_eq!(vis["observable"].as_bool(), Some(ok));
        for m in moments {
            let up = m["star_altitude_deg"].as_f64().unwrap() >= 0.0;
            assert_eq!(m["airmass"].is_f64(), up);
        }
        seen += usize::from(ok);
    }
    assert!(seen > 0 && seen < 12, "{seen} of 12 seen");
    let assumed: Vec<&str> = v["assumptions"]
        .as_array()
        .unwrap()
        .iter()
        .map(|a| a.as_str().unwrap())
        .collect();
    assert!(assumed
        .iter()
        .any(|a| a.contains("proper motion is not applied")));
    assert!(assumed.iter().any(|a| a.contains("no refraction")));

    // --observable keeps exactly the observable ones, in order, and says how many.
    let mut args = SITE.to_vec();
    args.push("--observable");
    let w = json(&args);
    let kept: Vec<i64> = w["transits"]
        .as_array()
        .unwrap()
        .iter()
        .map(|t| t["n"].as_i64().unwrap())
        .collect();
    let expect: Vec<i64> = ts
        .iter()
        .filter(|t| t["visibility"]["observable"].as_bool().unwrap())
        .map(|t| t["n"].as_i64().unwrap())
        .collect();
    assert_eq!(kept, expect);
    assert!(w["assumptions"]
        .as_array()
        .unwrap()
        .iter()
        .any(|a| a.as_str().unwrap()
            == format!("--observable: {seen} of the 12 transits looked at are listed")));

    // The text output says the same.
    let o = run(&SITE[..SITE.len() - 2]);
    assert!(o.status.success(), "{}", stderr(&o));
    let text = stdout(&o);
    assert!(text.contains("east positive"), "{text}");
    assert_eq!(text.matches("  observable: ").count(), seen, "{text}");
    assert!(text.contains("ingress 2027-03-"), "{text}");
}

#[test]
fn the_project_file_site_is_used_and_the_flag_wins() {
    let dir = scratch("site");
    std::fs::copy(
        syzygy_e2e::root().join("examples/orrin.syz"),
        dir.join("orrin.syz"),
    )
    .unwrap();
    std::fs::write(
        dir.join("syzygy.toml"),
        "[site]\nlatitude = 28.76\nlongitude = -17.88\nelevation = 2300\n",
    )
    .unwrap();
    let file = dir.join("orrin.syz");
    let f = file.to_str().unwrap();
    let base = [
        "ephemeris",
        f,
        "b",
        "--from",
        "2027-03-01",
        "--count",
        "12",
        "--format",
        "json",
    ];
    let from_file = json(&base);
    let from_flag = json(SITE);
    assert_eq!(from_file["transits"], from_flag["transits"]);
    let mut south = base.to_vec();
    south.extend(["--site", "-30.2,-70.7"]);
    let other = json(&south);
    assert!((other["site"]["latitude_deg"].as_f64().unwrap() + 30.2).abs() < 1e-9);
    assert_ne!(other["transits"], from_flag["transits"]);
}

#[test]
fn a_site_without_a_sky_position_or_bad_flags_are_clear_errors() {
    let o = run(&[
        "ephemeris",
        "examples/veyra.syz",
        "b",
        "--site",
        "28.76,-17.88",
    ]);
    assert_eq!(o.status.code(), Some(1));
    let e = stderr(&o);
    assert!(
        e.contains("declares no right_ascension and declination"),
        "{e}"
    );
    assert!(e.contains("star veyra"), "{e}");
    let o = run(&["ephemeris", "examples/veyra.syz", "b", "--observable"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("--observable needs a site"));
    let o = run(&["ephemeris", "examples/orrin.syz", "b", "--site", "95,0"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("latitude 95"), "{}", stderr(&o));
    let o = run(&[
        "ephemeris",
        "examples/orrin.syz",
        "b",
        "--site",
        "28.76,-17.88",
        "--min-altitude",
        "91",
    ]);
    assert_eq!(o.status.code(), Some(2));
}

/// A longitude past 180 (east positive, as the flag reads it) is said as the west one it also
/// is: `200` is 160 degrees west.
#[test]
fn a_longitude_past_180_is_said_as_west_too() {
    let o = run(&[
        "ephemeris",
        "examples/orrin.syz",
        "b",
        "--count",
        "1",
        "--site",
        "28.7,200",
    ]);
    assert!(o.status.success(), "{}", stderr(&o));
    let out = stdout(&o);
    assert!(
        out.contains("longitude 200.0000° (east positive, i.e. 160.0000° west)"),
        "{out}"
    );
}
