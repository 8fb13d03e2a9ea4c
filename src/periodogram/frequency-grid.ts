import { medianOf, sortedQuantile } from "../numerics/order-statistics.js";
import type { SampledSeries } from "./time-series.js";

/**
 * An evenly spaced grid of frequencies, in cycles per unit of time: start, start + step, ...,
 * start + (count - 1) step.
 */
export interface FrequencyGrid {
  readonly start: number;
  readonly step: number;
  readonly count: number;
  /**
   * Present when the grid is coarser than a full search would be (the full grid was over
   * `maximumCount`): the step of the full grid, of which `step` is a whole multiple r. Coarse point k
   * stands for the fine points k r to k r + r - 1 ({@link computePeriodogram} gives it their largest
   * power and refines its peaks at the fine step).
   */
  readonly fineStep?: number;
}

/** Options of `automaticFrequencyGrid`. */
export interface FrequencyGridOptions {
  /** Lowest frequency; default 1 / baseline (a period as long as the data). */
  readonly minimumFrequency?: number;
  /**
   * Highest frequency; default half the reciprocal of the typical spacing of visits on different nights
   * (`typicalVisitSpacing`), a "pseudo-Nyquist" frequency of the visits (common practice;
   * VanderPlas 2018, sect. 4.1.2, explains why irregular sampling has no true Nyquist limit, and why
   * the smallest spacing, minutes for visits clustered within a night, is not a useful limit).
   */
  readonly maximumFrequency?: number;
  /** Grid points per peak width 1 / baseline; default 5 (VanderPlas 2018, sect. 7.1, advises 5 to 10). */
  readonly oversampling?: number;
  /**
   * Grids longer than this (default 2,000,000) become a coarse-then-fine search: a grid of this many
   * points over the same range, whose peaks are refined at the full resolution (`fineStep`).
   */
  readonly maximumCount?: number;
}

/**
 * A frequency grid for a periodogram following VanderPlas 2018 (ApJS 236, 16, sect. 7.1): spacing
 * 1 / (oversampling * baseline), since a peak is about 1 / baseline wide, from the minimum to the
 * maximum frequency; over `maximumCount` points, a coarser grid of that many points with `fineStep`
 * set (coarse-then-fine search). Throws a RangeError for fewer than two distinct times or a bad range.
 *
 * @example automaticFrequencyGrid({ time, value }) // periods from the baseline down to 2x the visit spacing
 */
export function automaticFrequencyGrid(series: Pick<SampledSeries, "time">, options: FrequencyGridOptions = {}): FrequencyGrid {
  const times = Float64Array.from(series.time).sort();
  const baseline = times[times.length - 1] - times[0];
  if (!(baseline > 0)) throw new RangeError("a frequency grid needs at least two distinct times");
  const oversampling = options.oversampling ?? 5;
  if (!(oversampling >= 1)) throw new RangeError(`oversampling must be >= 1, got ${oversampling}`);
  const minimum = options.minimumFrequency ?? 1 / baseline;
  const maximum = options.maximumFrequency ?? 0.5 / typicalVisitSpacing(times);
  if (!(minimum >= 0 && Number.isFinite(minimum))) throw new RangeError(`minimumFrequency must be >= 0, got ${minimum}`);
  if (!(maximum > minimum && Number.isFinite(maximum))) {
    throw new RangeError(`maximumFrequency (${maximum}) must exceed minimumFrequency (${minimum})`);
  }
  const step = 1 / (oversampling * baseline);
  const count = Math.floor((maximum - minimum) / step + 1e-9) + 1;
  const limit = options.maximumCount ?? 2_000_000;
  if (!(Number.isInteger(limit) && limit >= 2)) throw new RangeError(`maximumCount must be an integer >= 2, got ${limit}`);
  if (count > limit) {
    // Each coarse point stands for `ratio` fine ones (computePeriodogram keeps their largest power).
    const ratio = Math.ceil(count / limit);
    return { start: minimum, step: ratio * step, count: Math.ceil(count / ratio), fineStep: step };
  }
  return { start: minimum, step, count };
}

/** The frequencies of a grid as an array. */
export function gridFrequencies(grid: FrequencyGrid): Float64Array {
  const f = new Float64Array(grid.count);
  for (let k = 0; k < grid.count; k++) f[k] = grid.start + k * grid.step;
  return f;
}

/**
 * The typical separation of visits: the median of the spacings that are at least a tenth of the mean
 * spacing. For an even cadence (space photometry) every spacing counts and this is the cadence; for
 * ground data with visits clustered within nights, the within-night spacings (minutes) fall below a
 * tenth of the mean spacing (inflated by the nights and seasons in between) and the result is the
 * night-to-night spacing. Twice it is the shortest period the sampling resolves without relying on
 * the within-night clusters (the Nyquist argument applied to the visits; common practice).
 */
export function visitSpacing(spacings: Float64Array, meanSpacing: number): number {
  let count = 0;
  for (let i = 0; i < spacings.length; i++) if (spacings[i] >= 0.1 * meanSpacing) count++;
  if (count === 0) return medianOf(spacings);
  const kept = new Float64Array(count);
  let k = 0;
  for (let i = 0; i < spacings.length; i++) if (spacings[i] >= 0.1 * meanSpacing) kept[k++] = spacings[i];
  return sortedQuantile(kept.sort(), 0.5);
}

/**
 * {@link visitSpacing} of sorted times: the typical separation of visits on different nights (or the
 * cadence of evenly spaced data). Throws a RangeError without two distinct times.
 */
export function typicalVisitSpacing(sortedTimes: ArrayLike<number>): number {
  const n = sortedTimes.length;
  const spacings = distinctSpacings(sortedTimes);
  if (spacings.length === 0) throw new RangeError("no two distinct times");
  return visitSpacing(spacings, (sortedTimes[n - 1] - sortedTimes[0]) / (n - 1));
}

function distinctSpacings(sortedTimes: ArrayLike<number>): Float64Array {
  const gaps = new Float64Array(Math.max(sortedTimes.length - 1, 0));
  let count = 0;
  for (let i = 1; i < sortedTimes.length; i++) {
    const gap = sortedTimes[i] - sortedTimes[i - 1];
    if (gap > 0) gaps[count++] = gap;
  }
  return gaps.subarray(0, count);
}

/** Median spacing between consecutive distinct times of a sorted array. */
export function medianSpacing(sortedTimes: ArrayLike<number>): number {
  const gaps = distinctSpacings(sortedTimes);
  if (gaps.length === 0) throw new RangeError("no two distinct times");
  return sortedQuantile(gaps.sort(), 0.5);
}
