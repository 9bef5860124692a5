// The extension: starts `syz lsp` over stdio for .syz files and restarts it when its
// settings change. Everything the server knows (diagnostics, hover, inlay hints,
// completion) comes over the protocol; this file only wires the process up.

import * as vscode from "vscode";
import {
  LanguageClient,
  LanguageClientOptions,
  ServerOptions,
  TransportKind,
} from "vscode-languageclient/node";
import { resolveServer } from "./server-path";

let client: LanguageClient | undefined;
let output: vscode.OutputChannel | undefined;

async function start(): Promise<void> {
  const config = vscode.workspace.getConfiguration("syzygy");
  const configured = config.get<string>("server.path", "syz");
  const extraArgs = config.get<string[]>("server.extraArgs", []);
  const baseDir = vscode.workspace.workspaceFolders?.[0]?.uri.fsPath;

  const resolved = resolveServer(configured, process.env, process.platform, baseDir);
  if (!resolved.found) {
    const open = "Open Settings";
    const choice = await vscode.window.showErrorMessage(resolved.message, open);
    if (choice === open) {
      await vscode.commands.executeCommand("workbench.action.openSettings", "syzygy.server.path");
    }
    return;
  }

  const run = { command: resolved.path, args: ["lsp", ...extraArgs], transport: TransportKind.stdio };
  const serverOptions: ServerOptions = { run, debug: run };
  output ??= vscode.window.createOutputChannel("Syzygy");
  const clientOptions: LanguageClientOptions = {
    documentSelector: [
      { scheme: "file", language: "syzygy" },
      { scheme: "untitled", language: "syzygy" },
    ],
    outputChannel: output,
    synchronize: {
      fileEvents: vscode.workspace.createFileSystemWatcher("**/*.syz"),
    },
  };

  client = new LanguageClient("syzygy", "Syzygy language server", serverOptions, clientOptions);
  try {
    await client.start();
  } catch (err) {
    const detail = err instanceof Error ? err.message : String(err);
    void vscode.window.showErrorMessage(
      `The Syzygy language server (${resolved.path} lsp) did not start: ${detail}`,
    );
    client = undefined;
  }
}

async function stop(): Promise<void> {
  const c = client;
  client = undefined;
  if (c) {
    await c.stop();
  }
}

export async function activate(context: vscode.ExtensionContext): Promise<void> {
  context.subscriptions.push(
    { dispose: () => void stop() },
    vscode.commands.registerCommand("syzygy.restartServer", async () => {
      await stop();
      await start();
    }),
    vscode.workspace.onDidChangeConfiguration(async (e) => {
      if (e.affectsConfiguration("syzygy.server")) {
        await stop();
        await start();
      }
    }),
  );
  await start();
}

export async function deactivate(): Promise<void> {
  await stop();
}
