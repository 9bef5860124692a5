//! The parser: tokens to a syntax tree, with error recovery.
//!
//! Grammar (`?` optional, `*` repeated, `SEP` is a newline or `;`):
//!
//! ```text
//! file      = (ref | system | SEP)*
//! ref       = "ref" NAME STRING
//! system    = "system" STRING "{" (body | let | SEP)* "}"
//! body      = ("star" NAME | "planet" NAME ("orbits" NAME)?) "{" (prop | let | SEP)* "}"
//! let       = "let" NAME "=" expr
//! prop      = NAME ("=" | "<" | ">") value
//! value     = (STRING | expr) ("assumed" | citations)*
//! citations = "[" NAME ("," NAME)* ","? "]"
//! expr      = product (("+" | "-") product)*
//! product   = unary (("*" | "/") unary)*
//! unary     = "-"* power
//! power     = atom ("^" "-"? atom)*            (right-associative)
//! atom      = literal | NAME "(" expr,* ")" | NAME "." NAME | NAME | "(" expr ")"
//! literal   = NUMBER ("±" NUMBER | "+" NUMBER "/" "-" NUMBER)? unit?
//! unit      = factor ("/"? factor)*            ("/" divides by the one factor after it)
//! factor    = NAME ("^" "-"? NUMBER)?
//! ```
//!
//! The block structure (files, systems, bodies, one property a line) is parsed by hand,
//! because the language is line-oriented and recovery at line and brace boundaries is then
//! exact: a bad property costs that one line, a missing `}` is reported where the next body
//! starts. Each property's value is parsed with a `chumsky` grammar, which recovers inside
//! parentheses. Nesting deeper than [`MAX_DEPTH`], and values longer than
//! [`MAX_VALUE_TOKENS`], are refused before they can exhaust the stack of any later stage;
//! after [`MAX_SYNTAX_ERRORS`] syntax errors the parser stops reading the file (as compilers
//! do), so garbage costs neither gigabytes of diagnostics nor their time.

use crate::ast::*;
use crate::diagnostic::{Diagnostic, Rule};
use crate::lexer::{tokens, Tok, Token, Tokens};
use crate::source::{FileId, Span};
use chumsky::prelude::*;
use chumsky::Stream;

/// Deepest nesting of parentheses (and brackets) accepted in one value.
pub const MAX_DEPTH: usize = 64;

/// Most tokens accepted in one value. Every later stage walks a value's tree recursively,
/// and a tree is never deeper than its token count, so this bounds their stack use; real
/// values are a few dozen tokens long.
pub const MAX_VALUE_TOKENS: usize = 256;
/// Syntax errors after which the parser stops reading a file: a file with more is not a
/// description with mistakes but something else (ten megabytes of stray names once made
/// five million errors and took two gigabytes).
pub const MAX_SYNTAX_ERRORS: usize = 1000;

type Range = std::ops::Range<usize>;
type ValueParser<'a> = chumsky::BoxedParser<'a, Tok, ValueParts, ParseError>;

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
    Tok::Number,
    Tok::Str,
    Tok::UnterminatedStr,
    Tok::Ident,
    Tok::Error,
];

/// What one property value parses to.
#[derive(Debug, Clone)]
struct ValueParts {
    value: PropValue,
    assumed: Option<Span>,
    citations: Vec<Ident>,
}

/// The result of parsing: a tree (possibly with `Error` placeholders) and the problems found.
pub struct Parsed {
    pub file: File,
    pub diagnostics: Vec<Diagnostic>,
}

/// Parse one source text.
pub fn parse(file: FileId, src: &str) -> Parsed {
    let mut p = Cursor {
        src,
        file,
        toks: Vec::new(),
        feed: Feed {
            src,
            file,
            lexer: Some(tokens(src)),
            comments: Vec::new(),
            line_has_code: false,
        },
        pos: 0,
        diags: Vec::new(),
        stopped: false,
        value: value_parser(src, file),
    };
    let mut out = p.parse_file();
    out.comments = p.feed.comments;
    Parsed {
        file: out,
        diagnostics: merge_repeats(src, p.diags),
    }
}

/// The tokens the parser reads, lexed as it asks for them (so a parser that stops early
/// never lexes the rest): comments are set aside, and a run of line ends (blank lines,
/// comment lines) or of `;` is kept as its first, as it separates like one.
struct Feed<'a> {
    src: &'a str,
    file: FileId,
    lexer: Option<Tokens<'a>>,
    comments: Vec<Comment>,
    line_has_code: bool,
}

impl Feed<'_> {
    /// The next token to keep, given the last one kept.
    fn next(&mut self, last: Option<Tok>) -> Option<Token> {
        loop {
            let t = self.lexer.as_mut()?.next()?;
            match t.kind {
                Tok::Comment => self.comments.push(Comment {
                    text: self.src.get(t.start..t.end).unwrap_or("").to_string(),
                    span: Span::new(self.file, t.start, t.end),
                    trailing: self.line_has_code,
                }),
                Tok::Newline | Tok::Semi => {
                    self.line_has_code = t.kind == Tok::Semi;
                    if last != Some(t.kind) {
                        return Some(t);
                    }
                }
                _ => {
                    self.line_has_code = true;
                    return Some(t);
                }
            }
        }
    }
}

/// One diagnostic for a run of identical ones on one line (a line of 10,000 stray `}` is one
/// error, not 10,000), with the count in its message and a span over the whole run.
fn merge_repeats(src: &str, diags: Vec<Diagnostic>) -> Vec<Diagnostic> {
    let mut out: Vec<(Diagnostic, usize)> = Vec::with_capacity(diags.len());
    for d in diags {
        if let Some((last, n)) = out.last_mut() {
            let same_line = last.span.end <= d.span.start
                && src
                    .get(last.span.end as usize..d.span.start as usize)
                    .is_some_and(|between| !between.contains(['\n', '\r']));
            if same_line
                && last.rule == d.rule
                && last.message == d.message
                && last.help == d.help
                && last.notes == d.notes
                && last.labels.is_empty()
                && d.labels.is_empty()
            {
                last.span = last.span.join(d.span);
                *n += 1;
                continue;
            }
        }
        out.push((d, 1));
    }
    out.into_iter()
        .map(|(mut d, n)| {
            if n > 1 {
                d.message = repeated(&d.message, n);
            }
            d
        })
        .collect()
}

/// A message for `n` errors in a row on one line.
fn repeated(message: &str, n: usize) -> String {
    if n > 1 {
        format!("{message} ({n} times in a row on this line)")
    } else {
        message.to_string()
    }
}

struct Cursor<'a> {
    src: &'a str,
    file: FileId,
    /// The tokens read so far; `pos` indexes them.
    toks: Vec<Token>,
    feed: Feed<'a>,
    pos: usize,
    diags: Vec<Diagnostic>,
    /// Set when the parser stopped reading after too many syntax errors.
    stopped: bool,
    value: ValueParser<'a>,
}

impl<'a> Cursor<'a> {
    /// The token at `pos`, lexed now if it has not been.
    fn current(&mut self) -> Option<Token> {
        if self.pos >= self.toks.len() {
            let last = self.toks.last().map(|t| t.kind);
            let t = self.feed.next(last)?;
            self.toks.push(t);
        }
        self.toks.get(self.pos).copied()
    }

    fn peek(&mut self) -> Option<Tok> {
        self.current().map(|t| t.kind)
    }

    fn peek_token(&mut self) -> Option<Token> {
        self.current()
    }

    fn span_here(&mut self) -> Span {
        match self.current() {
            Some(t) => Span::new(self.file, t.start, t.end),
            None => Span::new(self.file, self.src.len(), self.src.len()),
        }
    }

    fn prev_end(&self) -> usize {
        self.pos
            .checked_sub(1)
            .and_then(|i| self.toks.get(i))
            .map_or(0, |t| t.end)
    }

    fn text(&self, t: Token) -> &'a str {
        self.src.get(t.start..t.end).unwrap_or("")
    }

    fn bump(&mut self) -> Option<Token> {
        let t = self.current();
        if t.is_some() {
            self.pos += 1;
        }
        t
    }

    fn eat(&mut self, kind: Tok) -> Option<Token> {
        if self.peek() == Some(kind) {
            self.bump()
        } else {
            None
        }
    }

    fn skip_separators(&mut self) {
        while matches!(self.peek(), Some(Tok::Newline | Tok::Semi)) {
            self.pos += 1;
        }
        if !self.stopped && self.diags.len() >= MAX_SYNTAX_ERRORS && self.peek().is_some() {
            self.stop();
        }
    }

    /// Stop reading: one last error where the parser stopped, then the end of the input.
    fn stop(&mut self) {
        let span = self.span_here();
        self.diags.push(
            Diagnostic::new(
                Rule::Syntax,
                span,
                format!("{MAX_SYNTAX_ERRORS} syntax errors: the file is not read past this point"),
            )
            .with_help("fix the errors above (or check that this is a Syzygy file) and run again"),
        );
        self.stopped = true;
        self.feed.lexer = None;
        self.pos = self.toks.len();
    }

    fn error(&mut self, span: Span, message: impl Into<String>) {
        self.diags
            .push(Diagnostic::new(Rule::Syntax, span, message.into()));
    }

    fn found(&mut self) -> String {
        match self.peek_token() {
            None => "end of file".to_string(),
            Some(t) => match t.kind {
                Tok::Ident | Tok::Number => format!("'{}'", self.text(t)),
                Tok::Error => format!("unexpected character '{}'", self.text(t)),
                k => k.describe().to_string(),
            },
        }
    }

    fn expect_error(&mut self, what: &str) {
        let msg = format!("expected {what}, found {}", self.found());
        let span = self.span_here();
        self.error(span, msg);
    }

    /// Skip to the end of the current line (not past a `}` that closes a block).
    fn skip_line(&mut self) {
        while let Some(k) = self.peek() {
            match k {
                Tok::Newline | Tok::Semi | Tok::RBrace => return,
                _ => self.pos += 1,
            }
        }
    }

    fn ident(&mut self, what: &str) -> Option<Ident> {
        match self.peek_token() {
            Some(t) if t.kind == Tok::Ident => {
                self.pos += 1;
                Some(Ident {
                    name: self.text(t).to_string(),
                    span: Span::new(self.file, t.start, t.end),
                })
            }
            _ => {
                self.expect_error(what);
                None
            }
        }
    }

    fn string(&mut self, what: &str) -> Option<(String, Span)> {
        match self.peek_token() {
            Some(t) if t.kind == Tok::Str => {
                self.pos += 1;
                Some((unescape(self.text(t)), Span::new(self.file, t.start, t.end)))
            }
            Some(t) if t.kind == Tok::UnterminatedStr => {
                self.pos += 1;
                let span = Span::new(self.file, t.start, t.end);
                self.diags.push(
                    Diagnostic::new(Rule::Syntax, span, "unterminated string")
                        .with_help("close the string with '\"' on the same line"),
                );
                let s = self.text(t).get(1..).unwrap_or("");
                Some((s.to_string(), span))
            }
            _ => {
                self.expect_error(what);
                None
            }
        }
    }

    fn parse_file(&mut self) -> File {
        let mut file = File::default();
        loop {
            self.skip_separators();
            match self.peek() {
                None => break,
                Some(Tok::Ref) => {
                    if let Some(r) = self.parse_ref() {
                        file.refs.push(r);
                    }
                }
                Some(Tok::System) => {
                    if let Some(s) = self.parse_system() {
                        file.systems.push(s);
                    }
                }
                Some(Tok::RBrace) => {
                    // A run of them is one error (see `merge_repeats`).
                    let first = self.span_here();
                    let mut n = 0usize;
                    while self.eat(Tok::RBrace).is_some() {
                        n += 1;
                    }
                    let span = first.join(Span::new(self.file, self.prev_end(), self.prev_end()));
                    self.error(span, repeated("unmatched '}'", n));
                }
                Some(Tok::StarKw | Tok::Planet) => {
                    let span = self.span_here();
                    self.diags.push(
                        Diagnostic::new(
                            Rule::Syntax,
                            span,
                            "a body must be declared inside a system",
                        )
                        .with_help("wrap it in `system \"Name\" { ... }`"),
                    );
                    // Parse it anyway so its own mistakes are reported, then drop it.
                    let _ = self.parse_body();
                }
                Some(_) => {
                    self.expect_error("'system' or 'ref'");
                    self.skip_line();
                    if self.peek() == Some(Tok::RBrace) {
                        self.pos += 1;
                    }
                }
            }
        }
        file
    }

    fn parse_ref(&mut self) -> Option<RefDecl> {
        let start = self.bump().map_or(0, |t| t.start);
        let id = self.ident("a reference id after 'ref'");
        let text = if id.is_some() {
            self.string("the reference text in quotes")
        } else {
            None
        };
        let end = self.prev_end();
        self.expect_line_end();
        Some(RefDecl {
            id: id?,
            text: text?.0,
            span: Span::new(self.file, start, end),
        })
    }

    /// After a complete line: anything but a separator or `}` is an error.
    fn expect_line_end(&mut self) {
        match self.peek() {
            None | Some(Tok::Newline | Tok::Semi | Tok::RBrace) => {}
            Some(_) => {
                self.expect_error("end of line");
                self.skip_line();
            }
        }
    }

    fn parse_system(&mut self) -> Option<SystemDecl> {
        let start = self.bump().map_or(0, |t| t.start);
        let name = self.string("the system's name in quotes");
        while self.peek() == Some(Tok::Newline) {
            self.pos += 1;
        }
        if self.eat(Tok::LBrace).is_none() {
            self.expect_error("'{' to open the system");
            self.skip_line();
            return None;
        }
        let (name, name_span) =
            name.unwrap_or_else(|| (String::new(), Span::new(self.file, start, start)));
        let mut sys = SystemDecl {
            name,
            name_span,
            lets: Vec::new(),
            bodies: Vec::new(),
            span: Span::new(self.file, start, start),
        };
        loop {
            self.skip_separators();
            match self.peek() {
                None if self.stopped => break,
                None => {
                    let span = Span::new(self.file, start, self.src.len());
                    self.diags.push(
                        Diagnostic::new(Rule::Syntax, sys.name_span, "this system is never closed")
                            .with_label(span, "the file ends here")
                            .with_help("add '}' at the end of the system"),
                    );
                    break;
                }
                Some(Tok::RBrace) => {
                    self.pos += 1;
                    break;
                }
                Some(Tok::StarKw | Tok::Planet) => {
                    if let Some(b) = self.parse_body() {
                        sys.bodies.push(b);
                    }
                }
                Some(Tok::Let) => {
                    if let Some(l) = self.parse_let() {
                        sys.lets.push(l);
                    }
                }
                Some(Tok::System) => {
                    let span = self.span_here();
                    self.diags.push(
                        Diagnostic::new(
                            Rule::Syntax,
                            sys.name_span,
                            "this system is not closed before the next one",
                        )
                        .with_label(span, "the next system starts here")
                        .with_help("add '}' to close the system"),
                    );
                    break;
                }
                Some(Tok::Ident) => {
                    let span = self.span_here();
                    self.diags.push(
                        Diagnostic::new(Rule::Syntax, span, "a property must belong to a star or planet")
                            .with_help("declare it inside `star NAME { ... }` or `planet NAME orbits STAR { ... }`"),
                    );
                    self.skip_line();
                }
                Some(_) => {
                    self.expect_error("'star', 'planet', 'let' or '}'");
                    self.skip_line();
                    if self.peek() == Some(Tok::RBrace) {
                        // Leave it: it closes the system.
                    }
                }
            }
        }
        sys.span = Span::new(self.file, start, self.prev_end());
        Some(sys)
    }

    fn parse_body(&mut self) -> Option<BodyDecl> {
        let kw = self.bump()?;
        let start = kw.start;
        let kind = if kw.kind == Tok::StarKw {
            BodyKind::Star
        } else {
            BodyKind::Planet
        };
        let name = self.ident(match kind {
            BodyKind::Star => "the star's name",
            BodyKind::Planet => "the planet's name",
        });
        let mut orbits = None;
        if kind == BodyKind::Planet && name.is_some() {
            if self.eat(Tok::Orbits).is_some() {
                orbits = self.ident("the name of the star it orbits");
            } else if self.peek() == Some(Tok::LBrace) {
                let span = name.as_ref().map_or(self.span_here(), |n| n.span);
                self.diags.push(
                    Diagnostic::new(Rule::Syntax, span, "a planet must say which star it orbits")
                        .with_help("write `planet NAME orbits STAR { ... }`"),
                );
            }
        } else if kind == BodyKind::Star && self.peek() == Some(Tok::Orbits) {
            let span = self.span_here();
            self.error(span, "a star does not orbit another body in this language");
            self.pos += 1;
            let _ = self.ident("a name");
        }
        while self.peek() == Some(Tok::Newline) {
            self.pos += 1;
        }
        if self.eat(Tok::LBrace).is_none() {
            self.expect_error("'{' to open the body");
            self.skip_line();
            return None;
        }
        let name = name?;
        let mut body = BodyDecl {
            kind,
            name,
            orbits,
            props: Vec::new(),
            lets: Vec::new(),
            span: Span::new(self.file, start, start),
        };
        loop {
            self.skip_separators();
            match self.peek() {
                None if self.stopped => break,
                None => {
                    self.diags.push(
                        Diagnostic::new(Rule::Syntax, body.name.span, "this body is never closed")
                            .with_help("add '}' after its last property"),
                    );
                    break;
                }
                Some(Tok::RBrace) => {
                    self.pos += 1;
                    break;
                }
                Some(Tok::StarKw | Tok::Planet | Tok::System) => {
                    let span = self.span_here();
                    self.diags.push(
                        Diagnostic::new(
                            Rule::Syntax,
                            body.name.span,
                            "this body is not closed before the next declaration",
                        )
                        .with_label(span, "the next declaration starts here")
                        .with_help("add '}' after the body's last property"),
                    );
                    break;
                }
                Some(Tok::Let) => {
                    if let Some(l) = self.parse_let() {
                        body.lets.push(l);
                    }
                }
                Some(Tok::Ident) => {
                    if let Some(p) = self.parse_prop() {
                        body.props.push(p);
                    }
                }
                Some(_) => {
                    self.expect_error("a property name, 'let' or '}'");
                    self.skip_line();
                }
            }
        }
        body.span = Span::new(self.file, start, self.prev_end());
        Some(body)
    }

    fn parse_let(&mut self) -> Option<LetDecl> {
        let start = self.bump().map_or(0, |t| t.start);
        let name = self.ident("a name after 'let'");
        if name.is_none() {
            self.skip_line();
            return None;
        }
        if self.eat(Tok::Eq).is_none() {
            self.expect_error("'=' after the name");
            self.skip_line();
            return None;
        }
        let parts = self.parse_value()?;
        let span = Span::new(self.file, start, self.prev_end());
        let value = match parts.value {
            PropValue::Expr(e) => e,
            PropValue::Text(_, s) => {
                self.error(
                    s,
                    "a 'let' binding takes a number or an expression, not text",
                );
                Expr {
                    kind: ExprKind::Error,
                    span: s,
                }
            }
        };
        if let Some(s) = parts.assumed {
            self.error(s, "'assumed' belongs on a property, not on a 'let' binding");
        }
        if let Some(c) = parts.citations.first() {
            self.error(
                c.span,
                "citations belong on a property, not on a 'let' binding",
            );
        }
        Some(LetDecl {
            name: name?,
            value,
            span,
        })
    }

    fn parse_prop(&mut self) -> Option<Prop> {
        let name = self.ident("a property name")?;
        let relation = match self.peek() {
            Some(Tok::Eq) => Relation::Equal,
            Some(Tok::Lt) => Relation::Below,
            Some(Tok::Gt) => Relation::Above,
            _ => {
                let msg = format!(
                    "expected '=', '<' or '>' after '{}', found {}",
                    name.name,
                    self.found()
                );
                let span = self.span_here();
                self.diags.push(
                    Diagnostic::new(Rule::Syntax, span, msg)
                        .with_help(format!("write `{} = VALUE UNIT`", name.name)),
                );
                self.skip_line();
                return None;
            }
        };
        self.pos += 1;
        let parts = self.parse_value()?;
        Some(Prop {
            span: name
                .span
                .join(Span::new(self.file, self.prev_end(), self.prev_end())),
            name,
            relation,
            value: parts.value,
            assumed: parts.assumed,
            citations: parts.citations,
        })
    }

    /// The tokens up to the end of the line (or `;` or `}`), handed to the value grammar.
    fn parse_value(&mut self) -> Option<ValueParts> {
        let begin = self.pos;
        let mut depth = 0usize;
        let mut max_depth = 0usize;
        while let Some(k) = self.peek() {
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
            return Some(ValueParts {
                value: PropValue::Expr(Expr {
                    kind: ExprKind::Error,
                    span: whole,
                }),
                assumed: None,
                citations: Vec::new(),
            });
        }
        if let Some(parts) = self.plain_measurement(slice) {
            return Some(parts);
        }
        let eoi = whole.end as usize..whole.end as usize;
        let stream = Stream::from_iter(eoi, slice.iter().map(|t| (t.kind, t.start..t.end)));
        let (out, errs) = self.value.parse_recovery(stream);
        for e in errs {
            let d = self.syntax_from_chumsky(e);
            self.diags.push(d);
        }
        Some(out.unwrap_or(ValueParts {
            value: PropValue::Expr(Expr {
                kind: ExprKind::Error,
                span: whole,
            }),
            assumed: None,
            citations: Vec::new(),
        }))
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
                    let (s, end) = num(2)?;
                    i = 3;
                    Uncertainty::Symmetric(s, sp(slice.get(1)?).join(end))
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
                let mut factors = Vec::new();
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
                            name: self.text(*sym).to_string(),
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
            citations: Vec::new(),
        };
        while let Some(t) = slice.get(i) {
            match t.kind {
                Tok::Assumed => {
                    parts.assumed = Some(sp(t));
                    i += 1;
                }
                Tok::LBracket => {
                    i += 1;
                    let before = parts.citations.len();
                    while kind(i) == Some(Tok::Ident) {
                        let id = slice.get(i)?;
                        parts.citations.push(Ident {
                            name: self.text(*id).to_string(),
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
        if matches!(e.found, Some(Tok::Ident | Tok::Number)) {
            d = d.with_help(
                "a unit follows the whole measurement: `1.2 ± 0.1 Rjup`; to multiply, write `*`",
            );
        }
        d
    }
}

fn join_or(items: &[&str]) -> String {
    match items {
        [] => String::new(),
        [one] => (*one).to_string(),
        [init @ .., last] => format!("{} or {}", init.join(", "), last),
    }
}

fn unescape(quoted: &str) -> String {
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

/// The chumsky grammar for one property value (see the module doc).
fn value_parser<'a>(src: &'a str, file: FileId) -> ValueParser<'a> {
    let sp = move |r: Range| Span::new(file, r.start, r.end);
    let slice = move |r: &Range| src.get(r.clone()).unwrap_or("").to_string();

    let ident = tok(Tok::Ident).map_with_span(move |_, r: Range| Ident {
        name: slice(&r),
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
            let mut factors = vec![first];
            factors.extend(rest);
            UnitExpr {
                factors,
                span: sp(r),
            }
        });
    let uncertainty = choice((
        tok(Tok::PlusMinus)
            .ignore_then(number.clone())
            .map_with_span(move |(s, _), r: Range| Uncertainty::Symmetric(s, sp(r))),
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
        Assumed(Span),
        Cites(Vec<Ident>),
    }
    let trail = choice((
        tok(Tok::Assumed).map_with_span(move |_, r: Range| Trail::Assumed(sp(r))),
        citations.map(Trail::Cites),
    ));
    choice((text, expr.map(PropValue::Expr)))
        .then(trail.repeated())
        .then_ignore(end())
        .map(|(value, trails)| {
            let mut parts = ValueParts {
                value,
                assumed: None,
                citations: Vec::new(),
            };
            for t in trails {
                match t {
                    Trail::Assumed(s) => parts.assumed = Some(s),
                    Trail::Cites(c) => parts.citations.extend(c),
                }
            }
            parts
        })
        .boxed()
}

#[cfg(test)]
mod tests;

fn tok(t: Tok) -> impl chumsky::Parser<Tok, Tok, Error = ParseError> + Clone {
    just(t)
}
