import type { LightCurve } from "../lightcurve/light-curve.js";
import { parseCarmaOrder } from "./carma-model.js";
import { summarizeLightCurve } from "./data-summary.js";
import type { FitResult } from "./fit-result.js";
import { withNoiseWeights } from "./robust-noise.js";
import { buildModel, type LightCurveModel } from "./light-curve-model.js";

/**
 * Rebuilds the model a result was fitted with, for the same light curve: the same data-driven priors and
 * structure (background, jitter), so that stored posterior draws can be used again (predictions, reports).
 */
export function modelFromResult(result: FitResult, lightCurve: LightCurve): LightCurveModel {
  const options = result.options;
  return buildModel(result.model, summarizeLightCurve(lightCurve), {
    ...(options.background ? { background: options.background } : {}),
    ...(options.jitter ? { jitter: true } : {}),
    ...(options.order !== undefined ? { order: parseCarmaOrder(options.order) } : {}),
  });
}

/**
 * The light curve a result's posterior was conditioned on: with robust noise, the errors inflated by the
 * stored weights (error / sqrt(weight)); otherwise the light curve itself.
 */
export function conditioningLightCurve(result: FitResult, lightCurve: LightCurve): LightCurve {
  if (!result.robust) return lightCurve;
  if (result.robust.weights.length !== lightCurve.time.length)
    throw new RangeError(`the result's robust weights are for ${result.robust.weights.length} points, the light curve has ${lightCurve.time.length}`);
  return withNoiseWeights(lightCurve, result.robust.weights);
}
