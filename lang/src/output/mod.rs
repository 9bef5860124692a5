//! What users see of an analysis: the text and JSON reports, `explain`, the data behind the
//! plots, upcoming transits, the rule catalogue's texts, and how many diagnostics are shown.

pub mod diff;
pub mod ephemeris;
pub mod plots;
pub mod report;
pub mod rule_docs;
pub mod shown;
pub mod table;
