//! How many diagnostics of one file the front ends show: the first [`PER_FILE`], in the
//! sorted order of `Analysis::diagnostics`, then one line counting the rest, in every format
//! (text, JSON, SARIF, the language server's list). Counts, summaries and exit statuses still
//! take every diagnostic into account. A file with 80,000 mistakes is read in a moment and
//! says so in a few screens, instead of printing for minutes.

use crate::diagnostic::Diagnostic;

/// Diagnostics shown per file.
pub const PER_FILE: usize = 200;

/// The diagnostics of one file to show, and how many are left out.
pub fn split(diagnostics: &[Diagnostic]) -> (&[Diagnostic], usize) {
    let shown = diagnostics.get(..PER_FILE).unwrap_or(diagnostics);
    (shown, diagnostics.len() - shown.len())
}

/// The line that stands for the diagnostics left out.
pub fn rest_words(left_out: usize) -> String {
    format!(
        "{left_out} more diagnostic{} in this file not shown (only the first {PER_FILE} of a file are)",
        if left_out == 1 { "" } else { "s" }
    )
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::diagnostic::Rule;
    use crate::source::Span;

    #[test]
    fn the_first_diagnostics_are_shown_and_the_rest_counted() {
        let d = |i: usize| Diagnostic::new(Rule::Syntax, Span::default(), format!("{i}"));
        let many: Vec<Diagnostic> = (0..PER_FILE + 7).map(d).collect();
        let (shown, rest) = split(&many);
        assert_eq!((shown.len(), rest), (PER_FILE, 7));
        assert_eq!(shown.last().map(|d| d.message.as_str()), Some("199"));
        let few: Vec<Diagnostic> = (0..3).map(d).collect();
        assert_eq!(split(&few).1, 0);
        assert!(rest_words(1).starts_with("1 more diagnostic in this file"));
    }
}
