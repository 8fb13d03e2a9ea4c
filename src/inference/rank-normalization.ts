import { normalQuantile } from "./distribution-functions.js";
import { sortedCopy, sortedQuantile } from "../numerics/order-statistics.js";
import { pooledChains } from "../numerics/pooled-chains.js";

/**
 * Splits each chain into its first and second half, doubling the number of chains; with an odd
 * length the middle draw is left out so the halves have equal length. Split chains let R-hat see a
 * trend within a chain (Vehtari et al. 2021, Bayesian Analysis 16, 667, sec. 3).
 */
export function splitChains(chains: readonly ArrayLike<number>[]): Float64Array[] {
  const out: Float64Array[] = [];
  for (const chain of chains) {
    const n = chain.length;
    const half = Math.floor(n / 2);
    const first = new Float64Array(half);
    const second = new Float64Array(half);
    for (let i = 0; i < half; i++) {
      first[i] = chain[i];
      second[i] = chain[n - half + i];
    }
    out.push(first, second);
  }
  return out;
}

/**
 * Rank normalisation: replaces each draw by Phi^-1((r - 3/8) / (S + 1/4)), where r is its rank among
 * all S pooled draws (ties get their average rank) and Phi^-1 the standard normal quantile
 * (Vehtari et al. 2021, Bayesian Analysis 16, 667, eq. 14; the offsets are Blom's 1958).
 */
export function rankNormalize(chains: readonly ArrayLike<number>[]): Float64Array[] {
  const sorted = sortedCopy(pooledChains(chains));
  const total = sorted.length;
  // The normal score of each run of equal sorted values [a, b): average rank (a + 1 + b) / 2, computed
  // once per run (ensemble draws repeat whenever a move is rejected).
  const score = new Float64Array(total);
  for (let a = 0; a < total; ) {
    let b = a + 1;
    while (b < total && sorted[b] === sorted[a]) b++;
    const z = normalQuantile(((a + 1 + b) / 2 - 0.375) / (total + 0.25), 0, 1);
    score.fill(z, a, b);
    a = b;
  }
  return chains.map((chain) => {
    const z = new Float64Array(chain.length);
    for (let i = 0; i < chain.length; i++) z[i] = score[firstAtOrAbove(sorted, chain[i])];
    return z;
  });
}

/** The first index of an ascending array whose value is >= x (binary search). */
function firstAtOrAbove(sorted: Float64Array, x: number): number {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid] < x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * Folds draws about their pooled median, |x - median|, so that R-hat and ESS of the folded draws
 * judge the spread and tails rather than the location (Vehtari et al. 2021, sec. 4.1).
 */
export function foldAboutMedian(chains: readonly ArrayLike<number>[]): Float64Array[] {
  const median = sortedQuantile(sortedCopy(pooledChains(chains)), 0.5);
  return chains.map((chain) => Float64Array.from(chain as ArrayLike<number>, (x) => Math.abs(x - median)));
}
