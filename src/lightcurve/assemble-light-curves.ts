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

/**
 * Validates extracted columns and builds light curves: drops rows with a missing time, value, error or
 * band, and rows whose value or error is a placeholder code (both counted in `provenance.dropped`, the
 * placeholders also in `provenance.placeholders`, with a warning); rejects non-positive errors with their line;
 * splits by band (or keeps `options.band`); sorts each light curve by time (stable, repeated times
 * kept); rejects too few points and zero time span; converts units if asked.
 */
export function assembleLightCurves(columns: ObservationColumns, options: AssembleOptions = {}): LightCurveSet {
  const { source, choice } = columns;
  const n = columns.time.length;
  const minimumPoints = options.minimumPoints ?? DEFAULT_MINIMUM_POINTS;
  if (!(Number.isInteger(minimumPoints) && minimumPoints >= 2)) {
    throw new InputError(`minimum number of points must be an integer >= 2, got ${minimumPoints}`, { file: source });
  }
  const where = (i: number, column: string) =>
    columns.positionKind === "line"
      ? { file: source, line: columns.positions[i], column }
      : { file: source, row: columns.positions[i], column };
  const warnings = [...choice.warnings];

  if (options.band !== undefined && !columns.band) {
    throw new InputError(`a band ("${options.band}") was asked for but the table has no band column`, { file: source });
  }

  // Group kept rows by band, in order of first appearance; count dropped rows per band.
  const groups = new Map<string, { rows: number[]; dropped: number; droppedPositions: number[]; placeholders: number; placeholderPositions: number[] }>();
  const group = (key: string) => {
    let g = groups.get(key);
    if (!g) groups.set(key, (g = { rows: [], dropped: 0, droppedPositions: [], placeholders: 0, placeholderPositions: [] }));
    return g;
  };
  let droppedWithoutBand = 0;
  for (let i = 0; i < n; i++) {
    const band = columns.band ? columns.band[i] : "";
    if (columns.band && (band === null || band.trim() === "")) {
      droppedWithoutBand++;
      continue;
    }
    if (options.band !== undefined && band !== options.band) continue;
    const g = group(band!);
    const missing =
      Number.isNaN(columns.time[i]) || Number.isNaN(columns.value[i]) || (columns.error !== null && Number.isNaN(columns.error[i]));
    if (missing) {
      g.dropped++;
      if (g.droppedPositions.length < 5) g.droppedPositions.push(columns.positions[i]);
      continue;
    }
    if (!options.keepPlaceholders && isPlaceholderRow(columns.value[i], columns.error?.[i], choice.unit)) {
      g.placeholders++;
      if (g.placeholderPositions.length < 5) g.placeholderPositions.push(columns.positions[i]);
      continue;
    }
    if (columns.error !== null && !(columns.error[i] > 0)) {
      throw new InputError(`error ${columns.error[i]} is not positive`, where(i, choice.error!.name));
    }
    g.rows.push(i);
  }
  if (droppedWithoutBand > 0) {
    warnings.push(`${source}: dropped ${droppedWithoutBand} row(s) with no band in column "${choice.band!.name}"`);
  }
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

  const lightCurves: LightCurve[] = [];
  for (const [band, g] of groups) {
    const label = columns.band ? ` band "${band}":` : "";
    if (g.dropped > 0) {
      const kind = columns.positionKind;
      const shown = g.droppedPositions.join(", ") + (g.dropped > g.droppedPositions.length ? ", ..." : "");
      warnings.push(`${source}:${label} dropped ${g.dropped} row(s) with a missing value (${kind}s ${shown})`);
    }
    if (g.placeholders > 0) {
      const kind = columns.positionKind;
      const shown = g.placeholderPositions.join(", ") + (g.placeholders > g.placeholderPositions.length ? ", ..." : "");
      warnings.push(
        `${source}:${label} dropped ${g.placeholders} row(s) whose value or error is a placeholder code ` +
          `(${PLACEHOLDER_CODES.join(", ")}) rather than a measurement (${kind}s ${shown}); keep them with --keep-placeholders`,
      );
    }
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
    let sorted = false;
    for (let k = 1; k < rows.length; k++) {
      if (columns.time[rows[k]] < columns.time[rows[k - 1]]) {
        sorted = true;
        break;
      }
    }
    // Array.prototype.sort is stable, so repeated times keep their file order.
    if (sorted) rows.sort((a, b) => columns.time[a] - columns.time[b]);
    if (columns.time[rows[rows.length - 1]] === columns.time[rows[0]]) {
      throw new InputError(`all ${rows.length} times are equal (${columns.time[rows[0]]}); a light curve needs a time span`, {
        file: source,
        column: choice.time.name,
      });
    }
    if (sorted) warnings.push(`${source}:${label} rows were not in time order; sorted by time`);

    const m = rows.length;
    const time = new Float64Array(m);
    const value = new Float64Array(m);
    const error = columns.error ? new Float64Array(m) : undefined;
    const target = options.convertTo ?? choice.unit;
    const zeroPoint = options.zeroPoint ?? 0;
    for (let k = 0; k < m; k++) {
      const i = rows[k];
      time[k] = columns.time[i];
      const v = columns.value[i];
      const e = columns.error ? columns.error[i] : 0;
      if (target === choice.unit) {
        value[k] = v;
        if (error) error[k] = e;
      } else if (target === "mag") {
        if (!(v > 0)) {
          throw new InputError(`flux ${v} is not positive, so it has no magnitude`, where(i, choice.value.name));
        }
        value[k] = fluxToMagnitude(v, zeroPoint);
        if (error) error[k] = fluxErrorToMagnitudeError(e, v);
      } else {
        value[k] = magnitudeToFlux(v, zeroPoint);
        if (error) error[k] = magnitudeErrorToFluxError(e, value[k]);
      }
    }
    lightCurves.push({
      time,
      value,
      error,
      unit: target,
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
