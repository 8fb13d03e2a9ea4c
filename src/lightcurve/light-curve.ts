/** Whether the values of a light curve are magnitudes or fluxes. */
export type PhotometricUnit = "mag" | "flux";

/**
 * A light curve as Horologium models it: times sorted ascending, values and optional per-point
 * 1-sigma errors, all in the units of the input file. Arrays have equal length.
 */
export interface LightCurve {
  /** Observation times in the input time unit (for example days, MJD or JD), sorted ascending. */
  readonly time: Float64Array;
  /** Magnitudes or fluxes. */
  readonly value: Float64Array;
  /** Per-point 1-sigma errors, in the unit of `value`; absent when the file has no error column. */
  readonly error?: Float64Array;
  /** Magnitudes or fluxes. */
  readonly unit: PhotometricUnit;
  /** The photometric band, when the light curve was selected from a multi-band file. */
  readonly band?: string;
  /** Where the data came from, for results and error messages. */
  readonly provenance: LightCurveProvenance;
}

/** Where a light curve came from and what was done to it on the way in. */
export interface LightCurveProvenance {
  /** The file path, or a label for built-in or simulated data. */
  readonly source: string;
  readonly timeColumn: string;
  readonly valueColumn: string;
  /** The error column, or null when the file has none (a white-noise term is then fitted). */
  readonly errorColumn: string | null;
  /** Rows dropped because a cell was missing (empty, NaN, null) or held a placeholder code (these included). */
  readonly dropped: number;
  /** Of the dropped rows, those whose value or error was a placeholder code (99, 99.99, -99, -999). */
  readonly placeholders?: number;
  /** Whether the rows had to be sorted by time. */
  readonly sorted: boolean;
}
