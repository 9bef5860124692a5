//! A file read in parts: whole top-level declarations (systems, references) grouped into
//! parts of about a set size, each parsed and lowered on its own, so that a catalogue of
//! a hundred megabytes is analysed and written part after part in memory that follows the
//! part, not the file.
//!
//! The parts of a file give the analysis a whole-file reading gives, split by place:
//! - the same parser reads the declarations ([`crate::parser::Items`]), so syntax errors
//!   and their recovery are the same;
//! - references are read ahead in a first pass when the file has more than one part (a
//!   citation may name a reference declared further down; the pass stops at the first
//!   system when lexing finds no reference below it), and a system or reference
//!   declared twice is reported wherever the two are ([`crate::model::Lowering`]);
//! - a part ends at the end of a line, after its last declaration; each comment and each
//!   diagnostic belongs to the part its place is in, so a silencing comment above a system
//!   travels with that system.
//!
//! A file no larger than the part size is one part, equal to what [`crate::analyze`] reads.

use crate::ast;
use crate::diagnostic::Diagnostic;
use crate::model::{self, Lowering, Model};
use crate::parser::{Item, Items};
use crate::source::{FileId, Region};

/// About how many bytes of source one part holds: large enough that a part is many
/// systems (a few hundred of a typical catalogue), small enough that one part's analysis
/// and output stay in tens of megabytes.
pub const PART_BYTES: usize = 256 * 1024;

/// One part, parsed and lowered, ready for [`crate::analyze_part`].
#[derive(Debug)]
pub struct Part {
    pub region: Region,
    pub ast: ast::File,
    pub model: Model,
    /// Syntax and lowering diagnostics of the part.
    pub diagnostics: Vec<Diagnostic>,
}

/// The parts of one file, in order. There is always at least one (an empty file is one
/// empty part). [`read_parts`] gives the same parts with reading and lowering overlapped.
pub struct Parts<'a> {
    split: Split<'a>,
    lower: Lower<'a>,
}

/// What lowers the parts, in order: the file's references (read ahead on the first part,
/// when the file has more than one) and what lowering remembers between parts (systems and
/// references declared twice).
struct Lower<'a> {
    file: FileId,
    src: &'a str,
    /// Whether the file has more than one part, so its references are read ahead.
    ahead: bool,
    refs: Option<Vec<model::RefInfo>>,
    lowering: Lowering,
}

/// A part read but not yet lowered.
struct Parsed {
    region: Region,
    ast: ast::File,
    diagnostics: Vec<Diagnostic>,
}

/// What reads the declarations of a file and cuts them into parts.
struct Split<'a> {
    src: &'a str,
    items: Items<'a>,
    part_bytes: usize,
    /// The declaration that starts the next part, read while ending this one.
    carried: Option<Item>,
    /// Comments and diagnostics read but placed after the part just returned.
    comments: Vec<ast::Comment>,
    diagnostics: Vec<Diagnostic>,
    /// Where the next part starts, and its first line's number.
    next_start: usize,
    next_line: usize,
    done: bool,
}

/// Where the read-ahead of references may stop: at the first `system` keyword when no `ref`
/// keyword follows it (references are declared at the top of a file), else the end.
/// The parser makes a reference only from a `ref` token, so past that point there is none
/// to find, and lexing the file to know it costs a fraction of parsing it.
fn refs_end(src: &str) -> usize {
    use crate::syntax::lexer::{tokens, Tok};
    let mut toks = tokens(src);
    let Some(system) = toks.find(|t| t.kind == Tok::System) else {
        return usize::MAX;
    };
    // A `ref` token is the bytes `ref` not followed by a letter, digit or underscore (those
    // would make a longer name): where the rest of the file holds none, it holds no `ref`
    // token, and the search costs a small part of lexing the rest.
    let rest = src.as_bytes().get(system.start..).unwrap_or_default();
    let may_be_ref = memchr::memmem::find_iter(rest, b"ref").any(|i| {
        !rest
            .get(i + 3)
            .is_some_and(|b| b.is_ascii_alphanumeric() || *b == b'_')
    });
    if !may_be_ref || !toks.any(|t| t.kind == Tok::Ref) {
        system.start
    } else {
        usize::MAX
    }
}

/// The file's references, read ahead: a citation in one part may name a reference
/// declared in a later one.
fn read_refs(file: FileId, src: &str) -> Vec<model::RefInfo> {
    let until = refs_end(src);
    let mut items = Items::new(file, src);
    let mut refs = Vec::new();
    while let Some(item) = items.next_item() {
        let end = item.span().end as usize;
        if let Item::Ref(r) = item {
            refs.push(r);
        }
        // Comments are not needed here; let them go as they come.
        drop(items.take_comments());
        if end > until {
            break;
        }
    }
    model::first_refs(&refs)
}

impl<'a> Parts<'a> {
    /// Parts of about `part_bytes` bytes (`usize::MAX`: the whole file as one part).
    pub fn new(file: FileId, src: &'a str, part_bytes: usize) -> Parts<'a> {
        Parts {
            split: Split::new(file, src, part_bytes),
            lower: Lower {
                file,
                src,
                ahead: src.len() > part_bytes,
                refs: None,
                lowering: Lowering::default(),
            },
        }
    }

    /// Citations may also name these shared references (the project's, see
    /// [`crate::catalogue::shared`]).
    pub fn with_shared(mut self, shared: std::sync::Arc<crate::catalogue::SharedRefs>) -> Self {
        self.lower.lowering = Lowering::with_shared(shared);
        self
    }

    /// Every part, in order, handed to `each`: the same parts as the iterator gives, with
    /// the reading of the next parts (on a thread of its own) overlapping the lowering of
    /// this one and whatever `each` does with it. At most two parts wait between the two.
    /// Parts already taken from the iterator are not given again.
    pub fn read_parts(self, mut each: impl FnMut(Part)) {
        let Parts { split, mut lower } = self;
        let (file, src, part_bytes) = (lower.file, split.src, split.part_bytes);
        let fresh = split.next_start == 0 && split.carried.is_none() && !split.done;
        if src.len() <= part_bytes || !fresh {
            // One part, nothing to overlap; or a reading already begun, which goes on here.
            Parts { split, lower }.for_each(each);
            return;
        }
        // The parser is not `Send`: the reading thread makes its own.
        drop(split);
        std::thread::scope(|scope| {
            let (send, receive) = std::sync::mpsc::sync_channel(2);
            scope.spawn(move || {
                let mut split = Split::new(file, src, part_bytes);
                while let Some(parsed) = split.next_parsed() {
                    if send.send(parsed).is_err() {
                        break;
                    }
                }
            });
            for parsed in receive {
                each(lower.lower(parsed));
            }
        });
    }
}

impl Lower<'_> {
    fn lower(&mut self, parsed: Parsed) -> Part {
        let Parsed {
            region,
            ast,
            mut diagnostics,
        } = parsed;
        if self.ahead && self.refs.is_none() {
            self.refs = Some(read_refs(self.file, self.src));
        }
        let model = self
            .lowering
            .lower(self.file, &ast, self.refs.as_deref(), &mut diagnostics);
        Part {
            region,
            ast,
            model,
            diagnostics,
        }
    }
}

impl Split<'_> {
    /// Where the next part starts, given where its first declaration starts: at the first
    /// of the blank and comment-only lines right above that declaration's line. A comment on
    /// a line of its own covers the next line of code, so those comments belong with the
    /// declaration below them (even when the declaration above, never closed, reaches
    /// over them).
    fn gap_start(&self, next: usize) -> usize {
        let mut start = line_start(self.src, next);
        while start > 0 {
            // The line break that ends the line above: one byte, or the `\r\n` pair.
            let crlf = start >= 2 && self.src.get(start - 2..start) == Some("\r\n");
            let above = line_start(self.src, start - if crlf { 2 } else { 1 });
            let text = self.src.get(above..start).unwrap_or_default().trim();
            if !(text.is_empty() || text.starts_with('#')) {
                break;
            }
            start = above;
        }
        start
    }

    /// The byte offset just past the line on which `offset` stands (past its line break).
    fn line_end_after(&self, offset: usize) -> usize {
        let rest = self.src.get(offset..).unwrap_or_default();
        match rest.find(['\n', '\r']) {
            None => self.src.len(),
            Some(i) => {
                let at = offset + i;
                let crlf = self.src.get(at..at + 2) == Some("\r\n");
                at + if crlf { 2 } else { 1 }
            }
        }
    }
}

impl Iterator for Parts<'_> {
    type Item = Part;

    fn next(&mut self) -> Option<Part> {
        let parsed = self.split.next_parsed()?;
        Some(self.lower.lower(parsed))
    }
}

impl<'a> Split<'a> {
    fn new(file: FileId, src: &'a str, part_bytes: usize) -> Split<'a> {
        Split {
            src,
            items: Items::new(file, src),
            part_bytes,
            carried: None,
            comments: Vec::new(),
            diagnostics: Vec::new(),
            next_start: 0,
            next_line: 0,
            done: false,
        }
    }

    fn next_parsed(&mut self) -> Option<Parsed> {
        if self.done {
            return None;
        }
        let mut items: Vec<Item> = self.carried.take().into_iter().collect();
        // Where this part ends: after the line of its last declaration when another
        // declaration starts on a later line and the part is big enough; else at the end.
        let mut end = self.src.len();
        loop {
            let Some(item) = self.items.next_item() else {
                self.done = true;
                break;
            };
            if let (Some(first), Some(last)) = (items.first(), items.last()) {
                let size = (last.span().end as usize).saturating_sub(first.span().start as usize);
                let line_end = self.line_end_after(last.span().end as usize);
                if size >= self.part_bytes && (item.span().start as usize) >= line_end {
                    end = self
                        .gap_start(item.span().start as usize)
                        .max(self.next_start);
                    self.carried = Some(item);
                    break;
                }
            }
            items.push(item);
        }
        // Comments and diagnostics read so far belong here when their place is before the end.
        self.comments.extend(self.items.take_comments());
        self.diagnostics.extend(self.items.take_diagnostics());
        // The last part takes everything left, including what is placed at the very end.
        let cut = if self.done { usize::MAX } else { end };
        let comments = take_before(&mut self.comments, cut, |c| c.span.start as usize);
        let diagnostics = take_before(&mut self.diagnostics, cut, |d| d.span.start as usize);
        let region = Region {
            start: self.next_start,
            end,
            first_line: self.next_line,
        };
        self.next_line += line_breaks(self.src.get(region.start..end).unwrap_or_default());
        self.next_start = end;
        let mut ast = ast::File {
            comments,
            ..ast::File::default()
        };
        for item in items {
            match item {
                Item::Ref(r) => ast.refs.push(r),
                Item::System(s) => ast.systems.push(s),
            }
        }
        Some(Parsed {
            region,
            ast,
            diagnostics,
        })
    }
}

/// The start of the line holding `offset` (lines end at `\n`, `\r\n` or a lone `\r`).
fn line_start(src: &str, offset: usize) -> usize {
    let before = src.as_bytes().get(..offset).unwrap_or_default();
    match before.iter().rposition(|&b| b == b'\n' || b == b'\r') {
        // A `\r\n` pair: `offset` is on the line after it either way.
        Some(i) => i + 1,
        None => 0,
    }
}

/// Take out of `from` the entries placed before `end`, keeping the order of both halves.
fn take_before<T>(from: &mut Vec<T>, end: usize, at: impl Fn(&T) -> usize) -> Vec<T> {
    let (before, after) = std::mem::take(from).into_iter().partition(|x| at(x) < end);
    *from = after;
    before
}

/// Line breaks in `text`, counted as the line index counts them (`\n`, `\r\n`, lone `\r`).
fn line_breaks(text: &str) -> usize {
    let b = text.as_bytes();
    // Every `\n`, and every `\r` not followed by one (found by `memchr`'s vector search;
    // a `\r` is rare).
    let lone_cr = memchr::memchr_iter(b'\r', b)
        .filter(|&i| b.get(i + 1) != Some(&b'\n'))
        .count();
    memchr::memchr_iter(b'\n', b).count() + lone_cr
}

#[cfg(test)]
mod tests;
