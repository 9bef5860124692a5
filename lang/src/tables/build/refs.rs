//! The references of a row: the key and text columns of `[refs]`, made ids once per text.

use super::super::mapping::Plan;
use super::super::names::{ref_name, syzygy_name};
use super::super::{IssueKind, Row};
use super::Importer;
use crate::model::normalized_text;
use std::collections::BTreeSet;

impl Importer {
    /// The ids of the references a row names in the `[refs]` columns. A key that differs
    /// from the one a text first came with, and a key without a text, are issues (they were
    /// dropped without a word).
    pub(super) fn row_refs(&mut self, row: &Row, plan: &Plan) -> BTreeSet<String> {
        let cell = |i: Option<usize>| -> &str {
            i.and_then(|i| row.cells.get(i)).map_or("", |s| s.as_str())
        };
        let mut row_refs = BTreeSet::new();
        let key = cell(plan.ref_key).to_string();
        for &c in &plan.ref_text {
            let text = cell(Some(c)).to_string();
            if !text.is_empty() {
                let known = self.ref_ids.contains_key(&normalized_text(&text));
                let id = self.ref_id(&text, &key);
                let first = self
                    .ref_keys
                    .get(&normalized_text(&text))
                    .cloned()
                    .unwrap_or_default();
                let wanted = syzygy_name(&key, "ref");
                if !known && !key.is_empty() && id != wanted {
                    // The key already names another text: a copied key, most likely.
                    let other = self.ref_texts.get(&wanted).cloned().unwrap_or_default();
                    self.issue(IssueKind::Conflict, row, plan.ref_key, format!("the reference key `{key}` was given to another text earlier (\"{other}\"), so this text is imported as `{id}`; check which paper the key belongs to"));
                }
                if !key.is_empty() && first != key {
                    self.summary.skipped_cells += 1;
                    let said = if first.is_empty() {
                        "no key".to_string()
                    } else {
                        format!("the key `{first}`")
                    };
                    self.issue(IssueKind::Unused, row, plan.ref_key, format!("an earlier row gives this reference text {said}, so it keeps the id `{id}`; this row's key `{key}` is not used"));
                }
                row_refs.insert(id);
            }
        }
        if row_refs.is_empty() && !key.is_empty() && !plan.ref_text.is_empty() {
            self.summary.skipped_cells += 1;
            self.issue(IssueKind::Unused, row, plan.ref_key, format!("the reference key `{key}` has no reference text in this row, so this row's values cite nothing and the key is not imported"));
        }
        row_refs
    }

    /// The id of a reference text (the key column's cell made a name when given, else a name
    /// made from the text); one text keeps one id for the whole import, texts that differ
    /// only in case and runs of white space being one text (as `syz check` compares them: a
    /// paper typed three ways was three sources, and a weighted mean counted it thrice).
    pub(super) fn ref_id(&mut self, text: &str, key: &str) -> String {
        let norm = normalized_text(text);
        if let Some(id) = self.ref_ids.get(&norm) {
            return id.clone();
        }
        let base = if key.is_empty() {
            ref_name(text)
        } else {
            syzygy_name(key, "ref")
        };
        let id = self.ref_names.fresh(&base);
        self.ref_ids.insert(norm.clone(), id.clone());
        self.ref_keys.insert(norm, key.to_string());
        self.ref_texts.insert(id.clone(), text.to_string());
        id
    }
}
