import { parquetMetadata, parquetReadObjects, parquetSchema, type FileMetaData } from "hyparquet";
import { assembleLightCurves, type LightCurveSet, type ObservationColumns } from "./assemble-light-curves.js";
import { chooseColumns } from "./column-choice.js";
import type { DelimitedReadOptions } from "./delimited-light-curve.js";
import { InputError } from "../errors/input-error.js";
import { readNumericCell } from "./numeric-cell.js";

/**
 * Light curves from Apache Parquet bytes, decoded by the pure-JavaScript `hyparquet` package (so this
 * works in the browser too). Problems are reported by 1-based table row.
 */

/** Days between the Unix epoch (1970-01-01 UTC) and MJD 0 (1858-11-17): MJD = Unix days + 40587. */
export const UNIX_EPOCH_MJD = 40587;

/**
 * Parses Parquet bytes into light curves: top-level columns are matched as for text tables; numbers,
 * 64-bit integers and numeric strings are accepted; null and NaN are missing values; timestamps in the
 * time column become MJD (UTC) with a warning.
 *
 * @param source the file name for messages and provenance
 */
export async function parseParquetLightCurves(
  bytes: Uint8Array,
  source: string,
  options: DelimitedReadOptions = {},
): Promise<LightCurveSet> {
  const buffer = bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer;
  let metadata: FileMetaData;
  try {
    metadata = parquetMetadata(buffer);
  } catch (error) {
    throw new InputError(`not a readable Parquet file (${error instanceof Error ? error.message : String(error)})`, { file: source });
  }
  const names = parquetSchema(metadata)
    .children.filter((child) => child.children.length === 0)
    .map((child) => child.element.name);
  const choice = chooseColumns(names, options, source);
  const wanted = [choice.time.name, choice.value.name];
  if (choice.error) wanted.push(choice.error.name);
  if (choice.band) wanted.push(choice.band.name);

  let rows: Record<string, unknown>[];
  try {
    rows = await parquetReadObjects({ file: buffer, metadata, columns: wanted });
  } catch (error) {
    throw new InputError(`cannot decode the Parquet data (${error instanceof Error ? error.message : String(error)})`, { file: source });
  }
  const n = rows.length;
  const positions = Array.from({ length: n }, (_, i) => i + 1);
  const warnings: string[] = [];
  let convertedTimestamps = false;
  const numbers = (name: string, isTime: boolean) => {
    const out = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const cell = rows[i][name];
      if (isTime && cell instanceof Date) {
        convertedTimestamps = true;
        out[i] = cell.getTime() / 86_400_000 + UNIX_EPOCH_MJD;
      } else out[i] = numericParquetCell(cell, source, i + 1, name);
    }
    return out;
  };
  const time = numbers(choice.time.name, true);
  const value = numbers(choice.value.name, false);
  const error = choice.error ? numbers(choice.error.name, false) : null;
  const band = choice.band
    ? rows.map((row) => {
        const cell = row[choice.band!.name];
        return cell === null || cell === undefined || String(cell).trim() === "" ? null : String(cell).trim();
      })
    : null;
  if (convertedTimestamps) warnings.push(`${source}: timestamps in column "${choice.time.name}" were converted to MJD (UTC)`);
  const columns: ObservationColumns = { source, positionKind: "row", positions, time, value, error, band, choice };
  const set = assembleLightCurves(columns, options);
  return { lightCurves: set.lightCurves, warnings: [...warnings, ...set.warnings] };
}

/** One Parquet cell as a number: NaN when missing, an InputError with the row for anything else. */
export function numericParquetCell(cell: unknown, source: string, row: number, column: string): number {
  if (cell === null || cell === undefined) return Number.NaN;
  if (typeof cell === "number") {
    if (Number.isNaN(cell)) return Number.NaN;
    if (!Number.isFinite(cell)) throw new InputError(`${cell} is infinite`, { file: source, row, column });
    return cell;
  }
  if (typeof cell === "bigint") return Number(cell);
  if (typeof cell === "string") {
    const parsed = readNumericCell(cell);
    if (parsed.kind === "number") return parsed.value;
    if (parsed.kind === "missing") return Number.NaN;
    const shown = JSON.stringify(cell.length > 40 ? cell.slice(0, 40) + "..." : cell);
    throw new InputError(parsed.kind === "infinite" ? `${shown} is infinite` : `${shown} is not a number`, { file: source, row, column });
  }
  const kind = cell instanceof Date ? "a timestamp" : typeof cell === "boolean" ? "a boolean" : `a ${typeof cell}`;
  throw new InputError(`${kind} where a number is needed`, { file: source, row, column });
}
