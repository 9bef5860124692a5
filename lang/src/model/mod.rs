//! The semantic model: the syntax tree resolved into systems, bodies and typed quantities.
//!
//! Lowering resolves names (bodies per system, refs per file, `let` bindings per body and
//! system), converts every literal measurement to SI, checks each value's dimension against
//! its quantity and its range, and infers the dimension of every expression. Problems become
//! diagnostics; the offending value is dropped and lowering goes on, so one mistake never
//! hides the rest.

pub mod limits;
mod props;
mod resolve;
mod value;
pub mod what_if;

use crate::ast::{self, BodyKind};
use crate::catalogue::SharedRefs;
use crate::diagnostic::{Diagnostic, Rule};
use crate::quantities::Qty;
use crate::source::{FileId, Span};
use crate::units::Dimension;
pub use resolve::{Func, LetId, Node, Resolved, UncertainLiteral};
use rustc_hash::{FxHashMap, FxHashSet};
use std::sync::Arc;

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

impl Measurement {
    /// Whether the derivations can use it as a quantity `def`: a limit is sampled up to the
    /// other end of the quantity's range, so that end must be finite (`mass > 1 Mjup` has
    /// none).
    pub fn can_be_sampled(&self, def: &crate::quantities::QuantityDef) -> bool {
        let (lo, hi) = def.limits();
        match self.form {
            Form::UpperLimit => lo.is_finite(),
            Form::LowerLimit => hi.is_finite(),
            _ => true,
        }
    }

    /// Exactly `v`: no uncertainty, and not a limit (`eccentricity = 0`).
    pub fn is_exactly(&self, v: f64) -> bool {
        self.value == v && self.below == 0.0 && self.above == 0.0 && !self.form.is_limit()
    }
}

#[derive(Debug, Clone, PartialEq)]
pub enum Content {
    Measured(Measurement),
    /// An expression, resolved (see [`resolve`]).
    Expr(Resolved),
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
    /// Marked `preferred`: of several declarations of the quantity, the one derivations use.
    pub preferred: bool,
    pub citations: Vec<(String, Span)>,
    /// The unit as written, when the value is a literal with a unit (`JD_UTC` for a
    /// transit epoch written as an ISO 8601 timestamp).
    pub written_unit: Option<crate::ast::Name>,
    /// The timestamp as written, for a time given as ISO 8601 text.
    pub timestamp: Option<String>,
    /// For a value set on the command line in place of the file's (`--set`, see
    /// [`what_if`]): the sentence that says so.
    pub set: Option<String>,
}

#[derive(Debug, Clone, PartialEq)]
pub struct LetInfo {
    pub name: String,
    pub name_span: Span,
    /// The resolved value; `None` when it could not be resolved (reported).
    pub value: Option<Resolved>,
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
    /// The first declaration of each quantity (the first one that could be read).
    pub declared: Vec<Declared>,
    /// Further declarations of quantities in `declared`, each citing its own source
    /// (several published values of one quantity), in file order.
    pub further: Vec<Declared>,
    /// Quantities written whose value could not be used (a wrong unit, a value out of range,
    /// ...), each with the declaration; an error says why. Only those with no declaration
    /// that could be read, so that what needs them can say so rather than "not declared".
    pub refused: Vec<(Qty, Span)>,
    pub lets: Vec<LetInfo>,
}

impl Body {
    pub fn get(&self, qty: Qty) -> Option<&Declared> {
        self.declared.iter().find(|d| d.qty == qty)
    }

    /// Whether it declares something only a transit gives (a depth, radius ratio, impact
    /// parameter, duration or transit epoch): a planet known to transit, not one whose depth
    /// is merely derivable from a declared radius.
    pub fn declares_transit_quantity(&self) -> bool {
        [
            Qty::TransitDepth,
            Qty::RadiusRatio,
            Qty::Impact,
            Qty::TransitDuration,
            Qty::TransitDurationFull,
            Qty::TransitEpoch,
        ]
        .iter()
        .any(|q| self.get(*q).is_some())
    }

    /// Every declaration of `qty`, in file order: one, or several published values.
    pub fn sources(&self, qty: Qty) -> Vec<&Declared> {
        let mut all: Vec<&Declared> = self
            .declared
            .iter()
            .chain(&self.further)
            .filter(|d| d.qty == qty)
            .collect();
        all.sort_by_key(|d| d.span.start);
        all
    }
}

#[derive(Debug, Clone, PartialEq)]
pub struct System {
    pub name: String,
    pub name_span: Span,
    pub span: Span,
    pub bodies: Vec<Body>,
    pub lets: Vec<LetInfo>,
    /// The bindings that resolved, each after those it uses: the order to evaluate them in.
    pub let_order: Vec<LetId>,
    /// The bodies declared past [`limits::MAX_SYSTEM_BODIES`], which are not read: each id
    /// and where the body is written.
    pub not_read: Vec<(String, Span)>,
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
    /// The declaration; for a shared reference, the first citation of it in this file.
    pub span: Span,
    pub id_span: Span,
    /// For a shared reference (declared in a file the project file names): that declaration.
    /// `None` for the file's own.
    pub shared: Option<crate::catalogue::SharedRef>,
}

#[derive(Debug, Clone, PartialEq, Default)]
pub struct Model {
    pub file: FileId,
    /// The file's own references, then the shared references it cites.
    pub refs: Vec<RefInfo>,
    /// Every shared reference the file could cite (for completion).
    pub shared: Arc<SharedRefs>,
    pub systems: Vec<System>,
    pub comments: Vec<ast::Comment>,
    /// Where each id of `refs` is, built at the first [`Model::reference`] (outputs look up
    /// a reference per citation: a scan would be quadratic in the references).
    pub ref_index: RefIndex,
}

/// A cache of where each reference is: not part of what a model says, so two models that
/// differ only in whether it was built yet are equal and print alike.
#[derive(Clone, Default)]
pub struct RefIndex(std::sync::OnceLock<FxHashMap<String, usize>>);

impl PartialEq for RefIndex {
    fn eq(&self, _: &RefIndex) -> bool {
        true
    }
}

impl std::fmt::Debug for RefIndex {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str("RefIndex")
    }
}

impl Model {
    /// The reference of this id (the file's own or a shared one it cites). For outputs, once
    /// `refs` is complete.
    pub fn reference(&self, id: &str) -> Option<&RefInfo> {
        let index = self.ref_index.0.get_or_init(|| {
            let mut index = FxHashMap::default();
            for (i, r) in self.refs.iter().enumerate() {
                // The first of an id, as a scan finds it.
                index.entry(r.id.clone()).or_insert(i);
            }
            index
        });
        index.get(id).and_then(|&i| self.refs.get(i))
    }
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
    Lowering::default().lower(file, ast, None, diags)
}

/// What lowering remembers from one part of a file to the next when a file is read in
/// parts (`crate::parts`): the systems and references declared so far, so that a name
/// declared twice is reported however far apart the two are.
#[derive(Debug, Default)]
pub struct Lowering {
    systems: FxHashMap<String, Span>,
    refs: FxHashMap<String, Span>,
    shared: Arc<SharedRefs>,
    /// The bound on the work of this file's did-you-mean hints.
    hints: crate::text::Hints,
}

impl Lowering {
    /// Lowering where citations may also name the project's shared references.
    pub fn with_shared(shared: Arc<SharedRefs>) -> Lowering {
        Lowering {
            shared,
            ..Lowering::default()
        }
    }

    /// Lower the declarations of `ast`. `all_refs` are the file's references when `ast` is
    /// only a part of it (read ahead, so a citation may name a reference declared later in
    /// the file); `None` when `ast` is the whole file.
    pub fn lower(
        &mut self,
        file: FileId,
        ast: &ast::File,
        all_refs: Option<&[RefInfo]>,
        diags: &mut Vec<Diagnostic>,
    ) -> Model {
        let mut model = Model {
            file,
            comments: ast.comments.clone(),
            shared: self.shared.clone(),
            ..Model::default()
        };
        // Where the parser found errors, sorted once: an empty body there is one whose lines
        // did not parse, which the syntax error already says.
        let mut parse_errors: Vec<(FileId, u32)> =
            diags.iter().map(|d| (d.span.file, d.span.start)).collect();
        parse_errors.sort_unstable();
        for r in &ast.refs {
            if let Some(prev) = self.refs.get(r.id.name.as_str()) {
                diags.push(
                    Diagnostic::new(
                        Rule::Duplicate,
                        r.id.span,
                        format!("reference '{}' is declared twice", r.id.name),
                    )
                    .with_label(*prev, "first declared here"),
                );
                continue;
            }
            self.refs.insert(r.id.name.to_string(), r.id.span);
            if let Some(d) = shadowing(r, &self.shared) {
                diags.push(d);
            }
            model.refs.push(ref_info(r));
        }
        if let Some(all) = all_refs {
            model.refs = all.to_vec();
        }
        let own = model.refs.len();
        // Citations are looked up here, once per citation, however many references.
        let known: FxHashSet<&str> = model.refs.iter().map(|r| r.id.as_str()).collect();
        let cites = Cites {
            refs: &model.refs,
            known: &known,
            shared: &self.shared,
            hints: &self.hints,
        };
        for s in &ast.systems {
            if !s.name.is_empty() {
                if let Some(prev) = self.systems.get(s.name.as_str()) {
                    diags.push(
                        Diagnostic::new(
                            Rule::Duplicate,
                            s.name_span,
                            format!("system \"{}\" is declared twice in this file", s.name),
                        )
                        .with_label(*prev, "first declared here"),
                    );
                } else {
                    self.systems.insert(s.name.clone(), s.name_span);
                }
            }
            let sys = lower_system(s, &cites, diags);
            note_empty_bodies(s, &sys, &parse_errors, diags);
            model.systems.push(sys);
        }
        add_shared_cited(&mut model, own);
        model
    }
}

/// Add to the model's references the shared ones its declarations cite (each once, placed at
/// its first citation), after the `own` references of the file.
fn add_shared_cited(model: &mut Model, own: usize) {
    if model.shared.is_empty() {
        return;
    }
    let mut known: std::collections::HashSet<String> =
        model.refs.iter().take(own).map(|r| r.id.clone()).collect();
    let mut added = Vec::new();
    let decls = model
        .systems
        .iter()
        .flat_map(|s| &s.bodies)
        .flat_map(|b| b.declared.iter().chain(&b.further));
    for d in decls {
        for (id, span) in &d.citations {
            if known.contains(id) {
                continue;
            }
            if let Some(r) = model.shared.get(id) {
                known.insert(id.clone());
                added.push(RefInfo {
                    id: id.clone(),
                    text: r.text.clone(),
                    span: *span,
                    id_span: *span,
                    shared: Some(r.clone()),
                });
            }
        }
    }
    added.sort_by_key(|r| r.span.start);
    model.refs.extend(added);
}

/// A file's own reference that has the id of a shared one with another text.
fn shadowing(r: &ast::RefDecl, shared: &SharedRefs) -> Option<Diagnostic> {
    let s = shared.get(&r.id.name)?;
    if same_text(&s.text, &r.text) {
        return None;
    }
    Some(
        Diagnostic::new(
            Rule::RefShadowsShared,
            r.id.span,
            format!(
                "reference '{}' is also a shared reference ({}) with another text; this file's own is used",
                r.id.name,
                s.place()
            ),
        )
        .with_note(format!("this file: \"{}\"; shared: \"{}\"", r.text, s.text))
        .with_help(format!(
            "if both are the same source, delete this `ref` and cite the shared one; else give this one another id than '{}'",
            r.id.name
        )),
    )
}

/// Whether two reference texts name the same source: equal but for case and runs of white
/// space.
pub fn same_text(a: &str, b: &str) -> bool {
    normalized_text(a) == normalized_text(b)
}

/// A reference text with case folded and white space collapsed, trimmed: what two citations
/// of the same paper have in common however they were typed.
pub fn normalized_text(t: &str) -> String {
    t.split_whitespace()
        .map(str::to_lowercase)
        .collect::<Vec<_>>()
        .join(" ")
}

/// The references of a file, as lowering keeps them: the first declaration of each id.
pub fn first_refs<'a>(refs: impl IntoIterator<Item = &'a ast::RefDecl>) -> Vec<RefInfo> {
    let mut seen = std::collections::HashSet::new();
    refs.into_iter()
        .filter(|r| seen.insert(r.id.name.as_str()))
        .map(ref_info)
        .collect()
}

fn ref_info(r: &ast::RefDecl) -> RefInfo {
    RefInfo {
        id: r.id.name.to_string(),
        text: r.text.clone(),
        span: r.span,
        id_span: r.id.span,
        shared: None,
    }
}

/// What a citation is checked against: the file's references (and their ids, to look one
/// up), the shared ones, and the bound on hints.
struct Cites<'a> {
    refs: &'a [RefInfo],
    known: &'a FxHashSet<&'a str>,
    shared: &'a SharedRefs,
    hints: &'a crate::text::Hints,
}

fn lower_system(s: &ast::SystemDecl, cites: &Cites, diags: &mut Vec<Diagnostic>) -> System {
    let (lets, let_syntax) = lower_lets(&s.lets, diags);
    let mut sys = System {
        name: s.name.clone(),
        name_span: s.name_span,
        span: s.span,
        bodies: Vec::new(),
        lets,
        let_order: Vec::new(),
        not_read: Vec::new(),
    };
    // First pass: bodies and their identifiers, so that references can be resolved in any order.
    let mut seen: FxHashMap<&str, usize> = FxHashMap::default();
    let mut body_syntax: Vec<&ast::BodyDecl> = Vec::new();
    let mut body_let_syntax: Vec<Vec<&ast::Expr>> = Vec::new();
    for b in &s.bodies {
        if let Some(prev) = seen
            .get(b.name.name.as_str())
            .and_then(|&i| sys.bodies.get(i))
        {
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
        if sys.bodies.len() >= limits::MAX_SYSTEM_BODIES {
            let first = sys.not_read.is_empty();
            diags.push(limits::too_many_bodies(s, b, first));
            sys.not_read.push((b.name.name.to_string(), b.span));
            continue;
        }
        seen.insert(&b.name.name, sys.bodies.len());
        let (lets, syntax) = lower_lets(&b.lets, diags);
        body_syntax.push(b);
        body_let_syntax.push(syntax);
        sys.bodies.push(Body {
            id: b.name.name.to_string(),
            kind: b.kind,
            name_span: b.name.span,
            span: b.span,
            orbits: None,
            orbits_span: b.orbits.as_ref().map(|o| o.span),
            declared: Vec::new(),
            further: Vec::new(),
            refused: Vec::new(),
            lets,
        });
    }
    // Bindings, in dependency order, then every body's properties.
    let mut resolver = resolve::Resolver::new(&sys, cites.hints);
    let syntax = |id: LetId| match id.body {
        None => let_syntax.get(id.index).copied(),
        Some(b) => body_let_syntax.get(b)?.get(id.index).copied(),
    };
    let bindings = resolver.bindings(&syntax, diags);
    let lowered: Vec<(Option<usize>, props::Props)> = body_syntax
        .iter()
        .enumerate()
        .map(|(bi, b)| {
            let orbits = b
                .orbits
                .as_ref()
                .and_then(|o| resolve::resolve_host(&sys, o, cites.hints, diags));
            (orbits, props::lower(b, bi, cites, &resolver, diags))
        })
        .collect();
    drop(resolver);
    for (body, (orbits, props)) in sys.bodies.iter_mut().zip(lowered) {
        body.orbits = orbits;
        body.declared = props.first;
        body.further = props.further;
        body.refused = props.refused;
    }
    for (id, value, dim) in bindings.resolved {
        let slot = match id.body {
            None => sys.lets.get_mut(id.index),
            Some(b) => sys.bodies.get_mut(b).and_then(|b| b.lets.get_mut(id.index)),
        };
        if let Some(l) = slot {
            l.value = value;
            l.dim = dim;
        }
    }
    sys.let_order = bindings.order;
    sys
}

/// A body written with nothing in it (an imported star whose cells were all empty, say):
/// nothing resting on it is derived, which `check` would otherwise pass in silence. Not
/// where something was written but did not parse (`parse_errors`, sorted): that error says
/// so already.
fn note_empty_bodies(
    s: &ast::SystemDecl,
    sys: &System,
    parse_errors: &[(FileId, u32)],
    diags: &mut Vec<Diagnostic>,
) {
    let mut planets = vec![0usize; sys.bodies.len()];
    for host in sys.bodies.iter().filter_map(|b| b.orbits) {
        if let Some(n) = planets.get_mut(host) {
            *n += 1;
        }
    }
    // The lowered bodies are the written ones in order, less those declared twice: walk
    // both together.
    let mut lowered = sys.bodies.iter().zip(planets).peekable();
    for b in &s.bodies {
        let Some((_, planets)) = lowered.next_if(|(l, _)| l.name_span == b.name.span) else {
            continue;
        };
        if !(b.props.is_empty() && b.lets.is_empty()) {
            continue;
        }
        let from = parse_errors.partition_point(|&e| e < (b.span.file, b.span.start));
        if parse_errors
            .get(from)
            .is_some_and(|&(f, at)| f == b.span.file && at < b.span.end)
        {
            continue;
        }
        let what = match (b.kind, planets) {
            (BodyKind::Star, 0) | (BodyKind::Planet, _) => "nothing is derived for it".to_string(),
            (BodyKind::Star, 1) => "nothing that needs the star (its planet's semi-major axis, mass or temperature) is derived".to_string(),
            (BodyKind::Star, n) => format!("nothing that needs the star (its {n} planets' semi-major axes, masses or temperatures) is derived"),
        };
        diags.push(
            Diagnostic::new(
                Rule::NotDerivable,
                b.name.span,
                format!(
                    "{} '{}' declares no value, so {what}",
                    b.kind.as_str(),
                    b.name.name
                ),
            )
            .with_help(match b.kind {
                BodyKind::Star => "declare its measurements: mass, radius, teff, ...",
                BodyKind::Planet => {
                    "declare its measurements: period, rv_amplitude, transit_depth, ..."
                }
            }),
        );
    }
}

/// The bindings of one scope, and each one's expression (a name bound twice keeps the first).
fn lower_lets<'a>(
    lets: &'a [ast::LetDecl],
    diags: &mut Vec<Diagnostic>,
) -> (Vec<LetInfo>, Vec<&'a ast::Expr>) {
    let mut out: Vec<LetInfo> = Vec::new();
    let mut syntax = Vec::new();
    let mut seen: FxHashMap<&str, Span> = FxHashMap::default();
    for l in lets {
        if let Some(prev) = seen.get(l.name.name.as_str()) {
            diags.push(
                Diagnostic::new(
                    Rule::Duplicate,
                    l.name.span,
                    format!("'{}' is bound twice in this scope", l.name.name),
                )
                .with_label(*prev, "first bound here"),
            );
            continue;
        }
        seen.insert(&l.name.name, l.name.span);
        out.push(LetInfo {
            name: l.name.name.to_string(),
            name_span: l.name.span,
            value: None,
            dim: None,
            span: l.span,
        });
        syntax.push(&l.value);
    }
    (out, syntax)
}

#[cfg(test)]
mod tests;
