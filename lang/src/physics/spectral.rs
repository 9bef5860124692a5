//! Stellar properties estimated from a spectral type.
//!
//! This module owns (1) reading a spectral type such as `K0V`, `G2 V`, `M3.5V` or `K1IV-V`
//! into a class, a numeric subtype and a luminosity class, and (2) the mean properties of
//! main-sequence dwarfs by spectral type, interpolated linearly in subtype.
//!
//! # The table
//!
//! Effective temperature, radius and mass of mean dwarfs from A0V to M9V, after the dwarf
//! sequence of Pecaut & Mamajek (2013, ApJS 208, 9, Table 5, in its later online
//! revisions). Every number below was recalled, not read from the table while writing:
//! all are "from memory", good to a few percent at best.
//!
//! # Uncertainties
//!
//! A table row is a mean over stars of differing age and metallicity, and a spectral type
//! is usually good to about one subtype (common practice). The standard uncertainty given
//! to each estimate therefore adds in quadrature
//! - the change of the quantity over one subtype (half the difference between the values
//!   one subtype earlier and one subtype later), and
//! - a floor for the intrinsic spread of dwarfs of one type: 2% in Teff, 10% in radius and
//!   in mass (from memory; field dwarfs of one type spread by about this much).
//!
//! # What is not estimated
//!
//! Only dwarfs (luminosity class V) are estimated. Subgiants (IV), giants (III), bright
//! giants (II) and supergiants (I) — and types with no luminosity class at all — give
//! [`Refusal`]s: their radius and mass are not fixed by the type.

use crate::constants::{M_SUN, R_SUN};

/// A spectral type read from text.
#[derive(Debug, Clone, PartialEq)]
pub struct SpectralType {
    /// O, B, A, F, G, K or M.
    pub class: char,
    /// Numeric subtype, 0 to 9.5.
    pub subtype: f64,
    /// Luminosity class as written (`V`, `IV`, `III`, `IV-V`, ...), if any.
    pub luminosity_class: Option<String>,
}

impl SpectralType {
    /// Position on one axis: O0 = 0, B0 = 10, ... M0 = 60, plus the subtype.
    pub fn index(&self) -> f64 {
        let base = match self.class {
            'O' => 0.0,
            'B' => 10.0,
            'A' => 20.0,
            'F' => 30.0,
            'G' => 40.0,
            'K' => 50.0,
            _ => 60.0,
        };
        base + self.subtype
    }

    /// Whether the luminosity class says main sequence: `V`, or `V` with peculiarity
    /// letters after it (`Ve`, `Vn`). `IV-V` is a subgiant or dwarf, so not a dwarf.
    pub fn is_dwarf(&self) -> bool {
        self.luminosity_class.as_deref() == Some("V")
    }
}

/// Read a spectral type: class letter, subtype (integer or decimal), optional space,
/// luminosity class in Roman numerals (with `a`, `b`, `ab` or a range such as `IV-V`), and
/// trailing peculiarity letters (`e`, `n`, `p`, ...), which are ignored.
pub fn parse(text: &str) -> Result<SpectralType, String> {
    let t = text.trim();
    let mut chars = t.chars();
    let class = chars
        .next()
        .map(|c| c.to_ascii_uppercase())
        .filter(|c| "OBAFGKM".contains(*c))
        .ok_or_else(|| {
            format!("'{text}' does not start with a spectral class letter (O, B, A, F, G, K, M)")
        })?;
    let rest = chars.as_str();
    let digits: String = rest
        .chars()
        .take_while(|c| c.is_ascii_digit() || *c == '.')
        .collect();
    if digits.is_empty() {
        return Err(format!(
            "'{text}' has no numeric subtype after the class letter (write e.g. K0V)"
        ));
    }
    let subtype: f64 = digits
        .parse()
        .map_err(|_| format!("'{text}' has a malformed subtype '{digits}'"))?;
    if !(0.0..10.0).contains(&subtype) {
        return Err(format!("'{text}': the subtype must lie between 0 and 9.5"));
    }
    let after = rest.get(digits.len()..).unwrap_or("").trim_start();
    let lum: String = after
        .chars()
        .take_while(|c| matches!(c, 'I' | 'V' | '-' | '/' | 'a' | 'b'))
        .collect();
    let tail = after.get(lum.len()..).unwrap_or("").trim();
    if !tail
        .chars()
        .all(|c| c.is_ascii_lowercase() || matches!(c, ':' | '+' | '(' | ')'))
    {
        return Err(format!(
            "'{text}' has unexpected text '{tail}' after the type"
        ));
    }
    let lum = lum.trim_end_matches(['-', '/']);
    let lum = lum.trim_end_matches(['a', 'b']);
    let lum_class = if lum.is_empty() {
        None
    } else if lum.split(['-', '/']).all(|p| {
        matches!(
            p.trim_end_matches(['a', 'b']),
            "I" | "II" | "III" | "IV" | "V" | "VI"
        )
    }) {
        Some(lum.to_string())
    } else {
        return Err(format!("'{text}' has an unknown luminosity class '{lum}'"));
    };
    Ok(SpectralType {
        class,
        subtype,
        luminosity_class: lum_class,
    })
}

/// Mean dwarf properties at one spectral type.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct DwarfRow {
    /// Spectral-type index (see [`SpectralType::index`]).
    pub index: f64,
    pub teff_k: f64,
    pub radius_rsun: f64,
    pub mass_msun: f64,
}

const fn row(index: f64, teff_k: f64, radius_rsun: f64, mass_msun: f64) -> DwarfRow {
    DwarfRow {
        index,
        teff_k,
        radius_rsun,
        mass_msun,
    }
}

/// The source of [`DWARF_SEQUENCE`], shown with every estimate.
pub const TABLE_SOURCE: &str =
    "mean main-sequence dwarf table after Pecaut & Mamajek 2013, ApJS 208, 9 (values from memory)";

/// Mean dwarfs, A0V to M9V (Pecaut & Mamajek 2013 dwarf sequence; every value from memory).
pub const DWARF_SEQUENCE: &[DwarfRow] = &[
    row(20.0, 9700.0, 2.193, 2.18),  // A0V
    row(22.0, 8840.0, 2.136, 2.05),  // A2V
    row(25.0, 8080.0, 1.861, 1.86),  // A5V
    row(27.0, 7770.0, 1.794, 1.74),  // A7V
    row(30.0, 7220.0, 1.728, 1.61),  // F0V
    row(32.0, 6810.0, 1.473, 1.46),  // F2V
    row(35.0, 6510.0, 1.359, 1.33),  // F5V
    row(38.0, 6170.0, 1.217, 1.18),  // F8V
    row(40.0, 5920.0, 1.100, 1.06),  // G0V
    row(42.0, 5770.0, 1.012, 1.02),  // G2V
    row(45.0, 5660.0, 0.977, 0.98),  // G5V
    row(48.0, 5490.0, 0.927, 0.94),  // G8V
    row(50.0, 5280.0, 0.880, 0.88),  // K0V
    row(51.0, 5170.0, 0.845, 0.86),  // K1V
    row(52.0, 5040.0, 0.800, 0.82),  // K2V
    row(53.0, 4830.0, 0.750, 0.78),  // K3V
    row(54.0, 4600.0, 0.730, 0.73),  // K4V
    row(55.0, 4440.0, 0.701, 0.70),  // K5V
    row(56.0, 4300.0, 0.665, 0.69),  // K6V
    row(57.0, 4050.0, 0.630, 0.64),  // K7V
    row(60.0, 3850.0, 0.588, 0.57),  // M0V
    row(61.0, 3660.0, 0.501, 0.50),  // M1V
    row(62.0, 3560.0, 0.446, 0.44),  // M2V
    row(63.0, 3430.0, 0.361, 0.37),  // M3V
    row(64.0, 3210.0, 0.274, 0.23),  // M4V
    row(65.0, 3060.0, 0.196, 0.162), // M5V
    row(66.0, 2810.0, 0.137, 0.102), // M6V
    row(67.0, 2680.0, 0.120, 0.090), // M7V
    row(68.0, 2570.0, 0.114, 0.085), // M8V
    row(69.0, 2380.0, 0.104, 0.079), // M9V
];

/// Mean dwarf properties at a spectral-type index, interpolated linearly between the
/// table's rows; `None` outside A0V–M9V.
pub fn dwarf_at(index: f64) -> Option<DwarfRow> {
    let pairs = DWARF_SEQUENCE.windows(2);
    for w in pairs {
        let (Some(a), Some(b)) = (w.first(), w.get(1)) else {
            continue;
        };
        if index >= a.index && index <= b.index {
            let f = (index - a.index) / (b.index - a.index);
            let lerp = |x: f64, y: f64| x + f * (y - x);
            return Some(DwarfRow {
                index,
                teff_k: lerp(a.teff_k, b.teff_k),
                radius_rsun: lerp(a.radius_rsun, b.radius_rsun),
                mass_msun: lerp(a.mass_msun, b.mass_msun),
            });
        }
    }
    None
}

/// One estimated quantity: SI value and standard uncertainty.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Estimate {
    pub value: f64,
    pub sigma: f64,
}

/// Teff (K), radius (m) and mass (kg) of a mean dwarf of this type, with the widened
/// uncertainties described in the module docs.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct DwarfEstimate {
    pub teff: Estimate,
    pub radius: Estimate,
    pub mass: Estimate,
}

/// How the uncertainty of an estimate is made, in words (shown with every estimate).
pub const UNCERTAINTY_WORDS: &str = "uncertainty: the table's change over ±1 subtype added in quadrature to an intrinsic spread of 2% (Teff) or 10% (radius, mass)";

/// Why a spectral type gives no estimate.
#[derive(Debug, Clone, PartialEq)]
pub enum Refusal {
    /// Not readable as a spectral type.
    Unreadable(String),
    /// No luminosity class: a dwarf cannot be assumed.
    NoLuminosityClass,
    /// A luminosity class other than V (subgiant, giant, supergiant, or a range).
    NotADwarf(String),
    /// A dwarf outside the table (O and B types, or past M9).
    OutsideTable,
}

impl std::fmt::Display for Refusal {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            Refusal::Unreadable(why) => write!(f, "{why}"),
            Refusal::NoLuminosityClass => write!(
                f,
                "no luminosity class is given, so the star cannot be taken for a dwarf"
            ),
            Refusal::NotADwarf(c) => write!(
                f,
                "luminosity class {c} is not the main sequence; the radius and mass of an evolved star do not follow from its type"
            ),
            Refusal::OutsideTable => write!(f, "the dwarf table covers A0V to M9V only"),
        }
    }
}

/// Estimate a dwarf's Teff, radius and mass from its spectral type.
pub fn estimate(text: &str) -> Result<(SpectralType, DwarfEstimate), Refusal> {
    let st = parse(text).map_err(Refusal::Unreadable)?;
    match st.luminosity_class.as_deref() {
        None => return Err(Refusal::NoLuminosityClass),
        Some("V") => {}
        Some(other) => return Err(Refusal::NotADwarf(other.to_string())),
    }
    let i = st.index();
    let mid = dwarf_at(i).ok_or(Refusal::OutsideTable)?;
    let first = DWARF_SEQUENCE.first().map_or(i, |r| r.index);
    let last = DWARF_SEQUENCE.last().map_or(i, |r| r.index);
    let lo = dwarf_at((i - 1.0).max(first)).unwrap_or(mid);
    let hi = dwarf_at((i + 1.0).min(last)).unwrap_or(mid);
    let est = |v: f64, a: f64, b: f64, floor: f64| {
        let step = (a - b).abs() / 2.0;
        Estimate {
            value: v,
            sigma: (step * step + (floor * v).powi(2)).sqrt(),
        }
    };
    let teff = est(mid.teff_k, lo.teff_k, hi.teff_k, 0.02);
    let radius = est(mid.radius_rsun, lo.radius_rsun, hi.radius_rsun, 0.10);
    let mass = est(mid.mass_msun, lo.mass_msun, hi.mass_msun, 0.10);
    Ok((
        st,
        DwarfEstimate {
            teff,
            radius: Estimate {
                value: radius.value * R_SUN,
                sigma: radius.sigma * R_SUN,
            },
            mass: Estimate {
                value: mass.value * M_SUN,
                sigma: mass.sigma * M_SUN,
            },
        },
    ))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::constants::{R_SUN, TEFF_SUN};

    #[test]
    fn parses_the_usual_spellings() {
        let k0 = parse("K0V").unwrap();
        assert_eq!((k0.class, k0.subtype), ('K', 0.0));
        assert!(k0.is_dwarf());
        let g2 = parse("G2 V").unwrap();
        assert_eq!((g2.class, g2.subtype, g2.is_dwarf()), ('G', 2.0, true));
        let m = parse("M3.5V").unwrap();
        assert_eq!((m.class, m.subtype), ('M', 3.5));
        assert_eq!(m.index(), 63.5);
        assert_eq!(
            parse("K1IV-V").unwrap().luminosity_class.as_deref(),
            Some("IV-V")
        );
        assert_eq!(
            parse("G8III").unwrap().luminosity_class.as_deref(),
            Some("III")
        );
        assert_eq!(
            parse("M2Ve").unwrap().luminosity_class.as_deref(),
            Some("V")
        );
        assert_eq!(
            parse("A5Ia").unwrap().luminosity_class.as_deref(),
            Some("I")
        );
        assert_eq!(parse("G5").unwrap().luminosity_class, None);
        for bad in ["", "X2V", "K", "Kv", "K12V", "K0Q"] {
            assert!(parse(bad).is_err(), "{bad} accepted");
        }
    }

    #[test]
    fn estimates_reproduce_the_table_rows() {
        // Rows of the dwarf table (Pecaut & Mamajek 2013 dwarf sequence; from memory).
        for (text, teff, r, m) in [
            ("G2V", 5770.0, 1.012, 1.02),
            ("K0V", 5280.0, 0.880, 0.88),
            ("M0V", 3850.0, 0.588, 0.57),
            ("F5V", 6510.0, 1.359, 1.33),
        ] {
            let (_, e) = estimate(text).unwrap();
            assert_eq!(e.teff.value, teff, "{text}");
            assert!((e.radius.value / R_SUN - r).abs() < 1e-12, "{text}");
            assert!((e.mass.value / M_SUN - m).abs() < 1e-12, "{text}");
        }
        // Halfway between M3V (3430 K) and M4V (3210 K).
        let (_, e) = estimate("M3.5V").unwrap();
        assert!((e.teff.value - 3320.0).abs() < 1e-9);
    }

    #[test]
    fn a_g2_dwarf_is_the_sun_within_the_uncertainty() {
        // IAU 2015 B3 nominal solar Teff 5772 K and radius 1 Rsun; the Sun is G2V (common practice).
        let (_, e) = estimate("G2V").unwrap();
        assert!((e.teff.value - TEFF_SUN).abs() < e.teff.sigma);
        assert!((e.radius.value - R_SUN).abs() < e.radius.sigma);
        assert!((e.mass.value - M_SUN).abs() < e.mass.sigma);
    }

    #[test]
    fn uncertainties_are_widened_as_documented() {
        let (_, e) = estimate("K0V").unwrap();
        // Teff: ±1 subtype spans G9V..K1V: (5170 - G9V)/2 in quadrature with 2%.
        let g9 = dwarf_at(49.0).unwrap().teff_k;
        let step = (g9 - 5170.0) / 2.0;
        let expect = (step * step + (0.02f64 * 5280.0).powi(2)).sqrt();
        assert!((e.teff.sigma - expect).abs() < 1e-9);
        assert!(e.radius.sigma / e.radius.value >= 0.10);
        assert!(e.mass.sigma / e.mass.value >= 0.10);
    }

    #[test]
    fn the_sequence_is_monotonic() {
        for w in DWARF_SEQUENCE.windows(2) {
            assert!(w[0].index < w[1].index);
            assert!(w[0].teff_k > w[1].teff_k);
            assert!(w[0].radius_rsun > w[1].radius_rsun);
            assert!(w[0].mass_msun > w[1].mass_msun);
        }
    }

    #[test]
    fn evolved_and_unclassified_types_are_refused() {
        assert!(matches!(estimate("K0III"), Err(Refusal::NotADwarf(c)) if c == "III"));
        assert!(matches!(estimate("G8IV"), Err(Refusal::NotADwarf(_))));
        assert!(matches!(estimate("K1IV-V"), Err(Refusal::NotADwarf(_))));
        assert!(matches!(estimate("B2Ia"), Err(Refusal::NotADwarf(_))));
        assert_eq!(estimate("G5"), Err(Refusal::NoLuminosityClass));
        assert_eq!(estimate("B5V"), Err(Refusal::OutsideTable));
        assert!(matches!(estimate("hot"), Err(Refusal::Unreadable(_))));
    }
}
