/**
 * The data a periodogram needs: times, values and optional 1-sigma errors. A LightCurve satisfies it;
 * plain arrays do too, so this layer depends on nothing else.
 */
export interface SampledSeries {
  /** Observation times, in any unit (frequencies come out in cycles per that unit). */
  readonly time: ArrayLike<number>;
  readonly value: ArrayLike<number>;
  /** Per-point 1-sigma errors; equal weights when absent. */
  readonly error?: ArrayLike<number>;
}

/**
 * Normalised weights w_i = sigma_i^-2 / sum_j sigma_j^-2 (Zechmeister & Kurster 2009, eq. 9), or 1/N
 * without errors. Throws a RangeError for mismatched lengths, non-finite data or non-positive errors.
 */
export function normalisedWeights(series: SampledSeries): Float64Array {
  const n = series.time.length;
  if (series.value.length !== n || (series.error && series.error.length !== n)) {
    throw new RangeError("time, value and error must have the same length");
  }
  const weights = new Float64Array(n);
  let total = 0;
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(series.time[i]) || !Number.isFinite(series.value[i])) {
      throw new RangeError(`time and value must be finite (index ${i})`);
    }
    let w = 1;
    if (series.error) {
      const e = series.error[i];
      if (!(e > 0 && Number.isFinite(e))) throw new RangeError(`error at index ${i} must be positive, got ${e}`);
      w = 1 / (e * e);
    }
    weights[i] = w;
    total += w;
  }
  for (let i = 0; i < n; i++) weights[i] /= total;
  return weights;
}

/** The weighted mean of the times, subtracted before any trigonometry so Julian dates keep their precision. */
export function weightedMeanTime(time: ArrayLike<number>, weights: Float64Array): number {
  let mean = 0;
  for (let i = 0; i < time.length; i++) mean += weights[i] * time[i];
  return mean;
}
