import { readdirSync, readFileSync } from "node:fs";
import { join, relative, sep } from "node:path";
import { describe, expect, it } from "vitest";
import { importsOf, layerViolations, type SourceText } from "./import-layers.js";

const root = join(import.meta.dirname, "..", "..");

function sourceFiles(folder: string): SourceText[] {
  const files: SourceText[] = [];
  for (const entry of readdirSync(folder, { withFileTypes: true, recursive: true })) {
    if (!entry.isFile() || !entry.name.endsWith(".ts")) continue;
    const full = join(entry.parentPath, entry.name);
    files.push({ path: relative(root, full).split(sep).join("/"), text: readFileSync(full, "utf8") });
  }
  return files;
}

describe("the layers of src/ (docs/architecture.md, Layers)", () => {
  it("no file of src/ imports a higher layer, no verb imports another, and the browser layers reach no Node-only module", () => {
    const files = sourceFiles(join(root, "src"));
    expect(files.length).toBeGreaterThan(100);
    expect(layerViolations(files)).toEqual([]);
  });
});

describe("the layer checker itself", () => {
  it("finds static, type-only, re-exported and dynamic imports", () => {
    const text = [
      'import { a } from "./a.js";',
      'import type { B } from "../b.js";',
      'export { c } from "./c.js";',
      'const d = await import("./d.js");',
      'import "./e.js";',
    ].join("\n");
    expect(importsOf(text)).toEqual([
      { specifier: "./a.js", line: 1 },
      { specifier: "../b.js", line: 2 },
      { specifier: "./c.js", line: 3 },
      { specifier: "./d.js", line: 4 },
      { specifier: "./e.js", line: 5 },
    ]);
  });

  it("accepts imports downwards and within a layer", () => {
    const files: SourceText[] = [
      { path: "src/models/fit.ts", text: 'import { p } from "../inference/p.js";\nimport { q } from "./q.js";\nimport { E } from "../errors/e.js";' },
      { path: "src/inference/p.ts", text: "export const p = 1;" },
      { path: "src/models/q.ts", text: "export const q = 1;" },
      { path: "src/errors/e.ts", text: "export class E extends Error {}" },
    ];
    expect(layerViolations(files)).toEqual([]);
  });

  it("rejects an upward import, type-only or not (inference importing models, batch importing cli)", () => {
    const files: SourceText[] = [
      { path: "src/inference/summary.ts", text: 'import type { FitResult } from "../models/fit-result.js";' },
      { path: "src/batch/shard.ts", text: '\nimport { UsageError } from "../cli/cli-io.js";' },
      { path: "src/models/fit-result.ts", text: "export interface FitResult {}" },
      { path: "src/cli/cli-io.ts", text: "export class UsageError extends Error {}" },
    ];
    expect(layerViolations(files)).toEqual([
      "src/inference/summary.ts:1 imports src/models/fit-result.ts: inference may not import models (a higher layer)",
      "src/batch/shard.ts:2 imports src/cli/cli-io.ts: batch may not import cli (a higher layer)",
    ]);
  });

  it("rejects a verb of the command line importing another verb, but not a sub-verb importing its own verb's files", () => {
    const files: SourceText[] = [
      { path: "src/cli/verbs/demo.ts", text: 'import { fitAll } from "./fit.js";' },
      { path: "src/cli/verbs/fit.ts", text: 'import { fitArguments } from "../fit-arguments.js";' },
      { path: "src/cli/verbs/batch/plan.ts", text: 'import { choice } from "./catalogue-fit-arguments.js";\nimport { x } from "../predict/x.js";' },
      { path: "src/cli/verbs/batch/catalogue-fit-arguments.ts", text: "" },
      { path: "src/cli/verbs/predict/x.ts", text: "" },
      { path: "src/cli/fit-arguments.ts", text: "" },
    ];
    expect(layerViolations(files)).toEqual([
      "src/cli/verbs/demo.ts:1 imports src/cli/verbs/fit.ts: the verb demo may not import the verb fit (shared code goes to src/cli/)",
      "src/cli/verbs/batch/plan.ts:2 imports src/cli/verbs/predict/x.ts: the verb batch may not import the verb predict (shared code goes to src/cli/)",
    ]);
  });

  it("rejects a folder that is not in the layer order", () => {
    const files: SourceText[] = [{ path: "src/helpers/x.ts", text: "" }];
    expect(layerViolations(files)[0]).toMatch(/"helpers" has no place in the layer order/);
  });

  it("rejects a Node built-in in a browser layer, directly or through a lower layer it imports", () => {
    const files: SourceText[] = [
      { path: "src/gp/reader.ts", text: 'import { readFile } from "node:fs/promises";' },
      { path: "src/models/load.ts", text: 'import { read } from "../lightcurve/read.js";' },
      { path: "src/lightcurve/read.ts", text: 'import { gunzipSync } from "zlib";' },
      { path: "src/kernels/fine.ts", text: 'import { Matrix } from "ml-matrix";' },
    ];
    expect(layerViolations(files)).toEqual([
      "src/gp/reader.ts must run in the browser but reaches the Node-only module node:fs/promises (src/gp/reader.ts:1 -> node:fs/promises)",
      "src/models/load.ts must run in the browser but reaches the Node-only module zlib (src/models/load.ts:1 -> src/lightcurve/read.ts:1 -> zlib)",
    ]);
  });
});
