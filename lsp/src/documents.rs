//! Open documents. Each change makes a new immutable [`Snapshot`] (text, line index,
//! generation, the project settings it is analysed with); its analysis is computed at most
//! once, on first use, off the request thread, reusing the per-system work of the latest
//! analysed snapshot before it. A change of a project file makes new snapshots of the same
//! texts under the new settings.

use crate::project::{Project, Projects};
use std::collections::HashMap;
use std::sync::atomic::{AtomicU64, Ordering};
use std::sync::{Arc, Mutex, OnceLock};
use syzygy::ide::symbols::{self, Occurrence};
use syzygy::source::{FileId, LineIndex, Span};
use syzygy::{Analysis, Reusable};
use tower_lsp::lsp_types::{Position, Range, TextDocumentContentChangeEvent, Url};

/// How the client counts columns.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Encoding {
    Utf16,
    Utf8,
}

pub struct Snapshot {
    pub text: Arc<str>,
    pub index: LineIndex,
    pub version: i32,
    /// Increases with every change of any document; a result computed for an older
    /// generation is stale.
    pub generation: u64,
    /// The settings it is analysed with.
    pub project: Arc<Project>,
    analysis: OnceLock<Arc<Analysis>>,
    /// Per-system work to reuse: until this snapshot is analysed, that of the latest
    /// analysed snapshot before it; then its own.
    reusable: Mutex<Option<Arc<Reusable>>>,
    occurrences: OnceLock<Vec<Occurrence>>,
}

impl Snapshot {
    /// A snapshot analysed without a project file.
    pub fn new(text: String, version: i32, generation: u64) -> Snapshot {
        Snapshot::under(Project::none(), text, version, generation)
    }

    /// A snapshot analysed with `project`'s settings.
    pub fn under(project: Arc<Project>, text: String, version: i32, generation: u64) -> Snapshot {
        let index = LineIndex::new(&text);
        Snapshot {
            text: Arc::from(text),
            index,
            version,
            generation,
            project,
            analysis: OnceLock::new(),
            reusable: Mutex::new(None),
            occurrences: OnceLock::new(),
        }
    }

    /// A snapshot of the text that follows `previous`, reusing its work where it can.
    pub fn following(
        previous: &Snapshot,
        project: Arc<Project>,
        text: String,
        version: i32,
        generation: u64,
    ) -> Snapshot {
        let snap = Snapshot::under(project, text, version, generation);
        *snap.reusable_slot() = previous.reusable_slot().clone();
        snap
    }

    fn reusable_slot(&self) -> std::sync::MutexGuard<'_, Option<Arc<Reusable>>> {
        // A panic while the lock was held leaves plain data behind; go on with it.
        self.reusable.lock().unwrap_or_else(|e| e.into_inner())
    }

    /// The analysis, computed on first use, deriving again only the systems that changed
    /// since the work it reuses. It uses the project's settings, except that propagation is
    /// first order so that typing stays smooth (see `syzygy::settings::EditorSettings`). A
    /// project file that cannot be used is reported on the first line, alone.
    pub fn analysis(&self) -> Arc<Analysis> {
        self.analysis
            .get_or_init(|| {
                let previous = self.reusable_slot().clone();
                let (mut analysis, reusable) = syzygy::analyze_reusing(
                    FileId(0),
                    &self.text,
                    &self.project.editor.settings,
                    previous.as_deref(),
                );
                if let Some(e) = &self.project.error {
                    // As `syz check`, which checks nothing under a project file it cannot
                    // use: that error alone (the rest, found under the default settings,
                    // differed from the project's: its shared references unknown, its rule
                    // levels not applied).
                    analysis.diagnostics = vec![e.diagnostic(FileId(0), &self.text)];
                }
                *self.reusable_slot() = Some(Arc::new(reusable));
                Arc::new(analysis)
            })
            .clone()
    }

    /// How many systems the analysis took from an earlier one, once it is computed.
    #[cfg(test)]
    fn reused_systems(&self) -> Option<usize> {
        self.analysis.get()?;
        self.reusable_slot().as_ref().map(|r| r.reused())
    }

    pub fn analysis_ready(&self) -> Option<Arc<Analysis>> {
        self.analysis.get().cloned()
    }

    /// Whether the symbol occurrences are computed already.
    pub fn occurrences_ready(&self) -> bool {
        self.occurrences.get().is_some()
    }

    pub fn occurrences(&self) -> &[Occurrence] {
        self.occurrences
            .get_or_init(|| symbols::occurrences(&self.analysis().ast))
    }

    pub fn offset(&self, pos: Position, enc: Encoding) -> usize {
        match enc {
            Encoding::Utf16 => self
                .index
                .offset_of_utf16(&self.text, pos.line, pos.character),
            Encoding::Utf8 => self
                .index
                .offset_of_utf8(&self.text, pos.line, pos.character),
        }
    }

    pub fn position(&self, offset: usize, enc: Encoding) -> Position {
        let (line, character) = match enc {
            Encoding::Utf16 => self.index.utf16_position(&self.text, offset),
            Encoding::Utf8 => {
                let mut o = offset.min(self.text.len());
                while o > 0 && !self.text.is_char_boundary(o) {
                    o -= 1;
                }
                self.index.utf8_position(o)
            }
        };
        Position { line, character }
    }

    pub fn range(&self, span: Span, enc: Encoding) -> Range {
        Range {
            start: self.position(span.start as usize, enc),
            end: self.position(span.end as usize, enc),
        }
    }

    pub fn span(&self, range: Range, enc: Encoding) -> Span {
        let a = self.offset(range.start, enc);
        let b = self.offset(range.end, enc);
        Span::new(FileId(0), a.min(b), a.max(b))
    }
}

/// Apply content changes in order (each range refers to the text after the previous one).
pub fn apply_changes(
    text: &str,
    changes: Vec<TextDocumentContentChangeEvent>,
    enc: Encoding,
) -> String {
    let mut text = text.to_string();
    for c in changes {
        match c.range {
            None => text = c.text,
            Some(r) => {
                let snap = Snapshot::new(std::mem::take(&mut text), 0, 0);
                let span = snap.span(r, enc);
                let mut t = snap.text.to_string();
                t.replace_range(span.range(), &c.text);
                text = t;
            }
        }
    }
    text
}

#[derive(Default)]
pub struct Documents {
    docs: Mutex<HashMap<Url, Arc<Snapshot>>>,
    generation: AtomicU64,
}

impl Documents {
    fn lock(&self) -> std::sync::MutexGuard<'_, HashMap<Url, Arc<Snapshot>>> {
        // A panic while the lock was held leaves plain data behind; go on with it.
        self.docs.lock().unwrap_or_else(|e| e.into_inner())
    }

    /// Open a document under its project (looked up under the lock, like every change, so
    /// that a project file read later never loses to one read earlier).
    pub fn open(&self, uri: Url, text: String, version: i32, projects: &Projects) -> Arc<Snapshot> {
        let mut docs = self.lock();
        let project = projects.for_document(&uri);
        let g = self.generation.fetch_add(1, Ordering::SeqCst) + 1;
        let snap = Arc::new(Snapshot::under(project, text, version, g));
        docs.insert(uri, snap.clone());
        snap
    }

    /// Apply a change under the lock, so concurrent changes never interleave; the project is
    /// looked up again (a project file changed on disk is noticed here). Gives the new
    /// snapshot and the one it replaced, for the caller to free off the way to the new
    /// diagnostics (freeing the analysis of a large file takes milliseconds).
    pub fn change(
        &self,
        uri: &Url,
        version: i32,
        changes: Vec<TextDocumentContentChangeEvent>,
        enc: Encoding,
        projects: &Projects,
    ) -> Option<(Arc<Snapshot>, Arc<Snapshot>)> {
        let mut docs = self.lock();
        let old = docs.get_mut(uri)?;
        let text = apply_changes(&old.text, changes, enc);
        let project = projects.for_document(uri);
        let g = self.generation.fetch_add(1, Ordering::SeqCst) + 1;
        let snap = Arc::new(Snapshot::following(old, project, text, version, g));
        let replaced = std::mem::replace(old, snap.clone());
        Some((snap, replaced))
    }

    /// Look up every document's project again; a document whose project changed gets a new
    /// snapshot of the same text and version. Gives each such document with its new snapshot
    /// and the one replaced.
    pub fn refresh(&self, projects: &Projects) -> Vec<(Url, Arc<Snapshot>, Arc<Snapshot>)> {
        let mut docs = self.lock();
        let mut out = Vec::new();
        for (uri, old) in docs.iter_mut() {
            let project = projects.for_document(uri);
            if Arc::ptr_eq(&project, &old.project) {
                continue;
            }
            let g = self.generation.fetch_add(1, Ordering::SeqCst) + 1;
            let text = old.text.to_string();
            let snap = Arc::new(Snapshot::following(old, project, text, old.version, g));
            let replaced = std::mem::replace(old, snap.clone());
            out.push((uri.clone(), snap, replaced));
        }
        out
    }

    pub fn close(&self, uri: &Url) {
        self.lock().remove(uri);
    }

    pub fn get(&self, uri: &Url) -> Option<Arc<Snapshot>> {
        self.lock().get(uri).cloned()
    }

    pub fn is_current(&self, uri: &Url, generation: u64) -> bool {
        self.lock()
            .get(uri)
            .is_some_and(|s| s.generation == generation)
    }
}

#[cfg(test)]
mod tests {
    #![allow(clippy::unwrap_used)]
    use super::*;

    fn change(line: u32, a: u32, b: u32, text: &str) -> TextDocumentContentChangeEvent {
        TextDocumentContentChangeEvent {
            range: Some(Range {
                start: Position { line, character: a },
                end: Position { line, character: b },
            }),
            range_length: None,
            text: text.to_string(),
        }
    }

    #[test]
    fn incremental_changes_apply_in_order_in_utf16() {
        // '☉' is one UTF-16 unit and three UTF-8 bytes; '𝑀' is two UTF-16 units.
        let text = "m = 1 M☉ 𝑀x\nnext";
        let out = apply_changes(
            text,
            vec![
                change(0, 11, 12, "y"),
                change(0, 0, 1, "mass"),
                change(5, 0, 0, "!"),
            ],
            Encoding::Utf16,
        );
        assert_eq!(out, "mass = 1 M☉ 𝑀y\nnext!");
        let out8 = apply_changes(text, vec![change(0, 6, 10, "Msun")], Encoding::Utf8);
        assert_eq!(out8, "m = 1 Msun 𝑀x\nnext");
    }

    #[test]
    fn positions_past_the_end_are_clamped() {
        let s = Snapshot::new("ab\ncd".to_string(), 1, 1);
        assert_eq!(
            s.offset(
                Position {
                    line: 0,
                    character: 99
                },
                Encoding::Utf16
            ),
            2
        );
        assert_eq!(
            s.offset(
                Position {
                    line: 99,
                    character: 0
                },
                Encoding::Utf16
            ),
            5
        );
        assert_eq!(
            s.position(999, Encoding::Utf8),
            Position {
                line: 1,
                character: 2
            }
        );
    }

    fn system(name: &str, mass: &str) -> String {
        format!(
            "system \"{name}\" {{\n  star s {{ mass = 1.0 ± 0.02 Msun }}\n  planet b orbits s {{ period = 365.25 ± 0.01 d; semi_major_axis = {mass} ± 0.01 au }}\n}}\n"
        )
    }

    /// Analyse a snapshot; its diagnostics must be those of a fresh analysis. Gives how many
    /// systems it reused.
    fn reused_when_analysed(snap: &Snapshot) -> Option<usize> {
        let fresh = syzygy::analyze(FileId(0), &snap.text, &syzygy::Settings::linear());
        assert_eq!(snap.analysis().diagnostics, fresh.diagnostics);
        assert_eq!(fresh.diagnostics.len(), 3, "one inconsistency per system");
        snap.reused_systems()
    }

    #[test]
    fn a_change_reuses_the_systems_it_did_not_touch() {
        let one = format!(
            "{}{}{}",
            system("Ambrel", "1.3"),
            system("Bostrin", "1.4"),
            system("Cindle", "1.5")
        );
        let s1 = Snapshot::new(one.clone(), 1, 1);
        assert_eq!(s1.reused_systems(), None, "not analysed yet");
        assert_eq!(reused_when_analysed(&s1), Some(0));
        // A longer first system moves the other two.
        let two = one.replacen("1.3", "1.30", 1);
        let s2 = Snapshot::following(&s1, Project::none(), two.clone(), 2, 2);
        assert_eq!(reused_when_analysed(&s2), Some(2));
        // Snapshots never analysed (overtaken while typing) pass on the older work.
        let three = two.replacen("1.4", "1.45", 1);
        let s3 = Snapshot::following(&s2, Project::none(), three.clone(), 3, 3);
        let s4 = Snapshot::following(&s3, Project::none(), three.replacen("1.5", "1.55", 1), 4, 4);
        assert_eq!(reused_when_analysed(&s4), Some(1));
    }
}
