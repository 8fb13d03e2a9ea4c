import { foldAboutMedian, rankNormalize, splitChains } from "./rank-normalization.js";

/** Mean and unbiased variance (divisor n - 1) of one chain. */
export function chainMoments(chain: ArrayLike<number>): { mean: number; variance: number } {
  const n = chain.length;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += chain[i];
  mean /= n;
  let ss = 0;
  for (let i = 0; i < n; i++) ss += (chain[i] - mean) ** 2;
  return { mean, variance: n > 1 ? ss / (n - 1) : NaN };
}

/**
 * Within-chain variance W, between-chain variance B and the pooled estimate
 * var+ = (N - 1)/N W + B/N for M chains of N draws, with W = mean of the chain variances (divisor
 * N - 1) and B = N/(M - 1) sum_m (mean_m - mean)^2 (Gelman et al., Bayesian Data Analysis, 3rd ed.,
 * eq. 11.2-11.3; Vehtari et al. 2021, eq. 1-3).
 */
export function varianceComponents(chains: readonly ArrayLike<number>[]): {
  within: number;
  between: number;
  pooledVariance: number;
  draws: number;
} {
  const m = chains.length;
  const n = chains[0]?.length ?? 0;
  for (const c of chains) if (c.length !== n) throw new RangeError("R-hat: chains must have equal length");
  const moments = chains.map(chainMoments);
  const grand = moments.reduce((s, x) => s + x.mean, 0) / m;
  const within = moments.reduce((s, x) => s + x.variance, 0) / m;
  const between = m > 1 ? (n / (m - 1)) * moments.reduce((s, x) => s + (x.mean - grand) ** 2, 0) : 0;
  return { within, between, pooledVariance: ((n - 1) / n) * within + between / n, draws: n };
}

/** Classic potential scale reduction sqrt(var+ / W) of the chains as given (no splitting). */
export function potentialScaleReduction(chains: readonly ArrayLike<number>[]): number {
  const { within, pooledVariance } = varianceComponents(chains);
  return Math.sqrt(pooledVariance / within);
}

/**
 * Rank-normalised split R-hat of Vehtari et al. 2021 (Bayesian Analysis 16, 667, sec. 4.1): the larger
 * of the split R-hat of the rank-normalised draws (bulk) and of the rank-normalised draws folded about
 * the median (tails). Converged chains give values near 1; the paper recommends below 1.01.
 */
export function rankNormalizedSplitRhat(chains: readonly ArrayLike<number>[]): number {
  const split = splitChains(chains);
  const bulk = potentialScaleReduction(rankNormalize(split));
  const tail = potentialScaleReduction(rankNormalize(foldAboutMedian(split)));
  return Math.max(bulk, tail);
}
