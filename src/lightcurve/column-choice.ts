import { InputError } from "../errors/input-error.js";
import { UnrecognisedColumnError } from "../errors/unrecognised-column-error.js";
import type { PhotometricUnit } from "./light-curve.js";

/**
 * Which table columns hold the time, the value, the error and the band: explicit choices first, then
 * the names recognised by default (docs/architecture.md, "Command line").
 */

/** Time column names recognised without `--time-col`, in order of preference (case-insensitive). */
export const TIME_COLUMN_NAMES: readonly string[] = ["time", "mjd", "jd", "bjd", "t"];
/** Value column names recognised without `--value-col`, in order of preference (case-insensitive). */
export const VALUE_COLUMN_NAMES: readonly string[] = ["mag", "flux", "value", "y"];
/** Error column names recognised without `--error-col`, in order of preference (case-insensitive). */
export const ERROR_COLUMN_NAMES: readonly string[] = ["err", "mag_err", "magerr", "flux_err", "sigma", "error"];
/**
 * Band column names recognised without `--band-col`: these two are the usual
 * headers of multi-band tables, and mixing bands silently would be worse than recognising them.
 */
export const BAND_COLUMN_NAMES: readonly string[] = ["band", "filter"];

/** The user's column choices: a column name, or a 1-based column number. */
export interface ColumnOptions {
  readonly timeColumn?: string;
  readonly valueColumn?: string;
  /** An error column; `null` means: use none, even if a recognised one exists. */
  readonly errorColumn?: string | null;
  readonly bandColumn?: string;
  /** The unit of the value column; by default inferred from its name. */
  readonly unit?: PhotometricUnit;
}

/** Resolved columns: indices into the table's column list and their names. */
export interface ColumnChoice {
  readonly time: { readonly index: number; readonly name: string };
  readonly value: { readonly index: number; readonly name: string };
  readonly error: { readonly index: number; readonly name: string } | null;
  readonly band: { readonly index: number; readonly name: string } | null;
  readonly unit: PhotometricUnit;
  /** Notes for the user (for example an assumed unit). */
  readonly warnings: readonly string[];
}

/**
 * Resolves the columns of a table with the given column names. An explicit choice matches a name
 * exactly, then case-insensitively, then as a 1-based column number. Without one, the recognised
 * names are tried in order; an error column is paired with its value column (`mag` does not take
 * `flux_err`, `flux` does not take `mag_err` or `magerr`). Headerless tables (`hasHeader` false) use
 * columns 1, 2 and 3 for time, value and error.
 *
 * The unit comes from `options.unit`, else from the value column name (containing "mag": magnitudes;
 * "flux": fluxes), else from the error column name, else magnitudes with a warning.
 */
export function chooseColumns(
  names: readonly string[],
  options: ColumnOptions,
  source: string,
  hasHeader = true,
): ColumnChoice {
  const find = (choice: string, role: string) => findExplicit(names, choice, role, source);
  const recognise = (candidates: readonly string[], exclude: readonly number[] = []) => {
    for (const candidate of candidates) {
      const index = names.findIndex((n, i) => !exclude.includes(i) && n.trim().toLowerCase() === candidate);
      if (index >= 0) return index;
    }
    return -1;
  };
  const fallback = (position: number) => (!hasHeader && names.length > position ? position : -1);

  const timeIndex = options.timeColumn !== undefined ? find(options.timeColumn, "time") : orElse(recognise(TIME_COLUMN_NAMES), fallback(0));
  if (timeIndex < 0) throw missingColumn("time", TIME_COLUMN_NAMES, "--time-col", names, source);
  const valueIndex =
    options.valueColumn !== undefined
      ? find(options.valueColumn, "value")
      : orElse(recognise(VALUE_COLUMN_NAMES, [timeIndex]), fallback(1));
  if (valueIndex < 0) throw missingColumn("value", VALUE_COLUMN_NAMES, "--value-col", names, source);
  if (valueIndex === timeIndex) {
    throw new InputError(`the same column is chosen for time and value`, { file: source, column: names[timeIndex] });
  }
  const valueName = names[valueIndex];

  let errorIndex = -1;
  if (options.errorColumn !== undefined && options.errorColumn !== null) {
    errorIndex = find(options.errorColumn, "error");
  } else if (options.errorColumn === undefined) {
    const lower = valueName.toLowerCase();
    const unsuited = lower.includes("mag") ? ["flux_err"] : lower.includes("flux") ? ["mag_err", "magerr"] : [];
    errorIndex = orElse(
      recognise(ERROR_COLUMN_NAMES.filter((n) => !unsuited.includes(n)), [timeIndex, valueIndex]),
      fallback(2),
    );
  }
  if (errorIndex === timeIndex || errorIndex === valueIndex) {
    throw new InputError(`the error column is also chosen as time or value column`, { file: source, column: names[errorIndex] });
  }

  const bandIndex =
    options.bandColumn !== undefined
      ? find(options.bandColumn, "band")
      : hasHeader
        ? recognise(BAND_COLUMN_NAMES, [timeIndex, valueIndex, errorIndex])
        : -1;

  const warnings: string[] = [];
  const errorName = errorIndex >= 0 ? names[errorIndex] : null;
  const unit = options.unit ?? unitFromName(valueName) ?? (errorName ? unitFromName(errorName) : undefined);
  if (unit === undefined) {
    warnings.push(`${source}: the unit of column "${valueName}" is not clear from its name; assuming magnitudes (set the unit to override)`);
  }
  return {
    time: { index: timeIndex, name: names[timeIndex] },
    value: { index: valueIndex, name: valueName },
    error: errorIndex >= 0 ? { index: errorIndex, name: names[errorIndex] } : null,
    band: bandIndex >= 0 ? { index: bandIndex, name: names[bandIndex] } : null,
    unit: unit ?? "mag",
    warnings,
  };
}

/** Magnitudes or fluxes from a column name ("mag" or "flux" in it), or undefined when it does not say. */
export function unitFromName(name: string): PhotometricUnit | undefined {
  const lower = name.toLowerCase();
  if (lower.includes("mag")) return "mag";
  if (lower.includes("flux")) return "flux";
  return undefined;
}

function orElse(index: number, other: number): number {
  return index >= 0 ? index : other;
}

/**
 * The index of a column chosen by the user: exact name, then case-insensitive name, then 1-based
 * column number; an InputError listing the columns when there is none.
 */
export function findColumn(names: readonly string[], choice: string, role: string, source: string): number {
  return findExplicit(names, choice, role, source);
}

function findExplicit(names: readonly string[], choice: string, role: string, source: string): number {
  let index = names.indexOf(choice);
  if (index < 0) index = names.findIndex((n) => n.trim().toLowerCase() === choice.trim().toLowerCase());
  if (index < 0 && /^\d+$/.test(choice.trim())) {
    const number = Number(choice.trim());
    if (number >= 1 && number <= names.length) index = number - 1;
  }
  if (index < 0) {
    throw new InputError(`no ${role} column "${choice}" (columns: ${listNames(names)})`, { file: source });
  }
  return index;
}

function missingColumn(role: string, recognised: readonly string[], flag: string, names: readonly string[], source: string): InputError {
  return new UnrecognisedColumnError(
    `no ${role} column recognised (looked for ${recognised.join("/")}; columns: ${listNames(names)}); name one with ${flag}`,
    { file: source },
    role,
    names,
  );
}

function listNames(names: readonly string[]): string {
  const shown = names.slice(0, 12).map((n) => JSON.stringify(n));
  return shown.join(", ") + (names.length > 12 ? `, ... (${names.length} in all)` : "");
}
