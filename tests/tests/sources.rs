//! Several published values of one quantity, through the real `syz`: every declaration in
//! the JSON `sources`, the value used and how (`choice`), under the project file's policy.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use syzygy_e2e::{root, run, scratch, stderr, stdout};

fn eval_json(path: &str) -> serde_json::Value {
    let o = run(&["eval", "--format", "json", "--propagation", "linear", path]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    serde_json::from_str(&stdout(&o)).unwrap()
}

fn planet_b(v: &serde_json::Value) -> &serde_json::Value {
    &v["systems"][0]["bodies"][1]["quantities"]
}

#[test]
fn eval_json_lists_every_source_and_how_the_value_was_chosen() {
    let demo = root().join("examples/halvard.syz");
    let v = eval_json(demo.to_str().unwrap());
    let q = planet_b(&v);
    let period = &q["period"];
    assert_eq!(period["choice"], "most-precise", "{period}");
    let sources = period["sources"].as_array().unwrap();
    assert_eq!(sources.len(), 2);
    assert_eq!(sources[0]["citations"][0], "aster");
    assert_eq!(sources[0]["value"], 4.217);
    assert_eq!(sources[0]["chosen"], false);
    assert_eq!(sources[1]["citations"][0], "brenn");
    assert_eq!(sources[1]["chosen"], true);
    assert_eq!(sources[1]["unit"], "d");
    let text = std::fs::read_to_string(&demo).unwrap();
    let line = text
        .lines()
        .position(|l| l.contains("[brenn]") && l.contains("period"))
        .unwrap()
        + 1;
    assert_eq!(sources[1]["line"], line as u64);
    assert_eq!(period["value"], 4.21762);
    assert_eq!(q["transit_depth"]["choice"], "marked");
    // A limit is listed with its kind; the measurement is used.
    let e = &q["eccentricity"]["sources"];
    assert_eq!(e[0]["limit"], "upper");
    assert_eq!(e[1]["chosen"], true);
    // A quantity declared once has neither field.
    assert!(q["impact"].get("sources").is_none() && q["impact"].get("choice").is_none());
    // A derived value lists every reference behind it.
    let cited: Vec<&str> = q["semi_major_axis"]["citations"]
        .as_array()
        .unwrap()
        .iter()
        .map(|c| c.as_str().unwrap())
        .collect();
    assert_eq!(cited, ["aster", "brenn", "cole"]);
}

#[test]
fn the_project_file_can_ask_for_a_weighted_mean() {
    let dir = scratch("sources-weighted-mean");
    std::fs::copy(root().join("examples/halvard.syz"), dir.join("h.syz")).unwrap();
    std::fs::write(
        dir.join("syzygy.toml"),
        "[sources]\nchoice = \"weighted-mean\"\n",
    )
    .unwrap();
    let v = eval_json(dir.join("h.syz").to_str().unwrap());
    let period = &planet_b(&v)["period"];
    assert_eq!(period["choice"], "weighted-mean", "{period}");
    assert!(period["sources"]
        .as_array()
        .unwrap()
        .iter()
        .all(|s| s["chosen"] == false));
    // Weights 1/0.0008^2 and 1/0.00012^2: the mean lies between, nearer the precise value.
    let value = period["value"].as_f64().unwrap();
    assert!(value > 4.2170 && value < 4.21762, "{value}");
    assert!(value > (4.2170 + 4.21762) / 2.0, "{value}");
    assert!(period["assumptions"][0]
        .as_str()
        .unwrap()
        .contains("weighted mean"));
    // The marked one is still used where there is a mark.
    assert_eq!(planet_b(&v)["transit_depth"]["choice"], "marked");
    let bad = dir.join("syzygy.toml");
    std::fs::write(&bad, "[sources]\nchoice = \"median\"\n").unwrap();
    let o = run(&["eval", dir.join("h.syz").to_str().unwrap()]);
    assert_ne!(o.status.code(), Some(0));
    assert!(
        stderr(&o).contains("[sources]: choice = \"median\""),
        "{}",
        stderr(&o)
    );
}

#[test]
fn the_sentence_of_the_choice_names_the_line_of_the_value_used() {
    let demo = root().join("examples/halvard.syz");
    let text = std::fs::read_to_string(&demo).unwrap();
    let line = |needle: &str, cite: &str| {
        text.lines()
            .position(|l| l.contains(needle) && l.contains(cite))
            .unwrap()
            + 1
    };
    let v = eval_json(demo.to_str().unwrap());
    let q = planet_b(&v);
    let said = |name: &str| -> String {
        q[name]["assumptions"]
            .as_array()
            .unwrap()
            .iter()
            .map(|a| a.as_str().unwrap())
            .find(|a| a.starts_with(&format!("b.{name}: 2 sources")))
            .unwrap()
            .to_string()
    };
    for (name, how) in [
        ("period", "the most precise, by standard uncertainty"),
        ("transit_depth", "the one marked preferred"),
    ] {
        let want = format!(
            "chosen: {how} ([brenn], source 2 of 2, line {})",
            line(name, "[brenn]")
        );
        assert!(said(name).ends_with(&want), "{}", said(name));
    }
}
