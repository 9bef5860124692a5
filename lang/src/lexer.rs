//! Tokens of the language, produced by a `logos` lexer.
//!
//! Tokens carry no payload: the parser slices the source text by span when it needs a
//! number, a name or a string. Newlines are tokens because a property ends at the end of
//! its line. Comments are kept as tokens too (silencing comments and the formatter need
//! them); the parser skips them.

use logos::Logos;

#[derive(Logos, Debug, Clone, Copy, PartialEq, Eq, Hash)]
#[logos(skip r"[ \t\r\f\u{FEFF}]+")]
pub enum Tok {
    #[regex(r"#[^\n]*")]
    Comment,
    #[token("\n")]
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
    #[regex(r"[0-9]+(\.[0-9]*)?([eE][+-]?[0-9]+)?")]
    #[regex(r"\.[0-9]+([eE][+-]?[0-9]+)?")]
    Number,
    #[regex(r#""([^"\\\n]|\\[^\n])*""#)]
    Str,
    #[regex(r#""([^"\\\n]|\\[^\n])*"#, priority = 0)]
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
    let mut lexer = Tok::lexer(src);
    while let Some(result) = lexer.next() {
        let span = lexer.span();
        let kind = result.unwrap_or(Tok::Error);
        out.push(Token {
            kind,
            start: span.start,
            end: span.end,
        });
    }
    out
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
}
