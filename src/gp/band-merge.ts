/**
 * The joint time order of several bands whose times are shifted by per-band lags.
 *
 * A band b observed at times t_i (sorted) sees the shared process at t_i - lag_b. Each band's shifted
 * times stay sorted, so the joint order is a B-way merge of sorted lists, exact for any lag vector:
 * O(N B) for N points in B bands. Ties go to the band listed first, then to file order, so the order is
 * a deterministic function of the shifted times. The likelihood does not depend on the order of points
 * with equal times (a permutation of a Gaussian vector), so it is continuous in the lags even where two
 * shifted points cross.
 */

/** Every band's points, band after band (the flat numbering), as a joint order is built from them. */
export interface BandColumns {
  /** Times before the shift; each band's stretch sorted ascending. */
  readonly time: Float64Array;
  readonly errorVariance: Float64Array;
  readonly values: Float64Array;
  /** Band b holds the flat indices offsets[b] to offsets[b + 1] - 1 (B + 1 entries). */
  readonly offsets: Int32Array;
}

/**
 * The points of every band in joint order of their shifted times, with what the likelihood reads at each
 * point carried along, so that the recursion runs over plain arrays in order.
 */
export interface BandMerge {
  /** Shifted times in joint order (ascending). */
  readonly time: Float64Array;
  /** The band of each point in joint order. */
  readonly band: Int32Array;
  /** Index of each point in the flat (band after band) numbering. */
  readonly source: Int32Array;
  /** Each point's time before the shift, squared error and value, in joint order. */
  readonly unshifted: Float64Array;
  readonly errorVariance: Float64Array;
  readonly values: Float64Array;
}

/** Band columns from per-band arrays (times sorted within each band; errors as variances). */
export function bandColumns(times: readonly ArrayLike<number>[], errorVariance: Float64Array, values: Float64Array): BandColumns {
  const offsets = new Int32Array(times.length + 1);
  for (let b = 0; b < times.length; b++) offsets[b + 1] = offsets[b] + times[b].length;
  const time = new Float64Array(offsets[times.length]);
  for (let b = 0; b < times.length; b++) time.set(times[b], offsets[b]);
  return { time, errorVariance, values, offsets };
}

/** Empty joint-order arrays for `count` points. */
export function emptyMerge(count: number): BandMerge {
  return {
    time: new Float64Array(count),
    band: new Int32Array(count),
    source: new Int32Array(count),
    unshifted: new Float64Array(count),
    errorVariance: new Float64Array(count),
    values: new Float64Array(count),
  };
}

/**
 * Merges the bands of `columns`, each band's times shifted by `lags[b]` (minus), into `out` (or new
 * arrays). One pass: at each step the earliest of the B bands' next shifted times is taken (kept in a
 * B-vector, so the scan reads no data arrays) and its data copied across. O(N B).
 *
 * @example
 * const columns = bandColumns([Float64Array.of(0, 2), Float64Array.of(1)], new Float64Array(3), Float64Array.of(5, 6, 7));
 * mergeBands(columns, [0, 1.5]).time // -0.5, 0, 2 (band 1's point first); .values // 7, 5, 6
 */
export function mergeBands(columns: BandColumns, lags: ArrayLike<number>, out?: BandMerge): BandMerge {
  const { time, errorVariance, values, offsets } = columns;
  const bands = offsets.length - 1;
  const total = offsets[bands];
  const merged = out ?? emptyMerge(total);
  if (merged.time.length !== total) throw new RangeError(`mergeBands: output has ${merged.time.length} places for ${total} points`);
  const head = new Int32Array(bands);
  const next = new Float64Array(bands);
  for (let b = 0; b < bands; b++) {
    head[b] = offsets[b];
    next[b] = offsets[b] < offsets[b + 1] ? time[offsets[b]] - lags[b] : Infinity;
  }
  for (let k = 0; k < total; k++) {
    let best = 0;
    let bestTime = next[0];
    for (let b = 1; b < bands; b++) {
      if (next[b] < bestTime) {
        best = b;
        bestTime = next[b];
      }
    }
    const s = head[best]++;
    merged.time[k] = bestTime;
    merged.band[k] = best;
    merged.source[k] = s;
    merged.unshifted[k] = time[s];
    merged.errorVariance[k] = errorVariance[s];
    merged.values[k] = values[s];
    next[best] = s + 1 < offsets[best + 1] ? time[s + 1] - lags[best] : Infinity;
  }
  return merged;
}

/**
 * Brings a joint order up to new lags in place, in one pass: each point's shifted time is recomputed from
 * its time before the shift and, where the new lags put it before points already placed, the point is
 * moved back past them (a stable insertion sort by (shifted time, band) that moves every array of `merge`
 * along). The result is the order {@link mergeBands} gives for these lags (ties to the band listed first,
 * then file order), so a sampler's small lag steps cost O(N + moves) instead of a new O(N B) merge.
 * Returns false, leaving an unsorted permutation, once more than `maxMoves` moves would be needed (then
 * merge afresh).
 */
export function reshiftMerge(merge: BandMerge, lags: ArrayLike<number>, maxMoves: number): boolean {
  const { time, band, source, unshifted, errorVariance, values } = merge;
  const total = time.length;
  let previousTime = -Infinity;
  let previousBand = 0;
  let moves = 0;
  for (let k = 0; k < total; k++) {
    const b = band[k];
    const t = unshifted[k] - lags[b];
    if (!(t < previousTime || (t === previousTime && b < previousBand))) {
      time[k] = t;
      previousTime = t;
      previousBand = b;
      continue;
    }
    // Out of order: find its place among the points before it (sorted), then shift them up by one.
    let j = k - 1;
    while (j > 0 && (t < time[j - 1] || (t === time[j - 1] && b < band[j - 1]))) j--;
    moves += k - j;
    if (moves > maxMoves) {
      time[k] = t;
      return false;
    }
    const s = source[k];
    const u = unshifted[k];
    const v = errorVariance[k];
    const y = values[k];
    for (let i = k; i > j; i--) {
      time[i] = time[i - 1];
      band[i] = band[i - 1];
      source[i] = source[i - 1];
      unshifted[i] = unshifted[i - 1];
      errorVariance[i] = errorVariance[i - 1];
      values[i] = values[i - 1];
    }
    time[j] = t;
    band[j] = b;
    source[j] = s;
    unshifted[j] = u;
    errorVariance[j] = v;
    values[j] = y;
    // The last point placed is still the one that was at k - 1: previousTime and previousBand stand.
  }
  return true;
}

/**
 * About how many insertion moves a change of lags from `from` to `to` costs: band b's points pass those
 * of band c lying within |d_b - d_c| of them (d = to - from), about n_b n_c |d_b - d_c| / span for points
 * spread evenly over the baseline `span`. Only used to choose between repairing an order and merging
 * afresh; any estimate gives the same order.
 */
export function expectedMoves(offsets: Int32Array, from: ArrayLike<number>, to: ArrayLike<number>, span: number): number {
  const bands = offsets.length - 1;
  let moves = 0;
  for (let b = 0; b < bands; b++)
    for (let c = b + 1; c < bands; c++) {
      const passed = Math.abs(to[b] - from[b] - (to[c] - from[c]));
      moves += (offsets[b + 1] - offsets[b]) * (offsets[c + 1] - offsets[c]) * passed;
    }
  return span > 0 ? moves / span : Infinity;
}
