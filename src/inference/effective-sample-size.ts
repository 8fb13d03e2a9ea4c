import { autocovariances } from "./autocorrelation.js";
import { sortedCopy, sortedQuantile } from "../numerics/order-statistics.js";
import { pooledChains } from "../numerics/pooled-chains.js";
import { rankNormalize, splitChains } from "./rank-normalization.js";
import { varianceComponents } from "./split-rhat.js";

/**
 * Effective sample size of M chains of N draws, as given (no splitting or normalisation):
 * rho_t = 1 - (W - (1/M) sum_m s_m^2 rho_{t,m}) / var+ combines the chains' autocorrelations
 * rho_{t,m} (s_m^2 the chain variance, so s_m^2 rho_{t,m} = c_{t,m} N / (N - 1) with c the divisor-N
 * autocovariance); Geyer's initial monotone sequence of pair sums P_k = rho_{2k} + rho_{2k+1}, kept
 * while positive and made non-increasing, gives tau = -1 + 2 sum_k P_k and ESS = N M / tau
 * (Vehtari et al. 2021, Bayesian Analysis 16, 667, eq. 10-11; Geyer 1992, Stat. Sci. 7, 473).
 * NaN when the draws do not vary.
 */
export function effectiveSampleSize(chains: readonly ArrayLike<number>[]): number {
  const m = chains.length;
  if (m === 0) return NaN;
  const { within, pooledVariance, draws: n } = varianceComponents(chains);
  if (n < 4 || !(pooledVariance > 0)) return NaN;
  const meanAutocov = new Float64Array(n);
  for (const c of autocovariances(chains)) {
    for (let t = 0; t < n; t++) meanAutocov[t] = meanAutocov[t] + c[t] / m;
  }
  const rho = (t: number): number => 1 - (within - (meanAutocov[t] * n) / (n - 1)) / pooledVariance;
  let sum = 0;
  let previousPair = Infinity;
  for (let k = 0; 2 * k + 1 < n; k++) {
    let pair = rho(2 * k) + rho(2 * k + 1);
    if (!(pair > 0)) break;
    if (pair > previousPair) pair = previousPair;
    previousPair = pair;
    sum += pair;
  }
  const tau = -1 + 2 * sum;
  return (n * m) / tau;
}

/**
 * Bulk effective sample size: the ESS of the rank-normalised split chains (Vehtari et al. 2021, sec. 4.2).
 */
export function bulkEffectiveSampleSize(chains: readonly ArrayLike<number>[]): number {
  return effectiveSampleSize(rankNormalize(splitChains(chains)));
}

/**
 * Tail effective sample size: the smaller ESS of the split-chain indicators I(x <= q_0.05) and
 * I(x >= q_0.95), with the quantiles of the pooled draws (Vehtari et al. 2021, sec. 4.3). It governs
 * how well the 5% and 95% quantiles are estimated.
 */
export function tailEffectiveSampleSize(chains: readonly ArrayLike<number>[]): number {
  const split = splitChains(chains);
  const sorted = sortedCopy(pooledChains(split));
  const q05 = sortedQuantile(sorted, 0.05);
  const q95 = sortedQuantile(sorted, 0.95);
  const lower = split.map((c) => Float64Array.from(c, (x) => (x <= q05 ? 1 : 0)));
  const upper = split.map((c) => Float64Array.from(c, (x) => (x >= q95 ? 1 : 0)));
  return Math.min(effectiveSampleSize(lower), effectiveSampleSize(upper));
}
