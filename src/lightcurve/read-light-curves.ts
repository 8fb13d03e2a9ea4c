import { readFile } from "node:fs/promises";
import { gunzipSync } from "node:zlib";
import type { LightCurveSet } from "./assemble-light-curves.js";
import { InputError } from "../errors/input-error.js";
import { formatFromBytes, formatFromName } from "./light-curve-format.js";
import { parseLightCurveBytes, type LightCurveReadOptions } from "./parse-light-curve-bytes.js";

export type { LightCurveReadOptions } from "./parse-light-curve-bytes.js";

/**
 * Reads a light-curve file (Node): CSV/TSV/whitespace text, Parquet or a FITS binary table, chosen by
 * extension (.csv .tsv .txt .dat .parquet .fits .fit, each optionally .gz); for other names the first
 * bytes decide. Returns one light curve per band (or a single one) and warnings for the user. Every
 * problem with the file is an {@link InputError} naming the file and, where known, line or row and column.
 *
 * @example const { lightCurves, warnings } = await readLightCurves("obj-0042.csv", { band: "r" });
 */
export async function readLightCurves(path: string, options: LightCurveReadOptions = {}): Promise<LightCurveSet> {
  let bytes: Uint8Array;
  try {
    bytes = await readFile(path);
  } catch (error) {
    throw new InputError(`cannot read the file (${describeFsError(error)})`, { file: path });
  }
  const byName = formatFromName(path);
  const bySniff = formatFromBytes(bytes);
  if (byName.gzip || bySniff.gzip) {
    try {
      bytes = gunzipSync(bytes);
    } catch {
      throw new InputError("the file is not valid gzip data", { file: path });
    }
  }
  const format = options.format ?? byName.format ?? formatFromBytes(bytes).format;
  return parseLightCurveBytes(bytes, path, format, { ...options }, byName.delimiter);
}

/** A short reason for a failed file access, without the stack. */
export function describeFsError(error: unknown): string {
  const code = (error as NodeJS.ErrnoException).code;
  if (code === "ENOENT") return "no such file";
  if (code === "EISDIR") return "it is a folder";
  if (code === "EACCES" || code === "EPERM") return "permission denied";
  return code ?? (error instanceof Error ? error.message : String(error));
}
