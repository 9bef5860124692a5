//! What is reported of a derivation: each quantity's value, spread, provenance and
//! assumptions, the alternatives, and the unit each is shown in.

use super::*;

/// Why a declared lower limit feeds no derivation (said by its diagnostic, and after
/// [`NOT_USED`] by its result).
pub(super) const UNUSABLE_LOWER_LIMIT: &str = "a lower limit without an upper physical bound has no distribution to sample, so derived values that need it are not computed";

/// How the note of a declared value the derivations cannot use starts.
const NOT_USED: &str = "not used in derivations: ";

/// The note of a value some of whose Monte Carlo draws gave no value: how many were left out.
fn left_out_note(s: &value::SampleSummary) -> Option<String> {
    (s.finite < 0.999).then(|| {
        format!(
            "{:.1}% of the Monte Carlo samples gave no value (outside the formula's domain) and were left out",
            (1.0 - s.finite) * 100.0
        )
    })
}

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
    /// The references cited on the declaration whose value is used (all the measurements
    /// combined, for a weighted mean).
    pub citations: Vec<String>,
    /// Every reference behind the value, through any depth of derivation: the citations of
    /// the declared values it rests on, sorted.
    pub cited: Vec<String>,
    /// Where it was declared, in its system (see [`InSystem`]).
    pub span: Option<InSystem>,
    /// Share of the variance per independent input (label, fraction), largest first.
    pub budget: Vec<(String, f64)>,
    /// What was assumed on the way (defaults, approximations), in words.
    pub assumptions: Vec<String>,
    pub notes: Vec<String>,
    /// The unit the value is shown in when it is not the quantity's usual one: a transit
    /// epoch keeps the Julian-date time system it was declared in.
    pub unit: Option<String>,
    /// For a quantity declared more than once: every declaration, in file order.
    pub sources: Vec<SourceResult>,
    /// For a quantity declared more than once: how the value used was reached.
    pub choice: Option<Choice>,
    /// For a value summarised from Monte Carlo samples: how precisely the samples fix its
    /// median and interval ends.
    pub precision: Option<value::Precision>,
    /// For a derived limit that the other ends of its inputs' ranges bound as well (a Hill
    /// radius at most as large as at zero eccentricity): that other end (SI), so the value
    /// lies between `value` and it.
    pub range_end: Option<f64>,
}

/// One of several declarations of a quantity, as reported.
#[derive(Debug, Clone, PartialEq)]
pub struct SourceResult {
    /// SI value and uncertainty below and above.
    pub value: f64,
    pub below: f64,
    pub above: f64,
    pub form: Form,
    pub citations: Vec<String>,
    /// Where it was declared, in its system (see [`InSystem`]).
    pub span: InSystem,
    /// Whether this declaration is the value used (false for all when they were combined).
    pub chosen: bool,
    /// Whether this declaration is marked `assumed`.
    pub assumed: bool,
    /// A transit epoch's Julian-date unit as this declaration wrote it (`BJD_TDB`,
    /// `JD_UTC`, ...): each source keeps its own time scale.
    pub unit: Option<String>,
}

impl SourceResult {
    /// The unit this source is shown in: its own time scale for a transit epoch, else the
    /// quantity's display unit.
    pub fn shown_unit<'a>(&'a self, q: &'a QuantityResult) -> DisplayUnit<'a> {
        self.unit
            .as_deref()
            .and_then(DisplayUnit::parse)
            .unwrap_or_else(|| q.shown_unit())
    }
}

impl QuantityResult {
    /// Whether this is a declared value the derivations could not use (its note says why).
    pub fn unused(&self) -> bool {
        self.notes.iter().any(|n| n.starts_with(NOT_USED))
    }

    /// Whether a Monte Carlo value's median and ends are fixed to the second significant
    /// digit of its standard uncertainty, the mean of its two sides (JCGM 101:2008 7.9.2 with
    /// n_dig = 2). Values not from samples are.
    pub fn stable(&self) -> bool {
        self.precision
            .is_none_or(|p| p.stable_for((self.below + self.above) / 2.0))
    }

    /// The largest of a Monte Carlo value's numerical precisions (twice the standard
    /// error of its median and ends) as a fraction of its uncertainty on that side.
    pub fn relative_precision(&self) -> Option<f64> {
        let p = self.precision?;
        let side = |w: f64, u: f64| if u > 0.0 { w / u } else { 0.0 };
        let mid = side(p.median, self.below.min(self.above));
        Some(
            side(p.low, self.below)
                .max(side(p.high, self.above))
                .max(mid),
        )
    }

    /// The unit to show the value in.
    /// The unit the value is shown in: the one written in the file, else the usual one.
    pub fn shown_unit(&self) -> DisplayUnit<'_> {
        self.unit
            .as_deref()
            .and_then(DisplayUnit::parse)
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
    /// The Monte Carlo sample count was chosen adaptively (`--samples auto`): doubled until
    /// every value was stable, or until the most drawn for the system.
    pub adaptive: bool,
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

impl<'m> Derivation<'m> {
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
                        let text = QuantityResult {
                            text: Some(t.clone()),
                            ..self.as_declared(
                                d,
                                &Measurement {
                                    value: f64::NAN,
                                    below: 0.0,
                                    above: 0.0,
                                    form: Form::Exact,
                                },
                            )
                        };
                        quantities.push(text);
                        continue;
                    }
                }
                let Some(entry) = self.entries.get(&key) else {
                    // A declared value the derivations could not use (a lower limit with no
                    // upper bound to sample up to) is still reported, with the reason.
                    if let Some(d) = decl {
                        if let Content::Measured(m) = &d.content {
                            quantities.push(self.unused_result(key, d, m));
                        }
                    }
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
            adaptive: self.options.adaptive,
        }
    }

    /// Every declaration of a quantity declared more than once, as reported, and the
    /// declaration whose value is used (the chosen source, else the one declared; `None`
    /// for a weighted mean).
    fn sources_of(
        &self,
        key: Key,
        decl: Option<&'m model::Declared>,
    ) -> (Vec<SourceResult>, Option<&'m model::Declared>) {
        let chosen = self.chosen.get(&key);
        let all = match (decl, chosen) {
            (Some(d), Some(_)) => self.sys.bodies.get(key.0).map(|b| b.sources(d.qty)),
            _ => None,
        }
        .unwrap_or_default();
        // The declaration whose value is used: the chosen source, else the one declared.
        let used = match chosen.map(|c| c.index) {
            Some(Some(i)) => all.get(i).copied(),
            Some(None) => None,
            None => decl,
        };
        let sources: Vec<SourceResult> = all
            .iter()
            .enumerate()
            .filter_map(|(i, d)| match &d.content {
                Content::Measured(m) => Some(SourceResult {
                    value: m.value,
                    below: m.below,
                    above: m.above,
                    form: m.form,
                    citations: d.citations.iter().map(|c| c.0.clone()).collect(),
                    span: InSystem::of(d.span, self.sys.span),
                    chosen: chosen.is_some_and(|c| c.index == Some(i)),
                    assumed: d.assumed,
                    unit: epoch_unit(key.1, d),
                }),
                _ => None,
            })
            .collect();
        (sources, used)
    }

    /// A declared measurement that feeds no derivation, as reported: its value as declared
    /// and a note that says why it is not used.
    /// With several sources, it is the one chosen (the most constraining limit), listed with
    /// the others.
    fn unused_result(&self, key: Key, d: &'m model::Declared, m: &Measurement) -> QuantityResult {
        let (sources, used) = self.sources_of(key, Some(d));
        let chosen = self.chosen.get(&key);
        let (d, m) = match (used, chosen) {
            (Some(u), Some(c)) => (u, &c.measurement),
            _ => (d, m),
        };
        QuantityResult {
            notes: vec![format!("{NOT_USED}{UNUSABLE_LOWER_LIMIT}")],
            sources,
            choice: chosen.map(|c| c.choice),
            ..self.as_declared(d, m)
        }
    }

    /// A declaration reported as written, with nothing derived about it.
    fn as_declared(&self, d: &model::Declared, m: &Measurement) -> QuantityResult {
        QuantityResult {
            qty: d.qty,
            origin: Origin::of(d),
            value: m.value,
            below: m.below,
            above: m.above,
            form: m.form,
            text: None,
            rule: None,
            formula: None,
            inputs: Vec::new(),
            citations: d.citations.iter().map(|c| c.0.clone()).collect(),
            cited: sorted_ids(&d.citations),
            span: Some(InSystem::of(d.span, self.sys.span)),
            budget: Vec::new(),
            assumptions: d.set.iter().cloned().collect(),
            notes: Vec::new(),
            unit: None,
            sources: Vec::new(),
            choice: None,
            precision: None,
            range_end: None,
        }
    }

    /// The best derived route for every declared quantity that has one.
    pub(super) fn alternatives(&self) -> Vec<Alternative> {
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
                (Propagation::MonteCarlo, Some(s)) => (
                    s.median,
                    (s.median - s.low).max(0.0),
                    (s.high - s.median).max(0.0),
                ),
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

    pub(super) fn result_for(
        &self,
        key: Key,
        entry: &Entry,
        decl: Option<&model::Declared>,
    ) -> QuantityResult {
        let rule = entry.rule.and_then(|r| RULES.get(r));
        let mut notes = Vec::new();
        let mut sampled = None;
        let mut precision = None;
        let mut range_end = None;
        let chosen = self.chosen.get(&key);
        let (sources, used) = self.sources_of(key, decl);
        let (value, below, above, form) = match (chosen, decl.map(|d| &d.content)) {
            (Some(c), _) => {
                let m = c.measurement;
                (m.value, m.below, m.above, m.form)
            }
            (None, Some(Content::Measured(m))) => (m.value, m.below, m.above, m.form),
            _ if self.bounded.contains_key(&key) => {
                let (v, form, words, other) = self.bounded.get(&key).cloned().unwrap_or((
                    f64::NAN,
                    Form::Exact,
                    String::new(),
                    None,
                ));
                sampled = Some(words);
                range_end = other;
                (v, 0.0, 0.0, form)
            }
            // An estimate from a spectral type is an input, shown as it is defined (the
            // table's value and widened uncertainty, as its assumption line says), not as a
            // summary of its draws, which differs in the last digit.
            _ if entry.origin == Origin::Estimated => {
                let (lo, hi) = entry.value.linear_spread(&self.inputs);
                (entry.value.nominal, lo, hi, Form::Symmetric)
            }
            _ => {
                let (lo, hi) = entry.value.linear_spread(&self.inputs);
                match (self.options.propagation, entry.value.sample_summary()) {
                    (Propagation::MonteCarlo, Some(s)) => {
                        notes.extend(left_out_note(&s));
                        if !entry.value.grad.is_empty() || entry.origin == Origin::Derived {
                            precision = s.precision;
                            (
                                s.median,
                                (s.median - s.low).max(0.0),
                                (s.high - s.median).max(0.0),
                                Form::Asymmetric,
                            )
                        } else {
                            (entry.value.nominal, 0.0, 0.0, Form::Exact)
                        }
                    }
                    _ => match self.sampled_instead(key) {
                        Some((s, words)) => {
                            notes.extend(left_out_note(&s));
                            sampled = Some(words);
                            precision = s.precision;
                            (
                                s.median,
                                (s.median - s.low).max(0.0),
                                (s.high - s.median).max(0.0),
                                Form::Asymmetric,
                            )
                        }
                        None => {
                            let form = if lo == 0.0 && hi == 0.0 {
                                Form::Exact
                            } else {
                                Form::Asymmetric
                            };
                            (entry.value.nominal, lo, hi, form)
                        }
                    },
                }
            }
        };
        if key.1 == Qty::HabitableZonePosition {
            notes.extend(self.habitable_note(key));
        }
        if matches!(key.1, Qty::RadiusRatio | Qty::TransitDepth) {
            notes.extend(self.grazing_note(key, entry));
        }
        if key.1 == Qty::Tsm {
            notes.extend(self.tsm_bin_note(key));
        }
        // Once per star, on the first of its habitable-zone values.
        if key.1 == Qty::HabitableInnerFlux {
            notes.extend(self.habitable_range_note(key));
        }
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
        let mut cited: Vec<String> = entry
            .deps
            .iter()
            .flat_map(|k| self.citations_of(*k))
            .collect();
        cited.sort();
        cited.dedup();
        QuantityResult {
            cited,
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
            citations: match (used, chosen) {
                (Some(d), _) => d.citations.iter().map(|c| c.0.clone()).collect(),
                // A combination rests on every measurement combined (not on a limit, a
                // value without an uncertainty or an assumed one, which are not averaged).
                (None, Some(_)) => {
                    let mut all: Vec<String> = sources
                        .iter()
                        .filter(|s| {
                            let m = Measurement {
                                value: s.value,
                                below: s.below,
                                above: s.above,
                                form: s.form,
                            };
                            super::sources::ranked(&m, s.assumed)
                        })
                        .flat_map(|s| s.citations.iter().cloned())
                        .collect();
                    all.sort();
                    all.dedup();
                    all
                }
                (None, None) => Vec::new(),
            },
            span: used.or(decl).map(|d| InSystem::of(d.span, self.sys.span)),
            budget,
            assumptions: entry
                .assumptions
                .iter()
                .chain(
                    self.sample_note
                        .as_ref()
                        .filter(|_| entry.origin == Origin::Derived),
                )
                .map(|a| a.to_string())
                .chain(sampled)
                .collect(),
            notes,
            unit: used.or(decl).and_then(|d| epoch_unit(key.1, d)),
            choice: chosen.map(|c| c.choice),
            sources,
            precision,
            range_end,
        }
    }
}

/// The Julian-date unit a transit epoch was declared in, when `qty` is one.
fn epoch_unit(qty: Qty, d: &model::Declared) -> Option<String> {
    (qty == Qty::TransitEpoch)
        .then(|| d.written_unit.as_ref().map(|u| u.to_string()))
        .flatten()
        .filter(|u| crate::time::system_of_unit(u).is_some())
}

impl Derivation<'_> {
    /// Where a planet lies against its star's habitable zones, as probabilities from the
    /// uncertainties of its insolation and of the zone's edges (their samples in Monte Carlo,
    /// a normal difference to first order).
    fn habitable_note(&self, key: Key) -> Option<String> {
        let host = self.sys.bodies.get(key.0)?.orbits?;
        let s = &self.entries.get(&(key.0, Qty::Insolation))?.value;
        let edge = |q: Qty| self.entries.get(&(host, q)).map(|e| &e.value);
        let pc = |p: f64| match p {
            p if p <= 0.0 => "0%".to_string(),
            p if p < 0.005 => "<1%".to_string(),
            p if p >= 1.0 => "100%".to_string(),
            p if p > 0.995 => ">99%".to_string(),
            p => format!("{:.0}%", p * 100.0),
        };
        let words = |[hot, within, cold]: [f64; 3]| {
            format!(
                "{} within, {} closer in (hotter), {} farther out (colder)",
                pc(within),
                pc(hot),
                pc(cold)
            )
        };
        let conservative = self.zone_shares(
            s,
            edge(Qty::HabitableInnerFlux)?,
            edge(Qty::HabitableOuterFlux)?,
        )?;
        let optimistic = match (
            edge(Qty::HabitableInnerOptimisticFlux),
            edge(Qty::HabitableOuterOptimisticFlux),
        ) {
            (Some(i), Some(o)) => self.zone_shares(s, i, o),
            _ => None,
        };
        // Far from both zones, one phrase says it all.
        let sure = |[hot, _, cold]: [f64; 3]| {
            if hot > 0.995 {
                Some("closer in (hotter)")
            } else if cold > 0.995 {
                Some("farther out (colder)")
            } else {
                None
            }
        };
        if let (Some(a), Some(b)) = (sure(conservative), optimistic.and_then(sure)) {
            if a == b {
                return Some(format!("{a} than both habitable zones (>99%)"));
            }
        }
        let mut text = format!(
            "conservative habitable zone (runaway to maximum greenhouse): {}",
            words(conservative)
        );
        if let Some(optimistic) = optimistic {
            text.push_str(&format!(
                "; optimistic zone (recent Venus to early Mars): {}",
                words(optimistic)
            ));
        }
        Some(text)
    }

    /// Probabilities that an insolation lies above the inner edge's, between the edges, and
    /// below the outer edge's.
    fn zone_shares(&self, s: &Value, inner: &Value, outer: &Value) -> Option<[f64; 3]> {
        if let (Some(ss), Some(si), Some(so)) = (&s.samples, &inner.samples, &outer.samples) {
            let (mut hot, mut cold, mut n) = (0usize, 0usize, 0usize);
            for ((x, i), o) in ss.iter().zip(si.iter()).zip(so.iter()) {
                if !(x.is_finite() && i.is_finite() && o.is_finite()) {
                    continue;
                }
                n += 1;
                if x > i {
                    hot += 1;
                } else if x < o {
                    cold += 1;
                }
            }
            if n == 0 {
                return None;
            }
            let (hot, cold) = (hot as f64 / n as f64, cold as f64 / n as f64);
            return Some([hot, (1.0 - hot - cold).max(0.0), cold]);
        }
        let phi = |z: f64| 0.5 * libm::erfc(-z / std::f64::consts::SQRT_2);
        let above = |edge: &Value| {
            let sd = s.sigma_of_difference(edge, &self.inputs);
            let d = s.nominal - edge.nominal;
            if sd > 0.0 {
                phi(d / sd)
            } else if d > 0.0 {
                1.0
            } else {
                0.0
            }
        };
        let hot = above(inner);
        let cold = 1.0 - above(outer);
        Some([hot, (1.0 - hot - cold).max(0.0), cold])
    }
}

/// The ids of `citations`, sorted and without repeats.
fn sorted_ids(citations: &[(String, Span)]) -> Vec<String> {
    let mut ids: Vec<String> = citations.iter().map(|c| c.0.clone()).collect();
    ids.sort();
    ids.dedup();
    ids
}

impl Derivation<'_> {
    /// The references behind a declared quantity's value: those of the source used, or of
    /// every measurement combined.
    fn citations_of(&self, key: Key) -> Vec<String> {
        let Some(body) = self.sys.bodies.get(key.0) else {
            return Vec::new();
        };
        let all = body.sources(key.1);
        let used: Vec<&model::Declared> = match self.chosen.get(&key) {
            Some(c) => match c.index {
                Some(i) => all.get(i).copied().into_iter().collect(),
                None => all
                    .into_iter()
                    .filter(|d| {
                        matches!(&d.content, Content::Measured(m) if super::sources::ranked(m, d.assumed))
                    })
                    .collect(),
            },
            None => body.get(key.1).into_iter().collect(),
        };
        used.iter()
            .flat_map(|d| d.citations.iter().map(|c| c.0.clone()))
            .collect()
    }
}

/// A unit values are shown in: its symbol and its SI factor, resolved together so that no
/// output can show a number in one unit and label it with another.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct DisplayUnit<'a> {
    pub symbol: &'a str,
    /// The SI value of one of this unit.
    pub factor: f64,
}

impl<'a> DisplayUnit<'a> {
    /// The unit written as `symbol` (registry syntax, `g/cm^3`); `None` when the registry
    /// does not know it.
    pub fn parse(symbol: &'a str) -> Option<DisplayUnit<'a>> {
        // Reports ask for the same few units many times per body: parse each once per thread.
        thread_local! {
            static FACTORS: std::cell::RefCell<FxHashMap<String, Option<f64>>> =
                std::cell::RefCell::new(FxHashMap::default());
        }
        let parse = || crate::units::parse_unit_text(symbol).map(|u| u.factor);
        let factor = FACTORS.with(|cache| {
            let Ok(mut cache) = cache.try_borrow_mut() else {
                return parse();
            };
            if let Some(f) = cache.get(symbol) {
                return *f;
            }
            let f = parse();
            cache.insert(symbol.to_string(), f);
            f
        })?;
        Some(DisplayUnit { symbol, factor })
    }

    /// A unit of the quantity table. Every one parses (`every_display_unit_parses`); were
    /// one not to, its values would show as NaN rather than in a wrong unit.
    fn known(symbol: &'static str) -> DisplayUnit<'static> {
        DisplayUnit::parse(symbol).unwrap_or(DisplayUnit {
            symbol,
            factor: f64::NAN,
        })
    }

    /// The unit's symbol as written after a number: nothing for plain numbers.
    pub fn suffix(self) -> &'a str {
        if self.symbol == "1" {
            ""
        } else {
            self.symbol
        }
    }

    /// `value` (in SI) in this unit.
    pub fn of(self, si: f64) -> f64 {
        si / self.factor
    }
}

impl std::fmt::Display for DisplayUnit<'_> {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(self.symbol)
    }
}

/// The unit a declared value is spoken of in: the one it was written in, where that is a
/// unit of the quantity (a mass written in Mjup is quoted in Mjup, however small), else
/// [`display_unit`].
pub fn written_unit(written: Option<&str>, qty: Qty, si: f64) -> DisplayUnit<'_> {
    written
        .and_then(DisplayUnit::parse)
        .filter(|u| u.factor > 0.0)
        .unwrap_or_else(|| display_unit(qty, si))
}

/// The unit a quantity is shown in, chosen by size for planet masses, radii and depths.
pub fn display_unit(qty: Qty, si: f64) -> DisplayUnit<'static> {
    let def = quantities::def(qty);
    DisplayUnit::known(match qty {
        Qty::Mass | Qty::MinMass if si.abs() < 0.1 * crate::constants::M_JUPITER => "Mearth",
        Qty::Radius if si.abs() < 0.5 * crate::constants::R_JUPITER => "Rearth",
        Qty::TransitDepth if si.abs() < 1e-3 => "ppm",
        Qty::HillRadius if si.abs() < 1e-3 * crate::constants::AU => "km",
        _ => def.display,
    })
}
