/**
 * Indices of `count` items spread evenly over `0..length-1` (at most `length`, all of them when
 * `count >= length`): floor(k length / count) for k = 0..count-1, so the first item is always kept and the
 * picks are reproducible (no random subsampling). The one thinning rule of the project: draws kept for the
 * summaries and the stored sample, draws pooled from several runs, points and curves drawn in figures.
 *
 * @example evenlySpacedIndices(10, 4) // [0, 2, 5, 7]
 */
export function evenlySpacedIndices(length: number, count: number): number[] {
  const n = Math.max(0, Math.min(length, count));
  return Array.from({ length: n }, (_, k) => Math.floor((k * length) / n));
}

/** The items at {@link evenlySpacedIndices}: at most `count` of them, spread evenly over the list. */
export function evenlySpacedItems<T>(items: readonly T[], count: number): T[] {
  return evenlySpacedIndices(items.length, count).map((i) => items[i]);
}
