//! Small text helpers shared by diagnostics: edit distance for did-you-mean hints, and
//! lists in words.

use std::cell::Cell;

/// `a`, `a and b`, `a, b and c`.
pub fn and_list(items: &[String]) -> String {
    match items.split_last() {
        Some((last, rest)) if !rest.is_empty() => format!("{} and {last}", rest.join(", ")),
        _ => items.join(""),
    }
}

/// Levenshtein distance over characters.
/// The text with its first letter in upper case (`read in d ...` -> `Read in d ...`).
pub fn sentence_case(text: &str) -> String {
    let mut chars = text.chars();
    match chars.next() {
        Some(c) => c.to_uppercase().chain(chars).collect(),
        None => String::new(),
    }
}

pub fn edit_distance(a: &str, b: &str) -> usize {
    let a: Vec<char> = a.chars().collect();
    let b: Vec<char> = b.chars().collect();
    within(&a, &b, usize::MAX, &mut Rows::default()).unwrap_or(usize::MAX)
}

/// The Levenshtein distance of `a` and `b` when it is at most `cap`, else `None`; cheaper
/// than [`edit_distance`] for a far pair.
pub fn distance_within(a: &str, b: &str, cap: usize) -> Option<usize> {
    if a.len().abs_diff(b.len()) > cap.saturating_mul(4) {
        // Each character is at most four bytes: the counts differ by more than `cap`.
        return None;
    }
    let a: Vec<char> = a.chars().collect();
    let b: Vec<char> = b.chars().collect();
    within(&a, &b, cap, &mut Rows::default())
}

/// The two rows of the distance table, kept between comparisons so that comparing a word
/// with many candidates allocates once.
#[derive(Default)]
struct Rows {
    prev: Vec<usize>,
    cur: Vec<usize>,
}

/// The Levenshtein distance of `a` and `b` when it is at most `cap`, else `None`: the rows
/// are abandoned as soon as every entry of one exceeds `cap`, since the entries of the next
/// row are never smaller than the smallest of the row before.
fn within(a: &[char], b: &[char], cap: usize, rows: &mut Rows) -> Option<usize> {
    if a.len().abs_diff(b.len()) > cap {
        return None;
    }
    let Rows { prev, cur } = rows;
    prev.clear();
    prev.extend(0..=b.len());
    cur.clear();
    cur.resize(b.len() + 1, 0);
    for (i, ca) in a.iter().enumerate() {
        if let Some(c0) = cur.first_mut() {
            *c0 = i + 1;
        }
        let mut least = i + 1;
        for (j, cb) in b.iter().enumerate() {
            let sub = prev.get(j).copied().unwrap_or(0) + usize::from(ca != cb);
            let del = prev.get(j + 1).copied().unwrap_or(0) + 1;
            let ins = cur.get(j).copied().unwrap_or(0) + 1;
            let d = sub.min(del).min(ins);
            least = least.min(d);
            if let Some(c) = cur.get_mut(j + 1) {
                *c = d;
            }
        }
        if least > cap {
            return None;
        }
        std::mem::swap(prev, cur);
    }
    prev.last().copied().filter(|d| *d <= cap)
}

/// The closest candidate within a small distance, for "did you mean" hints. For a few
/// candidates known in advance (the quantities of a kind of body, the rules); a set that
/// grows with the file goes through [`Hints::closest`], which bounds the work.
pub fn closest<'a>(word: &str, candidates: impl IntoIterator<Item = &'a str>) -> Option<&'a str> {
    search(word, candidates, &Cell::new(u64::MAX))
}

/// Did-you-mean hints over sets that grow with the file (its references, bodies and
/// bindings), with a bound on the work of all of them together: a file that cites thousands
/// of missing references among thousands of declared ones would otherwise compare every
/// pair (minutes for a 2 MB file). Each candidate looked at costs one unit and each cell of
/// a distance table one more; once [`Hints::WORK`] units are spent, the diagnostics that
/// follow keep their other help but name no close match. Deterministic: the same file gives
/// the same hints.
#[derive(Debug)]
pub struct Hints {
    left: Cell<u64>,
}

impl Default for Hints {
    fn default() -> Hints {
        Hints {
            left: Cell::new(Hints::WORK),
        }
    }
}

impl Hints {
    /// The work all hints of one file may take: a few tens of milliseconds.
    pub const WORK: u64 = 20_000_000;

    /// [`closest`], charged to this file's bound; `None` once the bound is spent.
    pub fn closest<'a>(
        &self,
        word: &str,
        candidates: impl IntoIterator<Item = &'a str>,
    ) -> Option<&'a str> {
        search(word, candidates, &self.left)
    }
}

/// [`closest`], spending at most `left` units of work (see [`Hints`]); `None` when they run
/// out before every candidate was looked at.
fn search<'a>(
    word: &str,
    candidates: impl IntoIterator<Item = &'a str>,
    left: &Cell<u64>,
) -> Option<&'a str> {
    let w: Vec<char> = word.to_lowercase().chars().collect();
    let length = word.chars().count();
    if length == 0 {
        return None;
    }
    // A candidate that shares nothing with the word (`x` and `M`) is no suggestion.
    let limit = (length / 3).clamp(1, 3).min(length.saturating_sub(1));
    let mut best: Option<(usize, &str)> = None;
    let mut rows = Rows::default();
    let mut c_low: Vec<char> = Vec::new();
    for c in candidates {
        let rest = left.get().checked_sub(1)?;
        left.set(rest);
        // Only a strictly closer candidate replaces the best so far.
        let cap = match best {
            Some((0, _)) => break,
            Some((bd, _)) => bd - 1,
            None => limit,
        };
        if c.is_ascii() && c.len().abs_diff(w.len()) > cap {
            continue;
        }
        c_low.clear();
        if c.is_ascii() {
            c_low.extend(c.chars().map(|ch| ch.to_ascii_lowercase()));
        } else {
            c_low.extend(c.to_lowercase().chars());
        }
        let cells = (w.len() as u64 + 1) * (c_low.len() as u64 + 1);
        let Some(rest) = left.get().checked_sub(cells) else {
            left.set(0);
            return None;
        };
        left.set(rest);
        if let Some(d) = within(&w, &c_low, cap, &mut rows) {
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
        assert_eq!(closest("", ["", "a"]), None);
    }

    /// The textbook table, every cell filled, and the rule of [`closest`] applied to every
    /// candidate: what the bounded search must agree with.
    fn plain_distance(a: &str, b: &str) -> usize {
        let b: Vec<char> = b.chars().collect();
        let mut prev: Vec<usize> = (0..=b.len()).collect();
        for (i, ca) in a.chars().enumerate() {
            let mut cur = vec![i + 1; b.len() + 1];
            for (j, cb) in b.iter().enumerate() {
                cur[j + 1] = (prev[j] + usize::from(ca != *cb))
                    .min(prev[j + 1] + 1)
                    .min(cur[j] + 1);
            }
            prev = cur;
        }
        prev[b.len()]
    }

    fn plain_closest<'a>(word: &str, candidates: &[&'a str]) -> Option<&'a str> {
        let length = word.chars().count();
        let limit = (length / 3).clamp(1, 3);
        let mut best: Option<(usize, &str)> = None;
        for c in candidates {
            let d = plain_distance(&word.to_lowercase(), &c.to_lowercase());
            if d <= limit && d < length && best.is_none_or(|(bd, _)| d < bd) {
                best = Some((d, c));
            }
        }
        best.map(|(_, c)| c)
    }

    proptest::proptest! {
        /// Words over a small alphabet (so that many are close), with capitals and a
        /// letter outside ASCII whose lower case differs.
        #[test]
        fn bounded_search_agrees_with_the_full_table(
            word in "[abAB\u{c9}\u{e9}_]{0,9}",
            candidates in proptest::collection::vec("[abAB\u{c9}\u{e9}_]{0,9}", 0..12),
        ) {
            let c: Vec<&str> = candidates.iter().map(String::as_str).collect();
            proptest::prop_assert_eq!(closest(&word, c.iter().copied()), plain_closest(&word, &c));
            let a = word.as_str();
            for b in &c {
                let d = plain_distance(a, b);
                proptest::prop_assert_eq!(edit_distance(a, b), d);
                for cap in 0..4 {
                    proptest::prop_assert_eq!(distance_within(a, b, cap), Some(d).filter(|d| *d <= cap));
                }
            }
        }
    }

    #[test]
    fn hints_stop_once_their_work_is_spent() {
        // 100,000 references `r0`..`r99999`, and citations that are each one letter off.
        let ids: Vec<String> = (0..100_000).map(|i| format!("r{i}")).collect();
        let hints = Hints::default();
        let mut found = 0;
        let mut calls = 0;
        while calls < 1_000 {
            calls += 1;
            if hints
                .closest(&format!("q{calls}"), ids.iter().map(String::as_str))
                .is_some()
            {
                found += 1;
            } else {
                break;
            }
        }
        // Each call looks at all 100,000 ids; the bound is spent after a few hundred calls
        // and every call after that names nothing.
        assert!(found > 10, "{found}");
        assert!(calls < 1_000, "the bound was never reached");
        assert_eq!(hints.closest("q1", ids.iter().map(String::as_str)), None);
        // A fresh bound (the next file) finds it again.
        assert_eq!(
            Hints::default().closest("q1", ids.iter().map(String::as_str)),
            Some("r1")
        );
    }
}
