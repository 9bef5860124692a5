//! Recovery from mistakes in the block structure: a line passed over, a block passed over
//! whole, a block opened by mistake inside a body, a misspelt keyword. Each costs one error
//! and keeps the lines after it where they belong (a `}` taken by the wrong block spilled a
//! body's lines into its system and closed the system early).

use super::*;

impl Cursor<'_> {
    /// The next token that is not a newline, with the newlines before it consumed (as
    /// [`Cursor::open_block`] would consume them).
    pub(super) fn peek_past_newlines(&mut self) -> Option<Tok> {
        while self.peek() == Some(Tok::Newline) {
            self.pos += 1;
        }
        self.peek()
    }

    /// The `{` that opens `what` (line ends before it allowed); when it is missing, an error,
    /// and the rest of the line skipped or the block on it opened.
    pub(super) fn open_block(&mut self, what: &str) -> bool {
        let mut next_line = false;
        while self.peek() == Some(Tok::Newline) {
            self.pos += 1;
            next_line = true;
        }
        if self.eat(Tok::LBrace).is_some() {
            return true;
        }
        self.expect_error(&format!("'{{' to open {what}"));
        // `star a junk {`: the block is still this one's (its lines spilled into the
        // enclosing block, whose `}` then closed it early). Only on the declaration's own
        // line: a `{` on a later line, after a keyword, opens that declaration's block.
        let declaration = matches!(
            self.peek(),
            Some(Tok::StarKw | Tok::Planet | Tok::System | Tok::Ref)
        );
        if !next_line && !declaration && self.line_opens_block() {
            self.skip_to_block();
            self.pos += 1;
            return true;
        }
        self.skip_line();
        false
    }

    /// Skip to the end of the current line (not past a `}` that closes a block).
    pub(super) fn skip_line(&mut self) {
        while let Some(k) = self.peek() {
            match k {
                Tok::Newline | Tok::Semi | Tok::RBrace => return,
                _ => self.pos += 1,
            }
        }
    }

    /// Skip to the `{` on this line, if there is one (not past the line's end or a `}`).
    pub(super) fn skip_to_block(&mut self) {
        while let Some(k) = self.peek() {
            match k {
                Tok::LBrace | Tok::Newline | Tok::Semi | Tok::RBrace => break,
                _ => self.pos += 1,
            }
        }
    }

    /// Whether the current line has a `{` before its end.
    pub(super) fn line_opens_block(&mut self) -> bool {
        let at = self.pos;
        self.skip_to_block();
        let opens = self.peek() == Some(Tok::LBrace);
        self.pos = at;
        opens
    }

    /// Pass over the rest of this line and the block it opens, braces nested inside counted,
    /// up to its `}`; a declaration keyword or the end of the file ends it first (so a block
    /// never closed does not take what follows).
    pub(super) fn skip_block(&mut self) {
        self.skip_to_block();
        let mut depth = 0usize;
        while let Some(k) = self.peek() {
            match k {
                Tok::LBrace => depth += 1,
                Tok::RBrace if depth <= 1 => {
                    self.pos += 1;
                    return;
                }
                Tok::RBrace => depth -= 1,
                Tok::StarKw | Tok::Planet | Tok::System | Tok::Ref => return,
                _ => {}
            }
            self.pos += 1;
        }
    }

    /// Whether a name followed by `{` comes next (a block opened inside a body).
    pub(super) fn opens_inner_block(&mut self) -> bool {
        let at = self.pos;
        self.pos += 1;
        let opens = self.peek() == Some(Tok::LBrace);
        self.pos = at;
        opens
    }

    /// `transit { depth = ... }` in a body: blocks do not nest. One error; the inner lines are
    /// read as the body's, and the caller counts the block so that its `}` closes it, not the
    /// body. The span of its `{`.
    pub(super) fn inner_block(&mut self) -> Span {
        let name = self
            .bump()
            .map(|t| self.text(t).to_string())
            .unwrap_or_default();
        let span = self.span_here();
        self.pos += 1;
        self.diags.push(
            Diagnostic::new(
                Rule::Syntax,
                span,
                format!("'{name}' opens a block inside a body; blocks do not nest"),
            )
            .with_help(
                "write the properties directly in the star's or planet's block, \
                 one per line; the lines of this block are read as the body's",
            ),
        );
        span
    }

    /// Whether a `star` or `planet` comes next, past line ends: after a system's `}`, the
    /// sign that the `}` was one too many (a body's lines after it were all errors, and the
    /// system's own `}` unmatched).
    pub(super) fn body_follows(&mut self) -> bool {
        let at = self.pos;
        while matches!(self.peek(), Some(Tok::Newline | Tok::Semi)) {
            self.pos += 1;
        }
        let follows = matches!(self.peek(), Some(Tok::StarKw | Tok::Planet));
        self.pos = at;
        follows
    }

    /// The `}` just read closed the system `name` with a body after it: one error at the
    /// `}`, and the system goes on (its bodies after it are kept).
    pub(super) fn stray_system_close(&mut self, name: &str) {
        let end = self.prev_end();
        let span = Span::new(self.file, end.saturating_sub(1), end);
        self.diags.push(
            Diagnostic::new(
                Rule::Syntax,
                span,
                format!("a body follows this '}}', which closes system \"{name}\""),
            )
            .with_help(
                "remove this '}' if the system goes on (the bodies after it are read as the \
                 system's), or wrap those bodies in a system of their own",
            ),
        );
    }

    /// Whether the token here starts a line indented further than the line of the byte
    /// `outer` (a body's keyword): inside that body's block, as the writer laid it out.
    pub(super) fn indented_past(&mut self, outer: usize) -> bool {
        let here = self.peek_token().map_or(0, |t| t.start);
        // The line's start is looked for at most this far back: a keyword that far into its
        // line does not start it, and a bounded look keeps a file of one long line linear.
        const LOOK_BACK: usize = 4096;
        let line_start = |at: usize| {
            let bytes = self.src.as_bytes();
            let from = at.saturating_sub(LOOK_BACK);
            let window = bytes.get(from..at)?;
            match window.iter().rposition(|b| matches!(b, b'\n' | b'\r')) {
                Some(i) => Some(from + i + 1),
                None if from == 0 => Some(0),
                None => None,
            }
        };
        let (Some(line), Some(outer_line)) = (line_start(here), line_start(outer)) else {
            return false;
        };
        // On the outer body's own line, after its `{` (`star a { planet b orbits a { ... } }`):
        // inside its block as written.
        if line == outer_line {
            return true;
        }
        let indent = |line: usize, at: usize| {
            let lead = self.src.get(line..at)?;
            // Only a keyword that starts its line counts (`mass = 1; star c {` does not).
            (lead.trim().is_empty() || at == outer).then(|| lead.len() - lead.trim_start().len())
        };
        matches!((indent(line, here), indent(outer_line, outer)), (Some(inner), Some(o)) if inner > o)
    }

    /// A `star` or `planet` declared inside the block of the body `outer` (indented into it):
    /// bodies do not nest. One error; the inner body is read and kept as the system's, and
    /// the outer body goes on after it (so its `}` closes it and the bodies after it stay in
    /// the system, where they were dropped with a cascade of errors).
    pub(super) fn nested_body(&mut self, outer: &str) {
        let span = self.span_here();
        let inner = std::mem::take(&mut self.props);
        self.nested += 1;
        let nested = self.parse_body();
        self.nested -= 1;
        self.props = inner;
        let name = nested
            .as_ref()
            .map_or("", |b| b.name.name.as_str())
            .to_string();
        self.diags.push(
            Diagnostic::new(
                Rule::Syntax,
                span,
                format!("'{name}' is declared inside the block of '{outer}'; bodies do not nest"),
            )
            .with_help(format!(
                "move it out of '{outer}', to the system's level (it is read as the system's)"
            )),
        );
        self.bodies.extend(nested);
    }

    /// `plnaet b orbits s {` in a system: a misspelt keyword. One error for the block, which
    /// is passed over whole (its lines did not belong to the system either).
    pub(super) fn misspelt_body_keyword(&mut self) {
        let span = self.span_here();
        let word = self.peek_token().map(|t| self.text(t)).unwrap_or("");
        let mut d = Diagnostic::new(
                Rule::Syntax,
                span,
                format!("'{word}' does not open a block: only 'star' and 'planet' do; this block is not read"),
            );
        d = match crate::text::closest(word, ["star", "planet"]) {
            Some(k) => d.with_help(format!("did you mean '{k}'?")),
            None => d.with_help(
                "declare bodies as `star NAME { ... }` or `planet NAME orbits STAR { ... }`",
            ),
        };
        self.diags.push(d);
        self.skip_block();
    }

    /// `sytsem "A" {` at the top of a file: read as a system (its own mistakes reported too)
    /// and dropped, its error covering its lines; another word's block is passed over.
    pub(super) fn misspelt_system_keyword(&mut self) {
        let span = self.span_here();
        let word = self.peek_token().map(|t| self.text(t)).unwrap_or("");
        let system = crate::text::closest(word, ["system"]).is_some();
        let mut d = Diagnostic::new(
                Rule::Syntax,
                span,
                format!("'{word}' does not open a block: only 'system' does at the top of a file; this block is not read"),
            );
        if system {
            d = d.with_help("did you mean 'system'?");
        }
        self.diags.push(d);
        if system {
            let _ = self.parse_system();
        } else {
            self.skip_block();
        }
    }
}

/// A body left open: name the last `{` opened inside it, if any (the `}` meant for the body may
/// have closed it).
pub(super) fn inner_label(d: Diagnostic, inner_at: Option<Span>) -> Diagnostic {
    match inner_at {
        Some(at) => d.with_label(
            at,
            "a '{' opened inside the body: the '}' meant for the body may have closed it",
        ),
        None => d,
    }
}
