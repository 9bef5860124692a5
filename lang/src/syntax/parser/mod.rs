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
//! value     = (STRING | expr) ("assumed" | "preferred" | citations)*
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
/// The words of the error that says the parser stopped reading (see [`stops_reading`]).
const STOPPED: &str = "the file is not read past this point";

/// Whether `d` is the error that says the parser stopped reading the file: front ends always
/// show it (it comes after a thousand others, which their caps on shown diagnostics hid it
/// behind, so nothing said that the rest of the file went unchecked).
pub fn stops_reading(d: &Diagnostic) -> bool {
    d.rule == Rule::Syntax && d.message.ends_with(STOPPED)
}

/// Bodies declared inside bodies that recovery reads as such (each one level of recursion).
const MAX_NESTED_BODIES: usize = 8;

mod names;
mod notation;
mod recovery;
use recovery::inner_label;
mod repeats;
mod value;

use repeats::{merge_repeats, repeated};
use value::{unescape, value_parser, ValueParser};

/// What one property value parses to.
#[derive(Debug, Clone)]
struct ValueParts {
    value: PropValue,
    assumed: Option<Span>,
    preferred: Option<Span>,
    citations: Vec<Ident>,
}

/// The result of parsing: a tree (possibly with `Error` placeholders) and the problems found.
pub struct Parsed {
    pub file: File,
    pub diagnostics: Vec<Diagnostic>,
}

/// Parse one source text.
pub fn parse(file: FileId, src: &str) -> Parsed {
    let mut items = Items::new(file, src);
    let mut out = File::default();
    while let Some(item) = items.next_item() {
        match item {
            Item::Ref(r) => out.refs.push(r),
            Item::System(s) => out.systems.push(s),
        }
    }
    out.comments = items.take_comments();
    Parsed {
        file: out,
        diagnostics: items.take_diagnostics(),
    }
}

/// One top-level declaration.
#[derive(Debug, Clone, PartialEq)]
pub enum Item {
    Ref(RefDecl),
    System(SystemDecl),
}

impl Item {
    pub fn span(&self) -> Span {
        match self {
            Item::Ref(r) => r.span,
            Item::System(s) => s.span,
        }
    }
}

/// A source text read one top-level declaration at a time, with the same grammar and
/// recovery as [`parse`] (which is built on it): what a file too large to hold as one tree
/// is read with. Tokens already parsed are let go between declarations, and the comments
/// and diagnostics met so far are taken out when wanted, so memory follows the largest
/// declaration, not the file.
pub struct Items<'a> {
    p: Cursor<'a>,
}

impl<'a> Items<'a> {
    pub fn new(file: FileId, src: &'a str) -> Items<'a> {
        Items {
            p: Cursor {
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
                taken: 0,
                stopped: false,
                value: value_parser(src, file),
                props: Vec::new(),
                bodies: Vec::new(),
                nested: 0,
            },
        }
    }

    /// The next declaration; `None` at the end of the text (or where the parser stopped
    /// after too many errors). Lines that declare nothing only add diagnostics.
    pub fn next_item(&mut self) -> Option<Item> {
        // Keep the last token read (separators are merged against it) and any read ahead.
        if let Some(done) = self.p.pos.checked_sub(1).filter(|&d| d > 0) {
            self.p.toks.drain(..done);
            self.p.pos -= done;
        }
        self.p.next_item()
    }

    /// The comments read so far (and not yet taken), in source order.
    pub fn take_comments(&mut self) -> Vec<Comment> {
        std::mem::take(&mut self.p.feed.comments)
    }

    /// The diagnostics so far (and not yet taken), runs on one line merged.
    pub fn take_diagnostics(&mut self) -> Vec<Diagnostic> {
        let diags = std::mem::take(&mut self.p.diags);
        self.p.taken += diags.len();
        merge_repeats(self.p.src, diags)
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

struct Cursor<'a> {
    src: &'a str,
    file: FileId,
    /// The tokens read so far; `pos` indexes them.
    toks: Vec<Token>,
    feed: Feed<'a>,
    pos: usize,
    diags: Vec<Diagnostic>,
    /// Diagnostics already taken out of `diags` (they still count towards the limit).
    taken: usize,
    /// Set when the parser stopped reading after too many syntax errors.
    stopped: bool,
    value: ValueParser<'a>,
    /// The properties of the body being read, moved into it at its end with the exact
    /// capacity (growing each body's own list by doubling copied its 232-byte nodes and
    /// left half of its memory unused).
    props: Vec<Prop>,
    /// The same for the bodies of the system being read.
    bodies: Vec<BodyDecl>,
    /// How deep the body being read is declared inside others (recursion is bounded by
    /// [`MAX_NESTED_BODIES`]; a deeper one ends its body as a missing `}` does).
    nested: usize,
}

impl<'a> Cursor<'a> {
    /// The token at `pos`, lexed now if it has not been. Small enough to inline: the
    /// parser asks for the current token several times per token, and the lexer it
    /// calls the first time is kept out of line ([`Cursor::lex_current`]).
    #[inline]
    fn current(&mut self) -> Option<Token> {
        match self.toks.get(self.pos) {
            Some(t) => Some(*t),
            None => self.lex_current(),
        }
    }

    #[inline(never)]
    fn lex_current(&mut self) -> Option<Token> {
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
        if !self.stopped
            && self.taken + self.diags.len() >= MAX_SYNTAX_ERRORS
            && self.peek().is_some()
        {
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
                format!("{MAX_SYNTAX_ERRORS} syntax errors: {STOPPED}"),
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

    fn ident(&mut self, what: &str) -> Option<Ident> {
        match self.peek_token() {
            Some(t) if t.kind == Tok::Ident => {
                self.pos += 1;
                Some(Ident {
                    name: self.text(t).into(),
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

    fn next_item(&mut self) -> Option<Item> {
        loop {
            self.skip_separators();
            match self.peek() {
                None => return None,
                Some(Tok::Ref) => {
                    if let Some(r) = self.parse_ref() {
                        return Some(Item::Ref(r));
                    }
                }
                Some(Tok::System) => {
                    if let Some(s) = self.parse_system() {
                        return Some(Item::System(s));
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
                Some(Tok::Ident) if self.line_opens_block() => self.misspelt_system_keyword(),
                Some(_) => {
                    self.expect_error("'system' or 'ref'");
                    self.skip_line();
                    if self.peek() == Some(Tok::RBrace) {
                        self.pos += 1;
                    }
                }
            }
        }
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
        if !self.open_block("the system") {
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
                    if self.body_follows() {
                        self.stray_system_close(&sys.name);
                        continue;
                    }
                    break;
                }
                Some(Tok::StarKw | Tok::Planet) => {
                    if let Some(b) = self.parse_body() {
                        self.bodies.push(b);
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
                Some(Tok::Ident) if self.line_opens_block() => self.misspelt_body_keyword(),
                Some(Tok::Ident) => {
                    let span = self.span_here();
                    self.diags.push(
                        Diagnostic::new(Rule::Syntax, span, "a property must belong to a star or planet")
                            .with_help("declare it inside `star NAME { ... }` or `planet NAME orbits STAR { ... }`"),
                    );
                    self.skip_line();
                }
                Some(Tok::Ref) => {
                    let span = self.span_here();
                    self.diags.push(
                        Diagnostic::new(
                            Rule::Syntax,
                            span,
                            "a reference is declared at the top of the file, not inside a system",
                        )
                        .with_help("move this `ref ID \"text\"` line above the first `system`"),
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
        sys.bodies = self.bodies.drain(..).collect();
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
                if orbits.is_none() {
                    // `planet c orbits é {`: the error says so; the body is still read (as a
                    // planet without a host) so that its lines do not spill into the system.
                    self.skip_to_block();
                }
            } else if self.peek_past_newlines() == Some(Tok::LBrace) {
                // `{` on the next line too: the block opens there all the same.
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
        if name.is_none() {
            // The name did not read (`star é {`): the error says so. Go on to the block on
            // this line, so that its lines are read as the body's and not spilled into the
            // system (which then closed at the body's `}`).
            self.skip_to_block();
            if self.peek() != Some(Tok::LBrace) {
                self.skip_line();
                return None;
            }
        }
        if !self.open_block("the body") {
            return None;
        }
        let named = name.is_some();
        // Blocks opened inside the body by mistake and not yet closed.
        let mut inner = 0usize;
        let mut inner_at: Option<Span> = None;
        let mut body = BodyDecl {
            kind,
            name: name.unwrap_or_else(|| Ident {
                name: Default::default(),
                span: Span::new(self.file, start, start),
            }),
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
                    self.diags.push(inner_label(
                        Diagnostic::new(Rule::Syntax, body.name.span, "this body is never closed")
                            .with_help("add '}' after its last property"),
                        inner_at,
                    ));
                    break;
                }
                Some(Tok::RBrace) => {
                    self.pos += 1;
                    if inner == 0 {
                        break;
                    }
                    inner -= 1;
                }
                Some(Tok::Ident) if self.opens_inner_block() => {
                    inner_at = Some(self.inner_block());
                    inner += 1;
                }
                Some(Tok::StarKw | Tok::Planet)
                    if self.nested < MAX_NESTED_BODIES && self.indented_past(start) =>
                {
                    self.nested_body(&body.name.name);
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
                    let d = self.diags.pop().map(|d| inner_label(d, inner_at));
                    self.diags.extend(d);
                    break;
                }
                Some(Tok::Let) => {
                    if let Some(l) = self.parse_let() {
                        body.lets.push(l);
                    }
                }
                Some(Tok::Ident) => {
                    if let Some(p) = self.parse_prop() {
                        self.props.push(p);
                    }
                }
                Some(_) => {
                    let here = self.peek_token().map_or(0, |t| t.start);
                    let help = names::bracketed_name_help(self.src.get(here..).unwrap_or(""));
                    self.expect_error("a property name, 'let' or '}'");
                    if let (Some(d), Some(h)) = (self.diags.last_mut(), help) {
                        d.help = Some(h.to_string());
                    }
                    self.skip_line();
                }
            }
        }
        body.props = self.props.drain(..).collect();
        body.span = Span::new(self.file, start, self.prev_end());
        // A body whose name did not read is not kept: its error covers its lines.
        named.then_some(body)
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
        if let Some(s) = parts.preferred {
            self.error(
                s,
                "'preferred' belongs on a property, not on a 'let' binding",
            );
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
                let slash = self.peek() == Some(Tok::Slash);
                let from_name = self.src.get(name.span.start as usize..).unwrap_or("");
                let help = names::property_name_help(&name.name, from_name, slash);
                self.diags
                    .push(Diagnostic::new(Rule::Syntax, span, msg).with_help(help));
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
            preferred: parts.preferred,
            citations: parts.citations,
        })
    }
}

#[cfg(test)]
mod tests;
#[cfg(test)]
mod tests_recovery;
