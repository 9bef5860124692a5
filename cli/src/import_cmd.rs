//! `syz import`: tables (CSV, VOTable) into one `.syz` file per system. Reads each table as
//! a stream, hands its rows to `syzygy::tables` and writes the texts it returns into the
//! output folder, never over a file that is there unless `--force` says so (docs/import.md).

use std::collections::HashSet;
use std::io::{BufReader, Write};
use std::path::{Path, PathBuf};
use syzygy::tables::{
    CsvTable, ImportResult, Importer, Limits, Mapping, RowSource, TableFormat, VoTable,
};

#[derive(clap::Args)]
pub struct Args {
    /// CSV or VOTable (TABLEDATA) files.
    #[arg(required = true)]
    tables: Vec<PathBuf>,
    /// The folder the `.syz` files are written into (made if missing).
    #[arg(short = 'o', long = "output", value_name = "DIR")]
    output: PathBuf,
    /// The mapping file: which columns hold what (see docs/import.md).
    #[arg(short, long, value_name = "FILE")]
    mapping: Option<PathBuf>,
    /// Replace files of the output folder that were there before the import.
    #[arg(long)]
    force: bool,
}

/// Largest mapping file read.
const MAX_MAPPING_BYTES: u64 = 1024 * 1024;

/// Exit code: 0 everything imported; 1 some cells were not imported (each is named); 2 a
/// table, the mapping or the output folder could not be used.
pub fn run(args: &Args) -> u8 {
    // Without a mapping file, only the tables `syz` writes itself can be read.
    let mapping = match &args.mapping {
        Some(_) => match mapping(args) {
            Some(m) => Some(m),
            None => return 2,
        },
        None => None,
    };
    if let Err(e) = std::fs::create_dir_all(&args.output) {
        eprintln!(
            "syz: error: {}: cannot make the folder: {e}",
            args.output.display()
        );
        return 2;
    }
    let mut written = HashSet::new();
    let mut code = 0;
    for table in &args.tables {
        let c = import_one(table, mapping.as_ref(), args, &mut written);
        code = code.max(c);
    }
    others_in_folder(args, &written);
    code
}

/// Say which `*.syz` files in the output folder this import did not write (an earlier
/// import's, whose systems the table may no longer hold): `syz check` of the folder reads
/// them too. Nothing is removed.
fn others_in_folder(args: &Args, written: &HashSet<String>) {
    let Ok(entries) = std::fs::read_dir(&args.output) else {
        return;
    };
    let mut others: Vec<String> = entries
        .filter_map(Result::ok)
        .map(|e| e.file_name().to_string_lossy().into_owned())
        .filter(|n| n.ends_with(".syz") && !written.contains(n))
        .collect();
    if others.is_empty() {
        return;
    }
    others.sort();
    let n = others.len();
    let shown: Vec<&str> = others.iter().take(5).map(String::as_str).collect();
    let more = if n > 5 {
        format!(" and {} more", n - 5)
    } else {
        String::new()
    };
    eprintln!(
        "syz: note: {} holds {n} other .syz file{} this import did not write ({}{more}); `syz check` of the folder reads {} too",
        args.output.display(),
        crate::check_cmd::plural(n),
        shown.join(", "),
        if n == 1 { "it" } else { "them" }
    );
}

/// The mapping the user gave.
fn mapping(args: &Args) -> Option<Mapping> {
    let path = args.mapping.as_ref()?;
    let text = match crate::files::read_text(path, MAX_MAPPING_BYTES) {
        Ok(t) => t,
        Err(e) => {
            eprintln!("syz: error: {e}");
            return None;
        }
    };
    match Mapping::from_toml(&text) {
        Ok(m) => Some(m),
        Err(e) => {
            eprintln!("syz: error: {}: {e}", path.display());
            None
        }
    }
}

fn format_of(path: &Path, mapping: Option<&Mapping>) -> TableFormat {
    if let Some(f) = mapping.and_then(|m| m.format) {
        return f;
    }
    let ext = path
        .extension()
        .and_then(|e| e.to_str())
        .unwrap_or("")
        .to_ascii_lowercase();
    match ext.as_str() {
        "xml" | "vot" | "votable" => TableFormat::Votable,
        _ => TableFormat::Csv,
    }
}

fn import_one(
    path: &Path,
    mapping: Option<&Mapping>,
    args: &Args,
    written: &mut HashSet<String>,
) -> u8 {
    let shown = path.display().to_string();
    let (file, size) = match crate::files::open_regular(path) {
        Ok(f) => f,
        Err(e) => {
            eprintln!("syz: error: {e}");
            return 2;
        }
    };
    let bar = progress_bar(size);
    let input: Box<dyn std::io::Read> = match &bar {
        Some(b) => Box::new(b.wrap_read(file)),
        None => Box::new(file),
    };
    let input = BufReader::with_capacity(64 * 1024, input);
    let limits = Limits::default();
    let source: Result<Box<dyn RowSource>, _> = match format_of(path, mapping) {
        TableFormat::Csv => CsvTable::new(input, mapping.and_then(|m| m.delimiter), limits)
            .map(|t| Box::new(t) as Box<dyn RowSource>),
        TableFormat::Votable => {
            VoTable::new(input, limits).map(|t| Box::new(t) as Box<dyn RowSource>)
        }
    };
    let mut source = match source {
        Ok(s) => s,
        Err(e) => {
            finish_bar(bar);
            eprintln!("syz: error: {shown}: {e}");
            return 2;
        }
    };
    let name = path
        .file_name()
        .map_or(shown.clone(), |n| n.to_string_lossy().into_owned());
    let Some(mapping) = mapping else {
        // No mapping: the table of declared values `syz eval --table sources` writes.
        if !syzygy::tables::is_sources_table(source.columns()) {
            finish_bar(bar);
            eprintln!(
                "syz: error: {shown}: give the mapping file with --mapping FILE (docs/import.md describes it); \
                 only the table of declared values that `syz eval --table sources` writes is read without one"
            );
            return 2;
        }
        let result = syzygy::tables::import_sources(source.as_mut(), &name);
        finish_bar(bar);
        return match result {
            Ok(result) => finish(&shown, &result, args, written),
            Err(e) => {
                eprintln!("syz: error: {shown}: {e}; nothing was written for this table");
                2
            }
        };
    };
    let mut importer = match Importer::new(mapping, source.columns(), &name) {
        Ok(i) => i.with_full_rows(source.full_rows()),
        Err(e) => {
            finish_bar(bar);
            eprintln!(
                "syz: error: {shown}: mapping: {e}{}",
                param_hint(&e.to_string(), source.params())
            );
            return 2;
        }
    };
    loop {
        match source.next_row() {
            Ok(Some(row)) => importer.add_row(&row),
            Ok(None) => break,
            Err(e) => {
                finish_bar(bar);
                eprintln!("syz: error: {shown}: {e}; nothing was written for this table");
                return 2;
            }
        }
    }
    finish_bar(bar);
    report_params(&shown, source.params());
    finish(&shown, &importer.finish(), args, written)
}

/// A VOTable's PARAMs are one value for the whole table, which the import does not read:
/// each is named, so that none is passed over without a word (the first ten, then a count).
fn report_params(table: &str, params: &[syzygy::tables::Param]) {
    if params.is_empty() {
        return;
    }
    let shown: Vec<String> = params
        .iter()
        .take(10)
        .map(|p| match &p.unit {
            Some(u) => format!("{} = {} {u}", p.name, p.value),
            None => format!("{} = {}", p.name, p.value),
        })
        .collect();
    let more = match params.len().saturating_sub(shown.len()) {
        0 => String::new(),
        n => format!(" and {n} more"),
    };
    eprintln!(
        "syz: {table}: PARAMs (one value for the whole table) are not imported: {}{more}; a value every star or planet should get goes under [constants.star] or [constants.planet] in the mapping (docs/import.md)",
        shown.join(", ")
    );
}

/// For a mapping that names a column the header lacks but a PARAM has: what a PARAM is.
fn param_hint(error: &str, params: &[syzygy::tables::Param]) -> String {
    params
        .iter()
        .find(|p| !p.name.is_empty() && error.contains(&format!("`{}` is not in the table's header", p.name)))
        .map(|p| {
            format!(
                "; `{}` is a PARAM of the table (one value for all rows), not a FIELD: give its value under [constants.star] or [constants.planet] instead (docs/import.md)",
                p.name
            )
        })
        .unwrap_or_default()
}

/// Report an import, write its files, and say how it went (the exit code).
fn finish(shown: &str, result: &ImportResult, args: &Args, written: &mut HashSet<String>) -> u8 {
    report(shown, result);
    let failed = write_all(result, args, written);
    if failed {
        2
    } else if result.issues.is_empty() && result.summary.skipped_cells == 0 {
        0
    } else {
        1
    }
}

/// Every issue, the unmapped columns once, then the summary.
fn report(table: &str, r: &ImportResult) {
    for i in &r.issues {
        let place = i.place();
        let sep = if place.is_empty() { "" } else { ": " };
        eprintln!("syz: {table}: {place}{sep}{} [{}]", i.message, i.kind.id());
    }
    if !r.unmapped.is_empty() {
        eprintln!(
            "syz: {table}: columns not in the mapping, not imported: {} (list them under `ignore` to silence this)",
            r.unmapped.join(", ")
        );
    }
    let s = &r.summary;
    let merged = if s.merged > 0 {
        format!(" ({} repeated values merged)", s.merged)
    } else {
        String::new()
    };
    let n = |count: usize, word: &str| format!("{count} {word}{}", crate::check_cmd::plural(count));
    println!(
        "{table}: {}: {}, {}, {}, {} read{merged}; {} skipped",
        n(s.rows, "row"),
        n(s.systems, "system"),
        n(s.stars, "star"),
        n(s.planets, "planet"),
        n(s.values, "value"),
        n(s.skipped_cells, "cell")
    );
}

/// Write every system's file; true if one could not be written.
fn write_all(r: &ImportResult, args: &Args, written: &mut HashSet<String>) -> bool {
    let mut failed = false;
    let mut count = 0;
    for f in &r.files {
        // A name this import already used gets a suffix: two systems never share a file.
        let mut name = format!("{}.syz", f.stem);
        let mut n = 1;
        while written.contains(&name) {
            n += 1;
            name = format!("{}-{n}.syz", f.stem);
        }
        written.insert(name.clone());
        let path = args.output.join(&name);
        match write_new(&path, &f.text, args.force) {
            Ok(()) => count += 1,
            Err(e) => {
                eprintln!("syz: error: system {:?}: {}: {e}", f.system, path.display());
                failed = true;
            }
        }
    }
    println!(
        "wrote {count} file{} to {}",
        crate::check_cmd::plural(count),
        args.output.display()
    );
    failed
}

/// Create the file; never follow or replace what is there, unless `force`, which replaces it
/// by renaming a new file over it (a link is replaced, not followed).
fn write_new(path: &Path, text: &str, force: bool) -> Result<(), String> {
    let create = |p: &Path| {
        std::fs::OpenOptions::new()
            .write(true)
            .create_new(true)
            .open(p)
            .and_then(|mut f| f.write_all(text.as_bytes()))
    };
    match create(path) {
        Ok(()) => Ok(()),
        Err(e) if e.kind() == std::io::ErrorKind::AlreadyExists && force => {
            let mut tmp = path.as_os_str().to_owned();
            tmp.push(".syz-import-tmp");
            let tmp = PathBuf::from(tmp);
            create(&tmp).map_err(|e| format!("cannot write: {e}"))?;
            std::fs::rename(&tmp, path).map_err(|e| {
                let _ = std::fs::remove_file(&tmp);
                format!("cannot replace: {e}")
            })
        }
        Err(e) if e.kind() == std::io::ErrorKind::AlreadyExists => {
            Err("exists already; not overwritten (--force replaces it)".into())
        }
        Err(e) => Err(format!("cannot write: {e}")),
    }
}

/// A bar over the table's bytes, on stderr, only when stderr is a terminal.
fn progress_bar(size: u64) -> Option<indicatif::ProgressBar> {
    use std::io::IsTerminal;
    if !std::io::stderr().is_terminal() || size < 1024 * 1024 {
        return None;
    }
    let bar = indicatif::ProgressBar::new(size);
    if let Ok(style) =
        indicatif::ProgressStyle::with_template("importing {bar:40} {bytes}/{total_bytes} ({eta})")
    {
        bar.set_style(style);
    }
    Some(bar)
}

fn finish_bar(bar: Option<indicatif::ProgressBar>) {
    if let Some(b) = bar {
        b.finish_and_clear();
    }
}
