//! The syntax tree. Every node carries its [`Span`]; nodes that failed to parse are kept as
//! `Error` placeholders so later stages can go on and report the rest of the file.

use crate::source::Span;

/// A name as written: kept inline up to 24 bytes (every name of a catalogue), so the
/// reader allocates nothing for it.
pub type Name = compact_str::CompactString;

#[derive(Debug, Clone, PartialEq)]
pub struct Ident {
    pub name: Name,
    pub span: Span,
}

#[derive(Debug, Clone, PartialEq, Default)]
pub struct File {
    pub refs: Vec<RefDecl>,
    pub systems: Vec<SystemDecl>,
    /// Comments in source order, with their spans (silencing comments live here).
    pub comments: Vec<Comment>,
}

#[derive(Debug, Clone, PartialEq)]
pub struct Comment {
    pub text: String,
    pub span: Span,
    /// Whether code precedes the comment on its line.
    pub trailing: bool,
}

#[derive(Debug, Clone, PartialEq)]
pub struct RefDecl {
    pub id: Ident,
    pub text: String,
    pub span: Span,
}

#[derive(Debug, Clone, PartialEq)]
pub struct SystemDecl {
    pub name: String,
    pub name_span: Span,
    pub lets: Vec<LetDecl>,
    pub bodies: Vec<BodyDecl>,
    pub span: Span,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, serde::Serialize)]
#[serde(rename_all = "lowercase")]
pub enum BodyKind {
    Star,
    Planet,
}

impl BodyKind {
    pub fn as_str(self) -> &'static str {
        match self {
            BodyKind::Star => "star",
            BodyKind::Planet => "planet",
        }
    }
}

#[derive(Debug, Clone, PartialEq)]
pub struct BodyDecl {
    pub kind: BodyKind,
    pub name: Ident,
    pub orbits: Option<Ident>,
    pub props: Vec<Prop>,
    pub lets: Vec<LetDecl>,
    pub span: Span,
}

#[derive(Debug, Clone, PartialEq)]
pub struct LetDecl {
    pub name: Ident,
    pub value: Expr,
    pub span: Span,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Relation {
    /// `name = value`
    Equal,
    /// `name < value`: an upper limit
    Below,
    /// `name > value`: a lower limit
    Above,
}

#[derive(Debug, Clone, PartialEq)]
pub struct Prop {
    pub name: Ident,
    pub relation: Relation,
    pub value: PropValue,
    pub assumed: Option<Span>,
    /// `preferred`: of several declarations of one quantity, the one derivations use.
    pub preferred: Option<Span>,
    pub citations: Vec<Ident>,
    pub span: Span,
}

#[derive(Debug, Clone, PartialEq)]
pub enum PropValue {
    Text(String, Span),
    Expr(Expr),
}

impl PropValue {
    pub fn span(&self) -> Span {
        match self {
            PropValue::Text(_, s) => *s,
            PropValue::Expr(e) => e.span,
        }
    }
}

#[derive(Debug, Clone, PartialEq)]
pub struct Expr {
    pub kind: ExprKind,
    pub span: Span,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum BinOp {
    Add,
    Sub,
    Mul,
    Div,
}

#[derive(Debug, Clone, PartialEq)]
pub enum ExprKind {
    /// A number with optional uncertainty and unit.
    Literal(Literal),
    /// A `let` binding or a constant.
    Name(Ident),
    /// `body.quantity`
    Ref(Ident, Ident),
    Neg(Box<Expr>),
    Binary(BinOp, Box<Expr>, Box<Expr>),
    /// Base and an exponent expression (which must be dimensionless and exact).
    Pow(Box<Expr>, Box<Expr>),
    Call(Ident, Vec<Expr>),
    /// Placeholder for a part that did not parse.
    Error,
}

#[derive(Debug, Clone, PartialEq)]
pub enum Uncertainty {
    None,
    /// `± s`
    Symmetric(f64, Span),
    /// `± a ± b ...`: independent uncertainties of one value (a statistical and a
    /// systematic one, say), combined in quadrature when lowered.
    Quadrature(Box<[f64]>, Span),
    /// `+p/-m`: the uncertainty above (plus) and below (minus) the value.
    Asymmetric {
        plus: f64,
        minus: f64,
        span: Span,
    },
}

#[derive(Debug, Clone, PartialEq)]
pub struct Literal {
    pub value: f64,
    pub value_span: Span,
    pub uncertainty: Uncertainty,
    pub unit: Option<UnitExpr>,
}

#[derive(Debug, Clone, PartialEq)]
pub struct UnitExpr {
    /// The symbols, the first kept inline (most units are one symbol).
    pub factors: UnitFactors,
    pub span: Span,
}

/// The symbols of a unit expression.
pub type UnitFactors = smallvec::SmallVec<[UnitFactor; 1]>;

/// One symbol of a unit expression with its signed exponent (`s^-1`, or `cm` after `/`
/// with exponent -1).
#[derive(Debug, Clone, PartialEq)]
pub struct UnitFactor {
    pub symbol: Ident,
    pub exponent: i32,
}
