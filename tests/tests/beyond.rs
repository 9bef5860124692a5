//! End-to-end tests of `syz plot` and `syz ephemeris` on the demo examples.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use syzygy_e2e::{root, run, scratch, stderr, stdout};

fn texts(svg: &str) -> Vec<String> {
    let doc = roxmltree::Document::parse(svg).expect("the SVG parses as XML");
    assert_eq!(doc.root_element().tag_name().name(), "svg");
    doc.descendants()
        .filter(|n| n.has_tag_name("text"))
        .map(|n| n.text().unwrap_or("").trim().to_string())
        .collect()
}

#[test]
fn mass_radius_diagram_is_valid_svg_with_labels_and_legend() {
    let dir = scratch("mass-radius");
    let out = dir.join("mr.svg");
    let o = run(&[
        "plot",
        "mass-radius",
        "examples/",
        "-o",
        out.to_str().unwrap(),
    ]);
    assert!(o.status.success(), "{}", stderr(&o));
    // Only the file -o names is written.
    let written: Vec<_> = std::fs::read_dir(&dir).unwrap().collect();
    assert_eq!(written.len(), 1);
    let svg = std::fs::read_to_string(&out).unwrap();
    let t = texts(&svg);
    let has = |s: &str| t.iter().any(|x| x.contains(s));
    for want in [
        "planet mass [Earth masses, M⊕]",
        "planet radius [Earth radii, R⊕]",
        "100% iron (Fe, ε phase) — Seager et al. 2007",
        "Earth-like rock (32.5% iron core) — Zeng et al. 2016",
        "100% water ice — Seager et al. 2007",
        "Solar System planets (NASA GSFC planetary fact sheets)",
        "planets in the files (1σ error bars)",
        "water ice",
        "Jupiter",
        "Earth",
        "Corvane b",
        "Veyra b",
    ] {
        assert!(has(want), "missing text '{want}' in {t:?}");
    }
    // Planets without a radius are named on stderr, not drawn.
    assert!(stderr(&o).contains("Veyra c: no radius"), "{}", stderr(&o));
}

#[test]
fn rv_and_transit_plots_show_their_inputs_and_limb_darkening() {
    let dir = scratch("models");
    let rv = dir.join("rv.svg");
    let o = run(&[
        "plot",
        "rv",
        "examples/veyra.syz",
        "b",
        "-o",
        rv.to_str().unwrap(),
    ]);
    assert!(o.status.success(), "{}", stderr(&o));
    let t = texts(&std::fs::read_to_string(&rv).unwrap());
    assert!(
        t.iter()
            .any(|x| x.contains("stellar radial velocity [m/s]")),
        "{t:?}"
    );
    assert!(
        t.iter()
            .any(|x| x.contains("rv_amplitude = 56.0 ± 2.0 m/s")),
        "{t:?}"
    );

    let tr = dir.join("tr.svg");
    let o = run(&[
        "plot",
        "transit",
        "examples/veyra.syz",
        "b",
        "-o",
        tr.to_str().unwrap(),
    ]);
    assert!(o.status.success(), "{}", stderr(&o));
    let t = texts(&std::fs::read_to_string(&tr).unwrap());
    assert!(t.iter().any(|x| x.contains("relative flux")));
    assert!(
        t.iter()
            .any(|x| x.contains("no limb darkening (a uniform stellar disc")),
        "{t:?}"
    );

    let o = run(&[
        "plot",
        "transit",
        "examples/veyra.syz",
        "b",
        "-o",
        tr.to_str().unwrap(),
        "--limb-darkening",
        "0.5,0.1",
    ]);
    assert!(o.status.success(), "{}", stderr(&o));
    let t = texts(&std::fs::read_to_string(&tr).unwrap());
    assert!(
        t.iter().any(|x| x.contains("u1 = 0.5, u2 = 0.1 (given)")),
        "{t:?}"
    );
}

#[test]
fn plot_errors_are_clear() {
    let dir = scratch("plot-errors");
    let o = run(&[
        "plot",
        "rv",
        "examples/veyra.syz",
        "zz",
        "-o",
        dir.join("a.svg").to_str().unwrap(),
    ]);
    assert_eq!(o.status.code(), Some(1));
    assert!(stderr(&o).contains("no body 'zz'"));
    // A body an error hides: the message says the file has errors (it said only "no body").
    let hidden = dir.join("hidden.syz");
    std::fs::write(
        &hidden,
        "system \"H\" {\n  star s { mass = 1 Msun }\n  plnaet c orbits s { period = 3 d }\n}\n",
    )
    .unwrap();
    let o = run(&["explain", hidden.to_str().unwrap(), "c.period"]);
    assert_ne!(o.status.code(), Some(0));
    assert!(
        stderr(&o).contains("no body 'c'") && stderr(&o).contains("the file has 1 error"),
        "{}",
        stderr(&o)
    );
    let o = run(&[
        "plot",
        "rv",
        "examples/veyra.syz",
        "b",
        "-o",
        dir.join("a.png").to_str().unwrap(),
    ]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("only SVG"));
    let o = run(&[
        "plot",
        "transit",
        "examples/veyra.syz",
        "b",
        "-o",
        dir.join("a.svg").to_str().unwrap(),
        "--limb-darkening",
        "0.5",
    ]);
    // A wrong argument: exit 2, as the README's exit statuses say.
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("two numbers"), "{}", stderr(&o));
    let o = run(&[
        "plot",
        "transit",
        "examples/veyra.syz",
        "b",
        "-o",
        dir.join("a.svg").to_str().unwrap(),
        "--limb-darkening=1e308,1e308",
    ]);
    assert_eq!(o.status.code(), Some(2));
    assert!(
        stderr(&o).contains("1e308, 1e308: unphysical"),
        "{}",
        stderr(&o)
    );
    // Veyra c has no radius ratio: no transit model, and nothing written.
    let o = run(&[
        "plot",
        "transit",
        "examples/veyra.syz",
        "c",
        "-o",
        dir.join("c.svg").to_str().unwrap(),
    ]);
    assert_eq!(o.status.code(), Some(1));
    assert!(!dir.join("c.svg").exists());
}

#[test]
fn ephemeris_lists_transits_with_growing_uncertainty() {
    let o = run(&[
        "ephemeris",
        "examples/veyra.syz",
        "b",
        "--from",
        "2027-01-01",
        "--count",
        "3",
        "--format",
        "json",
    ]);
    assert!(o.status.success(), "{}", stderr(&o));
    let v: serde_json::Value = serde_json::from_str(&stdout(&o)).unwrap();
    let ts = v["transits"].as_array().unwrap();
    assert_eq!(ts.len(), 3);
    // Veyra b: T0 = 2460123.4567 ± 0.0004 BJD_TDB, P = 3.52474 ± 0.00002 d (the example).
    for t in ts {
        let n = t["n"].as_f64().unwrap();
        let jd = t["jd"].as_f64().unwrap();
        assert!((jd - (2_460_123.456_7 + n * 3.52474)).abs() < 1e-6);
        let sigma = (0.0004f64.powi(2) + (n * 0.00002).powi(2)).sqrt();
        assert!((t["sigma_days"].as_f64().unwrap() - sigma).abs() < 1e-12);
        // UTC = TDB − 69.184 s − (TDB − TT), within 2 ms.
        let dt = (jd - t["jd_utc"].as_f64().unwrap()) * 86_400.0;
        assert!((dt - 69.184).abs() < 0.002, "{dt}");
        assert!(t["utc"].as_str().unwrap().starts_with("2027-01-"));
    }
    let first = ts[0]["jd_utc"].as_f64().unwrap();
    assert!((2_461_406.5..2_461_406.5 + 3.53).contains(&first));
    let assumed = v["assumptions"].as_array().unwrap();
    assert!(assumed
        .iter()
        .any(|a| a.as_str().unwrap().contains("±8.3 min")));

    assert_eq!(v["warnings"].as_array().map(Vec::len), Some(0), "{v}");

    let o = run(&["ephemeris", "examples/veyra.syz", "b", "--count", "2"]);
    assert!(o.status.success());
    assert!(stdout(&o).contains("mid-transit (UTC)"), "{}", stdout(&o));

    // A period known to 2 %: after 141 orbits the uncertainty is 28 days, almost three
    // periods, which the listing says instead of printing 40,608 minutes as a prediction.
    let dir = scratch("lost-ephemeris");
    let file = dir.join("lost.syz");
    std::fs::write(
        &file,
        "system \"Vellum\" {\n  star v { mass = 0.9 ± 0.02 Msun; radius = 0.9 ± 0.02 Rsun }\n  planet b orbits v {\n    period = 10.0 ± 0.2 d\n    transit_epoch = 2460000.5 ± 0.01 BJD_TDB\n  }\n}\n",
    )
    .unwrap();
    let path = file.to_str().unwrap();
    let o = run(&[
        "ephemeris",
        path,
        "b",
        "--from",
        "2027-01-01",
        "--count",
        "1",
    ]);
    assert!(o.status.success(), "{}", stderr(&o));
    let text = stdout(&o);
    assert!(text.contains("28.2 d"), "{text}");
    assert!(!text.contains("40608"), "{text}");
    assert!(
        text.contains("warning: the ephemeris is lost from transit n = 141 on"),
        "{text}"
    );

    let o = run(&["ephemeris", "examples/veyra.syz", "c"]);
    assert_eq!(o.status.code(), Some(1));
    assert!(stderr(&o).contains("declares no transit_epoch"));
    let o = run(&["ephemeris", "examples/veyra.syz", "b", "--from", "soon"]);
    assert_eq!(o.status.code(), Some(2));
    // A period far too short for the date blames the period, not the date.
    let tiny = dir.join("tiny.syz");
    std::fs::write(
        &tiny,
        "system \"Mote\" {\n  star s { mass = 1 Msun; radius = 1 Rsun }\n  planet b orbits s { period = 1e-300 d; transit_epoch = 2460000.5 BJD_TDB }\n}\n",
    )
    .unwrap();
    let o = run(&["ephemeris", tiny.to_str().unwrap(), "b", "--count", "1"]);
    assert_eq!(o.status.code(), Some(1));
    assert!(
        stderr(&o).contains("check the period's unit"),
        "{}",
        stderr(&o)
    );
    assert!(!stderr(&o).contains("Julian date"), "{}", stderr(&o));
    // A --from the listing cannot start at is the option's fault (exit 2), said plainly.
    let o = run(&[
        "ephemeris",
        "examples/veyra.syz",
        "b",
        "--from",
        "1960-01-01",
    ]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("before 1972-01-01"), "{}", stderr(&o));
    assert!(!stderr(&o).contains("TT or TDB"), "{}", stderr(&o));
    let o = run(&["ephemeris", "examples/veyra.syz", "b", "--from", "1e300"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("1.000e300"), "{}", stderr(&o));
}

#[test]
fn spectral_type_estimates_show_in_eval_json() {
    let o = run(&["eval", "--format", "json", "examples/corvane.syz"]);
    assert!(o.status.success(), "{}", stderr(&o));
    let v: serde_json::Value = serde_json::from_str(&stdout(&o)).unwrap();
    let star = &v["systems"][0]["bodies"][0]["quantities"];
    for q in ["mass", "radius", "teff"] {
        assert_eq!(star[q]["origin"], "estimated", "{q}");
        // The estimate in a line of its own, the table and the uncertainty model in one line
        // shared by the three estimates.
        let words: Vec<&str> = star[q]["assumptions"]
            .as_array()
            .unwrap()
            .iter()
            .filter_map(|a| a.as_str())
            .collect();
        let own = format!("corvane.{q} = ");
        assert!(
            words
                .iter()
                .any(|w| w.starts_with(&own) && w.ends_with("estimated from spectral type M3.5V")),
            "{words:?}"
        );
        assert!(
            words
                .iter()
                .any(|w| w.starts_with("estimates from a spectral type: ")
                    && w.contains("Pecaut & Mamajek 2013")),
            "{words:?}"
        );
    }
    // M3.5V: the table's own row, 3270 K (Mamajek's mean dwarf table, version 2024.05.15);
    // the value shown is a Monte Carlo median.
    let teff = star["teff"]["value"].as_f64().unwrap();
    assert!((teff - 3270.0).abs() < 5.0, "{teff}");
    // The estimate's assumption follows into what is derived from it.
    let planet = &v["systems"][0]["bodies"][1]["quantities"]["radius"];
    assert!(planet["assumptions"]
        .as_array()
        .unwrap()
        .iter()
        .any(|a| a.as_str().unwrap().contains("estimated from spectral type")));
}

#[test]
fn a_folder_with_an_unreadable_file_is_plotted_from_the_rest_and_exits_2() {
    // As `check` and `eval` do for the same folder: the rest is used, the status says not all.
    let dir = scratch("plot-unreadable");
    std::fs::copy(root().join("examples/veyra.syz"), dir.join("veyra.syz")).unwrap();
    std::fs::write(dir.join("broken.syz"), [0xff, 0xfe, 0x00]).unwrap();
    let svg = dir.join("mr.svg");
    let o = run(&[
        "plot",
        "mass-radius",
        dir.to_str().unwrap(),
        "-o",
        svg.to_str().unwrap(),
    ]);
    assert_eq!(o.status.code(), Some(2), "{}", stderr(&o));
    assert!(stderr(&o).contains("broken.syz"), "{}", stderr(&o));
    assert!(std::fs::read_to_string(&svg).unwrap().contains("Veyra b"));
    let o = run(&["check", dir.to_str().unwrap()]);
    assert_eq!(o.status.code(), Some(2), "{}", stderr(&o));
}

/// A plot from a file with errors says so, on stderr and in the caption (a planet hidden by a
/// misspelt keyword was left out of the figure without a word); a mass error bar reaching
/// below zero is said to be cut at the edge (it ran to the edge in silence).
#[test]
fn a_mass_radius_diagram_says_what_errors_and_cut_bars_hide() {
    let dir = scratch("plot-input-errors");
    let file = dir.join("halm.syz");
    std::fs::write(
        &file,
        "system \"Halm\" {\n  star h { mass = 0.8 ± 0.02 Msun; radius = 0.8 ± 0.02 Rsun; teff = 5000 ± 50 K }\n  planet b orbits h { period = 3 ± 0.01 d; mass = 5 ± 1 Mearth; radius = 2 ± 0.1 Rearth }\n  plnaet c orbits h { period = 9 ± 0.01 d; mass = 8 ± 1 Mearth; radius = 2.5 ± 0.1 Rearth }\n  planet d orbits h { period = 5 ± 0.01 d; mass = 5 ± 20 Mearth; radius = 2 ± 0.1 Rearth }\n}\n",
    )
    .unwrap();
    let out = dir.join("mr.svg");
    let o = run(&[
        "plot",
        "mass-radius",
        file.to_str().unwrap(),
        "-o",
        out.to_str().unwrap(),
    ]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let err = stderr(&o);
    assert!(err.contains("the input has 1 error"), "{err}");
    assert!(
        err.contains("Halm d: the mass error bar reaches below zero"),
        "{err}"
    );
    assert!(!err.contains("Halm b: the mass error bar"), "{err}");
    let t = texts(&std::fs::read_to_string(&out).unwrap()).join(" ");
    assert!(t.contains("The input has 1 error"), "{t}");
    assert!(t.contains("1 error bar is cut at the edge"), "{t}");
}

/// The largest signal an amplitude limit allows is one curve: no band is drawn, so neither
/// the legend nor the caption speaks of one (they did).
#[test]
fn an_rv_plot_of_an_amplitude_limit_speaks_of_no_band() {
    let dir = scratch("plot-rv-limit");
    let file = dir.join("limit.syz");
    std::fs::write(
        &file,
        "system \"Quell\" {\n  star quell { mass = 0.8 ± 0.03 Msun }\n  planet b orbits quell {\n    period = 12.5 ± 0.01 d\n    rv_amplitude < 5 m/s\n  }\n}\n",
    )
    .unwrap();
    let svg = dir.join("limit.svg");
    let o = run(&[
        "plot",
        "rv",
        file.to_str().unwrap(),
        "b",
        "-o",
        svg.to_str().unwrap(),
    ]);
    assert!(o.status.success(), "{}", stderr(&o));
    let t = texts(&std::fs::read_to_string(&svg).unwrap());
    assert!(t.iter().any(|x| x.contains("largest signal")), "{t:?}");
    assert!(!t.iter().any(|x| x.contains("band")), "{t:?}");
}
