//! The `assumed:` list of a body in the text report.

use crate::ast::BodyKind;
use crate::derive::SystemResult;
use crate::model::System;

/// Fewer lines shared with the host than this are repeated: a pointer to one or two lines
/// elsewhere reads worse than the lines.
const FOLDED: usize = 3;

/// The assumptions body `bi`'s values rest on, each once and sorted. A planet leaves out
/// those its host star's list has already (a spectral-type estimate of the star's mass, the
/// table it comes from), when there are at least [`FOLDED`], and says in one line where
/// they are: what a star assumes is spelt out under the star, not again under each of its
/// planets.
pub(super) fn assumed_lines(sys: &System, res: &SystemResult, bi: usize) -> Vec<String> {
    let own = |i: usize| -> Vec<&String> {
        let mut all: Vec<&String> = res
            .bodies
            .get(i)
            .map(|r| {
                r.quantities
                    .iter()
                    .flat_map(|q| q.assumptions.iter())
                    .collect()
            })
            .unwrap_or_default();
        all.sort();
        all.dedup();
        all
    };
    let mine = own(bi);
    let host = sys
        .bodies
        .get(bi)
        .and_then(|b| b.orbits)
        .filter(|h| sys.bodies.get(*h).is_some_and(|h| h.kind == BodyKind::Star));
    let Some(h) = host else {
        return mine.into_iter().cloned().collect();
    };
    let theirs = own(h);
    let (shared, kept): (Vec<&String>, Vec<&String>) =
        mine.iter().partition(|s| theirs.binary_search(s).is_ok());
    if shared.len() < FOLDED {
        return mine.into_iter().cloned().collect();
    }
    let mut lines: Vec<String> = kept.into_iter().cloned().collect();
    {
        let id = sys.bodies.get(h).map_or("", |b| b.id.as_str());
        lines.push(match shared.len() {
            1 => format!("the assumption listed under star {id} (its values enter these)"),
            n => format!("the {n} assumptions listed under star {id} (its values enter these)"),
        });
    }
    lines
}
