/**
 * The shortest interval that holds a fraction `mass` of sorted draws: among the windows of
 * k = ceil(mass n) consecutive order statistics, the narrowest (Chen & Shao 1999, J. Comput. Graph.
 * Stat. 8, 69). For a unimodal posterior this estimates the highest-density interval; for a multimodal
 * one it is the shortest single interval, which may include a low-density gap.
 *
 * @example highestDensityInterval(sortedDraws, 0.95)  // [lower, upper]
 */
export function highestDensityInterval(sorted: ArrayLike<number>, mass: number): [number, number] {
  const n = sorted.length;
  if (!(mass > 0 && mass <= 1)) throw new RangeError(`highest-density interval: mass must be in (0, 1], got ${mass}`);
  if (n === 0) return [NaN, NaN];
  const k = Math.min(n, Math.max(1, Math.ceil(mass * n)));
  let best = 0;
  let bestWidth = Infinity;
  for (let i = 0; i + k - 1 < n; i++) {
    const width = sorted[i + k - 1] - sorted[i];
    if (width < bestWidth) {
      bestWidth = width;
      best = i;
    }
  }
  return [sorted[best], sorted[best + k - 1]];
}
