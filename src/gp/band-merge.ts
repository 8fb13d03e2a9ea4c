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
export interface BandMerge {
  /** Shifted times in joint order (ascending). */
  readonly time: Float64Array;
  /** The band of each point in joint order. */
  readonly band: Int32Array;
  /** Index of each point in the flat (band after band) numbering. */
  readonly source: Int32Array;
}

/**
 * Merges bands whose sorted times are `times[b]`, shifted by `lags[b]` (each band's times minus its lag).
 * `offsets[b]` is where band b starts in the flat numbering (band after band).
 *
 * @example mergeBands([Float64Array.of(0, 2), Float64Array.of(1)], [0, 1.5], [0, 2]) // times -0.5, 0, 2
 */
export function mergeBands(
  times: readonly ArrayLike<number>[],
  lags: ArrayLike<number>,
  offsets: ArrayLike<number>,
  out?: BandMerge,
): BandMerge {
  const bands = times.length;
  let total = 0;
  for (let b = 0; b < bands; b++) total += times[b].length;
  const merged = out ?? { time: new Float64Array(total), band: new Int32Array(total), source: new Int32Array(total) };
  if (merged.time.length !== total) throw new RangeError(`mergeBands: output has ${merged.time.length} places for ${total} points`);
  const head = new Int32Array(bands);
  for (let k = 0; k < total; k++) {
    let best = -1;
    let bestTime = Infinity;
    for (let b = 0; b < bands; b++) {
      const i = head[b];
      if (i >= times[b].length) continue;
      const shifted = times[b][i] - lags[b];
      if (best < 0 || shifted < bestTime) {
        best = b;
        bestTime = shifted;
      }
    }
    merged.time[k] = bestTime;
    merged.band[k] = best;
    merged.source[k] = offsets[best] + head[best];
    head[best]++;
  }
  return merged;
}

/**
 * Brings a joint order up to new lags in place: every shifted time recomputed from its time before the
 * shift (`unshifted`, one of the `carried` arrays, in joint order), then, where the new lags put points
 * out of order, a stable insertion sort by (shifted time, band) that moves `carried` (values, errors, ...)
 * along with `merge`. The result is the order {@link mergeBands} gives for these lags (ties to the band
 * listed first, then file order), so a sampler's small lag steps cost O(N + moves) instead of a new
 * O(N B) merge. Returns false, leaving an unsorted permutation, once more than `maxMoves` moves would
 * be needed (then merge afresh).
 */
export function reshiftMerge(
  merge: BandMerge,
  unshifted: Float64Array,
  lags: ArrayLike<number>,
  carried: readonly Float64Array[],
  maxMoves: number,
): boolean {
  const { time, band, source } = merge;
  const total = time.length;
  let unsorted = false;
  for (let k = 0; k < total; k++) {
    time[k] = unshifted[k] - lags[band[k]];
    if (k > 0 && before(time[k], band[k], time[k - 1], band[k - 1])) unsorted = true;
  }
  if (!unsorted) return true;
  const held = new Float64Array(carried.length);
  let moves = 0;
  for (let k = 1; k < total; k++) {
    const t = time[k];
    const b = band[k];
    if (!before(t, b, time[k - 1], band[k - 1])) continue;
    const s = source[k];
    for (let c = 0; c < carried.length; c++) held[c] = carried[c][k];
    let j = k;
    while (j > 0 && before(t, b, time[j - 1], band[j - 1])) {
      time[j] = time[j - 1];
      band[j] = band[j - 1];
      source[j] = source[j - 1];
      for (let c = 0; c < carried.length; c++) carried[c][j] = carried[c][j - 1];
      j--;
      if (++moves > maxMoves) {
        // Leave a permutation behind (the held point back in), unsorted: the caller merges afresh.
        time[j] = t;
        band[j] = b;
        source[j] = s;
        for (let c = 0; c < carried.length; c++) carried[c][j] = held[c];
        return false;
      }
    }
    time[j] = t;
    band[j] = b;
    source[j] = s;
    for (let c = 0; c < carried.length; c++) carried[c][j] = held[c];
  }
  return true;
}

/** Whether point (t, b) comes before point (u, c) in the joint order: earlier, or at the same time in an earlier band. */
function before(t: number, b: number, u: number, c: number): boolean {
  return t < u || (t === u && b < c);
}
