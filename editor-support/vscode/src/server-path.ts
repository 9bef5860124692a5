// Finding the `syz` program before starting it, so a missing binary gets a message that
// says what to do instead of a bare spawn error. No `vscode` import: unit-tested with node.

import * as fs from "fs";
import * as path from "path";

/** Where the configured program was found, or why it was not. */
export type Resolved = { found: true; path: string } | { found: false; message: string };

function isExecutableFile(file: string, platform: NodeJS.Platform): boolean {
  try {
    const st = fs.statSync(file);
    if (!st.isFile()) {
      return false;
    }
    if (platform === "win32") {
      return true;
    }
    fs.accessSync(file, fs.constants.X_OK);
    return true;
  } catch {
    return false;
  }
}

/**
 * Resolve `configured` (a bare name looked up on PATH, or a path) to an executable file.
 * A leading `~/` means the home folder; a relative path with a separator is taken
 * relative to `baseDir` (the workspace folder) when one is given.
 */
export function resolveServer(
  configured: string,
  env: NodeJS.ProcessEnv = process.env,
  platform: NodeJS.Platform = process.platform,
  baseDir?: string,
): Resolved {
  const name = configured.trim() || "syz";
  const hint =
    "Install it with `cargo install --path cli` from a Syzygy checkout, " +
    "or set `syzygy.server.path` to the full path of `syz`.";
  const sep = platform === "win32" ? /[\\/]/ : /\//;
  const exts =
    platform === "win32"
      ? ["", ...(env.PATHEXT ?? ".EXE;.CMD;.BAT").split(";").filter((e) => e.length > 0)]
      : [""];

  if (sep.test(name)) {
    let file = name;
    const home = env.HOME ?? env.USERPROFILE;
    if (file.startsWith("~/") && home) {
      file = path.join(home, file.slice(2));
    } else if (!path.isAbsolute(file) && baseDir) {
      file = path.resolve(baseDir, file);
    }
    for (const ext of exts) {
      if (isExecutableFile(file + ext, platform)) {
        return { found: true, path: file + ext };
      }
    }
    return {
      found: false,
      message: `The Syzygy language server was not found at '${file}' (setting syzygy.server.path). ${hint}`,
    };
  }

  const dirs = (env.PATH ?? env.Path ?? "").split(path.delimiter).filter((d) => d.length > 0);
  for (const dir of dirs) {
    for (const ext of exts) {
      const file = path.join(dir, name + ext);
      if (isExecutableFile(file, platform)) {
        return { found: true, path: file };
      }
    }
  }
  return {
    found: false,
    message: `The Syzygy language server '${name}' is not on PATH, so .syz files get highlighting but no checking. ${hint}`,
  };
}
