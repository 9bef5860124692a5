//! Unit tests of the composition curves and classifier, one module per composition module;
//! each reference value names its source. The check that quadrature agrees with the engine's
//! own sampling lives in `lang/tests/composition_quadrature.rs`, so that this folder depends on
//! nothing of the derivation engine.

use super::classes::boundary_parts_unchecked;
use super::curves::sphere_volume;
use super::*;
use crate::constants::{M_EARTH, M_JUPITER, R_EARTH, R_JUPITER};

use crate::solar_system::{by_name, PLANETS};

fn rel_diff(a: f64, b: f64) -> f64 {
    ((a - b) / b).abs()
}

fn me(x: f64) -> f64 {
    x * M_EARTH
}

fn re(x: f64) -> f64 {
    x * R_EARTH
}

/// Normal scatter around `mean`, from a seeded ChaCha8 generator (the engine's own).
fn gaussian_samples(seed: u64, n: usize, mean: f64, rel_sigma: f64) -> Vec<f64> {
    use rand::{Rng, SeedableRng};
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(seed);
    (0..n)
        .map(|_| mean * (1.0 + rel_sigma * rng.sample::<f64, _>(rand_distr::StandardNormal)))
        .collect()
}

fn expected_class(name: &str) -> CompositionClass {
    match name {
        "Mercury" => CompositionClass::IronRich,
        "Venus" | "Earth" | "Mars" => CompositionClass::Rocky,
        "Uranus" | "Neptune" => CompositionClass::VolatileRich,
        "Jupiter" | "Saturn" => CompositionClass::GasGiant,
        other => panic!("unexpected body {other}"),
    }
}

mod curves {
    use super::*;

    #[test]
    fn zeng_earth_like_gives_one_earth_radius() {
        // Zeng et al. 2016: CMF 0.325 at 1 M_earth gives (1.07 - 0.21*0.325) = 1.0018 R_earth.
        let r = radius_of(Curve::EARTH_LIKE, M_EARTH).expect("inside fitted range");
        assert!(rel_diff(r, R_EARTH) < 0.01, "{}", r / R_EARTH);
        // And Earth's fact-sheet mean radius is within 1% of it.
        let earth = by_name("Earth").expect("Earth");
        assert!(rel_diff(r, earth.mean_radius_m) < 0.01);
    }

    #[test]
    fn zeng_relation_coefficients() {
        // Pure-mantle planet, 1 M_earth: 1.07 R_earth; 8 M_earth: 1.07 * 8^(1/3.7).
        let r1 = radius_of(
            Curve::Rocky {
                core_mass_fraction: 0.0,
            },
            M_EARTH,
        )
        .expect("in range");
        assert!(rel_diff(r1, re(1.07)) < 1e-12);
        let r8 = radius_of(
            Curve::Rocky {
                core_mass_fraction: 0.4,
            },
            me(8.0),
        )
        .expect("in range");
        assert!(rel_diff(r8, re((1.07 - 0.084) * 8f64.powf(1.0 / 3.7))) < 1e-12);
    }

    #[test]
    fn seager_fits_tend_to_zero_pressure_densities() {
        // At small mass the Seager fit reduces to constant density. Zero-pressure
        // densities from the same paper's equation-of-state table (from memory):
        // Fe(epsilon) 8.30 g/cm^3, MgSiO3 perovskite 4.10 g/cm^3, H2O ice 1.46 g/cm^3.
        for (curve, rho0) in [
            (Curve::PureIron, 8300.0),
            (Curve::PureSilicate, 4100.0),
            (Curve::PureWaterIce, 1460.0),
        ] {
            let m = me(1e-4);
            let point = radius_of_extrapolated(curve, m).expect("valid mass");
            assert!(point.extrapolated);
            let rho = m / sphere_volume(point.radius_m);
            assert!(
                rel_diff(rho, rho0) < 0.03,
                "{}: {rho:.0} vs {rho0}",
                curve.name()
            );
        }
    }

    #[test]
    fn iron_curve_values() {
        // Direct evaluation of the Seager et al. 2007 iron fit: at M = m1 = 5.80 M_earth
        // the radius is r1 * 10^(k1 - k2) = 2.52 * 10^(-0.28989) R_earth = 1.2925 R_earth.
        let r = iron_radius(me(5.80)).expect("in range");
        assert!(rel_diff(r, re(1.2925)) < 1e-3, "{}", r / R_EARTH);
        // 1 M_earth pure iron: ~0.79 R_earth (the fit evaluated; cross-checked below
        // against the Earth-like curve, which must be larger).
        let r1 = iron_radius(M_EARTH).expect("in range");
        assert!(r1 > re(0.75) && r1 < re(0.83), "{}", r1 / R_EARTH);
        let earth_like = radius_of(Curve::EARTH_LIKE, M_EARTH).expect("in range");
        assert!(r1 < earth_like);
        // Density of a 1 M_earth iron planet exceeds Earth's (5513 kg/m^3, fact sheet).
        let rho = density_of_pure_iron_body(M_EARTH).expect("in range");
        assert!(rho > 1.5 * 5513.0 && rho < 2.5 * 5513.0, "{rho}");
    }

    #[test]
    fn curves_are_ordered_iron_silicate_water() {
        for m in [0.1, 1.0, 5.0, 10.0, 20.0] {
            let fe = radius_of(Curve::PureIron, me(m)).expect("in range");
            let si = radius_of(Curve::PureSilicate, me(m)).expect("in range");
            let h2o = radius_of(Curve::PureWaterIce, me(m)).expect("in range");
            assert!(fe < si && si < h2o, "at {m} M_earth: {fe} {si} {h2o}");
        }
    }

    #[test]
    fn fitted_range_and_extrapolation_flag() {
        assert!(iron_radius(me(0.005)).is_none());
        assert!(iron_radius(me(25.0)).is_none());
        assert!(iron_radius(me(20.0)).is_some());
        let beyond = radius_of_extrapolated(Curve::PureIron, me(25.0)).expect("meaningful");
        assert!(beyond.extrapolated);
        let inside = radius_of_extrapolated(Curve::PureIron, me(10.0)).expect("meaningful");
        assert!(!inside.extrapolated);
        // Zeng: mass range 1-8, CMF range 0-0.4.
        assert!(radius_of(Curve::EARTH_LIKE, me(0.5)).is_none());
        assert!(radius_of(Curve::EARTH_LIKE, me(9.0)).is_none());
        let high_cmf = Curve::Rocky {
            core_mass_fraction: 0.6,
        };
        assert!(radius_of(high_cmf, M_EARTH).is_none());
        assert!(radius_of_extrapolated(high_cmf, M_EARTH).is_some_and(|p| p.extrapolated));
        let bad_cmf = Curve::Rocky {
            core_mass_fraction: 1.5,
        };
        assert!(radius_of_extrapolated(bad_cmf, M_EARTH).is_none());
        for bad in [0.0, -1.0, f64::NAN, f64::INFINITY] {
            assert!(radius_of_extrapolated(Curve::PureIron, bad).is_none());
            assert!(density_of_pure_iron_body(bad).is_none());
        }
    }

    #[test]
    fn curve_metadata() {
        for curve in [
            Curve::PureIron,
            Curve::PureSilicate,
            Curve::PureWaterIce,
            Curve::EARTH_LIKE,
        ] {
            assert!(!curve.name().is_empty());
            assert!(!curve.label().is_empty());
            assert!(curve.source().contains("ApJ"));
            let (lo, hi) = curve.mass_range_kg();
            assert!(lo > 0.0 && lo < hi);
        }
        assert!(Curve::PureIron.source().contains("Seager"));
        assert!(Curve::EARTH_LIKE.source().contains("Zeng"));
        assert_eq!(Curve::EARTH_LIKE.label(), "rocky, core mass fraction 0.33");
    }
}

mod classes {
    use super::*;

    #[test]
    fn per_sample_boundaries_match_the_curves() {
        // The classifier's one-logarithm path must give the curves' own radii and flags.
        let mut m = 1e-4;
        while m < 1e4 {
            let kg = m * M_EARTH;
            let (b, _) = boundary_parts_unchecked(kg, 0.5).unwrap();
            let iron = radius_of_extrapolated(Curve::PureIron, kg).unwrap();
            let rock = radius_of_extrapolated(
                Curve::Rocky {
                    core_mass_fraction: 0.0,
                },
                kg,
            )
            .unwrap();
            assert!((b.iron_floor_m / iron.radius_m - 1.0).abs() < 1e-13, "{m}");
            assert!((b.rock_ceiling_m / rock.radius_m.max(iron.radius_m) - 1.0).abs() < 1e-13);
            assert_eq!(
                b.extrapolated,
                iron.extrapolated || rock.extrapolated,
                "{m}"
            );
            m *= 1.37;
        }
        assert!(boundary_parts_unchecked(0.0, 0.5).is_none());
        assert!(boundary_parts_unchecked(f64::NAN, 0.5).is_none());
    }

    #[test]
    fn mixing_rule_reproduces_zeng_cmf_dependence() {
        // Volume mixing of the Seager iron curve and Zeng's CMF 0 curve against Zeng's
        // own formula, inside Zeng's fitted mass range.
        for m in [1.0, 2.0, 4.0, 8.0] {
            for cmf in [0.2, 0.325, 0.4] {
                let b = boundary_radii(
                    me(m),
                    &ClassBoundaries {
                        iron_rich_core_fraction: cmf,
                        ..ClassBoundaries::default()
                    },
                )
                .expect("valid");
                let zeng = radius_of(
                    Curve::Rocky {
                        core_mass_fraction: cmf,
                    },
                    me(m),
                )
                .expect("in range");
                assert!(
                    rel_diff(b.iron_rich_limit_m, zeng) < 0.02,
                    "M={m} CMF={cmf}: {} vs {}",
                    b.iron_rich_limit_m / R_EARTH,
                    zeng / R_EARTH
                );
            }
        }
    }

    #[test]
    fn solar_system_margins_from_boundaries() {
        // The classifications above are not knife-edge: every rocky/iron-rich planet sits
        // at least 3% in radius from the nearest boundary.
        for name in ["Mercury", "Venus", "Earth", "Mars"] {
            let p = by_name(name).expect("planet");
            let b = boundary_radii(p.mass_kg, &ClassBoundaries::default()).expect("valid");
            let r = p.mean_radius_m;
            let nearest = [b.iron_floor_m, b.iron_rich_limit_m, b.rock_ceiling_m]
                .iter()
                .map(|edge| rel_diff(r, *edge))
                .fold(f64::INFINITY, f64::min);
            assert!(nearest > 0.03, "{name}: nearest boundary {nearest:.3}");
        }
    }

    #[test]
    fn denser_than_iron_and_inflated_and_volatile() {
        // 5 M_earth at 1.0 R_earth is smaller than pure iron (~1.25 R_earth).
        assert_eq!(
            classify_point(me(5.0), re(1.0), &ClassBoundaries::default()),
            Some(CompositionClass::DenserThanIron)
        );
        let masses = [me(5.0), me(5.0), me(5.0), me(5.0)];
        let radii = [re(1.0), re(1.1), re(1.5), re(3.0)];
        let p = classify(&masses, &radii)
            .probability(CompositionClass::DenserThanIron)
            .expect("valid pairs");
        assert!((p - 0.5).abs() < 1e-12, "{p}");
        // 1 M_J at 1.6 R_J: inflated; at 1.0 R_J: gas giant.
        let b = ClassBoundaries::default();
        assert_eq!(
            classify_point(M_JUPITER, 1.6 * R_JUPITER, &b),
            Some(CompositionClass::InflatedGiant)
        );
        assert_eq!(
            classify_point(M_JUPITER, R_JUPITER, &b),
            Some(CompositionClass::GasGiant)
        );
        // 5 M_earth at 2.5 R_earth: needs volatiles.
        assert_eq!(
            classify_point(me(5.0), re(2.5), &b),
            Some(CompositionClass::VolatileRich)
        );
    }
}

mod models_range {
    use super::*;

    #[test]
    fn outside_the_models_range_no_solid_class_is_given() {
        let b = ClassBoundaries::default();
        // The Moon (NASA GSFC lunar fact sheet, from memory): before the range was enforced,
        // the extrapolated ceiling called it iron-rich.
        let moon = by_name("Moon").unwrap();
        assert_eq!(
            classify_point(moon.mass_kg, moon.mean_radius_m, &b),
            Some(CompositionClass::OutsideModels)
        );
        // 25 Mearth at 5 Rearth and 100 Mearth at 3 Rearth: beyond the Seager fits' 20 Mearth
        // and short of a giant above the rock ceiling.
        assert_eq!(
            classify_point(me(25.0), re(5.0), &b),
            Some(CompositionClass::OutsideModels)
        );
        assert_eq!(
            classify_point(me(100.0), re(3.0), &b),
            Some(CompositionClass::OutsideModels)
        );
        // Still given outside: denser than iron, and giants above the ceiling.
        assert_eq!(
            classify_point(me(40.0), re(1.2), &b),
            Some(CompositionClass::DenserThanIron)
        );
        assert_eq!(
            classify_point(me(100.0), re(9.0), &b),
            Some(CompositionClass::GasGiant)
        );
        // Inside, at both ends: Mercury's mass (0.055 Mearth) and 20 Mearth.
        assert_eq!(
            classify_point(me(0.0553), re(0.383), &b),
            Some(CompositionClass::IronRich)
        );
        assert_eq!(
            classify_point(me(20.0), re(4.0), &b),
            Some(CompositionClass::VolatileRich)
        );
    }

    #[test]
    fn quadrature_agrees_with_samples_outside_the_range() {
        let b = ClassBoundaries::default();
        let moon = by_name("Moon").unwrap();
        let split = |v: f64, rel: f64| TwoSidedNormal {
            value: v,
            below: v * rel,
            above: v * rel,
        };
        let quad = classify_distributions(
            split(moon.mass_kg, 0.02),
            split(moon.mean_radius_m, 0.01),
            &b,
        )
        .unwrap();
        assert!(
            (quad.probability(CompositionClass::OutsideModels) - 1.0).abs() < 1e-9,
            "{quad:?}"
        );
        // A mass spread across the lower end: quadrature and samples give the same share.
        let (m, r) = (me(0.05), re(0.45));
        let quad = classify_distributions(split(m, 0.2), split(r, 0.02), &b).unwrap();
        let masses = gaussian_samples(7, 40_000, m, 0.2);
        let radii = gaussian_samples(8, 40_000, r, 0.02);
        let s = classify(&masses, &radii);
        let p_samples = s.probability(CompositionClass::OutsideModels).unwrap();
        let p_quad = quad.probability(CompositionClass::OutsideModels);
        assert!(p_quad > 0.3 && p_quad < 0.7, "{p_quad}");
        assert!((p_samples - p_quad).abs() < 0.01, "{p_samples} vs {p_quad}");
    }
}

mod samples {
    use super::*;

    #[test]
    fn solar_system_planets_classify_as_known_point_samples() {
        // Fact-sheet masses and mean radii (NASA GSFC planetary fact sheet, from memory).
        for planet in PLANETS {
            let s = classify(&[planet.mass_kg], &[planet.mean_radius_m]);
            assert_eq!(s.n_valid, 1);
            assert_eq!(
                s.most_probable(),
                Some(expected_class(planet.name)),
                "{}: {:?}",
                planet.name,
                s.probabilities()
            );
            assert_eq!(s.probability(CompositionClass::DenserThanIron), Some(0.0));
        }
    }

    #[test]
    fn solar_system_planets_classify_as_known_with_spreads() {
        // 2% mass and 1% radius scatter around the fact-sheet values.
        for (i, planet) in PLANETS.iter().enumerate() {
            let seed = 1000 + i as u64;
            let masses = gaussian_samples(seed, 2000, planet.mass_kg, 0.02);
            let radii = gaussian_samples(seed + 77, 2000, planet.mean_radius_m, 0.01);
            let s = classify(&masses, &radii);
            assert_eq!(s.n_valid, 2000);
            let p = s
                .probability(expected_class(planet.name))
                .expect("samples present");
            assert!(p > 0.95, "{}: {:?}", planet.name, s.probabilities());
            assert_eq!(s.probability(CompositionClass::DenserThanIron), Some(0.0));
            let total: f64 = s.probabilities().iter().map(|(_, p)| p).sum();
            assert!((total - 1.0).abs() < 1e-12);
        }
    }

    #[test]
    fn boundaries_are_reported_and_adjustable() {
        let custom = ClassBoundaries {
            inflated_min_radius_m: 1.5 * R_JUPITER,
            ..ClassBoundaries::default()
        };
        let s = classify_with(&[M_JUPITER], &[1.3 * R_JUPITER], &custom);
        assert_eq!(s.boundaries, custom);
        assert_eq!(s.most_probable(), Some(CompositionClass::GasGiant));
        let s = classify(&[M_JUPITER], &[1.3 * R_JUPITER]);
        assert_eq!(s.most_probable(), Some(CompositionClass::InflatedGiant));
        let bad = ClassBoundaries {
            iron_rich_core_fraction: 1.0,
            ..ClassBoundaries::default()
        };
        let s = classify_with(&[M_EARTH], &[R_EARTH], &bad);
        assert_eq!(s.problem, Some(SampleProblem::InvalidBoundaries));
        assert_eq!(s.probability(CompositionClass::Rocky), None);
    }

    #[test]
    fn extrapolated_fraction_is_reported() {
        let s = classify(&[me(0.5), me(2.0), me(2.0), me(50.0)], &[re(0.8); 4]);
        assert_eq!(s.n_extrapolated, 2);
        assert_eq!(s.fraction_extrapolated(), Some(0.5));
    }

    #[test]
    fn empty_input_gives_no_probabilities() {
        let s = classify(&[], &[]);
        assert_eq!(s.n_pairs, 0);
        assert_eq!(s.n_valid, 0);
        assert_eq!(s.problem, None);
        assert!(s.probabilities().is_empty());
        assert_eq!(s.most_probable(), None);
        assert_eq!(s.fraction_extrapolated(), None);
        assert_eq!(s.probability(CompositionClass::DenserThanIron), None);
    }

    #[test]
    fn invalid_samples_are_rejected_not_counted() {
        let masses = [M_EARTH, f64::NAN, M_EARTH, -M_EARTH, M_EARTH, 0.0];
        let radii = [R_EARTH, R_EARTH, f64::NAN, R_EARTH, f64::INFINITY, R_EARTH];
        let s = classify(&masses, &radii);
        assert_eq!(s.n_pairs, 6);
        assert_eq!(s.n_valid, 1);
        assert_eq!(s.n_rejected, 5);
        assert_eq!(s.probability(CompositionClass::Rocky), Some(1.0));
        let all_nan = classify(&[f64::NAN], &[f64::NAN]);
        assert_eq!(all_nan.n_rejected, 1);
        assert_eq!(all_nan.probability(CompositionClass::Rocky), None);
        assert_eq!(
            classify(&[f64::NAN], &[R_EARTH]).probability(CompositionClass::DenserThanIron),
            None
        );
    }

    #[test]
    fn mismatched_lengths_are_an_input_problem() {
        let s = classify(&[M_EARTH, M_EARTH], &[R_EARTH]);
        assert_eq!(
            s.problem,
            Some(SampleProblem::LengthMismatch {
                mass_len: 2,
                radius_len: 1
            })
        );
        assert_eq!(s.n_valid, 0);
        assert!(s.probabilities().is_empty());
        assert_eq!(
            classify(&[M_EARTH], &[]).probability(CompositionClass::DenserThanIron),
            None
        );
        assert!(s
            .problem
            .is_some_and(|p| p.to_string().contains("must pair up")));
    }
}

mod quadrature {
    use super::*;

    #[test]
    fn quadrature_handles_exact_and_impossible_inputs() {
        let b = ClassBoundaries::default();
        let exact = |v| TwoSidedNormal {
            value: v,
            below: 0.0,
            above: 0.0,
        };
        // An exact Earth sits on the rocky side of the boundaries (fact sheet, from memory).
        let earth = classify_distributions(exact(M_EARTH), exact(R_EARTH), &b).unwrap();
        assert_eq!(earth.most_probable(), Some(CompositionClass::Rocky));
        assert!((earth.probability(CompositionClass::Rocky) - 1.0).abs() < 1e-12);
        // Nothing positive: no answer rather than NaN.
        assert!(classify_distributions(exact(-1.0), exact(R_EARTH), &b).is_none());
        assert!(classify_distributions(exact(M_EARTH), exact(-1.0), &b).is_none());
    }
}

mod diagram {
    use super::*;

    #[test]
    fn positions_in_words() {
        // Earth (fact sheet, from memory) sits on the Earth-like curve, between pure iron
        // and pure silicate.
        let earth = by_name("Earth").unwrap();
        let d = describe_position(earth.mass_kg, earth.mean_radius_m);
        assert!(d.contains("rocky"), "{d}");
        assert!(
            d.contains("% smaller than Earth-like rock")
                || d.contains("% larger than Earth-like rock"),
            "{d}"
        );
        // Neptune is far above the water-ice curve and needs volatiles.
        let neptune = by_name("Neptune").unwrap();
        let d = describe_position(neptune.mass_kg, neptune.mean_radius_m);
        assert!(d.contains("above the 100% water ice curve"), "{d}");
        assert!(d.contains("water or a gas envelope"), "{d}");
        // A very dense point lies below the iron curve.
        let d = describe_position(5.0 * M_EARTH, 1.0 * R_EARTH);
        assert!(d.starts_with("1 R⊕ at 5 M⊕: below the 100% iron"), "{d}");
        assert!(describe_position(-1.0, 1.0).starts_with("no position"));
    }
}
