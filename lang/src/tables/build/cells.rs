//! Cells into Syzygy text: numbers as the lexer reads them, string literals, and what a
//! cell that is not a number probably meant.

/// A cell read as a number, with the text to write: the cell itself when the language reads
/// it as written (so no digit is lost), else the shortest text that gives the same number.
pub(super) fn number(raw: &str) -> Option<(f64, String)> {
    let t = raw.trim();
    let t = t.strip_prefix('+').unwrap_or(t);
    // The minus sign of typeset text (U+2212, from a PDF), which the language reads too.
    let unicode_minus = t.strip_prefix('\u{2212}').map(|r| format!("-{r}"));
    let t = unicode_minus.as_deref().unwrap_or(t);
    let v: f64 = t.parse().ok()?;
    if !v.is_finite() || too_small(v, t) {
        return None;
    }
    let (neg, digits) = match t.strip_prefix('-') {
        Some(rest) => (true, rest),
        None => (false, t),
    };
    if syzygy_number(digits) {
        let digits = digits.to_string();
        return Some((v, if neg { format!("-{digits}") } else { digits }));
    }
    Some((v, format!("{v:e}")))
}

/// A number the language refuses as too small to represent: below the smallest normal
/// `f64` (`1e-320`, which would lose digits), or read as 0 though a digit is not (`1e-400`).
fn too_small(v: f64, t: &str) -> bool {
    let mantissa = t.split(['e', 'E']).next().unwrap_or("");
    let nonzero_digit = mantissa.bytes().any(|b| (b'1'..=b'9').contains(&b));
    (v != 0.0 && v.abs() < f64::MIN_POSITIVE) || (v == 0.0 && nonzero_digit)
}

/// What a value cell that is not a number probably meant, as a clause to add to the issue:
/// a limit written into the value (`<5`), or a spelling of "no value" (`NaN`, `--`).
/// `has_limit_column`: whether the mapping names a limit-flag column for the quantity.
pub(super) fn not_a_number_hint(raw: &str, has_limit_column: bool) -> String {
    let t = raw.trim();
    let limit = t
        .strip_prefix(['<', '>', '≤', '≥'])
        .map(|r| r.trim_start_matches('=').trim())
        .filter(|r| number(r).is_some());
    if let Some(rest) = limit {
        let how = if has_limit_column {
            "write `{rest}` in the value cell and the limit's code in the quantity's limit-flag column"
        } else {
            "write `{rest}` in the value cell, the limit's code in a column of its own, and name that column as the quantity's `limit` in the mapping (codes as in `[limit_codes]`)"
        };
        return format!(
            "; a limit is read from a flag beside its value: {}",
            how.replace("{rest}", rest)
        );
    }
    // `0,91` in a table whose cells are separated by `;` or tabs: a decimal comma.
    if let Some((int, frac)) = t.split_once(',') {
        let point = format!("{int}.{frac}");
        if !frac.contains(',') && number(&point).is_some() {
            return format!(
                "; it looks like a decimal comma: write `{point}`, with a decimal point"
            );
        }
    }
    if let Ok(v) = t.parse::<f64>() {
        if v.is_finite() && too_small(v, t) {
            return "; it is too small to represent (below 2.2e-308): if it means 0, write 0"
                .to_string();
        }
    }
    let lower = t.to_ascii_lowercase();
    if [
        "nan", "na", "n/a", "null", "none", "-", "--", "---", "?", "...",
    ]
    .contains(&lower.as_str())
    {
        return "; if it means no value, leave the cell empty (an empty cell is no value and no issue)"
            .to_string();
    }
    String::new()
}

/// Whether text is a number as the lexer reads it: digits with an optional fraction and
/// exponent (`42`, `0.93`, `1.`, `.5`, `6.2e-3`).
fn syzygy_number(t: &str) -> bool {
    let (mant, exp) = match t.find(['e', 'E']) {
        Some(i) => (t.get(..i).unwrap_or(""), t.get(i + 1..)),
        None => (t, None),
    };
    let (int, frac) = mant.split_once('.').unwrap_or((mant, ""));
    let digits = |s: &str| s.bytes().all(|b| b.is_ascii_digit());
    let mant_ok = digits(int) && digits(frac) && !(int.is_empty() && frac.is_empty());
    let exp_ok = exp.is_none_or(|e| {
        let e = e.strip_prefix(['+', '-']).unwrap_or(e);
        !e.is_empty() && digits(e)
    });
    mant_ok && exp_ok
}

/// A string literal of the language.
pub(crate) fn string_literal(s: &str) -> String {
    let mut out = String::from("\"");
    for ch in s.chars() {
        match ch {
            '"' => out.push_str("\\\""),
            '\\' => out.push_str("\\\\"),
            '\n' => out.push_str("\\n"),
            '\t' => out.push_str("\\t"),
            // Other control characters cannot stand in a string literal; a space keeps the
            // words apart.
            c if c.is_control() => out.push(' '),
            c => out.push(c),
        }
    }
    out.push('"');
    out
}

/// A cell shown in a message: at most 40 characters.
pub(super) fn shorten(s: &str) -> String {
    if s.chars().count() <= 40 {
        s.to_string()
    } else {
        let head: String = s.chars().take(40).collect();
        format!("{head}…")
    }
}

/// Whether two declared values (`0.91 ± 0.03 Msun`, `< 5 m/s`) are the same: their numbers
/// equal as numbers (`0.91`, `0.910` and `9.1e-1` are one value), everything else equal as
/// written.
pub(super) fn same_value(a: &str, b: &str) -> bool {
    let (mut x, mut y) = (pieces(a), pieces(b));
    loop {
        match (x.next(), y.next()) {
            (None, None) => return true,
            (Some(p), Some(q)) => {
                let equal = match (p.parse::<f64>(), q.parse::<f64>()) {
                    (Ok(u), Ok(v)) => u == v,
                    _ => p == q,
                };
                if !equal {
                    return false;
                }
            }
            _ => return false,
        }
    }
}

/// `text` cut into runs of the characters numbers are written with and runs of the rest.
fn pieces(text: &str) -> impl Iterator<Item = &str> {
    let numeric = |c: char| c.is_ascii_digit() || matches!(c, '.' | 'e' | 'E' | '+' | '-');
    let mut rest = text;
    std::iter::from_fn(move || {
        let first = rest.chars().next()?;
        let kind = numeric(first);
        let end = rest
            .find(|c: char| numeric(c) != kind)
            .unwrap_or(rest.len());
        let (piece, after) = rest.split_at(end);
        rest = after;
        Some(piece)
    })
}

#[cfg(test)]
mod tests {
    use super::same_value;

    #[test]
    fn a_decimal_comma_is_pointed_out() {
        let hint = super::not_a_number_hint("0,91", false);
        assert!(hint.contains("decimal comma: write `0.91`"), "{hint}");
        let hint = super::not_a_number_hint("-1,5e3", false);
        assert!(hint.contains("`-1.5e3`"), "{hint}");
        assert!(!super::not_a_number_hint("1,2,3", false).contains("decimal"));
        assert!(!super::not_a_number_hint("a,b", false).contains("decimal"));
    }

    /// A typeset minus (U+2212, as a PDF gives it) is read as the language reads it; a number
    /// too small to represent is refused with the reason, as `syz check` would refuse it.
    #[test]
    fn a_typeset_minus_is_read_and_a_subnormal_refused() {
        assert_eq!(
            super::number("\u{2212}0.05"),
            Some((-0.05, "-0.05".to_string()))
        );
        for tiny in ["1e-320", "1e-400", "0.5e-310"] {
            assert_eq!(super::number(tiny), None, "{tiny}");
            let hint = super::not_a_number_hint(tiny, false);
            assert!(hint.contains("too small to represent"), "{tiny}: {hint}");
        }
        assert_eq!(super::number("0e-400"), Some((0.0, "0e-400".to_string())));
    }

    #[test]
    fn values_are_the_same_when_their_numbers_are() {
        assert!(same_value("0.91 ± 0.03 Msun", "0.910 ± 0.030 Msun"));
        assert!(same_value("0.91 ± 0.03 Msun", "9.1e-1 ± 3e-2 Msun"));
        assert!(same_value("4.2 +0.3/-0.20 d", "4.20 +0.30/-0.2 d"));
        assert!(!same_value("0.91 ± 0.03 Msun", "0.92 ± 0.03 Msun"));
        assert!(!same_value("0.91 ± 0.03 Msun", "0.91 ± 0.03 Rsun"));
        assert!(!same_value("0.91 ± 0.03 Msun", "0.91 Msun"));
        assert!(!same_value("4.2 +0.3/-0.2 d", "4.2 +0.2/-0.3 d"));
        assert!(same_value("\"K0V\"", "\"K0V\""));
        assert!(!same_value("\"K0V\"", "\"K1V\""));
    }
}
