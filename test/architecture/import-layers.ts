import { builtinModules } from "node:module";
import { posix } from "node:path";
import ts from "typescript";

/**
 * The layer order of src/ (docs/architecture.md, "Layers"), lowest first. A file may import files of its own
 * layer and of the layers below it, never above. The ground floor (errors, random, version, ambient types)
 * holds what every layer may need (numerics: the shared sample arithmetic, quantiles, thinning, constants).
 */
export const LAYER_ORDER: readonly (readonly string[])[] = [
  ["errors", "numerics", "random", "types", "version.ts"],
  ["lightcurve"],
  ["linalg"],
  ["kernels"],
  ["gp"],
  ["inference"],
  ["periodogram"],
  ["models"],
  ["report"],
  ["batch"],
  ["cli"],
  ["index.ts"],
  ["browser.ts"],
];

/**
 * Layers that bundle for the browser: neither they nor anything they import (transitively) may import a
 * Node built-in module or one of {@link NODE_ONLY_PACKAGES}.
 */
export const BROWSER_SAFE_LAYERS: readonly string[] = ["numerics", "linalg", "kernels", "gp", "inference", "models", "periodogram", "index.ts", "browser.ts"];

/** Where the verbs of the command line live: `cli/verbs/<verb>.ts` or `cli/verbs/<verb>/...`. */
const VERBS_FOLDER = "src/cli/verbs/";

/** The verb a file belongs to (its file or folder under cli/verbs/), or undefined outside the verbs. */
export function verbOf(path: string): string | undefined {
  if (!path.startsWith(VERBS_FOLDER)) return undefined;
  return path.slice(VERBS_FOLDER.length).split("/")[0].replace(/\.ts$/, "");
}

/** npm packages that run only under Node (native code, terminal output). */
export const NODE_ONLY_PACKAGES: readonly string[] = ["@resvg/resvg-js", "cli-progress"];

/** A source file: its path relative to the repository root (posix separators) and its text. */
export interface SourceText {
  readonly path: string;
  readonly text: string;
}

/** One import (static, type-only, re-export or dynamic) of a file. */
export interface ImportReference {
  readonly specifier: string;
  /** 1-based line of the specifier. */
  readonly line: number;
}

/** Every module specifier a file names, as the TypeScript compiler's pre-processor finds them. */
export function importsOf(text: string): ImportReference[] {
  const info = ts.preProcessFile(text, true, true);
  return info.importedFiles.map((reference) => ({
    specifier: reference.fileName,
    line: text.slice(0, reference.pos).split("\n").length,
  }));
}

/** An import resolved: a path under the repository for relative imports, else the package or module name. */
interface ImportEdge {
  readonly target: string;
  readonly line: number;
  readonly external: boolean;
}

/** The layer a path under src/ belongs to: its first folder, or the file name for files directly in src/. */
export function layerOf(path: string): string | undefined {
  const parts = path.split("/");
  if (parts[0] !== "src" || parts.length < 2) return undefined;
  return parts[1];
}

function levelOf(layer: string): number {
  return LAYER_ORDER.findIndex((names) => names.includes(layer));
}

function isNodeOnly(specifier: string): boolean {
  if (specifier.startsWith("node:")) return true;
  const bare = specifier.split("/")[0];
  if (builtinModules.includes(specifier) || builtinModules.includes(bare)) return true;
  return NODE_ONLY_PACKAGES.some((name) => specifier === name || specifier.startsWith(`${name}/`));
}

/** Resolves a relative specifier ("../models/fit-result.js") to the path of the .ts source it names. */
function resolveRelative(from: string, specifier: string): string {
  const joined = posix.normalize(posix.join(posix.dirname(from), specifier));
  if (joined.endsWith(".js")) return `${joined.slice(0, -3)}.ts`;
  return joined.endsWith(".ts") ? joined : `${joined}.ts`;
}

/**
 * Every import in `files` that goes against the layer order, the browser rule or the rule that a verb of
 * the command line imports no other verb, one line each
 * (`src/batch/shard.ts:1 imports src/cli/cli-io.ts: batch may not import cli (a higher layer)`).
 * An empty list means the tree keeps its layers.
 */
export function layerViolations(files: readonly SourceText[]): string[] {
  const problems: string[] = [];
  const edges = new Map<string, ImportEdge[]>();
  for (const file of files) {
    const layer = layerOf(file.path);
    if (layer === undefined) continue;
    const level = levelOf(layer);
    if (level < 0) {
      problems.push(`${file.path}: "${layer}" has no place in the layer order: add it to LAYER_ORDER (test/architecture/import-layers.ts) and to docs/architecture.md`);
      continue;
    }
    const list: ImportEdge[] = [];
    for (const { specifier, line } of importsOf(file.text)) {
      if (!specifier.startsWith(".")) {
        list.push({ target: specifier, line, external: true });
        continue;
      }
      const target = resolveRelative(file.path, specifier);
      list.push({ target, line, external: false });
      const targetLayer = layerOf(target);
      if (targetLayer === undefined) {
        problems.push(`${file.path}:${line} imports ${target}, outside src/`);
        continue;
      }
      const [fromVerb, toVerb] = [verbOf(file.path), verbOf(target)];
      if (fromVerb !== undefined && toVerb !== undefined && fromVerb !== toVerb)
        problems.push(`${file.path}:${line} imports ${target}: the verb ${fromVerb} may not import the verb ${toVerb} (shared code goes to src/cli/)`);
      const targetLevel = levelOf(targetLayer);
      if (targetLayer !== layer && targetLevel >= level) {
        const why = targetLevel < 0 ? "which has no place in the layer order" : targetLevel === level ? "(the same floor)" : "(a higher layer)";
        problems.push(`${file.path}:${line} imports ${target}: ${layer} may not import ${targetLayer} ${why}`);
      }
    }
    edges.set(file.path, list);
  }
  problems.push(...browserViolations(edges));
  return problems;
}

/** Files of the browser-safe layers that reach a Node-only module, with the chain of imports that gets there. */
function browserViolations(edges: ReadonlyMap<string, readonly ImportEdge[]>): string[] {
  // reaches.get(file) = the chain from the file to a Node-only module; grown until nothing changes, so
  // that import cycles need no special care.
  const reaches = new Map<string, string[]>();
  for (const [path, list] of edges) {
    const direct = list.find((edge) => edge.external && isNodeOnly(edge.target));
    if (direct) reaches.set(path, [`${path}:${direct.line}`, direct.target]);
  }
  for (let grown = true; grown; ) {
    grown = false;
    for (const [path, list] of edges) {
      if (reaches.has(path)) continue;
      const via = list.find((edge) => !edge.external && reaches.has(edge.target));
      if (via) {
        reaches.set(path, [`${path}:${via.line}`, ...reaches.get(via.target)!]);
        grown = true;
      }
    }
  }
  const problems: string[] = [];
  for (const [path, chain] of reaches) {
    const layer = layerOf(path);
    if (layer === undefined || !BROWSER_SAFE_LAYERS.includes(layer)) continue;
    problems.push(`${path} must run in the browser but reaches the Node-only module ${chain.at(-1)} (${chain.join(" -> ")})`);
  }
  return problems;
}
