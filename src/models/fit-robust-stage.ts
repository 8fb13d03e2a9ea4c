import type { LightCurve } from "../lightcurve/light-curve.js";
import type { LightCurveModel } from "./light-curve-model.js";
import { robustNoiseWeights, withNoiseWeights, type RobustNoise } from "./robust-noise.js";

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
