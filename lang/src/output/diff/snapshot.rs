//! The snapshots `syz diff` compares: each analysis reduced to what a reviewer reads
//! (declared and derived values, composition classes, diagnostics, a file's references).

use crate::derive::{Origin, QuantityResult};
use crate::diagnostic::Severity;
use crate::model::Form;
use crate::quantities;
use crate::Analysis;

/// One value as a comparison needs it.
#[derive(Debug, Clone, PartialEq)]
pub struct ValueSnapshot {
    /// The quantity's name in the language (`semi_major_axis`).
    pub name: &'static str,
    pub origin: Origin,
    /// SI value and uncertainty below and above (zero for exact values and limits); NaN for text.
    pub value: f64,
    pub below: f64,
    pub above: f64,
    pub form: Form,
    /// The value as people read it, in its own display unit (`0.0552 ± 0.0007 au`, `"G5V"`).
    pub shown: String,
    /// The unit differences are shown in, and its SI factor.
    pub unit: String,
    pub factor: f64,
    /// The references cited on the declaration, and every declaration when there are several.
    pub citations: Vec<String>,
    pub sources: Vec<String>,
    /// What was assumed on the way.
    pub assumptions: Vec<String>,
}

impl ValueSnapshot {
    fn new(q: &QuantityResult) -> ValueSnapshot {
        let unit = q.shown_unit();
        ValueSnapshot {
            name: quantities::def(q.qty).name,
            origin: q.origin,
            value: q.value,
            below: q.below,
            above: q.above,
            form: q.form,
            shown: crate::report::value_text(q),
            unit: unit.suffix().to_string(),
            factor: unit.factor,
            citations: q.citations.clone(),
            sources: crate::report::sources_text(q),
            assumptions: q.assumptions.clone(),
        }
    }

    /// Written by the user (in the file, or set on the command line), not derived.
    pub fn is_declared(&self) -> bool {
        matches!(
            self.origin,
            Origin::Declared | Origin::Assumed | Origin::Set | Origin::Combined
        )
    }
}

/// A diagnostic as a comparison needs it: lines move with every edit, so they are left out.
#[derive(Debug, Clone, PartialEq, Eq, PartialOrd, Ord)]
pub struct DiagnosticSnapshot {
    pub severity: Severity,
    pub rule: &'static str,
    pub message: String,
}

#[derive(Debug, Clone, PartialEq)]
pub struct BodySnapshot {
    pub id: String,
    pub kind: &'static str,
    pub values: Vec<ValueSnapshot>,
    /// The most probable composition class of a planet.
    pub class: Option<&'static str>,
}

/// One system of one side, or (with `name` `None`) what a file says outside any system.
#[derive(Debug, Clone, PartialEq)]
pub struct SystemSnapshot {
    pub name: Option<String>,
    /// The file, as the front end names it for this comparison (relative to the folder).
    pub file: String,
    pub bodies: Vec<BodySnapshot>,
    pub diagnostics: Vec<DiagnosticSnapshot>,
    /// What a file says outside any system: its own references, each id with its text.
    pub refs: Vec<(String, String)>,
}

/// Reduce an analysis (of a whole file or a part of one) to what [`compare`] reads. `file`
/// is the name the file goes by in the comparison.
pub fn snapshot(a: &Analysis, file: &str) -> Vec<SystemSnapshot> {
    let mut out: Vec<SystemSnapshot> = a
        .model
        .systems
        .iter()
        .zip(&a.results)
        .enumerate()
        .map(|(si, (sys, res))| SystemSnapshot {
            name: Some(sys.name.clone()),
            file: file.to_string(),
            bodies: sys
                .bodies
                .iter()
                .zip(&res.bodies)
                .map(|(b, r)| BodySnapshot {
                    id: b.id.clone(),
                    kind: b.kind.as_str(),
                    values: r.quantities.iter().map(ValueSnapshot::new).collect(),
                    class: a
                        .composition
                        .get(&(si, b.id.clone()))
                        .and_then(|c| c.json.most_probable),
                })
                .collect(),
            diagnostics: Vec::new(),
            refs: Vec::new(),
        })
        .collect();
    let mut outside = Vec::new();
    for d in &a.diagnostics {
        let snap = DiagnosticSnapshot {
            severity: d.severity,
            rule: d.rule.id(),
            message: d.message.clone(),
        };
        let at = a
            .model
            .systems
            .iter()
            .position(|s| s.span.start <= d.span.start && d.span.end <= s.span.end);
        match at.and_then(|i| out.get_mut(i)) {
            Some(s) => s.diagnostics.push(snap),
            None => outside.push(snap),
        }
    }
    // A declaration refused by a silenced rule has no diagnostic: it is compared as one, so
    // that a version adding such a line (or fixing one) does not compare as unchanged.
    for u in a.unused.iter().filter(|u| u.silenced) {
        if let Some(s) = out.get_mut(u.system) {
            s.diagnostics.push(DiagnosticSnapshot {
                severity: Severity::Note,
                rule: u.rule.unwrap_or("not-used"),
                message: format!(
                    "`{}` of {} is not used (its finding is silenced): {}",
                    u.text, u.body_id, u.why
                ),
            });
        }
    }
    // The file's own references (a shared one is the project's, compared in its own file).
    let refs: Vec<(String, String)> = a
        .model
        .refs
        .iter()
        .filter(|r| r.shared.is_none())
        .map(|r| (r.id.clone(), r.text.clone()))
        .collect();
    if !outside.is_empty() || !refs.is_empty() {
        out.push(SystemSnapshot {
            name: None,
            file: file.to_string(),
            bodies: Vec::new(),
            diagnostics: outside,
            refs,
        });
    }
    out
}
