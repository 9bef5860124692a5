//! `syz diff --format markdown`: a review comment. A heading and the method in a few lines,
//! then one table per system, most significant first; inside a table, the most significant
//! change first.

use super::text::{difference_text, method_lines, shift_text, subject, summary_line};
use super::{About, Diff, SystemStatus};

/// A table cell: pipes escaped and lines joined, so that no text breaks the table.
fn cell(text: &str) -> String {
    text.replace('\\', "\\\\")
        .replace('|', "\\|")
        .replace(['\n', '\r'], " ")
}

/// Inline code, with a fence longer than any run of backticks inside.
fn code(text: &str) -> String {
    let mut run = 0;
    let mut longest = 0;
    for c in text.chars() {
        run = if c == '`' { run + 1 } else { 0 };
        longest = longest.max(run);
    }
    let fence = "`".repeat(longest + 1);
    // A space on each side only when the text starts or ends with a backtick (CommonMark
    // strips one from each side).
    let pad = if text.starts_with('`') || text.ends_with('`') {
        " "
    } else {
        ""
    };
    format!("{fence}{pad}{}{pad}{fence}", cell(text))
}

/// The whole Markdown form.
pub fn render(diff: &Diff, about: &About) -> String {
    let mut out = String::from("### Syzygy catalogue diff\n\n");
    out.push_str(&format!(
        "Comparing {} (old) with {} (new).\n\n",
        code(&about.old),
        code(&about.new)
    ));
    for l in method_lines(diff, about) {
        out.push_str(&format!("- {}\n", cell(&l)));
    }
    out.push('\n');
    if diff.systems.is_empty() {
        out.push_str("No change listed.\n\n");
    }
    for s in &diff.systems {
        let file = s
            .new_file
            .as_deref()
            .or(s.old_file.as_deref())
            .unwrap_or("");
        match s.status {
            SystemStatus::Added | SystemStatus::Removed => {
                out.push_str(&format!(
                    "#### {} — {} ({})\n\n",
                    cell(&s.title()),
                    s.status.as_str(),
                    code(file)
                ));
                continue;
            }
            SystemStatus::Changed => {
                out.push_str(&format!("#### {} ({})\n\n", cell(&s.title()), code(file)))
            }
        }
        out.push_str("| what | change | old | new | difference | shift |\n");
        out.push_str("| --- | --- | --- | --- | --- | --- |\n");
        for c in &s.changes {
            let mut shift = shift_text(c);
            if !c.significant {
                shift.push_str(" (within the threshold)");
            }
            let mut new = c.new.clone().unwrap_or_default();
            for n in &c.notes {
                new.push_str(&format!(" ({n})"));
            }
            out.push_str(&format!(
                "| {} | {} | {} | {} | {} | {} |\n",
                cell(&subject(c)),
                c.kind.words(),
                cell(c.old.as_deref().unwrap_or("")),
                cell(&new),
                cell(&difference_text(c)),
                cell(shift.trim())
            ));
        }
        out.push('\n');
    }
    out.push_str(&cell(&summary_line(diff)));
    out.push('\n');
    out
}
