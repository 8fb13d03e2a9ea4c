import type { ColumnChoice } from "./column-choice.js";
import { InputError } from "../errors/input-error.js";
import type { LightCurve, PhotometricUnit } from "./light-curve.js";
import { isPlaceholderRow, PLACEHOLDER_CODES } from "./placeholder-values.js";
import { fluxErrorToMagnitudeError, fluxToMagnitude, magnitudeErrorToFluxError, magnitudeToFlux } from "./units.js";

/**
 * The columns a reader extracted from a table, before validation: one entry per data row, missing
 * cells as NaN (band: null), with the file line (text) or 1-based row (binary tables) of every row.
 * Readers have already rejected garbage and infinite cells.
 */
export interface ObservationColumns {
  readonly source: string;
  /** Whether `positions` are 1-based file lines (text) or 1-based table rows (Parquet, FITS). */
  readonly positionKind: "line" | "row";
  readonly positions: ArrayLike<number>;
  readonly time: ArrayLike<number>;
  readonly value: ArrayLike<number>;
  readonly error: ArrayLike<number> | null;
  readonly band: ReadonlyArray<string | null> | null;
  readonly choice: ColumnChoice;
}

/** Options of {@link assembleLightCurves}. */
export interface AssembleOptions {
  /** Keep only this band (needs a band column). */
  readonly band?: string;
  /** Fewest usable points per light curve (default `DEFAULT_MINIMUM_POINTS`). */
  readonly minimumPoints?: number;
  /** Convert values and errors to this unit (first-order error propagation). */
  readonly convertTo?: PhotometricUnit;
  /** Zero point for conversions: m = -2.5 log10 f + zeroPoint (default 0). */
  readonly zeroPoint?: number;
  /**
   * Keep rows whose value or error is a placeholder code (99, 99.99, -99, -999; see
   * placeholder-values.ts) as if they were measurements. Default false: they are dropped and counted.
   */
  readonly keepPlaceholders?: boolean;
}

/** The light curves of one table and what the user should be told about them. */
export interface LightCurveSet {
  /** One light curve per band in order of first appearance, or a single one. */
  readonly lightCurves: LightCurve[];
  readonly warnings: string[];
}

/**
 * Fewest usable points accepted by default. A Gaussian-process model has 3 to 6 parameters and the
 * periodogram's false-alarm estimate needs N > 3; below 5 points nothing useful can be learnt.
 */
export const DEFAULT_MINIMUM_POINTS = 5;

/** The rows of one band: those kept, and those dropped as missing or as placeholders (counts and the first few positions). */
interface BandRows {
  readonly rows: number[];
  dropped: number;
  readonly droppedPositions: number[];
  placeholders: number;
  readonly placeholderPositions: number[];
}

/** Rows whose position is listed in a warning, at most. */
const POSITIONS_SHOWN = 5;

/** Where row i is, for an error message naming file, line (or row) and column. */
function rowLocation(columns: ObservationColumns, i: number, column: string) {
  return columns.positionKind === "line"
    ? { file: columns.source, line: columns.positions[i], column }
    : { file: columns.source, row: columns.positions[i], column };
}

/**
 * Stage 1: the kept rows grouped by band in order of first appearance, rows with a missing value or a
 * placeholder code counted per band, rows with no band counted; a non-positive error is an InputError.
 */
function groupRowsByBand(columns: ObservationColumns, options: AssembleOptions): { groups: Map<string, BandRows>; droppedWithoutBand: number } {
  const { choice } = columns;
  const groups = new Map<string, BandRows>();
  let droppedWithoutBand = 0;
  for (let i = 0; i < columns.time.length; i++) {
    const band = columns.band ? columns.band[i] : "";
    if (columns.band && (band === null || band.trim() === "")) {
      droppedWithoutBand++;
      continue;
    }
    if (options.band !== undefined && band !== options.band) continue;
    let g = groups.get(band!);
    if (!g) groups.set(band!, (g = { rows: [], dropped: 0, droppedPositions: [], placeholders: 0, placeholderPositions: [] }));
    const missing =
      Number.isNaN(columns.time[i]) || Number.isNaN(columns.value[i]) || (columns.error !== null && Number.isNaN(columns.error[i]));
    if (missing) {
      g.dropped++;
      if (g.droppedPositions.length < POSITIONS_SHOWN) g.droppedPositions.push(columns.positions[i]);
      continue;
    }
    if (!options.keepPlaceholders && isPlaceholderRow(columns.value[i], columns.error?.[i], choice.unit)) {
      g.placeholders++;
      if (g.placeholderPositions.length < POSITIONS_SHOWN) g.placeholderPositions.push(columns.positions[i]);
      continue;
    }
    if (columns.error !== null && !(columns.error[i] > 0)) {
      throw new InputError(`error ${columns.error[i]} is not positive`, rowLocation(columns, i, choice.error!.name));
    }
    g.rows.push(i);
  }
  return { groups, droppedWithoutBand };
}

/** Stage 2: an InputError when the band asked for has no rows or no band has any. */
function requireRows(columns: ObservationColumns, options: AssembleOptions, groups: Map<string, BandRows>, minimumPoints: number): void {
  const { source, choice } = columns;
  if (options.band !== undefined && !groups.has(options.band)) {
    const present = new Set<string>();
    for (const b of columns.band!) if (b !== null && b.trim() !== "") present.add(b);
    throw new InputError(`no rows for band "${options.band}" (bands present: ${[...present].join(", ") || "none"})`, {
      file: source,
      column: choice.band!.name,
    });
  }
  if (groups.size === 0) {
    throw new InputError(`no data rows (at least ${minimumPoints} points are needed)`, { file: source });
  }
}

/** Stage 3: the warnings that count one band's dropped rows (missing values, placeholder codes), with their first positions. */
function exclusionWarnings(columns: ObservationColumns, label: string, g: BandRows): string[] {
  const { source, positionKind: kind } = columns;
  const warnings: string[] = [];
  if (g.dropped > 0) {
    const shown = g.droppedPositions.join(", ") + (g.dropped > g.droppedPositions.length ? ", ..." : "");
    warnings.push(`${source}:${label} dropped ${g.dropped} row(s) with a missing value (${kind}s ${shown})`);
  }
  if (g.placeholders > 0) {
    const shown = g.placeholderPositions.join(", ") + (g.placeholders > g.placeholderPositions.length ? ", ..." : "");
    warnings.push(
      `${source}:${label} dropped ${g.placeholders} row(s) whose value or error is a placeholder code ` +
        `(${PLACEHOLDER_CODES.join(", ")}) rather than a measurement (${kind}s ${shown}); keep them with --keep-placeholders`,
    );
  }
  return warnings;
}

/**
 * Stage 4: one band's rows put in time order (in place; Array.prototype.sort is stable, so repeated times
 * keep their file order); returns whether they had to be sorted. An InputError when all times are equal.
 */
function sortRowsByTime(columns: ObservationColumns, rows: number[]): boolean {
  let sorted = false;
  for (let k = 1; k < rows.length; k++) {
    if (columns.time[rows[k]] < columns.time[rows[k - 1]]) {
      sorted = true;
      break;
    }
  }
  if (sorted) rows.sort((a, b) => columns.time[a] - columns.time[b]);
  if (columns.time[rows[rows.length - 1]] === columns.time[rows[0]]) {
    throw new InputError(`all ${rows.length} times are equal (${columns.time[rows[0]]}); a light curve needs a time span`, {
      file: columns.source,
      column: columns.choice.time.name,
    });
  }
  return sorted;
}

/** Stage 5: the values and errors of the rows, converted to the unit asked for (first-order error propagation). */
function convertedMeasurements(columns: ObservationColumns, rows: readonly number[], options: AssembleOptions) {
  const { choice } = columns;
  const m = rows.length;
  const time = new Float64Array(m);
  const value = new Float64Array(m);
  const error = columns.error ? new Float64Array(m) : undefined;
  const unit = options.convertTo ?? choice.unit;
  const zeroPoint = options.zeroPoint ?? 0;
  for (let k = 0; k < m; k++) {
    const i = rows[k];
    time[k] = columns.time[i];
    const v = columns.value[i];
    const e = columns.error ? columns.error[i] : 0;
    if (unit === choice.unit) {
      value[k] = v;
      if (error) error[k] = e;
    } else if (unit === "mag") {
      if (!(v > 0)) {
        throw new InputError(`flux ${v} is not positive, so it has no magnitude`, rowLocation(columns, i, choice.value.name));
      }
      value[k] = fluxToMagnitude(v, zeroPoint);
      if (error) error[k] = fluxErrorToMagnitudeError(e, v);
    } else {
      value[k] = magnitudeToFlux(v, zeroPoint);
      if (error) error[k] = magnitudeErrorToFluxError(e, value[k]);
    }
  }
  return { time, value, error, unit };
}

/**
 * Validates extracted columns and builds light curves: drops rows with a missing time, value, error or
 * band, and rows whose value or error is a placeholder code (both counted in `provenance.dropped`, the
 * placeholders also in `provenance.placeholders`, with a warning); rejects non-positive errors with their line;
 * splits by band (or keeps `options.band`); sorts each light curve by time (stable, repeated times
 * kept); rejects too few points and zero time span; converts units if asked. Stages: `groupRowsByBand`,
 * `requireRows`, then per band `exclusionWarnings`, `sortRowsByTime`, `convertedMeasurements`.
 */
export function assembleLightCurves(columns: ObservationColumns, options: AssembleOptions = {}): LightCurveSet {
  const { source, choice } = columns;
  const minimumPoints = options.minimumPoints ?? DEFAULT_MINIMUM_POINTS;
  if (!(Number.isInteger(minimumPoints) && minimumPoints >= 2)) {
    throw new InputError(`minimum number of points must be an integer >= 2, got ${minimumPoints}`, { file: source });
  }
  const warnings = [...choice.warnings];
  if (options.band !== undefined && !columns.band) {
    throw new InputError(`a band ("${options.band}") was asked for but the table has no band column`, { file: source });
  }

  const { groups, droppedWithoutBand } = groupRowsByBand(columns, options);
  if (droppedWithoutBand > 0) {
    warnings.push(`${source}: dropped ${droppedWithoutBand} row(s) with no band in column "${choice.band!.name}"`);
  }
  requireRows(columns, options, groups, minimumPoints);

  const lightCurves: LightCurve[] = [];
  for (const [band, g] of groups) {
    const label = columns.band ? ` band "${band}":` : "";
    for (const warning of exclusionWarnings(columns, label, g)) warnings.push(warning);
    const excluded = g.dropped + g.placeholders;
    const rows = g.rows;
    if (rows.length < minimumPoints) {
      throw new InputError(
        `${label ? label.slice(1) + " " : ""}only ${rows.length} usable point(s)` +
          `${excluded > 0 ? ` after dropping ${excluded} with missing values${g.placeholders > 0 ? " or placeholder codes" : ""}` : ""}; ` +
          `at least ${minimumPoints} are needed`,
        { file: source },
      );
    }
    const sorted = sortRowsByTime(columns, rows);
    if (sorted) warnings.push(`${source}:${label} rows were not in time order; sorted by time`);
    const { time, value, error, unit } = convertedMeasurements(columns, rows, options);
    lightCurves.push({
      time,
      value,
      error,
      unit,
      ...(columns.band ? { band } : {}),
      provenance: {
        source,
        timeColumn: choice.time.name,
        valueColumn: choice.value.name,
        errorColumn: choice.error ? choice.error.name : null,
        dropped: excluded,
        placeholders: g.placeholders,
        sorted,
      },
    });
  }
  return { lightCurves, warnings };
}
