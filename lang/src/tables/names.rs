//! Table values made into Syzygy names and file names. Both are built from an allow-list of
//! characters, so no table value can name a path outside the output folder or a keyword.

const KEYWORDS: &[&str] = &[
    "system",
    "star",
    "planet",
    "orbits",
    "ref",
    "let",
    "assumed",
    "preferred",
];

/// Longest name or file stem made.
const MAX_LEN: usize = 64;

/// Longest valid name kept as it is.
const KEPT_LEN: usize = 256;

/// The characters a name may hold besides ASCII letters, digits and `_`, as the lexer reads
/// them (`crate::lexer`): `☉`, `⊕`, `µ`, `μ`, `ω` anywhere, `°` only first.
fn other_name_char(ch: char, first: bool) -> bool {
    matches!(
        ch,
        '\u{2609}' | '\u{2295}' | '\u{00B5}' | '\u{03BC}' | '\u{03C9}'
    ) || (first && ch == '\u{00B0}')
}

/// A valid Syzygy name for a table value: the characters a name may hold (ASCII letters,
/// digits, `_`, and the few others the language reads, so that a name the language wrote comes
/// back as it was), every run of others made one `_`, starting with a letter or `_`, never a
/// keyword; `fallback` when nothing is left.
pub fn syzygy_name(text: &str, fallback: &str) -> String {
    // A name the language reads comes back as it was, up to `KEPT_LEN` bytes (the language
    // sets no length; a longer one is cut like any other).
    let valid = |ch: char, first: bool| {
        ch.is_ascii_alphabetic()
            || ch == '_'
            || (!first && ch.is_ascii_digit())
            || other_name_char(ch, first)
    };
    let mut chars = text.chars();
    if text.len() <= KEPT_LEN
        && chars.next().is_some_and(|c| valid(c, true))
        && chars.all(|c| valid(c, false))
        && !KEYWORDS.contains(&text)
    {
        return text.to_string();
    }
    let mut out = String::new();
    for ch in text.trim().chars() {
        if out.len() >= MAX_LEN {
            break;
        }
        if ch.is_ascii_alphanumeric() || other_name_char(ch, out.is_empty()) {
            out.push(ch);
        } else if !out.ends_with('_') && !out.is_empty() {
            out.push('_');
        }
    }
    let out = out.trim_end_matches('_').to_string();
    if out.is_empty() {
        return format!("{fallback}_unnamed");
    }
    if out.starts_with(|c: char| c.is_ascii_digit()) || KEYWORDS.contains(&out.as_str()) {
        return format!("{fallback}_{out}");
    }
    out
}

/// Device names Windows reserves whatever the extension (common practice).
const DEVICES: &[&str] = &[
    "con", "prn", "aux", "nul", "com1", "com2", "com3", "com4", "com5", "com6", "com7", "com8",
    "com9", "lpt1", "lpt2", "lpt3", "lpt4", "lpt5", "lpt6", "lpt7", "lpt8", "lpt9",
];

/// A file stem for a system's name: lower-case ASCII letters, digits and single `-`, at most
/// 64 characters, never empty, never starting with `-` or `.`, never a Windows device name.
/// An id made from a reference's text: its first word and first four-digit number, lower
/// case (`Orlen et al. 2031, invented journal` is `orlen2031`).
pub fn ref_name(text: &str) -> String {
    let word: String = text
        .split(|c: char| !c.is_ascii_alphabetic())
        .find(|w| !w.is_empty())
        .unwrap_or("")
        .to_ascii_lowercase();
    let year = text
        .as_bytes()
        .windows(4)
        .enumerate()
        .find(|(i, w)| {
            w.iter().all(u8::is_ascii_digit)
                && !text.as_bytes().get(i + 4).is_some_and(u8::is_ascii_digit)
                && (*i == 0 || !text.as_bytes().get(i - 1).is_some_and(u8::is_ascii_digit))
        })
        .and_then(|(i, _)| text.get(i..i + 4))
        .unwrap_or("");
    syzygy_name(&format!("{word}{year}"), "ref")
}

/// Different names can give the same stem; the front end adds a suffix then.
pub fn file_stem(system: &str) -> String {
    let mut out = String::new();
    for ch in system.chars() {
        if out.len() >= MAX_LEN {
            break;
        }
        if ch.is_ascii_alphanumeric() {
            out.push(ch.to_ascii_lowercase());
        } else if !out.is_empty() && !out.ends_with('-') {
            out.push('-');
        }
    }
    let out = out.trim_end_matches('-').to_string();
    if out.is_empty() {
        return "system".to_string();
    }
    if DEVICES.contains(&out.as_str()) {
        return format!("{out}-system");
    }
    out
}

/// The ids given so far in one scope (a system's bodies, a file's references), to make each
/// new one unique: `base`, else `base_2`, `base_3`... Each base remembers the next number to
/// try, so many names that make one base cost no more than distinct ones.
#[derive(Debug, Default, Clone)]
pub struct Ids {
    taken: std::collections::HashSet<String>,
    next: std::collections::HashMap<String, usize>,
}

impl Ids {
    /// A fresh id from `base`, now taken.
    pub fn fresh(&mut self, base: &str) -> String {
        let mut id = base.to_string();
        if self.taken.contains(&id) {
            let n = self.next.entry(base.to_string()).or_insert(2);
            loop {
                id = format!("{base}_{n}");
                *n += 1;
                if !self.taken.contains(&id) {
                    break;
                }
            }
        }
        self.taken.insert(id.clone());
        id
    }
}
