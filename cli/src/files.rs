//! Finding and reading input files. The only place the CLI touches the file system; files
//! are only ever read.

use std::collections::BTreeSet;
use std::path::{Path, PathBuf};
use syzygy::source::{MemoryDb, SourceDb};
use syzygy::{analyze, Analysis, Settings};

pub struct Loaded {
    pub db: MemoryDb,
    /// One line per path that could not be read.
    pub errors: Vec<String>,
}

/// Collect the files named (folders recursively, `*.syz` only, in sorted order) and read them.
pub fn load(paths: &[PathBuf]) -> Loaded {
    let mut files = Vec::new();
    let mut errors = Vec::new();
    let mut visited = BTreeSet::new();
    for p in paths {
        match std::fs::metadata(p) {
            Ok(m) if m.is_dir() => walk(p, &mut files, &mut errors, &mut visited),
            Ok(_) => files.push(p.clone()),
            Err(e) => errors.push(format!("{}: {}", p.display(), io_words(&e))),
        }
    }
    // Read in parallel (a catalogue is thousands of small files), kept in sorted order.
    let read: Vec<Result<String, String>> = {
        use rayon::prelude::*;
        files
            .par_iter()
            .map(|f| match std::fs::read(f) {
                Ok(bytes) => String::from_utf8(bytes).map_err(|e| format!(
                    "{}: not valid UTF-8 (first bad byte at offset {}); Syzygy files are UTF-8 text",
                    f.display(),
                    e.utf8_error().valid_up_to()
                )),
                Err(e) => Err(format!("{}: {}", f.display(), io_words(&e))),
            })
            .collect()
    };
    let mut db = MemoryDb::new();
    for (f, r) in files.iter().zip(read) {
        match r {
            Ok(text) => {
                db.add(f.display().to_string(), text);
            }
            Err(e) => errors.push(e),
        }
    }
    if files.is_empty() && errors.is_empty() {
        // Not an error (an empty catalogue is valid), but a misspelt folder or extension
        // should not pass a CI job unnoticed.
        let names: Vec<String> = paths.iter().map(|p| p.display().to_string()).collect();
        eprintln!("syz: warning: no .syz file found in {}", names.join(", "));
    }
    Loaded { db, errors }
}

fn walk(
    dir: &Path,
    files: &mut Vec<PathBuf>,
    errors: &mut Vec<String>,
    visited: &mut BTreeSet<PathBuf>,
) {
    // A symlink loop leads back to a folder already walked: skip it, once, with a word.
    match std::fs::canonicalize(dir) {
        Ok(c) => {
            if !visited.insert(c) {
                errors.push(format!(
                    "{}: folder already visited (symbolic link loop?), skipped",
                    dir.display()
                ));
                return;
            }
        }
        Err(e) => {
            errors.push(format!("{}: {}", dir.display(), io_words(&e)));
            return;
        }
    }
    let entries = match std::fs::read_dir(dir) {
        Ok(rd) => rd,
        Err(e) => {
            errors.push(format!("{}: {}", dir.display(), io_words(&e)));
            return;
        }
    };
    // The entry's own type (from the folder listing) answers for plain files and folders
    // without a further system call per file; symbolic links are followed with `metadata`.
    let mut paths: Vec<(PathBuf, Option<std::fs::FileType>)> = entries
        .filter_map(|e| e.ok().map(|e| (e.path(), e.file_type().ok())))
        .collect();
    paths.sort_by(|a, b| a.0.cmp(&b.0));
    for (p, kind) in paths {
        match kind {
            Some(k) if k.is_file() => {
                if p.extension().is_some_and(|e| e == "syz") {
                    files.push(p);
                }
                continue;
            }
            Some(k) if k.is_dir() => {
                walk(&p, files, errors, visited);
                continue;
            }
            _ => {}
        }
        match std::fs::metadata(&p) {
            Ok(m) if m.is_dir() => walk(&p, files, errors, visited),
            Ok(_) if p.extension().is_some_and(|e| e == "syz") => files.push(p),
            Ok(_) => {}
            Err(e) => {
                if p.extension().is_some_and(|e| e == "syz")
                    || std::fs::symlink_metadata(&p).is_ok()
                {
                    errors.push(format!("{}: {}", p.display(), io_words(&e)));
                }
            }
        }
    }
}

fn io_words(e: &std::io::Error) -> String {
    match e.kind() {
        std::io::ErrorKind::NotFound => "no such file or folder".to_string(),
        std::io::ErrorKind::PermissionDenied => "permission denied".to_string(),
        _ => e.to_string(),
    }
}

/// Above this many files, `check` shows a progress bar (on a terminal only).
const PROGRESS_THRESHOLD: usize = 200;

/// Analyse every loaded file, in parallel, each with the settings of its nearest project
/// file (`syzygy.toml`) under the explicit flags; the result keeps the files' (sorted) order.
/// An unreadable or invalid project file is an error naming it.
pub fn analyze_all(
    db: &MemoryDb,
    flags: &syzygy::settings::Layer,
) -> Result<Vec<Analysis>, String> {
    let settings = crate::config_file::resolve(db, flags)?;
    Ok(analyze_each(db, &settings))
}

/// Analyse every loaded file with its own settings (one entry per file, in file order).
pub fn analyze_each(db: &MemoryDb, settings: &[Settings]) -> Vec<Analysis> {
    let mut out = Vec::with_capacity(settings.len());
    for_each_analysed(db, settings, |a| a, |a| out.push(a));
    out
}

/// Files analysed per batch by [`for_each_analysed`]: enough to keep both cores busy, few
/// enough that a batch's results stay small.
const BATCH: usize = 128;

/// Analyse every loaded file with its own settings, turn each analysis into a `T` on the
/// worker that made it, and hand the `T`s to `sink` in file order. Files are analysed in
/// parallel batches and each analysis is dropped once mapped, so memory stays flat however
/// many files there are (what `eval` streams).
pub fn for_each_analysed<T: Send>(
    db: &MemoryDb,
    settings: &[Settings],
    map: impl Fn(Analysis) -> T + Sync,
    mut sink: impl FnMut(T),
) {
    use rayon::prelude::*;
    let ids: Vec<_> = db.files().zip(settings).collect();
    let progress = progress_bar(ids.len());
    for batch in ids.chunks(BATCH) {
        let mapped: Vec<T> = batch
            .par_iter()
            .map(|&(f, settings)| {
                let a = analyze(f, db.text(f), settings);
                if let Some(p) = &progress {
                    p.inc(1);
                }
                map(a)
            })
            .collect();
        mapped.into_iter().for_each(&mut sink);
    }
    if let Some(p) = progress {
        p.finish_and_clear();
    }
}

/// A bar on stderr, only when stderr is a terminal and there are many files.
fn progress_bar(n: usize) -> Option<indicatif::ProgressBar> {
    use std::io::IsTerminal;
    if n < PROGRESS_THRESHOLD || !std::io::stderr().is_terminal() {
        return None;
    }
    let bar = indicatif::ProgressBar::new(n as u64);
    if let Ok(style) =
        indicatif::ProgressStyle::with_template("checking {bar:40} {pos}/{len} files ({eta})")
    {
        bar.set_style(style);
    }
    Some(bar)
}

pub fn report_io_errors(errors: &[String]) {
    for e in errors {
        eprintln!("syz: error: {e}");
    }
}
