//! Small text helpers shared by diagnostics: edit distance for did-you-mean hints, and
//! lists in words.

/// `a`, `a and b`, `a, b and c`.
pub fn and_list(items: &[String]) -> String {
    match items.split_last() {
        Some((last, rest)) if !rest.is_empty() => format!("{} and {last}", rest.join(", ")),
        _ => items.join(""),
    }
}

/// Levenshtein distance over characters.
pub fn edit_distance(a: &str, b: &str) -> usize {
    let b: Vec<char> = b.chars().collect();
    let mut prev: Vec<usize> = (0..=b.len()).collect();
    let mut cur = vec![0; b.len() + 1];
    for (i, ca) in a.chars().enumerate() {
        if let Some(c0) = cur.first_mut() {
            *c0 = i + 1;
        }
        for (j, cb) in b.iter().enumerate() {
            let sub = prev.get(j).copied().unwrap_or(0) + usize::from(ca != *cb);
            let del = prev.get(j + 1).copied().unwrap_or(0) + 1;
            let ins = cur.get(j).copied().unwrap_or(0) + 1;
            if let Some(c) = cur.get_mut(j + 1) {
                *c = sub.min(del).min(ins);
            }
        }
        std::mem::swap(&mut prev, &mut cur);
    }
    prev.last().copied().unwrap_or(0)
}

/// The closest candidate within a small distance, for "did you mean" hints.
pub fn closest<'a>(word: &str, candidates: impl IntoIterator<Item = &'a str>) -> Option<&'a str> {
    let mut best: Option<(usize, &str)> = None;
    for c in candidates {
        let d = edit_distance(&word.to_lowercase(), &c.to_lowercase());
        let length = word.chars().count();
        let limit = (length / 3).clamp(1, 3);
        // A candidate that shares nothing with the word (`x` and `M`) is no suggestion.
        if d <= limit && d < length && best.is_none_or(|(bd, _)| d < bd) {
            best = Some((d, c));
        }
    }
    best.map(|(_, c)| c)
}

/// The citations of one declaration as shown beside its value: `[a, b]`, or `(no citation)`
/// rather than an empty `[]`.
pub fn citation_mark<'a>(ids: impl IntoIterator<Item = &'a str>) -> String {
    let ids: Vec<&str> = ids.into_iter().collect();
    if ids.is_empty() {
        "(no citation)".to_string()
    } else {
        format!("[{}]", ids.join(", "))
    }
}

/// A failed read of a file in the words every front end uses (`syz` and the editor say the
/// same): the common kinds in plain words, the rest as the system gives them.
pub fn io_words(e: &std::io::Error) -> String {
    match e.kind() {
        std::io::ErrorKind::NotFound => "no such file or folder".to_string(),
        std::io::ErrorKind::PermissionDenied => "permission denied".to_string(),
        _ => e.to_string(),
    }
}

/// Why a path that is not a regular file (`what`: "a folder", "a named pipe (FIFO)", ...)
/// is not read.
pub fn not_regular_words(what: &str) -> String {
    format!("{what}, not a regular file; skipped (only regular files are read)")
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn distances() {
        assert_eq!(edit_distance("kitten", "sitting"), 3);
        assert_eq!(edit_distance("", "abc"), 3);
        assert_eq!(closest("perod", ["period", "mass"]), Some("period"));
        assert_eq!(closest("zzzz", ["period", "mass"]), None);
        // One letter shares nothing with another: no suggestion; one more letter does.
        assert_eq!(closest("x", ["M", "e"]), None);
        assert_eq!(closest("Ms", ["M", "e"]), Some("M"));
        assert_eq!(closest("B", ["b", "c"]), Some("b"));
    }
}
