import type { FrequencyGrid } from "./frequency-grid.js";
import { normalisedWeights, weightedMeanTime, type SampledSeries } from "./time-series.js";

/**
 * The generalised Lomb-Scargle periodogram of Zechmeister & Kurster 2009 (A&A 496, 577): at each
 * frequency f, a weighted least-squares fit of y = a cos(2 pi f t) + b sin(2 pi f t) + c (a floating
 * mean) and its power p(f) = (chi2_0 - chi2(f)) / chi2_0 in [0, 1], where chi2_0 is the weighted
 * scatter about the mean. Frequencies are in cycles per unit of time.
 */

/** Data prepared once for many frequencies: centred times, weights, weighted centred values. */
export interface PreparedSeries {
  readonly n: number;
  /** t_i - t_ref, with t_ref the weighted mean time. */
  readonly dt: Float64Array;
  readonly w: Float64Array;
  /** w_i (y_i - Y), Y the weighted mean. */
  readonly wy: Float64Array;
  /** YY of ZK09 eq. 10: sum w_i (y_i - Y)^2. */
  readonly yy: number;
}

/**
 * Centres the times on their weighted mean and the values on their weighted mean, with normalised
 * weights 1 / error^2 (ZK09 eq. 4). Throws a RangeError for fewer than 3 points or values without scatter.
 */
export function prepareSeries(series: SampledSeries): PreparedSeries {
  const w = normalisedWeights(series);
  const n = w.length;
  if (n < 3) throw new RangeError(`a periodogram needs at least 3 points, got ${n}`);
  const tRef = weightedMeanTime(series.time, w);
  const dt = new Float64Array(n);
  let mean = 0;
  let lowest = Number.POSITIVE_INFINITY;
  let highest = Number.NEGATIVE_INFINITY;
  for (let i = 0; i < n; i++) {
    dt[i] = series.time[i] - tRef;
    mean += w[i] * series.value[i];
    lowest = Math.min(lowest, series.value[i]);
    highest = Math.max(highest, series.value[i]);
  }
  if (!(highest > lowest)) throw new RangeError("the values have no scatter, so there is no periodogram");
  const wy = new Float64Array(n);
  let yy = 0;
  for (let i = 0; i < n; i++) {
    const r = series.value[i] - mean;
    wy[i] = w[i] * r;
    yy += w[i] * r * r;
  }
  if (!(yy > 0)) throw new RangeError("the values have no scatter, so there is no periodogram");
  return { n, dt, w, wy, yy };
}

/**
 * The power from the weighted sums at one frequency (ZK09 eqs. 5, 10-15): with C, S the weighted means
 * of cos and sin, YC = sum w y cos, YS = sum w y sin (y centred), CC = sum w cos^2 - C^2,
 * SS = 1 - sum w cos^2 - S^2, CS = sum w cos sin - C S and D = CC SS - CS^2,
 * p = (SS YC^2 + CC YS^2 - 2 CS YC YS) / (YY D). When the sine or cosine column is degenerate (f = 0,
 * or the Nyquist frequency of even sampling) the one-column fit is used.
 */
export function powerFromSums(c: number, s: number, yc: number, ys: number, wcc: number, wcs: number, yy: number): number {
  const cc = wcc - c * c;
  const ss = 1 - wcc - s * s;
  const cs = wcs - c * s;
  const d = cc * ss - cs * cs;
  const tiny = 1e-12;
  let p: number;
  if (cc > tiny && ss > tiny && d > 1e-9 * cc * ss) {
    p = (ss * yc * yc + cc * ys * ys - 2 * cs * yc * ys) / (yy * d);
  } else if (cc >= ss && cc > tiny) {
    p = (yc * yc) / (yy * cc);
  } else if (ss > tiny) {
    p = (ys * ys) / (yy * ss);
  } else {
    p = 0;
  }
  return p < 0 ? 0 : p > 1 ? 1 : p;
}

/**
 * Generalised Lomb-Scargle power at arbitrary frequencies (cycles per unit time), by direct evaluation.
 * Cost O(N) trigonometric calls per frequency; prefer {@link glsPower} on a grid.
 *
 * @example glsPowerAt({ time, value, error }, [0.1, 0.2])
 */
export function glsPowerAt(series: SampledSeries, frequencies: ArrayLike<number>): Float64Array {
  const { n, dt, w, wy, yy } = prepareSeries(series);
  const power = new Float64Array(frequencies.length);
  for (let k = 0; k < frequencies.length; k++) {
    const omega = 2 * Math.PI * frequencies[k];
    let c = 0, s = 0, yc = 0, ys = 0, wcc = 0, wcs = 0;
    for (let i = 0; i < n; i++) {
      const x = omega * dt[i];
      const cos = Math.cos(x);
      const sin = Math.sin(x);
      c += w[i] * cos;
      s += w[i] * sin;
      yc += wy[i] * cos;
      ys += wy[i] * sin;
      wcc += w[i] * cos * cos;
      wcs += w[i] * cos * sin;
    }
    power[k] = powerFromSums(c, s, yc, ys, wcc, wcs, yy);
  }
  return power;
}

/** Grid steps between exact re-evaluations of the rotated cosines, to bound round-off drift. */
const RESYNC_INTERVAL = 64;

/**
 * Generalised Lomb-Scargle power on an evenly spaced grid. The cosines and sines of the next frequency
 * come from the current ones by the angle-addition rotation (cos(a + b) = cos a cos b - sin a sin b),
 * re-evaluated exactly every 64 steps, so the cost is O(N) multiplications per frequency. Times are
 * centred on their weighted mean first, so Julian dates near 2.46e6 lose no precision.
 *
 * @returns power p(f) in [0, 1] at each grid frequency (ZK09 normalisation)
 */
export function glsPower(series: SampledSeries, grid: FrequencyGrid): Float64Array {
  const { n, dt, w, wy, yy } = prepareSeries(series);
  const cos = new Float64Array(n);
  const sin = new Float64Array(n);
  const stepCos = new Float64Array(n);
  const stepSin = new Float64Array(n);
  const stepOmega = 2 * Math.PI * grid.step;
  for (let i = 0; i < n; i++) {
    stepCos[i] = Math.cos(stepOmega * dt[i]);
    stepSin[i] = Math.sin(stepOmega * dt[i]);
  }
  const power = new Float64Array(grid.count);
  for (let k = 0; k < grid.count; k++) {
    if (k % RESYNC_INTERVAL === 0) {
      const omega = 2 * Math.PI * (grid.start + k * grid.step);
      for (let i = 0; i < n; i++) {
        cos[i] = Math.cos(omega * dt[i]);
        sin[i] = Math.sin(omega * dt[i]);
      }
    }
    let c = 0, s = 0, yc = 0, ys = 0, wcc = 0, wcs = 0;
    for (let i = 0; i < n; i++) {
      const ci = cos[i];
      const si = sin[i];
      const wi = w[i];
      c += wi * ci;
      s += wi * si;
      yc += wy[i] * ci;
      ys += wy[i] * si;
      wcc += wi * ci * ci;
      wcs += wi * ci * si;
      cos[i] = ci * stepCos[i] - si * stepSin[i];
      sin[i] = si * stepCos[i] + ci * stepSin[i];
    }
    power[k] = powerFromSums(c, s, yc, ys, wcc, wcs, yy);
  }
  return power;
}
