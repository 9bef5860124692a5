//! How much of one system is read: a bound on the bodies of a system, so that the results
//! of one system, held whole until it is written, stay small whatever the file holds, and one
//! on its `let` bindings, so that the work of first-order propagation stays bounded.

use crate::ast;
use crate::diagnostic::{Diagnostic, Rule};
use crate::source::Span;

/// The most bodies read in one system. A planetary system is a star (or a few) and its
/// planets; a thousand is far past any, and at about 10 kB of results per body (more in
/// Monte Carlo) it keeps one system in tens of megabytes. Before the bound, one system of
/// 100,000 stars (a 5 MB file) took over a gigabyte.
pub const MAX_SYSTEM_BODIES: usize = 1000;

/// The error on a body past the bound: it is not read. Each such body has its own, so that
/// every value it declares is listed as not used with this reason; the first says how to
/// fix it.
pub(super) fn too_many_bodies(s: &ast::SystemDecl, b: &ast::BodyDecl, first: bool) -> Diagnostic {
    let d = Diagnostic::new(
        Rule::TooManyBodies,
        b.name.span,
        format!(
            "{} '{}' is not read: system \"{}\" already has {MAX_SYSTEM_BODIES} bodies, the most \
             one system is read with",
            b.kind.as_str(),
            b.name.name,
            s.name
        ),
    );
    if !first {
        return d;
    }
    d.with_note(
        "this body and the ones after it in the system are not derived or checked; a bound \
         keeps one system's results small",
    )
    .with_help(
        "a system is a star (or a few) with its planets: put each other star and its planets \
         in a system of its own",
    )
}

/// What is said where a body past the bound is named (`orbits`, `body.quantity`, hover,
/// `syz explain`): that it is declared but not read, and why.
pub fn not_read(system: &str, id: &str) -> String {
    format!(
        "'{id}' is declared but not read: system \"{system}\" has more than {MAX_SYSTEM_BODIES} bodies, the most one system is read with (too-many-bodies)"
    )
}

/// The most `let` bindings evaluated in one system (its own and its bodies', in the order
/// written). A value's first-order uncertainty keeps one slope per uncertain input it rests
/// on, so a chain of bindings that each add an uncertain number costs the square of its
/// length: 32,000 such bindings (a 1 MB file) took 4 s, and ten times as many would take
/// minutes. A thousand is far past what a system's derivation needs, and keeps the square
/// under a second.
pub const MAX_SYSTEM_BINDINGS: usize = 1000;

/// The error on the first binding of a scope (`owner`: a body's kind and id, `None` for the
/// system's own) past the bound, naming how many of that scope (`count`, itself included)
/// are not evaluated; what uses them has no value. The first such error says how to fix it.
pub(super) fn too_many_bindings(
    system: &str,
    owner: Option<(&str, &str)>,
    (name, span): (&str, Span),
    count: usize,
    first: bool,
) -> Diagnostic {
    let scope = match owner {
        Some((kind, id)) => format!("of {kind} '{id}'"),
        None => format!("of system \"{system}\""),
    };
    let which = match count {
        1 => format!("let '{name}' {scope} is not evaluated"),
        n => format!(
            "let '{name}' and the {} bindings {scope} after it are not evaluated",
            n - 1
        ),
    };
    let d = Diagnostic::new(
        Rule::TooManyBindings,
        span,
        format!(
            "{which}: system \"{system}\" already has {MAX_SYSTEM_BINDINGS} bindings, the most \
             one system is evaluated with (its own first, then its bodies', as written)"
        ),
    );
    if !first {
        return d;
    }
    d.with_note(
        "values that use a binding not evaluated are not derived (`syz eval` lists them as not \
         used); a bound keeps the work of propagating uncertainties small",
    )
    .with_help(
        "compute long series of numbers outside the file and write the results as \
         measurements, or split the work over several systems",
    )
}
