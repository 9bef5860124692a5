//! The workspace folders as catalogues: the checks between files of `syz check DIR`
//! (`syzygy::catalogue::check`), run on every `*.syz` file under the workspace folders, and
//! their findings published on the files they are placed in.
//!
//! Each file is reduced to a `syzygy::catalogue::Entry`: a closed file from its text on disk,
//! analysed once under its project's settings in a background scan; an open document from
//! the analysis its own diagnostics come from, so the findings follow typing. Comparing the
//! entries sorts their keys (n log n), cheap enough to redo after every analysed change. The
//! scan is bounded: at most [`MAX_FILES`] files, each of at most [`MAX_FILE_BYTES`], and at
//! most [`MAX_TOTAL_BYTES`] together (the server logs a warning when it leaves files out).

use crate::convert;
use crate::documents::{Encoding, Snapshot};
use crate::project::Projects;
use std::collections::{BTreeMap, HashMap, HashSet};
use std::path::{Path, PathBuf};
use std::sync::{Arc, Mutex, MutexGuard};
use syzygy::catalogue::Entry;
use syzygy::source::FileId;
use tower_lsp::lsp_types::{self as lsp, Url};

/// The most files of the workspace folders compared with each other.
pub const MAX_FILES: usize = 10_000;
/// The largest closed file read for the comparison.
pub const MAX_FILE_BYTES: u64 = 16 << 20;
/// The most bytes of closed files held for the comparison, all files together.
pub const MAX_TOTAL_BYTES: u64 = 256 << 20;
/// How deep folders are walked.
const MAX_DEPTH: usize = 32;

/// One file as the comparison sees it.
struct Stored {
    uri: Url,
    entry: Entry,
    /// The text the entry's spans are in, for positions.
    snap: Arc<Snapshot>,
    /// For a file read from disk: its modification time and length then, by which a rescan
    /// knows it unchanged and keeps it without reading it again.
    stamp: Option<Stamp>,
}

type Stamp = (std::time::SystemTime, u64);

fn stamp_of(meta: &std::fs::Metadata) -> Option<Stamp> {
    Some((meta.modified().ok()?, meta.len()))
}

#[derive(Default)]
struct Inner {
    files: BTreeMap<PathBuf, Stored>,
    /// Files open in the editor: their entries come from the documents, not from disk.
    open: HashSet<PathBuf>,
    /// The findings last computed, per file.
    findings: HashMap<PathBuf, Vec<lsp::Diagnostic>>,
}

#[derive(Default)]
pub struct Catalogue {
    inner: Mutex<Inner>,
}

fn lock(m: &Mutex<Inner>) -> MutexGuard<'_, Inner> {
    m.lock().unwrap_or_else(|e| e.into_inner())
}

/// The `*.syz` files under `roots`, sorted, at most [`MAX_FILES`]; and whether some were
/// left out.
pub fn files_under(roots: &[PathBuf]) -> (Vec<PathBuf>, bool) {
    let mut out = Vec::new();
    let mut seen = HashSet::new();
    for r in roots {
        walk(r, 0, &mut out, &mut seen);
    }
    out.sort();
    out.dedup();
    let over = out.len() > MAX_FILES;
    out.truncate(MAX_FILES);
    (out, over)
}

fn walk(dir: &Path, depth: usize, out: &mut Vec<PathBuf>, seen: &mut HashSet<PathBuf>) {
    if depth > MAX_DEPTH || out.len() > MAX_FILES {
        return;
    }
    // A folder reached twice (a symbolic link loop) is walked once.
    let Ok(c) = std::fs::canonicalize(dir) else {
        return;
    };
    if !seen.insert(c) {
        return;
    }
    let Ok(entries) = std::fs::read_dir(dir) else {
        return;
    };
    for e in entries.flatten() {
        let p = e.path();
        match std::fs::metadata(&p) {
            Ok(m) if m.is_dir() => walk(&p, depth + 1, out, seen),
            Ok(m) if m.is_file() && p.extension().is_some_and(|x| x == "syz") => out.push(p),
            _ => {}
        }
    }
}

/// A closed file's entry: read from disk (regular files up to [`MAX_FILE_BYTES`]) and
/// analysed under its project's settings.
fn from_disk(path: &Path, projects: &Projects) -> Option<Stored> {
    let meta = std::fs::metadata(path).ok()?;
    if !meta.is_file() || meta.len() > MAX_FILE_BYTES {
        return None;
    }
    let text = std::fs::read_to_string(path).ok()?;
    let uri = Url::from_file_path(path).ok()?;
    let project = projects.for_document(&uri);
    let settings = project.editor.settings.clone();
    let snap = Arc::new(Snapshot::under(project, text, 0, 0));
    let analysis = syzygy::analyze(FileId(0), &snap.text, &settings);
    Some(Stored {
        uri,
        entry: Entry::of(&analysis, &settings),
        snap,
        stamp: stamp_of(&meta),
    })
}

impl Catalogue {
    /// Read every file of the workspace folders that is not open (blocking: call it off the
    /// request threads). Returns whether files were left out, over [`MAX_FILES`] or
    /// [`MAX_TOTAL_BYTES`].
    /// With `reuse`, a file whose modification time and length are those it was read with is
    /// kept as it is (a stat, not a read and an analysis), so a rescan costs little when
    /// little changed; without, every file is read again (its project may have changed).
    pub fn scan(&self, roots: &[PathBuf], projects: &Projects, reuse: bool) -> bool {
        let (paths, over) = files_under(roots);
        let (open, known): (HashSet<PathBuf>, HashMap<PathBuf, Stamp>) = {
            let inner = lock(&self.inner);
            let known = inner
                .files
                .iter()
                .filter(|_| reuse)
                .filter_map(|(p, s)| Some((p.clone(), s.stamp?)))
                .collect();
            (inner.open.clone(), known)
        };
        let mut total = 0u64;
        let mut over = over;
        let mut kept: Vec<PathBuf> = Vec::new();
        let read: BTreeMap<PathBuf, Stored> = paths
            .into_iter()
            .filter(|p| !open.contains(p))
            .filter_map(|p| {
                let meta = std::fs::metadata(&p).ok();
                total += meta.as_ref().map_or(0, |m| m.len());
                over |= total > MAX_TOTAL_BYTES;
                if total > MAX_TOTAL_BYTES {
                    return None;
                }
                let unchanged = meta
                    .as_ref()
                    .and_then(stamp_of)
                    .is_some_and(|s| known.get(&p) == Some(&s));
                if unchanged {
                    kept.push(p);
                    return None;
                }
                from_disk(&p, projects).map(|s| (p, s))
            })
            .collect();
        let mut inner = lock(&self.inner);
        let mut before = std::mem::take(&mut inner.files);
        // Open documents keep the entries of their own analyses; unchanged files theirs.
        let open: Vec<(PathBuf, Stored)> = before
            .iter()
            .filter(|(p, _)| inner.open.contains(*p))
            .map(|(p, _)| p.clone())
            .collect::<Vec<_>>()
            .into_iter()
            .filter_map(|p| before.remove(&p).map(|s| (p, s)))
            .collect();
        let unchanged: Vec<(PathBuf, Stored)> = kept
            .into_iter()
            .filter_map(|p| before.remove(&p).map(|s| (p, s)))
            .collect();
        inner.files = read;
        inner.files.extend(open);
        inner.files.extend(unchanged);
        over
    }

    /// An open document was analysed: its entry replaces the file's (if it lies under a
    /// workspace folder).
    pub fn update(
        &self,
        uri: &Url,
        snap: Arc<Snapshot>,
        analysis: &syzygy::Analysis,
        roots: &[PathBuf],
    ) {
        let Ok(path) = uri.to_file_path() else {
            return;
        };
        if !roots.iter().any(|r| path.starts_with(r)) {
            return;
        }
        let entry = Entry::of(analysis, &snap.project.editor.settings);
        let mut inner = lock(&self.inner);
        inner.open.insert(path.clone());
        inner.files.insert(
            path,
            Stored {
                uri: uri.clone(),
                entry,
                snap,
                // An open document's entry is its buffer's: never taken as the disk's.
                stamp: None,
            },
        );
    }

    /// A document was closed, or a closed file changed on disk: its entry comes from disk
    /// again (or goes, when the file is gone).
    pub fn reload(&self, uri: &Url, projects: &Projects) {
        let Ok(path) = uri.to_file_path() else {
            return;
        };
        let stored = from_disk(&path, projects);
        let mut inner = lock(&self.inner);
        inner.open.remove(&path);
        let known = inner.files.contains_key(&path);
        match stored {
            Some(s) if known || inner.files.len() < MAX_FILES => {
                inner.files.insert(path, s);
            }
            _ => {
                inner.files.remove(&path);
            }
        }
    }

    /// Forget every file outside `roots` (a workspace folder was removed).
    pub fn keep_under(&self, roots: &[PathBuf]) {
        let mut inner = lock(&self.inner);
        inner
            .files
            .retain(|p, _| roots.iter().any(|r| p.starts_with(r)));
    }

    /// Compare the files again; the files whose findings changed, with their URIs.
    pub fn recompute(&self, enc: Encoding, roots: &[PathBuf]) -> Vec<Url> {
        let mut inner = lock(&self.inner);
        let stored: Vec<(&PathBuf, &Stored)> = inner.files.iter().collect();
        let entries: Vec<Entry> = stored
            .iter()
            .enumerate()
            .map(|(i, (_, s))| s.entry.clone().in_file(FileId(i as u32)))
            .collect();
        let file = |f: FileId| {
            stored
                .get(f.0 as usize)
                .map(|(_, s)| (&s.uri, s.snap.as_ref()))
        };
        let place = |span: syzygy::source::Span| match stored.get(span.file.0 as usize) {
            Some((p, s)) => {
                let line = s
                    .snap
                    .index
                    .line_col(&s.snap.text, span.start as usize)
                    .line;
                format!("{}:{line}", shown_path(p, roots))
            }
            None => "?".to_string(),
        };
        let mut findings: HashMap<PathBuf, Vec<lsp::Diagnostic>> = HashMap::new();
        for d in syzygy::catalogue::check(&entries, &place) {
            let (Some((p, _)), Some(converted)) = (
                stored.get(d.span.file.0 as usize),
                convert::diagnostic_in(&d, &file, enc),
            ) else {
                continue;
            };
            findings.entry((*p).clone()).or_default().push(converted);
        }
        let mut changed: Vec<Url> = Vec::new();
        for (p, old) in &inner.findings {
            if findings.get(p) != Some(old) {
                if let Ok(u) = Url::from_file_path(p) {
                    changed.push(u);
                }
            }
        }
        for p in findings.keys() {
            if !inner.findings.contains_key(p) {
                if let Ok(u) = Url::from_file_path(p) {
                    changed.push(u);
                }
            }
        }
        inner.findings = findings;
        changed
    }

    /// The findings last computed for the file at `uri`.
    pub fn findings(&self, uri: &Url) -> Vec<lsp::Diagnostic> {
        let Ok(path) = uri.to_file_path() else {
            return Vec::new();
        };
        lock(&self.inner)
            .findings
            .get(&path)
            .cloned()
            .unwrap_or_default()
    }
}

/// A path as messages name it: relative to the workspace folder that holds it.
fn shown_path(p: &Path, roots: &[PathBuf]) -> String {
    roots
        .iter()
        .filter_map(|r| p.strip_prefix(r).ok())
        .min_by_key(|rel| rel.components().count())
        .unwrap_or(p)
        .display()
        .to_string()
}
