import { readdir } from "node:fs/promises";
import { join, relative } from "node:path";
import { InputError } from "../errors/input-error.js";
import { isLightCurveFileName } from "./light-curve-format.js";

/**
 * The light-curve files of a folder (Node): names with a recognised extension (.csv .tsv .txt .dat
 * .parquet .fits .fit, optionally .gz), hidden files skipped, sorted by path in code-unit order so that
 * every machine lists them identically (shards of a batch run depend on that). With `recursive`,
 * subfolders are searched too.
 *
 * @returns paths joined to `folder`
 */
export async function listLightCurveFiles(folder: string, options: { readonly recursive?: boolean } = {}): Promise<string[]> {
  let entries;
  try {
    entries = await readdir(folder, { withFileTypes: true, recursive: options.recursive ?? false });
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    const reason = code === "ENOENT" ? "no such folder" : code === "ENOTDIR" ? "not a folder" : (code ?? String(error));
    throw new InputError(`cannot list light-curve files (${reason})`, { file: folder });
  }
  const paths: string[] = [];
  for (const entry of entries) {
    if (entry.name.startsWith(".") || !(entry.isFile() || entry.isSymbolicLink())) continue;
    if (!isLightCurveFileName(entry.name)) continue;
    // Node 20 gives `parentPath` (or `path` before 20.12) for recursive listings.
    const parent = (entry as { parentPath?: string; path?: string }).parentPath ?? (entry as { path?: string }).path ?? folder;
    const full = join(parent, entry.name);
    if (relative(folder, full).split(/[\\/]/).some((part) => part.startsWith("."))) continue;
    paths.push(full);
  }
  return paths.sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
}
