//! A catalogue: a folder of `.syz` files checked together.
//!
//! Two things need more than one file, and both live here so that `syz check` and the
//! language server agree on them:
//!
//! - [`shared`]: the references a project file names (`[references] files`), which every
//!   file under that project may cite. Lowering looks a citation up in the file's own `ref`s
//!   first, then here.
//! - [`across`]: the checks between the files under one project file (a catalogue: the
//!   project file marks it, as it names its shared references) — a system declared in two
//!   files, a star whose values disagree between files, one paper cited under two ids. Each file is reduced to a
//!   small [`across::Entry`] where it is analysed; the check then sorts the entries' keys, so
//!   it costs n log n in the number of systems, stars and references, never a pairwise loop.
//!
//! Like the rest of the core this does no I/O: front ends read the files and pass their text.

pub mod across;
pub mod shared;

pub use across::{check, Entry};
pub use shared::{SharedRef, SharedRefs};

#[cfg(test)]
mod tests;
