//! Values written in notations this language does not read (an uncertainty typeset as in a
//! paper, in parentheses, given twice; a unit's exponent without `^`; a second property on
//! the line), each an error with the spelling the language takes.

use super::*;
use crate::diagnostic::Fix;

impl Cursor<'_> {
    /// A unit's exponent written as papers typeset it, without `^` (`km s-1`, `g cm-3`):
    /// to the grammar a subtraction, reported as a dimension error far from the cause. The
    /// first unit symbol followed directly by `-` and a whole number is an error with the
    /// unit rewritten.
    pub(super) fn exponent_without_caret(&self, slice: &[Token]) -> Option<Diagnostic> {
        let joined = |x: &Token, y: &Token| x.end == y.start;
        // Only after a number, where a unit is written (`d-1` alone may be a binding's use).
        if slice.first()?.kind != Tok::Number {
            return None;
        }
        let found = slice.windows(3).find_map(|w| match w {
            [unit, minus, n]
                if unit.kind == Tok::Ident
                    && minus.kind == Tok::Minus
                    && n.kind == Tok::Number
                    && joined(unit, minus)
                    && joined(minus, n)
                    && self.text(*n).bytes().all(|c| c.is_ascii_digit())
                    && crate::units::lookup(self.text(*unit)).is_some() =>
            {
                Some((unit, n))
            }
            _ => None,
        })?;
        let (unit, n) = found;
        let at = Span::new(self.file, unit.start, n.end);
        let written = self.src.get(unit.start..n.end)?;
        let exponent = self.text(*n);
        let symbol = self.text(*unit);
        // `ms-1` is how metres per second are written where spaces are dropped; `ms` here is
        // the millisecond, so `ms^-1` would be a frequency.
        let (help, fix) = if symbol == "ms" && exponent == "1" {
            (
                "for metres per second write `m/s` (`ms` is the millisecond)".to_string(),
                "m/s".to_string(),
            )
        } else {
            (
                format!(
                    "write the exponent with `^`: `{symbol}^-{exponent}` (or divide: `/{symbol}`)"
                ),
                format!("{symbol}^-{exponent}"),
            )
        };
        Some(
            Diagnostic::new(
                Rule::Syntax,
                at,
                format!("`{written}` reads as a subtraction, not as a unit with an exponent"),
            )
            .with_help(help)
            .with_fix(at, fix),
        )
    }

    /// An uncertainty written as tables and papers write it, which the grammar would read
    /// as something else or not at all: `0.4 +0.1 -0.05` (signs attached to their numbers,
    /// a sum to the grammar: `impact` would silently be 0.45) and the concise `1.1(5)`. An
    /// error with the spelling this language takes; a sum written with spaces after its
    /// signs (`0.4 + 0.1 - 0.05`) is left to be one.
    pub(super) fn uncertainty_in_another_notation(&self, slice: &[Token]) -> Option<Diagnostic> {
        let joined = |x: &Token, y: &Token| x.end == y.start;
        let span = |from: &Token, to: &Token| Span::new(self.file, from.start, to.end);
        // A negative value keeps its sign: `-0.4 +0.1 -0.05`.
        let (begin, slice) = match slice {
            [m, rest @ ..]
                if m.kind == Tok::Minus && rest.first().is_some_and(|n| joined(m, n)) =>
            {
                (m.start, rest)
            }
            _ => (slice.first()?.start, slice),
        };
        let [value, a, b, rest @ ..] = slice else {
            return None;
        };
        if value.kind != Tok::Number {
            return None;
        }
        let v = self.src.get(begin..value.end)?;
        // `92^{+6}_{-5}` (or `_{-5}^{+6}`): an asymmetric uncertainty as typeset in a paper.
        if let Some((plus, minus, len)) = self.src.get(value.end..).and_then(typeset_uncertainty) {
            let at = Span::new(self.file, value.end, value.end + len);
            let written = self.src.get(value.end..value.end + len).unwrap_or("");
            let fixed = format!(" +{plus}/-{minus}");
            return Some(
                Diagnostic::new(
                    Rule::Syntax,
                    at,
                    format!(
                        "`{v}{written}` is typeset notation, which this language does not read"
                    ),
                )
                .with_help(format!("write the uncertainty as `{v} +{plus}/-{minus}`"))
                .with_fix(at, fixed),
            );
        }
        // `5000 ± 30 +40/-20`, `1.0 +0.1/-0.05 ± 0.02`, `5 ± 1 ± 2 +3%/-2%`: symmetric and
        // asymmetric uncertainties on one value, which the grammar reads as arithmetic.
        if let Some(d) = self.both_kinds_of_uncertainty(v, slice.get(1..).unwrap_or_default()) {
            return Some(d);
        }
        // `92 (+6/-5)`: an asymmetric uncertainty in parentheses.
        if a.kind == Tok::LParen && matches!(b.kind, Tok::Plus | Tok::Minus) {
            let close = rest.iter().position(|t| t.kind == Tok::RParen)?;
            let inside: Vec<Tok> = rest.get(..close)?.iter().map(|t| t.kind).collect();
            let close = rest.get(close)?;
            let sign = |t: Tok| matches!(t, Tok::Plus | Tok::Minus);
            let shape = matches!(
                inside.as_slice(),
                [Tok::Number, Tok::Slash, m, Tok::Number] if sign(*m) && *m != b.kind
            );
            if !shape {
                return None;
            }
            let written = self.src.get(b.start..close.start)?.trim();
            let (first, second) = (rest.first()?, rest.get(3)?);
            let (above, below) = if b.kind == Tok::Plus {
                (first, second)
            } else {
                (second, first)
            };
            let fixed = format!("+{}/-{}", self.text(*above), self.text(*below));
            return Some(
                Diagnostic::new(
                    Rule::Syntax,
                    span(a, close),
                    format!("`({written})`: an uncertainty is written without parentheses"),
                )
                .with_help(format!("write `{v} {fixed}`"))
                .with_fix(span(a, close), fixed),
            );
        }
        // `1.1(5)`: the last digits' uncertainty in parentheses.
        if a.kind == Tok::LParen && joined(value, a) && b.kind == Tok::Number {
            let close = rest.first().filter(|t| t.kind == Tok::RParen)?;
            let digits = self.text(*b);
            if !digits.bytes().all(|c| c.is_ascii_digit()) {
                return None;
            }
            let d = Diagnostic::new(
                Rule::Syntax,
                span(value, close),
                format!(
                    "`{v}({digits})` gives the uncertainty of the last digits in parentheses, \
                     a notation this language does not read"
                ),
            );
            let whole = Span::new(self.file, begin, close.end);
            return Some(match concise_uncertainty(v, digits) {
                Some(u) => d
                    .with_help(format!("write the uncertainty out: `{v} ± {u}`"))
                    .with_fix(whole, format!("{v} ± {u}")),
                None => d.with_help("write the uncertainty out: `VALUE ± UNCERTAINTY`"),
            });
        }
        let signed = |sign: &Token, n: &Token| {
            matches!(sign.kind, Tok::Plus | Tok::Minus) && n.kind == Tok::Number && joined(sign, n)
        };
        // `0.4 -0.05` or `0.4 +0.05` alone: one side of an uncertainty, or a `±` lost in
        // copying, which the grammar reads as a difference or a sum (0.35 or 0.45). An
        // operator after it (`0.4 -0.05 * x`) makes it an expression, left as one.
        let two_sided = matches!(rest, [c, d, ..] if signed(c, d));
        // An operator: `*`, `/`, `^`, `(`, or a `+`/`-` not attached to a number after it.
        let operator_follows = match rest {
            [t, ..] if matches!(t.kind, Tok::Star | Tok::Slash | Tok::Caret | Tok::LParen) => true,
            [t, n, ..] if matches!(t.kind, Tok::Plus | Tok::Minus) => !joined(t, n),
            [t] => matches!(t.kind, Tok::Plus | Tok::Minus),
            _ => false,
        };
        // A signed number right after an uncertainty's last token `last`: the same slip,
        // which the grammar reads as a difference or a sum.
        let slip_after = |last: &Token, after: &[Token], help: &str| {
            let [c, d, more @ ..] = after else {
                return None;
            };
            let operator_after = more.first().is_some_and(|t| {
                matches!(t.kind, Tok::Star | Tok::Slash | Tok::Caret | Tok::LParen)
            });
            if !signed(c, d) || joined(last, c) || operator_after {
                return None;
            }
            let written = self.src.get(c.start..d.end).unwrap_or("");
            Some(
                Diagnostic::new(
                    Rule::Syntax,
                    span(c, d),
                    format!(
                        "`{written}` after the uncertainty reads as {}, not as part of the measurement",
                        if c.kind == Tok::Minus { "a difference" } else { "a sum" }
                    ),
                )
                .with_help(help.to_string()),
            )
        };
        // `0.3 ± 0.05 -0.01`: after a symmetric uncertainty (0.29 ± 0.05).
        if a.kind == Tok::PlusMinus && b.kind == Tok::Number {
            return slip_after(
                b,
                rest,
                "a second uncertainty is written `± u` (combined in quadrature), one above and below `+above/-below`; for a sum, put a space after the sign",
            );
        }
        // `0.3 +0.1/-0.1 -0.2`: after an asymmetric one, which the grammar read as a
        // difference (0.1 +0.1/-0.1, with no word).
        if let Some((Term::Asymmetric(..), used)) = slice.get(1..).and_then(|t| self.term_at(t)) {
            let after = slice.get(1 + used..).unwrap_or_default();
            let found = slip_after(
                slice.get(used)?,
                after,
                "an asymmetric uncertainty is one `+above/-below`; for a sum, put a space after the sign",
            );
            if found.is_some() {
                return found;
            }
        }
        // `0.4 -0.05 -0.1` or `0.4 +0.05 +0.1`: two signed numbers of the same sign.
        if let [c, d, ..] = rest {
            if signed(a, b)
                && signed(c, d)
                && a.kind == c.kind
                && !joined(value, a)
                && !joined(b, c)
            {
                let written = self.src.get(a.start..d.end).unwrap_or("");
                return Some(
                    Diagnostic::new(
                        Rule::Syntax,
                        span(a, d),
                        format!("`{written}` after the value reads as arithmetic, not as uncertainties"),
                    )
                    .with_help(format!(
                        "an uncertainty is written `{v} ± u`, or `{v} +above/-below`; for arithmetic, put a space after each sign"
                    )),
                );
            }
        }
        if signed(a, b) && !joined(value, a) && !two_sided && !operator_follows {
            let written = self.src.get(a.start..b.end).unwrap_or("");
            let u = self.text(*b);
            let reads = if a.kind == Tok::Minus {
                "a difference"
            } else {
                "a sum"
            };
            return Some(
                Diagnostic::new(
                    Rule::Syntax,
                    span(a, b),
                    format!("`{written}` after the value reads as {reads}, not as an uncertainty"),
                )
                .with_help(format!(
                    "a symmetric uncertainty is written `{v} ± {u}`, one above and below \
                     `{v} +above/-below`; for {reads}, put a space after the sign"
                ))
                .with_fix(span(a, b), format!("± {u}")),
            );
        }
        // `0.4 +0.1 -0.05` or `0.4 -0.05 +0.1`.
        let [c, d, ..] = rest else {
            return None;
        };
        if !(signed(a, b) && signed(c, d) && a.kind != c.kind) || joined(value, a) || joined(b, c) {
            return None;
        }
        let (above, below) = if a.kind == Tok::Plus { (b, d) } else { (d, b) };
        let (above, below) = (self.text(*above), self.text(*below));
        Some(
            Diagnostic::new(
                Rule::Syntax,
                span(a, d),
                format!(
                    "`{}` reads as a sum, not as uncertainties above and below the value",
                    self.src.get(a.start..d.end).unwrap_or("")
                ),
            )
            .with_help(format!(
                "an uncertainty above and below is written `+above/-below`: `{v} +{above}/-{below}`; \
                 for a sum, put a space after each sign"
            ))
            .with_fix(span(a, d), format!("+{above}/-{below}")),
        )
    }
}

impl Cursor<'_> {
    /// The name of a second property written on the line of the first
    /// (`mass = 1 Msun radius = 1 Rsun`): found '=', '<' or '>' just after a quantity's name.
    pub(super) fn second_property(&self, at: usize, found: Option<Tok>) -> Option<&str> {
        if !matches!(found?, Tok::Eq | Tok::Lt | Tok::Gt) {
            return None;
        }
        let i = self.toks.partition_point(|t| t.start < at);
        let name = self.toks.get(i.checked_sub(1)?)?;
        let text = self.text(*name);
        // Only a quantity's name: `1 Msun = 2` is not two properties.
        let quantity = [crate::ast::BodyKind::Star, crate::ast::BodyKind::Planet]
            .into_iter()
            .any(|k| crate::quantities::find(k, text).is_some());
        (name.kind == Tok::Ident && quantity).then_some(text)
    }

    /// Help for an uncertainty written in a form the grammar does not take, found at
    /// `at`: `-below/+above` (the parts swapped), or a unit before the uncertainty.
    pub(super) fn misplaced_uncertainty(
        &self,
        at: usize,
        found: Option<Tok>,
    ) -> Option<(String, Option<Fix>)> {
        let i = self.toks.partition_point(|t| t.start < at);
        let back = |n: usize| i.checked_sub(n).and_then(|j| self.toks.get(j));
        let kind = |n: usize| back(n).map(|t| t.kind);
        let ahead = |n: usize| self.toks.get(i + n);
        let back_of = |j: usize| j.checked_sub(1).and_then(|j| self.toks.get(j));
        let text = |t: Option<&Token>| t.map_or("", |t| self.text(*t));
        match found? {
            // `1.1 -0.03/+0.05 Rjup`: found '+' after `- NUMBER /`.
            Tok::Plus
                if kind(1) == Some(Tok::Slash)
                    && kind(2) == Some(Tok::Number)
                    && kind(3) == Some(Tok::Minus) =>
            {
                let below = text(back(2));
                let above = ahead(1)
                    .filter(|t| t.kind == Tok::Number)
                    .map_or("ABOVE", |t| self.text(*t));
                Some((
                    format!(
                        "an asymmetric uncertainty is written `+above/-below`, the part above \
                         the value first: `+{above}/-{below}`"
                    ),
                    None,
                ))
            }
            // `1.2 Mjup ± 0.1`: found '±' after a unit that follows a number.
            Tok::PlusMinus if kind(1) == Some(Tok::Ident) => {
                let mut j = 1;
                while matches!(kind(j), Some(Tok::Ident | Tok::Caret | Tok::Slash))
                    || (kind(j) == Some(Tok::Number) && kind(j + 1) == Some(Tok::Caret))
                    || (kind(j) == Some(Tok::Minus) && kind(j + 1) == Some(Tok::Caret))
                {
                    j += 1;
                }
                let value_end = back(j).filter(|t| t.kind == Tok::Number)?.end;
                // The measurement before the unit: a number, perhaps with `± s` already.
                let mut k = j;
                while kind(k + 1) == Some(Tok::PlusMinus) && kind(k + 2) == Some(Tok::Number) {
                    k += 2;
                }
                let value = self.src.get(back(k)?.start..value_end)?;
                let unit = self.src.get(back(j - 1)?.start..back(1)?.end)?;
                let spread = ahead(1)
                    .filter(|t| t.kind == Tok::Number)
                    .map_or("SPREAD", |t| self.text(*t));
                let combined = if k > j {
                    " (the uncertainties are then combined in quadrature)"
                } else {
                    ""
                };
                Some((
                    format!(
                        "the unit goes after the uncertainty, once for the whole measurement: \
                         `{value} ± {spread} {unit}`{combined}"
                    ),
                    None,
                ))
            }
            // `1.05 +/- 0.04 Msun`: found '/' right after '+', with '-' right after it.
            Tok::Slash
                if back(1).is_some_and(|t| t.kind == Tok::Plus && t.end == at)
                    && ahead(1).is_some_and(|t| t.kind == Tok::Minus && t.start == at + 1) =>
            {
                let plus = back(1)?;
                // The user's own numbers in the example, when they are there.
                let example = match (
                    back(2).filter(|t| t.kind == Tok::Number),
                    ahead(2).filter(|t| t.kind == Tok::Number),
                ) {
                    (Some(v), Some(u)) => format!("{} ± {}", self.text(*v), self.text(*u)),
                    _ => "1.05 ± 0.04 Msun".to_string(),
                };
                Some((
                    format!(
                        "a symmetric uncertainty is written `±` or `+-`: `{example}`; an \
                         asymmetric one `+above/-below`: `+0.05/-0.04`"
                    ),
                    Some(Fix {
                        span: Span::new(self.file, plus.start, at + 2),
                        text: "±".to_string(),
                    }),
                ))
            }
            // `12,5 d`: found ',' between two numbers written without spaces.
            Tok::Comma => {
                let whole = back(1).filter(|t| t.kind == Tok::Number && t.end == at)?;
                let fraction = ahead(1).filter(|t| t.kind == Tok::Number && t.start == at + 1)?;
                let point = format!("{}.{}", self.text(*whole), self.text(*fraction));
                // Every decimal comma of the value in one fix (`27,3 ± 0,2` had only its
                // first mended).
                let mut commas = vec![at];
                let mut last = fraction.end;
                let mut n = 2;
                while let Some(t) = ahead(n) {
                    if matches!(t.kind, Tok::Newline | Tok::Semi | Tok::RBrace) {
                        break;
                    }
                    let joined = t.kind == Tok::Comma
                        && back_of(i + n)
                            .is_some_and(|b| b.kind == Tok::Number && b.end == t.start)
                        && ahead(n + 1).is_some_and(|f| f.kind == Tok::Number && f.start == t.end);
                    if joined {
                        commas.push(t.start);
                        last = ahead(n + 1).map_or(last, |f| f.end);
                    }
                    n += 1;
                }
                let written = self.src.get(whole.start..last)?;
                let fixed: String = written
                    .char_indices()
                    .map(|(k, c)| {
                        if commas.contains(&(whole.start + k)) {
                            '.'
                        } else {
                            c
                        }
                    })
                    .collect();
                let more = match commas.len() {
                    1 => String::new(),
                    n => format!(" (all {n} on this line: `{fixed}`)"),
                };
                Some((
                    format!("the decimal separator is a point: `{point}`{more}"),
                    Some(Fix {
                        span: Span::new(self.file, whole.start, last),
                        text: fixed,
                    }),
                ))
            }
            _ => None,
        }
    }
}

/// The uncertainty `digits` of the concise notation `value(digits)`, in the value's own
/// decimals: `1.1(5)` is 0.5, `2459000.1234(12)` is 0.0012, `152(3)` is 3 (common practice).
/// `None` for a value with an exponent.
pub(super) fn concise_uncertainty(value: &str, digits: &str) -> Option<String> {
    if value.contains(['e', 'E']) {
        return None;
    }
    let decimals = value.split_once('.').map_or(0, |(_, f)| f.len());
    if decimals == 0 {
        return Some(digits.trim_start_matches('0').to_string()).filter(|s| !s.is_empty());
    }
    let padded = format!("{digits:0>width$}", width = decimals + 1);
    let (int, frac) = padded.split_at(padded.len() - decimals);
    let int = int.trim_start_matches('0');
    Some(format!("{}.{frac}", if int.is_empty() { "0" } else { int }))
}

/// A typeset asymmetric uncertainty at the start of `text`: `^{+6}_{-5}` or `_{-5}^{+6}`
/// (spaces allowed inside and between the groups): the part above, the part below, and the
/// length of text they took.
fn typeset_uncertainty(text: &str) -> Option<(String, String, usize)> {
    fn group(text: &str, marker: char, sign: char) -> Option<(&str, &str)> {
        let rest = text.trim_start().strip_prefix(marker)?.trim_start();
        let rest = rest.strip_prefix('{')?;
        let close = rest.find('}')?;
        let inside = rest.get(..close)?.trim();
        let number = match inside.strip_prefix(sign) {
            Some(n) => n.trim(),
            // `^{6}`: the part above may come without its sign.
            None if sign == '+' => inside,
            None => return None,
        };
        if number.is_empty() || number.parse::<f64>().is_err() {
            return None;
        }
        Some((number, rest.get(close + 1..)?))
    }
    let (plus, minus, rest) = if let Some((p, rest)) = group(text, '^', '+') {
        let (m, rest) = group(rest, '_', '-')?;
        (p, m, rest)
    } else {
        let (m, rest) = group(text, '_', '-')?;
        let (p, rest) = group(rest, '^', '+')?;
        (p, m, rest)
    };
    Some((plus.to_string(), minus.to_string(), text.len() - rest.len()))
}

/// One uncertainty term after a value: `± N`, `+N/-M`, each number possibly in `%`.
enum Term {
    Symmetric(String),
    Asymmetric(String, String),
}

impl Cursor<'_> {
    /// A number, with a `%` right after it if there is one: its text and the tokens it took.
    fn number_at(&self, t: &[Token]) -> Option<(String, usize)> {
        let n = t.first().filter(|n| n.kind == Tok::Number)?;
        match t.get(1) {
            Some(p) if p.kind == Tok::Ident && self.text(*p) == "%" => {
                Some((format!("{}%", self.text(*n)), 2))
            }
            _ => Some((self.text(*n).to_string(), 1)),
        }
    }

    /// A sign slip inside an asymmetric uncertainty, which the grammar would read as a
    /// division and report as a wrong dimension: `± 0.05/-0.02` (`+-` for `+`) and
    /// `+0.1/--0.1` (a doubled minus).
    pub(super) fn sign_slip_in_uncertainty(&self, slice: &[Token]) -> Option<Diagnostic> {
        let kinds: Vec<Tok> = slice.iter().map(|t| t.kind).collect();
        kinds.windows(5).enumerate().find_map(|(k, w)| {
            let (fix, len) = match w {
                [Tok::PlusMinus, Tok::Number, Tok::Slash, Tok::Minus, Tok::Number] => {
                    let (a, b) = (slice.get(k + 1)?, slice.get(k + 4)?);
                    (format!("+{}/-{}", self.text(*a), self.text(*b)), 5)
                }
                [Tok::Plus, Tok::Number, Tok::Slash, Tok::Minus, Tok::Minus] => {
                    let (a, b) = (slice.get(k + 1)?, slice.get(k + 5)?);
                    (b.kind == Tok::Number).then_some(())?;
                    (format!("+{}/-{}", self.text(*a), self.text(*b)), 6)
                }
                _ => return None,
            };
            let (first, last) = (slice.get(k)?, slice.get(k + len - 1)?);
            let written = self.src.get(first.start..last.end).unwrap_or("");
            Some(
                Diagnostic::new(
                    Rule::Syntax,
                    Span::new(self.file, first.start, last.end),
                    format!("`{written}` is not an uncertainty: the signs are mixed up"),
                )
                .with_help(format!(
                    "write an asymmetric uncertainty as `{fix}` (above, then below), or a symmetric one as `± {}`",
                    self.text(*slice.get(k + 1)?)
                )),
            )
        })
    }

    /// Both kinds of uncertainty on a literal inside an expression (`2 * 3 ± 1 +1/-1`), which
    /// the grammar read as arithmetic without a word (a value at the start is checked by
    /// [`Cursor::uncertainty_in_another_notation`]).
    pub(super) fn uncertainty_twice_inside(&self, slice: &[Token]) -> Option<Diagnostic> {
        slice.iter().enumerate().skip(1).find_map(|(k, t)| {
            let after = slice.get(k + 1..)?;
            let starts_term = matches!(after.first()?.kind, Tok::PlusMinus | Tok::Plus);
            (t.kind == Tok::Number && starts_term)
                .then(|| self.both_kinds_of_uncertainty(self.text(*t), after))
                .flatten()
        })
    }

    /// The uncertainty term at the start of `t` and the tokens it took.
    fn term_at(&self, t: &[Token]) -> Option<(Term, usize)> {
        match t.first()?.kind {
            Tok::PlusMinus => {
                let (n, used) = self.number_at(t.get(1..)?)?;
                Some((Term::Symmetric(n), 1 + used))
            }
            Tok::Plus => {
                let (above, a) = self.number_at(t.get(1..)?)?;
                let rest = t.get(1 + a..)?;
                if rest.first()?.kind != Tok::Slash || rest.get(1)?.kind != Tok::Minus {
                    return None;
                }
                let (below, b) = self.number_at(rest.get(2..)?)?;
                Some((Term::Asymmetric(above, below), 1 + a + 2 + b))
            }
            _ => None,
        }
    }

    /// Both kinds of uncertainty after the value `v` (`after` starts right after it): one
    /// error that names them and says to keep one kind.
    fn both_kinds_of_uncertainty(&self, v: &str, after: &[Token]) -> Option<Diagnostic> {
        let (mut symmetric, mut asymmetric) = (Vec::new(), Vec::new());
        let mut used = 0;
        while let Some((term, n)) = after.get(used..).and_then(|t| self.term_at(t)) {
            match term {
                Term::Symmetric(s) => symmetric.push(format!("± {s}")),
                Term::Asymmetric(a, b) => asymmetric.push(format!("+{a}/-{b}")),
            }
            used += n;
        }
        let (first, last) = (after.first()?, after.get(used.checked_sub(1)?)?);
        let written = self.src.get(first.start..last.end).unwrap_or("");
        let at = Span::new(self.file, first.start, last.end);
        let in_percent = asymmetric.iter().any(|a| a.contains('%'));
        if symmetric.is_empty() && asymmetric.len() == 1 && in_percent {
            // `5 +1%/-2%`: the grammar takes no per cent in an asymmetric uncertainty (it said
            // "reads as a sum"); give it in the value's unit.
            let value: f64 = v.parse().ok()?;
            let (above, below) = written.trim_start_matches('+').split_once("/-")?;
            let side = |t: &str| -> Option<String> {
                let (n, percent) = match t.trim().strip_suffix('%') {
                    Some(n) => (n.trim().parse::<f64>().ok()?, true),
                    None => (t.trim().parse::<f64>().ok()?, false),
                };
                let x = if percent {
                    (value * n / 100.0).abs()
                } else {
                    n
                };
                Some(crate::format::sig(x, 3))
            };
            let fixed = format!("{v} +{}/-{}", side(above)?, side(below)?);
            let bare = |t: &str| t.trim().trim_end_matches('%').trim().to_string();
            let in_unit = format!("{v} +{}/-{} %", bare(above), bare(below));
            return Some(
                Diagnostic::new(
                    Rule::Syntax,
                    at,
                    format!("`{written}`: `%` inside an uncertainty is not read"),
                )
                .with_help(format!(
                    "a unit is written once, after the uncertainty: `{in_unit}` if the value is in per cent; a relative uncertainty is written out in the value's unit: `{fixed}`"
                )),
            );
        }
        if asymmetric.is_empty() || (symmetric.is_empty() && asymmetric.len() < 2) {
            return None;
        }
        let (sym, asym) = (symmetric.join(" "), asymmetric.join(" "));
        if symmetric.is_empty() {
            // `5 +1/-1 +2/-2`: read as arithmetic, it was a dimension error.
            return Some(
                Diagnostic::new(
                    Rule::Syntax,
                    at,
                    format!("`{written}` gives {} asymmetric uncertainties on one value", asymmetric.len()),
                )
                .with_help(format!(
                    "keep one, as in `{v} {}`: asymmetric uncertainties are not combined by the language (symmetric ones, `± a ± b`, are combined in quadrature); combine them yourself if that is meant",
                    asymmetric.first().map_or("", String::as_str)
                )),
            );
        }
        let asym_help = match asymmetric.as_slice() {
            _ if in_percent => {
                "one asymmetric uncertainty in the value's unit (no `%`)".to_string()
            }
            [one] => format!("`{v} {one}`"),
            _ => "one asymmetric uncertainty".to_string(),
        };
        Some(
            Diagnostic::new(
                Rule::Syntax,
                at,
                format!(
                    "`{written}` gives the uncertainty twice, once symmetric ({sym}) and once asymmetric ({asym})"
                ),
            )
            .with_help(format!(
                "keep one: `{v} {sym}` or {asym_help}; several symmetric uncertainties are written `± a ± b` (combined in quadrature), an asymmetric one is not combined so: combine them yourself if that is meant"
            )),
        )
    }
}
