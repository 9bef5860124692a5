//! Finding `syzygy.toml` for each checked file (the nearest one walking up from the file's
//! folder wins) and merging it with the command line: an explicit flag beats the project
//! file, which beats the engine's defaults.

use std::collections::HashMap;
use std::path::{Path, PathBuf};
use syzygy::config::{ProjectConfig, FILE_NAME};
use syzygy::diagnostic::SeverityOverride;
use syzygy::source::{MemoryDb, SourceDb};
use syzygy::{Options, Propagation};

/// The engine settings given explicitly on the command line (`None`: not given).
#[derive(Default)]
pub struct Flags {
    pub propagation: Option<Propagation>,
    pub samples: Option<usize>,
    pub seed: Option<u64>,
    pub sigma: Option<f64>,
    pub overrides: Vec<SeverityOverride>,
}

impl Flags {
    /// These flags over `base`.
    pub fn over(&self, base: Options) -> Options {
        // The same layering as a project file's: reuse it rather than repeat it.
        syzygy::config::ProjectConfig {
            overrides: Vec::new(),
            propagation: self.propagation,
            samples: self.samples,
            seed: self.seed,
            consistency_sigma: self.sigma,
        }
        .apply(base)
    }
}

/// The settings of one file: derivation options and severity overrides, in order of
/// increasing precedence (project file first, then flags).
pub type FileSettings = (Options, Vec<SeverityOverride>);

/// Settings for every file of `db`, in file order. A project file that cannot be read or
/// parsed is an error naming it.
pub fn resolve(db: &MemoryDb, flags: &Flags) -> Result<Vec<FileSettings>, String> {
    let mut found: HashMap<PathBuf, Option<PathBuf>> = HashMap::new();
    let mut parsed: HashMap<PathBuf, ProjectConfig> = HashMap::new();
    let mut out = Vec::new();
    for f in db.files() {
        let dir = folder_of(Path::new(db.name(f)));
        let config = match nearest(&dir, &mut found) {
            Some(path) => {
                if !parsed.contains_key(&path) {
                    let text = std::fs::read_to_string(&path)
                        .map_err(|e| format!("{}: cannot be read: {e}", path.display()))?;
                    let c = ProjectConfig::parse(&text)
                        .map_err(|e| format!("{}: {e}", path.display()))?;
                    parsed.insert(path.clone(), c);
                }
                parsed.get(&path).cloned().unwrap_or_default()
            }
            None => ProjectConfig::default(),
        };
        let options = flags.over(config.apply(Options::default()));
        let mut overrides = config.overrides.clone();
        overrides.extend(flags.overrides.iter().copied());
        out.push((options, overrides));
    }
    Ok(out)
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
