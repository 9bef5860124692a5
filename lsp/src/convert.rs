//! Core data to protocol types. Positions go through the snapshot in the negotiated
//! encoding; nothing here knows any physics.

use crate::documents::{Encoding, Snapshot};
use syzygy::diagnostic::{Diagnostic, Rule, Severity};
use syzygy::ide::complete::CompletionKind;
use syzygy::ide::outline::{Node, NodeKind, TokenClass};
use tower_lsp::lsp_types as lsp;
use tower_lsp::lsp_types::Url;

/// The diagnostics published for a file: the first `syzygy::shown::PER_FILE` of each
/// severity, then one of severity information, where the first one left out is, counting the
/// rest.
pub fn diagnostics(
    all: &[Diagnostic],
    snap: &Snapshot,
    uri: &Url,
    enc: Encoding,
) -> Vec<lsp::Diagnostic> {
    let (shown, left_out) = syzygy::shown::split(all);
    let mut out: Vec<lsp::Diagnostic> = shown
        .iter()
        .map(|d| diagnostic(d, snap, uri, enc))
        .collect();
    let first_left_out = all
        .iter()
        .zip(shown.iter().map(Some).chain(std::iter::repeat(None)))
        .find(|(d, s)| !s.is_some_and(|s| std::ptr::eq(*d, *s)))
        .map(|(d, _)| d);
    if let (Some(first), true) = (first_left_out, left_out > 0) {
        out.push(lsp::Diagnostic {
            range: snap.range(first.span, enc),
            severity: Some(lsp::DiagnosticSeverity::INFORMATION),
            source: Some("syzygy".to_string()),
            message: syzygy::shown::rest_words(left_out),
            ..lsp::Diagnostic::default()
        });
    }
    out
}

pub fn diagnostic(d: &Diagnostic, snap: &Snapshot, uri: &Url, enc: Encoding) -> lsp::Diagnostic {
    diagnostic_in(d, &|_| Some((uri, snap)), enc)
        .unwrap_or_else(|| lsp::Diagnostic::new_simple(snap.range(d.span, enc), d.message.clone()))
}

/// A diagnostic whose spans may lie in several files: `file` gives each span's file (its
/// URI and text); `None` when the primary span's file is unknown. A label in an unknown file
/// is left out.
pub fn diagnostic_in<'a>(
    d: &Diagnostic,
    file: &dyn Fn(syzygy::source::FileId) -> Option<(&'a Url, &'a Snapshot)>,
    enc: Encoding,
) -> Option<lsp::Diagnostic> {
    let (_, snap) = file(d.span.file)?;
    let mut message = d.message.clone();
    for n in &d.notes {
        message.push_str(&format!("\nnote: {n}"));
    }
    if let Some(h) = &d.help {
        message.push_str(&format!("\nhelp: {h}"));
    }
    let related: Vec<lsp::DiagnosticRelatedInformation> = d
        .labels
        .iter()
        .filter_map(|l| {
            let (uri, at) = file(l.span.file)?;
            Some(lsp::DiagnosticRelatedInformation {
                location: lsp::Location {
                    uri: uri.clone(),
                    range: at.range(l.span, enc),
                },
                message: l.message.clone(),
            })
        })
        .collect();
    Some(lsp::Diagnostic {
        range: snap.range(d.span, enc),
        severity: Some(match d.severity {
            Severity::Error => lsp::DiagnosticSeverity::ERROR,
            Severity::Warning => lsp::DiagnosticSeverity::WARNING,
            Severity::Note => lsp::DiagnosticSeverity::INFORMATION,
        }),
        code: Some(lsp::NumberOrString::String(d.rule.id().to_string())),
        code_description: None,
        source: Some("syzygy".to_string()),
        message,
        related_information: (!related.is_empty()).then_some(related),
        tags: (d.rule == Rule::UnusedAllow).then(|| vec![lsp::DiagnosticTag::UNNECESSARY]),
        data: None,
    })
}

pub fn completion_kind(k: CompletionKind) -> lsp::CompletionItemKind {
    match k {
        CompletionKind::Quantity => lsp::CompletionItemKind::PROPERTY,
        CompletionKind::Unit => lsp::CompletionItemKind::UNIT,
        CompletionKind::Body => lsp::CompletionItemKind::CLASS,
        CompletionKind::Ref => lsp::CompletionItemKind::REFERENCE,
        CompletionKind::Keyword => lsp::CompletionItemKind::KEYWORD,
        CompletionKind::Binding => lsp::CompletionItemKind::VARIABLE,
        CompletionKind::Function => lsp::CompletionItemKind::FUNCTION,
        CompletionKind::Constant => lsp::CompletionItemKind::CONSTANT,
    }
}

fn symbol_kind(k: NodeKind) -> lsp::SymbolKind {
    match k {
        NodeKind::Ref => lsp::SymbolKind::KEY,
        NodeKind::System => lsp::SymbolKind::NAMESPACE,
        NodeKind::Star | NodeKind::Planet => lsp::SymbolKind::OBJECT,
        NodeKind::Quantity => lsp::SymbolKind::PROPERTY,
        NodeKind::Binding => lsp::SymbolKind::VARIABLE,
    }
}

#[allow(deprecated)] // `DocumentSymbol::deprecated` must still be given
pub fn document_symbol(n: &Node, snap: &Snapshot, enc: Encoding) -> lsp::DocumentSymbol {
    let range = snap.range(n.span, enc);
    let mut selection = snap.range(n.selection, enc);
    // The protocol wants the selection inside the range.
    if selection.start < range.start || selection.end > range.end {
        selection = range;
    }
    lsp::DocumentSymbol {
        name: if n.name.is_empty() {
            "(unnamed)".to_string()
        } else {
            n.name.clone()
        },
        detail: (!n.detail.is_empty()).then(|| n.detail.clone()),
        kind: symbol_kind(n.kind),
        tags: None,
        deprecated: None,
        range,
        selection_range: selection,
        children: Some(
            n.children
                .iter()
                .map(|c| document_symbol(c, snap, enc))
                .collect(),
        ),
    }
}

/// The token types, in legend order.
pub const TOKEN_TYPES: &[lsp::SemanticTokenType] = &[
    lsp::SemanticTokenType::KEYWORD,
    lsp::SemanticTokenType::COMMENT,
    lsp::SemanticTokenType::STRING,
    lsp::SemanticTokenType::NUMBER,
    lsp::SemanticTokenType::OPERATOR,
    lsp::SemanticTokenType::PROPERTY,
    lsp::SemanticTokenType::CLASS,
    lsp::SemanticTokenType::VARIABLE,
    lsp::SemanticTokenType::NAMESPACE,
    lsp::SemanticTokenType::TYPE,
    lsp::SemanticTokenType::FUNCTION,
];

fn token_index(c: TokenClass) -> u32 {
    match c {
        TokenClass::Keyword => 0,
        TokenClass::Comment => 1,
        TokenClass::String => 2,
        TokenClass::Number => 3,
        TokenClass::Operator => 4,
        TokenClass::Quantity => 5,
        TokenClass::Body => 6,
        TokenClass::Binding => 7,
        TokenClass::Reference => 8,
        TokenClass::Unit => 9,
        TokenClass::Function => 10,
    }
}

pub fn semantic_tokens(
    classes: &[(syzygy::source::Span, TokenClass)],
    snap: &Snapshot,
    enc: Encoding,
) -> Vec<lsp::SemanticToken> {
    let mut out = Vec::with_capacity(classes.len());
    let (mut last_line, mut last_col) = (0u32, 0u32);
    for (span, class) in classes {
        let start = snap.position(span.start as usize, enc);
        let end = snap.position(span.end as usize, enc);
        if end.line != start.line || end.character <= start.character {
            continue;
        }
        let delta_line = start.line - last_line;
        let delta_start = if delta_line == 0 {
            start.character - last_col
        } else {
            start.character
        };
        out.push(lsp::SemanticToken {
            delta_line,
            delta_start,
            length: end.character - start.character,
            token_type: token_index(*class),
            token_modifiers_bitset: 0,
        });
        last_line = start.line;
        last_col = start.character;
    }
    out
}
