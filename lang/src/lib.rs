//! Syzygy's language core.
//!
//! Pipeline: [`lexer`] → [`parser`] → [`model`] (name resolution, units, measurements) →
//! derivations → physics checks → [`diagnostic`]s. The core does no I/O: front ends give it
//! text through [`source::SourceDb`].

pub mod ast;
pub mod constants;
pub mod diagnostic;
pub mod lexer;
pub mod parser;
pub mod source;
