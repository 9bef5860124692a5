//! Runs of one syntax error on one line reported once, with their count.

use crate::diagnostic::Diagnostic;

/// One diagnostic for a run of identical ones on one line (a line of 10,000 stray `}` is one
/// error, not 10,000), with the count in its message and a span over the whole run.
pub(super) fn merge_repeats(src: &str, diags: Vec<Diagnostic>) -> Vec<Diagnostic> {
    let mut out: Vec<(Diagnostic, usize)> = Vec::with_capacity(diags.len());
    for d in diags {
        if let Some((last, n)) = out.last_mut() {
            let same_line = last.span.end <= d.span.start
                && src
                    .get(last.span.end as usize..d.span.start as usize)
                    .is_some_and(|between| !between.contains(['\n', '\r']));
            if same_line
                && last.rule == d.rule
                && last.message == d.message
                && last.help == d.help
                && last.notes == d.notes
                && last.labels.is_empty()
                && d.labels.is_empty()
            {
                last.span = last.span.join(d.span);
                *n += 1;
                continue;
            }
        }
        out.push((d, 1));
    }
    out.into_iter()
        .map(|(mut d, n)| {
            if n > 1 {
                d.message = repeated(&d.message, n);
            }
            d
        })
        .collect()
}

/// A message for `n` errors in a row on one line.
pub(super) fn repeated(message: &str, n: usize) -> String {
    if n > 1 {
        format!("{message} ({n} times in a row on this line)")
    } else {
        message.to_string()
    }
}
