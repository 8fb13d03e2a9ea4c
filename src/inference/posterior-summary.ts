import { highestDensityInterval } from "./highest-density-interval.js";
import { sortedCopy, sortedQuantile } from "../numerics/order-statistics.js";

/**
 * Posterior summary of one scalar: the keys every result of a fit carries for each parameter
 * (docs/architecture.md, "Result JSON"). Units are those of the draws.
 */
export interface ParameterSummary {
  readonly median: number;
  readonly mean: number;
  /** Standard deviation, divisor n - 1. */
  readonly sd: number;
  readonly "q2.5": number;
  readonly q16: number;
  readonly q84: number;
  readonly "q97.5": number;
}

/** {@link ParameterSummary} plus highest-density intervals. */
export interface PosteriorSummary extends ParameterSummary {
  /** Shortest interval holding 95% of the draws. */
  readonly hdi95: readonly [number, number];
  /** Shortest interval holding 68.27% of the draws (the 1-sigma mass of a normal). */
  readonly hdi68: readonly [number, number];
}

/**
 * Summarises draws of one scalar: median, mean, standard deviation (divisor n - 1), the 2.5, 16, 84
 * and 97.5% quantiles (definition 7 of Hyndman & Fan 1996, Am. Stat. 50, 361) and highest-density
 * intervals of 95% and 68.27% ({@link highestDensityInterval}). Units are those of the draws.
 * With no draws (a run cancelled during warm-up) every figure is NaN.
 */
export function summarizeDraws(draws: ArrayLike<number>): PosteriorSummary {
  const n = draws.length;
  if (n === 0) {
    return { median: NaN, mean: NaN, sd: NaN, "q2.5": NaN, q16: NaN, q84: NaN, "q97.5": NaN, hdi95: [NaN, NaN], hdi68: [NaN, NaN] };
  }
  const sorted = sortedCopy(draws);
  let mean = 0;
  for (let i = 0; i < n; i++) mean += draws[i];
  mean /= n;
  let ss = 0;
  for (let i = 0; i < n; i++) ss += (draws[i] - mean) ** 2;
  return {
    median: sortedQuantile(sorted, 0.5),
    mean,
    sd: n > 1 ? Math.sqrt(ss / (n - 1)) : NaN,
    "q2.5": sortedQuantile(sorted, 0.025),
    q16: sortedQuantile(sorted, 0.16),
    q84: sortedQuantile(sorted, 0.84),
    "q97.5": sortedQuantile(sorted, 0.975),
    hdi95: highestDensityInterval(sorted, 0.95),
    hdi68: highestDensityInterval(sorted, 0.6827),
  };
}
