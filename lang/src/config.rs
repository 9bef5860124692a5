//! The project file `syzygy.toml`: rule severities and derivation settings shared by a
//! catalogue. Front ends find the file (walking up from the checked files) and pass its
//! text here; command-line options then override it.
//!
//! ```toml
//! [rules]
//! inconsistent = "error"        # error | warning | note | off
//! unstable-spacing = "off"
//!
//! [derivation]
//! propagation = "linear"        # monte-carlo | linear
//! samples = 5000
//! seed = 7
//! consistency_sigma = 3.0
//! ```

use crate::derive::{Options, Propagation};
use crate::diagnostic::{Rule, Severity, SeverityOverride};
use serde::Deserialize;
use std::collections::BTreeMap;

/// The name front ends look for.
pub const FILE_NAME: &str = "syzygy.toml";

#[derive(Debug, Clone, Default, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
struct Raw {
    #[serde(default)]
    rules: BTreeMap<String, String>,
    #[serde(default)]
    derivation: RawDerivation,
}

#[derive(Debug, Clone, Default, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawDerivation {
    propagation: Option<String>,
    samples: Option<u64>,
    seed: Option<u64>,
    consistency_sigma: Option<f64>,
}

/// A parsed project file.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct ProjectConfig {
    pub overrides: Vec<SeverityOverride>,
    pub propagation: Option<Propagation>,
    pub samples: Option<usize>,
    pub seed: Option<u64>,
    pub consistency_sigma: Option<f64>,
}

impl ProjectConfig {
    /// Parse the text of a `syzygy.toml`. Errors are sentences fit to show as they are.
    pub fn parse(text: &str) -> Result<ProjectConfig, String> {
        let raw: Raw = toml::from_str(text).map_err(|e| e.message().to_string())?;
        let mut overrides = Vec::new();
        for (id, level) in &raw.rules {
            let rule = Rule::from_id(id).ok_or_else(|| {
                let near = crate::text::closest(id, Rule::ALL.iter().map(|r| r.id()));
                match near {
                    Some(n) => format!("[rules]: unknown rule '{id}' (did you mean '{n}'?)"),
                    None => format!("[rules]: unknown rule '{id}'"),
                }
            })?;
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
        let samples = match d.samples {
            None => None,
            Some(n) if (1..=10_000_000).contains(&n) => Some(n as usize),
            Some(n) => {
                return Err(format!(
                    "[derivation]: samples = {n}: expected 1 to 10000000"
                ))
            }
        };
        if let Some(s) = d.consistency_sigma {
            if !(s.is_finite() && s > 0.0) {
                return Err(format!(
                    "[derivation]: consistency_sigma = {s}: expected a positive number"
                ));
            }
        }
        Ok(ProjectConfig {
            overrides,
            propagation,
            samples,
            seed: d.seed,
            consistency_sigma: d.consistency_sigma,
        })
    }

    /// The derivation options this file asks for, over `base`.
    pub fn apply(&self, mut base: Options) -> Options {
        if let Some(p) = self.propagation {
            base.propagation = p;
        }
        if let Some(n) = self.samples {
            base.samples = n;
        }
        if let Some(s) = self.seed {
            base.seed = s;
        }
        if let Some(s) = self.consistency_sigma {
            base.consistency_sigma = s;
        }
        base
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn full_file() {
        let c = ProjectConfig::parse(
            "[rules]\ninconsistent = \"error\"\nunstable-spacing = \"off\"\n[derivation]\npropagation = \"linear\"\nsamples = 500\nseed = 9\nconsistency_sigma = 5.0\n",
        )
        .unwrap();
        assert_eq!(
            c.overrides,
            vec![
                (Rule::Inconsistent, Some(Severity::Error)),
                (Rule::UnstableSpacing, None)
            ]
        );
        let o = c.apply(Options::default());
        assert_eq!(o.propagation, Propagation::Linear);
        assert_eq!((o.samples, o.seed, o.consistency_sigma), (500, 9, 5.0));
    }

    #[test]
    fn mistakes_are_explained() {
        let e = ProjectConfig::parse("[rules]\ninconsistant = \"error\"\n").unwrap_err();
        assert!(e.contains("did you mean 'inconsistent'"), "{e}");
        assert!(ProjectConfig::parse("[rules]\ninconsistent = \"loud\"\n")
            .unwrap_err()
            .contains("expected"));
        assert!(ProjectConfig::parse("[derivation]\nsamples = 0\n").is_err());
        assert!(ProjectConfig::parse("[derivaton]\n").is_err());
        assert!(ProjectConfig::parse("not toml [").is_err());
        assert_eq!(ProjectConfig::parse("").unwrap(), ProjectConfig::default());
    }
}
