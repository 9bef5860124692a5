use super::*;

fn si(text: &str) -> (f64, Dimension) {
    let u = parse_unit_text(text).unwrap_or_else(|| panic!("unit {text} did not parse"));
    (u.factor, u.dim)
}

fn close(a: f64, b: f64, rel: f64) -> bool {
    (a - b).abs() <= rel * b.abs().max(f64::MIN_POSITIVE)
}

/// Conversions checked against values computed with astropy 8.0.2 (IAU 2015 B3 nominal
/// values, CODATA 2018 G), recorded by `tests/reference/make_reference.py` in
/// `tests/reference/units.json`.
#[test]
fn conversions_match_astropy_reference() {
    let json = include_str!("../../../tests/reference/units.json");
    let v: serde_json::Value = serde_json::from_str(json).unwrap_or_default();
    let rows = v["units"].as_array().cloned().unwrap_or_default();
    assert!(rows.len() >= 25, "reference file has too few rows");
    for row in rows {
        let text = row["text"].as_str().unwrap_or("");
        let expected = row["si_value"].as_f64().unwrap_or(f64::NAN);
        let (value, unit) = text.split_once(' ').unwrap_or((text, ""));
        let value: f64 = value.parse().unwrap_or(f64::NAN);
        let (factor, dim) = si(unit);
        assert!(
            close(value * factor, expected, 1e-12),
            "{text}: {} vs astropy {expected}",
            value * factor
        );
        let expect_unit = row["si_unit"].as_str().unwrap_or("");
        assert_eq!(dim.si_unit(), expect_unit, "{text}");
    }
}

#[test]
fn published_definitions() {
    // IAU 2012 Resolution B2: 1 au = 149 597 870 700 m exactly.
    assert_eq!(si("au").0, 149_597_870_700.0);
    // IAU 2015 Resolution B3: nominal solar radius 6.957e8 m, Jupiter equatorial 7.1492e7 m,
    // Earth equatorial 6.3781e6 m, nominal solar luminosity 3.828e26 W.
    assert_eq!(si("Rsun").0, 6.957e8);
    assert_eq!(si("R☉").0, 6.957e8);
    assert_eq!(si("Rjup").0, 7.1492e7);
    assert_eq!(si("R⊕").0, 6.3781e6);
    assert_eq!(si("Lsun").0, 3.828e26);
    // Julian year, 365.25 d of 86 400 s (IAU).
    assert_eq!(si("yr").0, 31_557_600.0);
    assert_eq!(si("Gyr").0, 31_557_600.0e9);
    // 1 pc = 648000/pi au (IAU 2015 Resolution B2) = 3.0856775814913673e16 m.
    assert!(close(si("pc").0, 3.085_677_581_491_367e16, 1e-15));
    assert!(close(si("kpc").0, 3.085_677_581_491_367e19, 1e-15));
    // 1 mas = pi/648e6 rad (SI Brochure definition of the arcsecond).
    assert!(close(si("mas").0, 4.848_136_811_095_36e-9, 1e-12));
}

#[test]
fn compound_units_and_dimensions() {
    assert_eq!(si("km/s").1, Dimension::of(1, 0, -1, 0, 0));
    assert_eq!(si("km s^-1"), si("km/s"));
    let (f, d) = si("g/cm^3");
    assert!(close(f, 1000.0, 1e-15));
    assert_eq!(d, Dimension::of(-3, 1, 0, 0, 0));
    assert_eq!(si("W/m^2").1.si_unit(), "W/m^2");
    assert_eq!(si("%").0, 0.01);
    assert!(
        si("deg").1 != si("1").1,
        "angles are not dimensionless numbers"
    );
    assert!(parse_unit_text("furlong").is_none());
    // A slash with nothing on one side: not a unit (it was written into imported files).
    for broken in ["Rearth/", "/s", "m//s", "m/ /s"] {
        assert!(parse_unit_text(broken).is_none(), "{broken}");
    }
}

#[test]
fn rational_exponents() {
    let d = Dimension::of(3, 0, 0, 0, 0).pow(Rat::new(1, 3));
    assert_eq!(d, Dimension::LENGTH);
    let half = Dimension::LENGTH.pow(Rat::new(1, 2));
    assert_eq!(half.pow(Rat::int(2)), Dimension::LENGTH);
    assert_eq!(half.si_unit(), "m^(1/2)");
}

#[test]
fn suggestions() {
    assert_eq!(suggest("msun"), Some("Msun"));
    assert_eq!(suggest("Rjupp"), Some("Rjup"));
    assert_eq!(suggest("qqqqqq"), None);
    // One character is one edit from every other one-character symbol: no guess.
    assert_eq!(suggest("C"), None);
    assert_eq!(suggest("q"), None);
    assert_eq!(suggest("k"), Some("K"));
    // Other spellings of the astronomical units point to ours, not to the nearest by edits
    // (`ME` is one edit from `m`, `RE` two from `R☉`).
    assert_eq!(suggest("ME"), Some("Mearth"));
    assert_eq!(suggest("RE"), Some("Rearth"));
    assert_eq!(suggest("solRad"), Some("Rsun"));
    assert_eq!(suggest("jupiterMass"), Some("Mjup"));
    assert_eq!(suggest("R_J"), Some("Rjup"));
    // Two edits are too many for a symbol of three characters (`R_Q` is two from `yr`).
    assert_eq!(suggest("R_Q"), None);
    assert_eq!(suggest("degrees"), Some("deg"));
    // Subscripts as papers write them: `Re` is the Earth's radius (R_e), not the Sun's.
    assert_eq!(suggest("Re"), Some("Rearth"));
    assert_eq!(suggest("Me"), Some("Mearth"));
    assert_eq!(suggest("Mo"), Some("Msun"));
    assert_eq!(suggest("R_solar"), Some("Rsun"));
    assert_eq!(suggest("hours"), Some("h"));
    // Each unit meant is one the language reads, and no other spelling is one already.
    for (other, meant) in OTHER_SPELLINGS {
        assert!(parse_unit_text(meant).is_some(), "{meant}");
        assert!(lookup(other).is_none(), "{other} is a unit already");
    }
}

#[test]
fn offset_temperature_scales_are_recognised_not_registered() {
    for sym in ["C", "°C", "degC", "celsius", "F", "°F", "degF"] {
        assert!(offset_scale(sym).is_some(), "{sym}");
        assert!(lookup(sym).is_none(), "{sym} must stay out of the registry");
    }
    let c = offset_scale("°C").unwrap();
    let f = offset_scale("degF").unwrap();
    // Definitions: 0 °C = 273.15 K (SI Brochure); 32 °F = 0 °C, 212 °F = 100 °C (common practice).
    assert!(close(c.kelvin(0.0), 273.15, 1e-12));
    assert!(close(c.kelvin(1500.0), 1773.15, 1e-12));
    assert!(close(f.kelvin(32.0), 273.15, 1e-12));
    assert!(close(f.kelvin(212.0), 373.15, 1e-12));
    assert!(offset_scale("K").is_none());
}

#[test]
fn prefixes_only_where_allowed() {
    assert!(lookup("kpc").is_some());
    assert!(lookup("mm").is_some());
    assert!(lookup("kMsun").is_none());
    assert!(lookup("kd").is_none());
    // "min" is the minute, not milli-inch; "mas" the milliarcsecond.
    assert_eq!(lookup("min").map(|(f, _)| f), Some(60.0));
}

/// The spelling index finds what a scan of the registry in order finds: for every symbol
/// and alias, and for every prefix before every symbol (prefixable or not), the same unit
/// and factor, or nothing for both.
#[test]
fn the_spelling_index_agrees_with_a_scan_of_the_registry() {
    let reg = all_units();
    let scan = |symbol: &str| -> Option<(f64, &'static UnitDef)> {
        if let Some(def) = reg
            .iter()
            .find(|d| d.symbol == symbol || d.aliases.contains(&symbol))
        {
            return Some((def.factor, def));
        }
        for (p, scale) in PREFIXES {
            if let Some(rest) = symbol.strip_prefix(p) {
                if let Some(def) = reg.iter().find(|d| d.prefixes && d.symbol == rest) {
                    return Some((scale * def.factor, def));
                }
            }
        }
        None
    };
    let mut spellings: Vec<String> = Vec::new();
    for d in reg {
        for s in std::iter::once(d.symbol).chain(d.aliases.iter().copied()) {
            spellings.push(s.to_string());
            for (p, _) in PREFIXES {
                spellings.push(format!("{p}{s}"));
            }
        }
    }
    spellings.extend(["", "x", "mmmag", "kkm", "Msun2"].map(String::from));
    let mut found = 0;
    for s in &spellings {
        let (a, b) = (lookup(s), scan(s));
        assert_eq!(
            a.map(|(f, d)| (f, d.symbol, d.name)),
            b.map(|(f, d)| (f, d.symbol, d.name)),
            "{s:?}"
        );
        found += usize::from(a.is_some());
    }
    assert!(found > 300, "only {found} spellings resolve");
}

/// How a unit is spelled back: numerator factors joined by spaces, each denominator factor
/// after a '/', or, with no numerator, the factors with their negative exponents. Checked
/// against the spelling written out here for each shape of unit.
#[test]
fn units_are_spelled_back_as_written() {
    use crate::ast::{Ident, UnitExpr, UnitFactor};
    use crate::source::{FileId, Span};
    let expr = |factors: &[(&str, i32)]| UnitExpr {
        factors: factors
            .iter()
            .map(|(n, e)| UnitFactor {
                symbol: Ident {
                    name: (*n).into(),
                    span: Span::new(FileId(0), 0, 0),
                },
                exponent: *e,
            })
            .collect(),
        span: Span::new(FileId(0), 0, 0),
    };
    let cases: &[(&[(&str, i32)], &str)] = &[
        (&[("Msun", 1)], "Msun"),
        (&[("m", 1), ("s", -1)], "m/s"),
        (&[("kg", 1), ("m", -3)], "kg/m^3"),
        (&[("g", 1), ("cm", -3)], "g/cm^3"),
        (&[("m", 3), ("kg", -1), ("s", -2)], "m^3/kg/s^2"),
        (&[("W", 1), ("m", 2)], "W m^2"),
        (&[("s", -1)], "s^-1"),
        (&[("s", -1), ("m", -2)], "s^-1 m^-2"),
        (&[("m", 0), ("K", 1)], "K"),
        (&[], ""),
    ];
    for (factors, spelled) in cases {
        assert_eq!(unit_text(&expr(factors)), *spelled, "{factors:?}");
    }
}

/// Whole exponents skip the reduction; the results are those of the reduced fraction.
#[test]
fn whole_exponents_add_and_multiply_as_reduced_fractions() {
    for a in -40..=40 {
        for b in -40..=40 {
            let (x, y) = (Rat::int(a), Rat::int(b));
            assert_eq!(x.add(y), Rat::new(a + b, 1), "{a} + {b}");
            assert_eq!(x.mul(y), Rat::new(a * b, 1), "{a} * {b}");
            assert_eq!(x, Rat::new(a * 3, 3), "{a}");
        }
    }
    // Beyond the range of the stored numerator, both clamp the same way.
    assert_eq!(Rat::int(40_000), Rat::new(40_000, 1));
    assert_eq!(Rat::int(300).mul(Rat::int(300)), Rat::new(90_000, 1));
    // Fractions still reduce: 1/2 + 1/2 = 1, (2/3) * (3/2) = 1.
    assert_eq!(Rat::new(1, 2).add(Rat::new(1, 2)), Rat::int(1));
    assert_eq!(Rat::new(2, 3).mul(Rat::new(3, 2)), Rat::int(1));
}

/// The shortcut of [`resolve`] for a unit of one symbol to the first power gives what the
/// general path gives (factor, dimension, text), for every spelling of the registry with
/// and without each prefix, and for unknown symbols.
#[test]
fn one_symbol_shortcut_equals_the_general_path() {
    use crate::ast::{Ident, UnitExpr, UnitFactor};
    use crate::source::{FileId, Span};
    let mut spellings: Vec<String> = Vec::new();
    for d in registry() {
        for s in std::iter::once(d.symbol).chain(d.aliases.iter().copied()) {
            spellings.push(s.to_string());
            for (p, _) in PREFIXES {
                spellings.push(format!("{p}{s}"));
            }
        }
    }
    spellings.extend(["x", "kkm", "Msun2"].map(String::from));
    let mut known = 0;
    for s in &spellings {
        let expr = UnitExpr {
            factors: std::iter::once(UnitFactor {
                symbol: Ident {
                    name: s.as_str().into(),
                    span: Span::new(FileId(0), 0, s.len()),
                },
                exponent: 1,
            })
            .collect(),
            span: Span::new(FileId(0), 0, s.len()),
        };
        let (fast, general) = (resolve(&expr), resolve_general(&expr));
        known += usize::from(fast.is_ok());
        assert_eq!(
            fast.map(|u| (u.factor.to_bits(), u.dim, u.text))
                .map_err(|e| e.len()),
            general
                .map(|u| (u.factor.to_bits(), u.dim, u.text))
                .map_err(|e| e.len()),
            "{s:?}"
        );
    }
    assert!(known > 300, "only {known} spellings resolve");
}

/// A misspelt unit is matched against spellings of the dimension the value needs first:
/// `Msn` for a mass is `Msun` (as close as the minute, `min`, when letter case is ignored),
/// `Rsum` for a length `Rsun`; without a dimension the nearest spelling is still found.
#[test]
fn suggestions_prefer_the_dimension_the_value_needs() {
    assert_eq!(suggest_for("Msn", Some(Dimension::MASS)), Some("Msun"));
    assert_eq!(suggest_for("Msn", Some(Dimension::TIME)), Some("min"));
    assert_eq!(suggest_for("Rsum", Some(Dimension::LENGTH)), Some("Rsun"));
    assert_eq!(suggest_for("dd", Some(Dimension::TIME)), Some("d"));
    assert!(suggest("Msn").is_some());
    // Only units of the dimension wanted; other spellings papers use are known by name.
    assert_eq!(suggest_for("parsec", Some(Dimension::LENGTH)), Some("pc"));
    assert_eq!(
        suggest_for("kelvins", Some(Dimension::TEMPERATURE)),
        Some("K")
    );
    assert_eq!(suggest_for("Gy", Some(Dimension::TIME)), Some("Gyr"));
    assert_eq!(suggest_for("Msn", Some(Dimension::LENGTH)), None);
    for (other, meant) in OTHER_SPELLINGS {
        assert!(lookup(other).is_none(), "{other} is a unit itself");
        assert!(parse_unit_text(meant).is_some(), "{meant} is no unit");
    }
    assert_eq!(suggest_for("zzzzzz", Some(Dimension::MASS)), None);
}
