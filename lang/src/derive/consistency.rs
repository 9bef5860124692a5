//! Second routes to a quantity compared with the first: the `inconsistent` rule.

use super::*;

impl<'m> Derivation<'m> {
    pub(super) fn check_consistency(&mut self) {
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

    pub(super) fn inconsistency(
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
            format!(
                "{} {unit}",
                crate::format::with_uncertainty(unit.of(v.nominal), unit.of(lo), unit.of(hi))
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
