import { logGamma } from "../numerics/log-gamma.js";
import { normalisedWeights, weightedMeanTime, type SampledSeries } from "./time-series.js";

/**
 * False-alarm probabilities of generalised Lomb-Scargle peaks (power p in [0, 1], the normalisation of
 * Zechmeister & Kurster 2009) for data that are pure Gaussian white noise with the given errors up to
 * a common unknown scale.
 */

/**
 * Probability that the power at one frequency fixed in advance exceeds p under the noise hypothesis:
 * (1 - p)^((N - 3) / 2) (Zechmeister & Kurster 2009, eq. 24; equivalently p ~ Beta(1, (N - 3) / 2)).
 */
export function singleFrequencyFalseAlarm(power: number, n: number): number {
  if (!(n > 3)) throw new RangeError(`false-alarm probabilities need more than 3 points, got ${n}`);
  if (power <= 0) return 1;
  if (power >= 1) return 0;
  return Math.pow(1 - power, (n - 3) / 2);
}

/** What the search-wide false-alarm estimate needs to know about the data and the search. */
export interface SearchExtent {
  /** Number of points N. */
  readonly n: number;
  /** Highest frequency searched, in cycles per unit of time. */
  readonly maximumFrequency: number;
  /** Weighted variance of the times, D_t = <t^2> - <t>^2 (see {@link timeVariance}). */
  readonly timeVariance: number;
}

/** The weighted variance of the observation times, D_t of Baluev 2008 (weights as in the periodogram). */
export function timeVariance(series: SampledSeries): number {
  const w = normalisedWeights(series);
  const mean = weightedMeanTime(series.time, w);
  let v = 0;
  for (let i = 0; i < w.length; i++) v += w[i] * (series.time[i] - mean) ** 2;
  return v;
}

/**
 * Baluev 2008 (MNRAS 385, 1279) tail term tau(p) for the floating-mean periodogram (d_H = 1 parameter
 * under the noise hypothesis, d_K = 3 with the sinusoid; N_H = N - 1, N_K = N - 3):
 * tau = gamma_H W (1 - p)^((N_K - 1) / 2) sqrt(N_H p / 2), with
 * gamma_H = sqrt(2 / N_H) Gamma(N_H / 2) / Gamma((N_H - 1) / 2), W = f_max T_eff and
 * T_eff = sqrt(4 pi D_t) (from memory of the paper's eqs.; the tests check the result on simulated noise).
 */
export function baluevTau(power: number, extent: SearchExtent): number {
  const { n, maximumFrequency, timeVariance: dt } = extent;
  if (!(n >= 5)) throw new RangeError(`the search-wide false-alarm estimate needs at least 5 points, got ${n}`);
  if (!(maximumFrequency > 0) || !(dt > 0)) throw new RangeError("maximumFrequency and timeVariance must be positive");
  if (power <= 0) return Number.POSITIVE_INFINITY;
  if (power >= 1) return 0;
  const nH = n - 1;
  const nK = n - 3;
  const gammaH = Math.sqrt(2 / nH) * Math.exp(logGamma(nH / 2) - logGamma((nH - 1) / 2));
  const w = maximumFrequency * Math.sqrt(4 * Math.PI * dt);
  return gammaH * w * Math.pow(1 - power, (nK - 1) / 2) * Math.sqrt((nH * power) / 2);
}

/**
 * Probability that the highest peak of a search up to `maximumFrequency` reaches `power` by chance:
 * the approximation of Baluev 2008, FAP ~ 1 - (1 - FAP_single) exp(-tau), tight for small FAP.
 *
 * @example baluevFalseAlarm(0.3, { n: 100, maximumFrequency: 2, timeVariance: timeVariance(lc) })
 */
export function baluevFalseAlarm(power: number, extent: SearchExtent): number {
  const single = singleFrequencyFalseAlarm(power, extent.n);
  const tau = baluevTau(power, extent);
  return 1 - (1 - single) * Math.exp(-tau);
}

/** The cruder upper bound FAP <= FAP_single + tau of Baluev 2008 (the Davies bound), capped at 1. */
export function baluevFalseAlarmBound(power: number, extent: SearchExtent): number {
  return Math.min(1, singleFrequencyFalseAlarm(power, extent.n) + baluevTau(power, extent));
}

/**
 * The power a peak must reach for a search-wide false-alarm probability `probability` under
 * {@link baluevFalseAlarm}, by bisection (FAP decreases with power). For dashed lines on a figure.
 */
export function baluevPowerLevel(probability: number, extent: SearchExtent): number {
  if (!(probability > 0 && probability < 1)) throw new RangeError(`probability must lie in (0, 1), got ${probability}`);
  let low = 0;
  let high = 1;
  for (let i = 0; i < 80; i++) {
    const mid = 0.5 * (low + high);
    if (baluevFalseAlarm(mid, extent) > probability) low = mid;
    else high = mid;
  }
  return 0.5 * (low + high);
}
