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
            .or_else(|| self.sign_slip_in_uncertainty(slice))
            .or_else(|| self.uncertainty_twice_inside(slice))
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
            (t.kind == Tok::Number).then(|| (literal_number(self.text(*t)), sp(t)))
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
        let v = literal_number(src.get(r.clone()).unwrap_or(""));
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

/// The text of a string literal: quotes removed, `\n`, `\t` and escaped characters read.
pub(super) fn unescape(quoted: &str) -> String {
    let inner = quoted
        .strip_prefix('"')
        .and_then(|s| s.strip_suffix('"'))
        .unwrap_or(quoted);
    let mut out = String::with_capacity(inner.len());
    let mut chars = inner.chars();
    while let Some(c) = chars.next() {
        if c == '\\' {
            match chars.next() {
                Some('n') => out.push('\n'),
                Some('t') => out.push('\t'),
                Some(other) => out.push(other),
                None => {}
            }
        } else {
            out.push(c);
        }
    }
    out
}

/// A number literal's value. One too small for a 64-bit float (`1e-400`) would read as 0
/// and pass for an exact value or a zero uncertainty without a word: it is read as the
/// smallest subnormal number instead, which lowering refuses as too small to represent.
fn literal_number(text: &str) -> f64 {
    let v = text.parse::<f64>().unwrap_or(f64::NAN);
    let mantissa = text.split(['e', 'E']).next().unwrap_or("");
    if v == 0.0 && mantissa.bytes().any(|b| (b'1'..=b'9').contains(&b)) {
        f64::from_bits(1)
    } else {
        v
    }
}
