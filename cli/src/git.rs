//! Reading `.syz` files as a git revision has them (`syz diff --against REV`), through the
//! `git` program. The revision is checked before git sees it and always follows
//! `--end-of-options`, so no revision can be read as an option; it is resolved to a commit
//! id once, and only that id, object ids and paths after `--` are passed on.

use crate::files::Loaded;
use std::io::{BufRead, BufReader, Read, Write};
use std::path::PathBuf;
use std::process::{Command, Stdio};
use syzygy::source::MemoryDb;

/// The `.syz` files under `paths` as revision `rev` has them, each named by its path in the
/// working tree (as `syz` names the files it reads there), in sorted order.
pub fn load(rev: &str, paths: &[PathBuf], limit: u64) -> Result<Loaded, String> {
    let commit = resolve(rev)?;
    let prefix = text(run(&["rev-parse", "--show-prefix"])?);
    let top = PathBuf::from(text(run(&["rev-parse", "--show-toplevel"])?));
    let mut args = vec![
        "ls-tree",
        "-r",
        "-z",
        "-l",
        "--full-name",
        commit.as_str(),
        "--",
    ];
    let shown: Vec<String> = paths.iter().map(|p| p.display().to_string()).collect();
    args.extend(shown.iter().map(String::as_str));
    let listing = run(&args)?;
    let mut entries: Vec<(String, String, u64)> = Vec::new();
    for entry in listing.split(|b| *b == 0).filter(|e| !e.is_empty()) {
        let entry = String::from_utf8_lossy(entry);
        // `<mode> <type> <object> <size>\t<path>`
        let Some((meta, path)) = entry.split_once('\t') else {
            continue;
        };
        let fields: Vec<&str> = meta.split_whitespace().collect();
        let (Some(&"blob"), Some(object), Some(size)) =
            (fields.get(1), fields.get(2), fields.get(3))
        else {
            continue;
        };
        if !path.ends_with(".syz") {
            continue;
        }
        // Paths are shown from the current folder, as the working tree's are.
        let here = match path.strip_prefix(prefix.as_str()) {
            Some(rel) => rel.to_string(),
            None => top.join(path).display().to_string(),
        };
        entries.push((here, object.to_string(), size.parse().unwrap_or(u64::MAX)));
    }
    entries.sort();
    let mut db = MemoryDb::new();
    let mut errors = Vec::new();
    let wanted: Vec<&(String, String, u64)> = entries
        .iter()
        .filter(|(name, _, size)| {
            let ok = *size <= limit;
            if !ok {
                errors.push(format!(
                    "{name} at {rev}: larger than the limit of {limit} bytes; skipped (--max-file-size sets the limit)"
                ));
            }
            ok
        })
        .collect();
    let objects: Vec<&str> = wanted.iter().map(|e| e.1.as_str()).collect();
    for ((name, _, _), blob) in wanted.iter().zip(blobs(&objects)?) {
        match String::from_utf8(blob) {
            Ok(t) => {
                db.add(name.clone(), t);
            }
            Err(_) => errors.push(format!("{name} at {rev}: not valid UTF-8")),
        }
    }
    if entries.is_empty() {
        eprintln!(
            "syz: warning: no .syz file found in {} at {rev}",
            shown.join(", ")
        );
    }
    Ok(Loaded {
        db,
        errors,
        max_file_size: limit,
    })
}

/// The commit a revision names, as a hex object id; an error naming the revision when it
/// names none (or could be taken for an option).
fn resolve(rev: &str) -> Result<String, String> {
    if rev.is_empty() || rev.starts_with('-') || rev.chars().any(|c| c.is_control()) {
        return Err(format!(
            "--against '{rev}': not a revision (a revision does not start with '-' and has no control characters)"
        ));
    }
    let asked = format!("{rev}^{{commit}}");
    let out = run(&[
        "rev-parse",
        "--verify",
        "--quiet",
        "--end-of-options",
        &asked,
    ])
    .map_err(|e| format!("--against '{rev}': no such revision in this repository ({e})"))?;
    let id = text(out);
    if id.is_empty() || !id.chars().all(|c| c.is_ascii_hexdigit()) {
        return Err(format!(
            "--against '{rev}': no such revision in this repository"
        ));
    }
    Ok(id)
}

/// The contents of the blobs named, in order, read by one `git cat-file --batch`.
fn blobs(objects: &[&str]) -> Result<Vec<Vec<u8>>, String> {
    if objects.is_empty() {
        return Ok(Vec::new());
    }
    let mut child = Command::new("git")
        .args(["cat-file", "--batch"])
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .map_err(|e| format!("could not run git: {e}"))?;
    let mut stdin = child.stdin.take().ok_or("git cat-file: no input")?;
    let stdout = child.stdout.take().ok_or("git cat-file: no output")?;
    let input: String = objects.iter().map(|o| format!("{o}\n")).collect();
    // Written on a thread of its own while the answers are read, so neither side waits on a
    // full pipe.
    let writer = std::thread::spawn(move || stdin.write_all(input.as_bytes()));
    let mut reader = BufReader::new(stdout);
    let mut out = Vec::with_capacity(objects.len());
    for o in objects {
        let mut header = String::new();
        reader
            .read_line(&mut header)
            .map_err(|e| format!("git cat-file: {e}"))?;
        // `<object> blob <size>`
        let size: usize = header
            .split_whitespace()
            .nth(2)
            .and_then(|s| s.parse().ok())
            .ok_or_else(|| format!("git cat-file: object {o}: {}", header.trim()))?;
        let mut blob = vec![0; size];
        reader
            .read_exact(&mut blob)
            .map_err(|e| format!("git cat-file: {e}"))?;
        let mut newline = [0u8; 1];
        reader
            .read_exact(&mut newline)
            .map_err(|e| format!("git cat-file: {e}"))?;
        out.push(blob);
    }
    let _ = writer.join();
    let _ = child.wait();
    Ok(out)
}

/// Run git with `args`; its standard output, or its error in a sentence.
fn run(args: &[&str]) -> Result<Vec<u8>, String> {
    let out = Command::new("git")
        .args(args)
        .stdin(Stdio::null())
        .output()
        .map_err(|e| format!("could not run git: {e}"))?;
    if !out.status.success() {
        let err = String::from_utf8_lossy(&out.stderr).trim().to_string();
        return Err(if err.is_empty() {
            format!("git {} failed", args.first().unwrap_or(&""))
        } else {
            err
        });
    }
    Ok(out.stdout)
}

fn text(bytes: Vec<u8>) -> String {
    String::from_utf8_lossy(&bytes)
        .trim_end_matches(['\n', '\r'])
        .to_string()
}
