//! `syz fmt`: the canonical layout of files (the same as the language server's formatting).
//! Prints the laid-out text by default; rewrites files only with `--write`; `--check` lists
//! the files that would change.

use std::io::Write;
use std::path::{Path, PathBuf};
use syzygy::source::SourceDb;

#[derive(Clone, Copy, PartialEq, Eq)]
pub enum Mode {
    Print,
    Write,
    Check,
}

/// Exit code: 0 done (or nothing to change), 1 `--check` found files to change, 2 a file
/// could not be read, written or laid out.
pub fn run(paths: &[PathBuf], read: crate::files::ReadArgs, mode: Mode) -> u8 {
    let loaded = crate::files::load(paths, read);
    crate::files::report_io_errors(&loaded.errors);
    let mut failed = !loaded.errors.is_empty();
    let mut would_change = Vec::new();
    let mut out = crate::output::stdout();
    for f in loaded.db.files() {
        let name = loaded.db.name(f).to_string();
        let text = loaded.db.text(f);
        let formatted = match syzygy::layout::format_source(text) {
            Ok(t) => t,
            Err(e) => {
                eprintln!("syz: {name}: not formatted: {e}");
                failed = true;
                continue;
            }
        };
        match mode {
            Mode::Print => {
                let _ = out.write_all(formatted.as_bytes());
            }
            Mode::Check => {
                if formatted != text {
                    let _ = writeln!(out, "{name}");
                    would_change.push(name);
                }
            }
            Mode::Write => {
                if formatted != text {
                    if let Err(e) = write_in_place(Path::new(&name), &formatted) {
                        eprintln!("syz: {name}: cannot write: {e}");
                        failed = true;
                    }
                }
            }
        }
    }
    if failed {
        2
    } else if mode == Mode::Check && !would_change.is_empty() {
        1
    } else {
        0
    }
}

/// Write beside the file, then rename over it, so a failure never leaves half a file. A
/// symbolic link is followed: its target is rewritten and the link stays a link.
fn write_in_place(path: &Path, text: &str) -> std::io::Result<()> {
    let target = std::fs::canonicalize(path)?;
    let path = target.as_path();
    let mut tmp = path.as_os_str().to_owned();
    tmp.push(".syz-fmt-tmp");
    let tmp = PathBuf::from(tmp);
    std::fs::write(&tmp, text)?;
    if let Ok(meta) = std::fs::metadata(path) {
        let _ = std::fs::set_permissions(&tmp, meta.permissions());
    }
    std::fs::rename(&tmp, path).inspect_err(|_| {
        let _ = std::fs::remove_file(&tmp);
    })
}
