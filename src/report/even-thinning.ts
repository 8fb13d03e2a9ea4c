/**
 * Indices of at most `limit` items spread evenly over `0..length-1`, always keeping the first and last.
 * Figures use it to bound the size of an SVG without random subsampling, so a report is reproducible.
 *
 * @example evenIndices(10, 4) // [0, 3, 6, 9]
 */
export function evenIndices(length: number, limit: number): number[] {
  if (length <= limit) return Array.from({ length }, (_, i) => i);
  if (limit <= 1) return length > 0 ? [0] : [];
  const indices: number[] = [];
  for (let k = 0; k < limit; k++) indices.push(Math.round((k * (length - 1)) / (limit - 1)));
  return indices;
}
