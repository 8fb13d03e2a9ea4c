import type { Rng } from "../../src/random/rng.js";

/**
 * Irregular times with months-long seasonal gaps: `seasons` observing seasons of `seasonLength` days
 * separated by `gapLength` days, with `perSeason` random epochs each, sorted. Test data only.
 */
export function seasonalTimes(
  rng: Rng,
  { seasons = 3, perSeason = 40, seasonLength = 200, gapLength = 165, start = 0 } = {},
): Float64Array {
  const out: number[] = [];
  for (let s = 0; s < seasons; s++) {
    const begin = start + s * (seasonLength + gapLength);
    for (let i = 0; i < perSeason; i++) out.push(begin + rng.uniform() * seasonLength);
  }
  return Float64Array.from(out.sort((a, b) => a - b));
}

/** Heteroscedastic errors between lo and hi. */
export function randomErrors(rng: Rng, n: number, lo = 0.02, hi = 0.1): Float64Array {
  return Float64Array.from({ length: n }, () => lo + (hi - lo) * rng.uniform());
}

/** Largest relative difference |a - b| / max(|b|, floor) over two arrays. */
export function maxRelativeDifference(a: ArrayLike<number>, b: ArrayLike<number>, floor = 1e-300): number {
  let worst = 0;
  for (let i = 0; i < a.length; i++) worst = Math.max(worst, Math.abs(a[i] - b[i]) / Math.max(Math.abs(b[i]), floor));
  return worst;
}
