//! The fixed point: rules fire in rounds, tier by tier, until nothing new is reachable.

use super::*;

/// What a rule or assumption stands for in words.
pub(super) fn rule_assumption(id: &str) -> Option<&'static str> {
    Some(match id {
        "depth-radius-ratio" | "radius-ratio-depth" => {
            "transit depth = (Rp/R*)^2: limb darkening neglected"
        }
        "depth-impact-radius-ratio" | "radius-ratio-impact-depth" => {
            "transit depth = the fraction of the star's disc the planet covers at mid-transit \
             ((Rp/R*)^2 unless grazing): limb darkening neglected"
        }
        "kepler-third-law-min-mass" | "hill-radius-min-mass" => {
            "the minimum mass stands in for the true mass"
        }
        "tsm-predicted-mass" => {
            "the mass predicted from the radius (Chen & Kipping 2017) stands in for the \
             unmeasured mass"
        }
        "kepler-third-law-light-planet"
        | "kepler-period-light-planet"
        | "kepler-stellar-mass-light-planet" => {
            "the planet's mass is neglected in Kepler's third law"
        }
        "stellar-density-from-transit" | "stellar-density-from-duration" => {
            "the planet's mass is neglected against the star's"
        }
        "equilibrium-temperature" => {
            "the star radiates as a blackbody; the planet sits at distance a"
        }
        "insolation" => "flux at the semi-major axis (not orbit-averaged)",
        "distance-from-parallax" => {
            "distance = 1/parallax, with no correction for the parallax's noise: biased when its \
             fractional error exceeds about 10 % (common practice)"
        }
        "luminosity-from-bolometric-flux" => "isotropic emission and no interstellar extinction",
        "habitable-inner-insolation"
        | "habitable-outer-insolation"
        | "habitable-inner-optimistic-insolation"
        | "habitable-outer-optimistic-insolation" => {
            "habitable-zone limits of Kopparapu et al. (2014) for a planet of 1 Earth mass with \
             an Earth-like atmosphere; the fits hold for Teff 2600-7200 K"
        }
        "habitable-zone-position" => {
            "the conservative habitable zone (runaway to maximum greenhouse, Kopparapu et al. \
             2014), compared in insolation at the semi-major axis"
        }
        "scale-height" => "an isothermal atmosphere at the equilibrium temperature",
        "tsm" => {
            "zero albedo and full heat redistribution for Teq, and the scale factor of the \
             planet's radius bin (0.190, 1.26, 1.28, 1.15 below 1.5, 2.75, 4 and 10 Rearth; \
             the last used above 10 Rearth too), as Kempton et al. (2018) define the metric"
        }
        "esm" => {
            "zero albedo and full heat redistribution for Teq, a day side at 1.10 Teq, and \
             blackbodies at 7.5 um, as Kempton et al. (2018) define the metric"
        }
        "predicted-mass" | "predicted-radius" | "predicted-radius-min-mass" => {
            "predicted from the mean mass-radius relation of Chen & Kipping (2017), widened by \
             its intrinsic scatter: a prediction for a typical planet, not a measurement; it \
             feeds no density, composition or other derivation"
        }
        "predicted-rv-amplitude" => "the predicted mass stands in for the planet's mass",
        _ => return None,
    })
}

impl<'m> Derivation<'m> {
    /// The (output, inputs) keys of a rule bound to a body, if it applies to it.
    pub(super) fn bind(&self, rule: &RuleDef, bi: usize) -> Option<(Key, Vec<Key>)> {
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

    pub(super) fn fixed_point(&mut self) {
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

    pub(super) fn rounds(
        &mut self,
        tier: u8,
        todo: &mut [Option<(usize, Key, Vec<Key>)>],
        pending_exprs: &mut Vec<Key>,
        pending_lets: &mut Vec<crate::model::LetId>,
    ) {
        // A rule that stands in for a quantity (depth = k^2 while the impact parameter is
        // unknown) waits for a round in which nothing else fires: the quantity may become
        // known a few rounds later (an impact parameter from an inclination and a/R*), and
        // then it must not have fired (a planet with b = 3.4 got a transit depth).
        let mut stand_ins_now = false;
        for _round in 0..64 {
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
                    let Some((ri, out, ins)) = slot.as_ref() else {
                        continue;
                    };
                    let tier_ok = RULES.get(*ri).is_some_and(|r| r.tier <= tier);
                    if !tier_ok || !ins.iter().all(|k| self.entries.contains_key(k)) {
                        continue;
                    }
                    if self
                        .focus
                        .as_ref()
                        .is_some_and(|f| !f.contains(out) || self.entries.contains_key(out))
                    {
                        continue; // not wanted, or a second route to a known value
                    }
                    let stands_in = RULES.get(*ri).and_then(|r| rules::stands_in_for(r.id));
                    if stands_in.is_some_and(|q| self.entries.contains_key(&(out.0, q))) {
                        continue; // the quantity it stands in for is known
                    }
                    // Rp/R* from a depth does not wait: a depth says the planet transits, and
                    // the ratio from it meets the other routes to the radius in the round it
                    // can (a depth written in the wrong unit is found through the radius).
                    let waits = RULES.get(*ri).is_some_and(|r| r.id != "depth-radius-ratio");
                    if stands_in.is_some() && waits && !stand_ins_now {
                        continue; // not yet: see `stand_ins_now`
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
                    let edge = rules::draws_at_edge(rule.id);
                    let drawn = match edge {
                        Some(e) => {
                            value::apply_drawing(&rule.eval, &e.formula, &args, &self.inputs)
                        }
                        None => value::apply(&rule.eval, &args, &self.inputs),
                    };
                    // A value of exactly 0 where the quantity cannot be 0 (a luminosity, a
                    // density) is a number too small to represent, from absurd inputs (a
                    // radius of 1e-200 Rsun): no solution, not a value of 0.
                    let zero_excluded = |v: &Value| {
                        v.nominal == 0.0
                            && matches!(quantities::def(out.1).min, quantities::Bound::Exclusive(z) if z == 0.0)
                    };
                    let Some(value) = drawn.filter(|v| !zero_excluded(v)) else {
                        self.no_solution.push((ri, ins));
                        continue;
                    };
                    if let Some(words) = edge.and_then(|e| at_edge_words(rule.id, &value, &e)) {
                        assumptions.insert(Arc::from(words));
                    }
                    let value = if rules::predicts(rule.id) {
                        self.with_relation_scatter(out, value)
                    } else {
                        value
                    };
                    if let Some(a) = rule_assumption(rule.id) {
                        assumptions.insert(Arc::from(a));
                    }
                    deps.insert(out);
                    if !self.entries.contains_key(&out) {
                        fresh.push(out);
                    }
                    self.fed.extend(ins.iter().copied());
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
                        // Routes as precise as each other (to rounding) are the same
                        // information: the one resting on fewer values is the direct one (a
                        // star's density from a/R*, not through a duration derived from it).
                        let (sa, sb) = (
                            relative_spread(&a.value, &self.inputs),
                            relative_spread(&b.value, &self.inputs),
                        );
                        let same = (sa - sb).abs() <= 1e-9 * sa.abs().max(sb.abs());
                        ta.cmp(&tb).then(if same {
                            a.deps.len().cmp(&b.deps.len())
                        } else {
                            sa.total_cmp(&sb)
                        })
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
                            origin: match RULES.get(c.rule).map(|r| r.output) {
                                Some(Slot::Planet(
                                    Qty::PredictedMass
                                    | Qty::PredictedRadius
                                    | Qty::PredictedRvAmplitude,
                                )) => Origin::Predicted,
                                _ => Origin::Derived,
                            },
                            rule: Some(c.rule),
                            inputs: c.inputs,
                            deps: c.deps,
                            assumptions: c.assumptions,
                        },
                    );
                }
            }
            if progress {
                stand_ins_now = false;
            } else if stand_ins_now {
                break;
            } else {
                stand_ins_now = true;
            }
        }
    }
}

impl Derivation<'_> {
    /// A value predicted from the mean mass-radius relation, widened by the relation's
    /// intrinsic scatter: multiplied by `10^(z sigma)` with `z` a standard normal of its own
    /// (an input named after the prediction, so the error budget shows its share) and `sigma`
    /// the scatter in log10 of the predicted quantity on the branch of the nominal value.
    fn with_relation_scatter(&mut self, out: Key, value: Value) -> Value {
        let nominal_of = |q: Qty| self.entries.get(&(out.0, q)).map(|e| e.value.nominal);
        // The branch the prediction was made on, found as the rule found it, and the mass it
        // rests on (none where the prediction is the mass).
        let mass_key = [Qty::Mass, Qty::MinMass]
            .into_iter()
            .map(|q| (out.0, q))
            .find(|k| self.entries.contains_key(k));
        let found = match out.1 {
            Qty::PredictedMass => nominal_of(Qty::Radius)
                .and_then(|r| crate::formulas::predicted_mass_earth(r / crate::constants::R_EARTH))
                .map(|(_, b)| (b.sigma / b.s, b, None)),
            _ => mass_key
                .and_then(|k| self.entries.get(&k))
                .and_then(|e| {
                    crate::formulas::predicted_radius_earth(
                        e.value.nominal / crate::constants::M_EARTH,
                    )
                })
                .map(|(_, b)| (b.sigma, b, mass_key)),
        };
        let Some((sigma, branch, mass)) = found.filter(|(s, _, _)| s.is_finite() && *s > 0.0)
        else {
            return value;
        };
        // A mass is predicted only up to the largest radius the relation maps to one mass
        // (11.3 Rearth, below the Neptunian branch's own end): the range ends there.
        let to = if out.1 == Qty::PredictedMass {
            let r = crate::formulas::largest_invertible_radius_earth();
            branch.to.min((r / branch.c).powf(1.0 / branch.s))
        } else {
            branch.to
        };
        let body = self.sys.bodies.get(out.0).map_or("?", |b| b.id.as_str());
        let label = format!("{body}.{} scatter", quantities::def(out.1).name);
        let z = self.unit_normal(label);
        if let Some(&(input, _)) = z.grad.first() {
            self.widened.insert(
                out,
                super::scatter::Widened {
                    input,
                    sigma_dex: sigma,
                    from: branch.from * crate::constants::M_EARTH,
                    to: to * crate::constants::M_EARTH,
                    mass,
                },
            );
        }
        let widen = move |x: &[f64]| match x {
            [v, z] => Some(v * 10f64.powf(z * sigma)),
            _ => None,
        };
        value::apply(&widen, &[&value, &z], &self.inputs).unwrap_or(value)
    }
}

/// How the assumption of a value some of whose draws were taken at the edge of its
/// formula's domain ends, to find it among a value's assumptions.
pub(super) const EDGE_TAKEN: &str = "rather than left out, which would move the interval away from";

/// The assumption of a value some of whose draws were taken at the edge of its formula's
/// domain ([`rules::draws_at_edge`]): how many, and what it means.
fn at_edge_words(rule: &str, value: &Value, edge: &rules::Edge) -> Option<String> {
    let samples = value.samples.as_deref()?;
    let n = samples.iter().filter(|&&x| x == edge.at).count();
    if n == 0 || samples.is_empty() {
        return None;
    }
    let share = 100.0 * n as f64 / samples.len() as f64;
    Some(format!(
        "{} in {share:.1}% of the Monte Carlo draws of {rule} ({}); they are taken at {}, the nearest geometry, {EDGE_TAKEN} {}",
        edge.past,
        edge.meaning,
        edge.taken,
        crate::format::number(edge.at)
    ))
}
