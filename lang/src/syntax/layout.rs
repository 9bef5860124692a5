//! The canonical layout of a source file, shared by `syz fmt` and the language server.
//!
//! The layout changes only whitespace and separators, never a token:
//! - one statement a line (`;` becomes a line break), `{` ends its header's line and `}`
//!   stands on a line of its own; two spaces of indentation per block;
//! - single spaces between words, around `=`, `<`, `>`, `±` and the operators `+ - * /`;
//!   none inside `+0.03/-0.02`, `b.period`, `x^2`, `m/s`, `f(x)`, `[a, b]`;
//! - within a run of statements of one block (a blank line ends the run) the names, the
//!   `=`, the units and the citations are aligned in columns;
//! - comments are kept, trailing ones two spaces after the code; at most one blank line in a
//!   row, none at the start or end of a block or of the file; one final newline.
//!
//! A file with syntax errors is not laid out (its structure is uncertain). The result is
//! checked token by token against the input before it is returned. Lines end as the input's
//! first line break does (`\n`, `\r\n` or `\r`).
//!
//! Memory stays a small multiple of the text: tokens are streamed from the lexer, a run of
//! blank lines becomes one item, and the token check compares two token streams without
//! collecting them.

use crate::lexer::{tokens, Tok, Token};
use crate::source::{line_break_of, FileId};

/// Why a text was not laid out.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum LayoutError {
    /// The file has this many syntax errors.
    Syntax(usize),
    /// The layout would have changed the tokens (a bug); the text is left as it is.
    Changed,
}

impl std::fmt::Display for LayoutError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            LayoutError::Syntax(n) => write!(
                f,
                "the file has {n} syntax error{}; run `syz check` and fix {} first",
                if *n == 1 { "" } else { "s" },
                if *n == 1 { "it" } else { "them" }
            ),
            LayoutError::Changed => f.write_str(
                "the layout would have changed the file's tokens, so it was left as it is",
            ),
        }
    }
}

const INDENT: &str = "  ";

#[derive(Debug)]
enum Item {
    Open {
        depth: usize,
        toks: Vec<Token>,
        comment: Option<String>,
    },
    Close {
        depth: usize,
        comment: Option<String>,
    },
    Stmt {
        depth: usize,
        toks: Vec<Token>,
        comment: Option<String>,
    },
    Comment {
        depth: usize,
        text: String,
    },
    Blank,
}

impl Item {
    fn set_comment(&mut self, c: String) -> bool {
        match self {
            Item::Open { comment, .. }
            | Item::Close { comment, .. }
            | Item::Stmt { comment, .. }
                if comment.is_none() =>
            {
                *comment = Some(c);
                true
            }
            _ => false,
        }
    }
}

/// Lay out a whole file.
pub fn format_source(src: &str) -> Result<String, LayoutError> {
    let parsed = crate::parser::parse(FileId(0), src);
    let errors = parsed
        .diagnostics
        .iter()
        .filter(|d| d.rule == crate::diagnostic::Rule::Syntax)
        .count();
    if errors > 0 {
        return Err(LayoutError::Syntax(errors));
    }
    let items = tidy_blanks(items_of(src, tokens(src)));
    let mut out = render(src, &items);
    drop(items);
    let line_break = line_break_of(src);
    if line_break != "\n" {
        // Comments and strings hold no line break, so every '\n' rendered ends a line.
        out = out.replace('\n', line_break);
    }
    if same_tokens(src, &out) {
        Ok(out)
    } else {
        Err(LayoutError::Changed)
    }
}

fn text<'a>(src: &'a str, t: &Token) -> &'a str {
    src.get(t.start..t.end).unwrap_or("")
}

fn items_of(src: &str, toks: impl Iterator<Item = Token>) -> Vec<Item> {
    let mut items: Vec<Item> = Vec::new();
    let mut cur: Vec<Token> = Vec::new();
    let mut depth = 0usize;
    let mut line_start_item = 0usize;
    let mut line_empty = true;
    let mut header_comment: Option<String> = None;
    let in_header = |cur: &[Token]| {
        cur.first()
            .is_some_and(|t| matches!(t.kind, Tok::System | Tok::StarKw | Tok::Planet))
    };
    let flush = |cur: &mut Vec<Token>, items: &mut Vec<Item>, depth: usize| {
        if !cur.is_empty() {
            items.push(Item::Stmt {
                depth,
                toks: std::mem::take(cur),
                comment: None,
            });
        }
    };
    for t in toks {
        let t = &t;
        match t.kind {
            Tok::Newline => {
                if in_header(&cur) {
                    line_empty = true;
                    continue;
                }
                flush(&mut cur, &mut items, depth);
                // Blank lines in a row are laid out as one: keep one item for the run.
                if line_empty && !matches!(items.last(), Some(Item::Blank)) {
                    items.push(Item::Blank);
                }
                line_empty = true;
                line_start_item = items.len();
            }
            Tok::Comment => {
                line_empty = false;
                let c = text(src, t).trim_end().to_string();
                if in_header(&cur) {
                    header_comment = Some(c);
                    continue;
                }
                if !cur.is_empty() {
                    flush(&mut cur, &mut items, depth);
                }
                let attached = items.len() > line_start_item
                    && items.last_mut().is_some_and(|i| i.set_comment(c.clone()));
                if !attached {
                    items.push(Item::Comment { depth, text: c });
                }
            }
            Tok::Semi => {
                line_empty = false;
                flush(&mut cur, &mut items, depth);
            }
            Tok::LBrace => {
                line_empty = false;
                let mut header = std::mem::take(&mut cur);
                header.push(*t);
                items.push(Item::Open {
                    depth,
                    toks: header,
                    comment: header_comment.take(),
                });
                depth += 1;
            }
            Tok::RBrace => {
                line_empty = false;
                flush(&mut cur, &mut items, depth);
                depth = depth.saturating_sub(1);
                items.push(Item::Close {
                    depth,
                    comment: None,
                });
            }
            _ => {
                line_empty = false;
                cur.push(*t);
            }
        }
    }
    flush(&mut cur, &mut items, depth);
    if let Some(c) = header_comment {
        items.push(Item::Comment { depth, text: c });
    }
    items
}

fn tidy_blanks(items: Vec<Item>) -> Vec<Item> {
    let mut out: Vec<Item> = Vec::with_capacity(items.len());
    for item in items {
        match item {
            Item::Blank => {
                if matches!(out.last(), None | Some(Item::Blank | Item::Open { .. })) {
                    continue;
                }
                out.push(Item::Blank);
            }
            Item::Close { .. } => {
                while matches!(out.last(), Some(Item::Blank)) {
                    out.pop();
                }
                out.push(item);
            }
            other => out.push(other),
        }
    }
    while matches!(out.last(), Some(Item::Blank)) {
        out.pop();
    }
    out
}

/// How a token is spaced from its neighbours.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Role {
    Atom,
    /// Spaced on both sides.
    BinOp,
    /// Spaced before, not after: unary minus, the `+` of `+0.03/-0.02`.
    Prefix,
    /// Never spaced: `.`, `^`, the `/` of a unit.
    Tight,
    Open,
    /// The `(` of a call.
    CallOpen,
    Close,
    Comma,
}

fn roles(toks: &[Token]) -> Vec<Role> {
    let n = toks.len();
    let mut out = vec![Role::Atom; n];
    let at = |i: usize| toks.get(i).map(|t| t.kind);
    let set = |out: &mut Vec<Role>, i: usize, r: Role| {
        if let Some(x) = out.get_mut(i) {
            *x = r;
        }
    };
    let mut i = 0;
    while i < n {
        let Some(k) = at(i) else { break };
        match k {
            Tok::Number => {
                i += 1;
                if at(i) == Some(Tok::PlusMinus) && at(i + 1) == Some(Tok::Number) {
                    set(&mut out, i, Role::BinOp);
                    i += 2;
                } else if at(i) == Some(Tok::Plus)
                    && at(i + 1) == Some(Tok::Number)
                    && at(i + 2) == Some(Tok::Slash)
                    && at(i + 3) == Some(Tok::Minus)
                    && at(i + 4) == Some(Tok::Number)
                {
                    set(&mut out, i, Role::Prefix);
                    set(&mut out, i + 2, Role::Tight);
                    set(&mut out, i + 3, Role::Tight);
                    i += 5;
                }
                // A unit: factors, each with an optional exponent, `/` before a divisor.
                while at(i) == Some(Tok::Ident) {
                    i += 1;
                    if at(i) == Some(Tok::Caret) {
                        set(&mut out, i, Role::Tight);
                        i += 1;
                        if at(i) == Some(Tok::Minus) {
                            set(&mut out, i, Role::Tight);
                            i += 1;
                        }
                        if at(i) == Some(Tok::Number) {
                            i += 1;
                        }
                    }
                    if at(i) == Some(Tok::Slash) && at(i + 1) == Some(Tok::Ident) {
                        set(&mut out, i, Role::Tight);
                        i += 1;
                    }
                }
                continue;
            }
            Tok::Minus => {
                let unary = match i.checked_sub(1).and_then(|p| out.get(p).map(|r| (p, *r))) {
                    None => true,
                    Some((p, r)) => {
                        matches!(
                            r,
                            Role::BinOp | Role::Prefix | Role::Open | Role::CallOpen | Role::Comma
                        ) || at(p) == Some(Tok::Caret)
                    }
                };
                set(&mut out, i, if unary { Role::Prefix } else { Role::BinOp });
            }
            Tok::Plus | Tok::Star | Tok::Slash | Tok::PlusMinus | Tok::Eq | Tok::Lt | Tok::Gt => {
                set(&mut out, i, Role::BinOp)
            }
            Tok::Caret | Tok::Dot => set(&mut out, i, Role::Tight),
            Tok::LParen => {
                let call = i
                    .checked_sub(1)
                    .is_some_and(|p| at(p) == Some(Tok::Ident) && out.get(p) == Some(&Role::Atom));
                set(&mut out, i, if call { Role::CallOpen } else { Role::Open });
            }
            Tok::LBracket => set(&mut out, i, Role::Open),
            Tok::RParen | Tok::RBracket => set(&mut out, i, Role::Close),
            Tok::Comma => set(&mut out, i, Role::Comma),
            _ => {}
        }
        i += 1;
    }
    out
}

fn spaced(a: Role, b: Role) -> bool {
    !(matches!(a, Role::Open | Role::CallOpen | Role::Tight | Role::Prefix)
        || matches!(b, Role::Close | Role::Comma | Role::Tight | Role::CallOpen))
}

/// Render `toks[range]`, spaced by roles computed over all of `toks`.
fn join(src: &str, toks: &[Token], roles: &[Role], range: std::ops::Range<usize>) -> String {
    let mut out = String::new();
    let mut prev: Option<Role> = None;
    for i in range {
        let (Some(t), Some(r)) = (toks.get(i), roles.get(i)) else {
            break;
        };
        if let Some(p) = prev {
            if spaced(p, *r) {
                out.push(' ');
            }
        }
        out.push_str(text(src, t));
        prev = Some(*r);
    }
    out
}

/// One statement split into columns.
struct Columns {
    name: String,
    rel: String,
    value: String,
    unit: String,
    cites: String,
    assumed: String,
}

fn columns(src: &str, toks: &[Token]) -> Option<Columns> {
    let first = toks.first()?;
    let (name, rel_at) = match first.kind {
        Tok::Let => {
            let n = toks.get(1)?;
            (format!("let {}", text(src, n)), 2)
        }
        Tok::Ident => (text(src, first).to_string(), 1),
        _ => return None,
    };
    let rel = toks.get(rel_at)?;
    if !matches!(rel.kind, Tok::Eq | Tok::Lt | Tok::Gt) {
        return None;
    }
    let rest = toks.get(rel_at + 1..)?;
    let r = roles(rest);
    // Trailing parts: citations, `assumed` and `preferred`, at bracket depth 0.
    let mut depth = 0i32;
    let mut trail = rest.len();
    for (i, t) in rest.iter().enumerate() {
        match t.kind {
            Tok::LParen => depth += 1,
            Tok::RParen => depth -= 1,
            Tok::LBracket | Tok::Assumed | Tok::Preferred if depth == 0 => {
                trail = i;
                break;
            }
            _ => {}
        }
    }
    let value_toks = rest.get(..trail)?;
    let unit_start = literal_unit_start(value_toks);
    let (value, unit) = match unit_start {
        Some(u) => (
            join(src, rest, &r, 0..u),
            join(src, rest, &r, u..value_toks.len()),
        ),
        None => (join(src, rest, &r, 0..trail), String::new()),
    };
    let mut cites = Vec::new();
    let mut assumed = Vec::new();
    let mut i = trail;
    // A mark written before a citation (`assumed [a]`, which the grammar allows) stays in
    // its place: the whole tail is kept in the citations' column in its written order, as
    // the layout never reorders tokens.
    let mark_first = rest.get(trail..).is_some_and(|tail| {
        let mark = tail
            .iter()
            .position(|t| matches!(t.kind, Tok::Assumed | Tok::Preferred));
        let cite = tail.iter().rposition(|t| t.kind == Tok::LBracket);
        matches!((mark, cite), (Some(m), Some(c)) if m < c)
    });
    if mark_first {
        cites.push(join(src, rest, &r, trail..rest.len()));
        i = rest.len();
    }
    while i < rest.len() {
        if matches!(
            rest.get(i).map(|t| t.kind),
            Some(Tok::Assumed | Tok::Preferred)
        ) {
            assumed.push(join(src, rest, &r, i..i + 1));
            i += 1;
        } else {
            let end = (i..rest.len())
                .find(|j| rest.get(*j).map(|t| t.kind) == Some(Tok::RBracket))
                .map_or(rest.len(), |j| j + 1);
            cites.push(join(src, rest, &r, i..end));
            i = end;
        }
    }
    Some(Columns {
        name,
        rel: text(src, rel).to_string(),
        value,
        unit,
        cites: cites.join(" "),
        assumed: assumed.join(" "),
    })
}

/// Where the unit of a lone literal starts, if the value is one literal with a unit.
fn literal_unit_start(v: &[Token]) -> Option<usize> {
    let k = |i: usize| v.get(i).map(|t| t.kind);
    let mut i = usize::from(k(0) == Some(Tok::Minus));
    if k(i) != Some(Tok::Number) {
        return None;
    }
    i += 1;
    if k(i) == Some(Tok::PlusMinus) && k(i + 1) == Some(Tok::Number) {
        // One `±` or several (combined in quadrature).
        while k(i) == Some(Tok::PlusMinus) && k(i + 1) == Some(Tok::Number) {
            i += 2;
        }
    } else if k(i) == Some(Tok::Plus)
        && k(i + 1) == Some(Tok::Number)
        && k(i + 2) == Some(Tok::Slash)
        && k(i + 3) == Some(Tok::Minus)
        && k(i + 4) == Some(Tok::Number)
    {
        i += 5;
    }
    if k(i) != Some(Tok::Ident) {
        return None;
    }
    let unit_ok = v.get(i..)?.iter().all(|t| {
        matches!(
            t.kind,
            Tok::Ident | Tok::Caret | Tok::Minus | Tok::Number | Tok::Slash
        )
    });
    unit_ok.then_some(i)
}

fn width(s: &str) -> usize {
    s.chars().count()
}

fn pad(s: &str, w: usize) -> String {
    let mut out = s.to_string();
    out.push_str(&" ".repeat(w.saturating_sub(width(s))));
    out
}

fn with_comment(line: String, comment: &Option<String>) -> String {
    match comment {
        Some(c) if line.trim().is_empty() => format!("{line}{c}"),
        Some(c) => format!("{line}  {c}"),
        None => line,
    }
}

fn render(src: &str, items: &[Item]) -> String {
    let mut out = String::new();
    let mut i = 0;
    while i < items.len() {
        let Some(item) = items.get(i) else { break };
        match item {
            Item::Blank => out.push('\n'),
            Item::Comment { depth, text } => {
                out.push_str(&format!("{}{text}\n", INDENT.repeat(*depth)));
            }
            Item::Open {
                depth,
                toks,
                comment,
            } => {
                let r = roles(toks);
                let line = format!(
                    "{}{}",
                    INDENT.repeat(*depth),
                    join(src, toks, &r, 0..toks.len())
                );
                out.push_str(&with_comment(line, comment));
                out.push('\n');
            }
            Item::Close { depth, comment } => {
                out.push_str(&with_comment(
                    format!("{}}}", INDENT.repeat(*depth)),
                    comment,
                ));
                out.push('\n');
            }
            Item::Stmt { depth, .. } => {
                // A run of statements and comments at one depth is aligned together.
                let mut j = i;
                while let Some(Item::Stmt { depth: d, .. } | Item::Comment { depth: d, .. }) =
                    items.get(j)
                {
                    if d != depth {
                        break;
                    }
                    j += 1;
                }
                out.push_str(&render_run(src, items.get(i..j).unwrap_or(&[]), *depth));
                i = j;
                continue;
            }
        }
        i += 1;
    }
    out
}

fn render_run(src: &str, run: &[Item], depth: usize) -> String {
    let indent = INDENT.repeat(depth);
    let cols: Vec<Option<Columns>> = run
        .iter()
        .map(|it| match it {
            Item::Stmt { toks, .. } => columns(src, toks),
            _ => None,
        })
        .collect();
    let all = || cols.iter().flatten();
    let name_w = all().map(|c| width(&c.name)).max().unwrap_or(0);
    let value_w = all()
        .filter(|c| !c.unit.is_empty())
        .map(|c| width(&c.value))
        .max()
        .unwrap_or(0);
    let head = |c: &Columns| {
        if c.unit.is_empty() {
            c.value.clone()
        } else {
            format!("{} {}", pad(&c.value, value_w), c.unit)
        }
    };
    let head_w = all()
        .filter(|c| !c.cites.is_empty())
        .map(|c| width(&head(c)))
        .max()
        .unwrap_or(0);
    let mut out = String::new();
    for (it, col) in run.iter().zip(&cols) {
        match (it, col) {
            (Item::Comment { text, .. }, _) => out.push_str(&format!("{indent}{text}\n")),
            (Item::Stmt { comment, .. }, Some(c)) => {
                let mut line = format!("{indent}{} {} ", pad(&c.name, name_w), c.rel);
                let h = head(c);
                if c.cites.is_empty() {
                    line.push_str(&h);
                } else {
                    line.push_str(&pad(&h, head_w));
                    line.push(' ');
                    line.push_str(&c.cites);
                }
                if !c.assumed.is_empty() {
                    line.push(' ');
                    line.push_str(&c.assumed);
                }
                out.push_str(&with_comment(line, comment));
                out.push('\n');
            }
            (Item::Stmt { toks, comment, .. }, None) => {
                let r = roles(toks);
                let line = format!("{indent}{}", join(src, toks, &r, 0..toks.len()));
                out.push_str(&with_comment(line, comment));
                out.push('\n');
            }
            _ => {}
        }
    }
    out
}

/// Whether two texts hold the same tokens, up to insignificant separators and the
/// whitespace inside comments' ends.
pub fn same_tokens(a: &str, b: &str) -> bool {
    code_tokens(a).eq(code_tokens(b)) && comments(a).eq(comments(b))
}

fn comments(src: &str) -> impl Iterator<Item = &str> + '_ {
    tokens(src)
        .filter(|t| t.kind == Tok::Comment)
        .map(|t| text(src, &t).trim_end())
}

/// The code tokens of a text with separators normalised: runs of newlines and `;` become
/// one separator, none next to a brace, at the start or at the end.
fn code_tokens(src: &str) -> impl Iterator<Item = (Tok, &str)> + '_ {
    const SEP: (Tok, &str) = (Tok::Newline, "");
    let mut toks = tokens(src);
    let mut last: Option<Tok> = None;
    let mut pending = false;
    let mut held: Option<(Tok, &str)> = None;
    std::iter::from_fn(move || {
        if let Some(h) = held.take() {
            return Some(h);
        }
        loop {
            let t = toks.next()?;
            match t.kind {
                Tok::Comment => {}
                Tok::Newline | Tok::Semi => {
                    if !matches!(last, None | Some(Tok::LBrace | Tok::RBrace)) {
                        pending = true;
                    }
                }
                Tok::LBrace | Tok::RBrace => {
                    pending = false;
                    last = Some(t.kind);
                    return Some((t.kind, text(src, &t)));
                }
                k => {
                    last = Some(k);
                    let tok = (k, text(src, &t));
                    if std::mem::take(&mut pending) {
                        held = Some(tok);
                        return Some(SEP);
                    }
                    return Some(tok);
                }
            }
        }
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_mark_written_before_its_citation_stays_before_it() {
        // The grammar takes `assumed` and `preferred` before or after the citations
        // (language.md); the layout keeps the order written rather than refuse the file.
        let src = "ref a \"A\"\nsystem \"S\" {\n  star s {\n    teff = 5400 ± 70 K assumed [a]\n    mass=1 Msun preferred   [a]\n  }\n}\n";
        let out = format_source(src).unwrap();
        assert!(out.contains("K    assumed [a]\n"), "{out}");
        assert!(out.contains("Msun preferred [a]\n"), "{out}");
        assert!(same_tokens(src, &out));
        assert_eq!(format_source(&out).unwrap(), out);
    }

    #[test]
    fn a_value_with_several_uncertainties_has_its_unit_in_the_column() {
        let src = "system \"A\" {\n  star s {\n    mass = 1.1 ± 0.05 ± 0.02 Msun\n    radius = 1.2 ± 0.05 Rsun\n  }\n}\n";
        let out = format_source(src).unwrap();
        let col = |unit: &str| {
            out.lines()
                .find_map(|l| l.find(unit).map(|i| l[..i].chars().count()))
                .unwrap()
        };
        assert_eq!(col("Msun"), col("Rsun"), "{out}");
        assert_eq!(format_source(&out).unwrap(), out);
    }

    #[test]
    fn several_declarations_of_one_quantity_stay_together_in_order() {
        let src = "ref a \"A\"\nref b \"B\"\nsystem \"S\" {\n  star s { mass = 1 Msun }\n  planet p orbits s {\n    period=10.0 ± 0.1 d [a]\n    mass = 5 ± 1 Mearth\n    period = 10.02 ± 0.01 d [b]   preferred\n    period < 11 d [b, a]\n  }\n}\n";
        let out = format_source(src).unwrap();
        let lines: Vec<&str> = out.lines().filter(|l| l.contains("period")).collect();
        assert_eq!(lines.len(), 3, "{out}");
        assert!(
            lines[0].contains("10.0 ± 0.1") && lines[0].ends_with("[a]"),
            "{out}"
        );
        assert!(lines[1].ends_with("[b] preferred"), "{out}");
        assert!(
            lines[2].contains("< 11") && lines[2].ends_with("[b, a]"),
            "{out}"
        );
        // In file order, around the line between them: nothing merged or moved.
        let at = |n: &str| out.find(n).unwrap();
        assert!(
            at("[a]") < at("Mearth") && at("Mearth") < at("preferred"),
            "{out}"
        );
        assert!(same_tokens(src, &out));
    }

    const MESSY: &str = "# Lead comment\n\n\nref rv1 \"Demo RV (invented)\"\nref ph1   \"Demo photometry\"\nsystem \"Veyra\" {\n\n  let base=2.0 d\n  star veyra {\n    mass = 0.93±0.04 Msun [rv1]\n      radius=0.88 +0.03/-0.02 Rsun   [ph1]  # trailing\n    teff = 5310 +- 80 K\n    spectral_type = \"K0V\"\n\n\n    # about the distance\n    distance = 41.2 ± 0.3 pc\n  }\n  planet c orbits veyra { period = 2*base+ -1 d; min_mass = 12 ± 3 Mearth\n  rv_amplitude = 4.1 ± 0.6 km s^-1 [rv1,ph1] }\n  planet b orbits veyra {\n    radius = sqrt( c.min_mass/(5.5 g/cm^3) ) ^ (1/3)\n    albedo = 0.3 assumed\n    eccentricity<0.08\n  }\n\n}\n\n\n";

    #[test]
    fn canonical_layout() {
        let out = format_source(MESSY).unwrap();
        let want = "# Lead comment\n\nref rv1 \"Demo RV (invented)\"\nref ph1 \"Demo photometry\"\nsystem \"Veyra\" {\n  let base = 2.0 d\n  star veyra {\n    mass          = 0.93 ± 0.04      Msun [rv1]\n    radius        = 0.88 +0.03/-0.02 Rsun [ph1]  # trailing\n    teff          = 5310 +- 80       K\n    spectral_type = \"K0V\"\n\n    # about the distance\n    distance = 41.2 ± 0.3 pc\n  }\n  planet c orbits veyra {\n    period       = 2 * base + -1 d\n    min_mass     = 12 ± 3    Mearth\n    rv_amplitude = 4.1 ± 0.6 km s^-1 [rv1, ph1]\n  }\n  planet b orbits veyra {\n    radius       = sqrt(c.min_mass / (5.5 g/cm^3))^(1 / 3)\n    albedo       = 0.3 assumed\n    eccentricity < 0.08\n  }\n}\n";
        assert_eq!(out, want, "\n{out}");
    }

    #[test]
    fn idempotent_and_token_preserving() {
        let once = format_source(MESSY).unwrap();
        assert_eq!(format_source(&once).unwrap(), once);
        assert!(same_tokens(MESSY, &once));
        let veyra = include_str!("../../../examples/veyra.syz");
        let f = format_source(veyra).unwrap();
        assert_eq!(format_source(&f).unwrap(), f);
    }

    #[test]
    fn refuses_files_with_syntax_errors() {
        assert_eq!(
            format_source("system \"A\" { star s { mass = = 1 } }"),
            Err(LayoutError::Syntax(1))
        );
    }

    #[test]
    fn token_check_sees_real_changes() {
        assert!(same_tokens("a = 1\n\n\nb = 2", "a = 1; b = 2"));
        assert!(!same_tokens("a = 1 b = 2", "a = 1\nb = 2"));
        assert!(!same_tokens("x = 1 # c", "x = 1"));
        assert!(!same_tokens("x = -1", "x = - - 1"));
    }

    #[test]
    fn line_ends_of_the_file_are_kept() {
        // Windows and old Mac line ends: the same layout, in the file's own convention.
        let want = format_source(MESSY).unwrap();
        for nl in ["\r\n", "\r"] {
            let src = MESSY.replace('\n', nl);
            let out = format_source(&src).unwrap();
            assert_eq!(out, want.replace('\n', nl), "{nl:?}");
            assert_eq!(format_source(&out).unwrap(), out);
        }
    }

    #[test]
    fn a_run_of_blank_lines_is_one_item() {
        let src = format!("ref a \"x\"{}ref b \"y\"\n", "\n".repeat(10_000));
        let items = items_of(&src, tokens(&src));
        assert_eq!(items.len(), 3, "{items:?}");
        assert_eq!(format_source(&src).unwrap(), "ref a \"x\"\n\nref b \"y\"\n");
        assert_eq!(format_source(&"\n".repeat(10_000)).unwrap(), "");
    }

    #[test]
    fn header_split_over_lines_and_comments_there() {
        let src = "system \"S\" # the system\n{\n  star s {}\n}\n";
        let out = format_source(src).unwrap();
        assert_eq!(out, "system \"S\" {  # the system\n  star s {\n  }\n}\n");
        assert_eq!(format_source(&out).unwrap(), out);
    }
}
