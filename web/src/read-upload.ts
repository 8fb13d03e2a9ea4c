import type { LightCurveSet } from "../../src/lightcurve/assemble-light-curves.js";
import { InputError } from "../../src/errors/input-error.js";
import { formatFromBytes, formatFromName } from "../../src/lightcurve/light-curve-format.js";
import { parseLightCurveBytes, type LightCurveReadOptions } from "../../src/lightcurve/parse-light-curve-bytes.js";

/**
 * Reads the bytes of a file the user picked, as `readLightCurves` reads a path on the command line:
 * the format from the extension, else from the first bytes; gzip (.gz or the gzip magic bytes)
 * undone with the browser's DecompressionStream.
 */
export async function readUploadedLightCurves(
  bytes: Uint8Array,
  fileName: string,
  options: LightCurveReadOptions = {},
): Promise<LightCurveSet> {
  const byName = formatFromName(fileName);
  let data = bytes;
  if (byName.gzip || formatFromBytes(bytes).gzip) data = await gunzip(bytes, fileName);
  const format = byName.format ?? formatFromBytes(data).format;
  return parseLightCurveBytes(data, fileName, format, options, byName.delimiter);
}

async function gunzip(bytes: Uint8Array, fileName: string): Promise<Uint8Array> {
  try {
    const stream = new Blob([bytes as BlobPart]).stream().pipeThrough(new DecompressionStream("gzip"));
    return new Uint8Array(await new Response(stream).arrayBuffer());
  } catch {
    throw new InputError("the file is not valid gzip data", { file: fileName });
  }
}
