import type { LightCurveSet } from "./assemble-light-curves.js";
import type { Delimiter } from "./delimited-text.js";
import { parseDelimitedLightCurves, type DelimitedReadOptions } from "./delimited-light-curve.js";
import { parseFitsLightCurves } from "./fits-light-curve.js";
import type { LightCurveFormat } from "./light-curve-format.js";
import { parseParquetLightCurves } from "./parquet-light-curve.js";

/** Options of the light-curve readers: columns, band, unit, validation, and an optional forced format. */
export interface LightCurveReadOptions extends DelimitedReadOptions {
  /** Read as this format whatever the file name says. */
  readonly format?: LightCurveFormat;
}

/**
 * Parses the (already decompressed) bytes of a light-curve file of a known format. No file access:
 * usable in the browser with bytes from a file input or a fetch.
 *
 * @param source the file name for messages and provenance
 * @param preferredDelimiter for text, the delimiter the extension implies
 */
export async function parseLightCurveBytes(
  bytes: Uint8Array,
  source: string,
  format: LightCurveFormat,
  options: LightCurveReadOptions = {},
  preferredDelimiter?: Delimiter,
): Promise<LightCurveSet> {
  switch (format) {
    case "text":
      return parseDelimitedLightCurves(new TextDecoder("utf-8").decode(bytes), source, options, preferredDelimiter);
    case "parquet":
      return parseParquetLightCurves(bytes, source, options);
    case "fits":
      return parseFitsLightCurves(bytes, source, options);
  }
}
