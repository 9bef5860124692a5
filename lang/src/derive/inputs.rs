//! Declared measurements, defaults and spectral-type estimates become the inputs of the
//! engine: values with their uncertainty, samples (Monte Carlo) and labels.

use super::*;

/// Defaults for planet quantities that rules need, with the words shown when used.
pub(super) fn default_for(q: Qty) -> Option<(f64, &'static str)> {
    Some(match q {
        Qty::Eccentricity => (0.0, "eccentricity = 0 (default: circular orbit)"),
        Qty::ArgPeriastron => (
            std::f64::consts::FRAC_PI_2,
            "argument of periastron = 90 deg (default; no effect on a circular orbit)",
        ),
        Qty::Albedo => (0.0, "Bond albedo = 0 (default)"),
        Qty::MeanMolecularWeight => (
            2.3,
            "mean molecular weight 2.3 (default: hydrogen and helium of solar composition; common practice)",
        ),
        Qty::Redistribution => (
            1.0,
            "heat redistribution f = 1 (default: full redistribution)",
        ),
        _ => return None,
    })
}

/// The assumption of an eccentric orbit's argument of periastron when none is declared.
pub const SPREAD_PERIASTRON: &str =
    "argument of periastron unknown: spread uniformly over 0-360 deg (default)";

/// An input asymmetric by this factor or more is skewed: first order does not describe it.
const SKEWED_RATIO: f64 = 1.5;

/// How far, in its uncertainty on that side, the truncation of a measurement to its
/// quantity's range must move its median to be noted: a tenth, about where the two digits
/// every output shows of an uncertainty would see it (an eccentricity of `0.05 ± 0.03`,
/// 4.8 % of it below 0, moves by 0.07 of its uncertainty and is not noted; `0.2 ± 0.3`
/// moves by 0.32).
const TRUNCATED_SHIFT: f64 = 0.1;
/// The factor is compared to a part in 10^4, so that one measurement written in another unit
/// (`0.88 +0.03/-0.02 Rsun` as `95.9872 +3.27229/-2.18153 Rearth`, a ratio of 1.499998) is
/// classed alike.
const RATIO_TOLERANCE: f64 = 1e-4;

impl<'m> Derivation<'m> {
    /// A standard normal input (mean 0, standard deviation 1) shared by the values that
    /// scale it: a relation's scatter, a spectral type's subtype.
    pub(super) fn unit_normal(&mut self, label: String) -> Value {
        self.new_input(
            None,
            label,
            &Measurement {
                value: 0.0,
                below: 1.0,
                above: 1.0,
                form: Form::Symmetric,
            },
            f64::NEG_INFINITY,
            f64::INFINITY,
        )
    }

    /// A new input of the engine: `key` is the quantity it is the value of (`None` for a
    /// literal in an expression or a prediction's scatter, which are always sampled).
    pub(super) fn new_input(
        &mut self,
        key: Option<Key>,
        label: String,
        m: &Measurement,
        lo: f64,
        hi: f64,
    ) -> Value {
        let id = u32::try_from(self.inputs.len()).unwrap_or(u32::MAX);
        if let Some(at) = self.pinned.get(&label) {
            // A limit evaluated at one end of its range (see
            // `validity::bound_where_limited`), a measurement at one of its sides (see
            // `asymmetric.rs`, `two_lines_at_sides`).
            let v = match (at, m.form) {
                (super::PinAt::OtherEnd, Form::UpperLimit) => Some(lo),
                (super::PinAt::OtherEnd, Form::LowerLimit) => Some(hi),
                (super::PinAt::Limit, Form::UpperLimit | Form::LowerLimit) => Some(m.value),
                // Within the quantity's range, where its samples are kept: an impact
                // parameter of 0.02 +- 0.2 is taken at 0 below.
                (super::PinAt::Above, Form::Symmetric | Form::Asymmetric) => {
                    Some((m.value + m.above).min(hi))
                }
                (super::PinAt::Below, Form::Symmetric | Form::Asymmetric) => {
                    Some((m.value - m.below).max(lo))
                }
                _ => None,
            };
            if let Some(v) = v {
                return Value::exact(v, self.n());
            }
        }
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
        // Each input's draws come from its own seed, so leaving some out changes no other.
        let samples =
            (n > 0 && key.is_none_or(|k| self.wants_samples(k))).then(|| match &self.grid {
                Some(grid) => grid.column(&label, nominal),
                None => {
                    let seed = value::stable_hash(&[&self.sys.name, &label], self.options.seed);
                    value::draw(m, lo, hi, n, seed)
                }
            });
        let shape = if m.form.is_limit() {
            value::Shape::Uniform
        } else if below.max(above) >= SKEWED_RATIO * (1.0 - RATIO_TOLERANCE) * below.min(above) {
            value::Shape::Skewed
        } else {
            value::Shape::Normal
        };
        // The share of its stated distribution outside the quantity's range.
        let outside =
            super::truncation::truncation(m, lo, hi).map_or(0.0, |(under, over, _)| under + over);
        let angle = key.is_some_and(|k| quantities::def(k.1).dim == crate::units::Dimension::ANGLE);
        let wide = shape == value::Shape::Normal
            && !angle
            && key.is_some_and(|k| super::validity::ratio_scale(k.1))
            && 0.5 * (below + above) > super::validity::WIDE_RELATIVE * nominal.abs();
        self.inputs.push(InputInfo {
            label,
            below,
            above,
            shape,
            limit: None,
            outside,
            angle,
            periodic: key.is_some_and(|k| k.1 == Qty::ArgPeriastron),
            wide,
        });
        let exact = below == 0.0 && above == 0.0;
        Value {
            nominal,
            grad: if exact { Vec::new() } else { vec![(id, 1.0)] },
            samples,
        }
    }

    /// A note on a measurement whose uncertainty puts enough of its stated distribution
    /// outside its quantity's range to move the median by [`TRUNCATED_SHIFT`] of its
    /// uncertainty, and the words of the assumption that says how it is sampled
    /// ([`super::truncation`]).
    fn truncated_note(
        &mut self,
        label: &str,
        qty: Qty,
        written: Option<&str>,
        m: &Measurement,
        span: crate::source::Span,
    ) -> Option<String> {
        let (lo, hi) = quantities::def(qty).limits();
        let (below, above, median) = super::truncation::truncation(m, lo, hi)?;
        // On the side the median moves to: `4 +1/-6 m/s` has a quarter of it below 0, and
        // its median moves up by 0.32 m/s, a third of its upper side (a twentieth of 6).
        let side = if median > m.value { m.above } else { m.below };
        if (median - m.value).abs() < TRUNCATED_SHIFT * side {
            return None;
        }
        let unit = summary::written_unit(written, qty, m.value);
        let f = unit.factor;
        let with_unit = |text: String| {
            if unit.symbol.is_empty() || unit.symbol == "1" {
                text
            } else {
                format!("{text} {}", unit.symbol)
            }
        };
        // An end of the range as a number; the median to the digits of the declared value.
        let end = |v: f64| with_unit(crate::format::number(v / f));
        let at_digits = |v: f64| {
            let t = crate::format::with_uncertainty(v / f, m.below / f, m.above / f);
            with_unit(t.split(' ').next().unwrap_or_default().to_string())
        };
        // Each tail that holds at least 0.05 %, with its own share.
        let pct = |p: f64| crate::format::number((p * 1000.0).round() / 10.0);
        let tails: Vec<String> = [(below, "below", lo), (above, "above", hi)]
            .into_iter()
            .filter(|(p, _, _)| *p >= 0.0005)
            .enumerate()
            .map(|(i, (p, word, at))| {
                let lies = if i == 0 {
                    " of its probability lies"
                } else {
                    ""
                };
                format!("{}%{lies} {word} {}", pct(p), end(at))
            })
            .collect();
        let side = crate::text::and_list(&tails);
        let declared = crate::report::shown_in(m.value, m.below, m.above, m.form, unit);
        let words = format!(
            "{label} = {declared} sampled inside its valid range ({side}, drawn again there), so the sampled median is {} (a truncated distribution)",
            at_digits(median)
        );
        // First-order mode draws it only for the values it cannot describe (those taking a
        // share of their variance from it, see `validity::OUTSIDE_LIMIT`).
        let kept = if self.options.propagation == Propagation::Linear {
            "values that take much of their variance from it are sampled, with its draws kept inside the range, whose median is"
        } else {
            "sampled values are kept inside the range, so their median is"
        };
        self.diagnostics.push(
            Diagnostic::new(
                Rule::Truncated,
                span,
                format!(
                    "{label} = {declared} reaches outside the range it can take: {side}; {kept} {}, not {}",
                    at_digits(median),
                    at_digits(m.value)
                ),
            )
            .with_help("if the data only bound the value, declare a limit (`<` or `>`) instead; if the published value is a median with percentiles of a fit kept inside the range, this is expected")
        );
        Some(words)
    }

    pub(super) fn declare_measurements(&mut self) {
        let sys = self.sys;
        for (bi, body) in sys.bodies.iter().enumerate() {
            for decl in &body.declared {
                let Content::Measured(m) = &decl.content else {
                    continue;
                };
                let def = quantities::def(decl.qty);
                let chosen_m;
                // The declaration whose value is used (the first for a weighted mean).
                let mut used = decl;
                let (m, choice_words) = match self.choose_source(bi, decl) {
                    Some((chosen, words)) => {
                        chosen_m = chosen.measurement;
                        if let Some(d) = chosen
                            .index
                            .and_then(|i| body.sources(decl.qty).get(i).copied())
                        {
                            used = d;
                        }
                        (&chosen_m, Some(words))
                    }
                    None => (m, None),
                };
                let (lo, hi) = super::limit_range::range(def, m);
                if !m.can_be_sampled(def) {
                    let mut d = Diagnostic::new(
                        Rule::NotDerivable,
                        used.span,
                        format!(
                            "the lower limit on '{}' is not used in derivations",
                            def.name
                        ),
                    )
                    .with_note(super::summary::UNUSABLE_LOWER_LIMIT);
                    let measured = body
                        .sources(decl.qty)
                        .iter()
                        .any(|s| matches!(&s.content, Content::Measured(x) if !x.form.is_limit()));
                    if measured {
                        d = d.with_help(format!(
                            "another declaration of '{}' is a measurement: take `preferred` off this limit (or choose the measurement) to use it",
                            def.name
                        ));
                    }
                    self.diagnostics.push(d);
                    continue;
                }
                let label = format!("{}.{}", body.id, def.name);
                let truncated = self.truncated_note(
                    &label,
                    decl.qty,
                    used.written_unit.as_deref(),
                    m,
                    used.span,
                );
                let before = self.inputs.len();
                let v = self.new_input(Some((bi, decl.qty)), label, m, lo, hi);
                // A declared limit (an unknown angle spread over a turn is not one); a limit
                // taken at its value (pinned) adds no input.
                if m.form.is_limit() && self.inputs.len() > before {
                    if let Some(input) = self.inputs.last_mut() {
                        input.limit = Some((m.form, m.value));
                    }
                }
                let combined = self
                    .chosen
                    .get(&(bi, decl.qty))
                    .is_some_and(|c| c.mean.is_some() && c.index.is_none());
                let origin = if combined {
                    Origin::Combined
                } else {
                    Origin::of(used)
                };
                let mut assumptions: SortedSet<Arc<str>> = SortedSet::new();
                if let Some(words) = &used.set {
                    assumptions.insert(Arc::from(words.as_str()));
                }
                if let Some(words) = choice_words {
                    assumptions.insert(Arc::from(words));
                }
                if let Some(words) =
                    truncated.filter(|_| self.options.propagation == Propagation::MonteCarlo)
                {
                    assumptions.insert(Arc::from(words));
                }
                // The value itself, in the unit people read it in (an axis was given in
                // metres without a unit); not for a mean, which no assumed value enters.
                if used.assumed && !combined {
                    let unit =
                        summary::written_unit(used.written_unit.as_deref(), decl.qty, m.value);
                    assumptions.insert(Arc::from(format!(
                        "{}.{} = {} (assumed)",
                        body.id,
                        def.name,
                        crate::report::shown_in(m.value, m.below, m.above, m.form, unit)
                    )));
                }
                if decl.qty == Qty::TransitEpoch {
                    for a in epoch_assumptions(used) {
                        assumptions.insert(Arc::from(a));
                    }
                }
                if m.form.is_limit() {
                    // In the unit it was written in (`< 3 m/s`, `< 0.08`).
                    let unit =
                        summary::written_unit(used.written_unit.as_deref(), decl.qty, m.value);
                    let declared = crate::report::shown_in(m.value, 0.0, 0.0, m.form, unit);
                    let words = super::limit_range::words(
                        &format!("{}.{}", body.id, def.name),
                        &declared,
                        m,
                        (lo, hi),
                        def,
                        unit,
                    );
                    assumptions.insert(Arc::from(words));
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
                    Qty::MeanMolecularWeight,
                ] {
                    if body.get(q).is_some() {
                        continue;
                    }
                    // A circular orbit declared exactly (`eccentricity = 0`) has no
                    // orientation to spread: the default applies, as when nothing is declared.
                    let circular = body.get(Qty::Eccentricity).is_some_and(
                        |d| matches!(&d.content, Content::Measured(m) if m.is_exactly(0.0)),
                    );
                    if q == Qty::ArgPeriastron && body.get(Qty::Eccentricity).is_some() && !circular
                    {
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
                        let value = self.new_input(
                            Some((bi, q)),
                            format!("{}.arg_periastron", body.id),
                            &m,
                            0.0,
                            turn,
                        );
                        self.entries.insert(
                            (bi, q),
                            Entry {
                                value,
                                origin: Origin::Default,
                                rule: None,
                                inputs: Vec::new(),
                                deps: SortedSet::one((bi, q)),
                                assumptions: SortedSet::one(Arc::from(SPREAD_PERIASTRON)),
                            },
                        );
                        continue;
                    }
                    if let Some((v, words)) = default_for(q) {
                        // A value written but refused (its error says why) is replaced by the
                        // default: said beside it, so that the default is not read as chosen.
                        let words: Arc<str> = if body.refused.iter().any(|(r, _)| *r == q) {
                            Arc::from(format!(
                                "{words}; the value written for {} could not be used (see its error)",
                                body.id
                            ))
                        } else {
                            Arc::from(words)
                        };
                        self.entries.insert(
                            (bi, q),
                            Entry {
                                value: Value::exact(v, self.n()),
                                origin: Origin::Default,
                                rule: None,
                                inputs: Vec::new(),
                                deps: SortedSet::one((bi, q)),
                                assumptions: SortedSet::one(words),
                            },
                        );
                    }
                }
            }
        }
    }

    /// For a quantity declared several times: the value used (recorded in `chosen`) and the
    /// sentence that says which and how. `None` for a quantity declared once.
    fn choose_source(
        &mut self,
        bi: usize,
        first: &model::Declared,
    ) -> Option<(sources::Chosen, String)> {
        let body = self.sys.bodies.get(bi)?;
        let all = body.sources(first.qty);
        if all.len() < 2 {
            return None;
        }
        let (measurements, assumed): (Vec<Measurement>, Vec<bool>) = all
            .iter()
            .filter_map(|d| match &d.content {
                Content::Measured(m) => Some((*m, d.assumed)),
                _ => None,
            })
            .unzip();
        let marked = all.iter().position(|d| d.preferred);
        let mut policy = self.options.source_choice;
        let not_averaged = (first.qty == Qty::TransitEpoch
            && policy == sources::SourceChoice::WeightedMean)
            .then(|| {
                let scales: Vec<Option<&str>> =
                    all.iter().map(|d| d.written_unit.as_deref()).collect();
                let period = body
                    .sources(Qty::Period)
                    .iter()
                    .find_map(|d| match &d.content {
                        Content::Measured(m) if !m.form.is_limit() => Some(m.value),
                        _ => None,
                    });
                sources::epochs_not_averaged(&measurements, &scales, period)
            })
            .flatten();
        if not_averaged.is_some() {
            policy = sources::SourceChoice::MostPrecise;
        }
        let chosen = sources::choose(&measurements, &assumed, marked, policy).map(|c| {
            if c.choice == sources::Choice::MostPrecise {
                sources::Chosen { not_averaged, ..c }
            } else {
                c
            }
        });
        // The index among the measurements is the index among all declarations when every
        // one is a measurement (a text quantity is never chosen among).
        let used = chosen
            .as_ref()
            .and_then(|c| c.index)
            .filter(|_| measurements.len() == all.len());
        self.sources_disagree(body, &all, used);
        let chosen = chosen?;
        let cites: Vec<Vec<String>> = all
            .iter()
            .map(|d| d.citations.iter().map(|c| c.0.clone()).collect())
            .collect();
        let lines: Vec<Option<usize>> = all.iter().map(|d| self.lines.line(d.span.start)).collect();
        let name = format!("{}.{}", body.id, quantities::def(first.qty).name);
        let words = sources::words(&name, &cites, &lines, &chosen, &measurements);
        self.chosen.insert((bi, first.qty), chosen.clone());
        Some((chosen, words))
    }

    /// `sources-disagree` for each declaration of one quantity further than the consistency
    /// threshold from an earlier one (reported once, against the first such, the value in
    /// use first: its disagreements are the ones that matter).
    fn sources_disagree(
        &mut self,
        body: &model::Body,
        all: &[&model::Declared],
        used: Option<usize>,
    ) {
        let shown = |d: &model::Declared| {
            let Content::Measured(m) = &d.content else {
                return None;
            };
            let cites = crate::text::citation_mark(d.citations.iter().map(|c| c.0.as_str()));
            if d.qty == Qty::TransitEpoch {
                // A Julian date in its own time scale, never in scientific notation.
                let scale = d.written_unit.as_deref().unwrap_or("JD");
                let day = crate::constants::DAY;
                let jd = crate::format::julian_date(m.value / day, m.below / day, m.above / day);
                return Some((*m, format!("{jd} {scale} {cites}")));
            }
            let unit = summary::written_unit(d.written_unit.as_deref(), d.qty, m.value);
            let f = unit.factor;
            let value = match m.form {
                Form::UpperLimit => format!("< {}", crate::format::number(m.value / f)),
                Form::LowerLimit => format!("> {}", crate::format::number(m.value / f)),
                _ => crate::format::with_uncertainty(m.value / f, m.below / f, m.above / f),
            };
            let assumed = if d.assumed { " assumed" } else { "" };
            let unit = unit.suffix();
            let unit = if unit.is_empty() {
                String::new()
            } else {
                format!(" {unit}")
            };
            Some((*m, format!("{value}{unit} {cites}{assumed}")))
        };
        // Epochs compare modulo the period: its first measurement that is not assumed, else
        // its first measurement (a limit carries nothing).
        let periods: Vec<(model::Measurement, bool)> = body
            .sources(Qty::Period)
            .iter()
            .filter_map(|d| match &d.content {
                Content::Measured(p) if !p.form.is_limit() => Some((*p, d.assumed)),
                _ => None,
            })
            .collect();
        let period = periods
            .iter()
            .find(|p| !p.1)
            .or(periods.first())
            .map(|p| p.0);
        let in_use = |i: usize| {
            if used == Some(i) {
                " (the value used)"
            } else {
                ""
            }
        };
        let k = self.options.consistency_sigma;
        let measured = |d: &model::Declared| match &d.content {
            Content::Measured(m) => Some(*m),
            _ => None,
        };
        for (j, later) in all.iter().enumerate() {
            // The value used is compared by every other source (before or after it), so it
            // needs no comparisons of its own.
            if used == Some(j) {
                continue;
            }
            let Some(b) = measured(later) else { continue };
            // The value used first, wherever it stands, then the earlier ones in order: at
            // most COMPARED_SOURCES of them, so that many sources of one quantity cost
            // linear time, not quadratic.
            let earlier_ones = used
                .into_iter()
                .chain((0..j).filter(|&i| used != Some(i)))
                .take(sources::COMPARED_SOURCES);
            for i in earlier_ones {
                let Some(earlier) = all.get(i) else { continue };
                let Some(a) = measured(earlier) else { continue };
                let limit = a.form.is_limit() || b.form.is_limit();
                let (carried, orbits) = if later.qty == Qty::TransitEpoch && !limit {
                    sources::epoch_aligned(&a, &b, period.as_ref())
                } else {
                    (b, 0)
                };
                let Some(z) = sources::separation(&a, &carried).filter(|z| *z > k) else {
                    continue;
                };
                let (Some((a, wa)), Some((_, wb))) = (shown(earlier), shown(later)) else {
                    continue;
                };
                let (wa, wb) = (format!("{wa}{}", in_use(i)), format!("{wb}{}", in_use(j)));
                let name = format!("{}.{}", body.id, quantities::def(later.qty).name);
                let mut apart = sources::apart_words(z, &a, &carried);
                if orbits != 0 {
                    apart.push_str(&format!(
                        " after carrying the second by {orbits} orbit{} of the period",
                        if orbits.abs() == 1 { "" } else { "s" }
                    ));
                }
                if let (Some(x), Some(y)) = (&earlier.written_unit, &later.written_unit) {
                    if later.qty == Qty::TransitEpoch && x != y {
                        apart.push_str(&format!(
                            " (they are in different time scales, {x} and {y}, compared as written)"
                        ));
                    }
                }
                self.diagnostics.push(
                    Diagnostic::new(
                        Rule::SourcesDisagree,
                        later.span,
                        format!("two sources of {name}: {wa} and {wb} {apart}"),
                    )
                    .with_label(earlier.span, format!("{wa} declared here"))
                    .with_note(format!(
                        "the threshold is {k} combined standard deviations (consistency_sigma); a measurement is compared with a limit by how far it lies past the limit, in its own uncertainty"
                    ))
                    .with_help("check both papers: one may use another definition, epoch or unit; mark the value to use with `preferred`"),
                );
                // One finding per declaration (against the first earlier one it disagrees
                // with), so that many sources cannot make a quadratic number of diagnostics.
                break;
            }
        }
    }

    /// Teff, radius and mass of a dwarf star from its spectral type, for each of them the
    /// star neither declares nor can derive from its own declarations ([`crate::spectral`]).
    pub(super) fn estimate_from_spectral_type(&mut self, bi: usize) {
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
        // One standard-normal input for the subtype, shared by the estimates (a star one
        // subtype later is cooler, smaller and lighter together), and one for each
        // estimate's own intrinsic spread: the three are correlated as the table makes them.
        let subtype = self.unit_normal(format!("{}.spectral_type (±1 subtype)", body.id));
        let how: Arc<str> = Arc::from(format!(
            "estimates from a spectral type: the {}; {}",
            crate::spectral::TABLE_SOURCE,
            crate::spectral::UNCERTAINTY_WORDS
        ));
        for q in wanted {
            let e = match q {
                Qty::Teff => est.teff,
                Qty::StarRadius => est.radius,
                _ => est.mass,
            };
            let unit = display_unit(q, e.value);
            let def = quantities::def(q);
            let m = Measurement {
                value: e.value,
                below: e.intrinsic,
                above: e.intrinsic,
                form: Form::Symmetric,
            };
            let (lo, hi) = def.limits();
            let label = format!("{}.{}", body.id, def.name);
            let own = self.new_input(Some((bi, q)), label, &m, lo, hi);
            let step = e.per_subtype;
            let Some(v) = value::apply(
                &|x: &[f64]| match x {
                    [own, z] => Some(own + step * z).filter(|v| *v > lo && *v < hi),
                    _ => None,
                },
                &[&own, &subtype],
                &self.inputs,
            ) else {
                continue;
            };
            let f = unit.factor;
            let words = format!(
                "{}.{} = {} {unit} estimated from spectral type {text}",
                body.id,
                def.name,
                crate::format::with_uncertainty(e.value / f, e.sigma / f, e.sigma / f),
            );
            // The table and the uncertainty model once, not once per estimate.
            let mut assumptions = SortedSet::one(Arc::from(words));
            assumptions.insert(Arc::clone(&how));
            self.entries.insert(
                (bi, q),
                Entry {
                    value: v,
                    origin: Origin::Estimated,
                    rule: None,
                    inputs: Vec::new(),
                    deps: SortedSet::one((bi, q)),
                    assumptions,
                },
            );
        }
    }
}

/// What reading a transit epoch took for granted: a time scale left unsaid, a timestamp.
pub(super) fn epoch_assumptions(decl: &model::Declared) -> Vec<String> {
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
