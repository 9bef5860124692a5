//! The published mass–radius fits this project uses, with their coefficients and the ranges
//! they were fitted over. Every curve and class boundary in the folder is built from these.
//!
//! * **Seager, Kuchner, Hier-Majumder & Militzer (2007, ApJ 669, 1279)**, their fitted
//!   relation `log10 R_s = k1 + (1/3) log10 M_s − k2 M_s^k3`, `M_s = M / m1`, `R_s = R / r1`
//!   (verified: the paper's abstract, arXiv:0707.2895, gives this form and says it holds
//!   "for up to M_p ≈ 20 M⊕"; the equation number, eq. 23, is from memory), with one
//!   parameter set per material from the paper's table of fit parameters. The coefficients
//!   below are from memory: the table itself (Table 4, number also from memory) was not
//!   found in a stored copy. They agree digit for digit with independent public
//!   implementations of the fit (three for iron, two each for silicate and water; not the
//!   paper, so not a verification):
//!
//!   | material                 | m1 (M⊕) | r1 (R⊕) | k1        | k2     | k3    |
//!   |--------------------------|---------|---------|-----------|--------|-------|
//!   | Fe (ε phase)             | 5.80    | 2.52    | −0.20949  | 0.0804 | 0.394 |
//!   | MgSiO3 (perovskite)      | 10.55   | 3.90    | −0.20959  | 0.0799 | 0.413 |
//!   | H2O (ice)                | 5.52    | 4.43    | −0.20940  | 0.0807 | 0.375 |
//!
//!   Fitted range used here: 0.01–20 M⊕ (upper end: the abstract, verified; lower end:
//!   the low end of the paper's model grid, from memory). At small mass the correction
//!   term vanishes and the fit tends to the material's zero-pressure density, so its small-mass behaviour is sound; a test
//!   checks this limit against the paper's zero-pressure densities.
//!
//! * **Zeng, Sasselov & Jacobsen (2016, ApJ 819, 127)**, semi-empirical two-layer
//!   rocky relation scaled from Earth's seismic model:
//!   `R / R⊕ = (1.07 − 0.21 CMF) (M / M⊕)^(1/3.7)`, CMF = core (iron) mass fraction.
//!   The abstract (verified, arXiv:1512.08827) gives this formula and states it is applicable
//!   to 1–8 M⊕ and CMF 0.0–0.4.

/// Parameters of one Seager et al. (2007) fit.
#[derive(Clone, Copy, Debug, PartialEq)]
pub(super) struct SeagerFit {
    /// Mass scale m1, Earth masses.
    m1: f64,
    /// Radius scale r1, Earth radii.
    r1: f64,
    k1: f64,
    k2: f64,
    k3: f64,
}

// Seager, Kuchner, Hier-Majumder & Militzer 2007, ApJ 669, 1279, table of fit
// parameters (Table 4; coefficients from memory, not read from the paper: see above).
pub(super) const SEAGER_IRON: SeagerFit = SeagerFit {
    m1: 5.80,
    r1: 2.52,
    k1: -0.209_490,
    k2: 0.0804,
    k3: 0.394,
};
pub(super) const SEAGER_SILICATE: SeagerFit = SeagerFit {
    m1: 10.55,
    r1: 3.90,
    k1: -0.209_594,
    k2: 0.0799,
    k3: 0.413,
};
pub(super) const SEAGER_WATER: SeagerFit = SeagerFit {
    m1: 5.52,
    r1: 4.43,
    k1: -0.209_396,
    k2: 0.0807,
    k3: 0.375,
};

/// Fitted mass range of the Seager et al. (2007) relations, Earth masses (upper end: the
/// paper's abstract, verified; lower end: the model grid's, from memory).
pub(super) const SEAGER_MASS_RANGE_EARTH: (f64, f64) = (0.01, 20.0);
/// Mass range, Earth masses, inside which the solid-planet classes (iron-rich, rocky,
/// volatile-rich) are given; outside it a sample is "outside the models' range". Upper end:
/// the Seager et al. (2007) fits' stated limit (abstract). Lower end: about Mercury's mass
/// (0.055 M⊕), the lightest body the classes are checked on; below it the rock ceiling,
/// Zeng's power law extrapolated far under its fitted 1 M⊕, is less dense than real rock
/// and would call a Moon-like body iron-rich.
pub(super) const CLASSIFIED_MASS_RANGE_EARTH: (f64, f64) = (0.05, 20.0);
/// Applicable mass range of the Zeng et al. (2016) relation, Earth masses (abstract).
pub(super) const ZENG_MASS_RANGE_EARTH: (f64, f64) = (1.0, 8.0);
/// Applicable core-mass-fraction range of the Zeng et al. (2016) relation (abstract).
pub(super) const ZENG_CMF_RANGE: (f64, f64) = (0.0, 0.4);

impl SeagerFit {
    /// Radius in Earth radii for a mass in Earth masses (no range check).
    pub(super) fn radius_earth(&self, mass_earth: f64) -> f64 {
        self.radius_earth_from_ln(mass_earth.ln())
    }

    /// The same, from the natural log of the mass in Earth masses.
    pub(super) fn radius_earth_from_ln(&self, ln_mass_earth: f64) -> f64 {
        // log10 Rs = k1 + (1/3) log10 Ms - k2 Ms^k3, Ms = M/m1, R = r1 Rs; written with
        // exponentials of one natural log (the same function; the classifier calls it for
        // every sample, and `powf` and `log10` cost about twice as much).
        let ln_ms = ln_mass_earth - self.m1.ln();
        let ln10 = std::f64::consts::LN_10;
        let ln_rs = ln10 * self.k1 + ln_ms / 3.0 - ln10 * self.k2 * (self.k3 * ln_ms).exp();
        self.r1 * ln_rs.exp()
    }
}

/// Zeng et al. (2016) rocky relation, R = (1.07 - 0.21 CMF) M^(1/3.7), Earth units (no range
/// check).
pub(super) fn zeng_radius_earth(mass_earth: f64, cmf: f64) -> f64 {
    zeng_radius_earth_from_ln(mass_earth.ln(), cmf)
}

pub(super) fn zeng_radius_earth_from_ln(ln_mass_earth: f64, cmf: f64) -> f64 {
    (1.07 - 0.21 * cmf) * (ln_mass_earth / 3.7).exp()
}
