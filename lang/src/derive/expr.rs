//! Evaluating resolved expressions: `let` bindings and declared expressions.
//!
//! Each binding is evaluated once, in the order lowering found (every binding after those it
//! uses), and its value is kept; an expression that uses it takes the kept value. An
//! expression waits while a quantity it uses is not known yet and is tried again in the next
//! round of the engine. Whatever still waits when the engine has nothing more to derive gets
//! a diagnostic that names what it needs, so no declared value disappears without a word.

use super::{value, Derivation, Entry, Key, Origin, Value};
use crate::ast::BinOp;
use crate::diagnostic::{Diagnostic, Rule};
use crate::model::{Content, LetId, Node, Resolved};
use crate::quantities;
use crate::source::Span;
use rustc_hash::{FxHashMap, FxHashSet};

#[derive(Debug)]
pub(super) enum Pending {
    /// A referenced quantity is not known yet.
    Waiting,
    /// The expression cannot be evaluated (reported).
    Failed,
}

/// A binding's state once evaluated.
pub(super) enum Binding {
    /// Its value and the quantities it used.
    Ready(Value, Vec<Key>),
    /// It cannot be evaluated (reported).
    Failed,
    /// Every expression that uses it is done; its value (and samples) were freed.
    Freed,
}

/// How many places still use each binding: a binding's value is freed when the count
/// reaches zero, so a long chain of bindings holds two values at a time, not all of them.
pub(super) fn binding_uses(sys: &crate::model::System) -> FxHashMap<LetId, usize> {
    let mut uses = FxHashMap::default();
    let lets = sys
        .lets
        .iter()
        .chain(sys.bodies.iter().flat_map(|b| b.lets.iter()))
        .filter_map(|l| l.value.as_ref());
    let declared = sys
        .bodies
        .iter()
        .flat_map(|b| &b.declared)
        .filter_map(|d| match &d.content {
            Content::Expr(e) => Some(e),
            _ => None,
        });
    for e in lets.chain(declared) {
        e.walk(|n| {
            if let Node::Binding(id) = n.node {
                *uses.entry(id).or_insert(0) += 1;
            }
        });
    }
    uses
}

fn is_waiting<T>(r: &Result<T, Pending>) -> bool {
    matches!(r, Err(Pending::Waiting))
}

impl<'m> Derivation<'m> {
    /// The resolved expression of a binding.
    fn binding_expr(&self, id: LetId) -> Option<&'m Resolved> {
        let sys = self.sys;
        let info = match id.body {
            None => sys.lets.get(id.index),
            Some(b) => sys.bodies.get(b)?.lets.get(id.index),
        };
        info?.value.as_ref()
    }

    /// A binding's name as written (`x`, or `body.x` for one inside a body).
    fn binding_name(&self, id: LetId) -> String {
        let sys = self.sys;
        match id.body {
            None => sys.lets.get(id.index).map(|l| l.name.clone()),
            Some(b) => sys.bodies.get(b).and_then(|body| {
                let l = body.lets.get(id.index)?;
                Some(format!("{}.{}", body.id, l.name))
            }),
        }
        .unwrap_or_else(|| "?".to_string())
    }

    /// The resolved expression declared for a quantity.
    fn declared_expr(&self, key: Key) -> Option<&'m Resolved> {
        let sys = self.sys;
        match &sys.bodies.get(key.0)?.get(key.1)?.content {
            Content::Expr(e) => Some(e),
            _ => None,
        }
    }

    pub(super) fn eval_binding(&mut self, id: LetId) -> Result<(), Pending> {
        let e = self.binding_expr(id).ok_or(Pending::Failed)?;
        let mut refs = Vec::new();
        self.naming = (self.binding_name(id), 0);
        let outcome = self.eval(e, &mut refs);
        let failed = matches!(outcome, Err(Pending::Failed));
        let state = match outcome {
            Ok(v) => {
                refs.sort_unstable();
                refs.dedup();
                Binding::Ready(v, refs)
            }
            Err(Pending::Failed) => Binding::Failed,
            Err(Pending::Waiting) => return Err(Pending::Waiting),
        };
        self.bindings.insert(id, state);
        if self.binding_uses.get(&id).copied().unwrap_or(0) == 0 {
            // Nothing uses it: keep only the fact that it was evaluated.
            self.bindings.insert(id, Binding::Freed);
        }
        self.done_with(e);
        if failed {
            Err(Pending::Failed)
        } else {
            Ok(())
        }
    }

    /// An expression is finished (evaluated or failed): release the bindings it used.
    fn done_with(&mut self, e: &Resolved) {
        let mut freed = Vec::new();
        e.walk(|n| {
            if let Node::Binding(id) = n.node {
                if let Some(count) = self.binding_uses.get_mut(&id) {
                    *count = count.saturating_sub(1);
                    if *count == 0 {
                        freed.push(id);
                    }
                }
            }
        });
        for id in freed {
            if let Some(state) = self.bindings.get_mut(&id) {
                if matches!(state, Binding::Ready(..)) {
                    *state = Binding::Freed;
                }
            }
        }
    }

    pub(super) fn eval_declared_expr(&mut self, key: Key) -> Result<(), Pending> {
        let e = self.declared_expr(key).ok_or(Pending::Failed)?;
        let origin = self
            .sys
            .bodies
            .get(key.0)
            .and_then(|b| b.get(key.1))
            .map_or(Origin::Declared, Origin::of);
        let mut refs = Vec::new();
        self.naming = (self.key_name(key), 0);
        let v = match self.eval(e, &mut refs) {
            Err(Pending::Waiting) => return Err(Pending::Waiting),
            outcome => {
                self.done_with(e);
                outcome?
            }
        };
        refs.sort_unstable();
        refs.dedup();
        let def = quantities::def(key.1);
        if let Some(why) = def.impossible(v.nominal) {
            self.diagnostics.push(Diagnostic::new(
                Rule::OutOfRange,
                e.span,
                format!(
                    "this expression evaluates to {} m/s: {why}",
                    crate::format::sig(v.nominal, 4)
                ),
            ));
            return Err(Pending::Failed);
        }
        if !def.in_range(v.nominal) {
            self.diagnostics.push(Diagnostic::new(
                Rule::OutOfRange,
                e.span,
                format!(
                    "this expression evaluates to {} {}, outside the valid range of '{}': {}",
                    crate::format::number(super::display_unit(key.1, v.nominal).of(v.nominal)),
                    super::display_unit(key.1, v.nominal),
                    def.name,
                    def.range_text()
                ),
            ));
            return Err(Pending::Failed);
        }
        let mut deps = super::set::SortedSet::one(key);
        let mut assumptions = super::set::SortedSet::new();
        for r in &refs {
            if let Some(e) = self.entries.get(r) {
                deps.merge(&e.deps);
                assumptions.merge(&e.assumptions);
            }
            self.used.insert(*r);
        }
        self.entries.insert(
            key,
            Entry {
                value: v,
                origin,
                rule: None,
                inputs: refs,
                deps,
                assumptions,
            },
        );
        Ok(())
    }

    /// Recursion follows the nesting of one written value, which the parser bounds.
    fn eval(&mut self, e: &Resolved, refs: &mut Vec<Key>) -> Result<Value, Pending> {
        let n = self.n();
        match &e.node {
            Node::Exact(v) => Ok(Value::exact(*v, n)),
            Node::Uncertain(lit) => {
                let m = &lit.measurement;
                if let Some(&id) = self.literal_inputs.get(&lit.value_span) {
                    // Re-evaluation in a later round: the same input, the same samples.
                    let samples = self.literal_samples(m, id);
                    return Ok(Value {
                        nominal: m.value,
                        grad: vec![(id, 1.0)],
                        samples,
                    });
                }
                let id = u32::try_from(self.inputs.len()).unwrap_or(u32::MAX);
                self.literal_inputs.insert(lit.value_span, id);
                // Named by what it declares and by order within it, not by position, so
                // that re-laying out the file (which moves bytes) never changes a seed or a
                // budget label: `x: 1 ± 0.1 Msun`, then `x: 2 ± 0.2 Msun (literal 2)`.
                self.naming.1 += 1;
                let label = match self.naming.1 {
                    1 => format!("{}: {}", self.naming.0, lit.written),
                    k => format!("{}: {} (literal {k})", self.naming.0, lit.written),
                };
                Ok(self.new_input(None, label, m, f64::NEG_INFINITY, f64::INFINITY))
            }
            Node::Binding(id) => match self.bindings.get(id) {
                Some(Binding::Ready(v, used)) => {
                    refs.extend(used.iter().copied());
                    Ok(v.clone())
                }
                // Freed only once every user is done, so no user asks again.
                Some(Binding::Failed | Binding::Freed) => Err(Pending::Failed),
                None => Err(Pending::Waiting),
            },
            Node::Quantity(bi, q) => {
                let key = (*bi, *q);
                match self.entries.get(&key) {
                    Some(entry) => {
                        refs.push(key);
                        Ok(entry.value.clone())
                    }
                    None => Err(Pending::Waiting),
                }
            }
            Node::Neg(x) => {
                let v = self.eval(x, refs)?;
                value::apply(&|a| a.first().map(|v| -v), &[&v], &self.inputs).ok_or(Pending::Failed)
            }
            Node::Binary(op, a, b) => {
                let va = self.eval(a, refs);
                let vb = self.eval(b, refs);
                if is_waiting(&va) || is_waiting(&vb) {
                    return Err(Pending::Waiting);
                }
                let (va, vb) = (va?, vb?);
                let f: fn(&[f64]) -> Option<f64> = match op {
                    BinOp::Add => |x| Some(x.first()? + x.get(1)?),
                    BinOp::Sub => |x| Some(x.first()? - x.get(1)?),
                    BinOp::Mul => |x| Some(x.first()? * x.get(1)?),
                    BinOp::Div => |x| {
                        let d = *x.get(1)?;
                        (d != 0.0).then(|| x.first().map(|n| n / d)).flatten()
                    },
                };
                self.finish(value::apply(&f, &[&va, &vb], &self.inputs), e.span)
            }
            Node::Pow(a, b) => {
                let va = self.eval(a, refs);
                let vb = self.eval(b, refs);
                if is_waiting(&va) || is_waiting(&vb) {
                    return Err(Pending::Waiting);
                }
                let (va, vb) = (va?, vb?);
                self.finish(
                    value::apply(
                        &|x| Some(x.first()?.powf(*x.get(1)?)),
                        &[&va, &vb],
                        &self.inputs,
                    ),
                    e.span,
                )
            }
            Node::Call(func, arg) => {
                let v = self.eval(arg, refs)?;
                let func = *func;
                self.finish(
                    value::apply(&|x| func.apply(*x.first()?), &[&v], &self.inputs),
                    e.span,
                )
            }
        }
    }

    fn literal_samples(
        &self,
        m: &crate::model::Measurement,
        id: u32,
    ) -> Option<std::sync::Arc<[f64]>> {
        let n = self.n();
        (n > 0).then(|| {
            let label = self
                .inputs
                .get(id as usize)
                .map_or("", |i| i.label.as_str());
            match &self.grid {
                Some(grid) => grid.column(label, m.value),
                None => {
                    let seed = value::stable_hash(&[&self.sys.name, label], self.options.seed);
                    value::draw(m, f64::NEG_INFINITY, f64::INFINITY, n, seed)
                }
            }
        })
    }

    fn finish(&mut self, v: Option<Value>, span: Span) -> Result<Value, Pending> {
        match v {
            Some(v) => Ok(v),
            None => {
                // Once per place (a set: a scan of the diagnostics made thousands of such
                // bindings quadratic).
                if self.no_value_at.insert(span) {
                    self.diagnostics.push(
                        Diagnostic::new(Rule::InvalidValue, span, "this expression has no finite value")
                            .with_note("division by zero, a root of a negative number or a logarithm of zero or less"),
                    );
                }
                Err(Pending::Failed)
            }
        }
    }

    /// Diagnostics for what still waits once nothing more can be derived: each declared
    /// expression, and each binding that no waiting expression or binding uses, says which
    /// quantities it needs and why they are not there.
    pub(super) fn report_unevaluated(&mut self, exprs: &[Key], lets: &[LetId]) {
        let waiting_exprs: FxHashSet<Key> = exprs.iter().copied().collect();
        let mut used_lets: FxHashSet<LetId> = FxHashSet::default();
        let roots = exprs
            .iter()
            .filter_map(|k| self.declared_expr(*k))
            .chain(lets.iter().filter_map(|id| self.binding_expr(*id)));
        for e in roots {
            e.walk(|n| {
                if let Node::Binding(id) = n.node {
                    used_lets.insert(id);
                }
            });
        }
        for &key in exprs {
            let Some(e) = self.declared_expr(key) else {
                continue;
            };
            let missing = self.missing(e);
            let d = self.unevaluated(e.span, Some(key), &missing, &waiting_exprs);
            self.diagnostics.push(d);
        }
        for &id in lets {
            if used_lets.contains(&id) {
                continue;
            }
            let Some(e) = self.binding_expr(id) else {
                continue;
            };
            let missing = self.missing(e);
            let d = self.unevaluated(e.span, None, &missing, &waiting_exprs);
            self.diagnostics.push(d);
        }
    }

    /// The quantities an expression needs that are not known, through its bindings.
    fn missing(&self, e: &'m Resolved) -> Vec<Key> {
        let mut out = Vec::new();
        let mut seen_lets = FxHashSet::default();
        let mut todo = vec![e];
        while let Some(e) = todo.pop() {
            e.walk(|n| match n.node {
                Node::Quantity(bi, q)
                    if !self.entries.contains_key(&(bi, q)) && !out.contains(&(bi, q)) =>
                {
                    out.push((bi, q));
                }
                Node::Binding(id) if !self.bindings.contains_key(&id) && seen_lets.insert(id) => {
                    if let Some(x) = self.binding_expr(id) {
                        todo.push(x);
                    }
                }
                _ => {}
            });
        }
        out
    }

    fn unevaluated(
        &self,
        span: Span,
        own: Option<Key>,
        missing: &[Key],
        waiting: &FxHashSet<Key>,
    ) -> Diagnostic {
        if let Some(key) = own.filter(|k| missing.contains(k)) {
            return Diagnostic::new(
                Rule::InvalidValue,
                span,
                format!("{} is defined in terms of itself", self.key_name(key)),
            )
            .with_note("a declared value cannot use its own value, directly or through other declared expressions")
            .with_help("write the value itself, or derive it from other quantities");
        }
        // A quantity written but refused (a wrong unit, say) is not "not declared": its own
        // error says why, and this one points there.
        let refused = |k: &Key| {
            let body = self.sys.bodies.get(k.0)?;
            body.refused
                .iter()
                .find(|(q, _)| *q == k.1)
                .map(|(_, at)| *at)
        };
        let names = |waiting_ones: bool, refused_ones: bool| -> Vec<String> {
            missing
                .iter()
                .filter(|k| waiting.contains(k) == waiting_ones)
                .filter(|k| waiting_ones || refused(k).is_some() == refused_ones)
                .map(|k| self.key_name(*k))
                .collect()
        };
        // Each group in the words for one of it or for several.
        let groups = [
            (
                names(false, true),
                "which is declared but whose value could not be used",
                "declared but with values that could not be used",
            ),
            (
                names(false, false),
                "which is neither declared nor derivable from what is declared",
                "none of them declared or derivable from what is declared",
            ),
            (
                names(true, false),
                "an expression that cannot be evaluated either",
                "expressions that cannot be evaluated either",
            ),
        ];
        let why: Vec<String> = groups
            .iter()
            .filter_map(|(keys, one, several)| match keys.as_slice() {
                [] => None,
                [k] => Some(format!("{k}, {one}")),
                _ => Some(format!("{}, {several}", crate::text::and_list(keys))),
            })
            .collect();
        let what = if own.is_some() {
            "this value"
        } else {
            "this binding"
        };
        let mut d = Diagnostic::new(
            Rule::InvalidValue,
            span,
            format!(
                "{what} cannot be evaluated: it needs {}",
                why.join("; and ")
            ),
        );
        for k in missing.iter().filter(|k| !waiting.contains(k)) {
            if let Some(at) = refused(k) {
                let name = self.key_name(*k);
                d = d.with_label(
                    at,
                    format!("{name} is declared here; its error says why it could not be used"),
                );
            }
        }
        if let Some(k) = missing
            .iter()
            .find(|k| !waiting.contains(k) && refused(k).is_none())
        {
            d = d.with_help(format!(
                "declare {} in the file, or write this value directly",
                self.key_name(*k)
            ));
        } else if let Some(k) = missing.iter().find(|k| refused(k).is_some()) {
            d = d.with_help(format!(
                "correct the declaration of {} (see its own error)",
                self.key_name(*k)
            ));
        }
        d
    }
}
