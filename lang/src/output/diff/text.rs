//! `syz diff` for people: a heading that says how the comparison was made, then each system
//! with something listed, most significant first, one aligned line per change.

use super::{About, Change, ChangeKind, Diff, SystemStatus};

/// What the comparison was made with, in sentences (shared by the text and Markdown forms).
pub fn method_lines(diff: &Diff, about: &About) -> Vec<String> {
    let mut out = vec![
        "Shifts are in units of the combined uncertainty of the two versions (σ): the old \
         value's uncertainty on the side it moved towards and the new value's on the side it \
         came from, added in quadrature."
            .to_string(),
        if diff.options.all {
            format!(
                "Every change is listed (--all); those of at least {} σ, or with no uncertainty \
                 to measure them by, are marked significant.",
                crate::format::number(diff.options.threshold)
            )
        } else {
            format!(
                "Listed: moves of at least {} σ (--threshold), changes with no uncertainty to \
                 measure them by, and every declared value that changed; --all lists every change.",
                crate::format::number(diff.options.threshold)
            )
        },
        format!(
            "Both sides derived with the same settings: uncertainties by {}.",
            about.uncertainties
        ),
    ];
    if !about.set.is_empty() {
        out.push(format!(
            "Set on the command line for the new side only (--set): {}.",
            about.set.join("; ")
        ));
    }
    out
}

/// The last line: how much was compared, found and listed.
pub fn summary_line(diff: &Diff) -> String {
    let mut s = format!(
        "{} system(s) compared; {} change(s) found, {} not listed",
        diff.systems_compared, diff.changes_found, diff.changes_not_listed
    );
    if diff.changes_not_listed > 0 && !diff.options.all {
        s.push_str(" (within the threshold; --all lists them)");
    }
    s.push_str(if diff.significant() {
        ". Something moved beyond the threshold, appeared or went away."
    } else {
        ". Nothing moved beyond the threshold."
    });
    s
}

/// A shift for people: `+2.3 σ`, or why there is none.
pub fn shift_text(c: &Change) -> String {
    match (c.shift, &c.old, &c.new) {
        (Some(s), _, _) => format!("{s:+.1} σ"),
        (None, Some(_), Some(_)) if c.quantity.is_some() => "no σ (exact or limit)".to_string(),
        _ => String::new(),
    }
}

/// A difference for people: `+0.13 Msun`, with the combined σ in brackets.
pub fn difference_text(c: &Change) -> String {
    let Some(d) = c.difference else {
        return String::new();
    };
    let unit = if c.unit.is_empty() {
        String::new()
    } else {
        format!(" {}", c.unit)
    };
    let number = if d > 0.0 {
        format!("+{}", two_digits(d))
    } else {
        two_digits(d)
    };
    match c.sigma {
        Some(s) => format!("{number}{unit} (σ {}{unit})", two_digits(s)),
        None => format!("{number}{unit}"),
    }
}

/// Two significant digits, both shown in scientific notation too (`8.0e-4` beside
/// `9.8e-4`, not `8e-4`), so a difference and its σ read alike.
fn two_digits(v: f64) -> String {
    let a = v.abs();
    if v.is_finite() && v != 0.0 && !(1e-3..1e6).contains(&a) {
        format!("{v:.1e}")
    } else {
        crate::format::sig(v, 2)
    }
}

/// What the change is about: `b.semi_major_axis`, `b`, or nothing for a diagnostic.
pub fn subject(c: &Change) -> String {
    match (&c.body, c.quantity) {
        (Some(b), Some(q)) => format!("{b}.{q}"),
        (Some(b), None) => b.clone(),
        (None, Some(q)) => q.to_string(),
        (None, None) => String::new(),
    }
}

/// Old and new, as `old → new`, `added: new` or `removed: old`.
pub fn values_text(c: &Change) -> String {
    match (&c.old, &c.new) {
        (Some(o), Some(n)) => format!("{o} → {n}"),
        (None, Some(n)) => n.clone(),
        (Some(o), None) => o.clone(),
        (None, None) => String::new(),
    }
}

/// The whole text form.
pub fn render(diff: &Diff, about: &About) -> String {
    let mut out = format!("syz diff: {} → {}\n", about.old, about.new);
    for l in method_lines(diff, about) {
        out.push_str(&format!("  {l}\n"));
    }
    for s in &diff.systems {
        let files = match (&s.old_file, &s.new_file) {
            (Some(o), Some(n)) if o != n => format!("{o} → {n}"),
            (_, Some(f)) | (Some(f), None) => f.clone(),
            (None, None) => String::new(),
        };
        out.push('\n');
        match s.status {
            SystemStatus::Added => {
                out.push_str(&format!("{} added ({files})\n", s.title()));
                continue;
            }
            SystemStatus::Removed => {
                out.push_str(&format!("{} removed ({files})\n", s.title()));
                continue;
            }
            SystemStatus::Changed => out.push_str(&format!("{} ({files})\n", s.title())),
        }
        let rows: Vec<[String; 5]> = s
            .changes
            .iter()
            .map(|c| {
                [
                    subject(c),
                    c.kind.words().to_string(),
                    values_text(c),
                    difference_text(c),
                    shift_text(c),
                ]
            })
            .collect();
        let width = |i: usize| {
            rows.iter()
                .filter_map(|r| r.get(i))
                .map(|t| t.chars().count())
                .max()
                .unwrap_or(0)
        };
        let widths = [width(0), width(1), width(2), width(3)];
        for (c, row) in s.changes.iter().zip(&rows) {
            let mut line = String::from(" ");
            for (text, w) in row.iter().zip(widths.iter().chain([&0])) {
                let pad = w.saturating_sub(text.chars().count());
                line.push(' ');
                line.push_str(text);
                line.push_str(&" ".repeat(pad + 1));
            }
            let mut line = line.trim_end().to_string();
            if !c.significant {
                line.push_str("  (within the threshold)");
            }
            out.push_str(&line);
            out.push('\n');
            for n in &c.notes {
                out.push_str(&format!("      note: {n}\n"));
            }
        }
        if s.changes.iter().any(|c| {
            c.kind == ChangeKind::DiagnosticAdded
                && c.new.as_deref().is_some_and(|n| n.starts_with("error"))
        }) {
            out.push_str("  (run `syz check` on the new side for the lines of its diagnostics)\n");
        }
    }
    out.push('\n');
    out.push_str(&summary_line(diff));
    out.push('\n');
    out
}

#[cfg(test)]
mod digits {
    /// A difference and its σ in one notation with the same digits.
    #[test]
    fn a_difference_and_its_sigma_read_alike() {
        assert_eq!(super::two_digits(9.8e-4), "9.8e-4");
        assert_eq!(super::two_digits(8e-4), "8.0e-4");
        assert_eq!(super::two_digits(0.05), "0.050");
        assert_eq!(super::two_digits(-0.0061), "-0.0061");
    }
}
