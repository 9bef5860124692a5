//! Physical and astronomical constants, in SI, each with the standard it comes from.
//!
//! This is the one place numbers like G or the nominal solar radius live; units, formulas and
//! tests all read them from here.

/// Newtonian constant of gravitation, m^3 kg^-1 s^-2 (CODATA 2018, unchanged in CODATA 2022;
/// relative standard uncertainty 2.2e-5).
pub const G: f64 = 6.674_30e-11;

/// Speed of light in vacuum, m/s (SI 2019, exact).
pub const C: f64 = 299_792_458.0;

/// Boltzmann constant, J/K (SI 2019, exact).
pub const K_B: f64 = 1.380_649e-23;

/// Planck constant, J s (SI 2019, exact).
pub const H: f64 = 6.626_070_15e-34;

/// Stefan–Boltzmann constant, W m^-2 K^-4, from the exact SI 2019 constants
/// (sigma = 2 pi^5 k^4 / (15 h^3 c^2); CODATA 2018 quotes 5.670 374 419...e-8).
pub const SIGMA_SB: f64 = 5.670_374_419e-8;

/// Atomic mass constant m_u = 1 Da, kg (CODATA 2022 recommended value, relative standard
/// uncertainty 3.1e-10; CODATA 2018 gave 1.660 539 066 60e-27).
pub const ATOMIC_MASS: f64 = 1.660_539_068_92e-27;

/// Zero point of the absolute bolometric magnitude scale: a star of luminosity `L0` has
/// `M_bol = 0`, so `M_bol = -2.5 log10(L / L0)` (IAU 2015 Resolution B2, exact by definition).
pub const L_BOL_ZERO: f64 = 3.012_8e28;
/// Zero point of the apparent bolometric magnitude scale: `m_bol = -2.5 log10(f / f0)`.
/// IAU 2015 Resolution B2 defines it as the irradiance of an `M_bol = 0` source at 10 pc,
/// `f0 = L0 / (4 pi (10 pc)^2)`, and quotes it rounded as 2.518 021 002e-8 W/m^2; it is
/// computed here from that definition.
pub const F_BOL_ZERO: f64 = L_BOL_ZERO / (4.0 * std::f64::consts::PI * 100.0 * PARSEC * PARSEC);

/// Nominal solar radius, m (IAU 2015 Resolution B3).
pub const R_SUN: f64 = 6.957e8;
/// Nominal total solar irradiance at 1 au, W/m^2 (IAU 2015 Resolution B3).
pub const S_SUN: f64 = 1361.0;
/// Nominal solar luminosity, W (IAU 2015 Resolution B3).
pub const L_SUN: f64 = 3.828e26;
/// Nominal solar effective temperature, K (IAU 2015 Resolution B3).
pub const TEFF_SUN: f64 = 5772.0;
/// Nominal solar mass parameter GM, m^3/s^2 (IAU 2015 Resolution B3).
pub const GM_SUN: f64 = 1.327_124_4e20;

/// Nominal equatorial Earth radius, m (IAU 2015 Resolution B3).
pub const R_EARTH: f64 = 6.378_1e6;
/// Nominal polar Earth radius, m (IAU 2015 Resolution B3).
pub const R_EARTH_POLAR: f64 = 6.356_8e6;
/// Nominal terrestrial mass parameter GM, m^3/s^2 (IAU 2015 Resolution B3).
pub const GM_EARTH: f64 = 3.986_004e14;

/// Nominal equatorial Jovian radius, m (IAU 2015 Resolution B3).
pub const R_JUPITER: f64 = 7.149_2e7;
/// Nominal polar Jovian radius, m (IAU 2015 Resolution B3).
pub const R_JUPITER_POLAR: f64 = 6.685_4e7;
/// Nominal Jovian mass parameter GM, m^3/s^2 (IAU 2015 Resolution B3).
pub const GM_JUPITER: f64 = 1.266_865_3e17;

/// Solar mass, kg: the nominal GM divided by G, as IAU 2015 B3 recommends for mass units.
pub const M_SUN: f64 = GM_SUN / G;
/// Earth mass, kg: nominal GM / G (IAU 2015 B3 recommendation).
pub const M_EARTH: f64 = GM_EARTH / G;
/// Jupiter mass, kg: nominal GM / G (IAU 2015 B3 recommendation).
pub const M_JUPITER: f64 = GM_JUPITER / G;

/// Astronomical unit, m (IAU 2012 Resolution B2, exact).
pub const AU: f64 = 149_597_870_700.0;
/// Parsec, m: 648000/pi au (IAU 2015 Resolution B2).
pub const PARSEC: f64 = 648_000.0 / std::f64::consts::PI * AU;
/// Day, s (86 400 SI seconds; IAU).
pub const DAY: f64 = 86_400.0;
/// Julian year, s: 365.25 days (IAU).
pub const JULIAN_YEAR: f64 = 365.25 * DAY;
/// Light-year, m: c times one Julian year (IAU).
pub const LIGHT_YEAR: f64 = C * JULIAN_YEAR;

/// Solar constant at 1 au used for insolation in Earth units, W/m^2 (IAU 2015 B3 nominal).
pub const INSOLATION_EARTH: f64 = S_SUN;

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn derived_masses_match_published_values() {
        // IAU 2015 B3 notes M_sun = GM_sun/G ~ 1.98848e30 kg with CODATA 2014 G (6.67408e-11);
        // with CODATA 2018 G it is 1.98841e30 kg (computed; common practice).
        assert!((M_SUN / 1.988_41e30 - 1.0).abs() < 1e-5);
        // Fact sheets (planetary fact sheet, NASA GSFC): Earth 5.9722e24 kg, Jupiter 1.89813e27 kg.
        assert!((M_EARTH / 5.9722e24 - 1.0).abs() < 1e-4);
        assert!((M_JUPITER / 1.898_13e27 - 1.0).abs() < 1e-4);
    }

    #[test]
    fn parsec_and_light_year_match_iau_figures() {
        // IAU 2015 B2: 1 pc = 3.085 677 581 491 3673e16 m (to the digits quoted there).
        assert!((PARSEC / 3.085_677_581_491_367e16 - 1.0).abs() < 1e-14);
        // IAU: 1 ly = 9 460 730 472 580 800 m exactly.
        assert_eq!(LIGHT_YEAR, 9_460_730_472_580_800.0);
    }

    #[test]
    fn stefan_boltzmann_from_exact_constants() {
        let pi = std::f64::consts::PI;
        let sigma = 2.0 * pi.powi(5) * K_B.powi(4) / (15.0 * H.powi(3) * C * C);
        assert!((sigma / SIGMA_SB - 1.0).abs() < 1e-9);
    }

    #[test]
    fn nominal_luminosity_is_consistent_with_radius_and_teff() {
        // IAU 2015 B3 defines L, R and Teff nominal values so that L = 4 pi R^2 sigma T^4
        // holds to about 1e-4 (the resolution's own remark).
        let l = 4.0 * std::f64::consts::PI * R_SUN * R_SUN * SIGMA_SB * TEFF_SUN.powi(4);
        assert!((l / L_SUN - 1.0).abs() < 2e-4);
    }
}
