//! Every named thing in a file and where it occurs: bodies, references, `let` bindings,
//! quantities and unit symbols. Definition, references, rename, hover and semantic tokens
//! all start from this one walk over the syntax tree.

use crate::ast::{self, BodyKind, Expr, ExprKind};
use crate::quantities::{self, Qty};
use crate::source::Span;

/// What a name stands for. Systems are identified by their index in the file.
#[derive(Debug, Clone, PartialEq, Eq, Hash)]
pub enum Symbol {
    Body {
        system: usize,
        name: String,
    },
    /// A reference (`ref id "..."`) and its citations.
    Ref(String),
    /// A `let` binding of a system (`body` is `None`) or of a body.
    Let {
        system: usize,
        body: Option<String>,
        name: String,
    },
    /// A quantity of a body: its declaration and `body.quantity` in expressions.
    Quantity {
        system: usize,
        body: String,
        qty: Qty,
    },
    /// A unit symbol inside a literal.
    Unit(String),
    /// A function or constant of the language.
    Builtin(String),
}

impl Symbol {
    /// Whether rename may change it (quantity names and units are fixed by the language).
    pub fn renamable(&self) -> bool {
        matches!(
            self,
            Symbol::Body { .. } | Symbol::Ref(_) | Symbol::Let { .. }
        )
    }
}

#[derive(Debug, Clone, PartialEq)]
pub struct Occurrence {
    pub span: Span,
    pub symbol: Symbol,
    /// The declaration rather than a use.
    pub def: bool,
}

/// All occurrences in source order.
pub fn occurrences(file: &ast::File) -> Vec<Occurrence> {
    let mut out = Vec::new();
    for r in &file.refs {
        out.push(Occurrence {
            span: r.id.span,
            symbol: Symbol::Ref(r.id.name.to_string()),
            def: true,
        });
    }
    for (si, sys) in file.systems.iter().enumerate() {
        let w = Walker { sys, si };
        for l in &sys.lets {
            out.push(Occurrence {
                span: l.name.span,
                symbol: Symbol::Let {
                    system: si,
                    body: None,
                    name: l.name.name.to_string(),
                },
                def: true,
            });
            w.expr(&l.value, None, &mut out);
        }
        for b in &sys.bodies {
            out.push(Occurrence {
                span: b.name.span,
                symbol: Symbol::Body {
                    system: si,
                    name: b.name.name.to_string(),
                },
                def: true,
            });
            if let Some(o) = &b.orbits {
                out.push(Occurrence {
                    span: o.span,
                    symbol: Symbol::Body {
                        system: si,
                        name: o.name.to_string(),
                    },
                    def: false,
                });
            }
            for l in &b.lets {
                out.push(Occurrence {
                    span: l.name.span,
                    symbol: Symbol::Let {
                        system: si,
                        body: Some(b.name.name.to_string()),
                        name: l.name.name.to_string(),
                    },
                    def: true,
                });
                w.expr(&l.value, Some(b), &mut out);
            }
            for p in &b.props {
                if let Some(def) = quantities::find(b.kind, &p.name.name) {
                    out.push(Occurrence {
                        span: p.name.span,
                        symbol: Symbol::Quantity {
                            system: si,
                            body: b.name.name.to_string(),
                            qty: def.qty,
                        },
                        def: true,
                    });
                }
                if let ast::PropValue::Expr(e) = &p.value {
                    w.expr(e, Some(b), &mut out);
                }
                for c in &p.citations {
                    out.push(Occurrence {
                        span: c.span,
                        symbol: Symbol::Ref(c.name.to_string()),
                        def: false,
                    });
                }
            }
        }
    }
    out.sort_by_key(|o| (o.span.start, o.span.end));
    out
}

struct Walker<'a> {
    sys: &'a ast::SystemDecl,
    si: usize,
}

impl Walker<'_> {
    fn body_kind(&self, name: &str) -> Option<BodyKind> {
        self.sys
            .bodies
            .iter()
            .find(|b| b.name.name == name)
            .map(|b| b.kind)
    }

    fn expr(&self, e: &Expr, body: Option<&ast::BodyDecl>, out: &mut Vec<Occurrence>) {
        match &e.kind {
            ExprKind::Literal(l) => {
                if let Some(u) = &l.unit {
                    for f in &u.factors {
                        out.push(Occurrence {
                            span: f.symbol.span,
                            symbol: Symbol::Unit(f.symbol.name.to_string()),
                            def: false,
                        });
                    }
                }
            }
            ExprKind::Name(id) => {
                let body_let = body.filter(|b| b.lets.iter().any(|l| l.name.name == id.name));
                let symbol = if let Some(b) = body_let {
                    Some(Symbol::Let {
                        system: self.si,
                        body: Some(b.name.name.to_string()),
                        name: id.name.to_string(),
                    })
                } else if self.sys.lets.iter().any(|l| l.name.name == id.name) {
                    Some(Symbol::Let {
                        system: self.si,
                        body: None,
                        name: id.name.to_string(),
                    })
                } else if crate::model::constant(&id.name).is_some() {
                    Some(Symbol::Builtin(id.name.to_string()))
                } else {
                    None
                };
                if let Some(symbol) = symbol {
                    out.push(Occurrence {
                        span: id.span,
                        symbol,
                        def: false,
                    });
                }
            }
            ExprKind::Ref(b, q) => {
                out.push(Occurrence {
                    span: b.span,
                    symbol: Symbol::Body {
                        system: self.si,
                        name: b.name.to_string(),
                    },
                    def: false,
                });
                if let Some(def) = self
                    .body_kind(&b.name)
                    .and_then(|k| quantities::find(k, &q.name))
                {
                    out.push(Occurrence {
                        span: q.span,
                        symbol: Symbol::Quantity {
                            system: self.si,
                            body: b.name.to_string(),
                            qty: def.qty,
                        },
                        def: false,
                    });
                }
            }
            ExprKind::Neg(x) => self.expr(x, body, out),
            ExprKind::Binary(_, a, b2) | ExprKind::Pow(a, b2) => {
                self.expr(a, body, out);
                self.expr(b2, body, out);
            }
            ExprKind::Call(f, args) => {
                if crate::model::FUNCTIONS.contains(&f.name.as_str()) {
                    out.push(Occurrence {
                        span: f.span,
                        symbol: Symbol::Builtin(f.name.to_string()),
                        def: false,
                    });
                }
                for a in args {
                    self.expr(a, body, out);
                }
            }
            ExprKind::Error => {}
        }
    }
}

/// The occurrence at a byte offset (a cursor just after a name still counts).
pub fn at(occ: &[Occurrence], offset: usize) -> Option<&Occurrence> {
    occ.iter()
        .filter(|o| o.span.contains(offset))
        .min_by_key(|o| (o.span.end - o.span.start, o.span.start))
}

/// Every occurrence of the symbol at `offset`, the declaration first.
pub fn related(occ: &[Occurrence], offset: usize) -> Vec<&Occurrence> {
    let Some(here) = at(occ, offset) else {
        return Vec::new();
    };
    let mut all: Vec<&Occurrence> = occ.iter().filter(|o| o.symbol == here.symbol).collect();
    all.sort_by_key(|o| (!o.def, o.span.start));
    all
}

/// Whether `name` may stand as a body, reference or binding name.
pub fn valid_name(name: &str) -> bool {
    let toks = crate::lexer::lex(name);
    matches!(toks.as_slice(), [t] if t.kind == crate::lexer::Tok::Ident && t.start == 0 && t.end == name.len())
        && name != "%"
}

/// Edits that rename the symbol at `offset`, or why not.
pub fn rename(
    occ: &[Occurrence],
    offset: usize,
    new_name: &str,
) -> Result<Vec<(Span, String)>, String> {
    let Some(here) = at(occ, offset) else {
        return Err("there is no body, reference or binding name here".to_string());
    };
    if !here.symbol.renamable() {
        return Err(match here.symbol {
            Symbol::Quantity { .. } => "quantity names are fixed by the language".to_string(),
            Symbol::Unit(_) => "unit symbols are fixed by the unit registry".to_string(),
            _ => "built-in functions and constants cannot be renamed".to_string(),
        });
    }
    if !valid_name(new_name) {
        return Err(format!(
            "'{new_name}' is not a valid name: use letters, digits and '_', starting with a letter"
        ));
    }
    Ok(related(occ, offset)
        .into_iter()
        .map(|o| (o.span, new_name.to_string()))
        .collect())
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::source::FileId;

    const SRC: &str = "ref rv1 \"x\"\nsystem \"S\" {\n  let base = 2 d\n  star s { mass = 1 Msun [rv1] }\n  planet b orbits s { period = base * 2; rv_amplitude = 3 m/s [rv1] }\n  planet c orbits s { period = 2 * b.period }\n}\n";

    fn occ() -> Vec<Occurrence> {
        occurrences(&crate::parser::parse(FileId(0), SRC).file)
    }

    fn nth(needle: &str, n: usize) -> usize {
        SRC.match_indices(needle).nth(n).map(|(i, _)| i).unwrap()
    }

    #[test]
    fn finds_bodies_refs_lets_and_quantities() {
        let o = occ();
        let refs = related(&o, nth("rv1", 1));
        assert_eq!(refs.len(), 3);
        assert!(refs[0].def && refs[0].span.start as usize == nth("rv1", 0));
        let body_b = related(&o, nth("b.period", 0));
        assert_eq!(body_b.len(), 2);
        assert_eq!(body_b[0].span.start as usize, nth("b orbits", 0));
        let base = related(&o, nth("base", 1));
        assert_eq!(base.len(), 2);
        let q = at(&o, nth("period }", 0)).unwrap();
        assert!(matches!(
            q.symbol,
            Symbol::Quantity {
                qty: Qty::Period,
                ..
            }
        ));
        let star = related(&o, nth("s {", 0));
        assert_eq!(star.len(), 3, "declaration and two 'orbits'");
        assert!(matches!(
            at(&o, nth("Msun", 0)).unwrap().symbol,
            Symbol::Unit(_)
        ));
    }

    #[test]
    fn rename_checks_names_and_kinds() {
        let o = occ();
        let edits = rename(&o, nth("b.period", 0), "hot").unwrap();
        assert_eq!(edits.len(), 2);
        assert!(rename(&o, nth("b.period", 0), "2x").is_err());
        assert!(rename(&o, nth("b.period", 0), "planet").is_err());
        assert!(rename(&o, nth("period }", 0), "p").is_err());
        assert!(rename(&o, 0, "x").is_err());
    }
}
