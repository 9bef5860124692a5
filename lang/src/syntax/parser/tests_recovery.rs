//! Recovery from mistakes in the block structure (see `recovery.rs`).

use super::*;

/// A body whose name does not read (`star é {`, `star 2x {`, `planet orbits s {`) is one
/// error: its block is read as its own and dropped, and the bodies after it stay in the system
/// (the block's lines spilled into the system, whose `}` then closed at the body's).
#[test]
fn a_body_whose_name_does_not_read_costs_only_that_body() {
    for bad in ["star é {", "star 2x {", "planet orbits s {", "star {"] {
        let src = format!(
            "system \"A\" {{\n  star s {{ mass = 1 Msun }}\n  {bad}\n    mass = 1 Msun\n  }}\n  star t {{ mass = 0.8 Msun }}\n  planet p orbits t {{ period = 3 d }}\n}}\nsystem \"B\" {{\n  star u {{ mass = 1 Msun }}\n}}\n"
        );
        let p = parse(FileId(0), &src);
        assert_eq!(p.diagnostics.len(), 1, "{bad}: {:#?}", p.diagnostics);
        assert!(
            p.diagnostics[0].message.contains("name"),
            "{bad}: {:?}",
            p.diagnostics[0]
        );
        let names: Vec<&str> = p.file.systems[0]
            .bodies
            .iter()
            .map(|b| b.name.name.as_str())
            .collect();
        assert_eq!(names, ["s", "t", "p"], "{bad}");
        assert_eq!(p.file.systems.len(), 2, "{bad}");
    }
}

/// The names of the bodies of each system, in order.
fn bodies_of(f: &File) -> Vec<Vec<String>> {
    f.systems
        .iter()
        .map(|s| s.bodies.iter().map(|b| b.name.name.to_string()).collect())
        .collect()
}

/// A planet whose host name does not read (`orbits é`) is one error; the planet is kept
/// without a host and its lines stay its own (they spilled into the system, which then closed
/// at the planet's `}` and dropped every later body).
#[test]
fn an_unreadable_host_name_costs_only_the_host() {
    let src = "system \"A\" {\n  star s { mass = 1 Msun }\n  planet c orbits é {\n    period = 3 d\n  }\n  planet d orbits s { period = 5 d }\n}\nsystem \"B\" {\n  star u { mass = 1 Msun }\n}\n";
    let p = parse(FileId(0), src);
    assert_eq!(p.diagnostics.len(), 1, "{:#?}", p.diagnostics);
    assert!(p.diagnostics[0].message.contains("star it orbits"));
    assert_eq!(bodies_of(&p.file), [vec!["s", "c", "d"], vec!["u"]]);
    let c = &p.file.systems[0].bodies[1];
    assert!(c.orbits.is_none());
    assert_eq!(c.props.len(), 1);
}

/// A block opened inside a body (`transit { ... }`, `notes { a }`) is one error; its lines are
/// read as the body's and its `}` does not close the body (it did, and the body's own `}` then
/// closed the system).
#[test]
fn a_block_inside_a_body_does_not_close_the_body() {
    let src = "system \"A\" {\n  star s { mass = 1 Msun }\n  planet d orbits s {\n    period = 10 d\n    transit {\n      transit_depth = 500 ppm\n    }\n    rv_amplitude = 5 m/s\n  }\n  planet e orbits s { period = 20 d }\n}\n";
    let p = parse(FileId(0), src);
    assert_eq!(p.diagnostics.len(), 1, "{:#?}", p.diagnostics);
    assert!(p.diagnostics[0].message.contains("'transit' opens a block"));
    assert_eq!(bodies_of(&p.file), [vec!["s", "d", "e"]]);
    let names: Vec<&str> = p.file.systems[0].bodies[1]
        .props
        .iter()
        .map(|p| p.name.name.as_str())
        .collect();
    assert_eq!(names, ["period", "transit_depth", "rv_amplitude"]);

    // On one line, with a stray word inside: the body still ends at its own `}`.
    let one_line = "system \"A\" {\n  star s { mass = 1 Msun }\n  planet d orbits s {\n    notes { a }\n    period = 10 d\n  }\n  planet e orbits s { period = 20 d }\n}\n";
    let p = parse(FileId(0), one_line);
    assert_eq!(
        bodies_of(&p.file),
        [vec!["s", "d", "e"]],
        "{:#?}",
        p.diagnostics
    );
    assert_eq!(p.file.systems[0].bodies[1].props.len(), 1);

    // Never closed: the body's `}` closes it, and the error for the open body names it.
    let open = "system \"A\" {\n  star s { mass = 1 Msun }\n  planet d orbits s {\n    transit {\n    period = 10 d\n  }\n  planet e orbits s { period = 20 d }\n}\n";
    let p = parse(FileId(0), open);
    assert_eq!(
        bodies_of(&p.file),
        [vec!["s", "d", "e"]],
        "{:#?}",
        p.diagnostics
    );
    let unclosed = p
        .diagnostics
        .iter()
        .find(|d| d.message.contains("not closed"))
        .expect("the open body is reported");
    assert!(unclosed
        .labels
        .iter()
        .any(|l| l.message.contains("opened inside the body")));
}

/// A misspelt keyword that opens a block (`plnaet b orbits s {`, `sytsem "A" {`) is one error
/// with the keyword suggested, and its block is passed over whole (its lines were each an
/// error, and its `}` closed the system).
#[test]
fn a_misspelt_keyword_costs_one_error_for_its_block() {
    let src = "system \"A\" {\n  star s { mass = 1 Msun }\n  plnaet d orbits s {\n    period = 10 d\n    rv_amplitude = 5 m/s\n  }\n  planet e orbits s { period = 20 d }\n}\n";
    let p = parse(FileId(0), src);
    assert_eq!(p.diagnostics.len(), 1, "{:#?}", p.diagnostics);
    assert!(p.diagnostics[0]
        .message
        .contains("'plnaet' does not open a block"));
    assert_eq!(
        p.diagnostics[0].help.as_deref(),
        Some("did you mean 'planet'?")
    );
    assert_eq!(bodies_of(&p.file), [vec!["s", "e"]]);

    let top = format!("sytsem \"Z\" {{\n  star z {{ mass = 1 Msun }}\n}}\n{src}");
    let p = parse(FileId(0), &top);
    assert_eq!(p.diagnostics.len(), 2, "{:#?}", p.diagnostics);
    assert_eq!(
        p.diagnostics[0].help.as_deref(),
        Some("did you mean 'system'?")
    );
    assert_eq!(bodies_of(&p.file), [vec!["s", "e"]]);

    // A block never closed ends at the next declaration instead of taking it.
    let open = "system \"A\" {\n  star s { mass = 1 Msun }\n  plnaet d orbits s {\n    period = 10 d\n  planet e orbits s { period = 20 d }\n}\n";
    let p = parse(FileId(0), open);
    assert_eq!(bodies_of(&p.file), [vec!["s", "e"]], "{:#?}", p.diagnostics);
}

/// A body declared inside another's block (indented into it) is one error; it is kept as the
/// system's, and the outer body and the bodies after it stay in the system (the outer body
/// ended there, its `}` closed the system, and the bodies after it were dropped with a
/// cascade of errors advising to wrap them in a system).
#[test]
fn a_body_inside_a_body_costs_one_error() {
    let src = "system \"K\" {\n  star k {\n    mass = 0.9 ± 0.02 Msun\n    star companion { mass = 0.2 Msun }\n    radius = 0.9 Rsun\n  }\n  planet b orbits k { period = 3 d }\n}\n";
    let p = parse(FileId(0), src);
    assert_eq!(p.diagnostics.len(), 1, "{:#?}", p.diagnostics);
    assert!(p.diagnostics[0].message.contains("bodies do not nest"));
    assert_eq!(bodies_of(&p.file), [vec!["companion", "k", "b"]]);
    assert_eq!(p.file.systems[0].bodies[1].props.len(), 2);

    // Not indented into the body: a `}` left out, as before (the next body ends it).
    let forgot = "system \"K\" {\n  star k {\n    mass = 0.9 Msun\n  planet b orbits k { period = 3 d }\n  planet c orbits k { period = 7 d }\n}\n";
    let p = parse(FileId(0), forgot);
    assert_eq!(p.diagnostics.len(), 1, "{:#?}", p.diagnostics);
    assert!(p.diagnostics[0].message.contains("not closed"));
    assert_eq!(bodies_of(&p.file), [vec!["k", "b", "c"]]);

    // Lines ended by a lone `\r` (old Mac files) or `\r\n` are read the same way.
    for end in ["\r", "\r\n"] {
        let p = parse(FileId(0), &src.replace('\n', end));
        assert_eq!(p.diagnostics.len(), 1, "{end:?}: {:#?}", p.diagnostics);
        assert_eq!(bodies_of(&p.file), [vec!["companion", "k", "b"]], "{end:?}");
    }

    // Two levels: each body keeps its own lines (the inner one's radius went to the outer).
    let two = "system \"Q\" {\n  star q {\n    mass = 0.9 Msun\n    star r {\n      mass = 0.5 Msun\n      planet b orbits r {\n        period = 3.1 d\n      }\n      radius = 0.5 Rsun\n    }\n    radius = 0.85 Rsun\n  }\n}\n";
    let p = parse(FileId(0), two);
    assert_eq!(p.diagnostics.len(), 2, "{:#?}", p.diagnostics);
    assert!(p.diagnostics.iter().any(|d| d
        .message
        .contains("'b' is declared inside the block of 'r'")));
    assert_eq!(bodies_of(&p.file), [vec!["b", "r", "q"]]);
    for b in &p.file.systems[0].bodies {
        let props: Vec<&str> = b.props.iter().map(|p| p.name.name.as_str()).collect();
        let want: &[&str] = if b.name.name == "b" {
            &["period"]
        } else {
            &["mass", "radius"]
        };
        assert_eq!(props, want, "{}", b.name.name);
    }

    // Nested deeper still: a bounded number of levels is taken as nesting, and reading stays
    // bounded.
    let mut deep = String::from("system \"K\" {\n");
    for i in 0..5_000 {
        deep.push_str(&format!("{}star s{i} {{\n", " ".repeat(i % 200)));
    }
    let p = parse(FileId(0), &deep);
    assert!(!p.diagnostics.is_empty());
}

/// A `}` too many in a system, with bodies after it, is one error at that `}`; the bodies
/// after it stay in the system (they were each "outside a system", and the system's own `}`
/// unmatched).
#[test]
fn a_brace_too_many_in_a_system_is_blamed_on_itself() {
    let src = "system \"K\" {\n  star k { mass = 0.9 Msun }\n  planet b orbits k { period = 3 d }\n  }\n  planet c orbits k { period = 7 d }\n}\nsystem \"L\" {\n  star l { mass = 1 Msun }\n}\n";
    let p = parse(FileId(0), src);
    assert_eq!(p.diagnostics.len(), 1, "{:#?}", p.diagnostics);
    let d = &p.diagnostics[0];
    assert!(
        d.message.contains("a body follows this '}'"),
        "{}",
        d.message
    );
    assert_eq!(
        d.span.start as usize,
        src.find("  }\n  planet c").unwrap() + 2
    );
    assert_eq!(bodies_of(&p.file), [vec!["k", "b", "c"], vec!["l"]]);
}

/// A stray word before a body's `{` (`star a junk {`, `orbits a orbits a {`) is one error, and
/// the block is still the body's (its lines spilled into the system, which the body's `}`
/// then closed, dropping the body and the host of every planet after it).
#[test]
fn a_stray_word_before_the_brace_costs_one_error() {
    let src = "system \"V\" {\n  star a junk { mass = 1 Msun }\n  planet j orbits a { period = 21 d }\n  planet i orbits a orbits a { period = 5 d }\n}\nsystem \"W\" junk {\n  star w { mass = 1 Msun }\n}\n";
    let p = parse(FileId(0), src);
    assert_eq!(p.diagnostics.len(), 3, "{:#?}", p.diagnostics);
    assert!(p
        .diagnostics
        .iter()
        .all(|d| d.message.starts_with("expected '{' to open")));
    assert_eq!(bodies_of(&p.file), [vec!["a", "j", "i"], vec!["w"]]);
    assert_eq!(p.file.systems[0].bodies[0].props.len(), 1);
    assert_eq!(
        p.file.systems[0].bodies[2].orbits.as_ref().unwrap().name,
        "a"
    );
}

/// A body declared inside another on that body's own line (`star a { planet b orbits a { ... } }`)
/// is one error, as when indented (it was two: the body ended early, and its `}` then closed
/// the system, with later lines lost).
#[test]
fn a_body_inside_a_body_on_one_line_costs_one_error() {
    let src = "system \"S\" {\n  star a { planet b orbits a { period = 3 d } }\n  star c { mass = 1 Msun; planet d orbits c { period = 3 d }; radius = 1 Rsun }\n  planet e orbits a { period = 5 d }\n}\n";
    let p = parse(FileId(0), src);
    assert_eq!(p.diagnostics.len(), 2, "{:#?}", p.diagnostics);
    assert!(p
        .diagnostics
        .iter()
        .all(|d| d.message.contains("bodies do not nest")));
    assert_eq!(bodies_of(&p.file), [vec!["b", "a", "d", "c", "e"]]);
    assert_eq!(p.file.systems[0].bodies[3].props.len(), 2);
}
