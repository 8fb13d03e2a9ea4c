import type { LightCurve } from "../lightcurve/light-curve.js";
import { parseCarmaOrder } from "./carma-model.js";
import { summarizeLightCurve } from "./data-summary.js";
import type { FitResult } from "./fit-result.js";
import { robustWeightsAt, withNoiseWeights } from "./robust-noise.js";
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
 * weights (error / sqrt(weight)), recomputed from the light curve at the result's `robust.weightParameters`
 * ({@link robustWeightsAt}: the same deterministic computation the fit conditioned on, so the result need
 * not store N weights); otherwise the light curve itself.
 */
export function conditioningLightCurve(result: FitResult, lightCurve: LightCurve): LightCurve {
  if (!result.robust) return lightCurve;
  if (result.robust.points !== lightCurve.time.length)
    throw new RangeError(`the result's robust weights are for ${result.robust.points} points, the light curve has ${lightCurve.time.length}`);
  const model = modelFromResult(result, lightCurve);
  const { weights } = robustWeightsAt(model, lightCurve, model.space.physicalFromRecord(result.robust.weightParameters));
  return withNoiseWeights(lightCurve, weights);
}
