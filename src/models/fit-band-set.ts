import type { LightCurve } from "../lightcurve/light-curve.js";
import { fitJointDetailed, type JointFitOptions } from "./fit-joint.js";
import { fitLightCurve } from "./fit-light-curve.js";
import type { FitResult } from "./fit-result.js";
import { perBandResults, type PerBandResults } from "./per-band-results.js";

export { fitLightCurve } from "./fit-light-curve.js";

/** Options of {@link fitBands}: those of a joint fit, and which of the two ways to fit several bands. */
export interface BandSetFitOptions extends JointFitOptions {
  /** "separate" (the default): each band on its own; "joint": one shared process for every band. */
  readonly bands?: "joint" | "separate";
}

/**
 * Fits the bands of one object by the multi-band rule of the command line (docs/multi-band.md): each band
 * on its own by default ({@link PerBandResults}), or with `bands: "joint"` (or `lags` / `referenceBand`,
 * which belong to the joint model) one joint fit. One band is fitted on its own whatever the options.
 * The batch workers call this for objects with several bands (`fitLightCurve` for the others).
 */
export function fitBands(lightCurves: readonly LightCurve[], options: BandSetFitOptions): FitResult | PerBandResults {
  const [first] = lightCurves;
  if (lightCurves.length === 1 && first) return fitLightCurve(first, options);
  const joint = options.bands === "joint" || options.lags === true || options.referenceBand !== undefined;
  if (joint) return fitJointDetailed(lightCurves, options).result;
  return perBandResults(lightCurves.map((lc) => fitLightCurve(lc, options)));
}
