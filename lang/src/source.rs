//! Source files, spans and line indexes.
//!
//! A [`Span`] is an end-exclusive byte range in one file. The core never reads the file
//! system: front ends hand it text through a [`SourceDb`]. [`LineIndex`] turns byte offsets
//! into 1-based lines and columns (in characters, for people) and into UTF-16 positions (for
//! the Language Server Protocol), and back.

use serde::Serialize;

/// Identifies one source file inside a [`SourceDb`].
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord, Serialize, Default)]
pub struct FileId(pub u32);

/// An end-exclusive byte range in one file.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord, Default)]
pub struct Span {
    pub file: FileId,
    pub start: u32,
    pub end: u32,
}

impl Span {
    pub fn new(file: FileId, start: usize, end: usize) -> Span {
        Span {
            file,
            start: clamp_u32(start),
            end: clamp_u32(end.max(start)),
        }
    }

    /// The smallest span covering both.
    pub fn join(self, other: Span) -> Span {
        Span {
            file: self.file,
            start: self.start.min(other.start),
            end: self.end.max(other.end),
        }
    }

    pub fn range(self) -> std::ops::Range<usize> {
        self.start as usize..self.end as usize
    }

    pub fn contains(self, offset: usize) -> bool {
        (self.start as usize) <= offset && offset <= (self.end as usize)
    }
}

/// A place inside a system: a byte range counted from the start of the system's span.
///
/// Results hold these rather than [`Span`]s, so that they stay true when text before the
/// system changes and the system only moves: the language server then reuses a moved
/// system's results as they are instead of copying them to move their places
/// ([`crate::reuse`]). [`InSystem::in_file`] gives the place in the file.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord, Default)]
pub struct InSystem {
    // Private, so that no offset is read as if it were one in the file.
    start: u32,
    end: u32,
}

impl InSystem {
    /// The place of `span`, which lies inside `system` (a span before the system's start
    /// is taken to start there).
    pub fn of(span: Span, system: Span) -> InSystem {
        InSystem {
            start: span.start.saturating_sub(system.start),
            end: span.end.saturating_sub(system.start),
        }
    }

    /// The place in the file, given the span of the system it lies in.
    pub fn in_file(self, system: Span) -> Span {
        Span {
            file: system.file,
            start: system.start.saturating_add(self.start),
            end: system.start.saturating_add(self.end),
        }
    }
}

fn clamp_u32(v: usize) -> u32 {
    u32::try_from(v).unwrap_or(u32::MAX)
}

/// Where the core gets source text from. The CLI reads files, the language server keeps
/// open buffers, the tests keep strings in memory.
pub trait SourceDb {
    fn name(&self, file: FileId) -> &str;
    fn text(&self, file: FileId) -> &str;
    /// The file's line index; a store that keeps them builds each once.
    fn line_index(&self, file: FileId) -> std::borrow::Cow<'_, LineIndex> {
        std::borrow::Cow::Owned(LineIndex::new(self.text(file)))
    }
}

/// The simplest [`SourceDb`]: named texts in memory.
#[derive(Debug, Default, Clone)]
pub struct MemoryDb {
    /// Name, text, and the line index once one is asked for (a file read in parts asks
    /// once per part with diagnostics: building it each time would cost the whole file
    /// each time).
    files: Vec<(String, String, std::sync::OnceLock<LineIndex>)>,
}

impl MemoryDb {
    pub fn new() -> MemoryDb {
        MemoryDb::default()
    }

    pub fn add(&mut self, name: impl Into<String>, text: impl Into<String>) -> FileId {
        self.files
            .push((name.into(), text.into(), std::sync::OnceLock::new()));
        FileId(clamp_u32(self.files.len() - 1))
    }

    pub fn files(&self) -> impl Iterator<Item = FileId> + '_ {
        (0..self.files.len()).map(|i| FileId(clamp_u32(i)))
    }
}

impl SourceDb for MemoryDb {
    fn name(&self, file: FileId) -> &str {
        self.files
            .get(file.0 as usize)
            .map(|f| f.0.as_str())
            .unwrap_or("<unknown>")
    }
    fn text(&self, file: FileId) -> &str {
        self.files
            .get(file.0 as usize)
            .map(|f| f.1.as_str())
            .unwrap_or("")
    }
    fn line_index(&self, file: FileId) -> std::borrow::Cow<'_, LineIndex> {
        match self.files.get(file.0 as usize) {
            Some((_, text, index)) => {
                std::borrow::Cow::Borrowed(index.get_or_init(|| LineIndex::new(text)))
            }
            None => std::borrow::Cow::Owned(LineIndex::new("")),
        }
    }
}

/// A 1-based line and column; the column counts characters (Unicode scalar values).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub struct LineCol {
    pub line: u32,
    pub column: u32,
}

/// A stretch of whole lines of a file: all of it, or one part of a file read in parts.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Region {
    /// Byte offset of the first line's start.
    pub start: usize,
    /// Byte offset just past the region (a line start, or the end of the text).
    pub end: usize,
    /// The 0-based number of the region's first line in the file.
    pub first_line: usize,
}

impl Region {
    pub fn whole(text: &str) -> Region {
        Region {
            start: 0,
            end: text.len(),
            first_line: 0,
        }
    }
}

/// Byte offsets of line starts, for turning spans into positions and back. Offsets are
/// `u32`, as in spans: half the memory for a file of many short lines.
#[derive(Debug, Clone)]
pub struct LineIndex {
    starts: Vec<u32>,
    len: usize,
    /// Places on lines longer than [`MARK_STEP`] bytes, about that far apart, with the
    /// characters before them on their line: a column is counted from the nearest one
    /// before it, so a file of one very long line (declarations separated by `;`) has
    /// every column in bounded time, not in time that grows with the line.
    marks: Vec<Mark>,
}

/// About how many bytes apart the [`LineIndex`]'s marks on a long line are.
const MARK_STEP: usize = 1024;

/// A character boundary on a long line, with the characters and UTF-16 units between its
/// line's start and it.
#[derive(Debug, Clone, Copy)]
struct Mark {
    at: u32,
    chars: u32,
    utf16: u32,
}

impl LineIndex {
    /// How many lines the text has (an empty text has one).
    pub fn line_count(&self) -> usize {
        self.starts.len()
    }

    /// A line ends at `\n`, `\r\n` or a lone `\r` (old Mac files), as in the lexer.
    pub fn new(text: &str) -> LineIndex {
        let mut starts = vec![0];
        let bytes = text.as_bytes();
        for (i, b) in bytes.iter().enumerate() {
            let ends = match b {
                b'\n' => true,
                b'\r' => bytes.get(i + 1) != Some(&b'\n'),
                _ => false,
            };
            if ends {
                starts.push(clamp_u32(i + 1));
            }
        }
        let mut marks = Vec::new();
        let mut bounds = starts.iter().map(|&s| s as usize).peekable();
        while let Some(start) = bounds.next() {
            let end = bounds.peek().copied().unwrap_or(text.len());
            if end - start <= MARK_STEP {
                continue;
            }
            let (mut chars, mut utf16, mut next) = (0u32, 0u32, start + MARK_STEP);
            for (i, ch) in text.get(start..end).unwrap_or_default().char_indices() {
                if start + i >= next {
                    marks.push(Mark {
                        at: clamp_u32(start + i),
                        chars,
                        utf16,
                    });
                    next = start + i + MARK_STEP;
                }
                chars += 1;
                utf16 += clamp_u32(ch.len_utf16());
            }
        }
        LineIndex {
            starts,
            len: text.len(),
            marks,
        }
    }

    /// The characters and UTF-16 units between the line start `start` and `offset` (a
    /// character boundary on that line), counted from the nearest mark between them.
    fn counted(&self, text: &str, start: usize, offset: usize) -> (usize, usize) {
        let nearest = self.marks.partition_point(|m| m.at as usize <= offset);
        let (from, chars, utf16) = match nearest.checked_sub(1).and_then(|i| self.marks.get(i)) {
            Some(m) if m.at as usize >= start => {
                (m.at as usize, m.chars as usize, m.utf16 as usize)
            }
            _ => (start, 0, 0),
        };
        let rest = text.get(from..offset).unwrap_or_default();
        (
            chars + rest.chars().count(),
            utf16 + rest.chars().map(char::len_utf16).sum::<usize>(),
        )
    }

    /// The 0-based line holding `offset` (clamped to the text).
    pub fn line_at(&self, offset: usize) -> usize {
        self.line_of(offset).0
    }

    /// The byte range of 0-based `line` without its line break; `None` past the last line.
    pub fn line_span(&self, text: &str, line: usize) -> Option<std::ops::Range<usize>> {
        let start = *self.starts.get(line)? as usize;
        let end = match self.starts.get(line + 1).map(|&n| n as usize) {
            Some(next) => next - line_break_before(text, next),
            None => text.len(),
        };
        Some(start..end.max(start))
    }

    /// The 0-based line holding `offset` and that line's start offset.
    fn line_of(&self, offset: usize) -> (usize, usize) {
        let offset = offset.min(self.len);
        let line = match self.starts.binary_search(&clamp_u32(offset)) {
            Ok(l) => l,
            Err(l) => l.saturating_sub(1),
        };
        (line, self.starts.get(line).map_or(0, |&s| s as usize))
    }

    /// 1-based line and character column of a byte offset.
    pub fn line_col(&self, text: &str, offset: usize) -> LineCol {
        let (line, start) = self.line_of(offset);
        let offset = floor_char_boundary(text, offset.min(text.len()));
        let column = self.counted(text, start, offset).0;
        LineCol {
            line: clamp_u32(line + 1),
            column: clamp_u32(column + 1),
        }
    }

    /// 0-based line and UTF-16 column of a byte offset (the protocol's default encoding).
    pub fn utf16_position(&self, text: &str, offset: usize) -> (u32, u32) {
        let (line, start) = self.line_of(offset);
        let offset = floor_char_boundary(text, offset.min(text.len()));
        let col = self.counted(text, start, offset).1;
        (clamp_u32(line), clamp_u32(col))
    }

    /// 0-based line and UTF-8 byte column of a byte offset.
    pub fn utf8_position(&self, offset: usize) -> (u32, u32) {
        let (line, start) = self.line_of(offset);
        (clamp_u32(line), clamp_u32(offset.min(self.len) - start))
    }

    /// The byte offset of a 0-based line and UTF-16 column; positions past the end of a line
    /// or of the file are clamped, as the protocol asks.
    pub fn offset_of_utf16(&self, text: &str, line: u32, col: u32) -> usize {
        let Some(std::ops::Range { start, end }) = self.line_span(text, line as usize) else {
            return text.len();
        };
        let mut units = 0usize;
        for (i, ch) in text.get(start..end).unwrap_or("").char_indices() {
            if units >= col as usize {
                return start + i;
            }
            units += ch.len_utf16();
        }
        end
    }

    /// The byte offset of a 0-based line and UTF-8 column, clamped like the UTF-16 form.
    pub fn offset_of_utf8(&self, text: &str, line: u32, col: u32) -> usize {
        let Some(std::ops::Range { start, end }) = self.line_span(text, line as usize) else {
            return text.len();
        };
        floor_char_boundary(text, (start + col as usize).min(end))
    }
}

/// Turns spans into the file's name and the 1-based line and column (in characters) of
/// their start and end: the one conversion the machine-readable emitters (JSON, SARIF)
/// share. Holds the line index of one file and makes another only for a span elsewhere.
pub struct Places<'a> {
    db: &'a dyn SourceDb,
    file: FileId,
    index: std::borrow::Cow<'a, LineIndex>,
}

impl<'a> Places<'a> {
    pub fn new(db: &'a dyn SourceDb, file: FileId) -> Places<'a> {
        Places {
            db,
            file,
            index: db.line_index(file),
        }
    }

    /// The file's name, and the start and end (exclusive) of the span.
    pub fn of(&self, span: Span) -> (&'a str, LineCol, LineCol) {
        let text = self.db.text(span.file);
        let other;
        let index = if span.file == self.file {
            &self.index
        } else {
            other = LineIndex::new(text);
            &other
        };
        (
            self.db.name(span.file),
            index.line_col(text, span.start as usize),
            index.line_col(text, span.end as usize),
        )
    }
}

/// The length of the line break (`\n`, `\r\n` or `\r`) that ends just before `offset`.
fn line_break_before(text: &str, offset: usize) -> usize {
    let b = text.as_bytes();
    match (
        offset.checked_sub(2).and_then(|i| b.get(i)),
        offset.checked_sub(1).and_then(|i| b.get(i)),
    ) {
        (Some(b'\r'), Some(b'\n')) => 2,
        (_, Some(b'\n' | b'\r')) => 1,
        _ => 0,
    }
}

/// The line break a text uses (its first one), `\n` when it has none; edits that add lines
/// use it so a file keeps one convention.
pub fn line_break_of(text: &str) -> &'static str {
    match text
        .find(['\n', '\r'])
        .and_then(|i| text.as_bytes().get(i..))
    {
        Some([b'\r', b'\n', ..]) => "\r\n",
        Some([b'\r', ..]) => "\r",
        _ => "\n",
    }
}

/// How many line breaks `text` holds (`\r\n` counts once, a lone `\r` counts).
pub fn count_line_breaks(text: &str) -> usize {
    let b = text.as_bytes();
    b.iter()
        .enumerate()
        .filter(|(i, c)| **c == b'\n' || (**c == b'\r' && b.get(i + 1) != Some(&b'\n')))
        .count()
}

fn floor_char_boundary(text: &str, mut offset: usize) -> usize {
    while offset > 0 && !text.is_char_boundary(offset) {
        offset -= 1;
    }
    offset
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A place in a system is the same place wherever the system moves.
    #[test]
    fn a_place_in_a_system_moves_with_it() {
        let system = Span::new(FileId(3), 100, 200);
        let decl = Span::new(FileId(3), 120, 135);
        let place = InSystem::of(decl, system);
        assert_eq!(place.in_file(system), decl);
        let moved = Span::new(FileId(3), 107, 207);
        assert_eq!(place.in_file(moved), Span::new(FileId(3), 127, 142));
    }

    #[test]
    fn line_col_counts_characters_not_bytes() {
        let text = "a ± b\nsecond";
        let idx = LineIndex::new(text);
        let b = text.find('b').unwrap_or(0);
        assert_eq!(idx.line_col(text, b), LineCol { line: 1, column: 5 });
        let s = text.find("second").unwrap_or(0);
        assert_eq!(idx.line_col(text, s), LineCol { line: 2, column: 1 });
    }

    /// Columns on lines longer than a mark's step, counted from the marks, equal columns
    /// counted from the line's start, for characters of one to four bytes (and two UTF-16
    /// units).
    #[test]
    fn columns_on_long_lines_are_those_counted_from_the_line_start() {
        let piece = "mass = 1 ± 0.1 Msun; é 🪐 x; ";
        let long: String = piece.repeat(300);
        let text = format!("short\n{long}\r\n{long}\rlast");
        let idx = LineIndex::new(&text);
        assert!(idx.marks.len() > 10);
        for (offset, _) in text.char_indices() {
            let (line, start) = idx.line_of(offset);
            let before = &text[start..offset];
            assert_eq!(
                idx.line_col(&text, offset).column as usize,
                before.chars().count() + 1,
                "{offset}"
            );
            let units: usize = before.chars().map(char::len_utf16).sum();
            assert_eq!(
                idx.utf16_position(&text, offset),
                (line as u32, units as u32)
            );
        }
    }

    #[test]
    fn every_line_break_convention_starts_a_line() {
        // "\r\n" is one break; a lone "\r" (old Mac files) is one too.
        let text = "a\nb\r\nc\rd";
        let idx = LineIndex::new(text);
        assert_eq!(idx.line_count(), 4);
        let d = text.find('d').unwrap_or(0);
        assert_eq!(idx.line_col(text, d), LineCol { line: 4, column: 1 });
        let spans: Vec<&str> = (0..4)
            .filter_map(|l| idx.line_span(text, l).and_then(|r| text.get(r)))
            .collect();
        assert_eq!(spans, ["a", "b", "c", "d"]);
        // A position past the end of a line is clamped before its line break.
        assert_eq!(
            idx.offset_of_utf16(text, 1, 99),
            text.find("\r\n").unwrap_or(0)
        );
        assert_eq!(count_line_breaks(text), 3);
        assert_eq!(line_break_of(text), "\n");
        assert_eq!(line_break_of("x\r\ny\n"), "\r\n");
        assert_eq!(line_break_of("x\ry"), "\r");
    }

    #[test]
    fn utf16_round_trip_with_astral_characters() {
        let text = "x = 1 M☉ 𝑀\nnext";
        let idx = LineIndex::new(text);
        for (off, _) in text.char_indices() {
            let (l, c) = idx.utf16_position(text, off);
            assert_eq!(idx.offset_of_utf16(text, l, c), off);
        }
        // Past the end of the line and of the file are clamped.
        assert_eq!(
            idx.offset_of_utf16(text, 0, 999),
            text.find('\n').unwrap_or(0)
        );
        assert_eq!(idx.offset_of_utf16(text, 99, 0), text.len());
    }
}
