//! Finding and reading input files. The only place the CLI reads the file system; files
//! are only ever read, and only regular files: a named pipe, a device or a socket, named or
//! met in a folder, is skipped with an error without being opened (opening a named pipe
//! waits for a writer), and a file larger than the size limit is skipped too. Every command
//! that reads `.syz` files reads them here.

use std::collections::BTreeSet;
use std::io::Read;
use std::path::{Path, PathBuf};
use syzygy::source::{FileId, MemoryDb, SourceDb};
use syzygy::{analyze, Analysis, Settings};

/// The largest file read unless `--max-file-size` says otherwise.
pub const DEFAULT_MAX_FILE_SIZE: &str = "256MiB";

/// How files are read: the options every command that reads `.syz` files takes.
#[derive(clap::Args, Clone, Copy, Debug)]
pub struct ReadArgs {
    /// Largest file read, in bytes or with a unit (KB, MB, GB; KiB, MiB, GiB); larger files
    /// are skipped with an error.
    #[arg(
        long,
        value_name = "SIZE",
        default_value = DEFAULT_MAX_FILE_SIZE,
        value_parser = parse_size,
        global = true
    )]
    pub max_file_size: u64,
}

/// A size: a whole number of bytes, or a number with a decimal (KB, MB, GB) or binary
/// (KiB, MiB, GiB) unit; case does not matter, `K`, `M`, `G` alone are decimal.
pub fn parse_size(text: &str) -> Result<u64, String> {
    let t = text.trim();
    let split = t
        .find(|c: char| !(c.is_ascii_digit() || c == '.'))
        .unwrap_or(t.len());
    let (number, unit) = t.split_at(split);
    let factor: u64 = match unit.trim().to_ascii_lowercase().as_str() {
        "" | "b" => 1,
        "k" | "kb" => 1_000,
        "m" | "mb" => 1_000_000,
        "g" | "gb" => 1_000_000_000,
        "kib" => 1 << 10,
        "mib" => 1 << 20,
        "gib" => 1 << 30,
        _ => {
            return Err(format!(
                "'{text}': expected a size such as 1048576, 500KB or 256MiB"
            ))
        }
    };
    let n: f64 = number
        .parse()
        .map_err(|_| format!("'{text}': expected a size such as 1048576, 500KB or 256MiB"))?;
    let bytes = n * factor as f64;
    if bytes >= u64::MAX as f64 {
        return Err(format!(
            "'{text}': too large a size (at most 18446744073709551615 bytes, about 18 EB)"
        ));
    }
    if !(bytes.is_finite() && bytes >= 1.0) {
        return Err(format!("'{text}': the size must be at least one byte"));
    }
    Ok(bytes as u64)
}

/// A size for people: exact binary multiples as such, else bytes.
fn size_words(n: u64) -> String {
    for (unit, size) in [("GiB", 1u64 << 30), ("MiB", 1 << 20), ("KiB", 1 << 10)] {
        if n >= size && n.is_multiple_of(size) {
            return format!("{} {unit}", n / size);
        }
    }
    format!("{n} bytes")
}

pub struct Loaded {
    pub db: MemoryDb,
    /// One line per path that could not be read.
    pub errors: Vec<String>,
    /// The size limit the files were read with (shared reference files are read with it too).
    pub max_file_size: u64,
}

/// Collect the files named (folders recursively, `*.syz` only, in sorted order) and read them.
pub fn load(paths: &[PathBuf], read: ReadArgs) -> Loaded {
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
    let texts: Vec<Result<String, String>> = {
        use rayon::prelude::*;
        files
            .par_iter()
            .map(|f| read_text(f, read.max_file_size))
            .collect()
    };
    let mut db = MemoryDb::new();
    for (f, r) in files.iter().zip(texts) {
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
    Loaded {
        db,
        errors,
        max_file_size: read.max_file_size,
    }
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

/// The text of one file, read only if it is a regular file of at most `limit` bytes; at most
/// `limit + 1` bytes are read, so a file growing meanwhile cannot exceed the limit.
pub fn read_text(path: &Path, limit: u64) -> Result<String, String> {
    let shown = path.display();
    let meta = std::fs::metadata(path).map_err(|e| format!("{shown}: {}", io_words(&e)))?;
    regular(&meta).map_err(|e| format!("{shown}: {e}"))?;
    if meta.len() > limit {
        return Err(format!(
            "{shown}: {} is larger than the limit of {}; skipped (--max-file-size sets the limit)",
            size_words(meta.len()),
            size_words(limit)
        ));
    }
    let file = open_without_waiting(path).map_err(|e| format!("{shown}: {}", io_words(&e)))?;
    // What was opened may not be what was looked at: look again, at the open file.
    let meta = file
        .metadata()
        .map_err(|e| format!("{shown}: {}", io_words(&e)))?;
    regular(&meta).map_err(|e| format!("{shown}: {e}"))?;
    let mut bytes = Vec::with_capacity(usize::try_from(meta.len().min(limit)).unwrap_or(0));
    file.take(limit.saturating_add(1))
        .read_to_end(&mut bytes)
        .map_err(|e| format!("{shown}: {}", io_words(&e)))?;
    if bytes.len() as u64 > limit {
        return Err(format!(
            "{shown}: grew past the limit of {} while being read; skipped (--max-file-size sets the limit)",
            size_words(limit)
        ));
    }
    String::from_utf8(bytes).map_err(|e| {
        format!(
            "{shown}: not valid UTF-8 (first bad byte at offset {}); Syzygy files are UTF-8 text",
            e.utf8_error().valid_up_to()
        )
    })
}

/// A regular file opened for streaming (a table for `syz import`), with its size; anything
/// else is refused without waiting, as `read_text` does.
pub fn open_regular(path: &Path) -> Result<(std::fs::File, u64), String> {
    let shown = path.display();
    let file = open_without_waiting(path).map_err(|e| format!("{shown}: {}", io_words(&e)))?;
    let meta = file
        .metadata()
        .map_err(|e| format!("{shown}: {}", io_words(&e)))?;
    regular(&meta).map_err(|e| format!("{shown}: {e}"))?;
    Ok((file, meta.len()))
}

/// `Ok` for a regular file, else what it is, in words.
fn regular(meta: &std::fs::Metadata) -> Result<(), String> {
    let kind = meta.file_type();
    if kind.is_file() {
        return Ok(());
    }
    let what = if kind.is_dir() {
        "a folder"
    } else {
        special_kind(&kind)
    };
    Err(syzygy::text::not_regular_words(what))
}

#[cfg(unix)]
fn special_kind(kind: &std::fs::FileType) -> &'static str {
    use std::os::unix::fs::FileTypeExt;
    if kind.is_fifo() {
        "a named pipe (FIFO)"
    } else if kind.is_char_device() {
        "a character device"
    } else if kind.is_block_device() {
        "a block device"
    } else if kind.is_socket() {
        "a socket"
    } else {
        "a special file"
    }
}

#[cfg(not(unix))]
fn special_kind(_: &std::fs::FileType) -> &'static str {
    "a special file"
}

/// Open for reading without blocking: should the path have become a named pipe since it
/// was looked at, opening it returns at once instead of waiting for a writer.
#[cfg(unix)]
fn open_without_waiting(path: &Path) -> std::io::Result<std::fs::File> {
    use std::os::unix::fs::OpenOptionsExt;
    std::fs::OpenOptions::new()
        .read(true)
        .custom_flags(libc::O_NONBLOCK)
        .open(path)
}

#[cfg(not(unix))]
fn open_without_waiting(path: &Path) -> std::io::Result<std::fs::File> {
    std::fs::File::open(path)
}

fn io_words(e: &std::io::Error) -> String {
    syzygy::text::io_words(e)
}

/// Above this many files, `check` shows a progress bar (on a terminal only).
const PROGRESS_THRESHOLD: usize = 200;

/// Analyse every loaded file, in parallel, each with the settings of its nearest project
/// file (`syzygy.toml`) under the explicit flags; the result keeps the files' (sorted) order.
/// An unreadable or invalid project file is an error naming it.
pub fn analyze_all(
    loaded: &Loaded,
    flags: &syzygy::settings::Layer,
) -> Result<Vec<Analysis>, String> {
    let settings = crate::config_file::resolve(loaded, flags)?;
    Ok(analyze_each(&loaded.db, &settings))
}

/// Analyse every loaded file with its own settings (one entry per file, in file order).
pub fn analyze_each(db: &MemoryDb, settings: &[Settings]) -> Vec<Analysis> {
    let mut out = Vec::with_capacity(settings.len());
    for_each_unit(db, settings, usize::MAX, |a| a, |a, _| out.push(a));
    out
}

/// Files (or parts of files) analysed per batch: enough to keep both cores busy, few
/// enough that a batch's results stay small.
const BATCH: usize = 128;
/// Source bytes analysed per batch, at most (and at least one file or part): a batch's
/// analyses and outputs take tens of bytes per byte of source.
const BATCH_BYTES: usize = 1 << 20;

/// Analyse every loaded file with its own settings, turn each analysis into a `T` on the
/// worker that made it, and hand the `T`s to `sink` in file order, with whether it is the
/// last of its file. A file larger than [`syzygy::parts::PART_BYTES`] is analysed in parts
/// of whole systems, one `T` per part, so memory follows the part, not the file. Files and
/// parts are analysed in parallel batches and each analysis is dropped once mapped, so
/// memory stays flat however many files there are and however large (what `check` and
/// `eval` stream).
pub fn for_each_analysed<T: Send>(
    db: &MemoryDb,
    settings: &[Settings],
    map: impl Fn(Analysis) -> T + Sync,
    sink: impl FnMut(T, bool),
) {
    for_each_unit(db, settings, syzygy::parts::PART_BYTES, map, sink);
}

/// What one worker analyses: a whole file, or a part of one already read.
enum Unit<'a> {
    Whole(FileId, &'a Settings),
    Part(Box<syzygy::parts::Part>, &'a Settings, bool),
}

fn for_each_unit<T: Send>(
    db: &MemoryDb,
    settings: &[Settings],
    part_bytes: usize,
    map: impl Fn(Analysis) -> T + Sync,
    mut sink: impl FnMut(T, bool),
) {
    use rayon::prelude::*;
    let progress = progress_bar(settings.len());
    let run = |units: &mut Vec<Unit>, bytes: &mut usize, sink: &mut dyn FnMut(T, bool)| {
        let mapped: Vec<(T, bool)> = std::mem::take(units)
            .into_par_iter()
            .map(|unit| {
                let (a, last) = match unit {
                    Unit::Whole(f, settings) => (analyze(f, db.text(f), settings), true),
                    Unit::Part(part, settings, last) => {
                        let f = part.model.file;
                        (syzygy::analyze_part(db.text(f), *part, settings), last)
                    }
                };
                if let Some(p) = progress.as_ref().filter(|_| last) {
                    p.inc(1);
                }
                (map(a), last)
            })
            .collect();
        *bytes = 0;
        mapped.into_iter().for_each(|(t, last)| sink(t, last));
    };
    let mut units = Vec::new();
    let mut bytes = 0usize;
    for (f, settings) in db.files().zip(settings) {
        let text = db.text(f);
        if text.len() <= part_bytes {
            units.push(Unit::Whole(f, settings));
            bytes += text.len();
            if units.len() >= BATCH || bytes >= BATCH_BYTES {
                run(&mut units, &mut bytes, &mut sink);
            }
            continue;
        }
        // The next parts are read while this one is analysed; a part is known to be the
        // last once the reading ends, so each is queued one part late.
        let mut held: Option<syzygy::parts::Part> = None;
        let mut queue = |part: syzygy::parts::Part, last: bool| {
            bytes += part.region.end - part.region.start;
            units.push(Unit::Part(Box::new(part), settings, last));
            if units.len() >= BATCH || bytes >= BATCH_BYTES {
                run(&mut units, &mut bytes, &mut sink);
            }
        };
        syzygy::parts::Parts::new(f, text, part_bytes)
            .with_shared(settings.shared_refs.clone())
            .read_parts(|part| {
                if let Some(before) = held.replace(part) {
                    queue(before, false);
                }
            });
        if let Some(part) = held {
            queue(part, true);
        }
    }
    run(&mut units, &mut bytes, &mut sink);
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

/// Read the files named and find each one's settings (its `syzygy.toml` under the flags);
/// `None`, after saying why, when a project file is bad.
pub fn load_with_settings(
    paths: &[PathBuf],
    flags: &syzygy::settings::Layer,
    read: ReadArgs,
) -> Option<(Loaded, Vec<syzygy::Settings>)> {
    let loaded = load(paths, read);
    match crate::config_file::resolve(&loaded, flags) {
        Ok(settings) => Some((loaded, settings)),
        Err(e) => {
            report_io_errors(&loaded.errors);
            eprintln!("syz: error: {e}");
            None
        }
    }
}

/// One file analysed under its settings, and the body a command is about.
pub struct OneBody {
    pub analysis: Analysis,
    pub settings: Settings,
    /// Indices of the system and of the body in it.
    pub system: usize,
    pub body: usize,
}

/// Read one file, analyse it under its project file and the flags, and find `body` (in
/// `system`, if named): what `explain`, `plot rv|transit` and `ephemeris` start from. The
/// error is a sentence for `syz: ...`, with the exit status it calls for (2: the file could
/// not be read or its settings are bad; 1: no such body).
pub fn one_body(
    file: &Path,
    system: Option<&str>,
    body: &str,
    flags: &syzygy::settings::Layer,
    read: ReadArgs,
) -> Result<OneBody, (u8, String)> {
    let loaded = load(&[file.to_path_buf()], read);
    if !loaded.errors.is_empty() {
        let lines: Vec<String> = loaded
            .errors
            .iter()
            .map(|e| format!("error: {e}"))
            .collect();
        return Err((2, lines.join("\nsyz: ")));
    }
    let settings =
        crate::config_file::resolve(&loaded, flags).map_err(|e| (2, format!("error: {e}")))?;
    let mut analyses = analyze_each(&loaded.db, &settings);
    let (Some(analysis), Some(settings)) = (analyses.pop(), settings.into_iter().next()) else {
        return Err((2, format!("{}: nothing to read", file.display())));
    };
    // A system named that the file does not have: say so, with the file's systems (the
    // body may well exist in one of them).
    if let Some(name) = system {
        if !analysis.model.systems.iter().any(|s| s.name == name) {
            let names: Vec<String> = analysis
                .model
                .systems
                .iter()
                .take(6)
                .map(|s| format!("\"{}\"", s.name))
                .collect();
            let close = analysis
                .model
                .systems
                .iter()
                .find(|s| s.name.eq_ignore_ascii_case(name))
                .map(|s| format!(" (\"{}\" differs only in letter case)", s.name))
                .unwrap_or_default();
            return Err((
                2,
                format!(
                    "no system \"{name}\" in {}{close}; its systems: {}{}",
                    file.display(),
                    names.join(", "),
                    if analysis.model.systems.len() > 6 {
                        ", ..."
                    } else {
                        ""
                    }
                ),
            ));
        }
    }
    // A body of that id in several systems: which one is meant is not for `syz` to guess.
    if system.is_none() {
        let holding: Vec<String> = analysis
            .model
            .systems
            .iter()
            .filter(|s| s.body(body).is_some())
            .map(|s| format!("\"{}\"", s.name))
            .collect();
        if holding.len() > 1 {
            let shown: Vec<String> = holding.iter().take(4).cloned().collect();
            let more = if holding.len() > 4 {
                format!(" and {} more", holding.len() - 4)
            } else {
                String::new()
            };
            return Err((
                2,
                format!(
                    "'{body}' names a body of several systems of {}: {}{more}; name the system with --system {}",
                    file.display(),
                    shown.join(", "),
                    shown.first().map_or("NAME", |s| s.as_str())
                ),
            ));
        }
    }
    let Some((system, body_index)) = syzygy::report::find_body(&analysis, system, body) else {
        let past = analysis.model.systems.iter().find(|s| {
            system.is_none_or(|n| n == s.name) && s.not_read.iter().any(|(n, _)| n == body)
        });
        return Err(match past {
            Some(s) => (1, syzygy::model::limits::not_read(&s.name, body)),
            None => {
                let errors = analysis.error_count();
                let hidden = if errors > 0 {
                    format!(
                        "; the file has {errors} error{}, and one may hide it (a misspelt \
                         'planet', an unreadable name): run `syz check` on it",
                        if errors == 1 { "" } else { "s" }
                    )
                } else {
                    String::new()
                };
                (1, format!("no body '{body}' in {}{hidden}", file.display()))
            }
        });
    };
    Ok(OneBody {
        analysis,
        settings,
        system,
        body: body_index,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn sizes_take_decimal_and_binary_units() {
        assert_eq!(parse_size("1000"), Ok(1000));
        assert_eq!(parse_size("2KB"), Ok(2000));
        assert_eq!(parse_size("1.5 MiB"), Ok(1_572_864));
        assert_eq!(parse_size("256mib"), Ok(256 << 20));
        assert_eq!(parse_size("1G"), Ok(1_000_000_000));
        assert!(parse_size("0").is_err_and(|e| e.contains("at least one byte")));
        // Past what a size can hold: said to be too large, not too small.
        assert!(parse_size("99999999999999999999GB").is_err_and(|e| e.contains("too large")));
        assert!(parse_size("ten").is_err());
        assert!(parse_size("5 parsecs").is_err());
        assert_eq!(size_words(256 << 20), "256 MiB");
        assert_eq!(size_words(1000), "1000 bytes");
    }

    /// A file whose size the file system does not know beforehand (as one still growing):
    /// the limit holds while reading, not only from the size looked up first.
    #[cfg(target_os = "linux")]
    #[test]
    fn the_limit_holds_while_reading() {
        let path = Path::new("/proc/self/status");
        assert_eq!(std::fs::metadata(path).map(|m| m.len()).ok(), Some(0));
        let err = read_text(path, 16).err().unwrap_or_default();
        assert!(err.contains("grew past the limit of 16 bytes"), "{err}");
        assert!(read_text(path, 1 << 20).is_ok_and(|t| t.contains("Name:")));
    }
}
