//! How many diagnostics of one file the front ends show: the first [`PER_FILE`] of each
//! severity (errors, warnings, notes), in the sorted order of `Analysis::diagnostics`, then
//! one line counting the rest, in every format (text, JSON, SARIF, the language server's
//! list). Counts, summaries and exit statuses still take every diagnostic into account. A
//! file with 80,000 mistakes is read in a moment and says so in a few screens, instead of
//! printing for minutes; and an error is never crowded out by notes or warnings earlier in
//! the file (200 notes once hid the only error of a file that failed its check).

use crate::diagnostic::{Diagnostic, Severity};

/// Diagnostics shown per file, of each severity.
pub const PER_FILE: usize = 200;

/// What is still shown of one file: room for [`PER_FILE`] diagnostics of each severity.
#[derive(Debug, Clone)]
pub struct Budget {
    left: [usize; 3],
}

impl Default for Budget {
    fn default() -> Budget {
        Budget {
            left: [PER_FILE; 3],
        }
    }
}

/// The quota a diagnostic is shown within: its severity's, or `None` for one always shown
/// (the error that says the parser stopped reading the file).
pub fn quota(d: &Diagnostic) -> Option<Severity> {
    (!crate::parser::stops_reading(d)).then_some(d.severity)
}

impl Budget {
    /// Whether a diagnostic of quota `s` (see [`quota`]) is shown, taking its room if so.
    pub fn take(&mut self, s: Option<Severity>) -> bool {
        let Some(s) = s else { return true };
        match self.left.get_mut(s as usize) {
            Some(n) if *n > 0 => {
                *n -= 1;
                true
            }
            _ => false,
        }
    }
}

/// The diagnostics of one file to show (in their order), and how many are left out.
pub fn split(diagnostics: &[Diagnostic]) -> (Vec<&Diagnostic>, usize) {
    let mut budget = Budget::default();
    let shown: Vec<&Diagnostic> = diagnostics
        .iter()
        .filter(|d| budget.take(quota(d)))
        .collect();
    let left_out = diagnostics.len() - shown.len();
    (shown, left_out)
}

/// The line that stands for the diagnostics left out.
pub fn rest_words(left_out: usize) -> String {
    format!(
        "{left_out} more diagnostic{} in this file not shown (only the first {PER_FILE} errors, {PER_FILE} warnings and {PER_FILE} notes of a file are)",
        if left_out == 1 { "" } else { "s" }
    )
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::diagnostic::Rule;
    use crate::source::Span;

    #[test]
    fn the_first_diagnostics_of_each_severity_are_shown_and_the_rest_counted() {
        let d = |i: usize| Diagnostic::new(Rule::Syntax, Span::default(), format!("{i}"));
        let many: Vec<Diagnostic> = (0..PER_FILE + 7).map(d).collect();
        let (shown, rest) = split(&many);
        assert_eq!((shown.len(), rest), (PER_FILE, 7));
        assert_eq!(shown.last().map(|d| d.message.as_str()), Some("199"));
        let few: Vec<Diagnostic> = (0..3).map(d).collect();
        assert_eq!(split(&few).1, 0);
        assert!(rest_words(1).starts_with("1 more diagnostic in this file"));
    }

    /// An error after more notes than are shown is still shown (it was left out with them).
    #[test]
    fn notes_do_not_crowd_out_an_error() {
        let note =
            |i: usize| Diagnostic::new(Rule::CombinedUncertainty, Span::default(), format!("{i}"));
        let mut all: Vec<Diagnostic> = (0..PER_FILE + 5).map(note).collect();
        all.push(Diagnostic::new(Rule::Syntax, Span::default(), "the error"));
        let (shown, rest) = split(&all);
        assert_eq!((shown.len(), rest), (PER_FILE + 1, 5));
        assert_eq!(shown.last().map(|d| d.message.as_str()), Some("the error"));
        assert!(
            shown
                .iter()
                .filter(|d| d.severity == Severity::Note)
                .count()
                == PER_FILE
        );
    }

    /// The error that says the parser stopped reading is always shown: it comes after a
    /// thousand other errors, so the cap hid it, and nothing said the rest went unread.
    #[test]
    fn the_stop_of_the_parser_is_always_shown() {
        let src: String = (0..1500).map(|_| "x x\n").collect();
        let p = crate::parser::parse(crate::source::FileId(0), &src);
        let (shown, rest) = split(&p.diagnostics);
        assert!(rest > 0);
        assert!(
            shown.iter().any(|d| crate::parser::stops_reading(d)),
            "{shown:?}"
        );
        assert_eq!(shown.len(), PER_FILE + 1);
    }
}
