import { formVariance, type SemiseparableForm } from "../linalg/semiseparable-form.js";
import { SemiseparableFactorization } from "../linalg/semiseparable-factorization.js";
import type { Rng } from "../random/rng.js";

/**
 * Diagonal added to the noise-free covariance before drawing, relative to k(0): keeps repeated times
 * factorisable and is far below any photometric error (common practice).
 */
export const DRAW_JITTER = 1e-10;

/** The LDL factorisation of the noise-free kernel matrix at sorted `time` (plus `DRAW_JITTER` k(0)). */
export function priorFactorization(form: SemiseparableForm, time: Float64Array): SemiseparableFactorization {
  const jitter = DRAW_JITTER * formVariance(form);
  return new SemiseparableFactorization(form, time, new Float64Array(time.length).fill(jitter));
}

/**
 * A draw of the latent process from the prior: mean + L D^{1/2} xi with xi standard normal and L D L^T
 * the {@link priorFactorization} at the draw's times. O(N R) given the factorisation.
 */
export function semiseparablePriorDraw(factor: SemiseparableFactorization, mean: number, rng: Rng): Float64Array {
  const xi = new Float64Array(factor.pivots.length);
  for (let i = 0; i < xi.length; i++) xi[i] = rng.normal();
  const draw = factor.correlate(xi);
  for (let i = 0; i < draw.length; i++) draw[i] += mean;
  return draw;
}
