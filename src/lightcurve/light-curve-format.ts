import { delimiterForExtension, type Delimiter } from "./delimited-text.js";

/**
 * File formats of light curves, chosen from the file name: delimited text (.csv .tsv .txt .dat),
 * Parquet (.parquet) and FITS binary tables (.fits .fit .fts), each optionally gzip-compressed (.gz).
 */

/** The table formats Horologium reads. */
export type LightCurveFormat = "text" | "parquet" | "fits";

/** Extensions of each format (lower case, with the dot). */
export const FORMAT_EXTENSIONS: Readonly<Record<LightCurveFormat, readonly string[]>> = {
  text: [".csv", ".tsv", ".tab", ".txt", ".dat"],
  parquet: [".parquet", ".parq", ".pq"],
  fits: [".fits", ".fit", ".fts"],
};

/** What the file name says about its content. */
export interface FormatGuess {
  /** The format, or undefined when the extension is not one of {@link FORMAT_EXTENSIONS}. */
  readonly format: LightCurveFormat | undefined;
  /** Whether the name ends in .gz. */
  readonly gzip: boolean;
  /** The extension that decided (after removing .gz), lower case. */
  readonly extension: string;
  /** The delimiter the extension implies (.csv, .tsv). */
  readonly delimiter: Delimiter | undefined;
}

/** Guesses the format from a path or file name. */
export function formatFromName(path: string): FormatGuess {
  const name = path.replace(/^.*[\\/]/, "").toLowerCase();
  const gzip = name.endsWith(".gz");
  const stem = gzip ? name.slice(0, -3) : name;
  const dot = stem.lastIndexOf(".");
  const extension = dot > 0 ? stem.slice(dot) : "";
  let format: LightCurveFormat | undefined;
  for (const [f, extensions] of Object.entries(FORMAT_EXTENSIONS) as [LightCurveFormat, readonly string[]][]) {
    if (extensions.includes(extension)) format = f;
  }
  return { format, gzip, extension, delimiter: delimiterForExtension(extension) };
}

/**
 * Recognises a format from the first bytes, for files whose name does not say: Parquet starts with
 * "PAR1" (Apache Parquet format specification), FITS with "SIMPLE  =" (FITS standard 4.0, section
 * 4.4.1.1), gzip with the bytes 1f 8b (RFC 1952). Anything else is taken as text.
 */
export function formatFromBytes(bytes: Uint8Array): { format: LightCurveFormat; gzip: boolean } {
  if (bytes.length >= 2 && bytes[0] === 0x1f && bytes[1] === 0x8b) return { format: "text", gzip: true };
  const head = Array.from(bytes.subarray(0, 9), (byte) => String.fromCharCode(byte)).join("");
  if (head.startsWith("PAR1")) return { format: "parquet", gzip: false };
  if (head === "SIMPLE  =") return { format: "fits", gzip: false };
  return { format: "text", gzip: false };
}

/** Whether a file name has one of the light-curve extensions (optionally followed by .gz). */
export function isLightCurveFileName(path: string): boolean {
  return formatFromName(path).format !== undefined;
}
