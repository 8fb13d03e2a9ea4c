import { RESULT_FORMAT_VERSION, type FitResult } from "./fit-result.js";

/** The JSON of separate fits of several bands: one result per band, by band name (an object, never a list). */
export interface PerBandResults {
  readonly formatVersion: number;
  readonly perBand: Readonly<Record<string, FitResult>>;
}

/** Wraps per-band results into the one JSON object of separate band fits. */
export function perBandResults(results: readonly FitResult[]): PerBandResults {
  return { formatVersion: RESULT_FORMAT_VERSION, perBand: Object.fromEntries(results.map((r) => [r.data.band ?? "", r])) };
}

/** Whether a parsed result JSON holds separate band fits rather than one fit. */
export function isPerBandResults(value: FitResult | PerBandResults): value is PerBandResults {
  return "perBand" in value;
}
