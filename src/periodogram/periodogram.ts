import { baluevFalseAlarm, baluevPowerLevel, timeVariance, type SearchExtent } from "./false-alarm-probability.js";
import { automaticFrequencyGrid, gridFrequencies, type FrequencyGrid, type FrequencyGridOptions } from "./frequency-grid.js";
import { fastGlsIsCheaper, fastGlsPower } from "./fast-lomb-scargle.js";
import { glsPower, glsPowerAt } from "./generalised-lomb-scargle.js";
import { findPeaks, type PeakOptions, type PeriodogramPeak } from "./periodogram-peaks.js";
import { fitSinusoid, type SinusoidFit } from "./sinusoid-fit.js";
import type { SampledSeries } from "./time-series.js";

/** Options of {@link computePeriodogram}: the grid (or an explicit one) and peak finding. */
export interface PeriodogramOptions extends FrequencyGridOptions {
  /** Use this grid instead of the automatic one. */
  readonly grid?: FrequencyGrid;
  /** Number of peaks to report (default 5). */
  readonly peaks?: number;
  /** Smallest frequency difference between reported peaks; default one peak width, 1 / baseline. */
  readonly peakSeparation?: number;
  /** Search-wide false-alarm probabilities whose power levels to report, for figures (default 0.1, 0.01, 0.001). */
  readonly falseAlarmLevels?: readonly number[];
}

/** A periodogram peak with its search-wide false-alarm probability and best-fitting sinusoid. */
export interface RankedPeak extends PeriodogramPeak {
  /** Baluev 2008 false-alarm probability of a peak this high anywhere in the searched range. */
  readonly falseAlarm: number;
  /** The best sinusoid at the peak; absent where it is not determined (zero frequency). */
  readonly sinusoid?: SinusoidFit;
}

/** A computed periodogram, ready for a figure or for initial guesses. */
export interface Periodogram {
  readonly grid: FrequencyGrid;
  /** Grid frequencies in cycles per unit of time. */
  readonly frequency: Float64Array;
  /** Generalised Lomb-Scargle power (Zechmeister & Kurster 2009 normalisation, in [0, 1]). */
  readonly power: Float64Array;
  /** The strongest peaks, strongest first. */
  readonly peaks: RankedPeak[];
  /** Power levels of the requested search-wide false-alarm probabilities (Baluev 2008). */
  readonly falseAlarmLevels: { readonly probability: number; readonly power: number }[];
  readonly n: number;
  /** Last time minus first, in the time unit. */
  readonly baseline: number;
}

/**
 * Generalised Lomb-Scargle periodogram with an automatic grid (VanderPlas 2018), peak finding, Baluev 2008
 * false-alarm probabilities and the best sinusoid at each peak. Each peak's frequency and power are
 * re-evaluated exactly at the refined frequency (kept at the grid point if that is higher).
 *
 * @example const { peaks } = computePeriodogram(lightCurve); peaks[0].period
 */
export function computePeriodogram(series: SampledSeries, options: PeriodogramOptions = {}): Periodogram {
  const grid = options.grid ?? automaticFrequencyGrid(series, options);
  const power = grid.fineStep !== undefined ? maxPooledPower(series, grid, grid.fineStep) : gridPower(series, grid);
  let first = Number.POSITIVE_INFINITY;
  let last = Number.NEGATIVE_INFINITY;
  for (let i = 0; i < series.time.length; i++) {
    first = Math.min(first, series.time[i]);
    last = Math.max(last, series.time[i]);
  }
  const baseline = last - first;
  const extent: SearchExtent = {
    n: series.time.length,
    maximumFrequency: grid.start + (grid.count - 1) * grid.step,
    timeVariance: timeVariance(series),
  };
  const wanted = options.peaks ?? 5;
  const peakOptions: PeakOptions = {
    // A coarse grid can rank peaks wrongly: refine more candidates than asked for, then keep the best.
    count: grid.fineStep !== undefined ? 4 * wanted : wanted,
    minimumSeparation: options.peakSeparation ?? (baseline > 0 ? 1 / baseline : 5 * grid.step),
  };
  const candidates = findPeaks(grid, power, peakOptions).map((peak) => (grid.fineStep !== undefined ? refinedPeak(series, grid, peak) : peak));
  if (grid.fineStep !== undefined) candidates.sort((a, b) => b.power - a.power).splice(wanted);
  const peaks = candidates.map((peak): RankedPeak => {
    let { frequency, power: height } = peak;
    if (!peak.atEdge && grid.fineStep === undefined) {
      const exact = glsPowerAt(series, [frequency])[0];
      if (exact >= power[peak.index]) height = exact;
      else {
        frequency = grid.start + peak.index * grid.step;
        height = power[peak.index];
      }
    }
    return {
      ...peak,
      frequency,
      period: 1 / frequency,
      power: height,
      falseAlarm: extent.n >= 5 ? baluevFalseAlarm(height, extent) : Number.NaN,
      sinusoid: frequency > 0 ? fitSinusoid(series, frequency) : undefined,
    };
  });
  const levels = extent.n >= 5 ? (options.falseAlarmLevels ?? [0.1, 0.01, 0.001]) : [];
  return {
    grid,
    frequency: gridFrequencies(grid),
    power,
    peaks,
    falseAlarmLevels: levels.map((probability) => ({ probability, power: baluevPowerLevel(probability, extent) })),
    n: extent.n,
    baseline,
  };
}

/**
 * The power on a grid, by the fast sums where they are cheaper than the direct ones and applicable (a
 * step of at most 1 / baseline, which the automatic grids always have).
 */
function gridPower(series: SampledSeries, grid: FrequencyGrid): Float64Array {
  let first = Infinity;
  let last = -Infinity;
  for (let i = 0; i < series.time.length; i++) {
    first = Math.min(first, series.time[i]);
    last = Math.max(last, series.time[i]);
  }
  const fits = grid.step * (last - first) <= 1;
  return fits && fastGlsIsCheaper(series.time.length, grid.count) ? fastGlsPower(series, grid) : glsPower(series, grid);
}

/** Fine frequencies per band of a coarse-then-fine search (bounds the memory of one pass). */
const BAND_POINTS = 1 << 18;

/**
 * The power of a coarse grid whose every point stands for r = step / fineStep fine points: the largest
 * power among them, computed band by band on the fine grid, so that no peak between coarse points is
 * lost and memory stays bounded by {@link BAND_POINTS} whatever the size of the full search.
 */
function maxPooledPower(series: SampledSeries, grid: FrequencyGrid, fineStep: number): Float64Array {
  const ratio = Math.round(grid.step / fineStep);
  const cellsPerBand = Math.max(1, Math.floor(BAND_POINTS / ratio));
  const pooled = new Float64Array(grid.count);
  for (let cell = 0; cell < grid.count; cell += cellsPerBand) {
    const cells = Math.min(cellsPerBand, grid.count - cell);
    const band = gridPower(series, { start: grid.start + cell * grid.step, step: fineStep, count: cells * ratio });
    for (let c = 0; c < cells; c++) {
      let best = 0;
      for (let j = c * ratio; j < (c + 1) * ratio; j++) best = Math.max(best, band[j]);
      pooled[cell + c] = best;
    }
  }
  return pooled;
}

/** Frequencies evaluated around a coarse peak at most: wider windows are sampled this finely. */
const REFINEMENT_POINTS = 401;

/**
 * A peak of a coarse grid refined at the full resolution: the exact power on a grid of step
 * `grid.fineStep` (or {@link REFINEMENT_POINTS} points, if that is coarser) over the coarse steps on
 * either side, and the highest point of it.
 */
function refinedPeak(series: SampledSeries, grid: FrequencyGrid, peak: PeriodogramPeak): PeriodogramPeak {
  const low = Math.max(grid.start, peak.frequency - grid.step);
  const high = Math.min(grid.start + (grid.count - 1) * grid.step, peak.frequency + grid.step);
  const count = Math.min(REFINEMENT_POINTS, Math.floor((high - low) / grid.fineStep!) + 1);
  const frequencies = Float64Array.from({ length: count }, (_, k) => (count > 1 ? low + ((high - low) * k) / (count - 1) : low));
  const power = glsPowerAt(series, frequencies);
  let best = 0;
  for (let k = 1; k < count; k++) if (power[k] > power[best]) best = k;
  return { ...peak, frequency: frequencies[best], period: 1 / frequencies[best], power: power[best] };
}
