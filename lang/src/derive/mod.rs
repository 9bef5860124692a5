//! The derivation engine: every quantity that a system's measurements imply.
//!
//! Declared measurements become independent inputs. Rules ([`rules::RULES`]) fire in rounds:
//! a rule fires once all its inputs are known and none of them was itself derived from the
//! rule's output (so no value is ever used to confirm itself). When a quantity is first
//! reachable in a round, the best route of that round becomes its value — routes are ranked
//! by how complete their physics is, then by precision. Routes found later, and routes to
//! quantities the user declared, are kept as alternatives and compared: a difference over the
//! consistency threshold (3 combined sigma by default) is an `inconsistent` warning.
//!
//! Uncertainties are propagated by Monte Carlo (default) or to first order; see
//! [`value`]. A few quantities have defaults when not declared (circular orbit, zero Bond
//! albedo, full heat redistribution); a default that a result used is listed with it.

mod expr;
pub mod rules;
mod set;
pub mod value;

use crate::ast::BodyKind;
use crate::diagnostic::{Diagnostic, Rule};
use crate::model::{self, Content, Form, Measurement, System};
use crate::quantities::{self, Qty};
use crate::source::Span;
use rules::{RuleDef, Slot, RULES};
use rustc_hash::{FxHashMap, FxHashSet};
use set::SortedSet;
use std::collections::BTreeMap;
use std::sync::Arc;
pub use value::{InputInfo, Value};

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Propagation {
    MonteCarlo,
    Linear,
}

#[derive(Debug, Clone, PartialEq)]
pub struct Options {
    pub propagation: Propagation,
    /// Monte Carlo sample count.
    pub samples: usize,
    pub seed: u64,
    /// Declared and derived values further apart than this many combined standard
    /// deviations are reported as `inconsistent`.
    pub consistency_sigma: f64,
}

impl Default for Options {
    fn default() -> Options {
        Options {
            propagation: Propagation::MonteCarlo,
            samples: 10_000,
            seed: 0x5359_5a59,
            consistency_sigma: 3.0,
        }
    }
}

impl Options {
    pub fn linear() -> Options {
        Options {
            propagation: Propagation::Linear,
            ..Options::default()
        }
    }
}

#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Origin {
    /// Measured and declared by the user.
    Declared,
    /// Declared with `assumed`: chosen by the user, not measured.
    Assumed,
    /// Computed by a rule.
    Derived,
    /// A default the engine supplied because a rule needed it.
    Default,
    /// Estimated by the engine from another declaration (a star's spectral type), not
    /// measured; the estimate's basis is in its assumptions.
    Estimated,
}

impl Origin {
    pub fn as_str(self) -> &'static str {
        match self {
            Origin::Declared => "declared",
            Origin::Assumed => "assumed",
            Origin::Derived => "derived",
            Origin::Default => "default",
            Origin::Estimated => "estimated",
        }
    }
}

/// A reference to a quantity of a body in the same system.
pub type Key = (usize, Qty);

/// One quantity of one body as reported.
#[derive(Debug, Clone, PartialEq)]
pub struct QuantityResult {
    pub qty: Qty,
    pub origin: Origin,
    /// SI value and uncertainty below and above (zero for exact values and limits).
    pub value: f64,
    pub below: f64,
    pub above: f64,
    pub form: Form,
    pub text: Option<String>,
    pub rule: Option<&'static str>,
    pub formula: Option<&'static str>,
    pub inputs: Vec<Key>,
    pub citations: Vec<String>,
    /// Where it was declared.
    pub span: Option<Span>,
    /// Share of the variance per independent input (label, fraction), largest first.
    pub budget: Vec<(String, f64)>,
    /// What was assumed on the way (defaults, approximations), in words.
    pub assumptions: Vec<String>,
    pub notes: Vec<String>,
    /// The unit the value is shown in when it is not the quantity's usual one: a transit
    /// epoch keeps the Julian-date time system it was declared in.
    pub unit: Option<String>,
}

impl QuantityResult {
    /// The unit to show the value in.
    pub fn shown_unit(&self) -> &str {
        self.unit
            .as_deref()
            .unwrap_or_else(|| display_unit(self.qty, self.value))
    }
}

#[derive(Debug, Clone, PartialEq)]
pub struct BodyResult {
    pub quantities: Vec<QuantityResult>,
}

impl BodyResult {
    pub fn get(&self, qty: Qty) -> Option<&QuantityResult> {
        self.quantities.iter().find(|q| q.qty == qty)
    }
}

#[derive(Debug, Clone, PartialEq)]
pub struct SystemResult {
    pub bodies: Vec<BodyResult>,
    /// For declared quantities that rules can also derive from other measurements: the best
    /// such route (front ends show it beside the declared value).
    pub alternatives: Vec<Alternative>,
}

impl SystemResult {
    pub fn alternative(&self, key: Key) -> Option<&Alternative> {
        self.alternatives.iter().find(|a| a.key == key)
    }
}

/// A value derived for a quantity that was also declared.
#[derive(Debug, Clone, PartialEq)]
pub struct Alternative {
    pub key: Key,
    /// SI value and uncertainty below and above.
    pub value: f64,
    pub below: f64,
    pub above: f64,
    pub rule: &'static str,
    pub inputs: Vec<Key>,
}

#[derive(Debug, Clone)]
struct Entry {
    value: Value,
    origin: Origin,
    rule: Option<usize>,
    inputs: Vec<Key>,
    deps: SortedSet<Key>,
    assumptions: SortedSet<Arc<str>>,
}

#[derive(Debug, Clone)]
struct Candidate {
    rule: usize,
    value: Value,
    inputs: Vec<Key>,
    deps: SortedSet<Key>,
    assumptions: SortedSet<Arc<str>>,
}

/// A system's derivation with its full values (samples included). Physics checks read it;
/// [`Derivation::summarize`] reduces it to what is reported.
pub struct Derivation<'m> {
    pub sys: &'m System,
    pub options: Options,
    entries: FxHashMap<Key, Entry>,
    candidates: BTreeMap<Key, Vec<Candidate>>,
    pub inputs: Vec<InputInfo>,
    literal_inputs: FxHashMap<Span, u32>,
    /// The value of each `let` binding evaluated so far.
    bindings: FxHashMap<crate::model::LetId, expr::Binding>,
    /// How many unfinished expressions use each binding (see [`expr::binding_uses`]).
    binding_uses: FxHashMap<crate::model::LetId, usize>,
    used: FxHashSet<Key>,
    pub diagnostics: Vec<Diagnostic>,
}

/// What a rule or assumption stands for in words.
fn rule_assumption(id: &str) -> Option<&'static str> {
    Some(match id {
        "depth-radius-ratio" | "radius-ratio-depth" => {
            "transit depth = (Rp/R*)^2: limb darkening neglected"
        }
        "kepler-third-law-min-mass" | "hill-radius-min-mass" => {
            "the minimum mass stands in for the true mass"
        }
        "kepler-third-law-light-planet"
        | "kepler-period-light-planet"
        | "kepler-stellar-mass-light-planet" => {
            "the planet's mass is neglected in Kepler's third law"
        }
        "stellar-density-from-transit" => "the planet's mass is neglected against the star's",
        "equilibrium-temperature" => {
            "the star radiates as a blackbody; the planet sits at distance a"
        }
        "insolation" => "flux at the semi-major axis (not orbit-averaged)",
        _ => return None,
    })
}

/// Defaults for planet quantities that rules need, with the words shown when used.
fn default_for(q: Qty) -> Option<(f64, &'static str)> {
    Some(match q {
        Qty::Eccentricity => (0.0, "eccentricity = 0 (default: circular orbit)"),
        Qty::ArgPeriastron => (
            std::f64::consts::FRAC_PI_2,
            "argument of periastron = 90 deg (default; no effect on a circular orbit)",
        ),
        Qty::Albedo => (0.0, "Bond albedo = 0 (default)"),
        Qty::Redistribution => (
            1.0,
            "heat redistribution f = 1 (default: full redistribution)",
        ),
        _ => return None,
    })
}

impl<'m> Derivation<'m> {
    pub fn run(sys: &'m System, options: &Options) -> Derivation<'m> {
        let mut d = Derivation {
            sys,
            options: options.clone(),
            entries: FxHashMap::default(),
            candidates: BTreeMap::new(),
            inputs: Vec::new(),
            literal_inputs: FxHashMap::default(),
            bindings: FxHashMap::default(),
            binding_uses: expr::binding_uses(sys),
            used: FxHashSet::default(),
            diagnostics: Vec::new(),
        };
        d.declare_measurements();
        d.fixed_point();
        d.check_consistency();
        d
    }

    fn n(&self) -> usize {
        match self.options.propagation {
            Propagation::MonteCarlo => self.options.samples.max(1),
            Propagation::Linear => 0,
        }
    }

    fn new_input(&mut self, label: String, m: &Measurement, lo: f64, hi: f64) -> Value {
        let id = u32::try_from(self.inputs.len()).unwrap_or(u32::MAX);
        let (below, above) = match m.form {
            Form::UpperLimit | Form::LowerLimit => {
                let width = if m.form == Form::UpperLimit {
                    m.value - lo
                } else {
                    hi - m.value
                };
                let s = width / 12f64.sqrt();
                (s, s)
            }
            _ => (m.below, m.above),
        };
        let nominal = match m.form {
            Form::UpperLimit => (lo + m.value) / 2.0,
            Form::LowerLimit => (m.value + hi) / 2.0,
            _ => m.value,
        };
        let n = self.n();
        let samples = (n > 0).then(|| {
            let seed = value::stable_hash(&[&self.sys.name, &label], self.options.seed);
            std::sync::Arc::from(value::draw(m, lo, hi, n, seed))
        });
        self.inputs.push(InputInfo {
            label,
            below,
            above,
        });
        let exact = below == 0.0 && above == 0.0;
        Value {
            nominal,
            grad: if exact { Vec::new() } else { vec![(id, 1.0)] },
            samples,
        }
    }

    fn declare_measurements(&mut self) {
        let sys = self.sys;
        for (bi, body) in sys.bodies.iter().enumerate() {
            for decl in &body.declared {
                let Content::Measured(m) = &decl.content else {
                    continue;
                };
                let def = quantities::def(decl.qty);
                let (lo, hi) = def.limits();
                let usable = match m.form {
                    Form::UpperLimit => lo.is_finite(),
                    Form::LowerLimit => hi.is_finite(),
                    _ => true,
                };
                if !usable {
                    self.diagnostics.push(
                        Diagnostic::new(Rule::NotDerivable, decl.span, format!("the lower limit on '{}' is not used in derivations", def.name))
                            .with_note("a lower limit without an upper physical bound has no distribution to sample; derived values that need it are not computed"),
                    );
                    continue;
                }
                let label = format!("{}.{}", body.id, def.name);
                let v = self.new_input(label, m, lo, hi);
                let origin = if decl.assumed {
                    Origin::Assumed
                } else {
                    Origin::Declared
                };
                let mut assumptions: SortedSet<Arc<str>> = SortedSet::new();
                if decl.assumed {
                    assumptions.insert(Arc::from(format!(
                        "{}.{} = {} (assumed)",
                        body.id,
                        def.name,
                        crate::format::number(m.value)
                    )));
                }
                if decl.qty == Qty::TransitEpoch {
                    for a in epoch_assumptions(decl) {
                        assumptions.insert(Arc::from(a));
                    }
                }
                if m.form.is_limit() {
                    assumptions.insert(Arc::from(format!(
                        "{}.{} {} {} sampled uniformly within its physical range",
                        body.id,
                        def.name,
                        if m.form == Form::UpperLimit { "<" } else { ">" },
                        crate::format::number(m.value)
                    )));
                }
                self.entries.insert(
                    (bi, decl.qty),
                    Entry {
                        value: v,
                        origin,
                        rule: None,
                        inputs: Vec::new(),
                        deps: SortedSet::one((bi, decl.qty)),
                        assumptions,
                    },
                );
            }
            if body.kind == BodyKind::Star {
                self.estimate_from_spectral_type(bi);
            }
            if body.kind == BodyKind::Planet {
                for q in [
                    Qty::Eccentricity,
                    Qty::ArgPeriastron,
                    Qty::Albedo,
                    Qty::Redistribution,
                ] {
                    if body.get(q).is_some() {
                        continue;
                    }
                    if q == Qty::ArgPeriastron && body.get(Qty::Eccentricity).is_some() {
                        // An eccentric orbit of unknown orientation: every orientation is
                        // equally likely, so the argument of periastron is spread uniformly
                        // over a full turn (nominal 180 deg, where sin omega = 0) rather
                        // than fixed at a value that would bias durations and inclinations.
                        let turn = 2.0 * std::f64::consts::PI;
                        let m = Measurement {
                            value: turn,
                            below: 0.0,
                            above: 0.0,
                            form: Form::UpperLimit,
                        };
                        let value =
                            self.new_input(format!("{}.arg_periastron", body.id), &m, 0.0, turn);
                        self.entries.insert(
                            (bi, q),
                            Entry {
                                value,
                                origin: Origin::Default,
                                rule: None,
                                inputs: Vec::new(),
                                deps: SortedSet::one((bi, q)),
                                assumptions: SortedSet::one(Arc::from(
                                    "argument of periastron unknown: spread uniformly over 0-360 deg (default)",
                                )),
                            },
                        );
                        continue;
                    }
                    if let Some((v, words)) = default_for(q) {
                        self.entries.insert(
                            (bi, q),
                            Entry {
                                value: Value::exact(v, self.n()),
                                origin: Origin::Default,
                                rule: None,
                                inputs: Vec::new(),
                                deps: SortedSet::one((bi, q)),
                                assumptions: SortedSet::one(Arc::from(words)),
                            },
                        );
                    }
                }
            }
        }
    }

    /// Teff, radius and mass of a dwarf star from its spectral type, for each of them the
    /// star neither declares nor can derive from its own declarations ([`crate::spectral`]).
    fn estimate_from_spectral_type(&mut self, bi: usize) {
        let sys = self.sys;
        let Some(body) = sys.bodies.get(bi) else {
            return;
        };
        let Some(decl) = body.get(Qty::SpectralType) else {
            return;
        };
        let Content::Text(text) = &decl.content else {
            return;
        };
        let declared = |q: Qty| body.get(q).is_some();
        let derivable = |q: Qty| {
            RULES.iter().any(|r| {
                r.output == Slot::Star(q)
                    && r.inputs
                        .iter()
                        .all(|s| matches!(s, Slot::Star(x) if declared(*x)))
            })
        };
        let wanted: Vec<Qty> = [Qty::Teff, Qty::StarRadius, Qty::StarMass]
            .into_iter()
            .filter(|q| !declared(*q) && !derivable(*q))
            .collect();
        if wanted.is_empty() {
            return;
        }
        let (_, est) = match crate::spectral::estimate(text) {
            Ok(e) => e,
            Err(why) => {
                let names: Vec<&str> = wanted.iter().map(|q| quantities::def(*q).name).collect();
                self.diagnostics.push(
                    Diagnostic::new(
                        Rule::NotDerivable,
                        decl.value_span,
                        format!(
                            "{} of '{}' not estimated from spectral type \"{text}\": {why}",
                            names.join(", "),
                            body.id
                        ),
                    )
                    .with_help("declare them from a measurement or a catalogue"),
                );
                return;
            }
        };
        for q in wanted {
            let (e, unit) = match q {
                Qty::Teff => (est.teff, "K"),
                Qty::StarRadius => (est.radius, "Rsun"),
                _ => (est.mass, "Msun"),
            };
            let def = quantities::def(q);
            let m = Measurement {
                value: e.value,
                below: e.sigma,
                above: e.sigma,
                form: Form::Symmetric,
            };
            let (lo, hi) = def.limits();
            let label = format!("{}.{}", body.id, def.name);
            let v = self.new_input(label, &m, lo, hi);
            let f = display_factor(unit);
            let words = format!(
                "{}.{} = {} {unit} estimated from spectral type {text} ({}; {})",
                body.id,
                def.name,
                crate::format::with_uncertainty(e.value / f, e.sigma / f, e.sigma / f),
                crate::spectral::TABLE_SOURCE,
                crate::spectral::UNCERTAINTY_WORDS
            );
            self.entries.insert(
                (bi, q),
                Entry {
                    value: v,
                    origin: Origin::Estimated,
                    rule: None,
                    inputs: Vec::new(),
                    deps: SortedSet::one((bi, q)),
                    assumptions: SortedSet::one(Arc::from(words)),
                },
            );
        }
    }

    /// The (output, inputs) keys of a rule bound to a body, if it applies to it.
    fn bind(&self, rule: &RuleDef, bi: usize) -> Option<(Key, Vec<Key>)> {
        let body = self.sys.bodies.get(bi)?;
        let is_star_rule = matches!(rule.output, Slot::Star(_));
        let host = if is_star_rule {
            if body.kind != BodyKind::Star {
                return None;
            }
            bi
        } else {
            if body.kind != BodyKind::Planet {
                return None;
            }
            body.orbits?
        };
        let key = |s: Slot| match s {
            Slot::Planet(q) => (bi, q),
            Slot::Host(q) => (host, q),
            Slot::Star(q) => (bi, q),
        };
        Some((
            key(rule.output),
            rule.inputs.iter().map(|s| key(*s)).collect(),
        ))
    }

    fn fixed_point(&mut self) {
        // Every (rule, body) pair that applies, bound once; a pair is taken out when it fires.
        let mut todo: Vec<Option<(usize, Key, Vec<Key>)>> = Vec::new();
        for (ri, rule) in RULES.iter().enumerate() {
            for bi in 0..self.sys.bodies.len() {
                if let Some((out, ins)) = self.bind(rule, bi) {
                    todo.push(Some((ri, out, ins)));
                }
            }
        }
        let mut pending_exprs: Vec<Key> = Vec::new();
        for (bi, body) in self.sys.bodies.iter().enumerate() {
            for decl in &body.declared {
                if matches!(decl.content, Content::Expr(_)) {
                    pending_exprs.push((bi, decl.qty));
                }
            }
        }
        // Rules are admitted tier by tier: the best physics first, approximations only
        // where nothing better became reachable (a planet's semi-major axis waits for its
        // minimum mass before the planet's mass is neglected).
        let mut pending_lets = self.sys.let_order.clone();
        let max_tier = RULES.iter().map(|r| r.tier).max().unwrap_or(0);
        for tier in 0..=max_tier {
            self.rounds(tier, &mut todo, &mut pending_exprs, &mut pending_lets);
        }
        self.report_unevaluated(&pending_exprs, &pending_lets);
    }

    fn rounds(
        &mut self,
        tier: u8,
        todo: &mut [Option<(usize, Key, Vec<Key>)>],
        pending_exprs: &mut Vec<Key>,
        pending_lets: &mut Vec<crate::model::LetId>,
    ) {
        for _round in 0..32 {
            let mut progress = false;
            // Bindings, each after those it uses, so one pass takes a whole chain.
            let mut still = Vec::new();
            for id in std::mem::take(pending_lets) {
                match self.eval_binding(id) {
                    Ok(()) => progress = true,
                    Err(expr::Pending::Waiting) => still.push(id),
                    Err(expr::Pending::Failed) => {}
                }
            }
            *pending_lets = still;
            // Declared expressions whose references are all known now.
            let mut still = Vec::new();
            for key in std::mem::take(pending_exprs) {
                match self.eval_declared_expr(key) {
                    Ok(()) => progress = true,
                    Err(expr::Pending::Waiting) => still.push(key),
                    Err(expr::Pending::Failed) => {}
                }
            }
            *pending_exprs = still;
            // Rules.
            let mut fresh: Vec<Key> = Vec::new();
            for slot in todo.iter_mut() {
                {
                    let Some((ri, _, ins)) = slot.as_ref() else {
                        continue;
                    };
                    let tier_ok = RULES.get(*ri).is_some_and(|r| r.tier <= tier);
                    if !tier_ok || !ins.iter().all(|k| self.entries.contains_key(k)) {
                        continue;
                    }
                    let Some((ri, out, ins)) = slot.take() else {
                        continue;
                    };
                    let Some(rule) = RULES.get(ri) else { continue };
                    let out: Key = out;
                    progress = true;
                    let mut deps = SortedSet::new();
                    let mut assumptions = SortedSet::new();
                    let mut args = Vec::with_capacity(ins.len());
                    for k in &ins {
                        if let Some(e) = self.entries.get(k) {
                            deps.merge(&e.deps);
                            assumptions.merge(&e.assumptions);
                            args.push(&e.value);
                        }
                    }
                    if deps.contains(&out) {
                        continue; // would confirm a value with itself
                    }
                    if let Some(existing) = self.entries.get(&out) {
                        // A second route only matters if it can disagree on the data
                        // (see `check_consistency`); skip the work otherwise.
                        let mine = self.declared_deps(&existing.deps);
                        let mut theirs = self.declared_deps(&deps);
                        theirs.remove(&out);
                        if mine.is_subset(&theirs) || theirs.is_subset(&mine) {
                            continue;
                        }
                    }
                    let Some(value) = value::apply(&rule.eval, &args, &self.inputs) else {
                        continue;
                    };
                    if let Some(a) = rule_assumption(rule.id) {
                        assumptions.insert(Arc::from(a));
                    }
                    deps.insert(out);
                    if !self.entries.contains_key(&out) {
                        fresh.push(out);
                    }
                    self.candidates.entry(out).or_default().push(Candidate {
                        rule: ri,
                        value,
                        inputs: ins,
                        deps,
                        assumptions,
                    });
                }
            }
            fresh.sort();
            fresh.dedup();
            for key in fresh {
                let Some(cands) = self.candidates.get(&key) else {
                    continue;
                };
                let best = cands
                    .iter()
                    .min_by(|a, b| {
                        let ta = RULES.get(a.rule).map_or(9, |r| r.tier);
                        let tb = RULES.get(b.rule).map_or(9, |r| r.tier);
                        ta.cmp(&tb).then(
                            relative_spread(&a.value, &self.inputs)
                                .total_cmp(&relative_spread(&b.value, &self.inputs)),
                        )
                    })
                    .cloned();
                if let Some(c) = best {
                    for k in &c.inputs {
                        self.used.insert(*k);
                    }
                    self.entries.insert(
                        key,
                        Entry {
                            value: c.value,
                            origin: Origin::Derived,
                            rule: Some(c.rule),
                            inputs: c.inputs,
                            deps: c.deps,
                            assumptions: c.assumptions,
                        },
                    );
                }
            }
            if !progress {
                break;
            }
        }
    }

    fn check_consistency(&mut self) {
        let threshold = self.options.consistency_sigma;
        let mut reported: FxHashSet<SortedSet<Key>> = FxHashSet::default();
        let keys: Vec<Key> = self.candidates.keys().copied().collect();
        for key in keys {
            let (Some(entry), Some(cands)) = (self.entries.get(&key), self.candidates.get(&key))
            else {
                continue;
            };
            for c in cands {
                if entry.rule == Some(c.rule) && entry.inputs == c.inputs {
                    continue;
                }
                // Two routes say something about the data only when each rests on a
                // measurement the other does not use; otherwise they differ by an
                // approximation (a planet's mass neglected, say), not by the data.
                let mine = self.declared_deps(&entry.deps);
                let mut theirs = self.declared_deps(&c.deps);
                theirs.remove(&key);
                if mine.is_subset(&theirs) || theirs.is_subset(&mine) {
                    continue;
                }
                let sigma = entry.value.sigma_of_difference(&c.value, &self.inputs);
                let diff = (entry.value.nominal - c.value.nominal).abs();
                let floor = 1e-9 * entry.value.nominal.abs().max(c.value.nominal.abs());
                let z = diff / sigma.max(floor);
                if z <= threshold || diff <= floor {
                    continue;
                }
                let mut involved: SortedSet<Key> = entry.deps.union(&c.deps);
                involved.retain(|k| self.entries.get(k).is_some_and(|e| e.rule.is_none()));
                if !reported.insert(involved.clone()) {
                    continue;
                }
                let diag = self.inconsistency(key, entry, c, z, &involved);
                self.diagnostics.push(diag);
            }
        }
    }

    fn inconsistency(
        &self,
        key: Key,
        entry: &Entry,
        c: &Candidate,
        z: f64,
        involved: &SortedSet<Key>,
    ) -> Diagnostic {
        let def = quantities::def(key.1);
        let body = self.sys.bodies.get(key.0);
        let bname = body.map_or("?", |b| b.id.as_str());
        let shown = |v: &Value| {
            let (lo, hi) = v.linear_spread(&self.inputs);
            let unit = display_unit(key.1, v.nominal);
            let f = display_factor(unit);
            format!(
                "{} {unit}",
                crate::format::with_uncertainty(v.nominal / f, lo / f, hi / f)
            )
        };
        let rule = RULES.get(c.rule);
        let route = |inputs: &[Key]| {
            inputs
                .iter()
                .map(|k| self.key_name(*k))
                .collect::<Vec<_>>()
                .join(", ")
        };
        let first = match entry.rule {
            None => format!("declared {}.{} = {}", bname, def.name, shown(&entry.value)),
            Some(r) => format!(
                "{}.{} = {} from {} ({})",
                bname,
                def.name,
                shown(&entry.value),
                route(&entry.inputs),
                RULES.get(r).map_or("?", |r| r.id)
            ),
        };
        let message = format!(
            "{first} disagrees with {} from {} ({}) by {:.1} sigma",
            shown(&c.value),
            route(&c.inputs),
            rule.map_or("?", |r| r.id),
            z
        );
        let span = body
            .and_then(|b| b.get(key.1))
            .map(|d| d.value_span)
            .or_else(|| {
                involved.iter().find_map(|k| {
                    self.sys
                        .bodies
                        .get(k.0)
                        .and_then(|b| b.get(k.1))
                        .map(|d| d.value_span)
                })
            })
            .or_else(|| body.map(|b| b.name_span))
            .unwrap_or_default();
        let mut d = Diagnostic::new(Rule::Inconsistent, span, message)
            .with_help("check the units and the sources of these measurements; one of them may belong to another body or epoch");
        if let Some(r) = rule {
            d = d.with_note(format!("{}: {}", r.id, r.formula));
        }
        for k in involved {
            if let Some(decl) = self.sys.bodies.get(k.0).and_then(|b| b.get(k.1)) {
                if decl.value_span != span {
                    d = d.with_label(
                        decl.value_span,
                        format!("{} is used here", self.key_name(*k)),
                    );
                }
            }
        }
        d
    }

    /// The declared measurements among `deps` (defaults and derived values left out).
    fn declared_deps(&self, deps: &SortedSet<Key>) -> SortedSet<Key> {
        deps.iter()
            .copied()
            .filter(|k| {
                self.entries
                    .get(k)
                    .is_some_and(|e| e.rule.is_none() && e.origin != Origin::Default)
            })
            .collect()
    }

    pub fn key_name(&self, k: Key) -> String {
        let b = self.sys.bodies.get(k.0).map_or("?", |b| b.id.as_str());
        format!("{b}.{}", quantities::def(k.1).name)
    }

    /// The full value of a quantity (with samples), for the physics checks.
    pub fn value(&self, k: Key) -> Option<&Value> {
        self.entries.get(&k).map(|e| &e.value)
    }

    pub fn origin(&self, k: Key) -> Option<Origin> {
        self.entries.get(&k).map(|e| e.origin)
    }

    /// Reduce to what is reported: summaries, provenance, budgets.
    pub fn summarize(&self) -> SystemResult {
        let mut bodies = Vec::new();
        for (bi, body) in self.sys.bodies.iter().enumerate() {
            let mut quantities = Vec::new();
            for def in quantities::table().iter().filter(|d| d.kind == body.kind) {
                let key = (bi, def.qty);
                let decl = body.get(def.qty);
                if let Some(d) = decl {
                    if let Content::Text(t) = &d.content {
                        quantities.push(QuantityResult {
                            qty: def.qty,
                            origin: if d.assumed {
                                Origin::Assumed
                            } else {
                                Origin::Declared
                            },
                            value: f64::NAN,
                            below: 0.0,
                            above: 0.0,
                            form: Form::Exact,
                            text: Some(t.clone()),
                            rule: None,
                            formula: None,
                            inputs: Vec::new(),
                            citations: d.citations.iter().map(|c| c.0.clone()).collect(),
                            span: Some(d.span),
                            budget: Vec::new(),
                            assumptions: Vec::new(),
                            notes: Vec::new(),
                            unit: None,
                        });
                        continue;
                    }
                }
                let Some(entry) = self.entries.get(&key) else {
                    continue;
                };
                // A default that a result used is shown, except a spread of orientations,
                // which has no value to show: the assumption lines of the results say it.
                let spread = entry.origin == Origin::Default && !entry.value.grad.is_empty();
                if spread || (entry.origin == Origin::Default && !self.used.contains(&key)) {
                    continue;
                }
                quantities.push(self.result_for(key, entry, decl));
            }
            bodies.push(BodyResult { quantities });
        }
        SystemResult {
            bodies,
            alternatives: self.alternatives(),
        }
    }

    /// The best derived route for every declared quantity that has one.
    fn alternatives(&self) -> Vec<Alternative> {
        let mut out = Vec::new();
        for (key, cands) in &self.candidates {
            let Some(entry) = self.entries.get(key) else {
                continue;
            };
            if entry.rule.is_some() || entry.origin == Origin::Default {
                continue;
            }
            let best = cands.iter().min_by(|a, b| {
                let ta = RULES.get(a.rule).map_or(9, |r| r.tier);
                let tb = RULES.get(b.rule).map_or(9, |r| r.tier);
                ta.cmp(&tb).then(
                    relative_spread(&a.value, &self.inputs)
                        .total_cmp(&relative_spread(&b.value, &self.inputs)),
                )
            });
            let Some(c) = best else { continue };
            let (lo, hi) = c.value.linear_spread(&self.inputs);
            let (value, below, above) = match (self.options.propagation, c.value.sample_summary()) {
                (Propagation::MonteCarlo, Some((med, p16, p84, _))) => {
                    (med, (med - p16).max(0.0), (p84 - med).max(0.0))
                }
                _ => (c.value.nominal, lo, hi),
            };
            if !value.is_finite() {
                continue;
            }
            out.push(Alternative {
                key: *key,
                value,
                below,
                above,
                rule: RULES.get(c.rule).map_or("?", |r| r.id),
                inputs: c.inputs.clone(),
            });
        }
        out
    }

    fn result_for(
        &self,
        key: Key,
        entry: &Entry,
        decl: Option<&model::Declared>,
    ) -> QuantityResult {
        let rule = entry.rule.and_then(|r| RULES.get(r));
        let mut notes = Vec::new();
        let (value, below, above, form) = match decl.map(|d| &d.content) {
            Some(Content::Measured(m)) => (m.value, m.below, m.above, m.form),
            _ => {
                let (lo, hi) = entry.value.linear_spread(&self.inputs);
                match (self.options.propagation, entry.value.sample_summary()) {
                    (Propagation::MonteCarlo, Some((med, p16, p84, frac))) => {
                        if frac < 0.999 {
                            notes.push(format!(
                                "{:.1}% of the Monte Carlo samples gave no value (outside the formula's domain) and were left out",
                                (1.0 - frac) * 100.0
                            ));
                        }
                        if !entry.value.grad.is_empty() || entry.origin == Origin::Derived {
                            (
                                med,
                                (med - p16).max(0.0),
                                (p84 - med).max(0.0),
                                Form::Asymmetric,
                            )
                        } else {
                            (entry.value.nominal, 0.0, 0.0, Form::Exact)
                        }
                    }
                    _ => {
                        let form = if lo == 0.0 && hi == 0.0 {
                            Form::Exact
                        } else {
                            Form::Asymmetric
                        };
                        (entry.value.nominal, lo, hi, form)
                    }
                }
            }
        };
        let form = if form == Form::Asymmetric && ((above - below).abs() <= 1e-3 * above.max(below))
        {
            Form::Symmetric
        } else {
            form
        };
        let budget = entry
            .value
            .budget(&self.inputs)
            .into_iter()
            .filter(|(_, share)| *share >= 0.001)
            .map(|(id, share)| {
                (
                    self.inputs
                        .get(id as usize)
                        .map_or_else(String::new, |i| i.label.clone()),
                    share,
                )
            })
            .collect();
        QuantityResult {
            qty: key.1,
            origin: entry.origin,
            value,
            below,
            above,
            form,
            text: None,
            rule: rule.map(|r| r.id).or_else(|| {
                (entry.origin != Origin::Default
                    && decl.is_some_and(|d| matches!(d.content, Content::Expr(_))))
                .then_some("expression")
            }),
            formula: rule.map(|r| r.formula),
            inputs: entry.inputs.clone(),
            citations: decl
                .map(|d| d.citations.iter().map(|c| c.0.clone()).collect())
                .unwrap_or_default(),
            span: decl.map(|d| d.span),
            budget,
            assumptions: entry.assumptions.iter().map(|a| a.to_string()).collect(),
            notes,
            unit: (key.1 == Qty::TransitEpoch)
                .then(|| {
                    decl.and_then(|d| d.written_unit.clone())
                        .filter(|u| crate::time::system_of_unit(u).is_some())
                })
                .flatten(),
        }
    }
}

/// What reading a transit epoch took for granted: a time scale left unsaid, a timestamp.
fn epoch_assumptions(decl: &model::Declared) -> Vec<String> {
    let mut out = Vec::new();
    if let Some(ts) = &decl.timestamp {
        out.push(format!(
            "transit_epoch given as the UTC timestamp {ts}, read as a JD_UTC Julian date"
        ));
    }
    match decl
        .written_unit
        .as_deref()
        .and_then(crate::time::system_of_unit)
    {
        Some((_, Some(words))) => out.push(words.to_string()),
        Some((_, None)) => {}
        None => out.push(
            "transit_epoch has no Julian-date time scale (such as BJD_TDB); read as JD_UTC"
                .to_string(),
        ),
    }
    out
}

fn relative_spread(v: &Value, inputs: &[InputInfo]) -> f64 {
    let (lo, hi) = v.linear_spread(inputs);
    (lo + hi) / 2.0 / v.nominal.abs().max(f64::MIN_POSITIVE)
}

/// The unit a quantity is shown in, chosen by size for planet masses, radii and depths.
pub fn display_unit(qty: Qty, si: f64) -> &'static str {
    let def = quantities::def(qty);
    match qty {
        Qty::Mass | Qty::MinMass if si.abs() < 0.1 * crate::constants::M_JUPITER => "Mearth",
        Qty::Radius if si.abs() < 0.5 * crate::constants::R_JUPITER => "Rearth",
        Qty::TransitDepth if si.abs() < 1e-3 => "ppm",
        Qty::HillRadius if si.abs() < 1e-3 * crate::constants::AU => "km",
        _ => def.display,
    }
}

/// SI value of one display unit.
pub fn display_factor(unit: &str) -> f64 {
    // Reports ask for the same few units many times per body: parse each once per thread.
    thread_local! {
        static FACTORS: std::cell::RefCell<FxHashMap<String, f64>> = std::cell::RefCell::new(FxHashMap::default());
    }
    let parse = || crate::units::parse_unit_text(unit).map_or(1.0, |u| u.factor);
    FACTORS.with(|cache| {
        let Ok(mut cache) = cache.try_borrow_mut() else {
            return parse();
        };
        if let Some(f) = cache.get(unit) {
            return *f;
        }
        let f = parse();
        cache.insert(unit.to_string(), f);
        f
    })
}

#[cfg(test)]
mod tests;
