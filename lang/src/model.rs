//! The semantic model: the syntax tree resolved into systems, bodies and typed quantities.
//!
//! Lowering resolves names (bodies per system, refs per file, `let` bindings per body and
//! system), converts every literal measurement to SI, checks each value's dimension against
//! its quantity and its range, and infers the dimension of every expression. Problems become
//! diagnostics; the offending value is dropped and lowering goes on, so one mistake never
//! hides the rest.

use crate::ast::{self, BinOp, BodyKind, ExprKind, Relation, Uncertainty};
use crate::diagnostic::{Diagnostic, Rule};
use crate::quantities::{self, Qty, QuantityDef};
use crate::source::{FileId, Span};
use crate::units::{self, Dimension, Rat};
use std::collections::HashMap;

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Form {
    Exact,
    Symmetric,
    Asymmetric,
    /// `name < value`
    UpperLimit,
    /// `name > value`
    LowerLimit,
}

impl Form {
    pub fn as_str(self) -> &'static str {
        match self {
            Form::Exact => "exact",
            Form::Symmetric => "symmetric",
            Form::Asymmetric => "asymmetric",
            Form::UpperLimit => "upper-limit",
            Form::LowerLimit => "lower-limit",
        }
    }

    pub fn is_limit(self) -> bool {
        matches!(self, Form::UpperLimit | Form::LowerLimit)
    }
}

/// A measured value in SI: the value and its uncertainty below and above.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Measurement {
    pub value: f64,
    pub below: f64,
    pub above: f64,
    pub form: Form,
}

#[derive(Debug, Clone, PartialEq)]
pub enum Content {
    Measured(Measurement),
    Expr(ast::Expr),
    Text(String),
}

/// A quantity as the user declared it.
#[derive(Debug, Clone, PartialEq)]
pub struct Declared {
    pub qty: Qty,
    pub name_span: Span,
    pub span: Span,
    pub value_span: Span,
    pub content: Content,
    pub assumed: bool,
    pub citations: Vec<(String, Span)>,
    /// The unit as written, when the value is a literal with a unit.
    pub written_unit: Option<String>,
}

#[derive(Debug, Clone, PartialEq)]
pub struct LetInfo {
    pub name: String,
    pub name_span: Span,
    pub expr: ast::Expr,
    pub dim: Option<Dimension>,
    pub span: Span,
}

#[derive(Debug, Clone, PartialEq)]
pub struct Body {
    pub id: String,
    pub kind: BodyKind,
    pub name_span: Span,
    pub span: Span,
    /// Index of the host star in the system's bodies.
    pub orbits: Option<usize>,
    pub orbits_span: Option<Span>,
    pub declared: Vec<Declared>,
    pub lets: Vec<LetInfo>,
}

impl Body {
    pub fn get(&self, qty: Qty) -> Option<&Declared> {
        self.declared.iter().find(|d| d.qty == qty)
    }
}

#[derive(Debug, Clone, PartialEq)]
pub struct System {
    pub name: String,
    pub name_span: Span,
    pub span: Span,
    pub bodies: Vec<Body>,
    pub lets: Vec<LetInfo>,
}

impl System {
    pub fn body(&self, id: &str) -> Option<usize> {
        self.bodies.iter().position(|b| b.id == id)
    }
}

#[derive(Debug, Clone, PartialEq)]
pub struct RefInfo {
    pub id: String,
    pub text: String,
    pub span: Span,
    pub id_span: Span,
}

#[derive(Debug, Clone, PartialEq, Default)]
pub struct Model {
    pub file: FileId,
    pub refs: Vec<RefInfo>,
    pub systems: Vec<System>,
    pub comments: Vec<ast::Comment>,
}

/// Constants available by name inside expressions.
pub fn constant(name: &str) -> Option<(f64, Dimension, &'static str)> {
    use crate::constants as k;
    Some(match name {
        "pi" => (std::f64::consts::PI, Dimension::NONE, "pi"),
        "G" => (
            k::G,
            Dimension::of(3, -1, -2, 0, 0),
            "Newtonian constant of gravitation (CODATA 2018)",
        ),
        "c" => (
            k::C,
            Dimension::of(1, 0, -1, 0, 0),
            "speed of light (SI 2019, exact)",
        ),
        "sigma_sb" => (
            k::SIGMA_SB,
            Dimension::of(0, 1, -3, -4, 0),
            "Stefan–Boltzmann constant (SI 2019)",
        ),
        _ => return None,
    })
}

/// Functions available inside expressions.
pub const FUNCTIONS: &[&str] = &[
    "sqrt", "cbrt", "exp", "ln", "log10", "sin", "cos", "tan", "abs",
];

/// Lower a parsed file into the model, appending diagnostics.
pub fn lower(file: FileId, ast: &ast::File, diags: &mut Vec<Diagnostic>) -> Model {
    let mut model = Model {
        file,
        comments: ast.comments.clone(),
        ..Model::default()
    };
    for r in &ast.refs {
        if let Some(prev) = model.refs.iter().find(|p| p.id == r.id.name) {
            diags.push(
                Diagnostic::new(
                    Rule::Duplicate,
                    r.id.span,
                    format!("reference '{}' is declared twice", r.id.name),
                )
                .with_label(prev.id_span, "first declared here"),
            );
            continue;
        }
        model.refs.push(RefInfo {
            id: r.id.name.clone(),
            text: r.text.clone(),
            span: r.span,
            id_span: r.id.span,
        });
    }
    let mut seen: HashMap<&str, Span> = HashMap::new();
    for s in &ast.systems {
        if !s.name.is_empty() {
            if let Some(prev) = seen.get(s.name.as_str()) {
                diags.push(
                    Diagnostic::new(
                        Rule::Duplicate,
                        s.name_span,
                        format!("system \"{}\" is declared twice in this file", s.name),
                    )
                    .with_label(*prev, "first declared here"),
                );
            } else {
                seen.insert(&s.name, s.name_span);
            }
        }
        let sys = lower_system(s, &model.refs, diags);
        model.systems.push(sys);
    }
    model
}

fn lower_system(s: &ast::SystemDecl, refs: &[RefInfo], diags: &mut Vec<Diagnostic>) -> System {
    let mut sys = System {
        name: s.name.clone(),
        name_span: s.name_span,
        span: s.span,
        bodies: Vec::new(),
        lets: lower_lets(&s.lets, diags),
    };
    // First pass: bodies and their identifiers, so that references can be resolved in any order.
    for b in &s.bodies {
        if let Some(prev) = sys.bodies.iter().find(|p| p.id == b.name.name) {
            diags.push(
                Diagnostic::new(
                    Rule::Duplicate,
                    b.name.span,
                    format!(
                        "body '{}' is declared twice in system \"{}\"",
                        b.name.name, s.name
                    ),
                )
                .with_label(prev.name_span, "first declared here")
                .with_help("body identifiers must be unique within a system"),
            );
            continue;
        }
        sys.bodies.push(Body {
            id: b.name.name.clone(),
            kind: b.kind,
            name_span: b.name.span,
            span: b.span,
            orbits: None,
            orbits_span: b.orbits.as_ref().map(|o| o.span),
            declared: Vec::new(),
            lets: lower_lets(&b.lets, diags),
        });
    }
    for b in &s.bodies {
        let Some(idx) = sys.body(&b.name.name) else {
            continue;
        };
        if sys.bodies.get(idx).map(|x| x.name_span) != Some(b.name.span) {
            continue; // a duplicate, already reported
        }
        let orbits = b.orbits.as_ref().and_then(|o| resolve_host(&sys, o, diags));
        let declared = lower_props(b, refs, diags);
        if let Some(body) = sys.bodies.get_mut(idx) {
            body.orbits = orbits;
            body.declared = declared;
        }
    }
    // Expressions: infer dimensions now that every body and binding is known.
    check_expressions(&mut sys, diags);
    sys
}

fn resolve_host(sys: &System, o: &ast::Ident, diags: &mut Vec<Diagnostic>) -> Option<usize> {
    match sys.body(&o.name) {
        Some(i) if sys.bodies.get(i).map(|b| b.kind) == Some(BodyKind::Star) => Some(i),
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
        None => {
            let stars = sys
                .bodies
                .iter()
                .filter(|b| b.kind == BodyKind::Star)
                .map(|b| b.id.as_str());
            let mut d = Diagnostic::new(
                Rule::UnknownBody,
                o.span,
                format!("no star '{}' in system \"{}\"", o.name, sys.name),
            );
            if let Some(s) = crate::text::closest(&o.name, stars) {
                d = d.with_help(format!("did you mean '{s}'?"));
            }
            diags.push(d);
            None
        }
    }
}

fn lower_lets(lets: &[ast::LetDecl], diags: &mut Vec<Diagnostic>) -> Vec<LetInfo> {
    let mut out: Vec<LetInfo> = Vec::new();
    for l in lets {
        if let Some(prev) = out.iter().find(|p| p.name == l.name.name) {
            diags.push(
                Diagnostic::new(
                    Rule::Duplicate,
                    l.name.span,
                    format!("'{}' is bound twice in this scope", l.name.name),
                )
                .with_label(prev.name_span, "first bound here"),
            );
            continue;
        }
        out.push(LetInfo {
            name: l.name.name.clone(),
            name_span: l.name.span,
            expr: l.value.clone(),
            dim: None,
            span: l.span,
        });
    }
    out
}

fn lower_props(b: &ast::BodyDecl, refs: &[RefInfo], diags: &mut Vec<Diagnostic>) -> Vec<Declared> {
    let mut out: Vec<Declared> = Vec::new();
    for p in &b.props {
        let Some(def) = quantities::find(b.kind, &p.name.name) else {
            diags.push(unknown_quantity(b.kind, &p.name));
            continue;
        };
        if let Some(prev) = out.iter().find(|d| d.qty == def.qty) {
            diags.push(
                Diagnostic::new(
                    Rule::Duplicate,
                    p.name.span,
                    format!("'{}' of '{}' is declared twice", def.name, b.name.name),
                )
                .with_label(prev.name_span, "first declared here"),
            );
            continue;
        }
        let mut citations = Vec::new();
        for c in &p.citations {
            if refs.iter().any(|r| r.id == c.name) {
                citations.push((c.name.clone(), c.span));
            } else {
                let mut d = Diagnostic::new(
                    Rule::UnknownRef,
                    c.span,
                    format!("no reference '{}' is declared in this file", c.name),
                );
                d = match crate::text::closest(&c.name, refs.iter().map(|r| r.id.as_str())) {
                    Some(s) => d.with_help(format!("did you mean '{s}'?")),
                    None => d.with_help(format!(
                        "declare it at the top of the file: ref {} \"...\"",
                        c.name
                    )),
                };
                diags.push(d);
            }
        }
        let Some((content, written_unit)) = lower_value(def, p, diags) else {
            continue;
        };
        out.push(Declared {
            qty: def.qty,
            name_span: p.name.span,
            span: p.span,
            value_span: p.value.span(),
            content,
            assumed: p.assumed.is_some(),
            citations,
            written_unit,
        });
    }
    out
}

/// The display unit as written after a number: nothing for plain numbers.
fn unit_suffix(def: &QuantityDef) -> &'static str {
    if def.display == "1" {
        ""
    } else {
        def.display
    }
}

fn unknown_quantity(kind: BodyKind, name: &ast::Ident) -> Diagnostic {
    let mut d = Diagnostic::new(
        Rule::UnknownQuantity,
        name.span,
        format!("'{}' is not a quantity of a {}", name.name, kind.as_str()),
    );
    let other = match kind {
        BodyKind::Star => BodyKind::Planet,
        BodyKind::Planet => BodyKind::Star,
    };
    if let Some(s) = crate::text::closest(&name.name, quantities::names_for(kind)) {
        d = d.with_help(format!("did you mean '{s}'?"));
    } else if quantities::find(other, &name.name).is_some() {
        d = d.with_help(format!(
            "'{}' is a quantity of a {}; declare it there",
            name.name,
            other.as_str()
        ));
    }
    d
}

/// A literal measurement: value, uncertainty and unit in one.
fn literal_of(e: &ast::Expr) -> Option<(f64, &ast::Literal)> {
    match &e.kind {
        ExprKind::Literal(l) => Some((1.0, l)),
        ExprKind::Neg(inner) => match &inner.kind {
            ExprKind::Literal(l) => Some((-1.0, l)),
            _ => None,
        },
        _ => None,
    }
}

fn lower_value(
    def: &QuantityDef,
    p: &ast::Prop,
    diags: &mut Vec<Diagnostic>,
) -> Option<(Content, Option<String>)> {
    let expr = match &p.value {
        ast::PropValue::Text(t, span) => {
            if def.text {
                return Some((Content::Text(t.clone()), None));
            }
            diags.push(
                Diagnostic::new(
                    Rule::UnitMismatch,
                    *span,
                    format!("'{}' takes {}, not text", def.name, def.dim.describe()),
                )
                .with_help(format!(
                    "write a number with a unit, e.g. `{} = 1.0 {}`",
                    def.name,
                    unit_suffix(def)
                )),
            );
            return None;
        }
        ast::PropValue::Expr(e) => e,
    };
    if def.text {
        diags.push(
            Diagnostic::new(
                Rule::UnitMismatch,
                expr.span,
                format!("'{}' takes text in quotes", def.name),
            )
            .with_help(format!("write `{} = \"K0V\"`", def.name)),
        );
        return None;
    }
    let Some((sign, lit)) = literal_of(expr) else {
        if p.relation != Relation::Equal {
            diags.push(
                Diagnostic::new(
                    Rule::InvalidValue,
                    expr.span,
                    "a limit takes a single number with a unit",
                )
                .with_help(format!(
                    "write `{} < 0.1 {}`",
                    def.name,
                    unit_suffix(def)
                )),
            );
            return None;
        }
        return Some((Content::Expr(expr.clone()), None));
    };
    let unit = match &lit.unit {
        None => units::Unit::one(),
        Some(u) => match units::resolve(u) {
            Ok(u) => u,
            Err(errs) => {
                for (span, e) in errs {
                    diags.push(unknown_unit(span, &e));
                }
                return None;
            }
        },
    };
    if unit.dim != def.dim {
        diags.push(mismatch_for(def, &unit, lit, expr.span));
        return None;
    }
    let value = sign * lit.value * unit.factor;
    let (below, above, form) = match (&lit.uncertainty, p.relation) {
        (Uncertainty::None, Relation::Equal) => (0.0, 0.0, Form::Exact),
        (Uncertainty::None, Relation::Below) => (0.0, 0.0, Form::UpperLimit),
        (Uncertainty::None, Relation::Above) => (0.0, 0.0, Form::LowerLimit),
        (Uncertainty::Symmetric(s, _), Relation::Equal) => {
            (s * unit.factor, s * unit.factor, Form::Symmetric)
        }
        (Uncertainty::Asymmetric { plus, minus, .. }, Relation::Equal) => {
            (minus * unit.factor, plus * unit.factor, Form::Asymmetric)
        }
        (_, _) => {
            diags.push(
                Diagnostic::new(
                    Rule::InvalidValue,
                    expr.span,
                    "a limit takes a single value, without an uncertainty",
                )
                .with_help(format!(
                    "write `{} < VALUE {}`, or give the value with its uncertainty after '='",
                    def.name,
                    unit_suffix(def)
                )),
            );
            return None;
        }
    };
    if !value.is_finite() || !below.is_finite() || !above.is_finite() {
        diags.push(
            Diagnostic::new(
                Rule::InvalidValue,
                expr.span,
                "this number is too large to represent",
            )
            .with_note("values must be finite 64-bit floating-point numbers"),
        );
        return None;
    }
    if unit.factor != 0.0 && value != 0.0 && value.abs() < f64::MIN_POSITIVE {
        diags.push(Diagnostic::new(
            Rule::InvalidValue,
            expr.span,
            "this number is too small to represent",
        ));
        return None;
    }
    if !def.in_range(value) {
        let what = match form {
            Form::UpperLimit => "upper limit",
            Form::LowerLimit => "lower limit",
            _ => "value",
        };
        let range = def.range_text();
        let written = crate::format::number(sign * lit.value);
        let written = if unit.text.is_empty() {
            written
        } else {
            format!("{written} {}", unit.text)
        };
        let mut d = Diagnostic::new(
            Rule::OutOfRange,
            expr.span,
            format!(
                "the {what} {written} lies outside the valid range of '{}': {range}",
                def.name
            ),
        );
        if def.qty == Qty::Eccentricity && value >= 1.0 {
            d = d.with_note("an eccentricity of 1 or more describes an unbound orbit");
        }
        diags.push(d);
        return None;
    }
    let written = lit.unit.as_ref().map(units::unit_text);
    Some((
        Content::Measured(Measurement {
            value,
            below,
            above,
            form,
        }),
        written,
    ))
}

pub(crate) fn unknown_unit(span: Span, e: &units::UnknownUnit) -> Diagnostic {
    let d = Diagnostic::new(
        Rule::UnknownUnit,
        span,
        format!("unknown unit '{}'", e.symbol),
    );
    match e.suggestion {
        Some(s) => d.with_help(format!("did you mean '{s}'?")),
        None => {
            d.with_help("see the unit table in docs/language.md; to multiply by a value, write '*'")
        }
    }
}

fn mismatch_for(
    def: &QuantityDef,
    unit: &units::Unit,
    lit: &ast::Literal,
    span: Span,
) -> Diagnostic {
    let found = if lit.unit.is_none() {
        "a number without a unit".to_string()
    } else {
        format!("'{}', {}", unit.text, unit.dim.describe())
    };
    let mut d = Diagnostic::new(
        Rule::UnitMismatch,
        span,
        format!(
            "'{}' is {}, but the value is {found}",
            def.name,
            def.dim.describe()
        ),
    );
    let value = crate::format::number(lit.value);
    if lit.unit.is_none() {
        d = d.with_help(format!(
            "add a unit: `{} = {value} {}`",
            def.name,
            unit_suffix(def)
        ));
        if def.dim == Dimension::ANGLE {
            d = d.with_note("angles and plain numbers are different types: write `deg` or `rad`");
        }
    } else if def.dim == Dimension::NONE {
        d = d.with_help(format!(
            "'{}' is a plain number; drop the unit or use % or ppm",
            def.name
        ));
    } else {
        d = d.with_help(format!(
            "use a unit of {}, such as {}",
            def.dim.describe(),
            def.display
        ));
    }
    d
}

/// Scope for resolving names inside expressions.
struct Scope<'a> {
    sys: &'a System,
    body: Option<usize>,
}

fn check_expressions(sys: &mut System, diags: &mut Vec<Diagnostic>) {
    let any = !sys.lets.is_empty()
        || sys.bodies.iter().any(|b| {
            !b.lets.is_empty()
                || b.declared
                    .iter()
                    .any(|d| matches!(d.content, Content::Expr(_)))
        });
    if !any {
        return;
    }
    // Infer with the system read-only, then write the results back.
    let view: &System = sys;
    let sys_dims: Vec<Option<Dimension>> = view
        .lets
        .iter()
        .map(|l| {
            let scope = Scope {
                sys: view,
                body: None,
            };
            infer(&l.expr, &scope, &mut vec![l.name.clone()], diags)
        })
        .collect();
    let mut updates = Vec::new();
    for (bi, body) in view.bodies.iter().enumerate() {
        let scope = Scope {
            sys: view,
            body: Some(bi),
        };
        let let_dims: Vec<Option<Dimension>> = body
            .lets
            .iter()
            .map(|l| {
                infer(
                    &l.expr,
                    &scope,
                    &mut vec![format!("{}.{}", body.id, l.name)],
                    diags,
                )
            })
            .collect();
        let mut drop = Vec::new();
        for (di, decl) in body.declared.iter().enumerate() {
            let Content::Expr(e) = &decl.content else {
                continue;
            };
            let def = quantities::def(decl.qty);
            match infer(e, &scope, &mut Vec::new(), diags) {
                Some(d) if d == def.dim => {}
                Some(d) => {
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
                    drop.push(di);
                }
                None => drop.push(di),
            }
        }
        updates.push((let_dims, drop));
    }
    for (l, d) in sys.lets.iter_mut().zip(sys_dims) {
        l.dim = d;
    }
    for (b, (let_dims, drop)) in sys.bodies.iter_mut().zip(updates) {
        for (l, d) in b.lets.iter_mut().zip(let_dims) {
            l.dim = d;
        }
        let mut i = 0;
        b.declared.retain(|_| {
            let keep = !drop.contains(&i);
            i += 1;
            keep
        });
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

fn lookup_let<'a>(scope: &'a Scope<'a>, name: &str) -> Option<(&'a LetInfo, String)> {
    if let Some(b) = scope.body.and_then(|i| scope.sys.bodies.get(i)) {
        if let Some(l) = b.lets.iter().find(|l| l.name == name) {
            return Some((l, format!("{}.{}", b.id, l.name)));
        }
    }
    scope
        .sys
        .lets
        .iter()
        .find(|l| l.name == name)
        .map(|l| (l, l.name.clone()))
}

/// The dimension of an expression; `None` after reporting why it has none.
fn infer(
    e: &ast::Expr,
    scope: &Scope,
    visiting: &mut Vec<String>,
    diags: &mut Vec<Diagnostic>,
) -> Option<Dimension> {
    match &e.kind {
        ExprKind::Error => None,
        ExprKind::Literal(l) => {
            if !l.value.is_finite() {
                diags.push(Diagnostic::new(
                    Rule::InvalidValue,
                    l.value_span,
                    "this number is too large to represent",
                ));
                return None;
            }
            match &l.unit {
                None => Some(Dimension::NONE),
                Some(u) => match units::resolve(u) {
                    Ok(u) => Some(u.dim),
                    Err(errs) => {
                        for (span, err) in errs {
                            diags.push(unknown_unit(span, &err));
                        }
                        None
                    }
                },
            }
        }
        ExprKind::Name(id) => {
            if let Some((l, key)) = lookup_let(scope, &id.name) {
                if visiting.contains(&key) {
                    diags.push(
                        Diagnostic::new(
                            Rule::InvalidValue,
                            id.span,
                            format!("'{}' is defined in terms of itself", id.name),
                        )
                        .with_label(l.name_span, "bound here"),
                    );
                    return None;
                }
                visiting.push(key);
                let d = infer(&l.expr, scope, visiting, &mut Vec::new());
                visiting.pop();
                return d;
            }
            if let Some((_, d, _)) = constant(&id.name) {
                return Some(d);
            }
            let mut d = Diagnostic::new(
                Rule::UnknownName,
                id.span,
                format!("'{}' is neither a 'let' binding nor a constant", id.name),
            );
            let mut names: Vec<&str> = vec!["pi", "G", "c", "sigma_sb"];
            if let Some(b) = scope.body.and_then(|i| scope.sys.bodies.get(i)) {
                names.extend(b.lets.iter().map(|l| l.name.as_str()));
            }
            names.extend(scope.sys.lets.iter().map(|l| l.name.as_str()));
            if let Some(s) = crate::text::closest(&id.name, names) {
                d = d.with_help(format!("did you mean '{s}'?"));
            } else if units::lookup(&id.name).is_some() {
                d = d.with_help(format!("a unit follows a number: write `1 {}`", id.name));
            } else {
                d = d.with_help("to use a quantity of a body, write `body.quantity`");
            }
            diags.push(d);
            None
        }
        ExprKind::Ref(b, q) => {
            let Some(bi) = scope.sys.body(&b.name) else {
                let mut d = Diagnostic::new(
                    Rule::UnknownBody,
                    b.span,
                    format!("no body '{}' in system \"{}\"", b.name, scope.sys.name),
                );
                if let Some(s) =
                    crate::text::closest(&b.name, scope.sys.bodies.iter().map(|x| x.id.as_str()))
                {
                    d = d.with_help(format!("did you mean '{s}'?"));
                }
                diags.push(d);
                return None;
            };
            let kind = scope.sys.bodies.get(bi).map_or(BodyKind::Star, |x| x.kind);
            match quantities::find(kind, &q.name) {
                Some(def) if !def.text => Some(def.dim),
                Some(def) => {
                    diags.push(Diagnostic::new(
                        Rule::UnitMismatch,
                        q.span,
                        format!("'{}' is text and cannot be used in arithmetic", def.name),
                    ));
                    None
                }
                None => {
                    diags.push(unknown_quantity(kind, q));
                    None
                }
            }
        }
        ExprKind::Neg(inner) => infer(inner, scope, visiting, diags),
        ExprKind::Binary(op, a, b) => {
            let da = infer(a, scope, visiting, diags);
            let db = infer(b, scope, visiting, diags);
            let (da, db) = (da?, db?);
            match op {
                BinOp::Mul => Some(da.times(db)),
                BinOp::Div => Some(da.per(db)),
                BinOp::Add | BinOp::Sub => {
                    if da == db {
                        Some(da)
                    } else {
                        diags.push(
                            Diagnostic::new(
                                Rule::UnitMismatch,
                                e.span,
                                format!(
                                    "cannot {} {} and {}",
                                    if *op == BinOp::Add { "add" } else { "subtract" },
                                    da.describe(),
                                    db.describe()
                                ),
                            )
                            .with_label(a.span, format!("this is {}", da.describe()))
                            .with_label(b.span, format!("this is {}", db.describe()))
                            .with_help(format!(
                                "multiply the right-hand side by a factor of {}",
                                da.per(db).describe()
                            )),
                        );
                        None
                    }
                }
            }
        }
        ExprKind::Pow(base, exp) => {
            let db = infer(base, scope, visiting, diags)?;
            let de = infer(exp, scope, visiting, diags)?;
            if !de.is_none() {
                diags.push(Diagnostic::new(
                    Rule::UnitMismatch,
                    exp.span,
                    format!(
                        "an exponent must be a plain number, but this is {}",
                        de.describe()
                    ),
                ));
                return None;
            }
            if db.is_none() {
                return Some(Dimension::NONE);
            }
            match const_value(exp).and_then(rational) {
                Some(r) => Some(db.pow(r)),
                None => {
                    diags.push(
                        Diagnostic::new(Rule::UnitMismatch, exp.span, "the exponent of a value with a unit must be an exact fraction such as 2, 0.5 or 1/3")
                            .with_label(base.span, format!("this is {}", db.describe())),
                    );
                    None
                }
            }
        }
        ExprKind::Call(f, args) => {
            let dims: Vec<Option<Dimension>> = args
                .iter()
                .map(|a| infer(a, scope, visiting, diags))
                .collect();
            if args.len() != 1 {
                diags.push(Diagnostic::new(
                    Rule::InvalidValue,
                    e.span,
                    format!("'{}' takes one argument, found {}", f.name, args.len()),
                ));
                return None;
            }
            let d = dims.into_iter().next().flatten()?;
            let arg_span = args.first().map_or(e.span, |a| a.span);
            let need = |want: Dimension, what: &str, diags: &mut Vec<Diagnostic>| {
                if d == want {
                    true
                } else {
                    diags.push(Diagnostic::new(
                        Rule::UnitMismatch,
                        arg_span,
                        format!("'{}' takes {what}, but this is {}", f.name, d.describe()),
                    ));
                    false
                }
            };
            match f.name.as_str() {
                "sqrt" => Some(d.pow(Rat::new(1, 2))),
                "cbrt" => Some(d.pow(Rat::new(1, 3))),
                "abs" => Some(d),
                "exp" | "ln" | "log10" => {
                    need(Dimension::NONE, "a plain number", diags).then_some(Dimension::NONE)
                }
                "sin" | "cos" | "tan" => {
                    need(Dimension::ANGLE, "an angle", diags).then_some(Dimension::NONE)
                }
                _ => {
                    let mut d = Diagnostic::new(
                        Rule::UnknownName,
                        f.span,
                        format!("unknown function '{}'", f.name),
                    );
                    if let Some(s) = crate::text::closest(&f.name, FUNCTIONS.iter().copied()) {
                        d = d.with_help(format!("did you mean '{s}'?"));
                    } else {
                        d = d.with_help(format!("the functions are {}", FUNCTIONS.join(", ")));
                    }
                    diags.push(d);
                    None
                }
            }
        }
    }
}

/// The value of an exact, unitless constant expression (for exponents).
pub(crate) fn const_value(e: &ast::Expr) -> Option<f64> {
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

/// Index of every body by id per system, for front ends.
pub fn body_index(model: &Model) -> HashMap<(usize, String), usize> {
    let mut m = HashMap::new();
    for (si, s) in model.systems.iter().enumerate() {
        for (bi, b) in s.bodies.iter().enumerate() {
            m.insert((si, b.id.clone()), bi);
        }
    }
    m
}
