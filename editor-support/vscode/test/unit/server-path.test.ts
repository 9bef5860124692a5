import { test } from "node:test";
import * as assert from "node:assert/strict";
import * as fs from "fs";
import * as os from "os";
import * as path from "path";
import { resolveServer } from "../../src/server-path";

function scratch(): string {
  return fs.mkdtempSync(path.join(os.tmpdir(), "syzygy-ext-"));
}

function program(dir: string, name: string, mode: number): string {
  const file = path.join(dir, name);
  fs.writeFileSync(file, "#!/bin/sh\n");
  fs.chmodSync(file, mode);
  return file;
}

test("a bare name is found on PATH", { skip: process.platform === "win32" }, () => {
  const dir = scratch();
  const file = program(dir, "syz", 0o755);
  const r = resolveServer("syz", { PATH: ["/nonexistent", dir].join(path.delimiter) }, "linux");
  assert.deepEqual(r, { found: true, path: file });
});

test("a file without the execute bit does not count", { skip: process.platform === "win32" }, () => {
  const dir = scratch();
  program(dir, "syz", 0o644);
  const r = resolveServer("syz", { PATH: dir }, "linux");
  assert.equal(r.found, false);
});

test("a missing program says where it looked and which setting to change", () => {
  const r = resolveServer("syz", { PATH: scratch() }, "linux");
  assert.equal(r.found, false);
  if (!r.found) {
    assert.match(r.message, /'syz' is not on PATH/);
    assert.match(r.message, /syzygy\.server\.path/);
    assert.match(r.message, /cargo install --path cli/);
  }
});

test("a path is checked as given, relative to the workspace, and ~ is the home folder", {
  skip: process.platform === "win32",
}, () => {
  const dir = scratch();
  const file = program(dir, "my-syz", 0o755);
  assert.deepEqual(resolveServer(file, {}, "linux"), { found: true, path: file });
  assert.deepEqual(resolveServer("./my-syz", {}, "linux", dir), { found: true, path: file });
  assert.deepEqual(resolveServer("~/my-syz", { HOME: dir }, "linux"), { found: true, path: file });
  const missing = resolveServer(path.join(dir, "nope"), {}, "linux");
  assert.equal(missing.found, false);
  if (!missing.found) {
    assert.match(missing.message, /not found at/);
  }
});

test("an empty setting falls back to syz", { skip: process.platform === "win32" }, () => {
  const dir = scratch();
  const file = program(dir, "syz", 0o755);
  assert.deepEqual(resolveServer("  ", { PATH: dir }, "linux"), { found: true, path: file });
});
