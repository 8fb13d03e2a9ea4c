import { fitGeneralizedPareto, generalizedParetoQuantile } from "./generalized-pareto-fit.js";

/** Importance weights after Pareto smoothing, with the diagnostic that says whether they can be trusted. */
export interface SmoothedWeights {
  /** Normalised weights (sum 1), in the order of the log ratios given. */
  readonly weights: Float64Array;
  /**
   * k-hat: the shape of the generalised Pareto distribution fitted to the largest raw weights. Below
   * {@link paretoShapeThreshold} the smoothed estimates are reliable (Vehtari et al. 2024); NaN when the
   * tail was too short or flat to fit (then no smoothing was done).
   */
  readonly paretoShape: number;
  /** Number of largest weights that were replaced by generalised Pareto quantiles. */
  readonly tailLength: number;
  /** Effective sample size of the smoothed weights, 1 / sum w_s^2 (Kish; Kong 1992). */
  readonly effectiveSampleSize: number;
}

/**
 * The largest k-hat at which Pareto-smoothed importance sampling with S draws is reliable:
 * min(1 - 1 / log10(S), 0.7) (Vehtari, Simpson, Gelman, Yao & Gabry 2024, JMLR 25, sec. 3, from memory).
 * Why: above 0.7 the smoothed estimates converge too slowly to be of use at any practical S, and for
 * smaller S the pre-asymptotic error already dominates at lower k (0.67 at S = 1000, 0.7 from S = 2154).
 */
export function paretoShapeThreshold(draws: number): number {
  return Math.min(1 - 1 / Math.log10(draws), 0.7);
}

/**
 * Pareto-smoothed importance weights (Vehtari, Simpson, Gelman, Yao & Gabry 2024, JMLR 25, from memory):
 * of S log ratios ln p(x_s) - ln q(x_s), the M = min(S / 5, 3 sqrt(S)) largest weights are replaced by
 * the expected order statistics of a generalised Pareto distribution fitted to their excess over the
 * next largest weight, u + q((z - 1/2) / M) for z = 1..M, never above the largest raw weight. This
 * stabilises the estimates when a few weights dominate, and the fitted shape k-hat estimates how heavy
 * the weights' tail is: for ratios with a Pareto tail of shape k the estimate is near k.
 *
 * Non-finite log ratios (-Infinity: a draw outside the target's support) get weight 0.
 */
export function paretoSmoothedWeights(logRatios: ArrayLike<number>): SmoothedWeights {
  const count = logRatios.length;
  if (count < 10) throw new RangeError(`Pareto-smoothed importance weights: needs at least 10 draws, got ${count}`);
  let largest = -Infinity;
  for (let s = 0; s < count; s++) {
    const r = logRatios[s];
    if (Number.isNaN(r) || r === Infinity) throw new RangeError(`Pareto-smoothed importance weights: log ratio ${s} is ${r}`);
    if (r > largest) largest = r;
  }
  if (largest === -Infinity) throw new RangeError("Pareto-smoothed importance weights: every draw has zero weight");
  const weights = Float64Array.from({ length: count }, (_, s) => Math.exp(logRatios[s] - largest));
  const tailLength = Math.min(Math.floor(0.2 * count), Math.ceil(3 * Math.sqrt(count)));
  const order = Int32Array.from({ length: count }, (_, s) => s).sort((a, b) => weights[a] - weights[b]);
  const cutoff = weights[order[count - tailLength - 1]];
  const exceedances = new Float64Array(tailLength);
  for (let z = 0; z < tailLength; z++) exceedances[z] = weights[order[count - tailLength + z]] - cutoff;
  let paretoShape = NaN;
  let smoothed = 0;
  // A tail of ties (weights that are all equal, or zero) carries no shape to fit.
  if (cutoff > 0 && tailLength >= 5 && exceedances[Math.max(0, Math.floor(tailLength / 4 + 0.5) - 1)] > 0) {
    const fit = fitGeneralizedPareto(exceedances);
    paretoShape = fit.shape;
    if (Number.isFinite(fit.shape) && fit.scale > 0) {
      for (let z = 0; z < tailLength; z++) {
        const value = cutoff + generalizedParetoQuantile((z + 0.5) / tailLength, fit.shape, fit.scale);
        weights[order[count - tailLength + z]] = Math.min(value, 1);
      }
      smoothed = tailLength;
    }
  }
  let total = 0;
  for (let s = 0; s < count; s++) total += weights[s];
  let squares = 0;
  for (let s = 0; s < count; s++) {
    weights[s] = weights[s] / total;
    squares += weights[s] * weights[s];
  }
  return { weights, paretoShape, tailLength: smoothed, effectiveSampleSize: 1 / squares };
}
