//! The value grammar: one property's value, read directly when it is a plain measurement
//! (the common case) and otherwise by a `chumsky` grammar that recovers inside parentheses,
//! with the diagnostics its errors become.

use super::*;
use crate::diagnostic::Fix;

type Range = std::ops::Range<usize>;
pub(super) type ValueParser<'a> = chumsky::BoxedParser<'a, Tok, ValueParts, ParseError>;

/// The value grammar's error: a span, what was found, and the expected tokens as a bit set.
/// Cheaper than chumsky's `Simple` (no allocation per failed alternative), which matters:
/// most alternatives tried while parsing a measurement fail.
#[derive(Debug, Clone, PartialEq)]
pub struct ParseError {
    span: Range,
    found: Option<Tok>,
    expected: u64,
    message: Option<String>,
    unclosed: Option<Tok>,
}

const END_BIT: u64 = 1 << 63;

fn bit(t: Option<Tok>) -> u64 {
    match t {
        Some(t) => 1u64 << (t as u8).min(62),
        None => END_BIT,
    }
}

impl ParseError {
    fn custom(span: Range, message: &str) -> ParseError {
        ParseError {
            span,
            found: None,
            expected: 0,
            message: Some(message.to_string()),
            unclosed: None,
        }
    }

    fn expected_names(&self) -> Vec<&'static str> {
        let mut v: Vec<&'static str> = ALL_TOKS
            .iter()
            .filter(|t| self.expected & bit(Some(**t)) != 0)
            .map(|t| t.describe())
            .collect();
        if self.expected & END_BIT != 0 {
            v.push("end of line");
        }
        v.sort_unstable();
        v.dedup();
        v
    }
}

impl chumsky::Error<Tok> for ParseError {
    type Span = Range;
    type Label = &'static str;

    fn expected_input_found<Iter: IntoIterator<Item = Option<Tok>>>(
        span: Range,
        expected: Iter,
        found: Option<Tok>,
    ) -> Self {
        ParseError {
            span,
            found,
            expected: expected.into_iter().fold(0, |m, t| m | bit(t)),
            message: None,
            unclosed: None,
        }
    }

    fn unclosed_delimiter(
        unclosed_span: Range,
        unclosed: Tok,
        _span: Range,
        _expected: Tok,
        found: Option<Tok>,
    ) -> Self {
        ParseError {
            span: unclosed_span,
            found,
            expected: 0,
            message: None,
            unclosed: Some(unclosed),
        }
    }

    fn with_label(self, _label: Self::Label) -> Self {
        self
    }

    fn merge(mut self, other: Self) -> Self {
        self.expected |= other.expected;
        if self.message.is_none() {
            self.message = other.message;
        }
        self
    }
}

const ALL_TOKS: &[Tok] = &[
    Tok::Comment,
    Tok::Newline,
    Tok::Semi,
    Tok::LBrace,
    Tok::RBrace,
    Tok::LParen,
    Tok::RParen,
    Tok::LBracket,
    Tok::RBracket,
    Tok::Comma,
    Tok::Dot,
    Tok::Eq,
    Tok::Lt,
    Tok::Gt,
    Tok::PlusMinus,
    Tok::Plus,
    Tok::Minus,
    Tok::Star,
    Tok::Slash,
    Tok::Caret,
    Tok::System,
    Tok::StarKw,
    Tok::Planet,
    Tok::Orbits,
    Tok::Ref,
    Tok::Let,
    Tok::Assumed,
    Tok::Preferred,
    Tok::Number,
    Tok::Str,
    Tok::UnterminatedStr,
    Tok::Ident,
    Tok::Error,
];

impl Cursor<'_> {
    /// The tokens up to the end of the line (or `;` or `}`), handed to the value grammar.
    pub(super) fn parse_value(&mut self) -> Option<ValueParts> {
        let begin = self.pos;
        let mut depth = 0usize;
        let mut max_depth = 0usize;
        while let Some(k) = self.peek() {
            // `92^{+6}_{-5}` as typeset in a paper: its braces belong to the value (to be
            // refused with the spelling taken), not to the file's blocks, whose structure
            // they would otherwise break for the rest of the file.
            if k == Tok::LBrace && self.latex_group_here(begin) {
                while let Some(k) = self.peek() {
                    if matches!(k, Tok::Newline | Tok::Semi) {
                        break;
                    }
                    self.pos += 1;
                    if k == Tok::RBrace {
                        break;
                    }
                }
                continue;
            }
            match k {
                Tok::Newline | Tok::Semi | Tok::RBrace | Tok::LBrace => break,
                Tok::LParen | Tok::LBracket => {
                    depth += 1;
                    max_depth = max_depth.max(depth);
                }
                Tok::RParen | Tok::RBracket => depth = depth.saturating_sub(1),
                _ => {}
            }
            self.pos += 1;
        }
        let slice = self.toks.get(begin..self.pos).unwrap_or(&[]);
        let here = self.prev_end();
        if slice.is_empty() {
            let span = self.span_here();
            self.error(span, "expected a value here");
            return None;
        }
        let whole = Span::new(
            self.file,
            slice.first().map_or(here, |t| t.start),
            slice.last().map_or(here, |t| t.end),
        );
        let too_long = slice.len() > MAX_VALUE_TOKENS;
        if max_depth > MAX_DEPTH || too_long {
            let d = if max_depth > MAX_DEPTH {
                Diagnostic::new(
                    Rule::Syntax,
                    whole,
                    format!("parentheses nested more than {MAX_DEPTH} deep"),
                )
            } else {
                Diagnostic::new(
                    Rule::Syntax,
                    whole,
                    format!(
                        "this value is {} tokens long; the limit is {MAX_VALUE_TOKENS}",
                        slice.len()
                    ),
                )
                .with_help("split it into 'let' bindings")
            };
            self.diags.push(d);
            return Some(error_value(whole));
        }
        if let Some(parts) = self.plain_measurement(slice) {
            return Some(parts);
        }
        if let Some(d) = self
            .uncertainty_in_another_notation(slice)
            .or_else(|| self.exponent_without_caret(slice))
        {
            self.diags.push(d);
            return Some(error_value(whole));
        }
        let eoi = whole.end as usize..whole.end as usize;
        let stream = Stream::from_iter(eoi, slice.iter().map(|t| (t.kind, t.start..t.end)));
        let (out, errs) = self.value.parse_recovery(stream);
        for e in errs {
            let d = self.syntax_from_chumsky(e);
            self.diags.push(d);
        }
        Some(out.unwrap_or_else(|| error_value(whole)))
    }

    /// A unit's exponent written as papers typeset it, without `^` (`km s-1`, `g cm-3`):
    /// to the grammar a subtraction, reported as a dimension error far from the cause. The
    /// first unit symbol followed directly by `-` and a whole number is an error with the
    /// unit rewritten.
    fn exponent_without_caret(&self, slice: &[Token]) -> Option<Diagnostic> {
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
        Some(
            Diagnostic::new(
                Rule::Syntax,
                at,
                format!("`{written}` reads as a subtraction, not as a unit with an exponent"),
            )
            .with_help(format!(
                "write the exponent with `^`: `{symbol}^-{exponent}` (or divide: `/{symbol}`)"
            ))
            .with_fix(at, format!("{symbol}^-{exponent}")),
        )
    }

    /// Whether the `{` at the cursor opens a typeset superscript or subscript of a value
    /// (`^{+6}` or `_{-5}`, after a number of this value) and closes on its line.
    fn latex_group_here(&mut self, begin: usize) -> bool {
        let Some(before) = self
            .pos
            .checked_sub(1)
            .and_then(|i| self.toks.get(i))
            .copied()
        else {
            return false;
        };
        let marker = before.kind == Tok::Caret || self.text(before) == "_";
        let has_number = self
            .toks
            .get(begin..self.pos)
            .is_some_and(|t| t.iter().any(|t| t.kind == Tok::Number));
        let line_end = self
            .src
            .get(before.end..)
            .map_or(0, |rest| rest.find(['\n', '\r', ';']).unwrap_or(rest.len()));
        let closes = self
            .src
            .get(before.end..before.end + line_end)
            .is_some_and(|rest| rest.contains('}'));
        marker && has_number && self.pos > begin && closes
    }

    /// An uncertainty written as tables and papers write it, which the grammar would read
    /// as something else or not at all: `0.4 +0.1 -0.05` (signs attached to their numbers,
    /// a sum to the grammar: `impact` would silently be 0.45) and the concise `1.1(5)`. An
    /// error with the spelling this language takes; a sum written with spaces after its
    /// signs (`0.4 + 0.1 - 0.05`) is left to be one.
    fn uncertainty_in_another_notation(&self, slice: &[Token]) -> Option<Diagnostic> {
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
        // `0.3 ± 0.05 -0.01`: the same slip after a symmetric uncertainty (0.29 ± 0.05).
        if a.kind == Tok::PlusMinus && b.kind == Tok::Number {
            let [c, d, after @ ..] = rest else {
                return None;
            };
            let operator_after = after.first().is_some_and(|t| {
                matches!(t.kind, Tok::Star | Tok::Slash | Tok::Caret | Tok::LParen)
            });
            if !signed(c, d) || joined(b, c) || operator_after {
                return None;
            }
            let written = self.src.get(c.start..d.end).unwrap_or("");
            return Some(
                Diagnostic::new(
                    Rule::Syntax,
                    span(c, d),
                    format!(
                        "`{written}` after the uncertainty reads as {}, not as part of the measurement",
                        if c.kind == Tok::Minus { "a difference" } else { "a sum" }
                    ),
                )
                .with_help(
                    "a second uncertainty is written `± u` (combined in quadrature), one above and below `+above/-below`; for a sum, put a space after the sign",
                ),
            );
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

    /// The common case, read directly: a number with an optional uncertainty and unit, or a
    /// string, followed by citations and `assumed`. Anything else (expressions, and every
    /// malformed value) goes to the chumsky grammar, which produces the same tree for these
    /// forms (a test checks that) and the error messages. Parsing is several times faster
    /// this way, because most values in a catalogue are plain measurements.
    fn plain_measurement(&self, slice: &[Token]) -> Option<ValueParts> {
        let kind = |i: usize| slice.get(i).map(|t| t.kind);
        let sp = |t: &Token| Span::new(self.file, t.start, t.end);
        let num = |i: usize| -> Option<(f64, Span)> {
            let t = slice.get(i)?;
            (t.kind == Tok::Number)
                .then(|| (self.text(*t).parse::<f64>().unwrap_or(f64::NAN), sp(t)))
        };
        let mut i;
        let first = slice.first()?;
        let value = match first.kind {
            Tok::Str => {
                i = 1;
                PropValue::Text(unescape(self.text(*first)), sp(first))
            }
            Tok::Number => {
                let (value, value_span) = num(0)?;
                i = 1;
                let uncertainty = if kind(1) == Some(Tok::PlusMinus) {
                    let (s, mut end) = num(2)?;
                    i = 3;
                    // A list only for a second `±` (most values have one).
                    let mut parts = Vec::new();
                    while kind(i) == Some(Tok::PlusMinus) {
                        let (more, at) = num(i + 1)?;
                        if parts.is_empty() {
                            parts.push(s);
                        }
                        parts.push(more);
                        end = at;
                        i += 2;
                    }
                    let span = sp(slice.get(1)?).join(end);
                    if parts.is_empty() {
                        Uncertainty::Symmetric(s, span)
                    } else {
                        Uncertainty::Quadrature(parts.into(), span)
                    }
                } else if kind(1) == Some(Tok::Plus)
                    && kind(3) == Some(Tok::Slash)
                    && kind(4) == Some(Tok::Minus)
                {
                    let (plus, _) = num(2)?;
                    let (minus, end) = num(5)?;
                    i = 6;
                    Uncertainty::Asymmetric {
                        plus,
                        minus,
                        span: sp(slice.get(1)?).join(end),
                    }
                } else {
                    Uncertainty::None
                };
                // Most units are one symbol (`Msun`, `d`), kept inline.
                let mut factors = crate::ast::UnitFactors::new();
                let mut unit_span: Option<Span> = None;
                loop {
                    let divide = kind(i) == Some(Tok::Slash) && !factors.is_empty();
                    let at = if divide { i + 1 } else { i };
                    if kind(at) != Some(Tok::Ident) {
                        break;
                    }
                    let sym = slice.get(at)?;
                    let mut exponent = 1i32;
                    let mut end = sp(sym);
                    i = at + 1;
                    if kind(i) == Some(Tok::Caret) {
                        let neg = kind(i + 1) == Some(Tok::Minus);
                        let at = if neg { i + 2 } else { i + 1 };
                        let t = slice.get(at).filter(|t| t.kind == Tok::Number)?;
                        let e: i32 = self.text(*t).parse().ok().filter(|e: &i32| e.abs() <= 12)?;
                        exponent = if neg { -e } else { e };
                        end = sp(t);
                        i = at + 1;
                    }
                    if divide {
                        exponent = -exponent;
                    }
                    let start = sp(sym);
                    unit_span = Some(unit_span.map_or(start.join(end), |u| u.join(end)));
                    factors.push(UnitFactor {
                        symbol: Ident {
                            name: self.text(*sym).into(),
                            span: start,
                        },
                        exponent,
                    });
                }
                let end = slice.get(i.checked_sub(1)?)?;
                let unit = unit_span.map(|span| UnitExpr { factors, span });
                PropValue::Expr(Expr {
                    span: value_span.join(sp(end)),
                    kind: ExprKind::Literal(Literal {
                        value,
                        value_span,
                        uncertainty,
                        unit,
                    }),
                })
            }
            _ => return None,
        };
        let mut parts = ValueParts {
            value,
            assumed: None,
            preferred: None,
            citations: Vec::new(),
        };
        while let Some(t) = slice.get(i) {
            match t.kind {
                // A mark written twice: the full grammar says so.
                Tok::Assumed if parts.assumed.is_some() => return None,
                Tok::Preferred if parts.preferred.is_some() => return None,
                Tok::Assumed => {
                    parts.assumed = Some(sp(t));
                    i += 1;
                }
                Tok::Preferred => {
                    parts.preferred = Some(sp(t));
                    i += 1;
                }
                Tok::LBracket => {
                    i += 1;
                    let before = parts.citations.len();
                    while kind(i) == Some(Tok::Ident) {
                        let id = slice.get(i)?;
                        parts.citations.push(Ident {
                            name: self.text(*id).into(),
                            span: sp(id),
                        });
                        i += 1;
                        if kind(i) == Some(Tok::Comma) {
                            i += 1;
                        } else {
                            break;
                        }
                    }
                    if kind(i) != Some(Tok::RBracket) || parts.citations.len() == before {
                        return None;
                    }
                    i += 1;
                }
                _ => return None,
            }
        }
        #[cfg(test)]
        tests::count_plain_measurement();
        Some(parts)
    }

    fn syntax_from_chumsky(&self, e: ParseError) -> Diagnostic {
        let r = e.span.clone();
        let span = Span::new(self.file, r.start, r.end);
        let found = match e.found {
            None => "end of line".to_string(),
            Some(Tok::Ident | Tok::Number) => {
                format!("'{}'", self.src.get(r.clone()).unwrap_or(""))
            }
            Some(Tok::Error) => format!(
                "unexpected character '{}'",
                self.src.get(r.clone()).unwrap_or("")
            ),
            Some(k) => k.describe().to_string(),
        };
        if let Some(msg) = &e.message {
            return Diagnostic::new(Rule::Syntax, span, msg.clone());
        }
        if let Some(delimiter) = e.unclosed {
            return Diagnostic::new(
                Rule::Syntax,
                span,
                format!("unclosed {}", delimiter.describe()),
            );
        }
        let expected = e.expected_names();
        let msg = if expected.is_empty() {
            format!("unexpected {found}")
        } else {
            format!("expected {}, found {found}", join_or(&expected))
        };
        let mut d = Diagnostic::new(Rule::Syntax, span, msg);
        if let Some((help, fix)) = self.misplaced_uncertainty(r.start, e.found) {
            d = d.with_help(help);
            if let Some(Fix { span, text }) = fix {
                d = d.with_fix(span, text);
            }
        } else if matches!(e.found, Some(Tok::Ident | Tok::Number)) {
            d = d.with_help(
                "a unit follows the whole measurement: `1.2 ± 0.1 Rjup`; to multiply, write `*`",
            );
        } else if let Some(name) = self.second_property(r.start, e.found) {
            d = d.with_help(format!(
                "one property per line: start a new line before `{name}`"
            ));
        }
        d
    }
}

impl Cursor<'_> {
    /// The name of a second property written on the line of the first
    /// (`mass = 1 Msun radius = 1 Rsun`): found '=', '<' or '>' just after a quantity's name.
    fn second_property(&self, at: usize, found: Option<Tok>) -> Option<&str> {
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
    fn misplaced_uncertainty(
        &self,
        at: usize,
        found: Option<Tok>,
    ) -> Option<(String, Option<Fix>)> {
        let i = self.toks.partition_point(|t| t.start < at);
        let back = |n: usize| i.checked_sub(n).and_then(|j| self.toks.get(j));
        let kind = |n: usize| back(n).map(|t| t.kind);
        let ahead = |n: usize| self.toks.get(i + n);
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
                Some((
                    format!("the decimal separator is a point: `{point}`"),
                    Some(Fix {
                        span: Span::new(self.file, whole.start, fraction.end),
                        text: point,
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

/// The value of a property that did not parse: an `Error` placeholder over its tokens.
fn error_value(whole: Span) -> ValueParts {
    ValueParts {
        value: PropValue::Expr(Expr {
            kind: ExprKind::Error,
            span: whole,
        }),
        assumed: None,
        preferred: None,
        citations: Vec::new(),
    }
}

fn join_or(items: &[&str]) -> String {
    match items {
        [] => String::new(),
        [one] => (*one).to_string(),
        [init @ .., last] => format!("{} or {}", init.join(", "), last),
    }
}

/// The chumsky grammar for one property value (see the module doc).
pub(super) fn value_parser<'a>(src: &'a str, file: FileId) -> ValueParser<'a> {
    let sp = move |r: Range| Span::new(file, r.start, r.end);
    let slice = move |r: &Range| src.get(r.clone()).unwrap_or("").to_string();

    let ident = tok(Tok::Ident).map_with_span(move |_, r: Range| Ident {
        name: slice(&r).into(),
        span: sp(r),
    });
    let number = tok(Tok::Number).map_with_span(move |_, r: Range| {
        let v = src
            .get(r.clone())
            .unwrap_or("")
            .parse::<f64>()
            .unwrap_or(f64::NAN);
        (v, sp(r))
    });
    let exponent = tok(Tok::Minus)
        .or_not()
        .then(tok(Tok::Number).map_with_span(move |_, r: Range| (slice(&r), r)))
        .try_map(|(neg, (text, r)), _| {
            let v: i32 = text.parse().map_err(|_| {
                ParseError::custom(r.clone(), "a unit exponent must be a whole number")
            })?;
            if v.abs() > 12 {
                return Err(ParseError::custom(
                    r,
                    "a unit exponent must lie between -12 and 12",
                ));
            }
            Ok(if neg.is_some() { -v } else { v })
        });
    let factor = ident
        .clone()
        .then(tok(Tok::Caret).ignore_then(exponent).or_not())
        .map(|(symbol, e)| UnitFactor {
            symbol,
            exponent: e.unwrap_or(1),
        });
    let unit = factor
        .clone()
        .then(
            tok(Tok::Slash)
                .or_not()
                .then(factor)
                .map(|(slash, mut f)| {
                    if slash.is_some() {
                        f.exponent = -f.exponent;
                    }
                    f
                })
                .repeated(),
        )
        .map_with_span(move |(first, rest), r: Range| {
            let mut factors = crate::ast::UnitFactors::new();
            factors.push(first);
            factors.extend(rest);
            UnitExpr {
                factors,
                span: sp(r),
            }
        });
    let uncertainty = choice((
        tok(Tok::PlusMinus)
            .ignore_then(number.clone())
            .repeated()
            .at_least(1)
            .map_with_span(move |parts, r: Range| match parts.as_slice() {
                [(s, _)] => Uncertainty::Symmetric(*s, sp(r)),
                _ => Uncertainty::Quadrature(parts.iter().map(|p| p.0).collect(), sp(r)),
            }),
        tok(Tok::Plus)
            .ignore_then(number.clone())
            .then_ignore(tok(Tok::Slash))
            .then_ignore(tok(Tok::Minus))
            .then(number.clone())
            .map_with_span(move |((p, _), (m, _)), r: Range| Uncertainty::Asymmetric {
                plus: p,
                minus: m,
                span: sp(r),
            }),
    ));
    let literal = number
        .then(uncertainty.or_not())
        .then(unit.or_not())
        .map_with_span(move |(((value, value_span), unc), unit), r: Range| Expr {
            kind: ExprKind::Literal(Literal {
                value,
                value_span,
                uncertainty: unc.unwrap_or(Uncertainty::None),
                unit,
            }),
            span: sp(r),
        });

    let expr = recursive(|expr| {
        let call = ident
            .clone()
            .then(
                expr.clone()
                    .separated_by(tok(Tok::Comma))
                    .delimited_by(tok(Tok::LParen), tok(Tok::RParen)),
            )
            .map_with_span(move |(f, args), r: Range| Expr {
                kind: ExprKind::Call(f, args),
                span: sp(r),
            });
        let reference = ident
            .clone()
            .then_ignore(tok(Tok::Dot))
            .then(ident.clone())
            .map_with_span(move |(b, q), r: Range| Expr {
                kind: ExprKind::Ref(b, q),
                span: sp(r),
            });
        let name = ident.clone().map(|i| {
            let span = i.span;
            Expr {
                kind: ExprKind::Name(i),
                span,
            }
        });
        let paren = expr
            .clone()
            .delimited_by(tok(Tok::LParen), tok(Tok::RParen))
            .recover_with(nested_delimiters(
                Tok::LParen,
                Tok::RParen,
                [(Tok::LBracket, Tok::RBracket)],
                move |r: Range| Expr {
                    kind: ExprKind::Error,
                    span: sp(r),
                },
            ));
        let atom = choice((literal, call, reference, name, paren));
        let power = atom
            .clone()
            .then(
                tok(Tok::Caret)
                    .ignore_then(
                        tok(Tok::Minus)
                            .map_with_span(move |_, r: Range| sp(r))
                            .or_not()
                            .then(atom),
                    )
                    .repeated(),
            )
            .map(|(base, rest)| {
                // Right-associative: a^b^c = a^(b^c).
                let mut exps: Vec<Expr> = rest
                    .into_iter()
                    .map(|(neg, e)| match neg {
                        Some(s) => Expr {
                            span: s.join(e.span),
                            kind: ExprKind::Neg(Box::new(e)),
                        },
                        None => e,
                    })
                    .collect();
                let mut acc = match exps.pop() {
                    Some(last) => last,
                    None => return base,
                };
                while let Some(prev) = exps.pop() {
                    acc = Expr {
                        span: prev.span.join(acc.span),
                        kind: ExprKind::Pow(Box::new(prev), Box::new(acc)),
                    };
                }
                Expr {
                    span: base.span.join(acc.span),
                    kind: ExprKind::Pow(Box::new(base), Box::new(acc)),
                }
            });
        let unary = tok(Tok::Minus)
            .map_with_span(move |_, r: Range| sp(r))
            .repeated()
            .then(power)
            .foldr(|s, e| Expr {
                span: s.join(e.span),
                kind: ExprKind::Neg(Box::new(e)),
            });
        let product = unary
            .clone()
            .then(
                choice((
                    tok(Tok::Star).to(BinOp::Mul),
                    tok(Tok::Slash).to(BinOp::Div),
                ))
                .then(unary)
                .repeated(),
            )
            .foldl(|a, (op, b)| Expr {
                span: a.span.join(b.span),
                kind: ExprKind::Binary(op, Box::new(a), Box::new(b)),
            });
        product
            .clone()
            .then(
                choice((
                    tok(Tok::Plus).to(BinOp::Add),
                    tok(Tok::Minus).to(BinOp::Sub),
                ))
                .then(product)
                .repeated(),
            )
            .foldl(|a, (op, b)| Expr {
                span: a.span.join(b.span),
                kind: ExprKind::Binary(op, Box::new(a), Box::new(b)),
            })
    });

    let text = tok(Tok::Str).map_with_span(move |_, r: Range| {
        PropValue::Text(unescape(src.get(r.clone()).unwrap_or("")), sp(r))
    });
    let citations = ident
        .separated_by(tok(Tok::Comma))
        .allow_trailing()
        .at_least(1)
        .delimited_by(tok(Tok::LBracket), tok(Tok::RBracket));
    enum Trail {
        Assumed(Span, Range),
        Preferred(Span, Range),
        Cites(Vec<Ident>),
    }
    let trail = choice((
        tok(Tok::Assumed).map_with_span(move |_, r: Range| Trail::Assumed(sp(r.clone()), r)),
        tok(Tok::Preferred).map_with_span(move |_, r: Range| Trail::Preferred(sp(r.clone()), r)),
        citations.map(Trail::Cites),
    ));
    choice((text, expr.map(PropValue::Expr)))
        .then(trail.repeated())
        .then_ignore(end())
        .try_map(|(value, trails), _| {
            let mut parts = ValueParts {
                value,
                assumed: None,
                preferred: None,
                citations: Vec::new(),
            };
            // A mark written twice is a slip (a pasted tail, say): said, not taken silently.
            let twice = |word: &str, r: Range| {
                ParseError::custom(r, &format!("`{word}` is written twice; once is enough"))
            };
            for t in trails {
                match t {
                    Trail::Assumed(_, r) if parts.assumed.is_some() => {
                        return Err(twice("assumed", r))
                    }
                    Trail::Preferred(_, r) if parts.preferred.is_some() => {
                        return Err(twice("preferred", r))
                    }
                    Trail::Assumed(s, _) => parts.assumed = Some(s),
                    Trail::Preferred(s, _) => parts.preferred = Some(s),
                    Trail::Cites(c) => parts.citations.extend(c),
                }
            }
            Ok(parts)
        })
        .boxed()
}

fn tok(t: Tok) -> impl chumsky::Parser<Tok, Tok, Error = ParseError> + Clone {
    just(t)
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
