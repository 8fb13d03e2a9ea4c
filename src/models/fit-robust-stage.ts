import type { LightCurve } from "../lightcurve/light-curve.js";
import type { LightCurveModel } from "./light-curve-model.js";
import { robustNoiseWeights, runningMedianWeights, withNoiseWeights, type RobustNoise } from "./robust-noise.js";

/** The light curve the posterior is conditioned on, and the robust weights that made it (if asked for). */
export interface NoiseConditioning {
  /** The input light curve, or a copy with each error divided by sqrt(weight). */
  readonly conditioning: LightCurve;
  readonly robust?: RobustNoise;
}

/**
 * The robust-noise stage of a fit: with `robust`, Student-t noise as per-point weights
 * (`robustNoiseWeights`) folded into the errors; otherwise the light curve unchanged.
 */
export function noiseConditioning(model: LightCurveModel, lightCurve: LightCurve, robust: boolean): NoiseConditioning {
  if (!robust) return { conditioning: lightCurve };
  const weights = robustNoiseWeights(model, lightCurve);
  return { conditioning: withNoiseWeights(lightCurve, weights.weights), robust: weights };
}

/**
 * The light curve the period search of a fit sees: with `robust`, each error divided by the square root
 * of its Student-t weight about the running median ({@link runningMedianWeights}), so that gross
 * outliers, which would put the highest periodogram peak anywhere, count for little (the robust weights
 * proper need the model, which needs the period guess); otherwise the light curve unchanged.
 */
export function periodSearchCurve(lightCurve: LightCurve, robust: boolean): LightCurve {
  return robust && lightCurve.error ? withNoiseWeights(lightCurve, runningMedianWeights(lightCurve)) : lightCurve;
}
