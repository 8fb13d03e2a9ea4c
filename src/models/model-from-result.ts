import type { LightCurve } from "../lightcurve/light-curve.js";
import { summarizeLightCurve } from "./data-summary.js";
import type { FitResult } from "./fit-result.js";
import { withNoiseWeights } from "./robust-noise.js";
import { buildModel, MODEL_NAMES, type LightCurveModel, type ModelName } from "./light-curve-model.js";

/**
 * Rebuilds the model a result was fitted with, for the same light curve: the same data-driven priors and
 * structure (background, jitter), so that stored posterior draws can be used again (predictions, reports).
 */
export function modelFromResult(result: FitResult, lightCurve: LightCurve): LightCurveModel {
  const name = result.model as ModelName;
  if (!MODEL_NAMES.includes(name)) throw new RangeError(`the result's model "${String(result.model)}" is not one of ${MODEL_NAMES.join(", ")}`);
  const options = (result.options ?? {}) as { background?: "drw"; jitter?: boolean };
  return buildModel(name, summarizeLightCurve(lightCurve), {
    ...(options.background ? { background: options.background } : {}),
    ...(options.jitter ? { jitter: true } : {}),
  });
}

/**
 * The light curve a result's posterior was conditioned on: with robust noise, the errors inflated by the
 * stored weights (error / sqrt(weight)); otherwise the light curve itself.
 */
export function conditioningLightCurve(result: FitResult, lightCurve: LightCurve): LightCurve {
  const robust = result.robust as { weights?: number[] } | undefined;
  if (!robust?.weights) return lightCurve;
  return withNoiseWeights(lightCurve, robust.weights);
}
