//! Checks between the files of a catalogue: a system declared in two files
//! (`system-in-two-files`), a star whose declared values disagree between files
//! (`star-disagrees-across-files`), one reference text under two ids (`paper-under-two-ids`).
//!
//! Each file (or each part of a large file) is reduced, where it is analysed, to an
//! [`Entry`]: its system names, its stars' declared values and its own references, with their
//! spans. [`check`] sorts the keys of all entries together and compares each occurrence with
//! the first one of its key in another file, so it costs n log n in the number of systems,
//! stars and references.

use crate::derive::{display_unit, sources, Origin};
use crate::diagnostic::{apply_overrides, sort_diagnostics, Diagnostic, Rule, SeverityOverride};
use crate::model::{normalized_text, Form, Measurement};
use crate::quantities::{self, Qty};
use crate::source::{FileId, Span};
use crate::{ast::BodyKind, Analysis, Settings};

/// What the checks between files need of one file: small, so that a catalogue's entries fit
/// in memory when its analyses do not.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Entry {
    pub file: FileId,
    /// The project file the file is under (`Settings::catalogue`): only files under the same
    /// one are compared; a file under none is compared with no other.
    pub catalogue: Option<String>,
    /// The file's consistency threshold (`consistency_sigma`).
    pub sigma: f64,
    /// The file's severity overrides, applied to the findings placed in it.
    pub overrides: Vec<SeverityOverride>,
    /// System names and the spans of the names.
    pub systems: Vec<(String, Span)>,
    pub stars: Vec<Star>,
    /// The file's own references: id, text, span of the id.
    pub refs: Vec<(String, String, Span)>,
}

/// A star and its declared, measured values.
#[derive(Debug, Clone, PartialEq)]
pub struct Star {
    pub id: String,
    pub name_span: Span,
    /// Each declared quantity with a number: the value used (of several sources, the one
    /// chosen), in SI.
    pub values: Vec<(Qty, Measurement)>,
}

impl Entry {
    /// The entry of one analysed file (or part of one), under the settings it was analysed
    /// with.
    pub fn of(a: &Analysis, settings: &Settings) -> Entry {
        let mut e = Entry {
            file: a.file,
            catalogue: settings.catalogue.clone(),
            sigma: settings.options.consistency_sigma,
            overrides: settings.overrides.clone(),
            ..Entry::default()
        };
        e.add(a);
        e
    }

    fn add(&mut self, a: &Analysis) {
        for r in a.model.refs.iter().filter(|r| r.shared.is_none()) {
            self.refs.push((r.id.clone(), r.text.clone(), r.id_span));
        }
        for (si, sys) in a.model.systems.iter().enumerate() {
            if !sys.name.is_empty() {
                self.systems.push((sys.name.clone(), sys.name_span));
            }
            let results = a.results.get(si);
            for (bi, b) in sys.bodies.iter().enumerate() {
                if b.kind != BodyKind::Star {
                    continue;
                }
                let values = results
                    .and_then(|r| r.bodies.get(bi))
                    .map(|r| {
                        r.quantities
                            .iter()
                            .filter(|q| {
                                matches!(q.origin, Origin::Declared | Origin::Combined)
                                    && q.text.is_none()
                                    && q.rule.is_none()
                                    && q.value.is_finite()
                            })
                            .map(|q| {
                                let m = Measurement {
                                    value: q.value,
                                    below: q.below,
                                    above: q.above,
                                    form: q.form,
                                };
                                (q.qty, m)
                            })
                            .collect()
                    })
                    .unwrap_or_default();
                self.stars.push(Star {
                    id: b.id.clone(),
                    name_span: b.name_span,
                    values,
                });
            }
        }
    }

    /// Add the entry of another part of the same file.
    pub fn absorb(&mut self, other: Entry) {
        self.systems.extend(other.systems);
        self.stars.extend(other.stars);
        // Every part of a file read in parts holds the file's references (read ahead, so a
        // citation may name one declared further down): each is kept once, or one text under
        // two ids would be reported once per part.
        let held: rustc_hash::FxHashSet<(u32, u32)> =
            self.refs.iter().map(|k| (k.2.start, k.2.end)).collect();
        self.refs.extend(
            other
                .refs
                .into_iter()
                .filter(|r| !held.contains(&(r.2.start, r.2.end))),
        );
    }

    /// The same entry for the file `file` (a front end that numbers files when it checks
    /// them, as the language server does).
    pub fn in_file(mut self, file: FileId) -> Entry {
        self.file = file;
        let at = |s: &mut Span| s.file = file;
        self.systems.iter_mut().for_each(|(_, s)| at(s));
        self.stars.iter_mut().for_each(|s| at(&mut s.name_span));
        self.refs.iter_mut().for_each(|(_, _, s)| at(s));
        self
    }
}

/// The findings between the files of `entries` (one entry per file; a file's spans carry its
/// `file`) that are under the same project file, each with the severity its file's settings give, sorted. `place` names a span for
/// people, `file:line`: the text output shows one file per finding, so each message names
/// the other place too.
pub fn check(entries: &[Entry], place: &dyn Fn(Span) -> String) -> Vec<Diagnostic> {
    let mut out: Vec<(usize, Diagnostic)> = Vec::new();
    systems(entries, place, &mut out);
    stars(entries, place, &mut out);
    refs(entries, place, &mut out);
    let mut diagnostics = Vec::with_capacity(out.len());
    for (i, d) in out {
        let mut one = vec![d];
        if let Some(e) = entries.get(i) {
            apply_overrides(&mut one, &e.overrides);
        }
        diagnostics.extend(one);
    }
    sort_diagnostics(&mut diagnostics);
    diagnostics
}

/// Occurrences of keys, sorted by key then by file order, grouped by key: for each key, the
/// occurrences after the first one that lie in another file than the first, each with the
/// first.
fn pairs<K: Ord, T>(mut all: Vec<(K, usize, Span, T)>) -> Vec<[(usize, Span, T); 2]>
where
    T: Clone,
{
    all.sort_by(|a, b| (&a.0, a.1, a.2.start).cmp(&(&b.0, b.1, b.2.start)));
    let mut out = Vec::new();
    let mut first: Option<(&K, usize, Span, &T)> = None;
    for (k, i, span, t) in &all {
        match first {
            Some((fk, fi, fs, ft)) if fk == k => {
                if *i != fi {
                    out.push([(fi, fs, ft.clone()), (*i, *span, t.clone())]);
                }
            }
            _ => first = Some((k, *i, *span, t)),
        }
    }
    out
}

fn systems(entries: &[Entry], place: &dyn Fn(Span) -> String, out: &mut Vec<(usize, Diagnostic)>) {
    let all = entries
        .iter()
        .enumerate()
        .filter_map(|(i, e)| Some((i, e.catalogue.as_deref()?, e)))
        .flat_map(|(i, c, e)| {
            e.systems
                .iter()
                .map(move |(n, s)| ((c, n.as_str()), i, *s, n.as_str()))
        })
        .collect();
    for [(_, first, name), (i, at, _)] in pairs(all) {
        out.push((
            i,
            Diagnostic::new(
                Rule::SystemInTwoFiles,
                at,
                format!("system \"{name}\" is also declared in {}", place(first)),
            )
            .with_label(first, format!("\"{name}\" first declared here"))
            .with_note("each file is analysed on its own, so the catalogue holds the system twice")
            .with_help(
                "keep the system in one file, or rename one of them if they are different systems",
            ),
        ));
    }
}

fn stars(entries: &[Entry], place: &dyn Fn(Span) -> String, out: &mut Vec<(usize, Diagnostic)>) {
    let all = entries
        .iter()
        .enumerate()
        .filter_map(|(i, e)| Some((i, e.catalogue.as_deref()?, e)))
        .flat_map(|(i, c, e)| {
            e.stars
                .iter()
                .map(move |s| ((c, s.id.as_str()), i, s.name_span, s))
        })
        .collect();
    for [(fi, first, a), (i, at, b)] in pairs(all) {
        let sigma = entries
            .get(fi)
            .map_or(0.0, |e| e.sigma)
            .max(entries.get(i).map_or(0.0, |e| e.sigma));
        let mut apart = Vec::new();
        for (qty, mb) in &b.values {
            let Some((_, ma)) = a.values.iter().find(|(q, _)| q == qty) else {
                continue;
            };
            let Some(z) = sources::separation(ma, mb).filter(|z| *z > sigma) else {
                continue;
            };
            let (wa, wb) = (shown(*qty, ma), shown(*qty, mb));
            apart.push(format!(
                "{}: {wa} there and {wb} here {}",
                quantities::def(*qty).name,
                sources::apart_words(z, ma, mb)
            ));
        }
        if apart.is_empty() {
            continue;
        }
        let mut d = Diagnostic::new(
            Rule::StarDisagreesAcrossFiles,
            at,
            format!(
                "star '{}' is also declared in {}, with values that disagree: {}",
                b.id,
                place(first),
                apart.join("; ")
            ),
        )
        .with_label(first, format!("'{}' declared here", a.id));
        d = d
            .with_note(format!(
                "the threshold is {sigma} combined standard deviations (consistency_sigma); stars are matched by id across files"
            ))
            .with_help("check both files' sources and units; if these are different stars, give them different ids");
        out.push((i, d));
    }
}

fn refs(entries: &[Entry], place: &dyn Fn(Span) -> String, out: &mut Vec<(usize, Diagnostic)>) {
    // Keyed by text; among the same text, the same id is no finding, so occurrences of the
    // first id of a text are skipped after the first.
    let mut all: Vec<((&str, String), usize, Span, &str)> = entries
        .iter()
        .enumerate()
        .filter_map(|(i, e)| Some((i, e.catalogue.as_deref()?, e)))
        .flat_map(|(i, c, e)| {
            e.refs
                .iter()
                .map(move |(id, text, s)| ((c, normalized_text(text)), i, *s, id.as_str()))
        })
        .filter(|((_, t), ..)| !t.is_empty())
        .collect();
    all.sort_by(|a, b| (&a.0, a.1, a.2.start).cmp(&(&b.0, b.1, b.2.start)));
    let mut first: Option<(&(&str, String), Span, &str)> = None;
    for (text, i, at, id) in &all {
        match first {
            Some((ft, fs, fid)) if ft == text => {
                if *id != fid {
                    out.push((
                        *i,
                        Diagnostic::new(
                            Rule::PaperUnderTwoIds,
                            *at,
                            format!(
                                "reference '{id}' has the same text as '{fid}' in {}: one source under two ids",
                                place(fs)
                            ),
                        )
                        .with_label(fs, format!("'{fid}' declared here"))
                        .with_help("cite one id for one source: keep one `ref` (in a shared references file, see docs/project-file.md) and cite it from both"),
                    ));
                }
            }
            _ => first = Some((text, *at, id)),
        }
    }
}

/// A declared value for a message, in its quantity's usual unit.
fn shown(qty: Qty, m: &Measurement) -> String {
    let unit = display_unit(qty, m.value);
    let form = match m.form {
        Form::Exact | Form::UpperLimit | Form::LowerLimit => m.form,
        _ => Form::Asymmetric,
    };
    crate::report::shown_in(m.value, m.below, m.above, form, unit)
}
