import { stat } from "node:fs/promises";
import { basename, resolve } from "node:path";
import { UsageError } from "../errors/usage-error.js";
import { InputError } from "../errors/input-error.js";
import { streamCatalogue } from "../lightcurve/catalogue-stream.js";
import type { LightCurve } from "../lightcurve/light-curve.js";
import { FORMAT_EXTENSIONS } from "../lightcurve/light-curve-format.js";
import { listLightCurveFiles } from "../lightcurve/list-light-curve-files.js";
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
 * file name without extension, listed in sorted order) or, with `idColumn`, one delimited-text table
 * holding every object, its rows grouped by id (streamed by the catalogue reader of src/lightcurve).
 * Nothing is read until the objects are iterated; then about one light curve at a time is in memory.
 * An object with several bands comes with all of them (`bands`) unless `--band` chose one; an object
 * that cannot be read comes with the reader's one-line reason instead of a light curve, so it is
 * recorded as failed and the run goes on;
 * a problem of the table as a whole (no such file, unknown column, ids not grouped) is an InputError.
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
        for (const file of await listLightCurveFiles(absolute)) yield objectIdFromFileName(basename(file));
      },
    };
  }
  const idColumn = options.idColumn;
  if (idColumn === undefined) {
    throw new UsageError(`${path} is a file: name its object-id column with --id-col, or give a folder of light-curve files`);
  }
  const entries = () => streamCatalogue(absolute, { ...options, idColumn });
  return {
    path: absolute,
    kind: "table",
    objects: async function* () {
      for await (const entry of entries()) {
        yield entry.problem !== undefined
          ? { id: entry.id, problem: entry.problem }
          : singleLightCurve(entry.id, `object "${entry.id}"`, entry.lightCurves, entry.warnings, options);
      }
    },
    ids: async function* () {
      for await (const entry of entries()) yield entry.id;
    },
  };
}

/** The objects of a folder, one file each, in the sorted order of the folder listing. */
async function* folderObjects(folder: string, options: CatalogueReadOptions): AsyncGenerator<CatalogueObject> {
  for (const file of await listLightCurveFiles(folder)) {
    const name = basename(file);
    const id = objectIdFromFileName(name);
    try {
      const set = await readLightCurves(file, options);
      yield singleLightCurve(id, name, set.lightCurves, set.warnings, options);
    } catch (error) {
      if (!(error instanceof InputError)) throw error;
      yield { id, problem: error.message };
    }
  }
}

/** One object's light curve (or its bands) from what a reader returned, or the reason there is none. */
function singleLightCurve(
  id: string,
  source: string,
  lightCurves: readonly LightCurve[],
  warnings: readonly string[],
  options: LightCurveReadOptions,
): CatalogueObject {
  const [first] = lightCurves;
  if (lightCurves.length === 1 && first) return { id, lightCurve: first, warnings };
  if (lightCurves.length === 0) return { id, problem: `${source}: no light curve` };
  if (options.band === undefined) return { id, bands: lightCurves, warnings };
  const bands = lightCurves.map((lc) => lc.band ?? "?").join(", ");
  return { id, problem: `${source}: ${lightCurves.length} bands (${bands})` };
}
