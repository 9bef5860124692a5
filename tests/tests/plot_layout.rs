//! The layout of `syz plot` figures: on invented catalogues of 3, 20 and 60 planets no two
//! lines of text overlap, every planet is drawn and every label that did not fit is named
//! in the text output; the README's figure is what the command printed under it draws.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use syzygy::plots::labels::{text_size, Rect, ASCENT};
use syzygy_e2e::{root, run, scratch, stderr, stdout};

/// Invented system names (no real star is called this).
const NAMES: [&str; 16] = [
    "Qorvath", "Ulmeris", "Zendrik", "Yssolde", "Wexmoor", "Tirrasc", "Pellvane", "Morquill",
    "Lisstra", "Krovane", "Joskerel", "Haldrin", "Gwenthos", "Fyrrund", "Evrasca", "Drummelt",
];

/// A catalogue of `systems` invented systems with `per` planets each, masses spread over
/// Earths to Jupiters and radii near a rough mass–radius relation, from a fixed sequence
/// of pseudo-random numbers (so the files are the same on every run).
fn catalogue(systems: usize, per: usize) -> String {
    let mut state: u64 = 0x5eed_1234_abcd_0042;
    let mut next = move || {
        state = state
            .wrapping_mul(6_364_136_223_846_793_005)
            .wrapping_add(1_442_695_040_888_963_407);
        (state >> 11) as f64 / (1u64 << 53) as f64
    };
    let mut text = String::from("# Invented systems for layout tests. All numbers are made up.\n");
    for s in 0..systems {
        let name = NAMES[s % NAMES.len()];
        let name = if s >= NAMES.len() {
            format!("{name} {}", s / NAMES.len() + 1)
        } else {
            name.to_string()
        };
        text.push_str(&format!(
            "system \"{name}\" {{\n  star host {{ mass = {:.2} ± 0.03 Msun; radius = {:.2} ± 0.02 Rsun; teff = 5400 ± 80 K }}\n",
            0.7 + 0.5 * next(),
            0.7 + 0.5 * next()
        ));
        for p in 0..per {
            // Clusters like real catalogues: many sub-Neptunes, some giants.
            let u = next();
            let mass = if u < 0.65 {
                10f64.powf(0.2 + 1.2 * next())
            } else {
                10f64.powf(1.8 + 1.1 * next())
            };
            let radius = if mass < 60.0 {
                mass.powf(0.55) * (0.8 + 0.5 * next())
            } else {
                9.0 + 5.0 * next()
            };
            let id = (b'b' + p as u8) as char;
            text.push_str(&format!(
                "  planet {id} orbits host {{\n    period = {:.3} ± 0.001 d\n    mass = {:.2} ± {:.2} Mearth\n    radius = {:.2} ± {:.2} Rearth\n  }}\n",
                2.0 + 3.0 * (p as f64 + 1.0) * (1.0 + next()),
                mass,
                mass * (0.05 + 0.15 * next()),
                radius,
                radius * (0.02 + 0.06 * next())
            ));
        }
        text.push_str("}\n");
    }
    text
}

/// The box of every line of text in an SVG, estimated as the layout estimates it: the
/// width from the character count and font size, the top `ASCENT` font sizes above the
/// baseline; quarter-turned text (the y axis's name) turned with it. A label's white halo
/// (a copy drawn under it, marked `aria-hidden`) is not a line of its own.
fn text_boxes(svg: &str) -> Vec<(String, Rect)> {
    let doc = roxmltree::Document::parse(svg).expect("the SVG parses as XML");
    doc.descendants()
        .filter(|n| n.has_tag_name("text") && n.attribute("aria-hidden") != Some("true"))
        .map(|n| {
            let text = n.text().unwrap_or("").to_string();
            let num = |a: &str| n.attribute(a).unwrap().parse::<f64>().unwrap();
            let (x, y, size) = (num("x"), num("y"), num("font-size"));
            let (w, h) = text_size(&text, size);
            let left = match n.attribute("text-anchor").unwrap_or("start") {
                "middle" => x - w / 2.0,
                "end" => x - w,
                _ => x,
            };
            let r = if n
                .attribute("transform")
                .is_some_and(|t| t.starts_with("rotate(-90"))
            {
                // Turned about (x, y): the baseline runs up through x, the text's height
                // lies to its left.
                Rect::new(
                    x - ASCENT * h,
                    y - w / 2.0,
                    x + (1.0 - ASCENT) * h,
                    y + w / 2.0,
                )
            } else {
                Rect::new(left, y - ASCENT * size, left + w, y - ASCENT * size + h)
            };
            (text, r)
        })
        .collect()
}

fn assert_no_text_overlaps(svg: &str, what: &str) {
    let boxes = text_boxes(svg);
    assert!(boxes.len() > 20, "{what}: only {} texts", boxes.len());
    for (i, (a, ra)) in boxes.iter().enumerate() {
        for (b, rb) in boxes.iter().skip(i + 1) {
            assert!(
                !ra.overlaps(rb),
                "{what}: '{a}' {ra:?} overlaps '{b}' {rb:?}"
            );
        }
    }
}

/// Draw the mass–radius diagram of a catalogue; returns the SVG and the two outputs.
fn mass_radius(systems: usize, per: usize, name: &str) -> (String, String, String) {
    let dir = scratch(name);
    let file = dir.join(format!("{name}.syz"));
    std::fs::write(&file, catalogue(systems, per)).unwrap();
    let out = dir.join(format!("{name}.svg"));
    let o = run(&[
        "plot",
        "mass-radius",
        file.to_str().unwrap(),
        "-o",
        out.to_str().unwrap(),
    ]);
    assert!(o.status.success(), "{}", stderr(&o));
    (
        std::fs::read_to_string(&out).unwrap(),
        stdout(&o),
        stderr(&o),
    )
}

fn check_catalogue(systems: usize, per: usize, name: &str) {
    let (svg, out, err) = mass_radius(systems, per, name);
    assert_no_text_overlaps(&svg, name);
    let texts: Vec<String> = text_boxes(&svg).into_iter().map(|(t, _)| t).collect();
    let n = systems * per;
    assert!(
        out.starts_with(&format!(
            "Mass–radius diagram: {n} planets of {systems} system{}",
            if systems == 1 { "" } else { "s" }
        )),
        "{out}"
    );
    // Every planet is in the text output; each is labelled on the figure or said not to be,
    // on both outputs.
    let mut unlabelled = 0;
    for line in out.lines().filter(|l| l.starts_with("  ")) {
        let label = line.trim_start().split([':', '[']).next().unwrap().trim();
        let on_figure = texts.iter().any(|t| t == label);
        let said = line.contains("[label not drawn: no room]");
        assert!(
            on_figure != said,
            "{label}: on figure {on_figure}, said {said}"
        );
        if said {
            unlabelled += 1;
            assert!(err.contains(label), "{label} not named on stderr: {err}");
        }
    }
    assert_eq!(out.lines().filter(|l| l.starts_with("  ")).count(), n);
    if unlabelled > 0 {
        assert!(
            texts
                .iter()
                .any(|t| t.contains("not drawn for lack of room")),
            "the caption counts the labels left off"
        );
    }
    // One marker per planet: markers are the filled shapes with a white edge.
    let markers = svg
        .matches("stroke=\"#ffffff\" stroke-width=\"1.3\"")
        .count();
    assert_eq!(markers, n + systems.min(20) + usize::from(systems > 20));
    // The image keeps a short caption: per-planet words are not on it.
    assert!(!texts
        .iter()
        .any(|t| t.contains("larger than Earth-like rock")));
}

#[test]
fn three_planets_are_labelled_without_overlaps() {
    check_catalogue(1, 3, "layout-3");
}

#[test]
fn twenty_planets_are_labelled_without_overlaps() {
    check_catalogue(5, 4, "layout-20");
}

#[test]
fn sixty_planets_are_labelled_without_overlaps() {
    check_catalogue(12, 5, "layout-60");
}

#[test]
fn the_overlap_check_finds_overlapping_text() {
    // The check itself can fail: two lines at the same place.
    let svg = "<svg xmlns=\"http://www.w3.org/2000/svg\"><text x=\"10\" y=\"20\" font-size=\"12\">Qorvath b</text><text x=\"30\" y=\"24\" font-size=\"12\" text-anchor=\"start\">Qorvath c</text></svg>";
    let boxes = text_boxes(svg);
    assert!(boxes[0].1.overlaps(&boxes[1].1));
}

#[test]
fn model_plots_do_not_overlap_text_and_say_each_assumption_once() {
    let dir = scratch("layout-models");
    for (kind, extra) in [
        ("rv", None),
        ("transit", None),
        ("transit", Some("0.5,0.1")),
    ] {
        let out = dir.join(format!("{kind}.svg"));
        let mut args = vec![
            "plot",
            kind,
            "examples/veyra.syz",
            "b",
            "-o",
            out.to_str().unwrap(),
        ];
        if let Some(ld) = extra {
            args.extend(["--limb-darkening", ld]);
        }
        let o = run(&args);
        assert!(o.status.success(), "{}", stderr(&o));
        let svg = std::fs::read_to_string(&out).unwrap();
        assert_no_text_overlaps(&svg, kind);
        let texts: Vec<String> = text_boxes(&svg).into_iter().map(|(t, _)| t).collect();
        let all = texts.join(" ");
        // The limb darkening is said once: given, or none.
        let limb = if extra.is_some() {
            "u1 = "
        } else {
            "no limb darkening"
        };
        for once in ["0-360 deg", limb] {
            if kind == "rv" && once == limb {
                continue;
            }
            assert_eq!(all.matches(once).count(), 1, "'{once}' in {all}");
        }
        // Tick labels are clean: no "60.0" where "60" says it, one number of decimals.
        for t in &texts {
            let is_number = !t.is_empty()
                && t.trim_start_matches('\u{2212}')
                    .chars()
                    .all(|c| c.is_ascii_digit() || c == '.');
            if is_number && t.contains('.') {
                let decimals = t.len() - t.find('.').unwrap() - 1;
                let same = texts
                    .iter()
                    .filter(|u| u.contains('.') && u.len() - u.find('.').unwrap() - 1 == decimals);
                assert!(
                    same.count() >= 3,
                    "tick '{t}' alone with {decimals} decimals"
                );
                assert!(
                    !t.ends_with(".0") || texts.iter().any(|u| u.ends_with(".5")),
                    "{t}"
                );
            }
        }
    }
}

#[test]
fn the_readme_figure_is_what_the_command_under_it_draws() {
    let readme = std::fs::read_to_string(root().join("README.md")).unwrap();
    // "The diagram above is `syz plot mass-radius ... -o docs/img/<name>.svg`."
    let start = readme
        .find("The diagram above is `syz ")
        .expect("the README names its command");
    let command = &readme[start + "The diagram above is `syz ".len()..];
    let command = &command[..command.find('`').unwrap()];
    let args: Vec<&str> = command.split_whitespace().collect();
    let o_at = args.iter().position(|a| *a == "-o").unwrap();
    let committed = args[o_at + 1];
    assert!(
        readme.contains(&format!("]({committed})")),
        "the README shows {committed}"
    );
    let dir = scratch("readme-figure");
    let fresh = dir.join("figure.svg");
    let mut args: Vec<&str> = args.clone();
    let fresh_s = fresh.to_str().unwrap().to_string();
    args[o_at + 1] = &fresh_s;
    let o = run(&args);
    assert!(o.status.success(), "{}", stderr(&o));
    let now = std::fs::read_to_string(&fresh).unwrap();
    let then = std::fs::read_to_string(root().join(committed)).unwrap();
    assert!(
        now == then,
        "{committed} is stale: regenerate it with `syz {command}`"
    );
    // The paragraph under it counts what it draws.
    let planets = stdout(&o)
        .lines()
        .next()
        .unwrap()
        .split(' ')
        .nth(2)
        .unwrap()
        .to_string();
    let flat = readme.split_whitespace().collect::<Vec<_>>().join(" ");
    assert!(
        flat.contains(&format!("draws the {planets} demo planets")),
        "the README should say it draws {planets} planets"
    );
}

/// The radial-velocity curve's time axis counts from inferior conjunction; only for a
/// planet that transits is that the mid-transit (Veyra b transits, Veyra c is seen in
/// radial velocities only).
#[test]
fn the_rv_time_axis_says_mid_transit_only_for_a_transiting_planet() {
    let dir = scratch("rv-axis");
    for (planet, axis) in [
        ("b", "time from mid-transit (inferior conjunction) [days]"),
        ("c", "time from inferior conjunction [days]"),
    ] {
        let out = dir.join(format!("{planet}.svg"));
        let o = run(&[
            "plot",
            "rv",
            "examples/veyra.syz",
            planet,
            "-o",
            out.to_str().unwrap(),
        ]);
        assert!(o.status.success(), "{}", stderr(&o));
        let texts: Vec<String> = text_boxes(&std::fs::read_to_string(&out).unwrap())
            .into_iter()
            .map(|(t, _)| t)
            .collect();
        assert!(texts.iter().any(|t| t == axis), "{planet}: {texts:?}");
    }
}

/// A planet clear of its star's disc (b = 3.4 > 1 + Rp/R*) has no transit to draw: the
/// command says so and exits 1, rather than drawing a flat line titled "Transit of ...".
#[test]
fn a_planet_that_does_not_transit_has_no_transit_plot() {
    let dir = scratch("no-transit");
    let file = dir.join("dunmere.syz");
    std::fs::write(
        &file,
        "# Invented.\nsystem \"Dunmere\" {\n  star dunmere { mass = 1.0 ± 0.04 Msun; radius = 1.0 ± 0.03 Rsun; teff = 5700 ± 80 K }\n  planet b orbits dunmere { period = 10 ± 0.001 d; radius = 1.0 ± 0.05 Rjup; mass = 1.0 ± 0.1 Mjup; inclination = 80 ± 0.5 deg }\n}\n",
    )
    .unwrap();
    let out = dir.join("t.svg");
    let o = run(&[
        "plot",
        "transit",
        file.to_str().unwrap(),
        "b",
        "-o",
        out.to_str().unwrap(),
    ]);
    assert_eq!(o.status.code(), Some(1), "{}", stderr(&o));
    assert!(
        stderr(&o).contains("Dunmere b does not transit"),
        "{}",
        stderr(&o)
    );
    assert!(!out.exists());
}
