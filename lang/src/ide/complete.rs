//! Completion candidates at an offset. The context comes from the tokens before the cursor
//! (so it works while the text is half typed): which block the cursor is in, and what the
//! statement so far looks like.

use crate::ast::BodyKind;
use crate::lexer::{lex, Tok, Token};
use crate::quantities;
use crate::source::Span;
use crate::Analysis;

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum CompletionKind {
    Quantity,
    Unit,
    Body,
    Ref,
    Keyword,
    Binding,
    Function,
    Constant,
}

#[derive(Debug, Clone, PartialEq)]
pub struct Completion {
    pub label: String,
    pub kind: CompletionKind,
    /// A short line: the dimension, the unit's name, the reference's text.
    pub detail: String,
    pub doc: String,
    /// The partly typed word the completion replaces.
    pub replace: Span,
}

#[derive(Debug, Clone, PartialEq)]
enum Block {
    Top,
    /// The n-th system of the file.
    System(usize),
    Body {
        system: usize,
        kind: BodyKind,
        name: String,
    },
    Other,
}

fn is_word_char(c: char) -> bool {
    c.is_alphanumeric() || matches!(c, '_' | '☉' | '⊕' | '°' | '%')
}

/// The block the cursor is in and the tokens of the statement before the cursor.
fn context(src: &str, toks: &[Token], end: usize) -> (Block, Vec<Token>) {
    let mut stack: Vec<Block> = Vec::new();
    let mut systems = 0usize;
    let mut stmt: Vec<Token> = Vec::new();
    for t in toks.iter().filter(|t| t.end <= end) {
        match t.kind {
            Tok::Newline | Tok::Semi => {
                if !stmt
                    .first()
                    .is_some_and(|f| matches!(f.kind, Tok::System | Tok::StarKw | Tok::Planet))
                    || t.kind == Tok::Semi
                {
                    stmt.clear();
                }
            }
            Tok::Comment => {}
            Tok::LBrace => {
                let block = match (stmt.first().map(|f| f.kind), stack.last()) {
                    (Some(Tok::System), None) => {
                        systems += 1;
                        Block::System(systems - 1)
                    }
                    (Some(k @ (Tok::StarKw | Tok::Planet)), Some(Block::System(s))) => {
                        Block::Body {
                            system: *s,
                            kind: if k == Tok::StarKw {
                                BodyKind::Star
                            } else {
                                BodyKind::Planet
                            },
                            name: stmt
                                .get(1)
                                .and_then(|n| src.get(n.start..n.end))
                                .unwrap_or("")
                                .to_string(),
                        }
                    }
                    _ => Block::Other,
                };
                stack.push(block);
                stmt.clear();
            }
            Tok::RBrace => {
                stack.pop();
                stmt.clear();
            }
            _ => stmt.push(*t),
        }
    }
    (stack.pop().unwrap_or(Block::Top), stmt)
}

fn keyword(label: &str, doc: &str, replace: Span) -> Completion {
    Completion {
        label: label.to_string(),
        kind: CompletionKind::Keyword,
        detail: "keyword".to_string(),
        doc: doc.to_string(),
        replace,
    }
}

/// Candidates at `offset`, best first.
pub fn complete(a: &Analysis, src: &str, offset: usize) -> Vec<Completion> {
    let offset = offset.min(src.len());
    let mut offset = offset;
    while offset > 0 && !src.is_char_boundary(offset) {
        offset -= 1;
    }
    let before = src.get(..offset).unwrap_or("");
    let word_start = before
        .char_indices()
        .rev()
        .take_while(|(_, c)| is_word_char(*c))
        .last()
        .map_or(offset, |(i, _)| i);
    let replace = Span::new(a.file, word_start, offset);
    let toks = lex(src);
    // No completion inside a comment or a string.
    if toks.iter().any(|t| {
        matches!(t.kind, Tok::Comment | Tok::Str | Tok::UnterminatedStr)
            && t.start < offset
            && (offset < t.end || (t.kind != Tok::Str && offset == t.end))
    }) {
        return Vec::new();
    }
    let (block, stmt) = context(src, &toks, word_start);
    let kinds: Vec<Tok> = stmt.iter().map(|t| t.kind).collect();
    let text = |t: &Token| src.get(t.start..t.end).unwrap_or("");
    let mut out = Vec::new();

    // Inside citation brackets: reference ids.
    let open_bracket = kinds.iter().rposition(|k| *k == Tok::LBracket);
    let close_bracket = kinds.iter().rposition(|k| *k == Tok::RBracket);
    if let Some(open) = open_bracket.filter(|o| Some(*o) > close_bracket) {
        // Not the ids this bracket cites already, before the cursor or after it.
        let after = toks
            .iter()
            .skip_while(|t| t.start < offset)
            .take_while(|t| !matches!(t.kind, Tok::RBracket | Tok::Newline | Tok::Semi));
        let cited: Vec<&str> = stmt
            .get(open..)
            .unwrap_or_default()
            .iter()
            .chain(after)
            .filter(|t| t.kind == Tok::Ident)
            .map(text)
            .collect();
        let own = a.model.refs.iter().filter(|r| r.shared.is_none());
        for r in own.clone().filter(|r| !cited.contains(&r.id.as_str())) {
            out.push(Completion {
                label: r.id.clone(),
                kind: CompletionKind::Ref,
                detail: r.text.clone(),
                doc: format!("reference `{}`: {}", r.id, r.text),
                replace,
            });
        }
        // Then the project's shared references the file's own do not hide.
        for r in a
            .model
            .shared
            .iter()
            .filter(|r| !cited.contains(&r.id.as_str()) && !own.clone().any(|o| o.id == r.id))
        {
            out.push(Completion {
                label: r.id.clone(),
                kind: CompletionKind::Ref,
                detail: r.text.clone(),
                doc: format!("shared reference `{}` ({}): {}", r.id, r.place(), r.text),
                replace,
            });
        }
        return out;
    }
    match kinds.as_slice() {
        [] => {
            match &block {
                Block::Top => {
                    out.push(keyword(
                        "system",
                        "`system \"Name\" { ... }`: a star and its planets",
                        replace,
                    ));
                    out.push(keyword(
                        "ref",
                        "`ref id \"text\"`: a source to cite as `[id]`",
                        replace,
                    ));
                }
                Block::System(_) => {
                    out.push(keyword("star", "`star NAME { ... }`", replace));
                    out.push(keyword(
                        "planet",
                        "`planet NAME orbits STAR { ... }`",
                        replace,
                    ));
                    out.push(keyword(
                        "let",
                        "`let NAME = VALUE`: a named value for expressions",
                        replace,
                    ));
                }
                Block::Body { system, kind, name } => {
                    let declared: Vec<crate::quantities::Qty> = a
                        .model
                        .systems
                        .get(*system)
                        .and_then(|s| s.bodies.get(s.body(name)?))
                        .map(|b| b.declared.iter().map(|d| d.qty).collect())
                        .unwrap_or_default();
                    for def in quantities::table().iter().filter(|d| d.kind == *kind) {
                        if declared.contains(&def.qty) {
                            continue;
                        }
                        out.push(Completion {
                            label: def.name.to_string(),
                            kind: CompletionKind::Quantity,
                            detail: format!("{} in {}", def.dim.describe(), def.display),
                            doc: format!(
                                "{}{}",
                                def.doc,
                                if def.aliases.is_empty() {
                                    String::new()
                                } else {
                                    format!(" Also written {}.", def.aliases.join(", "))
                                }
                            ),
                            replace,
                        });
                    }
                    out.push(keyword("let", "`let NAME = VALUE`", replace));
                }
                Block::Other => {}
            }
            return out;
        }
        [Tok::Planet, Tok::Ident] => {
            out.push(keyword("orbits", "the star this planet orbits", replace));
            return out;
        }
        [.., Tok::Orbits] => {
            let sys = match &block {
                Block::System(s) => Some(*s),
                _ => None,
            };
            if let Some(s) = sys.and_then(|s| a.model.systems.get(s)) {
                for b in s.bodies.iter().filter(|b| b.kind == BodyKind::Star) {
                    out.push(Completion {
                        label: b.id.clone(),
                        kind: CompletionKind::Body,
                        detail: "star".to_string(),
                        doc: String::new(),
                        replace,
                    });
                }
            }
            return out;
        }
        [Tok::System | Tok::StarKw | Tok::Planet | Tok::Let | Tok::Ref, ..] if kinds.len() <= 2 => {
            return out; // a new name is being written
        }
        _ => {}
    }
    let system = match &block {
        Block::System(s) => Some(*s),
        Block::Body { system, .. } => Some(*system),
        _ => None,
    };
    let sys = system.and_then(|s| a.model.systems.get(s));
    // `body.` → that body's quantities.
    if let [.., body_tok, dot] = stmt.as_slice() {
        if dot.kind == Tok::Dot && body_tok.kind == Tok::Ident {
            if let Some(b) = sys.and_then(|s| s.bodies.get(s.body(text(body_tok))?)) {
                for def in quantities::table()
                    .iter()
                    .filter(|d| d.kind == b.kind && !d.text)
                {
                    out.push(Completion {
                        label: def.name.to_string(),
                        kind: CompletionKind::Quantity,
                        detail: def.dim.describe(),
                        doc: def.doc.to_string(),
                        replace,
                    });
                }
            }
            return out;
        }
    }
    // After a number in a property's value: units of the quantity's dimension.
    let rel = kinds
        .iter()
        .position(|k| matches!(k, Tok::Eq | Tok::Lt | Tok::Gt));
    if kinds.last() == Some(&Tok::Number) {
        let def = match (&block, stmt.first()) {
            (Block::Body { kind, .. }, Some(first)) if rel == Some(1) => {
                quantities::find(*kind, text(first))
            }
            _ => None,
        };
        let candidates: Vec<(String, String)> = match def {
            Some(d) => crate::units::units_for(d.dim)
                .into_iter()
                .filter(|(sym, _)| crate::units::takes_unit(d.display, sym))
                .collect(),
            None => crate::units::all_units()
                .iter()
                .map(|u| (u.symbol.to_string(), u.name.to_string()))
                .collect(),
        };
        for (sym, name) in candidates {
            let doc = super::hover::unit(&sym);
            out.push(Completion {
                label: sym,
                kind: CompletionKind::Unit,
                detail: name,
                doc,
                replace,
            });
        }
        return out;
    }
    if rel.is_none() {
        return out;
    }
    // In an expression: bindings in scope, bodies, constants and functions.
    if let Some(s) = sys {
        if let Block::Body { name, .. } = &block {
            if let Some(b) = s.bodies.get(s.body(name).unwrap_or(usize::MAX)) {
                for l in &b.lets {
                    out.push(Completion {
                        label: l.name.clone(),
                        kind: CompletionKind::Binding,
                        detail: l.dim.map(|d| d.describe()).unwrap_or_default(),
                        doc: format!("`let {}` of {}", l.name, b.id),
                        replace,
                    });
                }
            }
        }
        for l in &s.lets {
            out.push(Completion {
                label: l.name.clone(),
                kind: CompletionKind::Binding,
                detail: l.dim.map(|d| d.describe()).unwrap_or_default(),
                doc: format!("`let {}` of system \"{}\"", l.name, s.name),
                replace,
            });
        }
        for b in &s.bodies {
            out.push(Completion {
                label: b.id.clone(),
                kind: CompletionKind::Body,
                detail: b.kind.as_str().to_string(),
                doc: format!("write `{}.QUANTITY` to use one of its quantities", b.id),
                replace,
            });
        }
    }
    for c in ["pi", "G", "c", "sigma_sb"] {
        if let Some((_, dim, what)) = crate::model::constant(c) {
            out.push(Completion {
                label: c.to_string(),
                kind: CompletionKind::Constant,
                detail: dim.si_unit(),
                doc: what.to_string(),
                replace,
            });
        }
    }
    for f in crate::model::FUNCTIONS {
        out.push(Completion {
            label: (*f).to_string(),
            kind: CompletionKind::Function,
            detail: "function".to_string(),
            doc: format!("`{f}(x)`"),
            replace,
        });
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::source::FileId;

    fn labels(src: &str, cursor: &str) -> Vec<String> {
        let off = src.find(cursor).unwrap() + cursor.len();
        let a = crate::analyze(FileId(0), src, &crate::Settings::linear());
        complete(&a, src, off)
            .into_iter()
            .map(|c| c.label)
            .collect()
    }

    const SRC: &str = "ref rv1 \"Demo\"\nsystem \"S\" {\n  let base = 2 d\n  star s { mass = 1 Msun }\n  planet b orbits s {\n    period = 3 d\n    rv_amplitude = 5 km\n    ma\n    radius = 2 * s.ra\n  }\n  planet c orbits \n}\n";

    #[test]
    fn quantities_for_the_body_kind_not_yet_declared() {
        let l = labels(SRC, "    ma");
        assert!(l.contains(&"mass".to_string()), "{l:?}");
        assert!(l.contains(&"semi_major_axis".to_string()));
        assert!(!l.contains(&"period".to_string()), "already declared");
        assert!(!l.contains(&"teff".to_string()), "a star's quantity");
    }

    #[test]
    fn units_of_the_quantity_dimension() {
        let l = labels(SRC, "rv_amplitude = 5 km");
        assert!(
            l.contains(&"km/s".to_string()) && l.contains(&"m/s".to_string()),
            "{l:?}"
        );
        assert!(!l.contains(&"Msun".to_string()));
        let l = labels(SRC, "period = 3 ");
        assert!(
            l.contains(&"d".to_string()) && l.contains(&"h".to_string()),
            "{l:?}"
        );
        assert!(!l.contains(&"au".to_string()));
    }

    #[test]
    fn bodies_after_orbits_quantities_after_a_dot_refs_in_brackets() {
        assert_eq!(labels(SRC, "planet c orbits "), ["s"]);
        let l = labels(SRC, "s.ra");
        assert!(
            l.contains(&"radius".to_string()) && l.contains(&"teff".to_string()),
            "{l:?}"
        );
        let src = SRC.replace("mass = 1 Msun", "mass = 1 Msun [r");
        assert_eq!(labels(&src, "[r"), ["rv1"]);
        let l = labels(SRC, "radius = 2 ");
        assert!(
            l.contains(&"Rjup".to_string()) && !l.contains(&"d".to_string()),
            "{l:?}"
        );
        let l = labels(SRC, "radius = ");
        assert!(
            l.contains(&"base".to_string()) && l.contains(&"sqrt".to_string()),
            "{l:?}"
        );
    }

    #[test]
    fn keywords_by_block() {
        assert_eq!(labels(SRC, "\"Demo\"\n"), ["system", "ref"]);
        let l = labels(SRC, "  let base = 2 d\n  ");
        assert_eq!(l, ["star", "planet", "let"]);
        assert!(labels("# comment", "# com").is_empty());
    }

    const CITED: &str = "ref disc \"Invented discovery\"\nref followup \"Invented follow-up\"\nref late \"Invented late\"\nsystem \"S\" {\n  star s { mass = 1 Msun }\n  planet b orbits s {\n    period = 10.000 ± 0.001 d [disc]\n    period = 10.0021 ± 0.0002 d [disc, , late]\n  }\n}\n";

    #[test]
    fn citation_ids_with_their_titles_not_those_already_in_the_bracket() {
        let off = CITED.find("[disc, ").unwrap() + "[disc, ".len();
        let a = crate::analyze(FileId(0), CITED, &crate::Settings::linear());
        let c = complete(&a, CITED, off);
        let got: Vec<(&str, &str)> = c
            .iter()
            .map(|c| (c.label.as_str(), c.detail.as_str()))
            .collect();
        // `disc` is cited before the cursor and `late` after it.
        assert_eq!(got, [("followup", "Invented follow-up")]);
        assert!(c.iter().all(|c| c.kind == CompletionKind::Ref));
        // The word being typed is not yet a citation; an empty bracket offers every id.
        let l = labels(CITED, "10.000 ± 0.001 d [disc");
        assert_eq!(l, ["disc", "followup", "late"]);
        let empty = CITED.replace("mass = 1 Msun", "mass = 1 Msun []");
        assert_eq!(labels(&empty, "Msun ["), ["disc", "followup", "late"]);
    }
}
