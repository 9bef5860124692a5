//! What changed between two versions of a catalogue (`syz diff`): each analysis reduced to a
//! [`Snapshot`] of what a reviewer reads (declared and derived values, composition classes,
//! diagnostics), then two sides' snapshots compared system by system and body by body.
//!
//! A value that moved is measured in units of the combined uncertainty of its two versions,
//! the side of each facing the other: for a move up, `(new - old) / sqrt(old.above² +
//! new.below²)`; for a move down, `(new - old) / sqrt(old.below² + new.above²)` (see
//! [`shift`]). A change with no uncertainty to measure it by (exact values, limits, text, a
//! value on one side only) has no shift and always counts as significant.
//!
//! Pure: the front end reads both sides, analyses them under the same settings and hands
//! the snapshots here. The emitters for people (text, Markdown) and the JSON contract are in
//! [`text`], [`markdown`] and [`json`].

pub mod json;
pub mod markdown;
mod snapshot;
pub mod text;

pub use snapshot::{snapshot, BodySnapshot, DiagnosticSnapshot, SystemSnapshot, ValueSnapshot};

use crate::derive::Origin;

/// How far a value moved, in units of the combined uncertainty of its two versions: the old
/// version's uncertainty on the side it moved towards and the new one's on the side it came
/// from, added in quadrature. Zero when the values are equal; `None` when they differ and
/// neither has an uncertainty on those sides (exact values, limits, text).
pub fn shift(old: (f64, f64, f64), new: (f64, f64, f64)) -> Option<f64> {
    let (ov, nv) = (old.0, new.0);
    if same_number(ov, nv) {
        return Some(0.0);
    }
    let d = nv - ov;
    let sigma = combined_sigma(old, new);
    (sigma > 0.0 && sigma.is_finite() && d.is_finite()).then(|| d / sigma)
}

/// The combined uncertainty a move is measured in (see [`shift`]): the old version's
/// uncertainty on the side it moved towards and the new one's on the side it came from.
pub fn combined_sigma(old: (f64, f64, f64), new: (f64, f64, f64)) -> f64 {
    if new.0 > old.0 {
        old.2.hypot(new.1)
    } else {
        old.1.hypot(new.2)
    }
}

/// Equal, or so close that only rounding in a unit conversion tells them apart.
fn same_number(a: f64, b: f64) -> bool {
    a == b || (a.is_nan() && b.is_nan()) || (a - b).abs() <= 1e-12 * a.abs().max(b.abs())
}

/// What kind of change a line of the comparison reports.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum ChangeKind {
    BodyAdded,
    BodyRemoved,
    /// A value written by the user on the new side only (it may have been derived before).
    DeclaredAdded,
    /// A value written by the user on the old side only (it may be derived now).
    DeclaredRemoved,
    DeclaredChanged,
    /// A derived value that moved.
    DerivedChanged,
    /// A value derived on the new side only.
    DerivedAdded,
    /// A value derived on the old side only.
    DerivedRemoved,
    ClassChanged,
    DiagnosticAdded,
    DiagnosticRemoved,
    /// A file's `ref`, by id: declared on the new side only, the old only, or with another text.
    ReferenceAdded,
    ReferenceRemoved,
    ReferenceChanged,
}

impl ChangeKind {
    pub fn as_str(self) -> &'static str {
        match self {
            ChangeKind::BodyAdded => "body-added",
            ChangeKind::BodyRemoved => "body-removed",
            ChangeKind::DeclaredAdded => "declared-added",
            ChangeKind::DeclaredRemoved => "declared-removed",
            ChangeKind::DeclaredChanged => "declared-changed",
            ChangeKind::DerivedChanged => "derived-changed",
            ChangeKind::DerivedAdded => "derived-added",
            ChangeKind::DerivedRemoved => "derived-removed",
            ChangeKind::ClassChanged => "class-changed",
            ChangeKind::DiagnosticAdded => "diagnostic-added",
            ChangeKind::DiagnosticRemoved => "diagnostic-removed",
            ChangeKind::ReferenceAdded => "reference-added",
            ChangeKind::ReferenceRemoved => "reference-removed",
            ChangeKind::ReferenceChanged => "reference-changed",
        }
    }

    /// In a few words, for people.
    pub fn words(self) -> &'static str {
        match self {
            ChangeKind::BodyAdded => "body added",
            ChangeKind::BodyRemoved => "body removed",
            ChangeKind::DeclaredAdded => "declared value added",
            ChangeKind::DeclaredRemoved => "declared value removed",
            ChangeKind::DeclaredChanged => "declared value changed",
            ChangeKind::DerivedChanged => "derived value moved",
            ChangeKind::DerivedAdded => "now derived",
            ChangeKind::DerivedRemoved => "no longer derived",
            ChangeKind::ClassChanged => "composition class changed",
            ChangeKind::DiagnosticAdded => "diagnostic appeared",
            ChangeKind::DiagnosticRemoved => "diagnostic went away",
            ChangeKind::ReferenceAdded => "reference added",
            ChangeKind::ReferenceRemoved => "reference removed",
            ChangeKind::ReferenceChanged => "reference text changed",
        }
    }
}

/// One change of one body (or of the system, for diagnostics).
#[derive(Debug, Clone, PartialEq)]
pub struct Change {
    pub kind: ChangeKind,
    pub body: Option<String>,
    /// The quantity, for a value; `None` for a body, class or diagnostic.
    pub quantity: Option<&'static str>,
    /// What it was and what it is, as people read them.
    pub old: Option<String>,
    pub new: Option<String>,
    /// New minus old, in `unit`, when both are numbers.
    pub difference: Option<f64>,
    /// The combined uncertainty the shift is measured in, in `unit`.
    pub sigma: Option<f64>,
    pub unit: String,
    /// The move in combined standard deviations (see [`shift`]); `None` when it cannot be
    /// measured that way.
    pub shift: Option<f64>,
    /// Beyond the threshold (always, for a change that has no shift).
    pub significant: bool,
    /// Values set on the command line (`--set`) on either side: the sentences that say so.
    pub notes: Vec<String>,
}

impl Change {
    fn plain(
        kind: ChangeKind,
        body: Option<&str>,
        old: Option<String>,
        new: Option<String>,
    ) -> Change {
        Change {
            kind,
            body: body.map(str::to_string),
            quantity: None,
            old,
            new,
            difference: None,
            sigma: None,
            unit: String::new(),
            shift: None,
            significant: true,
            notes: Vec::new(),
        }
    }

    /// How strongly it ranks: the size of its shift, or infinity for one that has none.
    pub fn weight(&self) -> f64 {
        self.shift.map_or(f64::INFINITY, f64::abs)
    }
}

/// Whether a system is on both sides.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum SystemStatus {
    Added,
    Removed,
    Changed,
}

impl SystemStatus {
    pub fn as_str(self) -> &'static str {
        match self {
            SystemStatus::Added => "added",
            SystemStatus::Removed => "removed",
            SystemStatus::Changed => "changed",
        }
    }
}

#[derive(Debug, Clone, PartialEq)]
pub struct SystemDiff {
    /// The system's name; `None` for what a file says outside any system.
    pub name: Option<String>,
    pub old_file: Option<String>,
    pub new_file: Option<String>,
    pub status: SystemStatus,
    /// The changes listed, most significant first.
    pub changes: Vec<Change>,
}

impl SystemDiff {
    /// How strongly the system ranks: its strongest listed change.
    pub fn weight(&self) -> f64 {
        match self.status {
            SystemStatus::Changed => self.changes.iter().map(Change::weight).fold(0.0, f64::max),
            _ => f64::INFINITY,
        }
    }

    pub fn significant(&self) -> bool {
        self.status != SystemStatus::Changed || self.changes.iter().any(|c| c.significant)
    }

    /// The system as people name it.
    pub fn title(&self) -> String {
        match &self.name {
            Some(n) => format!("system \"{n}\""),
            None => format!(
                "outside any system of {}",
                self.new_file
                    .as_deref()
                    .or(self.old_file.as_deref())
                    .unwrap_or("?")
            ),
        }
    }
}

/// What a comparison lists and how.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct DiffOptions {
    /// Moves of at least this many combined standard deviations are significant.
    pub threshold: f64,
    /// List every change, significant or not (declared values are always listed).
    pub all: bool,
}

/// How a comparison was made, for its outputs to say.
#[derive(Debug, Clone, PartialEq)]
pub struct About {
    /// The two sides as the user named them.
    pub old: String,
    pub new: String,
    /// The derivation settings both sides were analysed with, and their propagation in words.
    pub options: crate::Options,
    pub uncertainties: String,
    /// Values set on the command line for the new side (`--set`), as written.
    pub set: Vec<String>,
}

/// The comparison of two sides.
#[derive(Debug, Clone, PartialEq)]
pub struct Diff {
    pub options: DiffOptions,
    /// Systems with something listed, most significant first.
    pub systems: Vec<SystemDiff>,
    /// Systems found on both sides.
    pub systems_compared: usize,
    /// Changes found in all, and how many of them were not listed (within the threshold).
    pub changes_found: usize,
    pub changes_not_listed: usize,
}

impl Diff {
    /// Something moved beyond the threshold, or appeared, or went away.
    pub fn significant(&self) -> bool {
        self.systems.iter().any(SystemDiff::significant)
    }
}

/// The names that occur more than once on either side: those are matched by name and file
/// on both sides, so that a system copied into a second file is one added, not one
/// removed and two added.
fn repeated<'a>(
    old: &'a [SystemSnapshot],
    new: &'a [SystemSnapshot],
) -> std::collections::HashSet<&'a str> {
    // Counted once per side (a count per system made a side of many systems quadratic).
    let mut out = std::collections::HashSet::new();
    for side in [old, new] {
        let mut count: std::collections::HashMap<&str, usize> = std::collections::HashMap::new();
        for n in side.iter().filter_map(|s| s.name.as_deref()) {
            *count.entry(n).or_insert(0) += 1;
        }
        out.extend(count.into_iter().filter(|(_, c)| *c > 1).map(|(n, _)| n));
    }
    out
}

/// The key a system is matched by: its name, or for a name in `repeated`, its name and
/// file (and its place among the systems of that name in the file); what a file says
/// outside systems goes by the file.
fn keys(
    side: &[SystemSnapshot],
    repeated: &std::collections::HashSet<&str>,
) -> Vec<(String, Option<String>)> {
    // A name written twice in one file (a `duplicate` error) is told apart by its place
    // among them: the first with the first, the second with the second.
    let mut seen: std::collections::HashMap<(&str, &str), usize> = std::collections::HashMap::new();
    side.iter()
        .map(|s| match &s.name {
            Some(n) if !repeated.contains(n.as_str()) => (n.clone(), None),
            Some(n) => {
                let k = seen.entry((n.as_str(), s.file.as_str())).or_insert(0);
                *k += 1;
                let file = if *k == 1 {
                    s.file.clone()
                } else {
                    format!("{} ({})", s.file, k)
                };
                (n.clone(), Some(file))
            }
            None => (String::new(), Some(s.file.clone())),
        })
        .collect()
}

/// Compare two sides, each the snapshots of all its files.
pub fn compare(old: &[SystemSnapshot], new: &[SystemSnapshot], options: DiffOptions) -> Diff {
    let repeated = repeated(old, new);
    let (old_keys, new_keys) = (keys(old, &repeated), keys(new, &repeated));
    // Each key's first place on the old side, and the keys of the new side: found through
    // hashes, not scans.
    let mut old_at: std::collections::HashMap<&(String, Option<String>), usize> =
        std::collections::HashMap::new();
    for (i, k) in old_keys.iter().enumerate() {
        old_at.entry(k).or_insert(i);
    }
    let new_set: std::collections::HashSet<&(String, Option<String>)> = new_keys.iter().collect();
    // Every reference of each side, whatever its file: one in a file that moved or was
    // split is not added on one side and removed on the other.
    let all_refs = |side: &[SystemSnapshot]| -> Vec<(String, String)> {
        side.iter().flat_map(|s| s.refs.iter().cloned()).collect()
    };
    let (old_refs, new_refs) = (all_refs(old), all_refs(new));
    let old_ref_set: std::collections::HashSet<&(String, String)> = old_refs.iter().collect();
    let new_ref_set: std::collections::HashSet<&(String, String)> = new_refs.iter().collect();
    let mut systems = Vec::new();
    let mut compared = 0;
    let mut found = 0;
    for (n, key) in new.iter().zip(&new_keys) {
        let Some(o) = old_at.get(key).and_then(|&i| old.get(i)) else {
            // What a file says outside any system, new with the file: each diagnostic is
            // listed as appeared.
            let mut changes = Vec::new();
            if n.name.is_none() {
                changes.extend(diagnostic_changes(&[], &n.diagnostics));
                let fresh: Vec<(String, String)> = n
                    .refs
                    .iter()
                    .filter(|r| !old_ref_set.contains(r))
                    .cloned()
                    .collect();
                changes.extend(reference_changes(&[], &fresh));
                if changes.is_empty() {
                    continue; // a file that moved, saying nothing new outside its systems
                }
            }
            found += changes.len().max(1);
            systems.push(SystemDiff {
                name: n.name.clone(),
                old_file: None,
                new_file: Some(n.file.clone()),
                status: if n.name.is_some() {
                    SystemStatus::Added
                } else {
                    SystemStatus::Changed
                },
                changes,
            });
            continue;
        };
        compared += usize::from(n.name.is_some());
        let all = system_changes(o, n, options);
        found += all.len();
        let mut changes: Vec<Change> = all
            .into_iter()
            .filter(|c| c.significant || options.all || is_declared_kind(c.kind))
            .collect();
        changes.sort_by(|a, b| b.weight().total_cmp(&a.weight()));
        if !changes.is_empty() {
            systems.push(SystemDiff {
                name: n.name.clone(),
                old_file: Some(o.file.clone()),
                new_file: Some(n.file.clone()),
                status: SystemStatus::Changed,
                changes,
            });
        }
    }
    for (o, key) in old.iter().zip(&old_keys) {
        if new_set.contains(key) {
            continue;
        }
        let changes = if o.name.is_none() {
            let mut c = diagnostic_changes(&o.diagnostics, &[]);
            let gone: Vec<(String, String)> = o
                .refs
                .iter()
                .filter(|r| !new_ref_set.contains(r))
                .cloned()
                .collect();
            c.extend(reference_changes(&gone, &[]));
            if c.is_empty() {
                continue;
            }
            c
        } else {
            Vec::new()
        };
        found += changes.len().max(1);
        systems.push(SystemDiff {
            name: o.name.clone(),
            old_file: Some(o.file.clone()),
            new_file: None,
            status: if o.name.is_some() {
                SystemStatus::Removed
            } else {
                SystemStatus::Changed
            },
            changes,
        });
    }
    let listed: usize = systems.iter().map(|s| s.changes.len().max(1)).sum();
    systems.sort_by(|a, b| b.weight().total_cmp(&a.weight()));
    Diff {
        options,
        systems,
        systems_compared: compared,
        changes_found: found,
        changes_not_listed: found.saturating_sub(listed),
    }
}

fn is_declared_kind(k: ChangeKind) -> bool {
    matches!(
        k,
        ChangeKind::DeclaredAdded | ChangeKind::DeclaredRemoved | ChangeKind::DeclaredChanged
    )
}

/// Every change between two versions of one system, listed or not.
fn system_changes(o: &SystemSnapshot, n: &SystemSnapshot, options: DiffOptions) -> Vec<Change> {
    let mut out = Vec::new();
    for nb in &n.bodies {
        let Some(ob) = o.bodies.iter().find(|b| b.id == nb.id) else {
            out.push(Change::plain(
                ChangeKind::BodyAdded,
                Some(&nb.id),
                None,
                Some(nb.kind.to_string()),
            ));
            continue;
        };
        body_changes(ob, nb, options, &mut out);
    }
    for ob in &o.bodies {
        if !n.bodies.iter().any(|b| b.id == ob.id) {
            out.push(Change::plain(
                ChangeKind::BodyRemoved,
                Some(&ob.id),
                Some(ob.kind.to_string()),
                None,
            ));
        }
    }
    out.extend(diagnostic_changes(&o.diagnostics, &n.diagnostics));
    out.extend(reference_changes(&o.refs, &n.refs));
    out
}

/// A file's references declared on one side only, or with another text (a corrected
/// citation is a change a reviewer must see, though no number moves).
fn reference_changes(old: &[(String, String)], new: &[(String, String)]) -> Vec<Change> {
    let quoted = |id: &str, text: &str| format!("{id} \"{text}\"");
    // Looked up through hashes: a file may declare thousands of references.
    let by_id = |side: &[(String, String)]| -> std::collections::HashMap<String, String> {
        side.iter().cloned().collect()
    };
    let (old_ids, new_ids) = (by_id(old), by_id(new));
    let mut out = Vec::new();
    for (id, text) in new {
        match old_ids.get(id) {
            None => out.push(Change::plain(
                ChangeKind::ReferenceAdded,
                None,
                None,
                Some(quoted(id, text)),
            )),
            Some(was) if was != text => out.push(Change::plain(
                ChangeKind::ReferenceChanged,
                None,
                Some(quoted(id, was)),
                Some(quoted(id, text)),
            )),
            Some(_) => {}
        }
    }
    for (id, text) in old {
        if !new_ids.contains_key(id) {
            out.push(Change::plain(
                ChangeKind::ReferenceRemoved,
                None,
                Some(quoted(id, text)),
                None,
            ));
        }
    }
    out
}

fn body_changes(ob: &BodySnapshot, nb: &BodySnapshot, options: DiffOptions, out: &mut Vec<Change>) {
    let body = Some(nb.id.as_str());
    // In the quantity table's order, as `eval` lists them.
    for nv in &nb.values {
        let ov = ob.values.iter().find(|v| v.name == nv.name);
        if let Some(c) = value_change(body, ov, Some(nv), options) {
            out.push(c);
        }
    }
    // An eccentric orbit with no declared argument of periastron has it spread over a full
    // turn: an input, not a reported value. Where a default of 90 deg was reported before,
    // it did not go away: it is now spread.
    let spread_now = nb.values.iter().any(|v| {
        v.assumptions
            .iter()
            .any(|a| a.as_str() == crate::derive::SPREAD_PERIASTRON)
    });
    for ov in &ob.values {
        if !nb.values.iter().any(|v| v.name == ov.name) {
            if let Some(mut c) = value_change(body, Some(ov), None, options) {
                if spread_now && ov.name == "arg_periastron" && ov.origin == Origin::Default {
                    c.kind = ChangeKind::DerivedChanged;
                    c.new = Some("spread uniformly over 0-360 deg".to_string());
                    c.notes.push(crate::derive::SPREAD_PERIASTRON.to_string());
                }
                out.push(c);
            }
        }
    }
    if ob.class != nb.class {
        out.push(Change::plain(
            ChangeKind::ClassChanged,
            body,
            ob.class.map(str::to_string),
            nb.class.map(str::to_string),
        ));
    }
}

/// The change of one value between its two versions (either may be missing); `None` when
/// nothing about it changed.
fn value_change(
    body: Option<&str>,
    old: Option<&ValueSnapshot>,
    new: Option<&ValueSnapshot>,
    options: DiffOptions,
) -> Option<Change> {
    let declared = |v: Option<&ValueSnapshot>| v.is_some_and(ValueSnapshot::is_declared);
    let kind = match (old, new) {
        (Some(o), Some(n)) if o.is_declared() && n.is_declared() => ChangeKind::DeclaredChanged,
        _ if declared(new) => ChangeKind::DeclaredAdded,
        _ if declared(old) => ChangeKind::DeclaredRemoved,
        (Some(_), Some(_)) => ChangeKind::DerivedChanged,
        (None, Some(_)) => ChangeKind::DerivedAdded,
        (Some(_), None) => ChangeKind::DerivedRemoved,
        (None, None) => return None,
    };
    let shown = new.or(old)?;
    let mut change = Change {
        kind,
        body: body.map(str::to_string),
        quantity: Some(shown.name),
        old: old.map(|v| v.shown.clone()),
        new: new.map(|v| v.shown.clone()),
        difference: None,
        sigma: None,
        unit: shown.unit.clone(),
        shift: None,
        significant: true,
        notes: Vec::new(),
    };
    for v in [old, new].into_iter().flatten() {
        if v.origin == Origin::Set {
            change.notes.extend(
                v.assumptions
                    .iter()
                    .filter(|a| a.contains(crate::what_if::SET_WORDS))
                    .cloned(),
            );
        }
    }
    change.notes.dedup();
    let (Some(o), Some(n)) = (old, new) else {
        return Some(change);
    };
    change.notes.extend(source_notes(o, n));
    // What changed when the number did not: a change shown as `X → X` says what it was.
    if o.sources.is_empty() && n.sources.is_empty() && o.citations != n.citations {
        let cites =
            |v: &ValueSnapshot| crate::text::citation_mark(v.citations.iter().map(String::as_str));
        change
            .notes
            .push(format!("citations changed: {} → {}", cites(o), cites(n)));
    }
    if o.origin != n.origin {
        change.notes.push(format!(
            "origin changed: {} → {}",
            o.origin.as_str(),
            n.origin.as_str()
        ));
    }
    let numbers = |v: &ValueSnapshot| (v.value, v.below, v.above);
    let unchanged = same_number(o.value, n.value)
        && same_number(o.below, n.below)
        && same_number(o.above, n.above)
        && o.form == n.form
        && o.shown == n.shown
        && o.citations == n.citations
        && o.sources == n.sources
        && o.origin == n.origin;
    if unchanged && kind != ChangeKind::DeclaredAdded && kind != ChangeKind::DeclaredRemoved {
        return None;
    }
    // A symmetric and an asymmetric interval compare alike; a limit only with a limit.
    if o.value.is_finite() && n.value.is_finite() && o.form.is_limit() == n.form.is_limit() {
        let factor = shown.factor;
        change.difference = Some((n.value - o.value) / factor);
        // A limit measures no move in sigma; nor does one that changed direction.
        change.shift = if o.form.is_limit() && (!same_number(o.value, n.value) || o.form != n.form)
        {
            None
        } else {
            shift(numbers(o), numbers(n))
        };
        let sigma = combined_sigma(numbers(o), numbers(n));
        change.sigma = (sigma > 0.0).then_some(sigma / factor);
        // Exact values have no uncertainty to measure a move by, not even a move of zero.
        if sigma == 0.0 {
            change.shift = None;
        }
    }
    let derived_limits =
        o.form.is_limit() && n.form == o.form && o.origin.is_computed() && n.origin.is_computed();
    // The same exact number declared another way (`assumed`, another citation) did not move.
    let same_exact = change.sigma.is_none()
        && !o.form.is_limit()
        && o.form == n.form
        && same_number(o.value, n.value);
    change.significant = match change.shift {
        None if same_exact => false,
        Some(s) => s.abs() >= options.threshold,
        // A derived limit has no uncertainty to measure its move by: it counts when it
        // moved at the digits shown, not by the rounding noise of its inputs.
        None if derived_limits => o.shown != n.shown,
        None => true,
    };
    Some(change)
}

/// The declarations of a declared value as people read them (`10.0030 ± 0.0010 d [b]`), without
/// saying which is used: every source of a quantity declared several times, else the one.
fn declarations(v: &ValueSnapshot) -> Vec<String> {
    if !v.sources.is_empty() {
        return v
            .sources
            .iter()
            .map(|s| s.trim_end_matches(" (used)").to_string())
            .collect();
    }
    if !v.is_declared() {
        return Vec::new();
    }
    if v.citations.is_empty() {
        vec![v.shown.clone()]
    } else {
        vec![format!("{} [{}]", v.shown, v.citations.join(", "))]
    }
}

/// The declarations added to and removed from a value between its versions: a source added
/// beside the one used changes no number shown, and would otherwise go unmentioned.
fn source_notes(old: &ValueSnapshot, new: &ValueSnapshot) -> Vec<String> {
    if old.sources.is_empty() && new.sources.is_empty() {
        return Vec::new(); // one declaration on each side: the change shows both
    }
    let (before, after) = (declarations(old), declarations(new));
    let mut left = before.clone();
    let mut notes = Vec::new();
    for d in &after {
        match left.iter().position(|x| x == d) {
            Some(i) => {
                left.remove(i);
            }
            None => notes.push(format!("source added: {d}")),
        }
    }
    notes.extend(left.iter().map(|d| format!("source removed: {d}")));
    // Which source is used (a `preferred` mark moved, or the policy picks another one).
    let used = |v: &ValueSnapshot| {
        v.sources
            .iter()
            .find_map(|s| s.strip_suffix(" (used)"))
            .map(str::to_string)
    };
    match (used(old), used(new)) {
        (Some(a), Some(b)) if a != b => notes.push(format!("source used: {a} → {b}")),
        (Some(a), None) if !new.sources.is_empty() => {
            notes.push(format!("source used: {a} → a combination of the sources"))
        }
        (None, Some(b)) if !old.sources.is_empty() => {
            notes.push(format!("source used: a combination of the sources → {b}"))
        }
        _ => {}
    }
    notes
}

/// Diagnostics on one side only; one said twice on one side and once on the other counts once.
fn diagnostic_changes(old: &[DiagnosticSnapshot], new: &[DiagnosticSnapshot]) -> Vec<Change> {
    let mut old: Vec<&DiagnosticSnapshot> = old.iter().collect();
    let mut new: Vec<&DiagnosticSnapshot> = new.iter().collect();
    old.sort();
    new.sort();
    let mut out = Vec::new();
    let words =
        |d: &DiagnosticSnapshot| format!("{} [{}]: {}", d.severity.as_str(), d.rule, d.message);
    let (mut i, mut j) = (0, 0);
    loop {
        match (old.get(i), new.get(j)) {
            (Some(a), Some(b)) if a == b => {
                i += 1;
                j += 1;
            }
            (a, Some(b)) if a.is_none_or(|a| b < a) => {
                out.push(Change::plain(
                    ChangeKind::DiagnosticAdded,
                    None,
                    None,
                    Some(words(b)),
                ));
                j += 1;
            }
            (Some(a), _) => {
                out.push(Change::plain(
                    ChangeKind::DiagnosticRemoved,
                    None,
                    Some(words(a)),
                    None,
                ));
                i += 1;
            }
            (None, _) => break,
        }
    }
    out
}

#[cfg(test)]
mod tests;
