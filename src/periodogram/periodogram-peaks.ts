import type { FrequencyGrid } from "./frequency-grid.js";

/** A local maximum of a periodogram. */
export interface PeriodogramPeak {
  /** Frequency in cycles per unit of time, refined between grid points. */
  readonly frequency: number;
  /** 1 / frequency, in the time unit. */
  readonly period: number;
  /** Power at the peak (the parabola vertex, or the grid value at an edge). */
  readonly power: number;
  /** Index of the grid point at the peak. */
  readonly index: number;
  /** Whether the peak sits at an end of the grid (the true maximum may lie outside it). */
  readonly atEdge: boolean;
}

/** Options of {@link findPeaks}. */
export interface PeakOptions {
  /** Number of peaks to return, strongest first (default 5). */
  readonly count?: number;
  /**
   * Smallest frequency difference between two reported peaks (default 5 grid steps, one peak width on
   * a 5-times oversampled grid); weaker maxima closer to a stronger one are side lobes of it.
   */
  readonly minimumSeparation?: number;
}

/**
 * The strongest local maxima of a periodogram on a grid, strongest first, each refined by the vertex of
 * the parabola through the three grid points around it (common practice).
 */
export function findPeaks(grid: FrequencyGrid, power: ArrayLike<number>, options: PeakOptions = {}): PeriodogramPeak[] {
  const count = options.count ?? 5;
  const separation = options.minimumSeparation ?? 5 * grid.step;
  const m = power.length;
  const candidates: number[] = [];
  for (let k = 0; k < m; k++) {
    const left = k > 0 ? power[k - 1] : Number.NEGATIVE_INFINITY;
    const right = k < m - 1 ? power[k + 1] : Number.NEGATIVE_INFINITY;
    if (power[k] > left && power[k] >= right && power[k] > 0) candidates.push(k);
  }
  candidates.sort((a, b) => power[b] - power[a]);
  const peaks: PeriodogramPeak[] = [];
  for (const k of candidates) {
    if (peaks.length >= count) break;
    let frequency = grid.start + k * grid.step;
    let value = power[k];
    const atEdge = k === 0 || k === m - 1;
    if (!atEdge) {
      const a = power[k - 1];
      const b = power[k];
      const c = power[k + 1];
      const curvature = a - 2 * b + c;
      if (curvature < 0) {
        const shift = (0.5 * (a - c)) / curvature;
        frequency += shift * grid.step;
        value = b - 0.25 * (a - c) * shift;
      }
    }
    if (peaks.some((p) => Math.abs(p.frequency - frequency) < separation)) continue;
    peaks.push({ frequency, period: 1 / frequency, power: Math.min(1, value), index: k, atEdge });
  }
  return peaks;
}
