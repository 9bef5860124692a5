//! The one diagnostic type of the core, and the catalogue of rules.
//!
//! Every stage reports problems as [`Diagnostic`]s that carry a stable [`Rule`] id. Front ends
//! render them (ariadne in the CLI, LSP diagnostics in the server, JSON and SARIF for machines)
//! but never invent their own.

use crate::source::Span;
use serde::{Serialize, Serializer};

#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Severity {
    Note,
    Warning,
    Error,
}

impl Severity {
    pub fn as_str(self) -> &'static str {
        match self {
            Severity::Note => "note",
            Severity::Warning => "warning",
            Severity::Error => "error",
        }
    }
}

macro_rules! rules {
    ($( $variant:ident = $id:literal, $sev:ident, $summary:literal; )*) => {
        /// Every rule the core can report, with its stable id.
        #[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash)]
        pub enum Rule { $( $variant, )* }

        impl Rule {
            pub const ALL: &'static [Rule] = &[ $( Rule::$variant, )* ];

            /// The stable id used in output, configuration and silencing comments.
            pub fn id(self) -> &'static str {
                match self { $( Rule::$variant => $id, )* }
            }

            pub fn default_severity(self) -> Severity {
                match self { $( Rule::$variant => Severity::$sev, )* }
            }

            /// One line saying what the rule catches.
            pub fn summary(self) -> &'static str {
                match self { $( Rule::$variant => $summary, )* }
            }

            pub fn from_id(id: &str) -> Option<Rule> {
                match id { $( $id => Some(Rule::$variant), )* _ => None }
            }

            /// Whether the rule keeps its severity whatever the user asks: a syntax error, an
            /// unreadable file, or bodies or bindings past a system's bound mean values were
            /// not read at all, so silencing it would make them disappear without a word.
            pub fn is_fixed(self) -> bool {
                matches!(
                    self,
                    Rule::Syntax | Rule::Io | Rule::TooManyBodies | Rule::TooManyBindings
                )
            }

            /// Why a fixed rule keeps its severity, in words for messages.
            pub fn why_fixed(self) -> &'static str {
                match self {
                    Rule::TooManyBodies => "bodies past a system's bound are not read",
                    Rule::TooManyBindings => "bindings past a system's bound are not evaluated",
                    _ => "a syntax error or an unreadable file means values were not read",
                }
            }
        }
    };
}

/// A rule is written as its id in machine-readable output.
impl Serialize for Rule {
    fn serialize<S: Serializer>(&self, serializer: S) -> Result<S::Ok, S::Error> {
        serializer.serialize_str(self.id())
    }
}

rules! {
    Syntax = "syntax", Error, "The text does not follow the grammar of the language.";
    Io = "io", Error, "A file could not be read.";
    UnitMismatch = "unit-mismatch", Error, "A value or expression has the wrong physical dimension.";
    UnknownUnit = "unknown-unit", Error, "A unit symbol that the unit registry does not know.";
    UnknownQuantity = "unknown-quantity", Error, "A property name that is not a quantity of this kind of body.";
    UnknownBody = "unknown-body", Error, "A reference to a body that is not declared in this system.";
    UnknownRef = "unknown-ref", Error, "A citation of a reference id that the file does not declare.";
    RefShadowsShared = "ref-shadows-shared", Warning, "A file's own reference has the id of a shared reference but another text.";
    UnknownName = "unknown-name", Error, "A name in an expression that is neither a let binding nor a constant.";
    Duplicate = "duplicate", Error, "The same body, reference, binding or quantity is declared twice.";
    TooManyBodies = "too-many-bodies", Error, "A system declares more bodies than one system is read with (1,000); the rest are not read.";
    TooManyBindings = "too-many-bindings", Error, "A system declares more let bindings than one system is read with (1,000); the rest are not evaluated.";
    OutOfRange = "out-of-range", Error, "A declared value lies outside the range the quantity can take.";
    InvalidValue = "invalid-value", Error, "A number that is not finite, or an expression that cannot be evaluated.";
    Inconsistent = "inconsistent", Warning, "A declared value disagrees with the value derived from other measurements.";
    SourcesDisagree = "sources-disagree", Warning, "Two declarations of one quantity, from different sources, disagree.";
    NoUncertainty = "no-uncertainty", Note, "A measured quantity is declared without an uncertainty, so what is derived from it looks more precise than the data are.";
    Truncated = "truncated", Note, "An uncertainty reaches past the quantity's valid range: sampled values are kept inside it, which moves their median.";
    NotDerivable = "not-derivable", Note, "A quantity could not be derived because an input is missing or unusable.";
    CombinedUncertainty = "combined-uncertainty", Note, "Several uncertainties given for one value are combined in quadrature.";
    DenserThanIron = "denser-than-iron", Error, "The planet is denser than a pure-iron body of its mass.";
    AboveDeuteriumLimit = "above-deuterium-limit", Warning, "The companion is more massive than about 13 Jupiter masses: a brown dwarf, not a planet.";
    StellarMassCompanion = "stellar-mass-companion", Error, "The companion is more massive than about 0.075 solar masses: a star.";
    LargerThanStar = "larger-than-star", Error, "The planet's radius is at least the radius of its star.";
    PeriastronInsideStar = "periastron-inside-star", Error, "The orbit's closest approach lies inside the star.";
    InsideRocheLimit = "inside-roche-limit", Warning, "The orbit lies inside the fluid-body Roche limit for the planet's density.";
    TransitGeometry = "transit-geometry", Error, "A transit is declared but the impact parameter or inclination allows none.";
    CrossingOrbits = "crossing-orbits", Error, "Two planets of one star have orbits that cross.";
    UnstableSpacing = "unstable-spacing", Warning, "Neighbouring planets are closer than 2 sqrt(3) mutual Hill radii.";
    ImplausiblePlanet = "implausible-planet", Warning, "The planet is larger, far smaller for its mass, or less dense than any known planet: usually a unit slip.";
    ImplausibleStar = "implausible-star", Warning, "No main-sequence or evolved star combines this mass, radius and temperature.";
    MassNeglected = "mass-neglected", Warning, "A value derived with the planet's mass neglected, where the planet is heavy enough to move it by a third of its uncertainty or more.";
    UnusedAllow = "unused-allow", Warning, "A silencing comment that no longer silences anything.";
    SystemInTwoFiles = "system-in-two-files", Warning, "A system of the same name is declared in another file of the catalogue.";
    StarDisagreesAcrossFiles = "star-disagrees-across-files", Warning, "A star of the same id is declared in another file with values that disagree.";
    PaperUnderTwoIds = "paper-under-two-ids", Note, "One reference text is declared under two ids.";
}

/// A secondary location with a message.
#[derive(Debug, Clone, PartialEq)]
pub struct Label {
    pub span: Span,
    pub message: String,
}

/// A replacement of the source that fixes a diagnostic: the editor offers it as a quick fix.
#[derive(Debug, Clone, PartialEq)]
pub struct Fix {
    pub span: Span,
    pub text: String,
}

#[derive(Debug, Clone, PartialEq)]
pub struct Diagnostic {
    pub rule: Rule,
    pub severity: Severity,
    pub span: Span,
    pub message: String,
    pub labels: Vec<Label>,
    pub notes: Vec<String>,
    pub help: Option<String>,
    /// The edit the help describes, when it is one replacement.
    pub fix: Option<Fix>,
}

impl Diagnostic {
    /// A diagnostic at the rule's default severity.
    pub fn new(rule: Rule, span: Span, message: impl Into<String>) -> Diagnostic {
        Diagnostic {
            rule,
            severity: rule.default_severity(),
            span,
            message: message.into(),
            labels: Vec::new(),
            notes: Vec::new(),
            help: None,
            fix: None,
        }
    }

    /// The replacement of `span` by `text` that fixes this diagnostic.
    pub fn with_fix(mut self, span: Span, text: impl Into<String>) -> Diagnostic {
        self.fix = Some(Fix {
            span,
            text: text.into(),
        });
        self
    }

    pub fn with_label(mut self, span: Span, message: impl Into<String>) -> Diagnostic {
        self.labels.push(Label {
            span,
            message: message.into(),
        });
        self
    }

    pub fn with_note(mut self, note: impl Into<String>) -> Diagnostic {
        self.notes.push(note.into());
        self
    }

    pub fn with_help(mut self, help: impl Into<String>) -> Diagnostic {
        self.help = Some(help.into());
        self
    }
}

/// A per-rule severity chosen by the user: `None` silences the rule.
pub type SeverityOverride = (Rule, Option<Severity>);

/// Apply severity overrides in order (a later one for the same rule wins). Syntax and I/O
/// problems keep their severity: the file could not be read as written.
pub fn apply_overrides(diags: &mut Vec<Diagnostic>, overrides: &[SeverityOverride]) {
    if overrides.is_empty() {
        return;
    }
    diags.retain_mut(|d| {
        if d.rule.is_fixed() {
            return true;
        }
        match overrides.iter().rev().find(|(r, _)| *r == d.rule) {
            Some((_, Some(sev))) => {
                if d.severity != *sev {
                    regrade_notes(d, *sev);
                }
                d.severity = *sev;
                true
            }
            Some((_, None)) => false,
            None => true,
        }
    });
}

/// A note that grades its finding by size (`an error: past the error threshold of 5 sigma`)
/// says so no more once the user's severity for the rule replaces that grading: it says
/// which severity holds, and what the size alone would have made it.
fn regrade_notes(d: &mut Diagnostic, to: Severity) {
    let article = |s: Severity| match s {
        Severity::Error => "an error",
        Severity::Warning => "a warning",
        Severity::Note => "a note",
    };
    let rule = d.rule.id();
    for note in &mut d.notes {
        for from in [Severity::Error, Severity::Warning, Severity::Note] {
            if let Some(rest) = note.strip_prefix(&format!("{}: ", article(from))) {
                *note = format!(
                    "{}, as the severity set for `{rule}` says; by its size alone it would be {} ({rest})",
                    article(to),
                    article(from)
                );
                break;
            }
        }
    }
}

/// Sort diagnostics into a stable, reading order: by file, position, then rule.
pub fn sort_diagnostics(diags: &mut [Diagnostic]) {
    diags.sort_by(|a, b| {
        (a.span.file, a.span.start, a.span.end, a.rule, &a.message).cmp(&(
            b.span.file,
            b.span.start,
            b.span.end,
            b.rule,
            &b.message,
        ))
    });
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn overrides_change_or_drop_severity_but_not_syntax() {
        let span = Span::default();
        let mut d = vec![
            Diagnostic::new(Rule::Inconsistent, span, "a"),
            Diagnostic::new(Rule::OutOfRange, span, "b"),
            Diagnostic::new(Rule::Syntax, span, "c"),
        ];
        apply_overrides(
            &mut d,
            &[
                (Rule::Inconsistent, Some(Severity::Error)),
                (Rule::OutOfRange, None),
                (Rule::Syntax, None),
            ],
        );
        assert_eq!(d.len(), 2);
        assert_eq!(d[0].severity, Severity::Error);
        assert_eq!(d[1].rule, Rule::Syntax);
    }

    /// An `inconsistent` finding graded an error by its size, shown as a warning because the
    /// project says so, no longer says it is an error.
    #[test]
    fn an_override_rewrites_the_grading_note() {
        let mut error = Diagnostic::new(Rule::Inconsistent, Span::default(), "a")
            .with_note("an error: past the error threshold of 5 sigma (--error-sigma)")
            .with_note("this file: x");
        error.severity = Severity::Error;
        let mut d = vec![error];
        apply_overrides(&mut d, &[(Rule::Inconsistent, Some(Severity::Warning))]);
        assert_eq!(d[0].severity, Severity::Warning);
        assert_eq!(
            d[0].notes[0],
            "a warning, as the severity set for `inconsistent` says; by its size alone it would be an error (past the error threshold of 5 sigma (--error-sigma))"
        );
        assert_eq!(d[0].notes[1], "this file: x");
    }

    #[test]
    fn rule_ids_are_unique_and_round_trip() {
        let mut seen = std::collections::HashSet::new();
        for r in Rule::ALL {
            assert!(seen.insert(r.id()), "duplicate id {}", r.id());
            assert_eq!(Rule::from_id(r.id()), Some(*r));
        }
        assert_eq!(Rule::from_id("no-such-rule"), None);
    }
}
