import type { Rng } from "../random/rng.js";

/**
 * Systematic resampling (Kitagawa 1996, J. Comput. Graph. Stat. 5, 1; Douc, Cappe & Moulines 2005):
 * `count` indices into normalised `weights`, index s appearing floor or ceil of count w_s times, chosen
 * with one uniform u: the k-th index is the one whose cumulative weight first exceeds (k + u) / count.
 * It adds less noise than independent multinomial draws and keeps the order of the indices, so draws
 * that were independent and in random order stay in random order.
 */
export function systematicResample(weights: ArrayLike<number>, count: number, rng: Rng): Int32Array {
  const picks = new Int32Array(count);
  const u = rng.uniform();
  let cumulative = weights[0];
  let s = 0;
  for (let k = 0; k < count; k++) {
    const position = (k + u) / count;
    while (cumulative < position && s < weights.length - 1) cumulative += weights[++s];
    picks[k] = s;
  }
  return picks;
}
