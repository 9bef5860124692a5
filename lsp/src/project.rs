//! Project files for open documents: the nearest `syzygy.toml` of each document, read from
//! disk (or from the editor's buffer while the editor has it open), parsed by the core and
//! kept until it changes.
//!
//! The search goes from the document's folder upward, as `syz check` does, but stops at the
//! root of the workspace folder that holds the document (if one does), so a file above the
//! workspace never applies in the editor. Every lookup checks the file's modification time
//! and size, so a project file changed, created or deleted behind the server's back is
//! noticed the next time a document is analysed; a `workspace/didChangeWatchedFiles`
//! notification makes the server look at once.

use std::collections::HashMap;
use std::path::{Path, PathBuf};
use std::sync::{Arc, Mutex, MutexGuard, OnceLock};
use std::time::SystemTime;
use syzygy::ide::Method;
use syzygy::settings::{EditorSettings, Layer, ProjectFileError, FILE_NAME};
use tower_lsp::lsp_types::Url;

/// The settings that apply to a document.
#[derive(Debug)]
pub struct Project {
    /// The project file, if one applies.
    pub file: Option<PathBuf>,
    /// What the document is analysed with.
    pub editor: EditorSettings,
    /// How its numbers are propagated, for hover and inlay hints.
    pub method: Method,
    /// A project file that cannot be used (the editor then uses the defaults): the error
    /// `syz check` stops with.
    pub error: Option<ProjectFileError>,
}

impl Project {
    /// The project of a document without a project file (one shared value, so that it
    /// compares equal to itself).
    pub fn none() -> Arc<Project> {
        static NONE: OnceLock<Arc<Project>> = OnceLock::new();
        NONE.get_or_init(|| Arc::new(Project::new(None, Ok(None))))
            .clone()
    }

    fn new(file: Option<PathBuf>, layer: Result<Option<Layer>, ProjectFileError>) -> Project {
        let (layer, error) = match layer {
            Ok(l) => (l, None),
            Err(e) => (None, Some(e)),
        };
        let editor = EditorSettings::new(layer.as_ref());
        Project {
            file,
            method: editor.method(),
            editor,
            error,
        }
    }
}

/// What a project file was read from, to tell when it changed.
#[derive(Debug, Clone, PartialEq)]
enum Stamp {
    Disk {
        modified: Option<SystemTime>,
        len: u64,
    },
    /// Open in the editor, at this version.
    Buffer(i32),
}

struct Cached {
    stamp: Stamp,
    /// The shared reference files the project file names, with their stamps when read.
    shared: Stamps,
    project: Arc<Project>,
}

/// The stamp of a file on disk, `None` when it cannot be looked at.
fn disk_stamp(path: &Path) -> Option<Stamp> {
    std::fs::metadata(path).ok().map(|m| Stamp::Disk {
        modified: m.modified().ok(),
        len: m.len(),
    })
}

/// The largest shared reference file read (as `syz`'s default `--max-file-size`).
const MAX_SHARED_BYTES: u64 = 256 << 20;

/// Shared reference files with their stamps when read.
type Stamps = Vec<(PathBuf, Option<Stamp>)>;

/// The shared references a project file names, read from disk relative to its folder.
fn read_shared(
    file: &Path,
    names: &[String],
) -> (
    Stamps,
    Result<Arc<syzygy::catalogue::SharedRefs>, ProjectFileError>,
) {
    let dir = file.parent().unwrap_or(Path::new("."));
    let paths: Vec<PathBuf> = names.iter().map(|n| dir.join(n)).collect();
    let stamps = paths.iter().map(|p| (p.clone(), disk_stamp(p))).collect();
    let mut texts = Vec::new();
    for p in &paths {
        let shown = p.display().to_string();
        // In the words `syz check` uses for the same file.
        let words = |e: std::io::Error| format!("{shown}: {}", syzygy::text::io_words(&e));
        let text = match std::fs::metadata(p) {
            Ok(m) if m.is_dir() => Err(format!(
                "{shown}: {}",
                syzygy::text::not_regular_words("a folder")
            )),
            Ok(m) if !m.is_file() => Err(format!(
                "{shown}: {}",
                syzygy::text::not_regular_words("a special file")
            )),
            Ok(m) if m.len() > MAX_SHARED_BYTES => Err(format!(
                "{shown}: larger than {MAX_SHARED_BYTES} bytes; skipped"
            )),
            Ok(_) => std::fs::read_to_string(p).map_err(words),
            Err(e) => Err(words(e)),
        };
        match text {
            Ok(t) => texts.push((shown, t)),
            Err(why) => {
                return (
                    stamps,
                    Err(ProjectFileError::shared_unreadable(
                        &file.display().to_string(),
                        why,
                    )),
                )
            }
        }
    }
    let shared = syzygy::catalogue::SharedRefs::from_files(
        texts.iter().map(|(n, t)| (n.as_str(), t.as_str())),
    );
    (stamps, Ok(Arc::new(shared)))
}

#[derive(Default)]
pub struct Projects {
    /// Roots of the workspace folders.
    roots: Mutex<Vec<PathBuf>>,
    /// Project files read so far, by path.
    cache: Mutex<HashMap<PathBuf, Cached>>,
    /// Project files open in the editor: text and version.
    buffers: Mutex<HashMap<PathBuf, (String, i32)>>,
}

/// A lock whose holder panicked still guards plain data; go on with it.
fn lock<T>(m: &Mutex<T>) -> MutexGuard<'_, T> {
    m.lock().unwrap_or_else(|e| e.into_inner())
}

/// The path of a project file's URI, if the URI names one.
pub fn project_file_path(uri: &Url) -> Option<PathBuf> {
    let path = uri.to_file_path().ok()?;
    (path.file_name()? == FILE_NAME).then_some(path)
}

impl Projects {
    pub fn add_root(&self, uri: &Url) {
        if let Ok(p) = uri.to_file_path() {
            lock(&self.roots).push(p);
        }
    }

    /// The roots of the workspace folders.
    pub fn roots(&self) -> Vec<PathBuf> {
        lock(&self.roots).clone()
    }

    pub fn remove_root(&self, uri: &Url) {
        if let Ok(p) = uri.to_file_path() {
            lock(&self.roots).retain(|r| *r != p);
        }
    }

    /// The project of the document at `uri` (a document that is not a file has none).
    pub fn for_document(&self, uri: &Url) -> Arc<Project> {
        let Ok(path) = uri.to_file_path() else {
            return Project::none();
        };
        match self.nearest(&path) {
            Some(file) => self.load(file),
            None => Project::none(),
        }
    }

    /// The nearest project file above `doc`, no higher than the innermost workspace folder
    /// that holds it.
    fn nearest(&self, doc: &Path) -> Option<PathBuf> {
        let stop = lock(&self.roots)
            .iter()
            .filter(|r| doc.starts_with(r))
            .max_by_key(|r| r.components().count())
            .cloned();
        let buffers = lock(&self.buffers);
        for dir in doc.ancestors().skip(1) {
            let candidate = dir.join(FILE_NAME);
            if buffers.contains_key(&candidate) || candidate.is_file() {
                return Some(candidate);
            }
            if stop.as_deref() == Some(dir) {
                break;
            }
        }
        None
    }

    /// The project of one project file, read again only if it changed since last time.
    fn load(&self, file: PathBuf) -> Arc<Project> {
        let buffer = lock(&self.buffers).get(&file).cloned();
        let stamp = match &buffer {
            Some((_, version)) => Stamp::Buffer(*version),
            None => match std::fs::metadata(&file) {
                Ok(m) => Stamp::Disk {
                    modified: m.modified().ok(),
                    len: m.len(),
                },
                // Gone since it was found: as if it had not been there.
                Err(_) => return Project::none(),
            },
        };
        if let Some(c) = lock(&self.cache).get(&file) {
            if c.stamp == stamp && c.shared.iter().all(|(p, st)| disk_stamp(p) == *st) {
                return c.project.clone();
            }
        }
        let name = file.display().to_string();
        let text = match buffer {
            Some((text, _)) => Ok(text),
            None => {
                std::fs::read_to_string(&file).map_err(|e| ProjectFileError::unreadable(&name, e))
            }
        };
        let layer = text.and_then(|t| Layer::from_project_file(&name, &t).map(Some));
        let names = match &layer {
            Ok(Some(l)) => l.reference_files.clone().unwrap_or_default(),
            _ => Vec::new(),
        };
        let (shared, refs) = read_shared(&file, &names);
        let project = match refs {
            Ok(refs) => {
                let mut p = Project::new(Some(file.clone()), layer);
                if p.error.is_none() {
                    p.editor.settings.shared_refs = refs;
                    // Files under one project file form a catalogue, compared with each
                    // other (a project file with a mistake stops `syz check` before that).
                    p.editor.settings.catalogue = Some(file.display().to_string());
                }
                p
            }
            Err(e) => Project::new(Some(file.clone()), Err(e)),
        };
        let project = Arc::new(project);
        lock(&self.cache).insert(
            file,
            Cached {
                stamp,
                shared,
                project: project.clone(),
            },
        );
        project
    }

    /// Read this project file again at its next use (the client says it changed on disk).
    pub fn forget(&self, file: &Path) {
        lock(&self.cache).remove(file);
    }

    /// Forget every project whose shared reference files include `file` (it changed on
    /// disk); whether any did.
    pub fn forget_sharing(&self, file: &Path) -> bool {
        let mut cache = lock(&self.cache);
        let before = cache.len();
        cache.retain(|_, c| !c.shared.iter().any(|(p, _)| p == file));
        cache.len() != before
    }

    /// The editor opened or changed a project file: its buffer now stands for the file.
    pub fn set_buffer(&self, file: PathBuf, text: String, version: i32) {
        lock(&self.buffers).insert(file, (text, version));
    }

    pub fn buffer_text(&self, file: &Path) -> Option<String> {
        lock(&self.buffers).get(file).map(|(t, _)| t.clone())
    }

    /// The editor closed a project file: the file on disk applies again.
    pub fn close_buffer(&self, file: &Path) {
        lock(&self.buffers).remove(file);
        self.forget(file);
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn scratch(name: &str) -> PathBuf {
        let dir = std::env::temp_dir().join(format!("syzygy-lsp-{}-{name}", std::process::id()));
        let _ = std::fs::remove_dir_all(&dir);
        std::fs::create_dir_all(dir.join("work/inner")).unwrap();
        dir
    }

    fn uri(p: &Path) -> Url {
        Url::from_file_path(p).unwrap()
    }

    #[test]
    fn nearest_file_within_the_workspace_folder_applies() {
        let dir = scratch("nearest");
        let doc = uri(&dir.join("work/inner/a.syz"));
        let p = Projects::default();
        assert!(Arc::ptr_eq(&p.for_document(&doc), &Project::none()));
        std::fs::write(
            dir.join("syzygy.toml"),
            "[derivation]\nconsistency_sigma = 5.0\n",
        )
        .unwrap();
        let above = p.for_document(&doc);
        assert_eq!(above.file, Some(dir.join("syzygy.toml")));
        assert_eq!(above.editor.settings.options.consistency_sigma, 5.0);
        assert!(
            Arc::ptr_eq(&above, &p.for_document(&doc)),
            "kept while unchanged"
        );
        // Inside a workspace folder, nothing above the folder applies.
        p.add_root(&uri(&dir.join("work")));
        assert!(p.for_document(&doc).file.is_none());
        std::fs::write(
            dir.join("work/syzygy.toml"),
            "[rules]\nunstable-spacing = \"off\"\n",
        )
        .unwrap();
        assert_eq!(
            p.for_document(&doc).file,
            Some(dir.join("work/syzygy.toml"))
        );
        p.remove_root(&uri(&dir.join("work")));
        // A change on disk is noticed at the next lookup.
        std::fs::write(
            dir.join("work/syzygy.toml"),
            "[rules]\nunknown-thing = \"off\"\n",
        )
        .unwrap();
        let bad = p.for_document(&doc);
        assert!(bad.error.as_ref().unwrap().reason.contains("unknown rule"));
        assert_eq!(bad.editor, EditorSettings::new(None), "defaults meanwhile");
        // A buffer open in the editor stands for the file.
        let file = dir.join("work/syzygy.toml");
        p.set_buffer(file.clone(), "[derivation]\nseed = 3\n".to_string(), 1);
        let open = p.for_document(&doc);
        assert!(open.error.is_none());
        assert_eq!(open.editor.settings.options.seed, 3);
        p.close_buffer(&file);
        assert!(p.for_document(&doc).error.is_some());
        std::fs::remove_dir_all(&dir).unwrap();
        assert!(p.for_document(&doc).file.is_none());
        assert!(Arc::ptr_eq(
            &p.for_document(&Url::parse("untitled:one").unwrap()),
            &Project::none()
        ));
    }
}
