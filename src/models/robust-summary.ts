import type { LightCurve } from "../lightcurve/light-curve.js";
import { sortedQuantile } from "../numerics/order-statistics.js";
import { MAX_FLAGGED_POINTS_STORED, type RobustFlaggedPoint, type RobustNoiseSummary } from "./fit-result.js";
import type { RobustNoise } from "./robust-noise.js";

/** Outlier probability above which a point counts as a likely outlier (more likely than not). */
export const LIKELY_OUTLIER = 0.5;

/**
 * The `robust` section of a fit result, bounded in size whatever N: the likely outliers (outlier
 * probability > 1/2; at most {@link MAX_FLAGGED_POINTS_STORED}, the most probable, in time order) with
 * their time, value, weight and probability; the minimum, median and maximum weight and the count below
 * 1/2; and the parameters at which the weights were computed, which with the light curve give every
 * weight again (`robustWeightsAt`).
 */
export function robustSummary(robust: RobustNoise, lightCurve: LightCurve): RobustNoiseSummary {
  const { weights, outlierProbability } = robust;
  const likely: number[] = [];
  for (let i = 0; i < outlierProbability.length; i++) if (outlierProbability[i] > LIKELY_OUTLIER) likely.push(i);
  const kept =
    likely.length > MAX_FLAGGED_POINTS_STORED
      ? likely
          .sort((a, b) => outlierProbability[b] - outlierProbability[a] || a - b)
          .slice(0, MAX_FLAGGED_POINTS_STORED)
          .sort((a, b) => a - b)
      : likely;
  const flagged = kept.map((i): RobustFlaggedPoint => ({
    index: i,
    time: lightCurve.time[i],
    value: lightCurve.value[i],
    weight: weights[i],
    outlierProbability: outlierProbability[i],
  }));
  const sorted = Float64Array.from(weights).sort();
  let belowHalf = 0;
  for (const w of weights) if (w < 0.5) belowHalf++;
  return {
    noise: `Student-t, ${robust.degreesOfFreedom} degrees of freedom (scale mixture of Gaussians, EM weights)`,
    degreesOfFreedom: robust.degreesOfFreedom,
    likelyOutliers: likely.length,
    points: weights.length,
    weightParameters: robust.parameters,
    weightSummary: {
      minimum: sorted[0] ?? NaN,
      median: sorted.length > 0 ? sortedQuantile(sorted, 0.5) : NaN,
      maximum: sorted[sorted.length - 1] ?? NaN,
      belowHalf,
    },
    flagged,
  };
}
