//! Settings: what the derivation engine and the diagnostics are run with, and the project
//! file `syzygy.toml` that holds them for a catalogue.
//!
//! One [`Settings`] value (derivation [`Options`] and rule severity overrides) is built by
//! layering: the engine's defaults, then the project file, then the command line (or, in the
//! language server, the editor's own choice of propagation). Each source gives a [`Layer`]:
//! what it sets explicitly. [`crate::analyze`] and [`crate::analyze_reusing`] take the result
//! and apply its overrides themselves, so `syz check` and the editor cannot disagree on
//! severities. Front ends find and read the project file (the core does no I/O) and pass its
//! text to [`Layer::from_project_file`].
//!
//! ```toml
//! [rules]
//! inconsistent = "error"        # error | warning | note | off
//! unstable-spacing = "off"
//!
//! [derivation]
//! propagation = "linear"        # monte-carlo | linear
//! samples = 5000                # or "auto": until stable (JCGM 101:2008 7.9)
//! seed = 7
//! consistency_sigma = 3.0
//! consistency_error_sigma = 5.0  # inconsistent past this is an error
//!
//! [sources]
//! choice = "most-precise"       # most-precise | last | weighted-mean
//!
//! [references]
//! files = ["references.syz"]    # shared references, relative to this file's folder
//!
//! [site]                        # where `syz ephemeris` looks from
//! latitude = 28.76              # degrees, north positive
//! longitude = -17.88            # degrees, east positive
//! elevation = 2300              # metres (optional, default 0)
//! ```

use crate::catalogue::SharedRefs;
use crate::derive::{Options, Propagation, SourceChoice};
use crate::diagnostic::{Diagnostic, Rule, Severity, SeverityOverride};
use crate::source::{FileId, Span};
use serde::Deserialize;
use std::collections::BTreeMap;
use std::sync::Arc;

/// The name front ends look for.
pub const FILE_NAME: &str = "syzygy.toml";

#[derive(Debug, Clone, Default, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
struct Raw {
    #[serde(default)]
    rules: BTreeMap<String, String>,
    #[serde(default)]
    derivation: RawDerivation,
    #[serde(default)]
    sources: RawSources,
    #[serde(default)]
    references: RawReferences,
    site: Option<RawSite>,
}

#[derive(Debug, Clone, Default, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawReferences {
    files: Option<Vec<String>>,
}

#[derive(Debug, Clone, Default, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawSite {
    latitude: Option<f64>,
    longitude: Option<f64>,
    elevation: Option<f64>,
}

#[derive(Debug, Clone, Default, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawSources {
    choice: Option<String>,
}

#[derive(Debug, Clone, Default, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawDerivation {
    propagation: Option<String>,
    samples: Option<RawSamples>,
    seed: Option<u64>,
    consistency_sigma: Option<f64>,
    consistency_error_sigma: Option<f64>,
}

/// `samples = 5000` or `samples = "auto"`.
#[derive(Debug, Clone, PartialEq, Deserialize)]
#[serde(untagged)]
enum RawSamples {
    Count(i64),
    Word(String),
}

/// The settings one source gives explicitly (`None`: not given, the layer below decides):
/// a project file, the command line's flags, the editor.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Layer {
    /// Severity overrides in order (a later one for the same rule wins).
    pub overrides: Vec<SeverityOverride>,
    pub propagation: Option<Propagation>,
    pub samples: Option<crate::derive::SampleCount>,
    pub seed: Option<u64>,
    pub consistency_sigma: Option<f64>,
    pub consistency_error_sigma: Option<f64>,
    /// Which of several declarations of one quantity derivations use (`[sources] choice`).
    pub source_choice: Option<SourceChoice>,
    /// Values set for one run in place of the files' (`--set`; never from a project file).
    pub what_if: Vec<crate::what_if::WhatIf>,
    /// The shared reference files (`[references] files`), relative to the project file's
    /// folder, as written.
    pub reference_files: Option<Vec<String>>,
    /// The observing site (`[site]`, or `syz ephemeris --site`).
    pub site: Option<crate::sky::Site>,
}

impl Layer {
    /// Parse the text of a project file; `path` names it in the error, which is the sentence
    /// `syz` prints after `syz: error: `.
    pub fn from_project_file(path: &str, text: &str) -> Result<Layer, ProjectFileError> {
        parse(text).map_err(|reason| ProjectFileError {
            path: path.to_string(),
            reason,
        })
    }
}

/// A TOML error as a sentence that says where: the line and what it holds (`seed = -7`
/// said only "invalid value: integer `-7`, expected u64"), with the parser's type names in
/// words.
fn toml_words(text: &str, e: &toml::de::Error) -> String {
    let message = e
        .message()
        .trim_end()
        .replace('\n', "; ")
        .replace("expected u64", "expected a whole number, 0 or more")
        .replace("expected f64", "expected a number");
    let Some(at) = e.span().map(|r| r.start.min(text.len())) else {
        return message;
    };
    let line = text.get(..at).map_or(0, |t| t.matches('\n').count()) + 1;
    let written = text.lines().nth(line - 1).unwrap_or("").trim();
    let written: String = written.chars().take(80).collect();
    format!("line {line} (`{written}`): {message}")
}

/// Parse the text of a `syzygy.toml`. Errors are sentences fit to show as they are.
fn parse(text: &str) -> Result<Layer, String> {
    let raw: Raw = toml::from_str(text).map_err(|e| toml_words(text, &e))?;
    let mut overrides = Vec::new();
    for (id, level) in &raw.rules {
        let rule = Rule::from_id(id).ok_or_else(|| {
            let near = crate::text::closest(id, Rule::ALL.iter().map(|r| r.id()));
            match near {
                Some(n) => format!("[rules]: unknown rule '{id}' (did you mean '{n}'?)"),
                None => format!("[rules]: unknown rule '{id}'"),
            }
        })?;
        if rule.is_fixed() {
            return Err(format!(
                "[rules]: '{id}' cannot be changed: {}, so it is always an error",
                rule.why_fixed()
            ));
        }
        let severity = match level.as_str() {
            "error" => Some(Severity::Error),
            "warning" => Some(Severity::Warning),
            "note" => Some(Severity::Note),
            "off" | "allow" => None,
            other => {
                return Err(format!(
                    "[rules]: '{id}' = \"{other}\": expected \"error\", \"warning\", \"note\" or \"off\""
                ))
            }
        };
        overrides.push((rule, severity));
    }
    let d = raw.derivation;
    let propagation = match d.propagation.as_deref() {
        None => None,
        Some("monte-carlo") => Some(Propagation::MonteCarlo),
        Some("linear") => Some(Propagation::Linear),
        Some(other) => {
            return Err(format!(
                "[derivation]: propagation = \"{other}\": expected \"monte-carlo\" or \"linear\""
            ))
        }
    };
    let samples = match &d.samples {
        None => None,
        Some(raw) => {
            let text = match raw {
                RawSamples::Count(n) => n.to_string(),
                RawSamples::Word(w) => w.clone(),
            };
            Some(
                crate::derive::SampleCount::parse(&text)
                    .map_err(|e| format!("[derivation]: samples = {text}: {e}"))?,
            )
        }
    };
    for (name, value) in [
        ("consistency_sigma", d.consistency_sigma),
        ("consistency_error_sigma", d.consistency_error_sigma),
    ] {
        if let Some(s) = value {
            if !(s.is_finite() && s > 0.0) {
                return Err(format!(
                    "[derivation]: {name} = {s}: expected a positive number"
                ));
            }
        }
    }
    let source_choice = match raw.sources.choice.as_deref() {
        None => None,
        Some(name) => Some(SourceChoice::parse(name).ok_or_else(|| {
            format!(
                "[sources]: choice = \"{name}\": expected \"most-precise\", \"last\" or \"weighted-mean\""
            )
        })?),
    };
    let reference_files = raw.references.files;
    for f in reference_files.iter().flatten() {
        if f.trim().is_empty() {
            return Err("[references]: files: a file name cannot be empty".to_string());
        }
    }
    let site = match raw.site {
        None => None,
        Some(RawSite {
            latitude: Some(lat),
            longitude: Some(lon),
            elevation,
        }) => Some(
            crate::sky::Site::from_degrees(lat, lon, elevation.unwrap_or(0.0))
                .map_err(|e| format!("[site]: {e}"))?,
        ),
        Some(_) => {
            return Err(
                "[site]: give both latitude and longitude (degrees, east longitude positive)"
                    .to_string(),
            )
        }
    };
    Ok(Layer {
        reference_files,
        site,
        overrides,
        source_choice,
        propagation,
        samples,
        seed: d.seed,
        consistency_sigma: d.consistency_sigma,
        consistency_error_sigma: d.consistency_error_sigma,
        what_if: Vec::new(),
    })
}

/// Everything an analysis is run with: the derivation options, the severity overrides and
/// the project's shared references.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Settings {
    pub options: Options,
    /// Severity overrides in order of increasing precedence (project file first, then flags).
    pub overrides: Vec<SeverityOverride>,
    /// Values set for this run in place of the files' (`--set`; see [`crate::what_if`]).
    pub what_if: Vec<crate::what_if::WhatIf>,
    /// The shared reference files the project file names, relative to its folder, as
    /// written. The front end reads them and fills `shared_refs`.
    pub reference_files: Vec<String>,
    /// The references of those files, which citations find after the file's own.
    pub shared_refs: Arc<SharedRefs>,
    /// The project file that applies, by path, as the front end found it: the files under one
    /// project file form a catalogue, whose files are compared with each other
    /// ([`crate::catalogue::across`]). `None`: no project file, no comparison.
    pub catalogue: Option<String>,
    /// The observing site, where one is given (used by `syz ephemeris`, not by analysis).
    pub site: Option<crate::sky::Site>,
}

impl From<Options> for Settings {
    fn from(options: Options) -> Settings {
        Settings {
            options,
            ..Settings::default()
        }
    }
}

impl Settings {
    /// The defaults with first-order propagation and no overrides.
    pub fn linear() -> Settings {
        Options::linear().into()
    }

    /// The engine's defaults, then the project file's layer (if there is one), then the
    /// explicit flags: a flag beats the project file, which beats the defaults.
    pub fn resolve(project_file: Option<&Layer>, flags: &Layer) -> Settings {
        let base = Settings::default();
        let base = match project_file {
            Some(p) => base.then(p),
            None => base,
        };
        base.then(flags)
    }

    /// `layer` laid over these settings: what it gives replaces what is here, and its
    /// overrides come after (so win over) the ones here.
    pub fn then(mut self, layer: &Layer) -> Settings {
        let o = &mut self.options;
        if let Some(p) = layer.propagation {
            o.propagation = p;
        }
        if let Some(n) = layer.samples {
            n.apply(o);
        }
        if let Some(s) = layer.seed {
            o.seed = s;
        }
        if let Some(s) = layer.consistency_sigma {
            o.consistency_sigma = s;
        }
        if let Some(s) = layer.consistency_error_sigma {
            o.consistency_error_sigma = s;
        }
        if let Some(c) = layer.source_choice {
            o.source_choice = c;
        }
        if let Some(files) = &layer.reference_files {
            self.reference_files = files.clone();
        }
        self.overrides.extend(layer.overrides.iter().copied());
        self.what_if.extend(layer.what_if.iter().cloned());
        if layer.site.is_some() {
            self.site = layer.site;
        }
        self
    }

    /// Change or drop diagnostics as the overrides say (syntax and I/O problems keep their
    /// severity).
    pub fn apply_overrides(&self, diags: &mut Vec<Diagnostic>) {
        crate::diagnostic::apply_overrides(diags, &self.overrides);
    }
}

/// A project file that cannot be used: it cannot be read, is not TOML, or says something
/// the engine does not accept. Shown as `path: reason`, the sentence `syz` prints after
/// `syz: error: ` and the language server shows on the documents it applies to.
#[derive(Debug, Clone, PartialEq)]
pub struct ProjectFileError {
    pub path: String,
    pub reason: String,
}

impl std::fmt::Display for ProjectFileError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "{}: {}", self.path, self.reason)
    }
}

impl ProjectFileError {
    /// A project file the front end found but could not read (`why` in words).
    pub fn unreadable(path: &str, why: impl std::fmt::Display) -> ProjectFileError {
        ProjectFileError {
            path: path.to_string(),
            reason: format!("cannot be read: {why}"),
        }
    }

    /// A shared reference file the project file names (`[references] files`) could not be
    /// read; `why` names the file and says why.
    pub fn shared_unreadable(project: &str, why: impl std::fmt::Display) -> ProjectFileError {
        ProjectFileError {
            path: project.to_string(),
            reason: format!("[references]: {why}"),
        }
    }

    /// The error as a diagnostic on the first line of a file `src` it applies to (rule `io`:
    /// like an unreadable file, it cannot be silenced or downgraded).
    pub fn diagnostic(&self, file: FileId, src: &str) -> Diagnostic {
        let end = src.find(['\n', '\r']).unwrap_or(src.len());
        Diagnostic::new(Rule::Io, Span::new(file, 0, end), self.to_string())
            .with_note("`syz check` stops with this error (exit status 2); until the project file is fixed, this file is checked with the default settings")
            .with_help(format!("fix {FILE_NAME} (see docs/project-file.md)"))
    }
}

/// What the language server analyses a document with, and how that compares with `syz eval`.
///
/// The editor keeps everything the project file says (severities, silencing by `off`, the
/// consistency threshold), so its diagnostics are those of `syz check`, except the
/// propagation of uncertainties: always first order, which is fast enough to re-derive on
/// every keystroke. Monte Carlo, when the project asks for it or by default, is left to the
/// command line, and hover and inlay hints say so.
#[derive(Debug, Clone, PartialEq)]
pub struct EditorSettings {
    pub settings: Settings,
    /// What `syz eval` uses for the same file when given no flags.
    pub eval_propagation: Propagation,
    /// Whether `eval_propagation` is the project file's choice (else the default).
    pub eval_from_project_file: bool,
}

impl EditorSettings {
    /// The editor's settings under a project file's layer (`None`: no usable project file).
    pub fn new(project_file: Option<&Layer>) -> EditorSettings {
        let editor = Layer {
            propagation: Some(Propagation::Linear),
            ..Layer::default()
        };
        let eval = Settings::resolve(project_file, &Layer::default());
        EditorSettings {
            settings: eval.clone().then(&editor),
            eval_propagation: eval.options.propagation,
            eval_from_project_file: project_file.is_some_and(|p| p.propagation.is_some()),
        }
    }

    /// How the numbers shown were propagated, for hover and inlay hints.
    pub fn method(&self) -> crate::ide::Method {
        let used = self.settings.options.propagation;
        let why = if self.eval_from_project_file {
            format!("per {FILE_NAME}")
        } else {
            "by default".to_string()
        };
        if used == self.eval_propagation {
            return crate::ide::Method {
                line: format!(
                    "{} propagation, as `syz eval` uses {why}",
                    propagation_words(used)
                ),
                tag: None,
            };
        }
        crate::ide::Method {
            line: format!(
                "{} propagation (the editor's choice for speed; `syz eval` uses {} {why}, so the last digits may differ)",
                propagation_words(used),
                propagation_words(self.eval_propagation)
            ),
            tag: Some(propagation_words(used).to_string()),
        }
    }
}

fn propagation_words(p: Propagation) -> &'static str {
    match p {
        Propagation::Linear => "first-order",
        Propagation::MonteCarlo => "Monte Carlo",
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn layer(text: &str) -> Result<Layer, ProjectFileError> {
        Layer::from_project_file("cat/syzygy.toml", text)
    }

    #[test]
    fn full_file() {
        let c = layer(
            "[rules]\ninconsistent = \"error\"\nunstable-spacing = \"off\"\n[derivation]\npropagation = \"linear\"\nsamples = 500\nseed = 9\nconsistency_sigma = 5.0\nconsistency_error_sigma = 8.0\n",
        )
        .unwrap();
        assert_eq!(
            c.overrides,
            vec![
                (Rule::Inconsistent, Some(Severity::Error)),
                (Rule::UnstableSpacing, None)
            ]
        );
        let o = Settings::resolve(Some(&c), &Layer::default()).options;
        assert_eq!(o.propagation, Propagation::Linear);
        assert_eq!((o.samples, o.seed, o.consistency_sigma), (500, 9, 5.0));
        assert_eq!(o.consistency_error_sigma, 8.0);
        assert_eq!(Settings::default().options.consistency_error_sigma, 5.0);
    }

    #[test]
    fn syntax_and_io_cannot_be_changed() {
        for id in ["syntax", "io"] {
            let e = layer(&format!("[rules]\n{id} = \"off\"\n")).unwrap_err();
            assert!(
                e.reason.contains(&format!("'{id}' cannot be changed")),
                "{e}"
            );
        }
    }

    #[test]
    fn flags_beat_the_project_file_which_beats_the_defaults() {
        let project = layer(
            "[rules]\ninconsistent = \"error\"\n[derivation]\nseed = 9\nconsistency_sigma = 5.0\n",
        )
        .unwrap();
        let flags = Layer {
            overrides: vec![(Rule::Inconsistent, Some(Severity::Note))],
            consistency_sigma: Some(2.0),
            ..Layer::default()
        };
        let s = Settings::resolve(Some(&project), &flags);
        let defaults = Options::default();
        assert_eq!(s.options.propagation, defaults.propagation);
        assert_eq!(s.options.samples, defaults.samples);
        assert_eq!((s.options.seed, s.options.consistency_sigma), (9, 2.0));
        let mut d = vec![Diagnostic::new(Rule::Inconsistent, Span::default(), "x")];
        s.apply_overrides(&mut d);
        assert_eq!(
            d[0].severity,
            Severity::Note,
            "the flag comes last and wins"
        );
        assert_eq!(
            Settings::resolve(None, &Layer::default()),
            Settings::default()
        );
    }

    #[test]
    fn mistakes_are_explained() {
        let e = layer("[rules]\ninconsistant = \"error\"\n").unwrap_err();
        assert_eq!(
            e.to_string(),
            "cat/syzygy.toml: [rules]: unknown rule 'inconsistant' (did you mean 'inconsistent'?)"
        );
        assert!(layer("[rules]\ninconsistent = \"loud\"\n")
            .unwrap_err()
            .reason
            .contains("expected"));
        assert!(layer("[derivation]\nsamples = 0\n").is_err());
        // One sample would show a single random draw as an exact value.
        for few in ["1", "99"] {
            let e = crate::derive::SampleCount::parse(few).unwrap_err();
            assert!(e.contains("from 100 to"), "{e}");
        }
        assert!(crate::derive::SampleCount::parse("100").is_ok());
        assert!(layer("[derivation]\nsamples = \"many\"\n")
            .unwrap_err()
            .reason
            .contains("\"auto\""));
        let auto = Settings::resolve(
            Some(&layer("[derivation]\nsamples = \"auto\"\n").unwrap()),
            &Layer::default(),
        );
        assert!(auto.options.adaptive && auto.options.samples == 10_000);
        // A count given later (the command line) turns adaptive sampling off again.
        let fixed = Settings::resolve(
            Some(&layer("[derivation]\nsamples = \"auto\"\n").unwrap()),
            &Layer {
                samples: Some(crate::derive::SampleCount::Fixed(500)),
                ..Layer::default()
            },
        );
        assert!(!fixed.options.adaptive && fixed.options.samples == 500);
        assert!(layer("[derivaton]\n").is_err());
        assert!(layer("not toml [").is_err());
        assert_eq!(layer("").unwrap(), Layer::default());
        assert!(layer("[references]\nfiles = [\" \"]\n").is_err());
        assert!(layer("[references]\nfile = [\"r.syz\"]\n").is_err());
        let shared = layer("[references]\nfiles = [\"r.syz\", \"more/s.syz\"]\n").unwrap();
        assert_eq!(
            Settings::resolve(Some(&shared), &Layer::default()).reference_files,
            vec!["r.syz", "more/s.syz"]
        );
        assert_eq!(
            ProjectFileError::unreadable("a/syzygy.toml", "permission denied").to_string(),
            "a/syzygy.toml: cannot be read: permission denied"
        );
    }

    #[test]
    fn a_bad_project_file_is_an_io_error_on_the_first_line() {
        let e = layer("[derivation]\nsamples = 0\n").unwrap_err();
        let d = e.diagnostic(FileId(3), "system \"A\" {\r\n}\n");
        assert_eq!((d.rule, d.severity), (Rule::Io, Severity::Error));
        assert_eq!(d.span, Span::new(FileId(3), 0, 12));
        assert_eq!(d.message, e.to_string());
        assert_eq!(e.diagnostic(FileId(0), "").span, Span::default());
    }

    /// A value of the wrong type names its line and what it holds, in words (`seed = -7`
    /// said only "invalid value: integer `-7`, expected u64").
    #[test]
    fn a_value_of_the_wrong_type_names_its_line() {
        let said = |text: &str| layer(text).unwrap_err().reason;
        assert_eq!(
            said("[derivation]\nseed = -7\n"),
            "line 2 (`seed = -7`): invalid value: integer `-7`, expected a whole number, 0 or more"
        );
        assert_eq!(
            said("[rules]\n\n[site]\nlatitude = \"north\"\n"),
            "line 4 (`latitude = \"north\"`): invalid type: string \"north\", expected a number"
        );
        // One line, whatever the parser's message holds.
        assert!(!said("[derivation\nseed = 1\n").contains('\n'));
    }

    #[test]
    fn the_editor_keeps_the_project_but_propagates_to_first_order() {
        let project = layer(
            "[rules]\nunstable-spacing = \"off\"\n[derivation]\npropagation = \"monte-carlo\"\nconsistency_sigma = 4.0\n",
        )
        .unwrap();
        let e = EditorSettings::new(Some(&project));
        let cli = Settings::resolve(Some(&project), &Layer::default());
        assert_eq!(e.settings.overrides, cli.overrides);
        assert_eq!(e.settings.options.consistency_sigma, 4.0);
        assert_eq!(e.settings.options.propagation, Propagation::Linear);
        let m = e.method();
        assert_eq!(
            m.line,
            "first-order propagation (the editor's choice for speed; `syz eval` uses Monte Carlo per syzygy.toml, so the last digits may differ)"
        );
        assert_eq!(m.tag.as_deref(), Some("first-order"));
        assert!(EditorSettings::new(None)
            .method()
            .line
            .contains("`syz eval` uses Monte Carlo by default"));
        let linear = layer("[derivation]\npropagation = \"linear\"\n").unwrap();
        let m = EditorSettings::new(Some(&linear)).method();
        assert_eq!(
            m.line,
            "first-order propagation, as `syz eval` uses per syzygy.toml"
        );
        assert_eq!(m.tag, None);
    }

    #[test]
    fn a_site_is_read_in_degrees_east_positive() {
        let l = layer("[site]\nlatitude = 28.76\nlongitude = -17.88\nelevation = 2300\n").unwrap();
        let site = l.site.unwrap();
        assert!((site.longitude.to_degrees() + 17.88).abs() < 1e-12);
        assert_eq!(site.elevation_m, 2300.0);
        let s = Settings::resolve(Some(&l), &Layer::default());
        assert_eq!(s.site, Some(site));
        let e = layer("[site]\nlatitude = 28.76\n").unwrap_err();
        assert!(e.reason.contains("both latitude and longitude"), "{e}");
        let e = layer("[site]\nlatitude = 128.76\nlongitude = 1\n").unwrap_err();
        assert!(e.reason.contains("[site]: latitude"), "{e}");
    }
}
