// Bundles the extension (with vscode-languageclient) into one file; `--tests` bundles the
// unit tests instead, `--production` minifies.
import * as esbuild from "esbuild";
import { readdirSync } from "fs";

const production = process.argv.includes("--production");
const tests = process.argv.includes("--tests");

const common = {
  bundle: true,
  platform: "node",
  target: "node18",
  format: "cjs",
  sourcemap: !production,
  minify: production,
  logLevel: "warning",
};

if (tests) {
  const entryPoints = readdirSync("test/unit")
    .filter((f) => f.endsWith(".test.ts"))
    .map((f) => `test/unit/${f}`);
  await esbuild.build({ ...common, entryPoints, outdir: "out/test" });
} else {
  await esbuild.build({
    ...common,
    entryPoints: ["src/extension.ts"],
    outfile: "out/extension.js",
    external: ["vscode"],
  });
}
