//! `syz diff OLD NEW` and `syz diff --against REV PATH...`: what changed between two
//! versions of a catalogue, derived values and their consequences included. Both sides are
//! read here (the old one from git with `--against`), analysed under the same settings and
//! reduced to snapshots; the comparison and its three forms are the core's
//! (`syzygy::diff`).

use crate::files::{self, Loaded};
use crate::{config_file, eval_cmd, git, DiffFormat};
use std::path::{Component, Path, PathBuf};
use syzygy::diff::{self, About, DiffOptions, SystemSnapshot};
use syzygy::settings::Layer;
use syzygy::source::SourceDb;
use syzygy::Settings;

/// What `syz diff` was asked.
pub struct Request<'a> {
    pub paths: &'a [PathBuf],
    pub against: Option<&'a str>,
    pub format: DiffFormat,
    pub options: DiffOptions,
}

/// One side: its files, and the name each goes by in the comparison (its path relative to
/// the folder given, or its file name).
struct Side {
    loaded: Loaded,
    labels: Vec<String>,
}

pub fn run(req: &Request, flags: &Layer, read: files::ReadArgs) -> u8 {
    match compare(req, flags, read) {
        Ok(code) => code,
        Err(e) => {
            eprintln!("syz: error: {e}");
            2
        }
    }
}

fn compare(req: &Request, flags: &Layer, read: files::ReadArgs) -> Result<u8, String> {
    let (old, new, names) =
        match (req.against, req.paths) {
            (Some(rev), paths) => {
                let new = side(files::load(paths, read), paths);
                let old = side(git::load(rev, paths, read.max_file_size)?, paths);
                let shown: Vec<String> = paths.iter().map(|p| p.display().to_string()).collect();
                let shown = shown.join(" ");
                (
                    old,
                    new,
                    (
                        format!("{shown} at {rev}"),
                        format!("{shown} (working tree)"),
                    ),
                )
            }
            (None, [one]) if !flags.what_if.is_empty() => {
                let paths = std::slice::from_ref(one);
                let name = one.display().to_string();
                (
                    side(files::load(paths, read), paths),
                    side(files::load(paths, read), paths),
                    (name.clone(), format!("{name} with --set")),
                )
            }
            (None, [o, n]) => (
                side(
                    files::load(std::slice::from_ref(o), read),
                    std::slice::from_ref(o),
                ),
                side(
                    files::load(std::slice::from_ref(n), read),
                    std::slice::from_ref(n),
                ),
                (o.display().to_string(), n.display().to_string()),
            ),
            _ => return Err(
                "syz diff takes OLD and NEW (two files or two folders), or the paths to compare \
                 with --against REV, or one path with --set"
                    .to_string(),
            ),
        };
    let failed: Vec<&String> = old.loaded.errors.iter().chain(&new.loaded.errors).collect();
    if !failed.is_empty() {
        for e in &failed {
            eprintln!("syz: error: {e}");
        }
        return Err("some files could not be read; nothing compared".to_string());
    }
    // The settings of the new side, for both: the same project file, flags and seed, so
    // that an unchanged file gives the same numbers. Values set on the command line are
    // for the new side only.
    let new_settings = config_file::resolve(&new.loaded, flags)?;
    let plain = Layer {
        what_if: Vec::new(),
        ..flags.clone()
    };
    let fallback = config_file::resolve(&new.loaded, &plain)?
        .into_iter()
        .next()
        .unwrap_or_else(|| Settings::resolve(None, &plain));
    let old_settings: Vec<Settings> = old
        .labels
        .iter()
        .map(|l| {
            new.labels
                .iter()
                .position(|n| n == l)
                .and_then(|i| new_settings.get(i))
                .map_or_else(
                    || fallback.clone(),
                    |s| Settings {
                        what_if: Vec::new(),
                        ..s.clone()
                    },
                )
        })
        .collect();
    let options = new_settings
        .first()
        .map_or_else(|| fallback.options.clone(), |s| s.options.clone());
    let old_snaps = snapshots(&old, &old_settings);
    let new_snaps = snapshots(&new, &new_settings);
    let result = diff::compare(&old_snaps, &new_snaps, req.options);
    let about = About {
        old: names.0,
        new: names.1,
        uncertainties: eval_cmd::propagation_words(&options),
        options,
        set: flags.what_if.iter().map(|w| w.written.clone()).collect(),
    };
    match req.format {
        DiffFormat::Text => print!("{}", diff::text::render(&result, &about)),
        DiffFormat::Markdown => print!("{}", diff::markdown::render(&result, &about)),
        DiffFormat::Json => {
            let doc = diff::json::document(&result, &about);
            println!("{}", crate::json_out::pretty(&doc));
        }
    }
    Ok(u8::from(result.significant()))
}

fn side(loaded: Loaded, roots: &[PathBuf]) -> Side {
    let labels = loaded
        .db
        .files()
        .map(|f| label(Path::new(loaded.db.name(f)), roots))
        .collect();
    Side { loaded, labels }
}

/// The name a file goes by: its path under the folder given that holds it, else its file name.
fn label(file: &Path, roots: &[PathBuf]) -> String {
    let file = normal(file);
    roots
        .iter()
        .find_map(|r| {
            let under = file.strip_prefix(normal(r)).ok()?;
            (!under.as_os_str().is_empty()).then(|| under.display().to_string())
        })
        .or_else(|| file.file_name().map(|n| n.to_string_lossy().into_owned()))
        .unwrap_or_else(|| file.display().to_string())
}

/// A path without `.` components, so `./a/b` and `a/b` compare equal.
fn normal(p: &Path) -> PathBuf {
    p.components()
        .filter(|c| !matches!(c, Component::CurDir))
        .collect()
}

/// Every file of a side analysed under its settings, reduced to snapshots.
fn snapshots(side: &Side, settings: &[Settings]) -> Vec<SystemSnapshot> {
    let mut out = Vec::new();
    let labels = &side.labels;
    files::for_each_analysed(
        &side.loaded.db,
        settings,
        |a| {
            let name = labels.get(a.file.0 as usize).map_or("?", String::as_str);
            diff::snapshot(&a, name)
        },
        |snaps, _| out.extend(snaps),
    );
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn files_are_named_under_the_folder_given() {
        let roots = [PathBuf::from("./cat/")];
        assert_eq!(label(Path::new("cat/a/x.syz"), &roots), "a/x.syz");
        assert_eq!(label(Path::new("./cat/x.syz"), &roots), "x.syz");
        assert_eq!(label(Path::new("other/y.syz"), &roots), "y.syz");
        assert_eq!(label(Path::new("cat"), &[PathBuf::from("cat")]), "cat");
    }
}
