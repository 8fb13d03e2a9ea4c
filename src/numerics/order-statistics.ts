/**
 * The p-quantile of ascending-sorted values by linear interpolation between order statistics:
 * h = (n - 1) p, Q = x[floor h] + (h - floor h) (x[floor h + 1] - x[floor h]), with p clamped to [0, 1]
 * (definition 7 of Hyndman & Fan 1996, The American Statistician 50, 361; the default of R and numpy).
 * NaN for no values. The one sample-quantile estimator of the project: every median, quartile and
 * credible bound of a sample is this one.
 *
 * @example sortedQuantile(Float64Array.of(1, 2, 3, 4), 0.5) // 2.5
 */
export function sortedQuantile(sorted: ArrayLike<number>, p: number): number {
  const n = sorted.length;
  if (n === 0) return Number.NaN;
  const h = (n - 1) * Math.min(1, Math.max(0, p));
  const below = Math.floor(h);
  const above = Math.min(n - 1, below + 1);
  const weight = h - below;
  // At an order statistic itself nothing is interpolated (so an infinite extreme stays itself, not NaN).
  return weight === 0 ? sorted[below] : sorted[below] + weight * (sorted[above] - sorted[below]);
}

/** A sorted copy of the values (ascending, numeric). */
export function sortedCopy(values: ArrayLike<number>): Float64Array {
  return Float64Array.from(values).sort();
}

/** {@link sortedQuantile} of values in any order (sorts a copy). */
export function quantileOf(values: ArrayLike<number>, p: number): number {
  return sortedQuantile(sortedCopy(values), p);
}

/** The median of values in any order ({@link sortedQuantile} at 0.5: the mean of the two middle values for an even count); NaN for none. */
export function medianOf(values: ArrayLike<number>): number {
  return quantileOf(values, 0.5);
}
