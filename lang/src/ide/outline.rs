//! The shape of a file for editors: the outline (systems → bodies → quantities), folding
//! ranges, and a class for every token (for semantic highlighting).

use super::symbols::{Occurrence, Symbol};
use crate::ast::{self, BodyKind};
use crate::lexer::{lex, Tok};
use crate::source::Span;

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum NodeKind {
    Ref,
    System,
    Star,
    Planet,
    Quantity,
    Binding,
}

#[derive(Debug, Clone, PartialEq)]
pub struct Node {
    pub name: String,
    pub detail: String,
    pub kind: NodeKind,
    /// The whole declaration.
    pub span: Span,
    /// The name.
    pub selection: Span,
    pub children: Vec<Node>,
}

fn let_node(l: &ast::LetDecl) -> Node {
    Node {
        name: l.name.name.to_string(),
        detail: "let".to_string(),
        kind: NodeKind::Binding,
        span: l.span,
        selection: l.name.span,
        children: Vec::new(),
    }
}

/// References, then systems with their bodies, each with its bindings and quantities.
pub fn outline(file: &ast::File) -> Vec<Node> {
    let mut out: Vec<Node> = file
        .refs
        .iter()
        .map(|r| Node {
            name: r.id.name.to_string(),
            detail: r.text.clone(),
            kind: NodeKind::Ref,
            span: r.span,
            selection: r.id.span,
            children: Vec::new(),
        })
        .collect();
    for s in &file.systems {
        let mut children: Vec<Node> = s.lets.iter().map(let_node).collect();
        for b in &s.bodies {
            let mut inner: Vec<Node> = b.lets.iter().map(let_node).collect();
            for p in &b.props {
                inner.push(Node {
                    name: p.name.name.to_string(),
                    detail: String::new(),
                    kind: NodeKind::Quantity,
                    span: p.span,
                    selection: p.name.span,
                    children: Vec::new(),
                });
            }
            inner.sort_by_key(|n| n.span.start);
            children.push(Node {
                name: b.name.name.to_string(),
                detail: match (&b.kind, &b.orbits) {
                    (BodyKind::Planet, Some(o)) => format!("planet orbiting {}", o.name),
                    (k, _) => k.as_str().to_string(),
                },
                kind: match b.kind {
                    BodyKind::Star => NodeKind::Star,
                    BodyKind::Planet => NodeKind::Planet,
                },
                span: b.span,
                selection: b.name.span,
                children: inner,
            });
        }
        children.sort_by_key(|n| n.span.start);
        out.push(Node {
            name: s.name.clone(),
            detail: "system".to_string(),
            kind: NodeKind::System,
            span: s.span,
            selection: s.name_span,
            children,
        });
    }
    out
}

/// Folding ranges as byte spans: systems, bodies, and runs of two or more comment lines.
pub fn folding(file: &ast::File, src: &str) -> Vec<Span> {
    let mut out = Vec::new();
    let multiline = |s: Span| {
        src.get(s.range())
            .is_some_and(|t| t.trim_end().contains(['\n', '\r']))
    };
    for s in &file.systems {
        if multiline(s.span) {
            out.push(s.span);
        }
        for b in &s.bodies {
            if multiline(b.span) {
                out.push(b.span);
            }
        }
    }
    let mut run: Option<(Span, Span)> = None;
    let push_run = |run: &mut Option<(Span, Span)>, out: &mut Vec<Span>| {
        if let Some((first, last)) = run.take() {
            if first != last {
                out.push(first.join(last));
            }
        }
    };
    for c in file.comments.iter().filter(|c| !c.trailing) {
        match run {
            Some((first, last)) => {
                let between = src
                    .get(last.end as usize..c.span.start as usize)
                    .unwrap_or("");
                if crate::source::count_line_breaks(between) == 1 && between.trim().is_empty() {
                    run = Some((first, c.span));
                } else {
                    push_run(&mut run, &mut out);
                    run = Some((c.span, c.span));
                }
            }
            None => run = Some((c.span, c.span)),
        }
    }
    push_run(&mut run, &mut out);
    out.sort_by_key(|s| s.start);
    out
}

/// Token classes for highlighting.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum TokenClass {
    Keyword,
    Comment,
    String,
    Number,
    Operator,
    Quantity,
    Body,
    Binding,
    Reference,
    Unit,
    Function,
}

/// Every classified token in source order (tokens never span lines).
pub fn token_classes(src: &str, occ: &[Occurrence]) -> Vec<(Span, TokenClass)> {
    let mut out = Vec::new();
    let mut oi = 0usize;
    for t in lex(src) {
        let class = match t.kind {
            Tok::Comment => Some(TokenClass::Comment),
            Tok::Str | Tok::UnterminatedStr => Some(TokenClass::String),
            Tok::Number => Some(TokenClass::Number),
            Tok::System
            | Tok::StarKw
            | Tok::Planet
            | Tok::Orbits
            | Tok::Ref
            | Tok::Let
            | Tok::Assumed
            | Tok::Preferred => Some(TokenClass::Keyword),
            Tok::Eq
            | Tok::Lt
            | Tok::Gt
            | Tok::PlusMinus
            | Tok::Plus
            | Tok::Minus
            | Tok::Star
            | Tok::Slash
            | Tok::Caret => Some(TokenClass::Operator),
            Tok::Ident => {
                while occ
                    .get(oi)
                    .is_some_and(|o| (o.span.start as usize) < t.start)
                {
                    oi += 1;
                }
                occ.get(oi)
                    .filter(|o| o.span.start as usize == t.start)
                    .map(|o| match o.symbol {
                        Symbol::Body { .. } => TokenClass::Body,
                        Symbol::Ref(_) => TokenClass::Reference,
                        Symbol::Let { .. } => TokenClass::Binding,
                        Symbol::Quantity { .. } => TokenClass::Quantity,
                        Symbol::Unit(_) => TokenClass::Unit,
                        Symbol::Builtin(_) => TokenClass::Function,
                    })
            }
            _ => None,
        };
        if let Some(c) = class {
            out.push((Span::new(crate::source::FileId(0), t.start, t.end), c));
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::source::FileId;

    const SRC: &str = include_str!("../../../examples/veyra.syz");

    #[test]
    fn outline_nests_systems_bodies_quantities() {
        let f = crate::parser::parse(FileId(0), SRC).file;
        let o = outline(&f);
        assert_eq!(o.len(), 3, "two refs and one system");
        let sys = &o[2];
        assert_eq!((sys.name.as_str(), sys.kind), ("Veyra", NodeKind::System));
        let names: Vec<&str> = sys.children.iter().map(|c| c.name.as_str()).collect();
        assert_eq!(names, ["veyra", "b", "c"]);
        assert_eq!(sys.children[0].children[0].name, "mass");
    }

    #[test]
    fn folds_blocks_and_comment_runs() {
        let f = crate::parser::parse(FileId(0), SRC).file;
        let folds = folding(&f, SRC);
        assert_eq!(folds.len(), 5, "{folds:?}");
        assert_eq!(folds[0].start, 0, "the two lead comment lines");
    }

    #[test]
    fn classes_follow_meaning() {
        let f = crate::parser::parse(FileId(0), SRC).file;
        let occ = super::super::symbols::occurrences(&f);
        let classes = token_classes(SRC, &occ);
        let class_of = |needle: &str| {
            let off = SRC.find(needle).unwrap() as u32;
            classes.iter().find(|(s, _)| s.start == off).map(|c| c.1)
        };
        assert_eq!(class_of("planet b"), Some(TokenClass::Keyword));
        assert_eq!(class_of("Msun"), Some(TokenClass::Unit));
        assert_eq!(class_of("period"), Some(TokenClass::Quantity));
        assert_eq!(class_of("rv1]"), Some(TokenClass::Reference));
        assert_eq!(class_of("0.93"), Some(TokenClass::Number));
    }
}
