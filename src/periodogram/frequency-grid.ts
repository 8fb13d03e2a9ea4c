import type { SampledSeries } from "./time-series.js";

/**
 * An evenly spaced grid of frequencies, in cycles per unit of time: start, start + step, ...,
 * start + (count - 1) step.
 */
export interface FrequencyGrid {
  readonly start: number;
  readonly step: number;
  readonly count: number;
}

/** Options of {@link automaticFrequencyGrid}. */
export interface FrequencyGridOptions {
  /** Lowest frequency; default 1 / baseline (a period as long as the data). */
  readonly minimumFrequency?: number;
  /**
   * Highest frequency; default half the reciprocal of the median spacing of distinct times, the
   * "pseudo-Nyquist" frequency (common practice; VanderPlas 2018, sect. 4.1.2, explains why irregular
   * sampling has no true Nyquist limit, so set this from the physics when you can).
   */
  readonly maximumFrequency?: number;
  /** Grid points per peak width 1 / baseline; default 5 (VanderPlas 2018, sect. 7.1, advises 5 to 10). */
  readonly oversampling?: number;
  /** Refuse grids longer than this (default 2,000,000), so that a typo cannot start a day-long run. */
  readonly maximumCount?: number;
}

/**
 * A frequency grid for a periodogram following VanderPlas 2018 (ApJS 236, 16, sect. 7.1): spacing
 * 1 / (oversampling * baseline), since a peak is about 1 / baseline wide, from the minimum to the
 * maximum frequency. Throws a RangeError for fewer than two distinct times or a bad range.
 *
 * @example automaticFrequencyGrid({ time, value }) // periods from the baseline down to 2x the median spacing
 */
export function automaticFrequencyGrid(series: Pick<SampledSeries, "time">, options: FrequencyGridOptions = {}): FrequencyGrid {
  const times = Float64Array.from(series.time).sort();
  const baseline = times[times.length - 1] - times[0];
  if (!(baseline > 0)) throw new RangeError("a frequency grid needs at least two distinct times");
  const oversampling = options.oversampling ?? 5;
  if (!(oversampling >= 1)) throw new RangeError(`oversampling must be >= 1, got ${oversampling}`);
  const minimum = options.minimumFrequency ?? 1 / baseline;
  const maximum = options.maximumFrequency ?? 0.5 / medianSpacing(times);
  if (!(minimum >= 0 && Number.isFinite(minimum))) throw new RangeError(`minimumFrequency must be >= 0, got ${minimum}`);
  if (!(maximum > minimum && Number.isFinite(maximum))) {
    throw new RangeError(`maximumFrequency (${maximum}) must exceed minimumFrequency (${minimum})`);
  }
  const step = 1 / (oversampling * baseline);
  const count = Math.floor((maximum - minimum) / step + 1e-9) + 1;
  const limit = options.maximumCount ?? 2_000_000;
  if (count > limit) {
    throw new RangeError(
      `the frequency grid would have ${count} points (limit ${limit}); lower maximumFrequency or oversampling`,
    );
  }
  return { start: minimum, step, count };
}

/** The frequencies of a grid as an array. */
export function gridFrequencies(grid: FrequencyGrid): Float64Array {
  const f = new Float64Array(grid.count);
  for (let k = 0; k < grid.count; k++) f[k] = grid.start + k * grid.step;
  return f;
}

/** Median spacing between consecutive distinct times of a sorted array. */
export function medianSpacing(sortedTimes: ArrayLike<number>): number {
  const gaps: number[] = [];
  for (let i = 1; i < sortedTimes.length; i++) {
    const gap = sortedTimes[i] - sortedTimes[i - 1];
    if (gap > 0) gaps.push(gap);
  }
  if (gaps.length === 0) throw new RangeError("no two distinct times");
  gaps.sort((a, b) => a - b);
  const mid = gaps.length >> 1;
  return gaps.length % 2 ? gaps[mid] : 0.5 * (gaps[mid - 1] + gaps[mid]);
}
