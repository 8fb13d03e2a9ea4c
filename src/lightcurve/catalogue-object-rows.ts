import { assembleLightCurves } from "./assemble-light-curves.js";
import type { ColumnChoice } from "./column-choice.js";
import type { DelimitedReadOptions } from "./delimited-light-curve.js";
import { InputError } from "../errors/input-error.js";
import type { LightCurve } from "./light-curve.js";

/** One object of a catalogue table. */
export interface CatalogueEntry {
  readonly id: string;
  /** The object's light curves: one per band, or one; empty when `problem` is set. */
  readonly lightCurves: LightCurve[];
  /** The light curve when there is exactly one (a single band, or `band` chosen). */
  readonly lightCurve?: LightCurve;
  /** Dropped rows, sorting, assumed units. */
  readonly warnings: string[];
  /** Why this object has no light curve: a one-line message naming file, line and column. */
  readonly problem?: string;
}

/** The rows of one object of a catalogue table gathered so far (text or Parquet). */
export interface ObjectRows {
  readonly id: string;
  /** 1-based file lines (text) or table rows (Parquet) of the object's rows. */
  readonly positions: number[];
  readonly time: number[];
  readonly value: number[];
  readonly error: number[] | null;
  readonly band: (string | null)[] | null;
  problem?: string;
}

export function newObjectRows(id: string, choice: ColumnChoice): ObjectRows {
  return { id, positions: [], time: [], value: [], error: choice.error ? [] : null, band: choice.band ? [] : null };
}

/** The object's light curves from its rows, or the one-line reason it has none. */
export function finishObject(
  rows: ObjectRows,
  path: string,
  positionKind: "line" | "row",
  choice: ColumnChoice,
  options: DelimitedReadOptions,
): CatalogueEntry {
  if (rows.problem !== undefined) return { id: rows.id, lightCurves: [], warnings: [], problem: `object "${rows.id}": ${rows.problem}` };
  try {
    const set = assembleLightCurves(
      { source: path, positionKind, positions: rows.positions, time: rows.time, value: rows.value, error: rows.error, band: rows.band, choice },
      options,
    );
    return {
      id: rows.id,
      lightCurves: set.lightCurves,
      ...(set.lightCurves.length === 1 ? { lightCurve: set.lightCurves[0] } : {}),
      warnings: set.warnings.map((w) => `object "${rows.id}": ${w}`),
    };
  } catch (problem) {
    if (!(problem instanceof InputError)) throw problem;
    return { id: rows.id, lightCurves: [], warnings: [], problem: `object "${rows.id}": ${problem.message}` };
  }
}

/** The error for an object id that reappears after another object. */
export function notContiguous(id: string, where: { file: string; line?: number; row?: number; column: string }): InputError {
  return new InputError(
    `rows of object "${id}" are not contiguous (it appeared before another object); sort or group the catalogue by the id column`,
    where,
  );
}
