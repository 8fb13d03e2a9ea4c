/**
 * The p-quantile of sorted values by linear interpolation between order statistics:
 * h = (n - 1) p, Q = x_floor(h) + (h - floor(h)) (x_floor(h)+1 - x_floor(h)) (definition 7 of
 * Hyndman & Fan 1996, Am. Stat. 50, 361).
 */
export function sortedQuantile(sorted: ArrayLike<number>, p: number): number {
  const n = sorted.length;
  if (n === 0) return NaN;
  if (p <= 0) return sorted[0]!;
  if (p >= 1) return sorted[n - 1]!;
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, n - 1);
  return sorted[lo]! + (h - lo) * (sorted[hi]! - sorted[lo]!);
}

/** A sorted copy of the values (ascending, numeric). */
export function sortedCopy(values: ArrayLike<number>): Float64Array {
  return Float64Array.from(values as ArrayLike<number>).sort();
}

/** Pools equal-length chains into one array, chain after chain. */
export function pooled(chains: readonly ArrayLike<number>[]): Float64Array {
  let total = 0;
  for (const c of chains) total += c.length;
  const out = new Float64Array(total);
  let offset = 0;
  for (const c of chains) {
    for (let i = 0; i < c.length; i++) out[offset + i] = c[i]!;
    offset += c.length;
  }
  return out;
}
