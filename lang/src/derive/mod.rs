//! The derivation engine: every quantity that a system's measurements imply.
//!
//! Declared measurements become independent inputs. Rules ([`rules::RULES`]) fire in rounds:
//! a rule fires once all its inputs are known and none of them was itself derived from the
//! rule's output (so no value is ever used to confirm itself). When a quantity is first
//! reachable in a round, the best route of that round becomes its value — routes are ranked
//! by how complete their physics is, then by precision. Routes found later, and routes to
//! quantities the user declared, are kept as alternatives and compared: a difference over the
//! consistency threshold (3 combined sigma by default) is an `inconsistent` warning, an error
//! past the second threshold (5 sigma by default).
//!
//! Uncertainties are propagated by Monte Carlo (default) or to first order; see
//! [`value`]. A few quantities have defaults when not declared (circular orbit, zero Bond
//! albedo, full heat redistribution); a default that a result used is listed with it.

mod adaptive;
pub mod asymmetric;
mod caveats;
mod consistency;
mod expr;
mod inputs;
mod roles;
mod rounds;
pub mod rules;
mod scatter;
mod select;
mod set;
mod slips;
pub mod sources;
mod summary;
pub(crate) use summary::written_unit;
mod limit_range;
mod limited;
pub mod truncation;
mod turn;
pub mod validity;
pub mod value;

use crate::ast::BodyKind;
use crate::diagnostic::{Diagnostic, Rule};
use crate::model::{self, Content, Form, Measurement, System};
use crate::quantities::{self, Qty};
use crate::source::{InSystem, Span};
pub use inputs::SPREAD_PERIASTRON;
use rules::{RuleDef, Slot, RULES};
use rustc_hash::{FxHashMap, FxHashSet};
use set::SortedSet;
pub(crate) use slips::readings_help;
pub use sources::{Choice, Lines, SourceChoice};
use std::collections::BTreeMap;
use std::sync::Arc;
pub use summary::{
    display_unit, Alternative, BodyResult, DisplayUnit, QuantityResult, SourceResult, SystemResult,
};
pub use value::{InputInfo, Precision, SampleSummary, Value};

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Propagation {
    MonteCarlo,
    Linear,
}

#[derive(Debug, Clone, PartialEq)]
pub struct Options {
    pub propagation: Propagation,
    /// Monte Carlo sample count (with `adaptive`, the first batch's).
    pub samples: usize,
    /// Keep drawing, doubling the sample count, until every derived value's median and
    /// interval ends are stable to its second significant digit (JCGM 101:2008 7.9), up to
    /// [`ADAPTIVE_MOST`] samples.
    pub adaptive: bool,
    pub seed: u64,
    /// Declared and derived values further apart than this many combined standard
    /// deviations are reported as `inconsistent`.
    pub consistency_sigma: f64,
    /// Past this many combined standard deviations an `inconsistent` finding is an error.
    pub consistency_error_sigma: f64,
    /// Which of several declarations of one quantity feeds the derivations when none is
    /// marked `preferred`.
    pub source_choice: SourceChoice,
}

impl Default for Options {
    fn default() -> Options {
        Options {
            propagation: Propagation::MonteCarlo,
            samples: 10_000,
            adaptive: false,
            seed: 0x5359_5a59,
            consistency_sigma: 3.0,
            consistency_error_sigma: 5.0,
            source_choice: SourceChoice::MostPrecise,
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
    /// Predicted from a population relation (a mass from a radius), not from this planet's
    /// measurements; it feeds no derivation but those meant for predictions.
    Predicted,
    /// Set on the command line for one run (`--set`), in place of what the file declares.
    Set,
    /// The weighted mean of several declared measurements of one quantity (`[sources]
    /// choice = "weighted-mean"`): no paper published this value.
    Combined,
}

impl Origin {
    /// Computed by a rule: derived from measurements, or predicted from a relation.
    pub fn is_computed(self) -> bool {
        matches!(self, Origin::Derived | Origin::Predicted)
    }

    /// The origin of a declaration: set on the command line, assumed, or declared.
    pub fn of(decl: &model::Declared) -> Origin {
        if decl.set.is_some() {
            Origin::Set
        } else if decl.assumed {
            Origin::Assumed
        } else {
            Origin::Declared
        }
    }

    pub fn as_str(self) -> &'static str {
        match self {
            Origin::Declared => "declared",
            Origin::Assumed => "assumed",
            Origin::Derived => "derived",
            Origin::Default => "default",
            Origin::Estimated => "estimated",
            Origin::Predicted => "predicted",
            Origin::Set => "set",
            Origin::Combined => "combined",
        }
    }
}

/// A reference to a quantity of a body in the same system.
pub type Key = (usize, Qty);

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
    /// The lines of the text, for sentences that name a declaration's line.
    lines: &'m sources::Lines,
    entries: FxHashMap<Key, Entry>,
    candidates: BTreeMap<Key, Vec<Candidate>>,
    pub inputs: Vec<InputInfo>,
    literal_inputs: FxHashMap<Span, u32>,
    /// What the expression being evaluated declares (a binding's name, `body.quantity`),
    /// and how many uncertain literals of it were met: how its literals are labelled.
    naming: (String, usize),
    /// The value of each `let` binding evaluated so far.
    bindings: FxHashMap<crate::model::LetId, expr::Binding>,
    /// How many unfinished expressions use each binding (see [`expr::binding_uses`]).
    binding_uses: FxHashMap<crate::model::LetId, usize>,
    /// Where an expression was found to have no finite value (reported once each).
    no_value_at: FxHashSet<Span>,
    used: FxHashSet<Key>,
    /// For each quantity declared several times: the value used and how it was reached.
    chosen: FxHashMap<Key, sources::Chosen>,
    pub diagnostics: Vec<Diagnostic>,
    /// How the sample count came about, when that needs saying: fewer samples than asked
    /// (a system so large that memory bounds them), or an adaptive count. Every derived
    /// value of the system carries the sentence.
    sample_note: Option<Arc<str>>,
    /// In first-order mode, Monte Carlo results for the values first order cannot
    /// describe (see [`validity`]).
    sampled: Option<validity::Sampled<'m>>,
    /// In first-order mode, the values whose only doubt is one asymmetric input, with their
    /// exact first-order distribution's median and percentiles and the words that say so
    /// ([`asymmetric`]): not sampled.
    two_lines: FxHashMap<Key, (value::SampleSummary, String)>,
    /// The values predicted by a relation and widened by its scatter (see [`scatter`]).
    widened: FxHashMap<Key, scatter::Widened>,
    /// Labels of declared limits taken at one end of their range rather than spread over it
    /// (for [`validity::bound_where_limited`]; empty in every ordinary run).
    pinned: Pins,
    /// Derived values that rest mostly on one limit, given as limits themselves: the value
    /// at that limit, its form, and the sentence that says so.
    bounded: FxHashMap<Key, (f64, Form, String, Option<f64>)>,
    /// When only some values are wanted (see [`Derivation::run_pinned`]): those keys and
    /// every key they rest on.
    focus: Option<FxHashSet<Key>>,
    /// Draw samples for every input, even those no value of the focus rests on.
    draw_all: bool,
    /// Deterministic columns in place of random draws (see [`turn`]).
    grid: Option<turn::Grid>,
    /// Rules whose inputs were all known but which gave no value for them (outside their
    /// formula's domain: durations that admit no impact parameter), with those inputs: the
    /// measurements they leave unused say why.
    no_solution: Vec<(usize, Vec<Key>)>,
    /// Inputs of every route found, the value's or an alternative compared with it: a
    /// measurement among them is not idle, even where another route gave the value.
    fed: FxHashSet<Key>,
}

/// The most samples adaptive Monte Carlo draws for one system (besides the memory bound of
/// [`samples_for`]).
pub const ADAPTIVE_MOST: usize = 1 << 20;

/// A count of samples, or `auto`: how the sample count is given in a project file and on
/// the command line.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum SampleCount {
    Fixed(usize),
    /// Adaptive (JCGM 101:2008 7.9), from 10^4 samples.
    Auto,
}

impl SampleCount {
    /// The most samples one may ask for.
    pub const MOST: usize = 10_000_000;

    /// The fewest samples one may ask for: fewer cannot place a 16th and an 84th
    /// percentile apart from the median (one sample showed a single random draw as an
    /// exact value).
    pub const FEWEST: usize = MIN_SAMPLES;

    /// `auto`, or a count from [`SampleCount::FEWEST`] to [`SampleCount::MOST`].
    pub fn parse(s: &str) -> Result<SampleCount, String> {
        let s = s.trim();
        if s == "auto" {
            return Ok(SampleCount::Auto);
        }
        match s.replace('_', "").parse::<usize>() {
            Ok(n) if (SampleCount::FEWEST..=SampleCount::MOST).contains(&n) => {
                Ok(SampleCount::Fixed(n))
            }
            _ => Err(format!(
                "expected a sample count from {} to {} or \"auto\", found '{s}'",
                SampleCount::FEWEST,
                SampleCount::MOST
            )),
        }
    }

    /// Lay this over `options`.
    pub fn apply(self, options: &mut Options) {
        match self {
            SampleCount::Fixed(n) => {
                options.samples = n;
                options.adaptive = false;
            }
            SampleCount::Auto => {
                options.samples = Options::default().samples;
                options.adaptive = true;
            }
        }
    }
}

/// Monte Carlo sample arrays one system may hold at once (in bytes), and about how many
/// arrays a body holds: past this, the system is sampled more thinly and says so.
const SAMPLE_BUDGET: usize = 512 << 20;
const ARRAYS_PER_BODY: usize = 40;
/// The fewest samples drawn however large the system.
const MIN_SAMPLES: usize = 100;

/// The sample count for system `sys` when `asked` were asked for, and the sentence that says
/// so when it is fewer. Each body holds about [`ARRAYS_PER_BODY`] arrays and each binding
/// one (its value's; a tree of thousands of uncertain bindings holds them all at once: 32,000
/// took 2.8 GB at 10^4 samples).
fn samples_for(sys: &System, asked: usize) -> (usize, Option<Arc<str>>) {
    let bodies = sys.bodies.len();
    let lets = sys.lets.len() + sys.bodies.iter().map(|b| b.lets.len()).sum::<usize>();
    let arrays = (bodies.max(1) * ARRAYS_PER_BODY).saturating_add(lets);
    let most = SAMPLE_BUDGET / (arrays * std::mem::size_of::<f64>());
    let most = most.max(MIN_SAMPLES);
    if asked <= most {
        return (asked, None);
    }
    let held = if lets > bodies * ARRAYS_PER_BODY {
        format!("{lets} bindings")
    } else {
        format!("{bodies} bodies")
    };
    let words = format!(
        "Monte Carlo with {most} samples, not the {asked} asked for: this system has {held}, \
         and fewer samples per value keep its memory bounded; interval ends are less precise \
         (first-order propagation, --propagation linear, samples only the values it cannot describe)"
    );
    (most, Some(Arc::from(words)))
}

impl<'m> Derivation<'m> {
    pub fn run(sys: &'m System, options: &Options, lines: &'m sources::Lines) -> Derivation<'m> {
        if options.adaptive && options.propagation == Propagation::MonteCarlo {
            return Derivation::run_adaptive(sys, options, lines);
        }
        Derivation::run_once(sys, options, lines)
    }

    fn run_once(sys: &'m System, options: &Options, lines: &'m sources::Lines) -> Derivation<'m> {
        let mut d = Derivation::run_pinned(sys, options, lines, Pins::default(), None);
        // Values given as limits need no sampling: bound first, then sample the rest.
        d.bound_where_limited();
        d.sample_where_doubtful();
        d
    }

    /// The derivations alone, with the limits labelled in `pinned` taken at the limit. With a
    /// `focus`, only the values of those keys are wanted: rules for other quantities do not
    /// fire, and neither do second routes to a known value or the consistency checks that
    /// compare them (the values of the focus come out as in a full run, by the same routes).
    ///
    /// With a focus, Monte Carlo draws only the inputs the focus rests on. Should a value of
    /// the focus come out without samples all the same (a route through an input outside
    /// it), the run is repeated drawing every input, so the focus always has its samples.
    fn run_pinned(
        sys: &'m System,
        options: &Options,
        lines: &'m sources::Lines,
        pinned: Pins,
        focus: Option<FxHashSet<Key>>,
    ) -> Derivation<'m> {
        let d = Derivation::run_drawing(sys, options, lines, pinned, focus, false, None);
        let unsampled = d.n() > 0
            && d.focus
                .iter()
                .flatten()
                .any(|k| d.entries.get(k).is_some_and(|e| e.value.samples.is_none()));
        if !unsampled {
            return d;
        }
        let Derivation { pinned, focus, .. } = d;
        Derivation::run_drawing(sys, options, lines, pinned, focus, true, None)
    }

    /// [`Derivation::run_pinned`], drawing every input if `draw_all`.
    fn run_drawing(
        sys: &'m System,
        options: &Options,
        lines: &'m sources::Lines,
        pinned: Pins,
        focus: Option<FxHashSet<Key>>,
        draw_all: bool,
        grid: Option<turn::Grid>,
    ) -> Derivation<'m> {
        let mut options = options.clone();
        let mut sample_note = None;
        if options.propagation == Propagation::MonteCarlo {
            let (n, words) = samples_for(sys, options.samples);
            options.samples = n;
            sample_note = words;
        }
        let mut d = Derivation {
            sys,
            options,
            lines,
            entries: FxHashMap::default(),
            candidates: BTreeMap::new(),
            inputs: Vec::new(),
            literal_inputs: FxHashMap::default(),
            naming: (String::new(), 0),
            bindings: FxHashMap::default(),
            binding_uses: expr::binding_uses(sys),
            no_value_at: FxHashSet::default(),
            used: FxHashSet::default(),
            chosen: FxHashMap::default(),
            diagnostics: Vec::new(),
            sample_note,
            sampled: None,
            two_lines: FxHashMap::default(),
            widened: FxHashMap::default(),
            pinned,
            bounded: FxHashMap::default(),
            focus,
            draw_all,
            grid,
            no_solution: Vec::new(),
            fed: FxHashSet::default(),
        };
        d.declare_measurements();
        d.fixed_point();
        if d.focus.is_none() {
            d.check_consistency();
        }
        d
    }

    /// Whether the input that is the value of `key` is sampled (when sampling at all):
    /// always, except in a run with a focus, where an input no value of the focus rests on
    /// is not.
    fn wants_samples(&self, key: Key) -> bool {
        self.draw_all || self.focus.as_ref().is_none_or(|f| f.contains(&key))
    }

    fn n(&self) -> usize {
        match self.options.propagation {
            Propagation::MonteCarlo => self.options.samples.max(1),
            Propagation::Linear => 0,
        }
    }

    pub fn key_name(&self, k: Key) -> String {
        let b = self.sys.bodies.get(k.0).map_or("?", |b| b.id.as_str());
        format!("{b}.{}", quantities::def(k.1).name)
    }

    /// The full value of a quantity (with samples), for the physics checks.
    pub fn value(&self, k: Key) -> Option<&Value> {
        self.entries.get(&k).map(|e| &e.value)
    }

    /// The rule a value was derived by and the quantities it read, for the checks that judge
    /// a route (a planet's mass neglected where it matters); `None` for a declared value.
    pub fn derived_by(&self, k: Key) -> Option<(&'static str, &[Key])> {
        let e = self.entries.get(&k)?;
        Some((rules::RULES.get(e.rule?)?.id, e.inputs.as_slice()))
    }

    /// Every quantity with a value, in no particular order.
    pub fn keys(&self) -> impl Iterator<Item = Key> + '_ {
        self.entries.keys().copied()
    }

    /// Whether a derived value was computed from `k` (it is an input of a chosen route).
    pub fn is_used(&self, k: Key) -> bool {
        self.used.contains(&k)
    }

    /// Whether `k` is an input of any route found (the value's own or an alternative
    /// compared with it), or itself compared with a route to it.
    pub fn feeds_a_route(&self, k: Key) -> bool {
        self.used.contains(&k) || self.fed.contains(&k) || self.candidates.contains_key(&k)
    }

    /// The first rule that takes `k` and had every input but gave no value for them.
    pub fn unsolved_with(&self, k: Key) -> Option<&'static RuleDef> {
        // A prediction outside its relation's range says so in a note of its own.
        self.no_solution
            .iter()
            .filter_map(|(ri, ins)| Some((RULES.get(*ri)?, ins)))
            .find(|(r, ins)| ins.contains(&k) && !rules::predicts(r.id))
            .map(|(r, _)| r)
    }

    pub fn origin(&self, k: Key) -> Option<Origin> {
        self.entries.get(&k).map(|e| e.origin)
    }

    /// The id of the rule a derived value came from.
    pub fn rule_id(&self, k: Key) -> Option<&'static str> {
        self.entries
            .get(&k)
            .and_then(|e| e.rule)
            .and_then(|r| RULES.get(r))
            .map(|r| r.id)
    }
}

/// A value's first-order spread relative to its size: how routes are ranked by precision.
fn relative_spread(v: &Value, inputs: &[InputInfo]) -> f64 {
    let (lo, hi) = v.linear_spread(inputs);
    (lo + hi) / 2.0 / v.nominal.abs().max(f64::MIN_POSITIVE)
}

/// Whether the engine supplies a default for `q` when a rule needs it and nothing declares
/// it (a circular orbit, a Bond albedo of 0, ...; each default is named when used).
/// Where a declared limit is taken instead of spread over its range: at the limit itself, or
/// at the other end of the range it leaves open (the quantity's physical bound).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub(super) enum PinAt {
    Limit,
    OtherEnd,
    /// A measurement at its value plus its uncertainty above, or less its uncertainty below.
    Above,
    Below,
}

/// Declared limits by label, each with where it is taken.
pub(super) type Pins = FxHashMap<String, PinAt>;

pub fn has_default(q: Qty) -> bool {
    inputs::default_for(q).is_some()
}

/// The default the engine takes for `q` when it is not declared (SI), with the words its
/// assumption lines use.
pub fn default_of(q: Qty) -> Option<(f64, &'static str)> {
    inputs::default_for(q)
}

#[cfg(test)]
mod tests;
#[cfg(test)]
mod tests_asymmetric;
#[cfg(test)]
mod tests_heavy;
#[cfg(test)]
mod tests_scatter;
#[cfg(test)]
mod tests_slips;
#[cfg(test)]
mod tests_sources;
#[cfg(test)]
mod tests_turn;
