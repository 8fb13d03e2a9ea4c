import type { LightCurve } from "../lightcurve/light-curve.js";
import type { ResultRow } from "./result-row.js";

/** What a fit worker is started with (its `workerData`). */
export interface FitWorkerData {
  /**
   * URL of an ES module exporting `fitLightCurve(lightCurve, options)` (returning a FitResult or a
   * promise of one); undefined means the project's own fit, `models/fit-light-curve.js`.
   */
  readonly fitModule?: string;
}

/** One object to fit, sent from the pool to a worker. */
export interface FitRequest {
  readonly kind: "fit";
  readonly objectId: string;
  readonly lightCurve: LightCurve;
  /** The fit options, with the object's own seed already in `seed`. */
  readonly options: Readonly<Record<string, unknown>> & { readonly seed: number };
}

/** Messages a worker sends to the pool. */
export type FitWorkerMessage =
  | { readonly kind: "ready" }
  | { readonly kind: "load-failed"; readonly reason: string }
  | { readonly kind: "fitted"; readonly row: ResultRow }
  | { readonly kind: "fit-failed"; readonly reason: string };
