//! The end-to-end tests of the real `syz` binary, one module per subject, in one test
//! binary (`cargo test -p syzygy-e2e --test e2e`; a filter such as `lsp::` runs one module).

mod beyond;
mod catalogue;
mod cli;
mod completions;
mod csv;
mod diff;
mod edges;
mod emitters;
mod eval;
mod expressions;
mod fmt;
mod ide;
mod import;
mod lsp;
mod lsp_bench;
mod lsp_catalogue;
mod lsp_project_file;
mod lsp_soak;
mod messages;
mod plot_layout;
mod project_file;
mod readme;
mod sarif;
mod scale;
mod severity;
mod site;
mod snapshots;
mod sources;
mod votable;
