import type { PosteriorDraws } from "../inference/index.js";
import { evenlySpacedIndices } from "../numerics/even-thinning.js";

/**
 * The pooling stage of a fit: the draws of several runs (one per period mode) in one set, each run
 * contributing a share proportional to its weight. The pooled size is the largest for which every
 * run has enough draws, each run's share spread evenly over its draws; chain numbers are offset so that
 * the chains of different runs stay distinct. One run is returned as it is. Linear in the draws.
 */
export function pooledDraws(runs: readonly PosteriorDraws[], weights: readonly number[]): PosteriorDraws {
  if (runs.length === 0) throw new RangeError("pooling needs at least one run");
  if (runs.length === 1) return runs[0];
  let size = Infinity;
  runs.forEach((d, k) => (size = Math.min(size, d.chain.length / weights[k])));
  const picks = runs.map((d, k) => evenlySpacedIndices(d.chain.length, Math.max(1, Math.round(size * weights[k]))));
  const total = picks.reduce((sum, p) => sum + p.length, 0);
  const names = runs[0].names;
  const columns: Record<string, Float64Array> = {};
  for (const name of names) columns[name] = new Float64Array(total);
  const chain = new Int32Array(total);
  const iteration = new Int32Array(total);
  const logPosterior = new Float64Array(total);
  let offset = 0;
  let chainOffset = 0;
  runs.forEach((run, k) => {
    for (const i of picks[k]) {
      for (const name of names) columns[name][offset] = run.columns[name][i];
      chain[offset] = run.chain[i] + chainOffset;
      iteration[offset] = run.iteration[i];
      logPosterior[offset] = run.logPosterior[i];
      offset++;
    }
    chainOffset += chainCount(run.chain);
  });
  return { names, columns, chain, iteration, logPosterior };
}

/** Number of chains in a draw set: the largest chain index plus one (0 for no draws). */
function chainCount(chain: Int32Array): number {
  let largest = -1;
  for (let i = 0; i < chain.length; i++) if (chain[i] > largest) largest = chain[i];
  return largest + 1;
}

/**
 * At most `limit` of the draws, spread evenly (every column alike), or the draws themselves when there
 * are no more than that. Bounds the cost of what is done draw by draw after sampling (the mean drawn
 * back costs one O(N) pass per draw).
 */
export function thinnedDraws(draws: PosteriorDraws, limit: number): PosteriorDraws {
  if (draws.chain.length <= limit) return draws;
  const picks = evenlySpacedIndices(draws.chain.length, limit);
  const columns: Record<string, Float64Array> = {};
  for (const name of draws.names) columns[name] = Float64Array.from(picks, (i) => draws.columns[name][i]);
  return {
    names: draws.names,
    columns,
    chain: Int32Array.from(picks, (i) => draws.chain[i]),
    iteration: Int32Array.from(picks, (i) => draws.iteration[i]),
    logPosterior: Float64Array.from(picks, (i) => draws.logPosterior[i]),
  };
}

/**
 * Draws kept for the summaries of a light curve of `n` points: all of them up to 2e8 / n (so that the
 * per-draw work after sampling stays below about 2e8 point operations), never fewer than 1000; the
 * effective sample size the sampler must reach (400) fits in that. For n <= 2e5 no run reaches the limit.
 */
export function summaryDrawLimit(n: number): number {
  return Math.max(1000, Math.floor(2e8 / Math.max(n, 1)));
}
