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
/// `lines` holds each body's own lines ([`body_lines_of`]).
pub(super) fn assumed_lines(sys: &System, lines: &[Vec<String>], bi: usize) -> Vec<String> {
    let own = |i: usize| lines.get(i).cloned().unwrap_or_default();
    let mine = own(bi);
    let host = sys
        .bodies
        .get(bi)
        .and_then(|b| b.orbits)
        .filter(|h| sys.bodies.get(*h).is_some_and(|h| h.kind == BodyKind::Star));
    let Some(h) = host else {
        return mine;
    };
    let theirs = lines.get(h).map_or(&[][..], |l| &l[..]);
    let (shared, kept): (Vec<&String>, Vec<&String>) =
        mine.iter().partition(|s| theirs.binary_search(s).is_ok());
    if shared.len() < FOLDED {
        return mine;
    }
    let mut lines: Vec<String> = kept.into_iter().cloned().collect();
    let id = sys.bodies.get(h).map_or("", |b| b.id.as_str());
    let n = shared.len();
    lines.push(if n == theirs.len() {
        format!("the {n} assumptions listed under star {id} (its values enter these)")
    } else {
        format!(
            "{n} of the {} assumptions listed under star {id}: {} (its values enter these)",
            theirs.len(),
            shared
                .iter()
                .map(|s| short(s))
                .collect::<Vec<_>>()
                .join("; ")
        )
    });
    lines
}

/// Every body's assumption lines ([`body_lines`]), in the system's order.
pub(super) fn body_lines_of(res: &SystemResult) -> Vec<Vec<String>> {
    (0..res.bodies.len()).map(|i| body_lines(res, i)).collect()
}

/// The assumption lines of body `i`, sorted, each once. A line that speaks of one value
/// ("sampled, not first-order: its first-order uncertainty is 57% of the value") names the
/// values it speaks of.
fn body_lines(res: &SystemResult, i: usize) -> Vec<String> {
    let Some(r) = res.bodies.get(i) else {
        return Vec::new();
    };
    let mut plain: Vec<String> = Vec::new();
    let mut of_values: Vec<(&str, &str)> = Vec::new();
    for q in &r.quantities {
        for a in &q.assumptions {
            if crate::derive::validity::is_interval_note(a) {
                of_values.push((crate::quantities::def(q.qty).name, a));
            } else {
                plain.push(a.clone());
            }
        }
    }
    plain.extend(grouped(of_values));
    plain.sort();
    plain.dedup();
    plain
}

/// Sentences about one value each, `(value, sentence)`, one line per distinct sentence with
/// the values it is about: `mass, density: 3.7% of the Monte Carlo samples gave no value`,
/// in the order first met.
pub(super) fn grouped<'a>(items: impl IntoIterator<Item = (&'a str, &'a str)>) -> Vec<String> {
    let mut groups: Vec<(&str, Vec<&str>)> = Vec::new();
    for (name, text) in items {
        match groups.iter_mut().find(|(t, _)| *t == text) {
            Some((_, names)) => {
                if !names.contains(&name) {
                    names.push(name);
                }
            }
            None => groups.push((text, vec![name])),
        }
    }
    groups
        .into_iter()
        .map(|(text, names)| format!("{}: {text}", names.join(", ")))
        .collect()
}

/// The first words of an assumption, to name it in a pointer.
fn short(s: &str) -> String {
    const MOST: usize = 48;
    let end = s.find([':', ';']).unwrap_or(s.len());
    if end <= MOST {
        return s[..end].trim_end().to_string();
    }
    // At a word boundary before the most.
    let cut = s[..end]
        .char_indices()
        .take_while(|(i, _)| *i <= MOST)
        .filter(|(_, c)| *c == ' ')
        .map(|(i, _)| i)
        .last()
        .unwrap_or(end.min(MOST));
    let cut = (0..=cut)
        .rev()
        .find(|i| s.is_char_boundary(*i))
        .unwrap_or(0);
    format!("{} ...", s[..cut].trim_end())
}
