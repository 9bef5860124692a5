//! Second routes to a quantity compared with the first, and pairs of quantities whose order
//! physics fixes: the `inconsistent` rule.

use super::*;

/// Pairs of one planet's quantities where the first can never exceed the second, and why.
const ORDERED: &[(Qty, Qty, &str)] = &[
    (
        Qty::MinMass,
        Qty::Mass,
        "a true mass is never below the minimum mass Mp sin i",
    ),
    (
        Qty::TransitDurationFull,
        Qty::TransitDuration,
        "the full transit (second to third contact) lies within the total transit (first to fourth contact)",
    ),
];

impl<'m> Derivation<'m> {
    pub(super) fn check_consistency(&mut self) {
        let threshold = self.options.consistency_sigma;
        // Every disagreement with the measurements it involves; reported below, fewest
        // measurements first.
        let mut found: Vec<(SortedSet<Key>, Diagnostic)> = Vec::new();
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
                // A route through a rule that only fills a gap (the star's mass from a
                // transit's density) inverts a rule whose own comparison says the same:
                // compared again through it, one disagreement would be reported twice.
                if self.through_fill(entry.rule, &entry.inputs, 0)
                    || self.through_fill(Some(c.rule), &c.inputs, 0)
                {
                    continue;
                }
                let sigma = entry.value.sigma_of_difference(&c.value, &self.inputs);
                let diff = (entry.value.nominal - c.value.nominal).abs();
                let floor = NO_UNCERTAINTY * entry.value.nominal.abs().max(c.value.nominal.abs());
                let z = diff / sigma.max(floor);
                if z <= threshold || diff <= floor {
                    continue;
                }
                let involved = self.declared_in(&entry.deps.union(&c.deps));
                if found.iter().any(|(f, _)| *f == involved) {
                    continue;
                }
                let diag = self.inconsistency(key, entry, c, (z, sigma), &involved);
                found.push((involved, diag));
            }
        }
        for bi in 0..self.sys.bodies.len() {
            for (small, large, why) in ORDERED {
                self.check_order((bi, *small), (bi, *large), why, threshold, &mut found);
            }
            self.check_transit_mass(bi, threshold, &mut found);
        }
        // One disagreement shows in every comparison whose measurements include those
        // that disagree (a declared axis against the star's mass by Kepler's law, and again
        // against its density through a/R*): the comparison with the fewest measurements is
        // reported, and none whose measurements include all of a reported one's.
        found.sort_by_key(|(involved, _)| involved.len());
        let mut reported: Vec<SortedSet<Key>> = Vec::new();
        for (involved, diag) in found {
            if reported.iter().any(|r| r.is_subset(&involved)) {
                continue;
            }
            reported.push(involved);
            self.diagnostics.push(diag);
        }
    }

    /// Whether a value from `rule` on `inputs` rests on a rule that only fills a gap
    /// ([`rules::stands_in_for`] its own output).
    fn through_fill(&self, rule: Option<usize>, inputs: &[Key], depth: usize) -> bool {
        let fills = |r: &RuleDef| match (rules::stands_in_for(r.id), r.output) {
            (Some(q), Slot::Planet(o) | Slot::Host(o) | Slot::Star(o)) => q == o,
            _ => false,
        };
        self.route_uses(rule, inputs, &fills, depth)
    }

    /// Whether a value from `rule` on `inputs` rests on a rule for which `what` holds, up the
    /// route at most [`super::slips::REEVALUATE_DEPTH`] rules deep.
    fn route_uses(
        &self,
        rule: Option<usize>,
        inputs: &[Key],
        what: &dyn Fn(&RuleDef) -> bool,
        depth: usize,
    ) -> bool {
        let Some(r) = rule.and_then(|r| RULES.get(r)) else {
            return false;
        };
        what(r)
            || (depth < super::slips::REEVALUATE_DEPTH
                && inputs.iter().any(|k| {
                    self.entries
                        .get(k)
                        .is_some_and(|e| self.route_uses(e.rule, &e.inputs, what, depth + 1))
                }))
    }

    /// `small` may not exceed `large` (a minimum mass and the true mass, a full and a total
    /// transit duration): when one of them rests on a measurement the other does not use and
    /// `small` exceeds `large` by more than `threshold` combined sigma, it is `inconsistent`.
    fn check_order(
        &mut self,
        small: Key,
        large: Key,
        why: &str,
        threshold: f64,
        found: &mut Vec<(SortedSet<Key>, Diagnostic)>,
    ) {
        let (Some(s), Some(l)) = (self.entries.get(&small), self.entries.get(&large)) else {
            return;
        };
        let (mine, theirs) = (self.declared_deps(&s.deps), self.declared_deps(&l.deps));
        if mine.is_subset(&theirs) || theirs.is_subset(&mine) {
            return; // one follows from the other's measurements, so the model orders them
        }
        let Some((z, sigma)) = self.excess(&s.value, &l.value, threshold) else {
            return;
        };
        // Compared, and found out of order: neither is idle (durations that contradict
        // each other have no impact parameter either, which this finding says already).
        self.fed.insert(small);
        self.fed.insert(large);
        let involved = self.declared_in(&s.deps.union(&l.deps));
        if found.iter().any(|(f, _)| *f == involved) {
            return;
        }
        // Both in one unit: the one a declared value of the two was written in.
        let unit = if l.rule.is_none() && s.rule.is_some() {
            self.unit_for(large, l)
        } else {
            self.unit_for(small, s)
        };
        let message = format!(
            "{} exceeds {} {}, but {why}",
            self.described(small, s, unit),
            self.described(large, l, unit),
            apart(z, s.value.nominal, l.value.nominal, sigma),
        );
        // Point at the declared one of the two (the measurement to check first).
        let span = [small, large]
            .iter()
            .find_map(|k| self.declared_span(*k))
            .or_else(|| involved.iter().find_map(|k| self.declared_span(*k)))
            .unwrap_or_default();
        // The declared one of the two, off by the ratio of two units (a mass in Mearth meant
        // as Mjup falls below the minimum mass 318 times over).
        let direct = match (s.rule, l.rule) {
            (None, _) => self.slip(small, &s.value, &l.value, Some(true)),
            (_, None) => self.slip(large, &l.value, &s.value, Some(false)),
            _ => None,
        };
        // Else further up the derived one's route (an amplitude in km/s meant as m/s makes
        // the minimum mass exceed the declared mass a thousand times over).
        let (small_name, large_name) = (self.key_name(small), self.key_name(large));
        let mut slips: Vec<String> = direct.into_iter().collect();
        if let Some(r) = s.rule.filter(|_| slips.is_empty()) {
            slips.extend(self.upstream_slip(
                (r, &s.inputs, &s.value, &s.deps),
                (&l.value, &l.deps, &large_name),
                unit,
                Some(true),
            ));
        }
        if let Some(r) = l.rule.filter(|_| slips.is_empty()) {
            slips.extend(self.upstream_slip(
                (r, &l.inputs, &l.value, &l.deps),
                (&s.value, &s.deps, &small_name),
                unit,
                Some(false),
            ));
        }
        let slip = super::slips::readings_help(&slips);
        let mut d = Diagnostic::new(Rule::Inconsistent, span, message)
            .with_help(slip.unwrap_or_else(|| GENERAL_HELP.to_string()));
        if let Some(n) = self.shared(unit, &s.value, &l.value, sigma) {
            d = d.with_note(n);
        }
        self.grade(
            &mut d,
            z,
            no_uncertainty(s.value.nominal, l.value.nominal, sigma),
        );
        let d = self.label_involved(d, span, &involved);
        found.push((involved, d));
    }

    /// A transiting planet's declared mass may not exceed its minimum mass over the sine of
    /// the lowest inclination at which it still transits: cos i <= (1 + k) / (a/R*), widened
    /// for an eccentric orbit by 1/(1 - e) (the most (1 + e sin omega)/(1 - e^2) can be;
    /// Winn 2010 eq. 7 with b <= 1 + k). Checked where no inclination is known (with one,
    /// the true mass is derived and compared as a route); the planet's mass in M* + Mp is
    /// neglected in the bound, which only makes it looser for a heavy planet.
    fn check_transit_mass(
        &mut self,
        bi: usize,
        threshold: f64,
        found: &mut Vec<(SortedSet<Key>, Diagnostic)>,
    ) {
        let get = |q: Qty| self.entries.get(&(bi, q));
        let transits = [Qty::TransitDepth, Qty::RadiusRatio, Qty::TransitDuration]
            .iter()
            .any(|q| get(*q).is_some_and(|e| e.rule.is_none()));
        if !transits || get(Qty::Inclination).is_some() {
            return;
        }
        let (Some(mass), Some(min), Some(ars)) =
            (get(Qty::Mass), get(Qty::MinMass), get(Qty::ScaledAxis))
        else {
            return;
        };
        if mass.rule.is_some() {
            return; // only a declared mass is bounded here
        }
        // A depth alone cannot tell a grazing transit, whose radius ratio may be far above
        // sqrt(depth): without a declared radius the ratio is taken as large as
        // GRAZING_RATIO; with one, as the declared radius over the star's.
        let from_depth = get(Qty::RadiusRatio).map_or(0.0, |e| e.value.nominal.max(0.0));
        let declared_ratio = match (get(Qty::Radius), self.entries.get(&(bi, Qty::StarRadius))) {
            (Some(r), Some(rs)) if r.rule.is_none() && rs.value.nominal > 0.0 => {
                Some(r.value.nominal / rs.value.nominal)
            }
            _ => None,
        };
        let k = match declared_ratio {
            Some(k) => k.max(from_depth),
            None => from_depth.max(GRAZING_RATIO),
        };
        let e = get(Qty::Eccentricity).map_or(0.0, |e| e.value.nominal.clamp(0.0, 0.99));
        // a/R* two standard deviations low: the bound errs on the side of no finding.
        let (lo, _) = ars.value.linear_spread(&self.inputs);
        let ars_low = ars.value.nominal - 2.0 * lo;
        let cos_max = (1.0 + k) / (ars_low * (1.0 - e));
        if !(cos_max.is_finite() && cos_max > 0.0 && cos_max < 1.0) {
            return;
        }
        let sin_min = (1.0 - cos_max * cos_max).sqrt();
        let most = Value {
            nominal: min.value.nominal / sin_min,
            grad: min
                .value
                .grad
                .iter()
                .map(|&(i, d)| (i, d / sin_min))
                .collect(),
            samples: None,
        };
        let Some((z, sigma)) = self.excess(&mass.value, &most, threshold) else {
            return;
        };
        let involved = self.declared_in(&mass.deps.union(&min.deps).union(&ars.deps));
        if found.iter().any(|(f, _)| *f == involved) {
            return;
        }
        let key = (bi, Qty::Mass);
        let unit = self.unit_for(key, mass);
        let message = format!(
            "{} exceeds {}, the most a transiting orbit allows, {}: the minimum mass {} over sin i at the lowest inclination that still transits ({:.1} deg for a/R* = {}, two standard deviations low)",
            self.described(key, mass, unit),
            self.shown(unit, &most),
            apart(z, mass.value.nominal, most.nominal, sigma),
            self.shown(unit, &min.value),
            cos_max.acos().to_degrees(),
            crate::format::sig(ars_low, 3),
        );
        let span = self.declared_span(key).unwrap_or_default();
        let slips: Vec<String> = self
            .slip(key, &mass.value, &most, Some(false))
            .into_iter()
            .collect();
        let mut d = Diagnostic::new(Rule::Inconsistent, span, message)
            .with_help(super::slips::readings_help(&slips).unwrap_or_else(|| GENERAL_HELP.to_string()))
            .with_note(if e > 0.0 {
                "cos i <= (1 + Rp/R*) / ((a/R*)(1 - e)): the transit's impact parameter is at most 1 + Rp/R* (Winn 2010 eq. 7, the orbit's shape taken at its most favourable; without a declared radius, Rp/R* up to 0.5, as a grazing transit allows)"
            } else {
                "cos i <= (1 + Rp/R*) / (a/R*): the transit's impact parameter is at most 1 + Rp/R* (Winn 2010 eq. 7, circular orbit; without a declared radius, Rp/R* up to 0.5, as a grazing transit allows)"
            });
        self.grade(
            &mut d,
            z,
            no_uncertainty(mass.value.nominal, most.nominal, sigma),
        );
        let d = self.label_involved(d, span, &involved);
        found.push((involved, d));
    }

    /// How many combined standard deviations `small` exceeds `large` by, with the standard
    /// deviation of their difference (shared inputs counted once), when past `threshold`
    /// and past the floor below which a difference is rounding.
    fn excess(&self, small: &Value, large: &Value, threshold: f64) -> Option<(f64, f64)> {
        let excess = small.nominal - large.nominal;
        let floor = NO_UNCERTAINTY * small.nominal.abs().max(large.nominal.abs());
        let sigma = small.sigma_of_difference(large, &self.inputs);
        let z = excess / sigma.max(floor);
        (excess > floor && z > threshold).then_some((z, sigma))
    }

    /// The values among `deps` that no rule derived (declared, and defaults): the
    /// measurements a finding involves.
    fn declared_in(&self, deps: &SortedSet<Key>) -> SortedSet<Key> {
        let mut involved = deps.clone();
        involved.retain(|k| self.entries.get(k).is_some_and(|e| e.rule.is_none()));
        involved
    }

    /// [`shared_note`] for two values.
    fn shared(&self, unit: DisplayUnit, a: &Value, b: &Value, sigma: f64) -> Option<String> {
        let own = |v: &Value| {
            let (lo, hi) = v.linear_spread(&self.inputs);
            (lo + hi) / 2.0
        };
        shared_note(
            unit,
            (a.nominal - b.nominal).abs(),
            own(a).min(own(b)),
            sigma,
        )
    }

    /// Where the value used for `k` is declared: the source chosen among several (the first
    /// declaration is not always the one used), or the first source averaged for a weighted
    /// mean.
    pub(super) fn declared_span(&self, k: Key) -> Option<Span> {
        self.declaration_used(k).map(|d| d.value_span)
    }

    /// The declaration whose value is used for `k` (see [`Self::declared_span`]).
    pub(super) fn declaration_used(&self, k: Key) -> Option<&crate::model::Declared> {
        let body = self.sys.bodies.get(k.0)?;
        match self.chosen.get(&k) {
            Some(c) => {
                let all = body.sources(k.1);
                match c.index {
                    Some(i) => all.get(i).copied(),
                    // A weighted mean: its first source averaged (not a limit, an assumed
                    // value or one without an uncertainty listed before it).
                    None => all
                        .iter()
                        .find(|d| match &d.content {
                            crate::model::Content::Measured(m) => {
                                super::sources::ranked(m, d.assumed)
                            }
                            _ => false,
                        })
                        .or(all.first())
                        .copied(),
                }
            }
            None => body.get(k.1),
        }
    }

    /// Whether the value used for `k` is the weighted mean of its sources.
    fn is_mean(&self, k: Key) -> bool {
        self.chosen.get(&k).is_some_and(|c| c.index.is_none())
    }

    /// A value with its uncertainty and unit, as diagnostics show it. Two values a message
    /// compares are shown in one unit (the first one's), so a reader compares numbers, not
    /// units (1.3 Rjup against 0.37 Rjup, not against 4.2 Rearth).
    fn shown(&self, unit: DisplayUnit, v: &Value) -> String {
        let (lo, hi) = v.linear_spread(&self.inputs);
        let number = crate::format::with_uncertainty(unit.of(v.nominal), unit.of(lo), unit.of(hi));
        if unit.symbol == "1" {
            number // a plain number (a/R*, an eccentricity) has no unit to show
        } else {
            format!("{number} {unit}")
        }
    }

    /// `declared b.mass = ...`, or `b.mass = ... from inputs (rule)`, in `unit`.
    /// The unit a finding quotes a value in: for a declared value, the unit it was written
    /// in (a mass written in Mjup stays in Mjup, however small); else the usual one.
    fn unit_for(&self, key: Key, entry: &Entry) -> DisplayUnit<'_> {
        let written = entry
            .rule
            .is_none()
            .then(|| {
                self.sys
                    .bodies
                    .get(key.0)?
                    .get(key.1)?
                    .written_unit
                    .as_deref()
            })
            .flatten();
        summary::written_unit(written, key.1, entry.value.nominal)
    }

    fn described(&self, key: Key, entry: &Entry, unit: DisplayUnit) -> String {
        let value = self.shown(unit, &entry.value);
        match entry.rule {
            None => format!("declared {} = {value}", self.key_name(key)),
            Some(r) => format!(
                "{} = {value} from {} ({})",
                self.key_name(key),
                self.route(&entry.inputs),
                RULES.get(r).map_or("?", |r| r.id)
            ),
        }
    }

    fn route(&self, inputs: &[Key]) -> String {
        inputs
            .iter()
            .map(|k| self.key_name(*k))
            .collect::<Vec<_>>()
            .join(", ")
    }

    /// The finding for a declared or derived value and a candidate route that disagree by
    /// `z` combined standard deviations of `sigma` (SI).
    pub(super) fn inconsistency(
        &self,
        key: Key,
        entry: &Entry,
        c: &Candidate,
        (z, sigma): (f64, f64),
        involved: &SortedSet<Key>,
    ) -> Diagnostic {
        let body = self.sys.bodies.get(key.0);
        let rule = RULES.get(c.rule);
        let unit = self.unit_for(key, entry);
        let message = format!(
            "{} disagrees with {} from {} ({}) {}",
            self.described(key, entry, unit),
            self.shown(unit, &c.value),
            self.route(&c.inputs),
            rule.map_or("?", |r| r.id),
            apart(z, entry.value.nominal, c.value.nominal, sigma)
        );
        let span = self
            .declared_span(key)
            .or_else(|| involved.iter().find_map(|k| self.declared_span(*k)))
            .or_else(|| body.map(|b| b.name_span))
            .unwrap_or_default();
        // A declared value off by the ratio of two units says which (318 times: Mearth
        // written for Mjup), and so does a measurement further up either route (the
        // candidate's, then the value's own): every reading that fits is named, since two can
        // (a radius in Rearth meant as Rjup, or the depth it comes from written as a fraction
        // where % was meant).
        let name = self.key_name(key);
        let mut slips: Vec<String> = (entry.rule.is_none())
            .then(|| self.slip(key, &entry.value, &c.value, None))
            .flatten()
            .into_iter()
            .collect();
        slips.extend(self.upstream_slip(
            (c.rule, &c.inputs, &c.value, &c.deps),
            (&entry.value, &entry.deps, &name),
            unit,
            None,
        ));
        if let Some(r) = entry.rule {
            slips.extend(self.upstream_slip(
                (r, &entry.inputs, &entry.value, &entry.deps),
                (&c.value, &c.deps, &name),
                unit,
                None,
            ));
        }
        let slip = super::slips::readings_help(&slips);
        let mut d = Diagnostic::new(Rule::Inconsistent, span, message)
            .with_help(slip.unwrap_or_else(|| GENERAL_HELP.to_string()));
        if let Some(r) = rule {
            d = d.with_note(format!("{}: {}", r.id, r.formula));
        }
        // A radius ratio of sqrt(depth) takes the transit as not grazing: a larger radius
        // on the other side may be a grazing transit's, which only an impact parameter tells.
        let not_grazing = |r: &RuleDef| r.id == "depth-radius-ratio";
        let theirs_from_depth = self.route_uses(Some(c.rule), &c.inputs, &not_grazing, 0);
        let mine_from_depth = self.route_uses(entry.rule, &entry.inputs, &not_grazing, 0);
        let (from_depth, other) = if theirs_from_depth {
            (&c.value, &entry.value)
        } else {
            (&entry.value, &c.value)
        };
        if theirs_from_depth != mine_from_depth && other.nominal > from_depth.nominal {
            d = d.with_note(
                "the radius ratio from the depth, sqrt(depth), takes the transit as not grazing; \
                 a grazing transit shows a smaller depth for the same radius, so unless the \
                 transit grazes the star (an impact parameter near 1 + Rp/R* would say so), the \
                 two disagree",
            );
        }
        if let Some(n) = self.shared(unit, &entry.value, &c.value, sigma) {
            // Where two routes share most inputs, the disagreement comes from the
            // measurements only one of them uses: name them, so that two nearly equal
            // numbers far apart in sigma point to what to check.
            let mine = self.declared_deps(&entry.deps);
            let mut theirs = self.declared_deps(&c.deps);
            theirs.remove(&key);
            let only = |a: &SortedSet<Key>, b: &SortedSet<Key>| -> Vec<String> {
                a.iter()
                    .filter(|k| !b.contains(k))
                    .map(|k| self.key_name(*k))
                    .collect()
            };
            let (first, second) = (only(&mine, &theirs), only(&theirs, &mine));
            let n = if first.is_empty() || second.is_empty() {
                n
            } else {
                format!(
                    "{n}; it comes from the measurements the two routes do not share: {} against {}",
                    crate::text::and_list(&first),
                    crate::text::and_list(&second)
                )
            };
            d = d.with_note(n);
        }
        self.grade(
            &mut d,
            z,
            no_uncertainty(entry.value.nominal, c.value.nominal, sigma),
        );
        self.label_involved(d, span, involved)
    }

    /// Labels every declared measurement among `involved` not at `span`.
    fn label_involved(
        &self,
        mut d: Diagnostic,
        span: Span,
        involved: &SortedSet<Key>,
    ) -> Diagnostic {
        for k in involved {
            if let Some(at) = self.declared_span(*k) {
                if at != span {
                    let what = if self.is_mean(*k) {
                        format!(
                            "{} is used (the weighted mean of its measurements, the first here)",
                            self.key_name(*k)
                        )
                    } else {
                        format!("{} is used here", self.key_name(*k))
                    };
                    d = d.with_label(at, what);
                }
            }
        }
        d
    }

    /// An `inconsistent` finding at `z` combined sigma is an error past the error threshold,
    /// else a warning; the note says which threshold it crossed.
    pub(super) fn grade(&self, d: &mut Diagnostic, z: f64, exact: bool) {
        let (warn, error) = (
            self.options.consistency_sigma,
            self.options.consistency_error_sigma,
        );
        if exact {
            // No sigma to speak of: the difference has no uncertainty at all.
            d.severity = crate::diagnostic::Severity::Error;
            d.notes.push("an error: every value both routes rest on is exact, so any difference past rounding passes every threshold; a value written without an uncertainty is taken as exact: if these are rounded (2.1 for 2.146), give each the uncertainty its digits allow (± 0.05 for 2.1)".to_string());
            return;
        }
        if z > error {
            d.severity = crate::diagnostic::Severity::Error;
            d.notes.push(format!(
                "an error: past the error threshold of {error} sigma (--error-sigma)"
            ));
        } else {
            d.notes.push(format!(
                "a warning: between the thresholds of {warn} and {error} sigma (--sigma, --error-sigma)"
            ));
        }
    }

    /// The declared measurements among `deps` (defaults and derived values left out).
    pub(super) fn declared_deps(&self, deps: &SortedSet<Key>) -> SortedSet<Key> {
        deps.iter()
            .copied()
            .filter(|k| {
                self.entries
                    .get(k)
                    .is_some_and(|e| e.rule.is_none() && e.origin != Origin::Default)
            })
            .collect()
    }
}

/// When two values that disagree share inputs whose uncertainties cancel in their difference
/// (its uncertainty `sigma` well below `own`, the smaller of the values' own), they can look
/// alike to the digits shown and still differ by many of the difference's standard
/// deviations: the note gives the difference itself (SI in, shown in `unit`).
pub(super) fn shared_note(
    unit: DisplayUnit,
    difference: f64,
    own: f64,
    sigma: f64,
) -> Option<String> {
    if !(sigma > 0.0 && sigma < 0.5 * own) {
        return None;
    }
    let u = if unit.symbol == "1" {
        String::new()
    } else {
        format!(" {unit}")
    };
    Some(format!(
        "the two share inputs whose uncertainties cancel in their difference: they differ by {}{u}, and that difference is known to ± {}{u}, far better than either value",
        crate::format::sig(unit.of(difference), 2),
        crate::format::sig(unit.of(sigma), 2)
    ))
}

/// The largest radius ratio a transit seen only through its depth is allowed in the bound on
/// a transiting planet's mass (a grazing transit's depth says little of it): a Jupiter-sized
/// body before a star of 0.2 Rsun.
const GRAZING_RATIO: f64 = 0.5;

/// The help of an inconsistency that no unit slip explains.
const GENERAL_HELP: &str =
    "check the units and the sources of these measurements; one of them may belong to another body or epoch";

/// A difference or uncertainty below this fraction of the values compared counts as none:
/// rounding and the tolerance of the numerical solutions (the transiting planet's axis is
/// iterated with its mass, and two routes through it agree to a few parts in 10^8), not
/// measurement. Two routes that share every uncertain input can differ by that much while
/// their difference has an uncertainty smaller still.
const NO_UNCERTAINTY: f64 = 1e-6;

/// Whether the difference of `a` and `b` has no uncertainty to weigh it by (see
/// [`NO_UNCERTAINTY`]).
fn no_uncertainty(a: f64, b: f64, sigma: f64) -> bool {
    sigma <= NO_UNCERTAINTY * a.abs().max(b.abs())
}

/// How far apart two values are, for a message: `by 3.2 sigma`; or, when the difference has
/// no uncertainty to weigh it by (every input both rest on is exact, so any difference
/// passes every threshold), by how many per cent: a number of sigma over a zero uncertainty
/// (`by 133764973.4 sigma`) says nothing.
fn apart(z: f64, a: f64, b: f64, sigma: f64) -> String {
    let scale = a.abs().max(b.abs());
    if !no_uncertainty(a, b, sigma) {
        return format!("by {z:.1} sigma");
    }
    let percent = (a - b).abs() / scale * 100.0;
    // Three significant digits: `24.9 %`, `0.0123 %`.
    let decimals = usize::try_from(2 - percent.log10().floor() as i64).unwrap_or(0);
    format!(
        "by {percent:.decimals$} %, with no uncertainty to weigh the difference by (every \
         value they rest on is exact)"
    )
}
