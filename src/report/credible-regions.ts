/** A grid of cells over two parameters, each marked with the smallest credible region it belongs to. */
export interface CredibleRegionGrid {
  /** Cell edges along x and y (length bins + 1). */
  readonly xEdges: Float64Array;
  readonly yEdges: Float64Array;
  /** Per cell (row-major, y outer), the smallest listed mass whose region holds it, or NaN for none. */
  readonly level: Float64Array;
}

/**
 * Highest-density credible regions of a two-parameter sample on a grid: the draws are counted on
 * `bins` x `bins` cells over the given extents, smoothed by the binomial kernel [1 2 1]/4 along each axis
 * (twice), and the cells sorted by smoothed count; a region of mass m is the smallest set of densest cells
 * holding a fraction m of all draws (those outside the extents included), the two-dimensional analogue of
 * a highest-density interval (Box & Tiao 1973, Bayesian Inference in Statistical Analysis, section 2.8).
 *
 * @param masses ascending credible masses, for example [0.68, 0.95]
 */
export function credibleRegions(
  xs: ArrayLike<number>,
  ys: ArrayLike<number>,
  xExtent: readonly [number, number],
  yExtent: readonly [number, number],
  bins: number,
  masses: readonly number[],
): CredibleRegionGrid {
  const edges = ([low, high]: readonly [number, number]) => Float64Array.from({ length: bins + 1 }, (_, i) => low + ((high - low) * i) / bins);
  const xEdges = edges(xExtent);
  const yEdges = edges(yExtent);
  let counts: Float64Array = new Float64Array(bins * bins);
  const n = xs.length;
  const xStep = (xExtent[1] - xExtent[0]) / bins;
  const yStep = (yExtent[1] - yExtent[0]) / bins;
  for (let i = 0; i < n; i++) {
    const cx = Math.floor((xs[i] - xExtent[0]) / xStep);
    const cy = Math.floor((ys[i] - yExtent[0]) / yStep);
    if (cx >= 0 && cx < bins && cy >= 0 && cy < bins) counts[cy * bins + cx] += 1;
  }
  for (let pass = 0; pass < 2; pass++) counts = smoothRows(smoothColumns(counts, bins), bins);
  const order = Array.from({ length: counts.length }, (_, i) => i).sort((a, b) => counts[b] - counts[a]);
  const level = new Float64Array(counts.length).fill(Number.NaN);
  let held = 0;
  let next = 0;
  for (const cell of order) {
    if (next >= masses.length || counts[cell] <= 0) break;
    level[cell] = masses[next];
    held += counts[cell];
    while (next < masses.length && held >= masses[next] * n) next++;
  }
  return { xEdges, yEdges, level };
}

/** [1 2 1]/4 along x; at the edges the edge cell stands in for its missing neighbour. */
function smoothRows(values: Float64Array, bins: number): Float64Array {
  const out = new Float64Array(values.length);
  for (let y = 0; y < bins; y++) {
    for (let x = 0; x < bins; x++) {
      const left = values[y * bins + Math.max(0, x - 1)];
      const right = values[y * bins + Math.min(bins - 1, x + 1)];
      out[y * bins + x] = 0.25 * left + 0.5 * values[y * bins + x] + 0.25 * right;
    }
  }
  return out;
}

function smoothColumns(values: Float64Array, bins: number): Float64Array {
  const out = new Float64Array(values.length);
  for (let y = 0; y < bins; y++) {
    const below = Math.max(0, y - 1);
    const above = Math.min(bins - 1, y + 1);
    for (let x = 0; x < bins; x++) {
      out[y * bins + x] = 0.25 * values[below * bins + x] + 0.5 * values[y * bins + x] + 0.25 * values[above * bins + x];
    }
  }
  return out;
}
