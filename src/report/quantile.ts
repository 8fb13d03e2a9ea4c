/**
 * The q-quantile of ascending-sorted values by linear interpolation between order statistics
 * (definition 7 of Hyndman & Fan 1996, The American Statistician 50, 361; the default of R and numpy).
 *
 * @example quantileSorted(Float64Array.of(1, 2, 3, 4), 0.5) // 2.5
 */
export function quantileSorted(sorted: ArrayLike<number>, q: number): number {
  const n = sorted.length;
  if (n === 0) return Number.NaN;
  const position = (n - 1) * Math.min(1, Math.max(0, q));
  const below = Math.floor(position);
  const above = Math.min(n - 1, below + 1);
  const weight = position - below;
  return sorted[below]! + weight * (sorted[above]! - sorted[below]!);
}
