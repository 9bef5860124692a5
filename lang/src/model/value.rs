//! Lowering one property's value: a literal measurement to SI with its dimension and range
//! checked, text, a timestamp, or an expression handed to the resolver.

use super::{Content, Form, Measurement, Resolved};
use crate::ast::{self, BodyKind, ExprKind, Relation, Uncertainty};
use crate::diagnostic::{Diagnostic, Rule};
use crate::quantities::{self, Qty, QuantityDef};
use crate::source::Span;
use crate::units::{self, Dimension};

/// The display unit as written after a number: nothing for plain numbers.
fn unit_suffix(def: &QuantityDef) -> &'static str {
    if def.display == "1" {
        ""
    } else {
        def.display
    }
}

pub(super) fn unknown_quantity(kind: BodyKind, name: &ast::Ident) -> Diagnostic {
    let mut d = Diagnostic::new(
        Rule::UnknownQuantity,
        name.span,
        format!("'{}' is not a quantity of a {}", name.name, kind.as_str()),
    );
    let other = match kind {
        BodyKind::Star => BodyKind::Planet,
        BodyKind::Planet => BodyKind::Star,
    };
    if let Some(what) = quantities::not_a_quantity(&name.name) {
        d = d.with_help(format!(
            "'{}' ({what}) is not among Syzygy's quantities (docs/language.md lists them); keep it in a comment",
            name.name
        ));
    } else if let Some(s) = quantities::suggest(kind, &name.name) {
        d = d.with_help(format!("did you mean '{s}'?"));
    } else if quantities::find(other, &name.name).is_some() {
        d = d.with_help(format!(
            "'{}' is a quantity of a {}; declare it there",
            name.name,
            other.as_str()
        ));
    } else if let Some(s) = quantities::suggest(other, &name.name) {
        d = d.with_help(format!(
            "did you mean '{s}'? It is a quantity of a {}; declare it there",
            other.as_str()
        ));
    }
    d
}

/// A literal measurement: value, uncertainty and unit in one.
fn literal_of(e: &ast::Expr) -> Option<(f64, &ast::Literal)> {
    match &e.kind {
        ExprKind::Literal(l) => Some((1.0, l)),
        ExprKind::Neg(inner) => match &inner.kind {
            ExprKind::Literal(l) => Some((-1.0, l)),
            _ => None,
        },
        _ => None,
    }
}

pub(super) fn lower_value(
    def: &QuantityDef,
    p: &ast::Prop,
    resolve: &dyn Fn(&ast::Expr, &mut Vec<Diagnostic>) -> Option<Resolved>,
    diags: &mut Vec<Diagnostic>,
) -> Option<(Content, Option<crate::ast::Name>)> {
    let expr = match &p.value {
        ast::PropValue::Text(t, span) => {
            if p.relation != Relation::Equal {
                // `spectral_type < "K1V"`: no text is a limit (the `<` would vanish).
                diags.push(
                    Diagnostic::new(
                        Rule::InvalidValue,
                        *span,
                        "a limit takes a single number with a unit, not text",
                    )
                    .with_help(format!("write `{} = \"{}\"`", def.name, t)),
                );
                return None;
            }
            if def.text {
                return Some((Content::Text(t.clone()), None));
            }
            if def.qty == Qty::TransitEpoch {
                // UTC before 1972 did not count SI seconds: no time scale can be had from it,
                // so it is refused here as `ephemeris` would refuse it later.
                let read = crate::time::parse_iso(t)
                    .and_then(|jd| crate::time::tai_minus_utc(jd).map(|_| jd));
                return match read {
                    Ok(jd) => Some((
                        Content::Measured(Measurement {
                            value: jd * crate::constants::DAY,
                            below: 0.0,
                            above: 0.0,
                            form: Form::Exact,
                        }),
                        Some("JD_UTC".into()),
                    )),
                    Err(e) => {
                        diags.push(
                            Diagnostic::new(Rule::InvalidValue, *span, e.to_string()).with_help(
                                "a transit epoch is a Julian date with its time scale \
                                 (`2460123.4567 ± 0.0004 BJD_TDB`) or a UTC timestamp \
                                 (`\"2026-03-14T05:12:00Z\"`)",
                            ),
                        );
                        None
                    }
                };
            }
            if matches!(def.qty, Qty::RightAscension | Qty::Declination) {
                let (parsed, help) = if def.qty == Qty::RightAscension {
                    (
                        crate::sky::parse_right_ascension(t),
                        "a right ascension is degrees (`201.3472 deg`) or hours, minutes and \
                         seconds of time in quotes (`\"13:25:23.3\"`)",
                    )
                } else {
                    (
                        crate::sky::parse_declination(t),
                        "a declination is degrees (`-12.04 deg`) or signed degrees, arcminutes \
                         and arcseconds in quotes (`\"-12:02:24\"`)",
                    )
                };
                return match parsed {
                    Ok(rad) => Some((
                        Content::Measured(Measurement {
                            value: rad,
                            below: 0.0,
                            above: 0.0,
                            form: Form::Exact,
                        }),
                        Some("deg".into()),
                    )),
                    Err(e) => {
                        diags.push(
                            Diagnostic::new(Rule::InvalidValue, *span, e.to_string())
                                .with_help(help),
                        );
                        None
                    }
                };
            }
            diags.push(
                Diagnostic::new(
                    Rule::UnitMismatch,
                    *span,
                    format!("'{}' takes {}, not text", def.name, def.dim.describe()),
                )
                .with_help(format!(
                    "write a number with a unit, e.g. `{} = 1.0 {}`",
                    def.name,
                    unit_suffix(def)
                )),
            );
            return None;
        }
        ast::PropValue::Expr(e) => e,
    };
    if def.text {
        diags.push(
            Diagnostic::new(
                Rule::UnitMismatch,
                expr.span,
                format!("'{}' takes text in quotes", def.name),
            )
            .with_help(format!(
                "write `{} = \"{}\"`",
                def.name,
                // A bare word (`K2V`) is what was meant, in quotes.
                match &expr.kind {
                    ast::ExprKind::Name(word) => word.name.as_str(),
                    _ => "K0V",
                }
            )),
        );
        return None;
    }
    let Some((sign, lit)) = literal_of(expr) else {
        if p.relation != Relation::Equal {
            diags.push(
                Diagnostic::new(
                    Rule::InvalidValue,
                    expr.span,
                    "a limit takes a single number with a unit",
                )
                .with_help(format!(
                    "write `{} < 0.1 {}`",
                    def.name,
                    unit_suffix(def)
                )),
            );
            return None;
        }
        return Some((Content::Expr(resolve(expr, diags)?), None));
    };
    if let Some(d) = fraction_times_a_unit(def, sign, lit, expr.span) {
        diags.push(d);
        return None;
    }
    let unit = match &lit.unit {
        None => units::Unit::one(),
        Some(u) => match units::resolve(u) {
            Ok(u) => u,
            Err(errs) => {
                let single = matches!(u.factors.as_slice(), [f] if f.exponent == 1);
                for (span, mut e) in errs {
                    if single {
                        // The unit alone gives the value its dimension: suggest one of it.
                        e.suggestion = units::suggest_for(&e.symbol, Some(def.dim));
                    }
                    let d = unknown_unit(span, &e);
                    diags.push(match units::offset_scale(&e.symbol) {
                        Some(scale) if def.dim == Dimension::TEMPERATURE => {
                            in_kelvin(d, def, sign, lit, scale)
                        }
                        _ => d,
                    });
                }
                return None;
            }
        },
    };
    if unit.dim != def.dim {
        diags.push(mismatch_for(def, &unit, lit, expr.span));
        return None;
    }
    if let Some(d) = logarithm_misplaced(def, &unit, expr.span) {
        diags.push(d);
        return None;
    }
    let value = sign * lit.value * unit.factor;
    let (below, above, form) = match (&lit.uncertainty, p.relation) {
        (Uncertainty::None, Relation::Equal) => (0.0, 0.0, Form::Exact),
        (Uncertainty::None, Relation::Below) => (0.0, 0.0, Form::UpperLimit),
        (Uncertainty::None, Relation::Above) => (0.0, 0.0, Form::LowerLimit),
        (Uncertainty::Symmetric(s, _), Relation::Equal) => {
            (s * unit.factor, s * unit.factor, Form::Symmetric)
        }
        (Uncertainty::Asymmetric { plus, minus, .. }, Relation::Equal) => {
            (minus * unit.factor, plus * unit.factor, Form::Asymmetric)
        }
        (Uncertainty::Quadrature(parts, span), Relation::Equal) => {
            let s = quadrature(parts);
            diags.push(combined_note(*span, parts, &unit.text));
            (s * unit.factor, s * unit.factor, Form::Symmetric)
        }
        (_, _) => {
            diags.push(
                Diagnostic::new(
                    Rule::InvalidValue,
                    expr.span,
                    "a limit takes a single value, without an uncertainty",
                )
                .with_help(format!(
                    "write `{} < VALUE {}`, or give the value with its uncertainty after '='",
                    def.name,
                    unit_suffix(def)
                )),
            );
            return None;
        }
    };
    if !value.is_finite() || !below.is_finite() || !above.is_finite() {
        diags.push(
            Diagnostic::new(
                Rule::InvalidValue,
                expr.span,
                "this number is too large to represent",
            )
            .with_note("values must be finite 64-bit floating-point numbers"),
        );
        return None;
    }
    let subnormal = |x: f64| x != 0.0 && x.abs() < f64::MIN_POSITIVE;
    // The numbers as written too, before the unit's factor (`± 1e-400 Msun` is a subnormal
    // number of solar masses, whatever it is in kilograms, and `± 1e-400 %` is 0 in SI).
    let written: Vec<f64> = match &lit.uncertainty {
        ast::Uncertainty::None => Vec::new(),
        ast::Uncertainty::Symmetric(u, _) => vec![*u],
        ast::Uncertainty::Quadrature(us, _) => us.to_vec(),
        ast::Uncertainty::Asymmetric { plus, minus, .. } => vec![*plus, *minus],
    };
    if unit.factor != 0.0 && (subnormal(value) || subnormal(lit.value)) {
        diags.push(Diagnostic::new(
            Rule::InvalidValue,
            expr.span,
            "this number is too small to represent",
        ));
        return None;
    }
    // An uncertainty too small for full precision (`1 ± 1e-320 %`) would be shown with
    // digits it does not have.
    if unit.factor != 0.0
        && (subnormal(below) || subnormal(above) || written.iter().any(|u| subnormal(*u)))
    {
        diags.push(
            Diagnostic::new(
                Rule::InvalidValue,
                expr.span,
                "this uncertainty is too small to represent",
            )
            .with_help(
                "an uncertainty this small is no uncertainty: write the value without one (exact)",
            ),
        );
        return None;
    }
    // A radial-velocity amplitude cannot reach the speed of light. Not a bound of the
    // quantity's range (a lower limit would then be sampled up to c); a value or limit at or
    // past it is a unit slip (K = 1e50 m/s once made the mass vanish without a word).
    if let Some(why) = def.impossible(value) {
        diags.push(
            Diagnostic::new(
                Rule::OutOfRange,
                expr.span,
                format!("{} m/s: {why}", crate::format::sig(value, 4)),
            )
            .with_help(
                "check the unit: stellar reflex motions are metres to kilometres per second",
            ),
        );
        return None;
    }
    // A Julian date outside the years 1000 to 9999 times no observation: before, almost
    // always a date published with an offset taken off (BJD - 2450000, say); after, a digit
    // too many. Only `ephemeris` refused them.
    let jd = value / crate::constants::DAY;
    if def.qty == Qty::TransitEpoch && !(crate::time::FIRST_JD..crate::time::END_JD).contains(&jd) {
        let written = sign * lit.value;
        let written = if (1e-3..1e15).contains(&written.abs()) {
            written.to_string()
        } else {
            format!("{written:e}")
        };
        let (when, help) = if jd < crate::time::FIRST_JD {
            (
                "before the year 1000",
                "epochs are often published with an offset taken off (2400000, 2450000, 2454833 or 2457000, common practice): write the full Julian date, the offset added back",
            )
        } else {
            (
                "after the year 9999",
                "check the digits: a Julian date of a transit observed today is about 2460000",
            )
        };
        diags.push(
            Diagnostic::new(
                Rule::InvalidValue,
                expr.span,
                format!(
                    "Julian date {written} is {when}: not the time of a transit anyone observed"
                ),
            )
            .with_help(help),
        );
        return None;
    }
    // An epoch in UTC before 1972, as a timestamp is: no time scale follows from it (its
    // seconds were not SI seconds), and only `ephemeris` refused it.
    // A Julian date with no scale named (`JD`, `HJD`) is read as UTC, so the same holds.
    let system = crate::time::system_of_unit(&unit.text);
    let utc = system.is_some_and(|(s, _)| s.scale == crate::time::Scale::Utc);
    if def.qty == Qty::TransitEpoch && utc {
        if let Err(e) = crate::time::tai_minus_utc(jd) {
            let mut d = Diagnostic::new(Rule::InvalidValue, expr.span, e.to_string());
            if let Some((_, Some(read_as))) = system {
                d = d.with_note(read_as);
            }
            diags.push(d);
            return None;
        }
    }
    if !def.in_range(value) {
        let what = match form {
            Form::UpperLimit => "upper limit",
            Form::LowerLimit => "lower limit",
            _ => "value",
        };
        let range = def.range_text();
        let written = crate::format::number(sign * lit.value);
        let written = if unit.text.is_empty() {
            written
        } else {
            format!("{written} {}", unit.text)
        };
        let mut d = Diagnostic::new(
            Rule::OutOfRange,
            expr.span,
            format!(
                "the {what} {written} lies outside the valid range of '{}': {range}",
                def.name
            ),
        );
        if def.qty == Qty::Eccentricity && value >= 1.0 {
            d = d.with_note("an eccentricity of 1 or more describes an unbound orbit");
        }
        if let Some(help) = other_unit_in_range(def, sign, lit, &unit) {
            d = d.with_help(help);
        }
        // `2.66667` against a bound of 8/3 shown as 2.66667: say what the bound is exactly.
        let display = crate::units::parse_unit_text(def.display).map_or(1.0, |u| u.factor);
        let bound_shown = |b: crate::quantities::Bound| match b {
            crate::quantities::Bound::Inclusive(m) | crate::quantities::Bound::Exclusive(m) => {
                Some(m / display)
            }
            crate::quantities::Bound::None => None,
        };
        let written_number = crate::format::number(sign * lit.value);
        for bound in [def.min, def.max].into_iter().filter_map(bound_shown) {
            if crate::format::number(bound) == written_number && bound != sign * lit.value {
                d = d.with_note(format!(
                    "the bound is {bound} to full precision, and {written_number} lies past it"
                ));
            }
        }
        diags.push(d);
        return None;
    }
    // The resolved unit's text is the unit as written (`units::unit_text`).
    let written = lit.unit.is_some().then_some(unit.text);
    Some((
        Content::Measured(Measurement {
            value,
            below,
            above,
            form,
        }),
        written,
    ))
}

/// Independent uncertainties of one value combined: the square root of their squares' sum.
pub(super) fn quadrature(parts: &[f64]) -> f64 {
    parts.iter().map(|p| p * p).sum::<f64>().sqrt()
}

/// The note that says several uncertainties were combined, and into what.
pub(super) fn combined_note(span: Span, parts: &[f64], unit: &str) -> Diagnostic {
    let written: Vec<String> = parts
        .iter()
        .map(|p| format!("± {}", crate::format::number(*p)))
        .collect();
    let squares: Vec<String> = parts
        .iter()
        .map(|p| format!("{}^2", crate::format::number(*p)))
        .collect();
    let q = quadrature(parts);
    // Three significant digits, without trailing zeros.
    let combined = crate::format::number(crate::format::sig(q, 3).parse().unwrap_or(q));
    let unit = if unit.is_empty() {
        String::new()
    } else {
        format!(" {unit}")
    };
    Diagnostic::new(
        Rule::CombinedUncertainty,
        span,
        format!(
            "the uncertainties {} are combined in quadrature: ± {combined}{unit}",
            written.join(" ")
        ),
    )
    .with_note(format!(
        "taken as independent (a statistical and a systematic uncertainty, say): \
         sqrt({}) = {combined}; if they are correlated, write the combined uncertainty \
         as one `± s`",
        squares.join(" + ")
    ))
}

/// Units people mix up, by the unit written (`""`: none): tried in order when a value is out
/// of range. Fractions only for quantities quoted as fractions (a depth, not an
/// eccentricity, for which `1.3` is no misplaced percentage).
const CONFUSED: &[(&str, &[&str])] = &[
    ("%", &["ppm"]),
    ("ppt", &["ppm"]),
    ("", &["%", "ppm"]),
    ("rad", &["deg"]),
];

/// "Did you mean ppm?" for a value out of range that a commonly confused unit puts in range.
fn other_unit_in_range(
    def: &QuantityDef,
    sign: f64,
    lit: &ast::Literal,
    written: &units::Unit,
) -> Option<String> {
    if def.dim.is_none() && !["%", "ppm", "ppt"].contains(&def.display) {
        return None;
    }
    let (_, others) = CONFUSED.iter().find(|(w, _)| *w == written.text)?;
    let other = others.iter().find_map(|sym| {
        let u = units::parse_unit_text(sym)?;
        (u.dim == def.dim && def.in_range(sign * lit.value * u.factor)).then_some(*sym)
    })?;
    let value = crate::format::number(sign * lit.value);
    Some(format!(
        "did you mean {other}? `{} = {value}{} {other}` lies in the range",
        def.name,
        spread_text(&lit.uncertainty, 1.0)
    ))
}

/// The uncertainty as written after a value, each part times `scale`.
fn spread_text(u: &Uncertainty, scale: f64) -> String {
    let k = |x: f64| crate::format::number(x * scale);
    match u {
        Uncertainty::None => String::new(),
        Uncertainty::Symmetric(s, _) => format!(" ± {}", k(*s)),
        Uncertainty::Quadrature(parts, _) => {
            parts.iter().map(|p| format!(" ± {}", k(*p))).collect()
        }
        Uncertainty::Asymmetric { plus, minus, .. } => format!(" +{}/-{}", k(*plus), k(*minus)),
    }
}

/// A temperature written on an offset scale, given back in kelvin when the value is one
/// number with that one unit.
fn in_kelvin(
    d: Diagnostic,
    def: &QuantityDef,
    sign: f64,
    lit: &ast::Literal,
    scale: units::OffsetScale,
) -> Diagnostic {
    let single = lit
        .unit
        .as_ref()
        .is_some_and(|u| matches!(u.factors.as_slice(), [f] if f.exponent == 1));
    if !single {
        return d;
    }
    let n = crate::format::number;
    let spread = spread_text(&lit.uncertainty, scale.per_degree);
    let kelvin = n(scale.kelvin(sign * lit.value));
    d.with_help(format!(
        "write kelvin: `{} = {kelvin}{spread} K` ({} {} is {kelvin} K)",
        def.name,
        n(sign * lit.value),
        scale.symbol
    ))
}

pub(crate) fn unknown_unit(span: Span, e: &units::UnknownUnit) -> Diagnostic {
    let d = Diagnostic::new(
        Rule::UnknownUnit,
        span,
        format!("unknown unit '{}'", e.symbol),
    );
    if let Some(scale) = units::offset_scale(&e.symbol) {
        return d
            .with_help(format!(
                "if '{}' means {}, write the temperature in kelvin: {}",
                e.symbol,
                scale.name,
                scale.rule()
            ))
            .with_note(
                "temperatures are taken in kelvin only: a scale with an offset would convert \
                 a temperature and a difference of temperatures differently",
            );
    }
    // `cm3`, `s2`: a power written without `^` (as some other unit syntaxes allow).
    let base = e.symbol.trim_end_matches(|c: char| c.is_ascii_digit());
    if base.len() < e.symbol.len() && units::lookup(base).is_some() {
        let power = e.symbol.get(base.len()..).unwrap_or_default();
        return d.with_help(format!("a power is written with '^': '{base}^{power}'"));
    }
    match e.suggestion {
        Some(s) => d.with_help(format!("did you mean '{s}'?")),
        None => {
            d.with_help("see the unit table in docs/language.md; to multiply by a value, write '*'")
        }
    }
}

/// Magnitudes and dex are logarithms of a ratio, not scale factors: they belong to the
/// quantities shown in them. Any other dimensionless quantity written in them (a transit
/// depth of `5 mmag`) would be read as a plain number and be wrong.
fn logarithm_misplaced(def: &QuantityDef, unit: &units::Unit, span: Span) -> Option<Diagnostic> {
    if units::takes_unit(def.display, &unit.text) {
        return None;
    }
    let written = units::log_family(&unit.text)?;
    let d = Diagnostic::new(
        Rule::UnitMismatch,
        span,
        format!(
            "'{}' is a logarithmic unit, and '{}' is not a logarithm",
            unit.text, def.name
        ),
    );
    Some(if def.qty == Qty::TransitDepth && written == "mag" {
        d.with_help(
            "convert the depth first: a dip of D magnitudes is a fractional depth of 1 - 10^(-0.4 D) \
             (5 mmag is about 0.46 %)",
        )
    } else {
        d.with_help(format!("write '{}' in {}", def.name, unit_suffix(def)))
    })
}

/// `3.5 ± 10% d`: a percentage (or ppm) in one unit with another unit. The unit applies to
/// the whole measurement, so this reads as 0.035 ± 0.1 d, a value nobody means: almost
/// always a relative uncertainty. Refused, with the uncertainty written out in the other
/// unit when it is `± p%`.
fn fraction_times_a_unit(
    def: &QuantityDef,
    sign: f64,
    lit: &ast::Literal,
    span: Span,
) -> Option<Diagnostic> {
    let unit = lit.unit.as_ref()?;
    let is_fraction =
        |f: &&ast::UnitFactor| matches!(f.symbol.name.as_str(), "%" | "percent" | "ppm");
    let fraction = unit.factors.iter().find(is_fraction)?;
    let others: Vec<&ast::UnitFactor> = unit.factors.iter().filter(|f| !is_fraction(f)).collect();
    if others.is_empty() {
        return None;
    }
    let rest = others
        .iter()
        .map(|f| match f.exponent {
            1 => f.symbol.name.to_string(),
            e => format!("{}^{e}", f.symbol.name),
        })
        .collect::<Vec<_>>()
        .join(" ");
    let (per, times) = if fraction.symbol.name == "ppm" {
        (1e-6, "a million")
    } else {
        (1e-2, "a hundred")
    };
    let value = sign * lit.value;
    let mut d = Diagnostic::new(
        Rule::UnitMismatch,
        unit.span,
        format!(
            "the unit '{}' multiplies a fraction by {rest}: the whole measurement is read in it, \
             so `{}` would be {} times smaller",
            crate::units::unit_text(unit),
            as_written(lit),
            times
        ),
    );
    d = match &lit.uncertainty {
        Uncertainty::Symmetric(relative, _) => {
            let absolute = crate::format::number(value.abs() * relative * per);
            let fixed = format!("{} ± {absolute} {rest}", crate::format::number(value));
            d.with_help(format!(
                "if {} {} is the relative uncertainty, write it out: `{} = {fixed}`",
                crate::format::number(*relative),
                fraction.symbol.name,
                def.name
            ))
            .with_fix(span, fixed)
        }
        _ => d.with_help(format!(
            "give the value and its uncertainty in {rest}, or a fraction alone"
        )),
    };
    Some(d)
}

/// A literal's number and uncertainty with every digit it was written with (the shortest
/// text that reads back as the same numbers), for a help whose fix is copied back into the
/// file: a Julian date of nine digits or a period of seven must not come back rounded.
fn as_written(lit: &ast::Literal) -> String {
    let n = |v: f64| {
        let plain = format!("{v}");
        if plain.len() > 18 {
            format!("{v:e}")
        } else {
            plain
        }
    };
    let spread = match &lit.uncertainty {
        Uncertainty::None => String::new(),
        Uncertainty::Symmetric(s, _) => format!(" ± {}", n(*s)),
        Uncertainty::Quadrature(parts, _) => {
            parts.iter().map(|p| format!(" ± {}", n(*p))).collect()
        }
        Uncertainty::Asymmetric { plus, minus, .. } => format!(" +{}/-{}", n(*plus), n(*minus)),
    };
    format!("{}{spread}", n(lit.value))
}

fn mismatch_for(
    def: &QuantityDef,
    unit: &units::Unit,
    lit: &ast::Literal,
    span: Span,
) -> Diagnostic {
    let found = if lit.unit.is_none() {
        "a number without a unit".to_string()
    } else {
        format!("'{}', {}", unit.text, unit.dim.describe())
    };
    let mut d = Diagnostic::new(
        Rule::UnitMismatch,
        span,
        format!(
            "'{}' is {}, but the value is {found}",
            def.name,
            def.dim.describe()
        ),
    );
    if lit.unit.is_none() {
        d = d.with_help(format!(
            "add a unit: `{} = {} {}`",
            def.name,
            as_written(lit),
            unit_suffix(def)
        ));
        // The unit goes after the whole measurement (the literal's end).
        if !unit_suffix(def).is_empty() {
            d = d.with_fix(
                Span::new(span.file, span.end as usize, span.end as usize),
                format!(" {}", unit_suffix(def)),
            );
        }
        if def.dim == Dimension::ANGLE {
            d = d.with_note("angles and plain numbers are different types: write `deg` or `rad`");
        }
    } else if def.dim == Dimension::NONE {
        // % and ppm only where the quantity is a fraction people write so (a depth).
        let fraction = matches!(unit_suffix(def), "%" | "ppm");
        d = d.with_help(format!(
            "'{}' is a plain number; drop the unit{}",
            def.name,
            if fraction { " or use % or ppm" } else { "" }
        ));
    } else if unit.text.starts_with("ms") && def.dim == Dimension::LENGTH.per(Dimension::TIME) {
        // `ms^-1` is per millisecond: the metre and the second need a space or a `/`.
        d = d.with_help(format!(
            "`ms` is the millisecond: for metres per second write `m/s` or `m s^-1` (`{} = {} m/s`)",
            def.name,
            as_written(lit)
        ));
    } else {
        d = d.with_help(format!(
            "use a unit of {}, such as {}",
            def.dim.describe(),
            def.display
        ));
    }
    d
}
