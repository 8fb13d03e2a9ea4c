import { opendir, stat } from "node:fs/promises";
import { join, resolve } from "node:path";
import { UsageError } from "../cli/cli-io.js";
import { InputError } from "../lightcurve/input-error.js";
import type { LightCurveSet } from "../lightcurve/assemble-light-curves.js";
import { FORMAT_EXTENSIONS, isLightCurveFileName } from "../lightcurve/light-curve-format.js";
import { readLightCurves, type LightCurveReadOptions } from "../lightcurve/read-light-curves.js";
import type { CatalogueObject } from "./catalogue-object.js";

/** How to read a catalogue: the light-curve reader's options, and the object-id column of a single table. */
export interface CatalogueReadOptions extends LightCurveReadOptions {
  /** For a single table holding many objects: the column with the object ids. */
  readonly idColumn?: string;
}

/** A catalogue opened for a batch run: its objects, streamed, and their ids alone (cheaper). */
export interface Catalogue {
  /** Absolute path of the folder or table. */
  readonly path: string;
  readonly kind: "folder" | "table";
  objects(): AsyncIterable<CatalogueObject>;
  ids(): AsyncIterable<string>;
}

const EXTENSIONS = Object.values(FORMAT_EXTENSIONS).flat();

/**
 * The object id of a light-curve file: its name without the light-curve extension (and `.gz`).
 *
 * @example objectIdFromFileName("lf-0042.csv.gz") // "lf-0042"
 */
export function objectIdFromFileName(name: string): string {
  const stem = name.toLowerCase().endsWith(".gz") ? name.slice(0, -3) : name;
  const dot = stem.lastIndexOf(".");
  return dot > 0 && EXTENSIONS.includes(stem.slice(dot).toLowerCase()) ? stem.slice(0, dot) : stem;
}

/**
 * Opens the input of `horologium batch`: a folder of light-curve files (one object per file, its id the
 * file name without extension) or, with `idColumn`, one table holding every object. Nothing is read
 * until the objects are iterated; then one light curve at a time is in memory. A file that cannot be
 * read becomes an object with the reader's one-line reason, so it is recorded as failed and the run goes on.
 */
export async function openCatalogue(path: string, options: CatalogueReadOptions): Promise<Catalogue> {
  const absolute = resolve(path);
  let info;
  try {
    info = await stat(absolute);
  } catch {
    throw new InputError("no such file or folder", { file: path });
  }
  if (info.isDirectory()) {
    if (options.idColumn !== undefined) {
      throw new UsageError(`${path} is a folder (one object per file); --id-col is for a single table of many objects`);
    }
    return {
      path: absolute,
      kind: "folder",
      objects: () => folderObjects(absolute, options),
      ids: async function* () {
        for await (const name of lightCurveFiles(absolute)) yield objectIdFromFileName(name);
      },
    };
  }
  if (options.idColumn === undefined) {
    throw new UsageError(`${path} is a file: name its object-id column with --id-col, or give a folder of light-curve files`);
  }
  throw new UsageError(
    `${path}: reading a single catalogue table by --id-col is not available yet (it waits for the streaming ` +
      "catalogue reader of src/lightcurve); give a folder of light-curve files",
  );
}

/** The light-curve files of a folder, streamed in directory order (no sort, so no list in memory). */
async function* lightCurveFiles(folder: string): AsyncGenerator<string> {
  const directory = await opendir(folder);
  for await (const entry of directory) {
    if ((entry.isFile() || entry.isSymbolicLink()) && isLightCurveFileName(entry.name)) yield entry.name;
  }
}

async function* folderObjects(folder: string, options: CatalogueReadOptions): AsyncGenerator<CatalogueObject> {
  for await (const name of lightCurveFiles(folder)) {
    const id = objectIdFromFileName(name);
    let set: LightCurveSet;
    try {
      set = await readLightCurves(join(folder, name), options);
    } catch (error) {
      if (error instanceof InputError) {
        yield { id, problem: error.message };
        continue;
      }
      throw error;
    }
    yield singleLightCurve(id, name, set, options);
  }
}

/** One object's light curve from what the reader returned, or the reason there is not exactly one. */
function singleLightCurve(id: string, source: string, set: LightCurveSet, options: LightCurveReadOptions): CatalogueObject {
  if (set.lightCurves.length === 1) return { id, lightCurve: set.lightCurves[0], warnings: set.warnings };
  if (set.lightCurves.length === 0) return { id, problem: `${source}: no light curve in the file` };
  const bands = set.lightCurves.map((lc) => lc.band ?? "?").join(", ");
  const hint = options.band === undefined ? "; choose one with --band" : "";
  return { id, problem: `${source}: ${set.lightCurves.length} bands (${bands})${hint}` };
}
