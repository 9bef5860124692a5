//! Shared references: the `ref` declarations of the files a project file names under
//! `[references] files`, citable from every file under that project file.
//!
//! A file's own `ref` of the same id wins (the file then means the same with or without the
//! project); if its text differs from the shared one, lowering reports `ref-shadows-shared`.

use crate::source::{FileId, LineIndex};

/// One shared reference and where it is declared.
#[derive(Debug, Clone, PartialEq)]
pub struct SharedRef {
    pub id: String,
    pub text: String,
    /// The shared file's name, as the front end gave it.
    pub file: String,
    /// The 1-based line of its declaration.
    pub line: u32,
}

impl SharedRef {
    /// `file:line`, as messages name the place.
    pub fn place(&self) -> String {
        format!("{}:{}", self.file, self.line)
    }
}

/// The shared references of one project, in the order of the files and of their lines. Only
/// the first declaration of an id counts (a second one is the `duplicate` its own file
/// reports when checked).
#[derive(Debug, Clone, PartialEq, Default)]
pub struct SharedRefs {
    refs: Vec<SharedRef>,
    /// Position in `refs` by id.
    index: std::collections::HashMap<String, usize>,
    /// The shared files' names, in order.
    files: Vec<String>,
}

impl SharedRefs {
    /// The references of the named texts (file name, text), in order. Syntax errors in a
    /// shared file are reported when that file is itself checked; here only its `ref`s count.
    pub fn from_files<'a>(files: impl IntoIterator<Item = (&'a str, &'a str)>) -> SharedRefs {
        let mut out = SharedRefs::default();
        for (name, text) in files {
            out.files.push(name.to_string());
            let parsed = crate::parser::parse(FileId::default(), text);
            let index = LineIndex::new(text);
            for r in parsed.file.refs {
                if out.index.contains_key(r.id.name.as_str()) {
                    continue;
                }
                out.index.insert(r.id.name.to_string(), out.refs.len());
                let line = index.line_col(text, r.id.span.start as usize).line;
                out.refs.push(SharedRef {
                    id: r.id.name.to_string(),
                    text: r.text,
                    file: name.to_string(),
                    line,
                });
            }
        }
        out
    }

    pub fn get(&self, id: &str) -> Option<&SharedRef> {
        self.index.get(id).and_then(|i| self.refs.get(*i))
    }

    pub fn iter(&self) -> impl Iterator<Item = &SharedRef> {
        self.refs.iter()
    }

    pub fn is_empty(&self) -> bool {
        self.files.is_empty()
    }

    /// The shared files' names, joined for a message: `references.syz`.
    pub fn file_names(&self) -> String {
        self.files.join(", ")
    }
}
