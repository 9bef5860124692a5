//! Measurements written without an uncertainty (`mass = 1.05 Msun`): taken as exact, they
//! add nothing to the uncertainties derived from them, which then look far more precise than
//! the data are (`teq 1278.109 ± 0.010 K`). For a star's mass, radius or temperature, or a
//! planet's amplitude, depth or size, that is almost always a forgotten uncertainty; a note
//! says so once per body. A value marked `assumed`, or set on the command line, is meant as
//! written and is left alone; so are quantities often fixed on purpose (an eccentricity of
//! 0, an albedo) and the period, whose published uncertainty is usually negligible; and so
//! is a system that gives no uncertainty anywhere, a sketch on purpose.

use crate::derive::Derivation;
use crate::diagnostic::{Diagnostic, Rule};
use crate::model::{Body, Content, Form};
use crate::quantities::Qty;

/// The quantities a note is given for when declared without an uncertainty.
fn measured(q: Qty) -> bool {
    matches!(
        q,
        Qty::StarMass
            | Qty::StarRadius
            | Qty::Teff
            | Qty::LogG
            | Qty::StarDensity
            | Qty::Luminosity
            | Qty::RvAmplitude
            | Qty::TransitDepth
            | Qty::RadiusRatio
            | Qty::Mass
            | Qty::MinMass
            | Qty::Radius
            | Qty::ScaledAxis
            | Qty::TransitDuration
            | Qty::TransitDurationFull
    )
}

/// One note per body naming its measured quantities declared without an uncertainty, at
/// the first of them, with a label at each other.
pub(super) fn exact_measurements(d: &Derivation, diags: &mut Vec<Diagnostic>) {
    // A system written without any uncertainty is a sketch on purpose; one that gives
    // uncertainties elsewhere and none here has probably lost one. Uncertainties on the
    // quantities this note is about count; a limit or a period's tiny uncertainty does not
    // make a sketch a measured system. Looked at once per system.
    let uncertain_elsewhere = d.sys.bodies.iter().flat_map(|b| &b.declared).any(|decl| {
        measured(decl.qty)
            && matches!(&decl.content, Content::Measured(m) if matches!(m.form, Form::Symmetric | Form::Asymmetric))
    });
    if !uncertain_elsewhere {
        return;
    }
    for (bi, body) in d.sys.bodies.iter().enumerate() {
        body_note(d, bi, body, diags);
    }
}

/// The note of body `bi`, if it has measurements without an uncertainty.
fn body_note(d: &Derivation, bi: usize, body: &Body, diags: &mut Vec<Diagnostic>) {
    let exact: Vec<_> = body
        .declared
        .iter()
        .chain(&body.further)
        .filter(|decl| {
            measured(decl.qty)
                && !decl.assumed
                && decl.set.is_none()
                && matches!(&decl.content, Content::Measured(m) if m.form == Form::Exact)
        })
        .collect();
    let Some(first) = exact.iter().min_by_key(|decl| decl.span.start) else {
        return;
    };
    let names: Vec<String> = exact
        .iter()
        .map(|decl| d.key_name((bi, decl.qty)))
        .collect();
    let (is, each, it, its) = if names.len() == 1 {
        ("is", "it is", "it", "its")
    } else {
        ("are", "each is", "them", "their")
    };
    let mut diag = Diagnostic::new(
        Rule::NoUncertainty,
        first.span,
        format!(
            "{} {is} declared without an uncertainty: {each} taken as exact, so what is derived from {it} carries none of {its} uncertainty and looks more precise than the data are",
            crate::text::and_list(&names),
        ),
    )
    .with_help("give each its published uncertainty (`value ± uncertainty unit`, or `+above/-below`), or mark a value meant as exact `assumed`");
    for decl in exact.iter().filter(|x| x.span != first.span) {
        diag = diag.with_label(
            decl.span,
            format!("{} has no uncertainty", d.key_name((bi, decl.qty))),
        );
    }
    diags.push(diag);
}
