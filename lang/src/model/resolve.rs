//! Name resolution and dimensions of expressions, done once.
//!
//! Every `let` binding and every declared expression is turned into a [`Resolved`] tree:
//! bindings, body quantities and constants by id, literals converted to SI, functions by
//! kind. Bindings are resolved in dependency order (an iterative depth-first search, so a
//! long chain costs no stack), each exactly once, so the cost is linear in the text however
//! the bindings refer to each other. A binding that depends on itself is reported once, with
//! its path. The derivation engine evaluates the resolved trees and never looks at a name.

use super::{constant, Body, Form, LetInfo, Measurement, System, FUNCTIONS};
use crate::ast::{self, BinOp, ExprKind, Uncertainty};
use crate::diagnostic::{Diagnostic, Rule};
use crate::quantities::{self, Qty, QuantityDef};
use crate::source::Span;
use crate::units::{self, Dimension, Rat};
use rustc_hash::FxHashMap;

/// A `let` binding: in the system (`body: None`) or in one body, by index in its scope.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub struct LetId {
    pub body: Option<usize>,
    pub index: usize,
}

/// The functions an expression may call.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Func {
    Sqrt,
    Cbrt,
    Exp,
    Ln,
    Log10,
    Sin,
    Cos,
    Tan,
    Abs,
}

impl Func {
    fn named(name: &str) -> Option<Func> {
        Some(match name {
            "sqrt" => Func::Sqrt,
            "cbrt" => Func::Cbrt,
            "exp" => Func::Exp,
            "ln" => Func::Ln,
            "log10" => Func::Log10,
            "sin" => Func::Sin,
            "cos" => Func::Cos,
            "tan" => Func::Tan,
            "abs" => Func::Abs,
            _ => return None,
        })
    }

    /// The function's value; `None` outside its domain.
    pub fn apply(self, x: f64) -> Option<f64> {
        match self {
            Func::Sqrt => (x >= 0.0).then(|| x.sqrt()),
            Func::Cbrt => Some(x.cbrt()),
            Func::Exp => Some(x.exp()),
            Func::Ln => (x > 0.0).then(|| x.ln()),
            Func::Log10 => (x > 0.0).then(|| x.log10()),
            Func::Sin => Some(x.sin()),
            Func::Cos => Some(x.cos()),
            Func::Tan => Some(x.tan()),
            Func::Abs => Some(x.abs()),
        }
    }
}

/// A literal with an uncertainty: an input of its own to the propagation.
#[derive(Debug, Clone, PartialEq)]
pub struct UncertainLiteral {
    /// In SI.
    pub measurement: Measurement,
    /// Where the number is written; it identifies the input.
    pub value_span: Span,
    /// The number and its uncertainty as written (`2.1 ± 0.3`), for labels.
    pub written: String,
}

/// An expression with every name resolved.
#[derive(Debug, Clone, PartialEq)]
pub struct Resolved {
    pub node: Node,
    pub span: Span,
}

#[derive(Debug, Clone, PartialEq)]
pub enum Node {
    /// An exact number in SI: a literal without uncertainty, or a constant.
    Exact(f64),
    Uncertain(Box<UncertainLiteral>),
    Binding(LetId),
    /// A quantity of a body of the same system, by body index.
    Quantity(usize, Qty),
    Neg(Box<Resolved>),
    Binary(BinOp, Box<Resolved>, Box<Resolved>),
    Pow(Box<Resolved>, Box<Resolved>),
    Call(Func, Box<Resolved>),
}

impl Resolved {
    /// Every node, parents before children, without recursion.
    pub fn walk(&self, mut f: impl FnMut(&Resolved)) {
        let mut stack = vec![self];
        while let Some(e) = stack.pop() {
            f(e);
            match &e.node {
                Node::Neg(x) | Node::Call(_, x) => stack.push(x),
                Node::Binary(_, a, b) | Node::Pow(a, b) => {
                    stack.push(b);
                    stack.push(a);
                }
                Node::Exact(_) | Node::Uncertain(_) | Node::Binding(_) | Node::Quantity(..) => {}
            }
        }
    }
}

/// Resolves the bindings and expressions of one system.
pub(super) struct Resolver<'a> {
    sys: &'a System,
    bodies: FxHashMap<&'a str, usize>,
    sys_lets: FxHashMap<&'a str, usize>,
    body_lets: Vec<FxHashMap<&'a str, usize>>,
    /// The dimension of each binding resolved so far; `None` after a reported failure.
    dims: FxHashMap<LetId, Option<Dimension>>,
    hints: &'a crate::text::Hints,
}

/// The outcome for the bindings of a system.
pub(super) struct Bindings {
    /// Per binding: its resolved value and dimension (`None` when it failed, reported).
    pub resolved: Vec<(LetId, Option<Resolved>, Option<Dimension>)>,
    /// Bindings that resolved, in an order where each comes after those it uses.
    pub order: Vec<LetId>,
}

fn scope_map(lets: &[LetInfo]) -> FxHashMap<&str, usize> {
    lets.iter()
        .enumerate()
        .map(|(i, l)| (l.name.as_str(), i))
        .collect()
}

impl<'a> Resolver<'a> {
    pub fn new(sys: &'a System, hints: &'a crate::text::Hints) -> Resolver<'a> {
        Resolver {
            sys,
            hints,
            bodies: sys
                .bodies
                .iter()
                .enumerate()
                .map(|(i, b)| (b.id.as_str(), i))
                .collect(),
            sys_lets: scope_map(&sys.lets),
            body_lets: sys.bodies.iter().map(|b| scope_map(&b.lets)).collect(),
            dims: FxHashMap::default(),
        }
    }

    fn body(&self, i: usize) -> Option<&'a Body> {
        self.sys.bodies.get(i)
    }

    fn let_info(&self, id: LetId) -> Option<&'a LetInfo> {
        match id.body {
            None => self.sys.lets.get(id.index),
            Some(b) => self.body(b)?.lets.get(id.index),
        }
    }

    /// The binding a name means in a scope: the body's own first, then the system's.
    fn lookup(&self, scope: Option<usize>, name: &str) -> Option<LetId> {
        if let Some(b) = scope {
            if let Some(&index) = self.body_lets.get(b).and_then(|m| m.get(name)) {
                return Some(LetId {
                    body: Some(b),
                    index,
                });
            }
        }
        self.sys_lets
            .get(name)
            .map(|&index| LetId { body: None, index })
    }

    /// Resolve every binding of the system; `syntax` gives each binding's expression.
    pub fn bindings(
        &mut self,
        syntax: &dyn Fn(LetId) -> Option<&'a ast::Expr>,
        diags: &mut Vec<Diagnostic>,
    ) -> Bindings {
        let mut all: Vec<LetId> = (0..self.sys.lets.len())
            .map(|index| LetId { body: None, index })
            .collect();
        for (b, body) in self.sys.bodies.iter().enumerate() {
            all.extend((0..body.lets.len()).map(|index| LetId {
                body: Some(b),
                index,
            }));
        }
        // The bindings each binding names, with where it names them.
        let edges: FxHashMap<LetId, Vec<(LetId, Span)>> = all
            .iter()
            .map(|&id| {
                let mut out = Vec::new();
                if let Some(e) = syntax(id) {
                    names_in(e, &mut |n| {
                        if let Some(to) = self.lookup(id.body, &n.name) {
                            out.push((to, n.span));
                        }
                    });
                }
                (id, out)
            })
            .collect();
        let (order, cyclic) = self.dependency_order(&all, &edges, diags);
        // Bindings past the system's bound, in the order written, are not evaluated.
        let past: rustc_hash::FxHashSet<LetId> = all
            .iter()
            .skip(super::limits::MAX_SYSTEM_BINDINGS)
            .copied()
            .collect();
        // One error per scope (the system's own bindings, each body's) at its first binding
        // past the bound, with how many of that scope are not evaluated: thousands of
        // errors would bury a body's binding among those not shown.
        let mut scopes: Vec<(Option<usize>, LetId, usize)> = Vec::new();
        for id in all.iter().skip(super::limits::MAX_SYSTEM_BINDINGS) {
            match scopes.iter_mut().find(|(scope, _, _)| *scope == id.body) {
                Some((_, _, n)) => *n += 1,
                None => scopes.push((id.body, *id, 1)),
            }
        }
        for (i, (scope, first, count)) in scopes.into_iter().enumerate() {
            let owner = scope
                .and_then(|b| self.body(b))
                .map(|b| (b.kind.as_str(), b.id.as_str()));
            if let Some(info) = self.let_info(first) {
                diags.push(super::limits::too_many_bindings(
                    &self.sys.name,
                    owner,
                    (&info.name, info.name_span),
                    count,
                    i == 0,
                ));
            }
        }
        let mut resolved = Vec::with_capacity(all.len());
        for id in order.iter().copied() {
            let (value, dim) = if cyclic.contains(&id) || past.contains(&id) {
                (None, None)
            } else {
                match syntax(id).and_then(|e| self.expr(e, id.body, diags)) {
                    Some((r, d)) => (Some(r), Some(d)),
                    None => (None, None),
                }
            };
            self.dims.insert(id, dim);
            resolved.push((id, value, dim));
        }
        let order = resolved
            .iter()
            .filter(|(_, v, _)| v.is_some())
            .map(|(id, _, _)| *id)
            .collect();
        Bindings { resolved, order }
    }

    /// Bindings in dependency order (post-order of an iterative depth-first search), and the
    /// set of those on a cycle, each cycle reported once.
    fn dependency_order(
        &self,
        all: &[LetId],
        edges: &FxHashMap<LetId, Vec<(LetId, Span)>>,
        diags: &mut Vec<Diagnostic>,
    ) -> (Vec<LetId>, rustc_hash::FxHashSet<LetId>) {
        #[derive(Clone, Copy, PartialEq)]
        enum Mark {
            New,
            Open,
            Done,
        }
        let mut mark: FxHashMap<LetId, Mark> = all.iter().map(|&id| (id, Mark::New)).collect();
        let mut order = Vec::with_capacity(all.len());
        let mut cyclic = rustc_hash::FxHashSet::default();
        let no_edges = Vec::new();
        for &start in all {
            if mark.get(&start) != Some(&Mark::New) {
                continue;
            }
            mark.insert(start, Mark::Open);
            let mut stack: Vec<(LetId, usize)> = vec![(start, 0)];
            while let Some(&mut (node, ref mut next)) = stack.last_mut() {
                let out = edges.get(&node).unwrap_or(&no_edges);
                let Some(&(to, at)) = out.get(*next) else {
                    stack.pop();
                    mark.insert(node, Mark::Done);
                    order.push(node);
                    continue;
                };
                *next += 1;
                match mark.get(&to) {
                    Some(Mark::New) => {
                        mark.insert(to, Mark::Open);
                        stack.push((to, 0));
                    }
                    Some(Mark::Open) => {
                        let from = stack.iter().position(|(n, _)| *n == to).unwrap_or(0);
                        let path: Vec<LetId> = stack.iter().skip(from).map(|(n, _)| *n).collect();
                        cyclic.extend(path.iter().copied());
                        diags.push(self.cycle(&path, to, at));
                    }
                    _ => {}
                }
            }
        }
        // Whatever uses a binding on a cycle cannot be evaluated either; the cycle is the
        // one reported cause.
        for id in &order {
            let tainted = edges
                .get(id)
                .is_some_and(|out| out.iter().any(|(to, _)| cyclic.contains(to)));
            if tainted {
                cyclic.insert(*id);
            }
        }
        (order, cyclic)
    }

    fn cycle(&self, path: &[LetId], to: LetId, at: Span) -> Diagnostic {
        let name = |id: LetId| self.let_info(id).map_or("?", |l| l.name.as_str());
        let mut message = format!("'{}' is defined in terms of itself", name(to));
        if path.len() > 1 {
            let chain: Vec<&str> = path.iter().map(|&id| name(id)).collect();
            message.push_str(&format!(": {} → {}", chain.join(" → "), name(to)));
        }
        let mut d = Diagnostic::new(Rule::InvalidValue, at, message);
        if let Some(l) = self.let_info(to) {
            d = d.with_label(l.name_span, "bound here");
        }
        d.with_note("a binding cannot use its own value, directly or through other bindings")
    }

    /// Resolve a declared expression of body `body` for quantity `def`.
    pub fn declared(
        &self,
        e: &ast::Expr,
        body: usize,
        def: &QuantityDef,
        diags: &mut Vec<Diagnostic>,
    ) -> Option<Resolved> {
        let (r, d) = self.expr(e, Some(body), diags)?;
        if d == def.dim {
            return Some(r);
        }
        diags.push(
            Diagnostic::new(
                Rule::UnitMismatch,
                e.span,
                format!(
                    "'{}' is {}, but this expression is {}",
                    def.name,
                    def.dim.describe(),
                    d.describe()
                ),
            )
            .with_help(dimension_fix(def.dim, d)),
        );
        None
    }

    /// The resolved form and dimension of an expression; `None` after reporting why it has
    /// none. Recursion follows the nesting of one value, which the parser bounds.
    fn expr(
        &self,
        e: &ast::Expr,
        scope: Option<usize>,
        diags: &mut Vec<Diagnostic>,
    ) -> Option<(Resolved, Dimension)> {
        let made = |node: Node, dim: Dimension| Some((Resolved { node, span: e.span }, dim));
        match &e.kind {
            ExprKind::Error => None,
            ExprKind::Literal(l) => {
                let (node, dim) = literal(l, diags)?;
                made(node, dim)
            }
            ExprKind::Name(id) => {
                if let Some(to) = self.lookup(scope, &id.name) {
                    // Resolved before (dependency order); a failure was reported there.
                    let dim = (*self.dims.get(&to)?)?;
                    return made(Node::Binding(to), dim);
                }
                if let Some((v, d, _)) = constant(&id.name) {
                    return made(Node::Exact(v), d);
                }
                diags.push(self.unknown_name(id, scope));
                None
            }
            ExprKind::Ref(b, q) => {
                let (bi, body) = match self.bodies.get(b.name.as_str()) {
                    Some(&bi) => (bi, self.body(bi)?),
                    None => {
                        diags.push(self.unknown_body(b));
                        return None;
                    }
                };
                match quantities::find(body.kind, &q.name) {
                    Some(def) if !def.text => made(Node::Quantity(bi, def.qty), def.dim),
                    Some(def) => {
                        diags.push(Diagnostic::new(
                            Rule::UnitMismatch,
                            q.span,
                            format!("'{}' is text and cannot be used in arithmetic", def.name),
                        ));
                        None
                    }
                    None => {
                        diags.push(super::value::unknown_quantity(body.kind, q));
                        None
                    }
                }
            }
            ExprKind::Neg(inner) => {
                let (x, d) = self.expr(inner, scope, diags)?;
                made(Node::Neg(Box::new(x)), d)
            }
            ExprKind::Binary(op, a, b) => {
                let ra = self.expr(a, scope, diags);
                let rb = self.expr(b, scope, diags);
                let ((ra, da), (rb, db)) = (ra?, rb?);
                let dim = match op {
                    BinOp::Mul => da.times(db),
                    BinOp::Div => da.per(db),
                    BinOp::Add | BinOp::Sub if da == db => da,
                    BinOp::Add | BinOp::Sub => {
                        diags.push(sum_mismatch(*op, e.span, (a.span, da), (b.span, db)));
                        return None;
                    }
                };
                made(Node::Binary(*op, Box::new(ra), Box::new(rb)), dim)
            }
            ExprKind::Pow(base, exp) => {
                let (rb, db) = self.expr(base, scope, diags)?;
                let (re, de) = self.expr(exp, scope, diags)?;
                let dim = power_dimension(db, de, base.span, exp, diags)?;
                made(Node::Pow(Box::new(rb), Box::new(re)), dim)
            }
            ExprKind::Call(f, args) => {
                let resolved: Vec<Option<(Resolved, Dimension)>> =
                    args.iter().map(|a| self.expr(a, scope, diags)).collect();
                if args.len() != 1 {
                    diags.push(Diagnostic::new(
                        Rule::InvalidValue,
                        e.span,
                        format!("'{}' takes one argument, found {}", f.name, args.len()),
                    ));
                    return None;
                }
                let (arg, d) = resolved.into_iter().next().flatten()?;
                let arg_span = args.first().map_or(e.span, |a| a.span);
                let Some(func) = Func::named(&f.name) else {
                    diags.push(unknown_function(f));
                    return None;
                };
                let dim = call_dimension(func, &f.name, d, arg_span, diags)?;
                made(Node::Call(func, Box::new(arg)), dim)
            }
        }
    }

    fn unknown_name(&self, id: &ast::Ident, scope: Option<usize>) -> Diagnostic {
        let d = Diagnostic::new(
            Rule::UnknownName,
            id.span,
            format!("'{}' is neither a 'let' binding nor a constant", id.name),
        );
        // Walked, not gathered: once the file's hints have spent their bound, a system of
        // thousands of bindings costs nothing more per unknown name.
        let body_lets = scope
            .and_then(|i| self.body(i))
            .map_or(&[][..], |b| &b.lets[..]);
        let names = ["pi", "G", "c", "sigma_sb"]
            .into_iter()
            .chain(body_lets.iter().map(|l| l.name.as_str()))
            .chain(self.sys.lets.iter().map(|l| l.name.as_str()));
        if let Some(s) = self.hints.closest(&id.name, names) {
            d.with_help(format!("did you mean '{s}'?"))
        } else if units::lookup(&id.name).is_some() {
            d.with_help(format!("a unit follows a number: write `1 {}`", id.name))
        } else {
            d.with_help("to use a quantity of a body, write `body.quantity`")
        }
    }

    fn unknown_body(&self, b: &ast::Ident) -> Diagnostic {
        if self.sys.not_read.iter().any(|(n, _)| *n == b.name) {
            let why = super::limits::not_read(&self.sys.name, &b.name);
            return Diagnostic::new(Rule::TooManyBodies, b.span, why);
        }
        let d = Diagnostic::new(
            Rule::UnknownBody,
            b.span,
            format!("no body '{}' in system \"{}\"", b.name, self.sys.name),
        );
        let bodies = self.sys.bodies.iter().map(|x| x.id.as_str());
        match self.hints.closest(&b.name, bodies) {
            Some(s) => d.with_help(format!("did you mean '{s}'?")),
            None => d,
        }
    }
}

/// Every plain name an expression uses (not function names), in order.
fn names_in<'e>(e: &'e ast::Expr, f: &mut dyn FnMut(&'e ast::Ident)) {
    let mut stack = vec![e];
    while let Some(e) = stack.pop() {
        match &e.kind {
            ExprKind::Name(id) => f(id),
            ExprKind::Neg(x) => stack.push(x),
            ExprKind::Binary(_, a, b) | ExprKind::Pow(a, b) => {
                stack.push(b);
                stack.push(a);
            }
            ExprKind::Call(_, args) => stack.extend(args.iter().rev()),
            ExprKind::Literal(_) | ExprKind::Ref(..) | ExprKind::Error => {}
        }
    }
}

/// A literal inside an expression, in SI.
fn literal(l: &ast::Literal, diags: &mut Vec<Diagnostic>) -> Option<(Node, Dimension)> {
    if !l.value.is_finite() {
        diags.push(Diagnostic::new(
            Rule::InvalidValue,
            l.value_span,
            "this number is too large to represent",
        ));
        return None;
    }
    let unit = match &l.unit {
        None => units::Unit::one(),
        Some(u) => match units::resolve(u) {
            Ok(u) => u,
            Err(errs) => {
                for (span, err) in errs {
                    diags.push(super::value::unknown_unit(span, &err));
                }
                return None;
            }
        },
    };
    let k = unit.factor;
    let (below, above, form, spread) = match l.uncertainty {
        Uncertainty::None => return Some((Node::Exact(l.value * k), unit.dim)),
        Uncertainty::Symmetric(s, _) => (s, s, Form::Symmetric, format!(" ± {}", num(s))),
        Uncertainty::Quadrature(ref parts, span) => {
            diags.push(super::value::combined_note(span, parts, &unit.text));
            let s = super::value::quadrature(parts);
            let written: String = parts.iter().map(|p| format!(" ± {}", num(*p))).collect();
            (s, s, Form::Symmetric, written)
        }
        Uncertainty::Asymmetric { plus, minus, .. } => (
            minus,
            plus,
            Form::Asymmetric,
            format!(" +{}/-{}", num(plus), num(minus)),
        ),
    };
    let literal = UncertainLiteral {
        measurement: Measurement {
            value: l.value * k,
            below: below * k,
            above: above * k,
            form,
        },
        value_span: l.value_span,
        written: format!("{}{spread}", num(l.value)),
    };
    Some((Node::Uncertain(Box::new(literal)), unit.dim))
}

fn num(v: f64) -> String {
    crate::format::number(v)
}

fn sum_mismatch(
    op: BinOp,
    span: Span,
    (a, da): (Span, Dimension),
    (b, db): (Span, Dimension),
) -> Diagnostic {
    Diagnostic::new(
        Rule::UnitMismatch,
        span,
        format!(
            "cannot {} {} and {}",
            if op == BinOp::Add { "add" } else { "subtract" },
            da.describe(),
            db.describe()
        ),
    )
    .with_label(a, format!("this is {}", da.describe()))
    .with_label(b, format!("this is {}", db.describe()))
    .with_help(format!(
        "multiply the right-hand side by a factor of {}",
        da.per(db).describe()
    ))
}

fn power_dimension(
    base: Dimension,
    exp_dim: Dimension,
    base_span: Span,
    exp: &ast::Expr,
    diags: &mut Vec<Diagnostic>,
) -> Option<Dimension> {
    if !exp_dim.is_none() {
        diags.push(Diagnostic::new(
            Rule::UnitMismatch,
            exp.span,
            format!(
                "an exponent must be a plain number, but this is {}",
                exp_dim.describe()
            ),
        ));
        return None;
    }
    if base.is_none() {
        return Some(Dimension::NONE);
    }
    match const_value(exp).and_then(rational) {
        Some(r) => Some(base.pow(r)),
        None => {
            diags.push(
                Diagnostic::new(
                    Rule::UnitMismatch,
                    exp.span,
                    "the exponent of a value with a unit must be an exact fraction such as 2, 0.5 or 1/3",
                )
                .with_label(base_span, format!("this is {}", base.describe())),
            );
            None
        }
    }
}

fn call_dimension(
    func: Func,
    name: &str,
    d: Dimension,
    arg_span: Span,
    diags: &mut Vec<Diagnostic>,
) -> Option<Dimension> {
    let mut need = |want: Dimension, what: &str| {
        if d == want {
            Some(Dimension::NONE)
        } else {
            diags.push(Diagnostic::new(
                Rule::UnitMismatch,
                arg_span,
                format!("'{name}' takes {what}, but this is {}", d.describe()),
            ));
            None
        }
    };
    match func {
        Func::Sqrt => Some(d.pow(Rat::new(1, 2))),
        Func::Cbrt => Some(d.pow(Rat::new(1, 3))),
        Func::Abs => Some(d),
        Func::Exp | Func::Ln | Func::Log10 => need(Dimension::NONE, "a plain number"),
        Func::Sin | Func::Cos | Func::Tan => need(Dimension::ANGLE, "an angle"),
    }
}

fn unknown_function(f: &ast::Ident) -> Diagnostic {
    let d = Diagnostic::new(
        Rule::UnknownName,
        f.span,
        format!("unknown function '{}'", f.name),
    );
    match crate::text::closest(&f.name, FUNCTIONS.iter().copied()) {
        Some(s) => d.with_help(format!("did you mean '{s}'?")),
        None => d.with_help(format!("the functions are {}", FUNCTIONS.join(", "))),
    }
}

/// Suggest the factor that would fix a dimension mismatch.
fn dimension_fix(expected: Dimension, found: Dimension) -> String {
    let missing = expected.per(found);
    format!(
        "multiply by a factor of {} to get {}",
        missing.describe(),
        expected.describe()
    )
}

/// The value of an exact, unitless constant expression (for exponents).
fn const_value(e: &ast::Expr) -> Option<f64> {
    match &e.kind {
        ExprKind::Literal(l) if l.unit.is_none() && l.uncertainty == Uncertainty::None => {
            Some(l.value)
        }
        ExprKind::Neg(x) => const_value(x).map(|v| -v),
        ExprKind::Binary(op, a, b) => {
            let (a, b) = (const_value(a)?, const_value(b)?);
            Some(match op {
                BinOp::Add => a + b,
                BinOp::Sub => a - b,
                BinOp::Mul => a * b,
                BinOp::Div => a / b,
            })
        }
        _ => None,
    }
    .filter(|v| v.is_finite())
}

fn rational(v: f64) -> Option<Rat> {
    for den in 1..=12 {
        let n = v * f64::from(den);
        if (n - n.round()).abs() < 1e-9 && n.abs() < 1000.0 {
            return Some(Rat::new(n.round() as i32, den));
        }
    }
    None
}

/// The star a planet `orbits`, or the error that says why there is none (no such body, a
/// planet, or a star past the system's bound on bodies).
pub(super) fn resolve_host(
    sys: &System,
    o: &ast::Ident,
    hints: &crate::text::Hints,
    diags: &mut Vec<Diagnostic>,
) -> Option<usize> {
    match sys.body(&o.name) {
        Some(i) if sys.bodies.get(i).map(|b| b.kind) == Some(crate::ast::BodyKind::Star) => Some(i),
        Some(_) => {
            diags.push(
                Diagnostic::new(
                    Rule::UnknownBody,
                    o.span,
                    format!("'{}' is a planet; a planet orbits a star", o.name),
                )
                .with_help("name a star declared in this system after 'orbits'"),
            );
            None
        }
        None if sys.not_read.iter().any(|(n, _)| *n == o.name) => {
            let why = super::limits::not_read(&sys.name, &o.name);
            diags.push(Diagnostic::new(Rule::TooManyBodies, o.span, why));
            None
        }
        None => {
            let stars = sys
                .bodies
                .iter()
                .filter(|b| b.kind == crate::ast::BodyKind::Star)
                .map(|b| b.id.as_str());
            let mut d = Diagnostic::new(
                Rule::UnknownBody,
                o.span,
                format!("no star '{}' in system \"{}\"", o.name, sys.name),
            );
            if let Some(s) = hints.closest(&o.name, stars) {
                d = d.with_help(format!("did you mean '{s}'?"));
            }
            diags.push(d);
            None
        }
    }
}
