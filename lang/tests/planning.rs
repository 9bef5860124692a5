//! The quantities an observer plans with, against outside references: astropy's units,
//! constants and blackbody model (`tests/reference/make_planning_reference.py`, its recorded
//! output `tests/reference/planning.json`), the IAU 2015 Resolution B2 statement that the
//! nominal Sun has M_bol = 4.74, and facts of the Solar System.

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use syzygy::derive::{Origin, QuantityResult};
use syzygy::diagnostic::Rule;
use syzygy::quantities::Qty;
use syzygy::source::FileId;
use syzygy::{Analysis, Options};

fn reference() -> serde_json::Value {
    let path = concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/../tests/reference/planning.json"
    );
    serde_json::from_str(&std::fs::read_to_string(path).unwrap()).unwrap()
}

fn num(v: &serde_json::Value, path: &[&str]) -> f64 {
    path.iter()
        .fold(v, |v, k| &v[*k])
        .as_f64()
        .unwrap_or_else(|| panic!("no number at {path:?}"))
}

fn analyze(src: &str) -> Analysis {
    syzygy::analyze(FileId(0), src, &Options::linear().into())
}

/// The result of `body.qty` in the system named `system`.
fn get<'a>(a: &'a Analysis, system: &str, body: &str, qty: Qty) -> Option<&'a QuantityResult> {
    let si = a.model.systems.iter().position(|s| s.name == system)?;
    let bi = a.model.systems[si]
        .bodies
        .iter()
        .position(|b| b.id == body)?;
    a.results[si].bodies[bi]
        .quantities
        .iter()
        .find(|q| q.qty == qty)
}

fn value(a: &Analysis, system: &str, body: &str, qty: Qty) -> f64 {
    get(a, system, body, qty)
        .unwrap_or_else(|| panic!("no {qty:?} on {system}/{body}"))
        .value
}

fn close(got: f64, want: f64, rel: f64, what: &str) {
    assert!(
        ((got - want) / want).abs() <= rel,
        "{what}: got {got}, want {want} (relative tolerance {rel})"
    );
}

/// The invented system of `make_planning_reference.py` (names and numbers made up).
const SRC: &str = r#"
system "Tessaly" {
  star Tessaly {
    mass = 0.92 Msun
    radius = 0.88 Rsun
    teff = 5310 K
    parallax = 8.12 mas
    magnitude_j = 9.87 mag
    magnitude_ks = 9.41 mag
  }
  planet d orbits Tessaly {
    period = 12.43 d
    transit_depth = 0.61 %
    mass = 0.153 Mjup
    scaled_semi_major_axis = 24.98
  }
  planet h orbits Tessaly {
    period = 30 d
    teq = 751 K
    surface_gravity = 8.48 m/s^2
  }
}
system "Brightwell" {
  star B { absolute_bolometric_magnitude = 4.74 mag }
}
system "Farrow" {
  star F { bolometric_magnitude = 10.2 mag; parallax = 8.12 mas }
}
system "Sizes" {
  star S { mass = 1 Msun; radius = 1 Rsun; teff = 5772 K }
  planet earthlike orbits S { period = 365 d; radius = 1 Rearth }
  planet neptunelike orbits S { period = 60 d; radius = 3.86 Rearth }
  planet giant orbits S { period = 4 d; radius = 1.2 Rjup }
}
"#;

#[test]
fn distance_and_bolometric_luminosities_match_astropy() {
    let r = reference();
    let a = analyze(SRC);
    close(
        value(&a, "Tessaly", "Tessaly", Qty::Distance),
        num(&r, &["distance_m"]),
        1e-9,
        "distance from the parallax (astropy Distance)",
    );
    // IAU 2015 Resolution B2: the nominal solar luminosity 3.828e26 W has M_bol = 4.74.
    let l = value(&a, "Brightwell", "B", Qty::Luminosity);
    close(
        l,
        3.828e26,
        1e-3,
        "luminosity of M_bol = 4.74 (IAU 2015 B2)",
    );
    close(
        l,
        num(&r, &["luminosity_from_m_bol_abs_w"]),
        1e-12,
        "astropy u.M_bol",
    );
    close(
        value(&a, "Farrow", "F", Qty::BolometricFlux),
        num(&r, &["bolometric_flux_w_m2"]),
        1e-12,
        "bolometric flux (astropy u.m_bol)",
    );
    close(
        value(&a, "Farrow", "F", Qty::Luminosity),
        num(&r, &["luminosity_from_flux_w"]),
        1e-9,
        "luminosity from flux and distance",
    );
    // The distance gives nothing back: no parallax appears where none was declared.
    assert!(get(&a, "Brightwell", "B", Qty::Parallax).is_none());
}

#[test]
fn spectroscopy_metrics_and_scale_height_match_the_reference() {
    let r = reference();
    let a = analyze(SRC);
    close(
        syzygy::formulas::planck_ratio(7.5e-6, 1.10 * num(&r, &["tsm_inputs", "teq"]), 5310.0)
            .unwrap(),
        num(&r, &["planck_ratio"]),
        1e-9,
        "Planck ratio at 7.5 um (astropy BlackBody)",
    );
    close(
        value(&a, "Tessaly", "d", Qty::Tsm),
        num(&r, &["tsm"]),
        1e-9,
        "TSM",
    );
    close(
        value(&a, "Tessaly", "d", Qty::Esm),
        num(&r, &["esm"]),
        1e-9,
        "ESM",
    );
    close(
        value(&a, "Tessaly", "h", Qty::ScaleHeight),
        num(&r, &["scale_height_m"]),
        1e-9,
        "scale height (astropy k_B and u)",
    );
    let h = get(&a, "Tessaly", "h", Qty::ScaleHeight).unwrap();
    assert!(
        h.inputs.iter().any(|k| k.1 == Qty::MeanMolecularWeight),
        "the scale height names the mean molecular weight it assumed"
    );
}

#[test]
fn habitable_zone_edges_match_the_reference() {
    let r = reference();
    let a = analyze(SRC);
    for (qty, flux, name) in [
        (
            Qty::HabitableInner,
            Qty::HabitableInnerFlux,
            "runaway_greenhouse",
        ),
        (
            Qty::HabitableOuter,
            Qty::HabitableOuterFlux,
            "maximum_greenhouse",
        ),
        (
            Qty::HabitableInnerOptimistic,
            Qty::HabitableInnerOptimisticFlux,
            "recent_venus",
        ),
        (
            Qty::HabitableOuterOptimistic,
            Qty::HabitableOuterOptimisticFlux,
            "early_mars",
        ),
    ] {
        close(
            value(&a, "Tessaly", "Tessaly", flux) / syzygy::constants::INSOLATION_EARTH,
            num(&r, &["habitable", name, "seff"]),
            1e-12,
            name,
        );
        close(
            value(&a, "Tessaly", "Tessaly", qty),
            num(&r, &["habitable", name, "distance_m"]),
            1e-9,
            name,
        );
    }
}

#[test]
fn optimistic_edges_are_the_fluxes_venus_and_mars_received_under_the_faint_young_sun() {
    // The optimistic limits are defined by Venus about 1 Gyr ago and Mars about 3.8 Gyr ago
    // (Kopparapu et al. 2013, sec. 4, from memory). The Sun's luminosity then follows
    // Gough (1981), L(t) = L_now / (1 + 0.4 (1 - t / 4.57 Gyr)) (from memory); Venus at
    // 0.723 au and Mars at 1.524 au (NASA fact sheets, from memory). The fits at the solar
    // temperature of the fits (5780 K) must give these fluxes within 2 %.
    let gough = |t_gyr: f64| 1.0 / (1.0 + 0.4 * (1.0 - t_gyr / 4.57));
    let venus = gough(4.57 - 1.0) / 0.723f64.powi(2);
    let mars = gough(4.57 - 3.8) / 1.524f64.powi(2);
    let sun = uom::si::f64::ThermodynamicTemperature::new::<
        uom::si::thermodynamic_temperature::kelvin,
    >(5780.0);
    let recent_venus =
        syzygy::formulas::habitable_flux(syzygy::formulas::HabitableEdge::RecentVenus, sun)
            .unwrap();
    let early_mars =
        syzygy::formulas::habitable_flux(syzygy::formulas::HabitableEdge::EarlyMars, sun).unwrap();
    close(recent_venus, venus, 0.02, "recent Venus");
    close(early_mars, mars, 0.02, "early Mars");
}

#[test]
fn habitable_zone_is_not_derived_outside_the_fits_range_and_says_why() {
    let a = analyze(
        "system \"Hotta\" {\n  star H { mass = 1.8 Msun; radius = 1.9 Rsun; teff = 8100 K }\n  planet b orbits H { period = 300 d }\n}\n",
    );
    assert!(get(&a, "Hotta", "H", Qty::HabitableInner).is_none());
    assert!(get(&a, "Hotta", "b", Qty::HabitableZonePosition).is_none());
    assert!(a
        .diagnostics
        .iter()
        .any(|d| d.rule == Rule::NotDerivable && d.message.contains("2600-7200 K")));
}

#[test]
fn a_planet_in_the_zone_gets_its_placement_with_probabilities() {
    // An invented Sun-like star and a planet at 1.1 au: within the conservative zone
    // (0.95-1.68 au for the Sun, from the fits).
    let a = analyze(
        "system \"Calma\" {\n  star C { mass = 1.0 Msun; radius = 1.0 ± 0.02 Rsun; teff = 5772 ± 50 K }\n  planet b orbits C { semi_major_axis = 1.1 ± 0.01 au }\n}\n",
    );
    let q = get(&a, "Calma", "b", Qty::HabitableZonePosition).unwrap();
    assert!((0.0..1.0).contains(&q.value), "{}", q.value);
    let note = q.notes.iter().find(|n| n.contains("conservative")).unwrap();
    assert!(note.contains("within"), "{note}");
    assert!(note.contains("optimistic"), "{note}");
}

#[test]
fn predicted_masses_of_an_earth_and_a_neptune_size_planet() {
    let r = reference();
    let a = analyze(SRC);
    let earth = get(&a, "Sizes", "earthlike", Qty::PredictedMass).unwrap();
    let neptune = get(&a, "Sizes", "neptunelike", Qty::PredictedMass).unwrap();
    assert_eq!(earth.origin, Origin::Predicted);
    let m_earth = syzygy::constants::M_EARTH;
    // The mean relation, inverted (the numpy inversion of the reference script); the median
    // of a log-normal spread is the mean relation's value.
    close(
        earth.value / m_earth,
        num(&r, &["predicted_mass_earth", "1.0"]),
        0.03,
        "Earth-size",
    );
    close(
        neptune.value / m_earth,
        num(&r, &["predicted_mass_earth", "3.86"]),
        0.03,
        "Neptune-size",
    );
    // The truths lie within the predicted 68 % intervals: Earth's mass is 1 Mearth, and
    // Neptune's 17.15 Mearth for 3.86 Rearth (NASA fact sheet, from memory).
    for (q, truth) in [(earth, 1.0), (neptune, 17.15)] {
        let (lo, hi) = ((q.value - q.below) / m_earth, (q.value + q.above) / m_earth);
        assert!(lo < truth && truth < hi, "{truth} outside {lo}..{hi}");
    }
    // The relation's scatter is in the error budget by name.
    assert!(neptune
        .budget
        .iter()
        .any(|(i, _)| i.contains("predicted_mass scatter")));
    // Predictions feed nothing: no density, gravity or composition from a predicted mass.
    for q in [Qty::Mass, Qty::Density, Qty::SurfaceGravity] {
        assert!(get(&a, "Sizes", "neptunelike", q).is_none(), "{q:?}");
    }
}

#[test]
fn a_giant_gets_no_predicted_mass_and_a_note() {
    let r = reference();
    close(
        syzygy::formulas::largest_invertible_radius_earth(),
        num(&r, &["largest_invertible_radius_earth"]),
        1e-9,
        "top of the invertible radii",
    );
    let a = analyze(SRC);
    assert!(get(&a, "Sizes", "giant", Qty::PredictedMass).is_none());
    assert!(a
        .diagnostics
        .iter()
        .any(|d| d.rule == Rule::NotDerivable
            && d.message.contains("no mass is predicted for giant")));
}

#[test]
fn a_transit_depth_in_magnitudes_is_refused_with_the_conversion() {
    let a = analyze(
        "system \"Dimma\" {\n  star D { mass = 1 Msun; radius = 1 Rsun }\n  planet b orbits D { period = 3 d; transit_depth = 5 mmag }\n}\n",
    );
    let d = a
        .diagnostics
        .iter()
        .find(|d| d.rule == Rule::UnitMismatch)
        .expect("a depth in mmag is refused");
    assert!(
        d.help.as_deref().unwrap_or("").contains("1 - 10^(-0.4 D)"),
        "{d:?}"
    );
}
