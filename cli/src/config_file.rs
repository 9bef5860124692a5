//! Finding `syzygy.toml` for each checked file (the nearest one walking up from the file's
//! folder wins) and reading it, with the shared reference files it names. Parsing it and
//! laying the command-line flags over it is the core's (`syzygy::settings`), shared with the
//! language server, and so is reading the shared references out of their texts
//! (`syzygy::catalogue::SharedRefs`).

use std::collections::HashMap;
use std::path::{Path, PathBuf};
use std::sync::Arc;
use syzygy::catalogue::SharedRefs;
use syzygy::settings::{Layer, ProjectFileError, FILE_NAME};
use syzygy::source::SourceDb;
use syzygy::Settings;

/// Settings for every file of `db`, in file order: the defaults, the file's nearest project
/// file, then `flags`. A project file that cannot be read or parsed is an error naming it.
pub fn resolve(loaded: &crate::files::Loaded, flags: &Layer) -> Result<Vec<Settings>, String> {
    let db = &loaded.db;
    let mut found: HashMap<PathBuf, Option<PathBuf>> = HashMap::new();
    // Per project file (None: none found), resolved once however many files it covers.
    let mut resolved: HashMap<Option<PathBuf>, Settings> = HashMap::new();
    let mut out = Vec::new();
    for f in db.files() {
        let dir = folder_of(Path::new(db.name(f)));
        let path = nearest(&dir, &mut found);
        let settings = match resolved.get(&path) {
            Some(s) => s.clone(),
            None => {
                let layer = path
                    .as_deref()
                    .map(read)
                    .transpose()
                    .map_err(|e| e.to_string())?;
                let mut s = Settings::resolve(layer.as_ref(), flags);
                if let Some(p) = &path {
                    s.catalogue = Some(p.display().to_string());
                    s.shared_refs = shared_refs(p, &s.reference_files, loaded.max_file_size)
                        .map_err(|e| e.to_string())?;
                }
                resolved.insert(path, s.clone());
                s
            }
        };
        out.push(settings);
    }
    check_what_if(db, &flags.what_if)?;
    Ok(out)
}

/// Every `--set` must name one body of the files read and give it a value it takes: checked
/// here, before anything is analysed, so that a misspelt one stops the command (status 2)
/// instead of being left out.
fn check_what_if(
    db: &syzygy::source::MemoryDb,
    sets: &[syzygy::what_if::WhatIf],
) -> Result<(), String> {
    if sets.is_empty() {
        return Ok(());
    }
    let mut outlines = Vec::new();
    for f in db.files() {
        for part in syzygy::parts::Parts::new(f, db.text(f), syzygy::parts::PART_BYTES) {
            outlines.extend(syzygy::what_if::Outline::of(&part.model, db.name(f)));
        }
    }
    for w in sets {
        syzygy::what_if::check(std::slice::from_ref(w), &outlines)
            .map_err(|e| format!("--set '{}': {e}", w.written))?;
    }
    syzygy::what_if::check(sets, &outlines).map_err(|e| format!("--set: {e}"))
}

/// The settings layer of one project file.
fn read(path: &Path) -> Result<Layer, ProjectFileError> {
    let name = path.display().to_string();
    let text = std::fs::read_to_string(path).map_err(|e| ProjectFileError::unreadable(&name, e))?;
    Layer::from_project_file(&name, &text)
}

/// The shared references of the project file at `project`: its `[references] files`, read
/// relative to its folder (each a regular file of at most `limit` bytes).
fn shared_refs(
    project: &Path,
    files: &[String],
    limit: u64,
) -> Result<Arc<SharedRefs>, ProjectFileError> {
    if files.is_empty() {
        return Ok(Arc::default());
    }
    let dir = project.parent().unwrap_or(Path::new("."));
    let project_name = project.display().to_string();
    let mut texts = Vec::with_capacity(files.len());
    for f in files {
        let path = dir.join(f);
        let text = crate::files::read_text(&path, limit)
            .map_err(|why| ProjectFileError::shared_unreadable(&project_name, why))?;
        // Named relative to the working folder when under it, as the checked files are.
        let cwd = std::env::current_dir().ok();
        let shown = cwd
            .as_deref()
            .and_then(|c| path.strip_prefix(c).ok())
            .unwrap_or(&path);
        texts.push((shown.display().to_string(), text));
    }
    Ok(Arc::new(SharedRefs::from_files(
        texts.iter().map(|(n, t)| (n.as_str(), t.as_str())),
    )))
}

fn folder_of(file: &Path) -> PathBuf {
    let abs = std::path::absolute(file).unwrap_or_else(|_| file.to_path_buf());
    abs.parent().map_or_else(|| abs.clone(), Path::to_path_buf)
}

/// The nearest `syzygy.toml` in `dir` or above, remembering each folder's answer.
fn nearest(dir: &Path, found: &mut HashMap<PathBuf, Option<PathBuf>>) -> Option<PathBuf> {
    if let Some(known) = found.get(dir) {
        return known.clone();
    }
    let candidate = dir.join(FILE_NAME);
    let answer = if candidate.is_file() {
        Some(candidate)
    } else {
        dir.parent().and_then(|p| nearest(p, found))
    };
    found.insert(dir.to_path_buf(), answer.clone());
    answer
}
