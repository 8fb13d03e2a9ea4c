import { FactorizationError } from "../linalg/factorization-error.js";
import type { SemiseparableForm } from "../linalg/semiseparable-form.js";
import { projectState } from "../linalg/state-update.js";
import { TransitionLayout } from "../linalg/transition-layout.js";
import { initialScalars, RECURSION_CHUNK, recursionTotals, stateLength, unrolledRecursion, type BandScaling } from "../linalg/unrolled-recursion.js";
import { LOG_TWO_PI } from "../numerics/gaussian-constants.js";

/** The sums a multi-band likelihood with its band means integrated out needs. */
export interface BandMeanSums {
  /**
   * The (B + 1) x (B + 1) Gram matrix V^T K^-1 V, row-major, of the columns V = [r, x_1 ... x_B]: r the
   * scaled residual, x_b the indicator of band b's points divided by a_b.
   */
  readonly gram: Float64Array;
  /** log det K. */
  readonly logDeterminant: number;
}

/**
 * V^T K^-1 V and log det K for K = K0 + diag(noise) semiseparable, in one pass of the factorisation's
 * recursion (Foreman-Mackey et al. 2017, AJ 154, 220, eqs. 44-47) carried with B + 1 right-hand sides:
 * the forward substitution z_c = L^-1 v_c runs on every column at once, and v_c^T K^-1 v_d = sum_n
 * z_c,n z_d,n / D_n. O(N (R^2 + B R + B^2)). The data are scaled per band inside the loop, as in
 * `bandScaledLogLikelihood`: r_k = (y_k - shift_b) inverse_b, noise_k = (v_k + extra_b) inverse_b^2,
 * x_b = [band = b] inverse_b; the written-out recursion (unrolled-recursion.ts, `bandColumns`) where the
 * layout has one, else a general loop.
 *
 * @param time sorted times (joint order); @param errorVariance squared errors; @param values the values;
 * @param scaling band of each point and the per-band constants (`shift`: the means' prior centres)
 */
export function bandMeanSums(
  form: SemiseparableForm,
  time: ArrayLike<number>,
  errorVariance: ArrayLike<number>,
  values: ArrayLike<number>,
  scaling: BandScaling,
  options: { readonly unrolled?: boolean } = {},
): BandMeanSums {
  const bands = scaling.inverse.length;
  const advance = options.unrolled === false ? undefined : unrolledRecursion(form.blocks, { scaling: "bands", bandColumns: bands });
  if (!advance) return generalBandMeanSums(form, time, errorVariance, values, scaling);
  const n = time.length;
  const r = form.observation.length;
  const columns = bands + 1;
  const state = new Float64Array(stateLength(r, false, bands));
  const scalars = initialScalars();
  const gram = new Float64Array(columns * columns);
  const withGram = { ...scaling, gram };
  for (let begin = 0; begin < n; begin += RECURSION_CHUNK) {
    advance(form.blocks, form.observation, form.projection, state, scalars, time, errorVariance, values, 0, begin, Math.min(n, begin + RECURSION_CHUNK), undefined, withGram);
  }
  const totals = recursionTotals(scalars);
  gram[0] = totals.quadratic;
  for (let c = 0; c < columns; c++) for (let d = 0; d < c; d++) gram[c * columns + d] = gram[d * columns + c];
  return { gram, logDeterminant: totals.logDeterminant };
}

/** {@link bandMeanSums} by a loop over typed arrays and `TransitionLayout`, for any blocks. */
function generalBandMeanSums(
  form: SemiseparableForm,
  time: ArrayLike<number>,
  errorVariance: ArrayLike<number>,
  values: ArrayLike<number>,
  scaling: BandScaling,
): BandMeanSums {
  const { band, inverse: inverseAmplitude, shift, extra } = scaling;
  const layout = new TransitionLayout(form);
  const r = layout.dimension;
  const p = form.observation;
  const q = form.projection;
  const bands = inverseAmplitude.length;
  const columns = bands + 1;
  let variance = 0;
  for (let i = 0; i < r; i++) variance += p[i] * q[i];
  const s = new Float64Array(r * r);
  const f = new Float64Array(columns * r); // predicted state of each column
  const u = new Float64Array(r);
  const z = new Float64Array(columns);
  const gram = new Float64Array(columns * columns);
  const projection = new Float64Array(2);
  let previousInverse = 0;
  let logDeterminant = 0;
  for (let k = 0; k < time.length; k++) {
    if (k > 0) {
      // S <- S + u u^T / D; f_c <- f_c + u z_c / D for every column; then both through Phi.
      for (let i = 0; i < r; i++) {
        const ui = u[i] * previousInverse;
        for (let j = 0; j < r; j++) s[i * r + j] += ui * u[j];
      }
      for (let c = 0; c < columns; c++) {
        const w = z[c] * previousInverse;
        if (w === 0) continue;
        for (let i = 0; i < r; i++) f[c * r + i] += u[i] * w;
      }
      layout.computeTransitions(time[k] - time[k - 1]);
      layout.applyCongruence(s, 0);
      for (let c = 0; c < columns; c++) layout.applyToVector(f, c * r);
    }
    projectState(s, f, p, q, u, 0, r, projection);
    const b = band[k];
    const w = inverseAmplitude[b];
    const pivot = (errorVariance[k] + extra[b]) * w * w + variance - projection[0];
    if (!(pivot > 0 && pivot < Infinity)) throw new FactorizationError(k, pivot);
    previousInverse = 1 / pivot;
    for (let c = 0; c < columns; c++) {
      let pf = 0;
      for (let i = 0; i < r; i++) pf += p[i] * f[c * r + i];
      const value = c === 0 ? (values[k] - shift[b]) * w : b === c - 1 ? w : 0;
      z[c] = value - pf;
    }
    for (let c = 0; c < columns; c++) {
      const zc = z[c] * previousInverse;
      for (let d = c; d < columns; d++) gram[c * columns + d] += zc * z[d];
    }
    logDeterminant += Math.log(pivot);
  }
  for (let c = 0; c < columns; c++) for (let d = 0; d < c; d++) gram[c * columns + d] = gram[d * columns + c];
  return { gram, logDeterminant };
}

/** A normal prior on one band's mean. */
export interface BandMeanPrior {
  readonly mean: number;
  /** Prior standard deviation, finite and > 0. */
  readonly sd: number;
}

/** The likelihood with the band means integrated out, and their Gaussian posterior given the rest. */
export interface BandMeanMarginal {
  readonly logLikelihood: number;
  /** Posterior means of the band means. */
  readonly mean: Float64Array;
  /** Lower Cholesky factor L of the posterior precision A = L L^T (B x B row-major): draws are mean + L^-T xi. */
  readonly precisionFactor: Float64Array;
}


/**
 * Integrates the band means m ~ N(m0, diag(s^2)) out of y = X m + a f + noise (X the band indicators),
 * the means being linear parameters of the Gaussian likelihood (Rybicki & Press 1992, ApJ 398, 169,
 * sec. 2, with one column per band). With C the covariance, r = y - X m0, A = diag(1/s^2) + X^T C^-1 X
 * and b = X^T C^-1 r (Woodbury's identity and the matrix determinant lemma):
 *
 *     log p(y) = -1/2 [r^T C^-1 r - b^T A^-1 b + log det C + sum log s_b^2 + log det A + N log 2 pi],
 *     m | y ~ N(m0 + A^-1 b, A^-1).
 *
 * `sums` are in the scaled space of the joint process (C = D K D, D = diag(a)): C^-1 quadratic forms equal
 * K^-1 forms of the scaled columns, and log det C = log det K + `logAmplitudeSum` (2 sum_i log |a_b(i)|).
 */
export function integrateBandMeans(
  sums: BandMeanSums,
  priors: readonly BandMeanPrior[],
  logAmplitudeSum: number,
  points: number,
): BandMeanMarginal {
  const bands = priors.length;
  const columns = bands + 1;
  const g = sums.gram;
  const precision = new Float64Array(bands * bands);
  const b = new Float64Array(bands);
  let logPrior = 0;
  for (let i = 0; i < bands; i++) {
    const sd = priors[i].sd;
    if (!(sd > 0 && sd < Infinity)) throw new RangeError(`integrateBandMeans: prior sd[${i}] must be finite and > 0, got ${sd}`);
    logPrior += 2 * Math.log(sd);
    b[i] = g[i + 1];
    for (let j = 0; j < bands; j++) precision[i * bands + j] = g[(i + 1) * columns + j + 1] + (i === j ? 1 / (sd * sd) : 0);
  }
  const factor = choleskyLower(precision, bands);
  // A^-1 b by two triangular solves; b^T A^-1 b = |L^-1 b|^2.
  const w = forwardSolve(factor, b, bands);
  let explained = 0;
  let logDetA = 0;
  for (let i = 0; i < bands; i++) {
    explained += w[i] * w[i];
    logDetA += 2 * Math.log(factor[i * bands + i]);
  }
  const shift = backwardSolve(factor, w, bands);
  const logLikelihood = -0.5 * (g[0] - explained + sums.logDeterminant + logAmplitudeSum + logPrior + logDetA + points * LOG_TWO_PI);
  if (!(logLikelihood > -Infinity && logLikelihood < Infinity)) throw new FactorizationError(points - 1, NaN);
  return { logLikelihood, mean: Float64Array.from(priors, (prior, i) => prior.mean + shift[i]), precisionFactor: factor };
}

/** m + L^-T xi for standard-normal xi: a draw of the band means from their posterior. */
export function drawBandMeans(marginal: BandMeanMarginal, xi: ArrayLike<number>): Float64Array {
  const bands = marginal.mean.length;
  const offset = backwardSolve(marginal.precisionFactor, xi, bands);
  return Float64Array.from(marginal.mean, (m, i) => m + offset[i]);
}

/** Lower Cholesky factor of a small symmetric positive-definite matrix (row-major). */
function choleskyLower(matrix: Float64Array, n: number): Float64Array {
  const l = new Float64Array(n * n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j <= i; j++) {
      let sum = matrix[i * n + j];
      for (let k = 0; k < j; k++) sum -= l[i * n + k] * l[j * n + k];
      if (i === j) {
        if (!(sum > 0)) throw new FactorizationError(i, sum);
        l[i * n + i] = Math.sqrt(sum);
      } else l[i * n + j] = sum / l[j * n + j];
    }
  return l;
}

/** L^-1 v. */
function forwardSolve(l: Float64Array, v: ArrayLike<number>, n: number): Float64Array {
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let sum = v[i];
    for (let k = 0; k < i; k++) sum -= l[i * n + k] * x[k];
    x[i] = sum / l[i * n + i];
  }
  return x;
}

/** L^-T v. */
function backwardSolve(l: Float64Array, v: ArrayLike<number>, n: number): Float64Array {
  const x = new Float64Array(n);
  for (let i = n - 1; i >= 0; i--) {
    let sum = v[i];
    for (let k = i + 1; k < n; k++) sum -= l[k * n + i] * x[k];
    x[i] = sum / l[i * n + i];
  }
  return x;
}
