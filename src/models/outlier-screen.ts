import { sortedQuantile } from "../numerics/order-statistics.js";
import { normalQuantile } from "../inference/distribution-functions.js";
import type { LightCurve } from "../lightcurve/light-curve.js";

/** Neighbours on each side of a point in the running median (a window of 2 x 5 + 1 points). */
const HALF_WINDOW = 5;

/**
 * Standardised residuals about a smooth curve that outliers cannot pull: z_i = (y_i - m_i) / s_i with
 * m_i the median of the point's 2 x 5 neighbours in time (the point itself excluded, so that a lone
 * outlier does not pull its own reference), and s_i^2 = error_i^2 + e^2, e^2 the scatter of the residuals
 * (1.4826 x their median absolute deviation, squared) beyond the median error^2, the part a
 * running median leaves of fast variability. The running median resists up to half of each window
 * being outliers (breakdown point 1/2, Hampel 1974, JASA 69, 383); the 1.4826 makes the MAD a
 * consistent estimate of a normal's sigma (common practice). O(N) memory, O(N k log k) time.
 */
export function robustResiduals(lightCurve: LightCurve): Float64Array {
  const { value } = lightCurve;
  const n = value.length;
  const residual = new Float64Array(n);
  const window = new Float64Array(2 * HALF_WINDOW);
  for (let i = 0; i < n; i++) {
    let count = 0;
    for (let j = Math.max(0, i - HALF_WINDOW); j <= Math.min(n - 1, i + HALF_WINDOW); j++) if (j !== i) window[count++] = value[j];
    residual[i] = count > 0 ? value[i] - medianInPlace(window.subarray(0, count)) : 0;
  }
  const absolute = Float64Array.from(residual, Math.abs);
  const scatter = 1.4826 * medianInPlace(absolute);
  const errors = lightCurve.error;
  const medianError = errors ? medianInPlace(Float64Array.from(errors)) : 0;
  const excess = Math.max(scatter * scatter - medianError * medianError, 0);
  const floor = Math.max(scatter, medianError, Number.MIN_VALUE) * 1e-6;
  return Float64Array.from(residual, (r, i) => r / Math.max(Math.sqrt((errors ? errors[i] ** 2 : 0) + excess), floor));
}

/**
 * The standardised residual beyond which a point is a gross outlier for Gaussian noise among `n`:
 * the |z| that n Gaussian points exceed with probability 1% in all, P(|z| > z*) = 0.01 / n, at least 5.
 * For n = 400 it is 4.21 -> 5; for n = 1e6, 5.73.
 */
export function grossOutlierThreshold(n: number): number {
  return Math.max(5, normalQuantile(1 - 0.005 / Math.max(n, 1), 0, 1));
}

/** Indices of the points whose {@link robustResiduals} exceed {@link grossOutlierThreshold}. */
export function grossOutliers(lightCurve: LightCurve): number[] {
  const z = robustResiduals(lightCurve);
  const threshold = grossOutlierThreshold(z.length);
  const found: number[] = [];
  for (let i = 0; i < z.length; i++) if (Math.abs(z[i]) > threshold) found.push(i);
  return found;
}

function medianInPlace(values: Float64Array): number {
  return sortedQuantile(values.sort(), 0.5);
}
