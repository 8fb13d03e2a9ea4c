import type { Kernel } from "../kernels/index.js";
import { kernels } from "../kernels/index.js";
import type { LightCurve } from "../lightcurve/light-curve.js";
import { quantileOf } from "../numerics/order-statistics.js";
import type { NumericColumn } from "./report-input.js";

/**
 * The power spectrum of a fit on one scale: the one-sided PSD P(f) of the model over posterior draws, the
 * data's periodogram normalised to the same units, the measurement-noise level, and the PSD of the best
 * damped random walk. Every power is in (value unit)^2 x (time unit), at frequencies in cycles per time
 * unit, and integrates over 0 < f < infinity to the variance.
 */
export interface PsdComparison {
  /** The model as named in the legend, for example "CARMA(2,1)". */
  readonly modelLabel: string;
  /** Frequencies of the model curves, ascending, positive. */
  readonly frequency: NumericColumn;
  readonly median: NumericColumn;
  readonly lower68: NumericColumn;
  readonly upper68: NumericColumn;
  readonly lower95: NumericColumn;
  readonly upper95: NumericColumn;
  /** The periodogram on the PSD's scale ({@link periodogramAsPsd}). */
  readonly periodogram: { readonly frequency: NumericColumn; readonly power: NumericColumn };
  /** The periodogram averaged in bins of equal width in log f (mean power, geometric-mean frequency). */
  readonly binnedPeriodogram: { readonly frequency: NumericColumn; readonly power: NumericColumn };
  /** Expected periodogram level of the measurement noise alone, 2 <e^2> T / N. */
  readonly noiseLevel?: number;
  /** The best damped random walk's PSD at `frequency`, when the model is not itself the DRW. */
  readonly referenceDrw?: { readonly sigma: number; readonly tau: number; readonly psd: NumericColumn };
  /** Draws the band was computed from. */
  readonly draws: number;
}

/**
 * One-sided PSD per unit frequency from a kernel's two-sided PSD per unit angular frequency S(omega)
 * (k(0) = (1/2 pi) integral S d omega): P(f) = 2 S(2 pi f), so that integral_0^inf P(f) df = k(0).
 */
export function oneSidedPsd(kernel: Kernel, frequency: ArrayLike<number>): Float64Array {
  const spectrum = kernel.psd(Array.from(frequency, (f) => 2 * Math.PI * f));
  return spectrum.map((s) => 2 * s);
}

/**
 * The generalised Lomb-Scargle power p(f) (Zechmeister & Kurster 2009: the fraction of the weighted
 * variance a sinusoid at f explains) as a one-sided PSD estimate: P(f) = p(f) var(y) T, with var(y) the
 * weighted (1 / e^2) variance and T the baseline. For even sampling p(f) = 2 |sum y e^(-2 pi i f t)|^2 / (N^2
 * var y) and 2 T |sum|^2 / N^2 is the usual one-sided periodogram, whose sum over the N / 2 independent
 * frequencies (spacing 1 / T) is the variance (Parseval; common practice). The measurement noise alone has
 * the expected level 2 <e^2> T / N.
 */
export function periodogramAsPsd(lightCurve: LightCurve, power: ArrayLike<number>): { power: Float64Array; noiseLevel?: number } {
  const { time, value, error } = lightCurve;
  const n = time.length;
  let weightSum = 0;
  let weightedSum = 0;
  for (let i = 0; i < n; i++) {
    const w = error ? 1 / ((error[i] ?? 1) * (error[i] ?? 1)) : 1;
    weightSum += w;
    weightedSum += w * (value[i] ?? 0);
  }
  const mean = weightedSum / weightSum;
  let variance = 0;
  let errorSquares = 0;
  for (let i = 0; i < n; i++) {
    const w = error ? 1 / ((error[i] ?? 1) * (error[i] ?? 1)) : 1;
    variance += (w * ((value[i] ?? 0) - mean) ** 2) / weightSum;
    if (error) errorSquares += (error[i] ?? 0) ** 2;
  }
  const baseline = (time[n - 1] ?? 0) - (time[0] ?? 0);
  return {
    power: Float64Array.from(power, (p) => p * variance * baseline),
    ...(error ? { noiseLevel: (2 * (errorSquares / n) * baseline) / n } : {}),
  };
}

/** Bins per decade of frequency of the averaged periodogram. */
const BINS_PER_DECADE = 12;

/**
 * The periodogram averaged in bins of equal width in log f: the mean power of each bin's frequencies
 * (the raw periodogram scatters like chi-square with two degrees of freedom about the spectrum; averaging
 * m of them cuts the relative scatter to about 1 / sqrt(m), common practice), at the geometric mean of its
 * frequencies. Empty bins are skipped.
 */
export function binnedPeriodogram(frequency: ArrayLike<number>, power: ArrayLike<number>): { frequency: Float64Array; power: Float64Array } {
  const sums = new Map<number, { logF: number; power: number; count: number }>();
  for (let i = 0; i < frequency.length; i++) {
    const f = frequency[i] ?? 0;
    const p = power[i] ?? 0;
    if (!(f > 0) || !Number.isFinite(p)) continue;
    const bin = Math.floor(Math.log10(f) * BINS_PER_DECADE);
    const entry = sums.get(bin) ?? { logF: 0, power: 0, count: 0 };
    entry.logF += Math.log(f);
    entry.power += p;
    entry.count += 1;
    sums.set(bin, entry);
  }
  const bins = [...sums.entries()].sort((a, b) => a[0] - b[0]).map(([, e]) => e);
  return {
    frequency: Float64Array.from(bins, (e) => Math.exp(e.logF / e.count)),
    power: Float64Array.from(bins, (e) => e.power / e.count),
  };
}

/** What {@link psdComparison} needs: the data, its periodogram (GLS power) and the posterior kernels. */
export interface PsdComparisonInputs {
  readonly lightCurve: LightCurve;
  readonly modelLabel: string;
  readonly periodogram: { readonly frequency: ArrayLike<number>; readonly power: ArrayLike<number> };
  /** The model frequencies, ascending. */
  readonly frequency: Float64Array;
  /** The kernel at each posterior draw used. */
  readonly kernels: readonly Kernel[];
  /** The best damped random walk, when the model is not itself one. */
  readonly referenceDrw?: { readonly sigma: number; readonly tau: number };
}

/** The curves of the figure: posterior PSD quantiles (central 68% and 95%), periodogram, noise level, best DRW. */
export function psdComparison(inputs: PsdComparisonInputs): PsdComparison {
  const { frequency, lightCurve } = inputs;
  const spectra = inputs.kernels.map((kernel) => oneSidedPsd(kernel, frequency));
  const quantile = (q: number) => frequency.map((_, i) => quantileOf(spectra.map((s) => s[i] ?? NaN), q));
  const scaled = periodogramAsPsd(lightCurve, inputs.periodogram.power);
  const periodogram = { frequency: Float64Array.from(inputs.periodogram.frequency), power: scaled.power };
  const drw = inputs.referenceDrw;
  return {
    modelLabel: inputs.modelLabel,
    frequency,
    median: quantile(0.5),
    lower68: quantile(0.16),
    upper68: quantile(0.84),
    lower95: quantile(0.025),
    upper95: quantile(0.975),
    periodogram,
    binnedPeriodogram: binnedPeriodogram(periodogram.frequency, periodogram.power),
    ...(scaled.noiseLevel !== undefined ? { noiseLevel: scaled.noiseLevel } : {}),
    ...(drw ? { referenceDrw: { ...drw, psd: oneSidedPsd(kernels.dampedRandomWalk(drw), frequency) } } : {}),
    draws: inputs.kernels.length,
  };
}
