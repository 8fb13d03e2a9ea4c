import { assembleLightCurves, type AssembleOptions, type LightCurveSet, type ObservationColumns } from "./assemble-light-curves.js";
import { chooseColumns, type ColumnChoice, type ColumnOptions } from "./column-choice.js";
import { detectDelimitedLayout, isSkippableLine, splitFields, type Delimiter, type DelimitedLayout } from "./delimited-text.js";
import { InputError } from "../errors/input-error.js";
import { MISSING_TOKENS, readNumericCell } from "./numeric-cell.js";

/**
 * Light curves from delimited text (CSV, TSV, whitespace columns), from a string: no file access, so
 * this works in the browser as well. Lines are numbered from 1 as in the file.
 */

/** Options of the delimited-text reader: column choices plus validation and unit conversion. */
export interface DelimitedReadOptions extends ColumnOptions, AssembleOptions {
  /** Force a delimiter instead of detecting one. */
  readonly delimiter?: Delimiter;
}

/** Number of leading lines scanned to detect the delimiter and the header. */
export const LAYOUT_SCAN_LINES = 60;

/**
 * Parses delimited text into light curves (one per band, or one): see {@link detectDelimitedLayout}
 * for the layout rules and {@link assembleLightCurves} for validation.
 *
 * @param source the file name used in messages and provenance
 * @param preferred the delimiter implied by the file extension, tried first
 * @example parseDelimitedLightCurves("mjd,mag,err\n1,20.1,0.05\n...", "obj.csv", {}, ",")
 */
export function parseDelimitedLightCurves(
  text: string,
  source: string,
  options: DelimitedReadOptions = {},
  preferred?: Delimiter,
): LightCurveSet {
  return assembleLightCurves(extractDelimitedColumns(text, source, options, preferred), options);
}

/** Splits text into lines, accepting \n, \r\n and \r endings and dropping a byte-order mark. */
export function splitLines(text: string): string[] {
  return text.replace(/^\uFEFF/, "").split(/\r\n|\n|\r/);
}

/**
 * Detects the layout of the first lines or throws an InputError saying why the text is not a table.
 */
export function requireDelimitedLayout(
  lines: readonly string[],
  source: string,
  delimiter: Delimiter | undefined,
  preferred: Delimiter | undefined,
): DelimitedLayout {
  if (lines.every(isSkippableLine)) throw new InputError("the file has no data lines", { file: source });
  const layout = delimiter
    ? detectDelimitedLayout(lines, delimiter)
    : detectDelimitedLayout(lines, preferred);
  if (!layout || (delimiter && layout.delimiter !== delimiter)) {
    const first = lines.findIndex((l) => !isSkippableLine(l));
    throw new InputError(
      "found fewer than two columns (expected at least time and value, separated by commas, tabs, semicolons, bars or spaces)",
      { file: source, line: first + 1 },
    );
  }
  return layout;
}

/** Reads the fields of one data line against the layout, rejecting a ragged row with its line. */
export function rowFields(line: string, lineNumber: number, layout: DelimitedLayout, names: readonly string[], source: string): string[] {
  const fields = splitFields(line, layout.delimiter);
  if (fields.length < layout.fieldCount) {
    throw new InputError(`only ${fields.length} field(s), expected ${layout.fieldCount}`, {
      file: source,
      line: lineNumber,
      column: names[fields.length],
    });
  }
  for (let k = layout.fieldCount; k < fields.length; k++) {
    if (fields[k] !== "") {
      throw new InputError(`${fields.length} fields, expected ${layout.fieldCount}`, { file: source, line: lineNumber });
    }
  }
  return fields;
}

/** Reads a numeric cell: NaN when missing; an InputError with line and column for garbage or infinities. */
export function numericField(text: string, lineNumber: number, column: string, source: string): number {
  const cell = readNumericCell(text);
  if (cell.kind === "number") return cell.value;
  if (cell.kind === "missing") return Number.NaN;
  const shown = JSON.stringify(text.length > 40 ? text.slice(0, 40) + "..." : text);
  throw new InputError(cell.kind === "infinite" ? `${shown} is infinite` : `${shown} is not a number`, {
    file: source,
    line: lineNumber,
    column,
  });
}

/** Reads a band cell: null when missing ("NA" is kept: it could name a band). */
export function bandField(text: string): string | null {
  const trimmed = text.trim();
  const lower = trimmed.toLowerCase();
  return lower !== "na" && MISSING_TOKENS.has(lower) ? null : trimmed;
}

/** Column names of a layout: the header, or "1", "2", ... for a headerless table. */
export function layoutColumnNames(layout: DelimitedLayout): string[] {
  return layout.header ?? Array.from({ length: layout.fieldCount }, (_, k) => String(k + 1));
}

/**
 * Extracts the time, value, error and band columns of delimited text, before validation.
 */
export function extractDelimitedColumns(
  text: string,
  source: string,
  options: DelimitedReadOptions = {},
  preferred?: Delimiter,
): ObservationColumns {
  const lines = splitLines(text);
  const layout = requireDelimitedLayout(lines.slice(0, LAYOUT_SCAN_LINES), source, options.delimiter, preferred);
  const names = layoutColumnNames(layout);
  const choice: ColumnChoice = chooseColumns(names, options, source, layout.header !== null);
  const positions: number[] = [];
  const time: number[] = [];
  const value: number[] = [];
  const error: number[] | null = choice.error ? [] : null;
  const band: (string | null)[] | null = choice.band ? [] : null;
  for (let i = layout.headerLineIndex + 1; i < lines.length; i++) {
    const line = lines[i];
    if (isSkippableLine(line)) continue;
    const lineNumber = i + 1;
    const fields = rowFields(line, lineNumber, layout, names, source);
    positions.push(lineNumber);
    time.push(numericField(fields[choice.time.index], lineNumber, choice.time.name, source));
    value.push(numericField(fields[choice.value.index], lineNumber, choice.value.name, source));
    if (error) error.push(numericField(fields[choice.error!.index], lineNumber, choice.error!.name, source));
    if (band) band.push(bandField(fields[choice.band!.index]));
  }
  return { source, positionKind: "line", positions, time, value, error, band, choice };
}
