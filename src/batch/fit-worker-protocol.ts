import type { LightCurve } from "../lightcurve/light-curve.js";
import type { ResultRow } from "./result-row.js";

/** What a fit worker is started with (its `workerData`). */
export interface FitWorkerData {
  /**
   * URL of an ES module exporting `fitLightCurve(lightCurve, options)` (returning a FitResult or a
   * promise of one) and, for objects with several bands, `fitBands(lightCurves, options)` (a FitResult
   * or per-band results); undefined means the project's own fits, `models/fit-band-set.js`.
   */
  readonly fitModule?: string;
}

/** One object to fit, sent from the pool to a worker. */
export interface FitRequest {
  readonly kind: "fit";
  readonly objectId: string;
  /** The object's light curve, or every band's when it has several (then `fitBands` fits them). */
  readonly lightCurves: readonly LightCurve[];
  /** The fit options, with the object's own seed already in `seed`. */
  readonly options: Readonly<Record<string, unknown>> & { readonly seed: number };
}

/** Messages a worker sends to the pool. */
export type FitWorkerMessage =
  | { readonly kind: "ready" }
  | { readonly kind: "load-failed"; readonly reason: string }
  | { readonly kind: "fitted"; readonly row: ResultRow }
  | { readonly kind: "fit-failed"; readonly reason: string };
