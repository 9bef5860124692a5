//! Every message a user meets leads to the fix: the rendered diagnostics without colour, the
//! advice of `syz explain`, the error of `syz ephemeris`, and the key order the JSON
//! contract describes, checked on the real binary.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use syzygy_e2e::{run, scratch, stderr, stdout};

const SLIPS: &str = "tests/fixtures/check/value-slips.syz";

/// The line under the source line that ends with `source`, in `out`.
fn mark_under(out: &str, source: &str) -> String {
    let lines: Vec<&str> = out.lines().collect();
    let at = lines
        .iter()
        .position(|l| l.ends_with(source))
        .unwrap_or_else(|| panic!("no line ending {source:?} in\n{out}"));
    lines[at + 1].to_string()
}

#[test]
fn without_colour_every_primary_span_is_underlined() {
    let o = run(&["check", SLIPS]);
    let out = stdout(&o);
    assert!(!out.contains('\u{1b}'), "colour with NO_COLOR set: {out}");
    // The unit written in Celsius: one character, marked where the arrow leaves it.
    let src_line = "    teq           = 1500 ± 30 C";
    let mark = mark_under(&out, src_line);
    let column = src_line.chars().count() - 1;
    let margin = out
        .lines()
        .find(|l| l.ends_with(src_line))
        .unwrap()
        .chars()
        .count()
        - src_line.chars().count();
    assert_eq!(mark.chars().nth(margin + column), Some('┬'), "{out}");
    // A longer span: a run of underline under the whole uncertainty.
    let mark = mark_under(&out, "    mass          = 0.40 ± 0.05 ± 0.02 Mjup");
    assert!(mark.contains("──────┬──────"), "{mark}");
}

#[test]
fn notes_are_called_notes() {
    let out = stdout(&run(&["check", SLIPS]));
    assert!(out.contains("[combined-uncertainty] Note: "), "{out}");
    assert!(!out.contains("Advice"), "{out}");
}

#[test]
fn each_slip_gets_a_help_that_shows_the_fix() {
    let out = stdout(&run(&["check", SLIPS]));
    for help in [
        "write kelvin: `teq = 1773.15 ± 30 K`",
        "`+above/-below`, the part above the value first: `+0.05/-0.03`",
        "combined in quadrature: ± 0.0539 Mjup",
        "did you mean ppm? `transit_depth = 1850 ± 100 ppm`",
        "did you mean 'inclination'?",
        "did you mean 'eccentricity'?",
        "`1.2 ± 0.1 Mjup`",
    ] {
        assert!(out.contains(help), "missing {help:?} in\n{out}");
    }
    assert!(!out.contains("did you mean 'm'"), "{out}");
}

#[test]
fn explain_never_names_a_declared_value_as_its_own_driver() {
    let o = run(&[
        "explain",
        "--propagation",
        "linear",
        "tests/fixtures/eval/transit-and-rv.syz",
        "b.transit_depth",
    ]);
    let out = stdout(&o);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    assert!(!out.contains("improve b.transit_depth"), "{out}");
    assert!(out.contains("b.transit_depth is declared"), "{out}");
}

#[test]
fn explain_says_why_a_declared_value_has_no_result() {
    // A lower limit the derivations cannot use: shown as declared, with the reason.
    let o = run(&["explain", "tests/fixtures/eval/limits.syz", "c.mass"]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let out = stdout(&o);
    assert!(out.contains("c.mass = > 0.5 Mjup  declared"), "{out}");
    assert!(out.contains("note: not used in derivations"), "{out}");
    assert!(!out.contains("neither declared"), "{out}");
    let o = run(&["explain", "tests/fixtures/eval/unevaluable.syz", "b.radius"]);
    let err = stderr(&o);
    assert!(
        err.contains("declared by an expression that could not be evaluated"),
        "{err}"
    );
    assert!(err.contains("it needs b.transit_depth"), "{err}");
}

#[test]
fn explain_points_an_abbreviation_to_its_quantity() {
    let o = run(&["explain", "examples/veyra.syz", "b.inc"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(
        stderr(&o).contains("did you mean 'inclination'?"),
        "{}",
        stderr(&o)
    );
}

#[test]
fn ephemeris_without_an_epoch_shows_how_to_declare_the_planets_own() {
    let dir = scratch("messages-epoch");
    let file = dir.join("no-epoch.syz");
    std::fs::write(
        &file,
        "system \"Orrin\" {\n  star orrin { mass = 1 Msun; radius = 1 Rsun }\n  planet b orbits orrin {\n    period = 2.5 ± 0.001 d\n    transit_epoch = 2460000.1 ± 0.001 BJD_TDB\n  }\n  planet c orbits orrin { period = 7.5 ± 0.01 d }\n}\n",
    )
    .unwrap();
    let o = run(&["ephemeris", file.to_str().unwrap(), "c"]);
    assert_eq!(o.status.code(), Some(1));
    let err = stderr(&o);
    assert!(err.contains("'c' declares no transit_epoch"), "{err}");
    assert!(err.contains("`planet c`"), "{err}");
    assert!(
        err.contains("transit_epoch = JD ± UNCERTAINTY BJD_TDB"),
        "{err}"
    );
    // Neither planet b's epoch nor any other number to paste.
    assert!(!err.contains("2460000"), "{err}");
}

#[test]
fn ephemeris_with_an_unreadable_epoch_says_why_not_that_there_is_none() {
    let dir = scratch("messages-bad-epoch");
    let file = dir.join("bad-epoch.syz");
    std::fs::write(
        &file,
        "system \"Orrin\" {\n  star orrin { mass = 1 Msun; radius = 1 Rsun }\n  planet b orbits orrin {\n    period = 2.5 ± 0.001 d\n    transit_epoch = 2460000.123 ± 0.001\n  }\n}\n",
    )
    .unwrap();
    let o = run(&["ephemeris", file.to_str().unwrap(), "b"]);
    assert_eq!(o.status.code(), Some(1));
    let err = stderr(&o);
    assert!(!err.contains("declares no transit_epoch"), "{err}");
    assert!(
        err.contains("the transit_epoch of 'b' is declared, but the value could not be used"),
        "{err}"
    );
    assert!(err.contains("without a unit"), "{err}");
    // `syz check` gives the fix with every digit of the value.
    let o = run(&["check", file.to_str().unwrap()]);
    assert!(
        stdout(&o).contains("`transit_epoch = 2460000.123 ± 0.001 BJD_TDB`"),
        "{}",
        stdout(&o)
    );
}

#[test]
fn json_keys_follow_the_documented_order_not_the_alphabet() {
    let o = run(&[
        "eval",
        "--format",
        "json",
        "--propagation",
        "linear",
        "examples/veyra.syz",
    ]);
    let text = stdout(&o);
    // Read the order from the text (a parsed map need not keep it): the first system's keys
    // and the first planet's quantity names.
    let at = |needle: &str| {
        text.find(needle)
            .unwrap_or_else(|| panic!("no {needle} in output"))
    };
    assert!(at("\"file\"") < at("\"name\"") && at("\"name\"") < at("\"bodies\""));
    // Quantities in the table's order: period before semi_major_axis before eccentricity,
    // which the alphabet would put first.
    assert!(at("\"period\"") < at("\"semi_major_axis\""));
    assert!(at("\"semi_major_axis\"") < at("\"eccentricity\""));
    let doc = std::fs::read_to_string(syzygy_e2e::root().join("docs/json-output.md")).unwrap();
    assert!(
        doc.contains("keys are not sorted alphabetically"),
        "the doc says so"
    );
}
