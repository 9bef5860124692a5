//! Dimensions and units at run time.
//!
//! A [`Dimension`] is a product of base dimensions (length, mass, time, temperature, angle)
//! with rational exponents, so `sqrt` and `cbrt` stay exact. Angle is a base dimension of
//! its own here, deliberately: `inclination = 88` must not pass for `88 deg`.
//!
//! One registry ([`lookup`]) holds every unit symbol with its aliases, its SI factor, its
//! dimension, whether SI prefixes apply, and the standard its value comes from. Constants
//! live in [`crate::constants`].

use crate::ast::UnitExpr;
use crate::constants as k;
use std::sync::OnceLock;

mod dimension;
pub use dimension::{Dimension, Rat};

/// One entry of the unit registry.
#[derive(Debug, Clone)]
pub struct UnitDef {
    pub symbol: &'static str,
    pub aliases: &'static [&'static str],
    pub name: &'static str,
    /// Multiply a value in this unit by `factor` to get SI.
    pub factor: f64,
    pub dim: Dimension,
    pub prefixes: bool,
    pub source: &'static str,
}

const PREFIXES: &[(&str, f64)] = &[
    ("Q", 1e30),
    ("R", 1e27),
    ("Y", 1e24),
    ("Z", 1e21),
    ("E", 1e18),
    ("P", 1e15),
    ("T", 1e12),
    ("G", 1e9),
    ("M", 1e6),
    ("k", 1e3),
    ("h", 1e2),
    ("da", 1e1),
    ("d", 1e-1),
    ("c", 1e-2),
    ("m", 1e-3),
    ("u", 1e-6),
    ("µ", 1e-6),
    ("μ", 1e-6),
    ("n", 1e-9),
    ("p", 1e-12),
    ("f", 1e-15),
    ("a", 1e-18),
];

fn registry() -> &'static [UnitDef] {
    static REG: OnceLock<Vec<UnitDef>> = OnceLock::new();
    REG.get_or_init(build_registry)
}

fn build_registry() -> Vec<UnitDef> {
    use Dimension as D;
    let u = |symbol, aliases, name, factor, dim, prefixes, source| UnitDef {
        symbol,
        aliases,
        name,
        factor,
        dim,
        prefixes,
        source,
    };
    let si = "SI base or derived unit (SI Brochure, 9th edition, 2019)";
    let b3 = "IAU 2015 Resolution B3 nominal value";
    let mut v = vec![
        u("m", &[], "metre", 1.0, D::LENGTH, true, si),
        u("g", &[], "gram", 1e-3, D::MASS, true, si),
        u("s", &["sec"], "second", 1.0, D::TIME, true, si),
        u("K", &[], "kelvin", 1.0, D::TEMPERATURE, true, si),
        u("rad", &[], "radian", 1.0, D::ANGLE, true, si),
        u("W", &[], "watt", 1.0, D::of(2, 1, -3, 0, 0), true, si),
        u("J", &[], "joule", 1.0, D::of(2, 1, -2, 0, 0), true, si),
        u("N", &[], "newton", 1.0, D::of(1, 1, -2, 0, 0), true, si),
        u("Hz", &[], "hertz", 1.0, D::of(0, 0, -1, 0, 0), true, si),
        u(
            "erg",
            &[],
            "erg",
            1e-7,
            D::of(2, 1, -2, 0, 0),
            false,
            "cgs unit, 1e-7 J (exact by definition)",
        ),
        u(
            "min",
            &[],
            "minute",
            60.0,
            D::TIME,
            false,
            "60 s (SI Brochure, non-SI unit accepted for use)",
        ),
        u(
            "h",
            &["hr"],
            "hour",
            3600.0,
            D::TIME,
            false,
            "3600 s (SI Brochure, non-SI unit accepted for use)",
        ),
        u(
            "d",
            &["day", "days"],
            "day",
            k::DAY,
            D::TIME,
            false,
            "86 400 s (SI Brochure; IAU)",
        ),
        u(
            "yr",
            &["a_j"],
            "Julian year",
            k::JULIAN_YEAR,
            D::TIME,
            true,
            "Julian year, 365.25 d (IAU)",
        ),
        u(
            "deg",
            &["°"],
            "degree",
            std::f64::consts::PI / 180.0,
            D::ANGLE,
            false,
            "pi/180 rad (SI Brochure)",
        ),
        u(
            "arcmin",
            &[],
            "arcminute",
            std::f64::consts::PI / 10_800.0,
            D::ANGLE,
            false,
            "pi/10800 rad (SI Brochure)",
        ),
        u(
            "arcsec",
            &["as"],
            "arcsecond",
            std::f64::consts::PI / 648_000.0,
            D::ANGLE,
            false,
            "pi/648000 rad (SI Brochure)",
        ),
        u(
            "mas",
            &[],
            "milliarcsecond",
            std::f64::consts::PI / 648_000_000.0,
            D::ANGLE,
            false,
            "1e-3 arcsec",
        ),
        u(
            "uas",
            &["µas", "μas"],
            "microarcsecond",
            std::f64::consts::PI / 648_000_000_000.0,
            D::ANGLE,
            false,
            "1e-6 arcsec",
        ),
        u(
            "au",
            &["AU"],
            "astronomical unit",
            k::AU,
            D::LENGTH,
            false,
            "IAU 2012 Resolution B2 (exact)",
        ),
        u(
            "pc",
            &[],
            "parsec",
            k::PARSEC,
            D::LENGTH,
            true,
            "648000/pi au (IAU 2015 Resolution B2)",
        ),
        u(
            "ly",
            &[],
            "light-year",
            k::LIGHT_YEAR,
            D::LENGTH,
            false,
            "c times one Julian year (IAU)",
        ),
        u(
            "Msun",
            &["M☉", "Msol", "M_sun"],
            "nominal solar mass",
            k::M_SUN,
            D::MASS,
            false,
            "IAU 2015 B3 nominal GM_sun divided by CODATA 2018 G",
        ),
        u(
            "Mjup",
            &["MJ", "M_jup", "Mjupiter"],
            "nominal Jupiter mass",
            k::M_JUPITER,
            D::MASS,
            false,
            "IAU 2015 B3 nominal GM_J divided by CODATA 2018 G",
        ),
        u(
            "Mearth",
            &["M⊕", "M_earth", "Mearth"],
            "nominal Earth mass",
            k::M_EARTH,
            D::MASS,
            false,
            "IAU 2015 B3 nominal GM_E divided by CODATA 2018 G",
        ),
        u(
            "Rsun",
            &["R☉", "Rsol", "R_sun"],
            "nominal solar radius",
            k::R_SUN,
            D::LENGTH,
            false,
            b3,
        ),
        u(
            "Rjup",
            &["RJ", "R_jup", "Rjupiter"],
            "nominal equatorial Jupiter radius",
            k::R_JUPITER,
            D::LENGTH,
            false,
            b3,
        ),
        u(
            "Rearth",
            &["R⊕", "R_earth"],
            "nominal equatorial Earth radius",
            k::R_EARTH,
            D::LENGTH,
            false,
            b3,
        ),
        u(
            "Lsun",
            &["L☉", "Lsol", "L_sun"],
            "nominal solar luminosity",
            k::L_SUN,
            D::of(2, 1, -3, 0, 0),
            false,
            b3,
        ),
        u(
            "Searth",
            &["S⊕", "S_earth"],
            "insolation at Earth (nominal total solar irradiance)",
            k::S_SUN,
            D::of(0, 1, -3, 0, 0),
            false,
            "IAU 2015 B3 nominal total solar irradiance, 1361 W/m^2",
        ),
        u("%", &["percent"], "percent", 1e-2, D::NONE, false, "1/100"),
        u("ppm", &[], "part per million", 1e-6, D::NONE, false, "1e-6"),
        u(
            "ppt",
            &[],
            "part per thousand",
            1e-3,
            D::NONE,
            false,
            "1e-3",
        ),
        u(
            "mag",
            &[],
            "magnitude",
            1.0,
            D::NONE,
            false,
            "astronomical magnitude: -2.5 log10 of a flux ratio (common practice)",
        ),
        u(
            "mmag",
            &[],
            "millimagnitude",
            1e-3,
            D::NONE,
            false,
            "1e-3 mag",
        ),
        u(
            "dex",
            &[],
            "decimal exponent",
            1.0,
            D::NONE,
            false,
            "dimensionless logarithm (common practice)",
        ),
    ];
    // One unit per Julian-date time system: all count days of 86 400 s; the symbol names
    // the time scale and where the clock sits (see `crate::time`, docs/timescales.md).
    v.extend(crate::time::JD_UNITS.iter().map(|sym| {
        u(
            *sym,
            &[],
            "Julian date (days)",
            k::DAY,
            D::TIME,
            false,
            "Julian date: days of 86 400 s (IAU); the symbol names the time scale",
        )
    }));
    v
}

/// A resolved unit: its SI factor and dimension (and the text it was written as).
#[derive(Debug, Clone, PartialEq)]
pub struct Unit {
    pub factor: f64,
    pub dim: Dimension,
    /// Kept inline up to 24 bytes (every unit of a catalogue): resolving allocates nothing.
    pub text: crate::ast::Name,
}

impl Unit {
    pub fn one() -> Unit {
        Unit {
            factor: 1.0,
            dim: Dimension::NONE,
            text: crate::ast::Name::default(),
        }
    }
}

/// Why a unit symbol did not resolve.
#[derive(Debug, Clone, PartialEq)]
pub struct UnknownUnit {
    pub symbol: String,
    pub suggestion: Option<&'static str>,
}

/// Look up one symbol, with or without an SI prefix.
pub fn lookup(symbol: &str) -> Option<(f64, &'static UnitDef)> {
    let (plain, prefixable) = symbol_index();
    if let Some(&def) = plain.get(symbol) {
        return Some((def.factor, def));
    }
    for (p, scale) in PREFIXES {
        if let Some(rest) = symbol.strip_prefix(p) {
            if let Some(&def) = prefixable.get(rest) {
                return Some((scale * def.factor, def));
            }
        }
    }
    None
}

/// The registry by spelling: every symbol and alias (the first unit in registry order that
/// has it), and the symbols that take a prefix. Every value with a unit is looked up here,
/// so a file of a hundred thousand values no longer scans the registry's list for each.
#[allow(clippy::type_complexity)]
fn symbol_index() -> &'static (
    rustc_hash::FxHashMap<&'static str, &'static UnitDef>,
    rustc_hash::FxHashMap<&'static str, &'static UnitDef>,
) {
    static INDEX: OnceLock<(
        rustc_hash::FxHashMap<&'static str, &'static UnitDef>,
        rustc_hash::FxHashMap<&'static str, &'static UnitDef>,
    )> = OnceLock::new();
    INDEX.get_or_init(|| {
        let mut plain = rustc_hash::FxHashMap::default();
        let mut prefixable = rustc_hash::FxHashMap::default();
        for def in registry() {
            for s in std::iter::once(def.symbol).chain(def.aliases.iter().copied()) {
                plain.entry(s).or_insert(def);
            }
            if def.prefixes {
                prefixable.entry(def.symbol).or_insert(def);
            }
        }
        (plain, prefixable)
    })
}

/// Every registered unit (for completion and documentation).
pub fn all_units() -> &'static [UnitDef] {
    registry()
}

/// Unit spellings of one dimension, for completion and conversion: every registered unit of
/// that dimension and a few common prefixed and compound spellings, with a name each.
/// The logarithmic family of a unit symbol (`mag` for `mag` and `mmag`, `dex`), if it is one.
pub fn log_family(sym: &str) -> Option<&'static str> {
    match sym {
        "mag" | "mmag" => Some("mag"),
        "dex" => Some("dex"),
        _ => None,
    }
}

/// Whether a quantity shown in `display` may be written in unit `sym`: magnitudes and dex are
/// logarithms of a ratio, not scale factors, so only quantities shown in them take them.
pub fn takes_unit(display: &str, sym: &str) -> bool {
    log_family(sym).is_none_or(|f| log_family(display) == Some(f))
}

pub fn units_for(dim: Dimension) -> Vec<(String, String)> {
    const COMMON: &[(&str, &str)] = &[
        ("km", "kilometre"),
        ("cm", "centimetre"),
        ("kg", "kilogram"),
        ("Myr", "million Julian years"),
        ("Gyr", "billion Julian years"),
        ("kpc", "kiloparsec"),
        ("m/s", "metre per second"),
        ("km/s", "kilometre per second"),
        ("m/s^2", "metre per second squared"),
        ("cm/s^2", "centimetre per second squared"),
        ("g/cm^3", "gram per cubic centimetre"),
        ("kg/m^3", "kilogram per cubic metre"),
        ("W/m^2", "watt per square metre"),
    ];
    let mut out: Vec<(String, String)> = Vec::new();
    for def in registry() {
        if def.dim == dim {
            out.push((def.symbol.to_string(), def.name.to_string()));
        }
    }
    for (text, name) in COMMON {
        if parse_unit_text(text).is_some_and(|u| u.dim == dim) && !out.iter().any(|o| o.0 == *text)
        {
            out.push(((*text).to_string(), (*name).to_string()));
        }
    }
    out
}

/// A temperature scale with an offset from kelvin. The registry holds none on purpose: a
/// reading and a difference would convert differently (20 °C is 293.15 K, a change of 20 °C
/// is 20 K), and every value here is a scale factor times a number.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct OffsetScale {
    /// The symbol people write, for messages.
    pub symbol: &'static str,
    pub name: &'static str,
    /// Kelvin per degree of the scale.
    pub per_degree: f64,
    /// The reading that is 0 K.
    pub zero: f64,
}

impl OffsetScale {
    /// A reading on this scale in kelvin.
    pub fn kelvin(&self, reading: f64) -> f64 {
        (reading - self.zero) * self.per_degree
    }

    /// How to convert, in words.
    pub fn rule(&self) -> &'static str {
        if self.symbol == "°C" {
            "K = °C + 273.15"
        } else {
            "K = (°F + 459.67) × 5/9"
        }
    }
}

/// The scale an unknown symbol names, if it is a temperature scale with an offset: `C`,
/// `°C`, `degC`, `celsius`, and the same for Fahrenheit.
pub fn offset_scale(symbol: &str) -> Option<OffsetScale> {
    // Definitions of the scales (SI Brochure for Celsius; common practice for Fahrenheit).
    const CELSIUS: OffsetScale = OffsetScale {
        symbol: "°C",
        name: "degrees Celsius",
        per_degree: 1.0,
        zero: -273.15,
    };
    const FAHRENHEIT: OffsetScale = OffsetScale {
        symbol: "°F",
        name: "degrees Fahrenheit",
        per_degree: 5.0 / 9.0,
        zero: -459.67,
    };
    match symbol {
        "C" | "°C" | "degC" | "deg_C" | "celsius" | "Celsius" => Some(CELSIUS),
        "F" | "°F" | "degF" | "deg_F" | "fahrenheit" | "Fahrenheit" => Some(FAHRENHEIT),
        _ => None,
    }
}

/// Spellings of the astronomical units that papers and general-purpose unit libraries use
/// but this language does not take (common practice), with the symbol meant. Kept out of the
/// registry on purpose: `ME` and `RE` are Earth's mass and radius in many papers but read as
/// other things elsewhere, so the user confirms the reading by writing the symbol. Without
/// this list the edit distance would offer `m` for `ME` and `Rsun` for `RE`.
const OTHER_SPELLINGS: &[(&str, &str)] = &[
    ("ME", "Mearth"),
    ("M_E", "Mearth"),
    ("RE", "Rearth"),
    ("R_E", "Rearth"),
    ("M_J", "Mjup"),
    ("R_J", "Rjup"),
    ("earthMass", "Mearth"),
    ("earthRad", "Rearth"),
    ("jupiterMass", "Mjup"),
    ("jupiterRad", "Rjup"),
    ("solMass", "Msun"),
    ("solRad", "Rsun"),
    ("solLum", "Lsun"),
    ("degree", "deg"),
    ("degrees", "deg"),
    ("hrs", "h"),
    ("hour", "h"),
    ("hours", "h"),
    ("mps", "m/s"),
    ("kms", "km/s"),
    ("Kelvin", "K"),
    ("kelvin", "K"),
    ("Kelvins", "K"),
    ("kelvins", "K"),
    ("Kms", "km/s"),
    ("parsec", "pc"),
    ("parsecs", "pc"),
    ("Gy", "Gyr"),
    ("Gyrs", "Gyr"),
    ("Myrs", "Myr"),
    ("yrs", "yr"),
    // Subscript e (Earth), J (Jupiter), o and "solar" (the Sun) as papers write them.
    ("Re", "Rearth"),
    ("Me", "Mearth"),
    ("R_e", "Rearth"),
    ("M_e", "Mearth"),
    ("Rj", "Rjup"),
    ("Mj", "Mjup"),
    ("Ro", "Rsun"),
    ("Mo", "Msun"),
    ("Lo", "Lsun"),
    ("R_solar", "Rsun"),
    ("M_solar", "Msun"),
    ("L_solar", "Lsun"),
];

/// The nearest known symbol, for a did-you-mean hint. A symbol of one or two characters
/// is nearly as close to every short symbol as to the one meant (`C` is one edit from
/// `m`, `g`, `s` and `K`, `R_J` two from `yr`), so a suggestion may be at most half as many
/// edits away as the symbol has characters.
pub fn suggest(symbol: &str) -> Option<&'static str> {
    suggest_for(symbol, None)
}

/// [`suggest`] for a unit that should have the dimension `wanted`: only spellings of that
/// dimension (`Msn` for a mass is `Msun`, not `min`; `parsec` is `pc`, not `arcsec`).
pub fn suggest_for(symbol: &str, wanted: Option<Dimension>) -> Option<&'static str> {
    if offset_scale(symbol).is_some() {
        return None;
    }
    if let Some((_, meant)) = OTHER_SPELLINGS.iter().find(|(other, _)| *other == symbol) {
        return Some(meant);
    }
    let lower = symbol.to_lowercase();
    let length = symbol.chars().count();
    let mut best: Option<(usize, &'static str)> = None;
    for def in registry() {
        if wanted.is_some_and(|w| w != def.dim) {
            continue;
        }
        for cand in std::iter::once(&def.symbol).chain(def.aliases.iter()) {
            // Within two edits and half the symbol, and closer than the best so far.
            let cap = best
                .map_or(2, |(bd, _)| bd.saturating_sub(1))
                .min(length / 2);
            if best.is_some_and(|(bd, _)| bd == 0) {
                break;
            }
            if let Some(d) = crate::text::distance_within(&lower, &cand.to_lowercase(), cap) {
                best = Some((d, def.symbol));
            }
        }
    }
    best.map(|(_, s)| s)
}

/// Resolve a parsed unit expression. Errors name each unknown symbol.
pub fn resolve(expr: &UnitExpr) -> Result<Unit, Vec<(crate::source::Span, UnknownUnit)>> {
    // Most units are one symbol to the first power (`Msun`, `d`, `%`): no powers to take
    // and the text is the symbol. The same result as the general path below.
    if let [f] = expr.factors.as_slice() {
        if f.exponent == 1 {
            if let Some((scale, def)) = lookup(&f.symbol.name) {
                return Ok(Unit {
                    factor: scale,
                    dim: def.dim,
                    text: f.symbol.name.clone(),
                });
            }
        }
    }
    resolve_general(expr)
}

/// [`resolve`] without its shortcut for one symbol (a test compares the two).
fn resolve_general(expr: &UnitExpr) -> Result<Unit, Vec<(crate::source::Span, UnknownUnit)>> {
    let mut factor = 1.0;
    let mut dim = Dimension::NONE;
    let mut errors = Vec::new();
    for f in &expr.factors {
        match lookup(&f.symbol.name) {
            Some((scale, def)) => {
                factor *= scale.powi(f.exponent);
                dim = dim.times(def.dim.pow(Rat::int(f.exponent)));
            }
            None => errors.push((
                f.symbol.span,
                UnknownUnit {
                    symbol: f.symbol.name.to_string(),
                    suggestion: suggest(&f.symbol.name),
                },
            )),
        }
    }
    if errors.is_empty() {
        Ok(Unit {
            factor,
            dim,
            text: unit_text(expr).into(),
        })
    } else {
        Err(errors)
    }
}

/// The canonical spelling of a unit expression: numerator factors joined by spaces, each
/// denominator factor after a `/` (`km s^-1` is spelled `km/s`, `g cm^-3` is `g/cm^3`).
pub fn unit_text(expr: &UnitExpr) -> String {
    use std::fmt::Write;
    // Written into one string (every value with a unit comes through here): the factors
    // with positive exponents joined by spaces, then each negative one after a '/'; with
    // no positive factor, the negative ones joined by spaces with their signs.
    let mut out = String::with_capacity(
        expr.factors
            .iter()
            .map(|f| f.symbol.name.len() + 4)
            .sum::<usize>(),
    );
    let put = |out: &mut String, name: &str, e: i32| {
        out.push_str(name);
        if e != 1 {
            let _ = write!(out, "^{e}");
        }
    };
    let any_positive = expr.factors.iter().any(|f| f.exponent > 0);
    let mut first = true;
    for f in expr.factors.iter().filter(|f| f.exponent > 0) {
        if !first {
            out.push(' ');
        }
        first = false;
        put(&mut out, &f.symbol.name, f.exponent);
    }
    for f in expr.factors.iter().filter(|f| f.exponent < 0) {
        if any_positive {
            out.push('/');
            put(&mut out, &f.symbol.name, -f.exponent);
        } else {
            if !first {
                out.push(' ');
            }
            first = false;
            put(&mut out, &f.symbol.name, f.exponent);
        }
    }
    out
}

/// Parse a unit written as text (`km/s`, `g/cm^3`, `W/m^2`, `km s^-1`), for display units
/// and conversions requested by front ends.
pub fn parse_unit_text(text: &str) -> Option<Unit> {
    let text = text.trim();
    if text.is_empty() || text == "1" {
        return Some(Unit::one());
    }
    let mut factor = 1.0;
    let mut dim = Dimension::NONE;
    for (i, part) in text.split('/').enumerate() {
        // `Rearth/`, `/s`, `m//s`: a unit is written into files as given, where it would not
        // parse.
        if part.trim().is_empty() {
            return None;
        }
        for word in part.split_whitespace() {
            let (sym, exp) = match word.split_once('^') {
                Some((s, e)) => (s, e.parse::<i32>().ok()?),
                None => (word, 1),
            };
            let exp = if i > 0 { -exp } else { exp };
            let (scale, def) = lookup(sym)?;
            factor *= scale.powi(exp);
            dim = dim.times(def.dim.pow(Rat::int(exp)));
        }
    }
    Some(Unit {
        factor,
        dim,
        text: text.into(),
    })
}

#[cfg(test)]
mod tests;
