//! Tokens of the language, produced by a `logos` lexer.
//!
//! Tokens carry no payload: the parser slices the source text by span when it needs a
//! number, a name or a string. Newlines are tokens because a property ends at the end of
//! its line; a line ends at `\n`, `\r\n` or a lone `\r` (old Mac files), as in
//! [`crate::source::LineIndex`]. Comments are kept as tokens too (silencing comments and the formatter need
//! them); the parser skips them.

use logos::Logos;

#[derive(Logos, Debug, Clone, Copy, PartialEq, Eq, Hash)]
#[logos(skip r"[ \t\f\u{FEFF}]+")]
pub enum Tok {
    #[regex(r"#[^\r\n]*")]
    Comment,
    #[token("\n")]
    #[token("\r\n")]
    #[token("\r")]
    Newline,
    #[token(";")]
    Semi,
    #[token("{")]
    LBrace,
    #[token("}")]
    RBrace,
    #[token("(")]
    LParen,
    #[token(")")]
    RParen,
    #[token("[")]
    LBracket,
    #[token("]")]
    RBracket,
    #[token(",")]
    Comma,
    #[token(".")]
    Dot,
    #[token("=")]
    Eq,
    #[token("<")]
    Lt,
    #[token(">")]
    Gt,
    #[token("±")]
    #[token("+-")]
    PlusMinus,
    #[token("+")]
    Plus,
    #[token("-")]
    #[token("\u{2212}")]
    Minus,
    #[token("*")]
    #[token("×")]
    #[token("·")]
    Star,
    #[token("/")]
    Slash,
    #[token("^")]
    Caret,
    #[token("system")]
    System,
    #[token("star")]
    StarKw,
    #[token("planet")]
    Planet,
    #[token("orbits")]
    Orbits,
    #[token("ref")]
    Ref,
    #[token("let")]
    Let,
    #[token("assumed")]
    Assumed,
    #[token("preferred")]
    Preferred,
    #[regex(r"[0-9]+(\.[0-9]*)?([eE][+-]?[0-9]+)?")]
    #[regex(r"\.[0-9]+([eE][+-]?[0-9]+)?")]
    Number,
    #[regex(r#""([^"\\\r\n]|\\[^\r\n])*""#)]
    Str,
    #[regex(r#""([^"\\\r\n]|\\[^\r\n])*"#, priority = 0)]
    UnterminatedStr,
    #[regex(r"[A-Za-z_\u{2609}\u{2295}\u{00B0}\u{00B5}\u{03BC}\u{03C9}][A-Za-z0-9_\u{2609}\u{2295}\u{00B5}\u{03BC}\u{03C9}]*")]
    #[token("%")]
    Ident,
    /// Anything the lexer does not recognise.
    Error,
}

impl Tok {
    /// How the token reads in a message.
    pub fn describe(self) -> &'static str {
        match self {
            Tok::Comment => "a comment",
            Tok::Newline => "end of line",
            Tok::Semi => "';'",
            Tok::LBrace => "'{'",
            Tok::RBrace => "'}'",
            Tok::LParen => "'('",
            Tok::RParen => "')'",
            Tok::LBracket => "'['",
            Tok::RBracket => "']'",
            Tok::Comma => "','",
            Tok::Dot => "'.'",
            Tok::Eq => "'='",
            Tok::Lt => "'<'",
            Tok::Gt => "'>'",
            Tok::PlusMinus => "'±'",
            Tok::Plus => "'+'",
            Tok::Minus => "'-'",
            Tok::Star => "'*'",
            Tok::Slash => "'/'",
            Tok::Caret => "'^'",
            Tok::System => "'system'",
            Tok::StarKw => "'star'",
            Tok::Planet => "'planet'",
            Tok::Orbits => "'orbits'",
            Tok::Ref => "'ref'",
            Tok::Let => "'let'",
            Tok::Assumed => "'assumed'",
            Tok::Preferred => "'preferred'",
            Tok::Number => "a number",
            Tok::Str => "a string",
            Tok::UnterminatedStr => "an unterminated string",
            Tok::Ident => "a name",
            Tok::Error => "an unexpected character",
        }
    }
}

/// A token with its byte range.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Token {
    pub kind: Tok,
    pub start: usize,
    pub end: usize,
}

/// Lex a whole source text. Never fails: unknown characters become [`Tok::Error`] tokens.
pub fn lex(src: &str) -> Vec<Token> {
    let mut out = Vec::with_capacity(src.len() / 4);
    out.extend(tokens(src));
    out
}

/// The tokens of a source text one at a time, for passes that need not hold them all
/// (a file of 10 MB of newlines is 10 million tokens).
pub fn tokens(src: &str) -> Tokens<'_> {
    Tokens(Tok::lexer(src))
}

/// The iterator of [`tokens`].
pub struct Tokens<'a>(logos::Lexer<'a, Tok>);

impl Iterator for Tokens<'_> {
    type Item = Token;

    fn next(&mut self) -> Option<Token> {
        let kind = self.0.next()?.unwrap_or(Tok::Error);
        let span = self.0.span();
        Some(Token {
            kind,
            start: span.start,
            end: span.end,
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn kinds(src: &str) -> Vec<Tok> {
        lex(src).into_iter().map(|t| t.kind).collect()
    }

    #[test]
    fn measurement_tokens() {
        assert_eq!(
            kinds("mass = 0.93 ± 0.04 Msun [rv1]"),
            vec![
                Tok::Ident,
                Tok::Eq,
                Tok::Number,
                Tok::PlusMinus,
                Tok::Number,
                Tok::Ident,
                Tok::LBracket,
                Tok::Ident,
                Tok::RBracket
            ]
        );
        assert_eq!(
            kinds("0.88 +0.03/-0.02 R☉"),
            vec![
                Tok::Number,
                Tok::Plus,
                Tok::Number,
                Tok::Slash,
                Tok::Minus,
                Tok::Number,
                Tok::Ident
            ]
        );
        assert_eq!(kinds("5310 +- 80 K")[1], Tok::PlusMinus);
        assert_eq!(kinds("6.2e-3"), vec![Tok::Number]);
        assert_eq!(kinds("1.12 %"), vec![Tok::Number, Tok::Ident]);
    }

    #[test]
    fn strings_comments_and_garbage() {
        assert_eq!(
            kinds("ref a \"x \\\" y\" # note\n"),
            vec![Tok::Ref, Tok::Ident, Tok::Str, Tok::Comment, Tok::Newline]
        );
        assert_eq!(kinds("\"open"), vec![Tok::UnterminatedStr]);
        assert!(kinds("\u{0}\u{1}@$").iter().all(|k| *k == Tok::Error));
    }

    #[test]
    fn every_line_break_convention_ends_a_line() {
        // Unix, Windows and old Mac line ends; a comment or a string stops at any of them.
        for nl in ["\n", "\r\n", "\r"] {
            let src = format!("# note{nl}ref a \"x{nl}b = 1{nl}");
            assert_eq!(
                kinds(&src),
                vec![
                    Tok::Comment,
                    Tok::Newline,
                    Tok::Ref,
                    Tok::Ident,
                    Tok::UnterminatedStr,
                    Tok::Newline,
                    Tok::Ident,
                    Tok::Eq,
                    Tok::Number,
                    Tok::Newline
                ],
                "{src:?}"
            );
            let comment = lex(&src)[0];
            assert_eq!(&src[comment.start..comment.end], "# note");
        }
    }
}
