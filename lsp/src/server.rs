//! The `LanguageServer` implementation: protocol types in, calls into `syzygy::ide`, protocol
//! types out. Document text is updated synchronously at the top of each notification (before
//! any `.await`), because tower-lsp runs handlers concurrently.

use crate::catalogue::Catalogue;
use crate::convert;
use crate::documents::{Documents, Encoding, Snapshot};
use crate::gate::Gates;
use crate::project::{project_file_path, Projects};
use std::collections::HashMap;
use std::sync::{Arc, OnceLock};
use syzygy::ide;
use tower_lsp::jsonrpc::{Error, Result};
use tower_lsp::lsp_types::*;
use tower_lsp::{Client, LanguageServer};

pub struct Backend {
    client: Client,
    state: Arc<State>,
}

#[derive(Default)]
struct State {
    docs: Documents,
    encoding: OnceLock<Encoding>,
    /// The project files of the documents, and the workspace folders that bound the search.
    projects: Projects,
    /// Whether the client lets the server register for changes of project files.
    can_watch: OnceLock<bool>,
    /// The checks between the files of the workspace folders.
    catalogue: Catalogue,
    /// One analysis of a document at a time (see [`crate::gate`]).
    gates: Gates,
}

impl State {
    fn enc(&self) -> Encoding {
        self.encoding.get().copied().unwrap_or(Encoding::Utf16)
    }
}

impl Backend {
    pub fn new(client: Client) -> Backend {
        Backend {
            client,
            state: Arc::new(State::default()),
        }
    }

    fn enc(&self) -> Encoding {
        self.state.enc()
    }

    /// Compute and publish diagnostics for one generation: at once if no analysis of the
    /// document is running, else after it ends, and only if no newer change came meanwhile
    /// ([`crate::gate`]); a generation overtaken during its analysis is dropped after it too.
    fn schedule_diagnostics(&self, uri: Url, snap: Arc<Snapshot>) {
        let state = self.state.clone();
        let client = self.client.clone();
        let gate = state.gates.of(&uri);
        tokio::spawn(async move {
            let _running = gate.lock().await;
            if !state.docs.is_current(&uri, snap.generation) {
                return;
            }
            let Some(analysis) = analysis_of(&snap, false).await else {
                return;
            };
            if !state.docs.is_current(&uri, snap.generation) {
                return;
            }
            // The document's entry in the checks between files, then its own diagnostics
            // with the findings between files placed in it.
            let roots = state.projects.roots();
            let changed = if roots.is_empty() {
                Vec::new()
            } else {
                let (st, u, sn, a) = (state.clone(), uri.clone(), snap.clone(), analysis.clone());
                tokio::task::spawn_blocking(move || {
                    st.catalogue.update(&u, sn, &a, &roots);
                    st.catalogue.recompute(st.enc(), &roots)
                })
                .await
                .unwrap_or_default()
            };
            if !state.docs.is_current(&uri, snap.generation) {
                return;
            }
            let enc = state.enc();
            let mut diags = convert::diagnostics(&analysis.diagnostics, &snap, &uri, enc);
            diags.extend(state.catalogue.findings(&uri));
            client
                .publish_diagnostics(uri.clone(), diags, Some(snap.version))
                .await;
            // Hover, rename and highlighting read the symbol occurrences: ready them now,
            // after the diagnostics rather than before.
            let warm = snap.clone();
            tokio::task::spawn_blocking(move || {
                let _ = warm.occurrences();
            });
            for other in changed.into_iter().filter(|u| *u != uri) {
                publish(&state, &client, other).await;
            }
        });
    }

    /// Read the workspace folders' files again and compare them, in the background; publish
    /// on the files whose findings changed.
    /// Compare the closed files of the workspace folders again; with `reuse`, a file
    /// unchanged on disk keeps its entry (its project's settings must not have changed).
    fn rescan_with(&self, reuse: bool) {
        let state = self.state.clone();
        let client = self.client.clone();
        tokio::spawn(async move {
            let st = state.clone();
            let scanned = tokio::task::spawn_blocking(move || {
                let roots = st.projects.roots();
                st.catalogue.keep_under(&roots);
                let over = st.catalogue.scan(&roots, &st.projects, reuse);
                (over, st.catalogue.recompute(st.enc(), &roots))
            })
            .await;
            let Ok((over, changed)) = scanned else {
                return;
            };
            if over {
                client
                    .log_message(
                        MessageType::WARNING,
                        format!(
                            "the workspace folders hold more .syz files than are compared with each other (at most {} files, {} MiB together): the first by path are compared",
                            crate::catalogue::MAX_FILES,
                            crate::catalogue::MAX_TOTAL_BYTES >> 20
                        ),
                    )
                    .await;
            }
            for uri in changed {
                publish(&state, &client, uri).await;
            }
        });
    }

    /// A file closed or changed on disk: compare it as it is on disk, in the background.
    fn reload(&self, uris: Vec<Url>) {
        let state = self.state.clone();
        let client = self.client.clone();
        tokio::spawn(async move {
            let st = state.clone();
            let reloaded = uris.clone();
            let changed = tokio::task::spawn_blocking(move || {
                for u in &reloaded {
                    st.catalogue.reload(u, &st.projects);
                }
                st.catalogue.recompute(st.enc(), &st.projects.roots())
            })
            .await
            .unwrap_or_default();
            let mut all: Vec<Url> = uris;
            all.extend(changed);
            all.sort();
            all.dedup();
            for uri in all {
                publish(&state, &client, uri).await;
            }
        });
    }

    /// Analyse again, and publish anew, every open document whose project changed (a project
    /// file was changed, created, deleted, or opened or closed in the editor).
    fn refresh_projects(&self) {
        let refreshed = self.state.docs.refresh(&self.state.projects);
        let any = !refreshed.is_empty();
        for (uri, snap, replaced) in refreshed {
            self.schedule_diagnostics(uri, snap);
            tokio::task::spawn_blocking(move || drop(replaced));
        }
        if any {
            // Closed files under a changed project are compared under its new settings.
            self.rescan_with(false);
        }
    }

    /// Ask the client to report changes of project files (`**/syzygy.toml`).
    fn watch_project_files(&self) {
        let options = DidChangeWatchedFilesRegistrationOptions {
            watchers: vec![
                FileSystemWatcher {
                    glob_pattern: GlobPattern::String(format!(
                        "**/{}",
                        syzygy::settings::FILE_NAME
                    )),
                    kind: None,
                },
                // Closed catalogue files, for the checks between files.
                FileSystemWatcher {
                    glob_pattern: GlobPattern::String("**/*.syz".to_string()),
                    kind: None,
                },
            ],
        };
        let registration = Registration {
            id: "syzygy-project-files".to_string(),
            method: "workspace/didChangeWatchedFiles".to_string(),
            register_options: serde_json::to_value(options).ok(),
        };
        let client = self.client.clone();
        // Not awaited here: the answer may take a while, and nothing waits for it.
        tokio::spawn(async move {
            if let Err(e) = client.register_capability(vec![registration]).await {
                client
                    .log_message(
                        MessageType::WARNING,
                        format!("project files are not watched ({e}); a change is noticed at the next edit"),
                    )
                    .await;
            }
        });
    }

    fn snapshot(&self, uri: &Url) -> Result<Arc<Snapshot>> {
        self.state.docs.get(uri).ok_or_else(|| {
            let mut e = Error::invalid_params(format!("{uri} is not open"));
            e.data = None;
            e
        })
    }
}

/// The snapshot's analysis, computed on a blocking thread if it is not there yet; with
/// `occurrences`, the symbol occurrences too (requests use them; diagnostics do not, and
/// warm them only after publishing, see [`Backend::schedule_diagnostics`]).
async fn analysis_of(snap: &Arc<Snapshot>, occurrences: bool) -> Option<Arc<syzygy::Analysis>> {
    if let Some(a) = snap.analysis_ready() {
        if !occurrences || snap.occurrences_ready() {
            return Some(a);
        }
    }
    let s = snap.clone();
    tokio::task::spawn_blocking(move || {
        let a = s.analysis();
        if occurrences {
            let _ = s.occurrences();
        }
        a
    })
    .await
    .ok()
}

/// Publish a file's diagnostics after its findings between files changed: an open
/// document's own (if analysed; else its own publication follows) with the findings, a closed
/// file's findings alone.
async fn publish(state: &Arc<State>, client: &Client, uri: Url) {
    let enc = state.enc();
    let findings = state.catalogue.findings(&uri);
    match state.docs.get(&uri) {
        Some(snap) => {
            let Some(analysis) = snap.analysis_ready() else {
                return;
            };
            let mut diags = convert::diagnostics(&analysis.diagnostics, &snap, &uri, enc);
            diags.extend(findings);
            client
                .publish_diagnostics(uri, diags, Some(snap.version))
                .await;
        }
        None => client.publish_diagnostics(uri, findings, None).await,
    }
}

async fn ready(snap: &Arc<Snapshot>) -> Result<Arc<syzygy::Analysis>> {
    analysis_of(snap, true)
        .await
        .ok_or_else(Error::internal_error)
}

fn edit(uri: &Url, edits: Vec<TextEdit>) -> WorkspaceEdit {
    WorkspaceEdit {
        changes: Some(HashMap::from([(uri.clone(), edits)])),
        document_changes: None,
        change_annotations: None,
    }
}

#[tower_lsp::async_trait]
impl LanguageServer for Backend {
    async fn initialize(&self, params: InitializeParams) -> Result<InitializeResult> {
        let utf8 = params
            .capabilities
            .general
            .as_ref()
            .and_then(|g| g.position_encodings.as_ref())
            .is_some_and(|e| e.contains(&PositionEncodingKind::UTF8));
        let enc = if utf8 {
            Encoding::Utf8
        } else {
            Encoding::Utf16
        };
        let _ = self.state.encoding.set(enc);
        match (params.workspace_folders, params.root_uri) {
            (Some(folders), _) => {
                for f in folders {
                    self.state.projects.add_root(&f.uri);
                }
            }
            (None, Some(root)) => self.state.projects.add_root(&root),
            (None, None) => {}
        }
        let can_watch = params
            .capabilities
            .workspace
            .as_ref()
            .and_then(|w| w.did_change_watched_files.as_ref())
            .and_then(|d| d.dynamic_registration)
            .unwrap_or(false);
        let _ = self.state.can_watch.set(can_watch);
        Ok(InitializeResult {
            server_info: Some(ServerInfo {
                name: "syzygy".to_string(),
                version: Some(env!("CARGO_PKG_VERSION").to_string()),
            }),
            capabilities: crate::capabilities::of(enc),
        })
    }

    async fn initialized(&self, _: InitializedParams) {
        if self.state.can_watch.get() == Some(&true) {
            self.watch_project_files();
        }
        // Compare the files of the workspace folders in the background.
        self.rescan_with(false);
        self.client
            .log_message(MessageType::INFO, "syzygy language server ready")
            .await;
    }

    async fn shutdown(&self) -> Result<()> {
        Ok(())
    }

    async fn did_open(&self, params: DidOpenTextDocumentParams) {
        let doc = params.text_document;
        if let Some(path) = project_file_path(&doc.uri) {
            // The editor's buffer of a project file stands for the file while it is open.
            self.state.projects.set_buffer(path, doc.text, doc.version);
            self.refresh_projects();
            return;
        }
        let snap =
            self.state
                .docs
                .open(doc.uri.clone(), doc.text, doc.version, &self.state.projects);
        self.schedule_diagnostics(doc.uri, snap);
        // Its project file may have changed unnoticed since the other documents were analysed.
        self.refresh_projects();
    }

    async fn did_change(&self, params: DidChangeTextDocumentParams) {
        let uri = params.text_document.uri;
        let version = params.text_document.version;
        if let Some(path) = project_file_path(&uri) {
            if let Some(text) = self.state.projects.buffer_text(&path) {
                let text =
                    crate::documents::apply_changes(&text, params.content_changes, self.enc());
                self.state.projects.set_buffer(path, text, version);
                self.refresh_projects();
            }
            return;
        }
        let snap = self.state.docs.change(
            &uri,
            version,
            params.content_changes,
            self.enc(),
            &self.state.projects,
        );
        match snap {
            Some((snap, replaced)) => {
                let project_changed = !Arc::ptr_eq(&snap.project, &replaced.project);
                self.schedule_diagnostics(uri, snap);
                tokio::task::spawn_blocking(move || drop(replaced));
                if project_changed {
                    // Noticed here (say, edited outside the editor): the other documents
                    // under the same file follow.
                    self.refresh_projects();
                }
            }
            None => {
                self.client
                    .log_message(
                        MessageType::WARNING,
                        format!("change to {uri}, which is not open"),
                    )
                    .await
            }
        }
    }

    async fn did_save(&self, _params: DidSaveTextDocumentParams) {
        // A client that cannot watch files never says a closed catalogue file changed on disk
        // (another tool, a `git pull`): at each save, the closed files are compared again as
        // they now are (a stat of each; only those changed are read again).
        if self.state.can_watch.get() != Some(&true) {
            self.rescan_with(true);
        }
    }

    async fn did_close(&self, params: DidCloseTextDocumentParams) {
        let uri = params.text_document.uri;
        if let Some(path) = project_file_path(&uri) {
            self.state.projects.close_buffer(&path);
            self.refresh_projects();
            return;
        }
        self.state.docs.close(&uri);
        self.state.gates.forget(&uri);
        self.client
            .publish_diagnostics(uri.clone(), Vec::new(), None)
            .await;
        // Under a workspace folder, the file on disk takes its place among the files compared.
        self.reload(vec![uri]);
    }

    async fn did_change_workspace_folders(&self, params: DidChangeWorkspaceFoldersParams) {
        for f in &params.event.removed {
            self.state.projects.remove_root(&f.uri);
        }
        for f in &params.event.added {
            self.state.projects.add_root(&f.uri);
        }
        // The folders bound the search for project files.
        self.refresh_projects();
        self.rescan_with(false);
    }

    async fn did_change_watched_files(&self, params: DidChangeWatchedFilesParams) {
        // A project file changed, was created or was deleted: read it again and analyse the
        // documents it applies to.
        let mut projects = false;
        for c in &params.changes {
            if let Some(path) = project_file_path(&c.uri) {
                self.state.projects.forget(&path);
                projects = true;
            } else if let Ok(path) = c.uri.to_file_path() {
                // A shared reference file of a project: its documents resolve citations
                // against it, so they are analysed again as `syz check` would see them.
                projects |= self.state.projects.forget_sharing(&path);
            }
        }
        if projects {
            self.refresh_projects();
        }
        // A closed .syz file changed on disk: compare it as it now is.
        let changed: Vec<Url> = params
            .changes
            .iter()
            .filter(|c| c.uri.path().ends_with(".syz") && self.state.docs.get(&c.uri).is_none())
            .map(|c| c.uri.clone())
            .collect();
        if !changed.is_empty() {
            self.reload(changed);
        }
        // Open documents are served from the editor's buffer, so a file deleted or changed
        // on disk changes nothing here until the editor says so.
        for c in params.changes {
            if c.typ == FileChangeType::DELETED && self.state.docs.get(&c.uri).is_some() {
                self.client
                    .log_message(
                        MessageType::INFO,
                        format!(
                            "{} was deleted on disk; still serving the open buffer",
                            c.uri
                        ),
                    )
                    .await;
            }
        }
    }

    async fn hover(&self, params: HoverParams) -> Result<Option<Hover>> {
        let p = params.text_document_position_params;
        let snap = self.snapshot(&p.text_document.uri)?;
        let a = ready(&snap).await?;
        let off = snap.offset(p.position, self.enc());
        Ok(
            ide::hover::hover(&a, snap.occurrences(), off, &snap.project.method).map(
                |(text, span)| Hover {
                    contents: HoverContents::Markup(MarkupContent {
                        kind: MarkupKind::Markdown,
                        value: text,
                    }),
                    range: Some(snap.range(span, self.enc())),
                },
            ),
        )
    }

    async fn inlay_hint(&self, params: InlayHintParams) -> Result<Option<Vec<InlayHint>>> {
        let snap = self.snapshot(&params.text_document.uri)?;
        let a = ready(&snap).await?;
        let enc = self.enc();
        let span = snap.span(params.range, enc);
        let hints = ide::hints::hints(&a, &snap.text, span.range(), &snap.project.method)
            .into_iter()
            .map(|h| InlayHint {
                position: snap.position(h.offset, enc),
                label: InlayHintLabel::String(h.label),
                kind: None,
                text_edits: None,
                tooltip: Some(InlayHintTooltip::String(h.detail)),
                padding_left: Some(true),
                padding_right: None,
                data: None,
            })
            .collect();
        Ok(Some(hints))
    }

    async fn completion(&self, params: CompletionParams) -> Result<Option<CompletionResponse>> {
        let p = params.text_document_position;
        let snap = self.snapshot(&p.text_document.uri)?;
        let a = ready(&snap).await?;
        let enc = self.enc();
        let off = snap.offset(p.position, enc);
        let items: Vec<CompletionItem> = ide::complete::complete(&a, &snap.text, off)
            .into_iter()
            .enumerate()
            .map(|(i, c)| CompletionItem {
                label: c.label.clone(),
                kind: Some(convert::completion_kind(c.kind)),
                detail: (!c.detail.is_empty()).then_some(c.detail),
                documentation: (!c.doc.is_empty()).then_some(Documentation::MarkupContent(
                    MarkupContent {
                        kind: MarkupKind::Markdown,
                        value: c.doc,
                    },
                )),
                sort_text: Some(format!("{i:04}")),
                text_edit: Some(CompletionTextEdit::Edit(TextEdit {
                    range: snap.range(c.replace, enc),
                    new_text: c.label,
                })),
                ..CompletionItem::default()
            })
            .collect();
        Ok(Some(CompletionResponse::Array(items)))
    }

    async fn goto_definition(
        &self,
        params: GotoDefinitionParams,
    ) -> Result<Option<GotoDefinitionResponse>> {
        let p = params.text_document_position_params;
        let uri = p.text_document.uri;
        let snap = self.snapshot(&uri)?;
        let a = ready(&snap).await?;
        let enc = self.enc();
        let off = snap.offset(p.position, enc);
        let occ = snap.occurrences();
        let target = ide::symbols::related(occ, off)
            .into_iter()
            .find(|o| o.def)
            .map(|o| o.span)
            .or_else(|| match ide::symbols::at(occ, off).map(|o| &o.symbol) {
                // A derived quantity has no declaration: go to its body.
                Some(ide::symbols::Symbol::Quantity { system, body, .. }) => a
                    .model
                    .systems
                    .get(*system)
                    .and_then(|s| s.bodies.get(s.body(body)?))
                    .map(|b| b.name_span),
                _ => None,
            });
        Ok(target.map(|span| {
            GotoDefinitionResponse::Scalar(Location {
                uri: uri.clone(),
                range: snap.range(span, enc),
            })
        }))
    }

    async fn references(&self, params: ReferenceParams) -> Result<Option<Vec<Location>>> {
        let p = params.text_document_position;
        let uri = p.text_document.uri;
        let snap = self.snapshot(&uri)?;
        ready(&snap).await?;
        let enc = self.enc();
        let off = snap.offset(p.position, enc);
        let with_decl = params.context.include_declaration;
        Ok(Some(
            ide::symbols::related(snap.occurrences(), off)
                .into_iter()
                .filter(|o| with_decl || !o.def)
                .map(|o| Location {
                    uri: uri.clone(),
                    range: snap.range(o.span, enc),
                })
                .collect(),
        ))
    }

    async fn prepare_rename(
        &self,
        params: TextDocumentPositionParams,
    ) -> Result<Option<PrepareRenameResponse>> {
        let snap = self.snapshot(&params.text_document.uri)?;
        ready(&snap).await?;
        let enc = self.enc();
        let off = snap.offset(params.position, enc);
        match ide::symbols::at(snap.occurrences(), off) {
            Some(o) if o.symbol.renamable() => {
                Ok(Some(PrepareRenameResponse::Range(snap.range(o.span, enc))))
            }
            Some(_) => Err(Error::invalid_params(
                "quantity names, units and built-ins cannot be renamed",
            )),
            None => Ok(None),
        }
    }

    async fn rename(&self, params: RenameParams) -> Result<Option<WorkspaceEdit>> {
        let p = params.text_document_position;
        let uri = p.text_document.uri;
        let snap = self.snapshot(&uri)?;
        ready(&snap).await?;
        let enc = self.enc();
        let off = snap.offset(p.position, enc);
        let edits = ide::symbols::rename(snap.occurrences(), off, &params.new_name)
            .map_err(Error::invalid_params)?;
        let edits = edits
            .into_iter()
            .map(|(span, new_text)| TextEdit {
                range: snap.range(span, enc),
                new_text,
            })
            .collect();
        Ok(Some(edit(&uri, edits)))
    }

    async fn document_symbol(
        &self,
        params: DocumentSymbolParams,
    ) -> Result<Option<DocumentSymbolResponse>> {
        let snap = self.snapshot(&params.text_document.uri)?;
        let a = ready(&snap).await?;
        let enc = self.enc();
        Ok(Some(DocumentSymbolResponse::Nested(
            ide::outline::outline(&a.ast)
                .iter()
                .map(|n| convert::document_symbol(n, &snap, enc))
                .collect(),
        )))
    }

    async fn folding_range(&self, params: FoldingRangeParams) -> Result<Option<Vec<FoldingRange>>> {
        let snap = self.snapshot(&params.text_document.uri)?;
        let a = ready(&snap).await?;
        let enc = self.enc();
        Ok(Some(
            ide::outline::folding(&a.ast, &snap.text)
                .into_iter()
                .filter_map(|s| {
                    let r = snap.range(s, enc);
                    (r.end.line > r.start.line).then_some(FoldingRange {
                        start_line: r.start.line,
                        start_character: None,
                        end_line: r.end.line,
                        end_character: None,
                        kind: None,
                        collapsed_text: None,
                    })
                })
                .collect(),
        ))
    }

    async fn semantic_tokens_full(
        &self,
        params: SemanticTokensParams,
    ) -> Result<Option<SemanticTokensResult>> {
        let snap = self.snapshot(&params.text_document.uri)?;
        ready(&snap).await?;
        let classes = ide::outline::token_classes(&snap.text, snap.occurrences());
        Ok(Some(SemanticTokensResult::Tokens(SemanticTokens {
            result_id: None,
            data: convert::semantic_tokens(&classes, &snap, self.enc()),
        })))
    }

    async fn formatting(&self, params: DocumentFormattingParams) -> Result<Option<Vec<TextEdit>>> {
        let snap = self.snapshot(&params.text_document.uri)?;
        match syzygy::layout::format_source(&snap.text) {
            Ok(out) if out == *snap.text => Ok(Some(Vec::new())),
            Ok(out) => Ok(Some(vec![TextEdit {
                range: Range {
                    start: Position::new(0, 0),
                    end: snap.position(snap.text.len(), self.enc()),
                },
                new_text: out,
            }])),
            Err(e) => {
                self.client
                    .log_message(MessageType::WARNING, format!("not formatted: {e}"))
                    .await;
                Ok(None)
            }
        }
    }

    async fn code_action(&self, params: CodeActionParams) -> Result<Option<CodeActionResponse>> {
        let uri = params.text_document.uri;
        let snap = self.snapshot(&uri)?;
        let a = ready(&snap).await?;
        let enc = self.enc();
        let span = snap.span(params.range, enc);
        let actions = ide::actions::actions(&a, &snap.text, span.range())
            .into_iter()
            .map(|act| {
                let edits = act
                    .edits
                    .into_iter()
                    .map(|(s, new_text)| TextEdit {
                        range: snap.range(s, enc),
                        new_text,
                    })
                    .collect();
                CodeActionOrCommand::CodeAction(CodeAction {
                    title: act.title,
                    kind: Some(match act.kind {
                        ide::actions::ActionKind::QuickFix => CodeActionKind::QUICKFIX,
                        ide::actions::ActionKind::Rewrite => CodeActionKind::REFACTOR_REWRITE,
                    }),
                    diagnostics: act
                        .fixes
                        .and_then(|i| a.diagnostics.get(i))
                        .map(|d| vec![convert::diagnostic(d, &snap, &uri, enc)]),
                    edit: Some(edit(&uri, edits)),
                    command: None,
                    is_preferred: act.preferred.then_some(true),
                    disabled: None,
                    data: None,
                })
            })
            .collect();
        Ok(Some(actions))
    }
}
