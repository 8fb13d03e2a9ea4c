import { normalisedWeights, weightedMeanTime, type SampledSeries } from "./time-series.js";

/** The best-fitting sinusoid at one frequency. */
export interface SinusoidFit {
  /** Frequency in cycles per unit of time. */
  readonly frequency: number;
  /** Semi-amplitude sqrt(a^2 + b^2), in the unit of the values. */
  readonly amplitude: number;
  /** Phase phi in radians of y = offset + amplitude cos(2 pi f (t - referenceTime) - phi). */
  readonly phase: number;
  /** The floating mean c. */
  readonly offset: number;
  /** The time the phase refers to (the weighted mean time). */
  readonly referenceTime: number;
}

/**
 * The weighted least-squares sinusoid y = a cos(w t') + b sin(w t') + c at one frequency, t' = t - t_ref
 * (the model of Zechmeister & Kurster 2009, eqs. 2-3), solved from its 3x3 normal equations. Used for
 * initial guesses (an amplitude sets the scale of a periodic kernel).
 */
export function fitSinusoid(series: SampledSeries, frequency: number): SinusoidFit {
  const w = normalisedWeights(series);
  const tRef = weightedMeanTime(series.time, w);
  const omega = 2 * Math.PI * frequency;
  // Normal equations for the basis (cos, sin, 1).
  const m = [0, 0, 0, 0, 0, 0, 0, 0, 0];
  const r = [0, 0, 0];
  for (let i = 0; i < w.length; i++) {
    const basis = [Math.cos(omega * (series.time[i] - tRef)), Math.sin(omega * (series.time[i] - tRef)), 1];
    for (let a = 0; a < 3; a++) {
      r[a] += w[i] * basis[a] * series.value[i];
      for (let b = 0; b < 3; b++) m[3 * a + b] += w[i] * basis[a] * basis[b];
    }
  }
  const [a, b, c] = solve3(m, r);
  return {
    frequency,
    amplitude: Math.hypot(a, b),
    phase: Math.atan2(b, a),
    offset: c,
    referenceTime: tRef,
  };
}

/** Solves a 3x3 symmetric system by Gaussian elimination with partial pivoting. */
function solve3(m: number[], r: number[]): [number, number, number] {
  const a = [
    [m[0], m[1], m[2], r[0]],
    [m[3], m[4], m[5], r[1]],
    [m[6], m[7], m[8], r[2]],
  ];
  for (let col = 0; col < 3; col++) {
    let pivot = col;
    for (let row = col + 1; row < 3; row++) if (Math.abs(a[row][col]) > Math.abs(a[pivot][col])) pivot = row;
    [a[col], a[pivot]] = [a[pivot], a[col]];
    if (Math.abs(a[col][col]) < 1e-14) throw new RangeError("the sinusoid is not determined at this frequency (degenerate sampling)");
    for (let row = col + 1; row < 3; row++) {
      const factor = a[row][col] / a[col][col];
      for (let k = col; k < 4; k++) a[row][k] -= factor * a[col][k];
    }
  }
  const x = [0, 0, 0];
  for (let row = 2; row >= 0; row--) {
    let sum = a[row][3];
    for (let k = row + 1; k < 3; k++) sum -= a[row][k] * x[k];
    x[row] = sum / a[row][row];
  }
  return [x[0], x[1], x[2]];
}
