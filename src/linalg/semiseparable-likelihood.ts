import { FactorizationError } from "./factorization-error.js";
import { recordAfterProjection, recordBeforeTransition, type TapeRecorder } from "./gradient-general-loop.js";
import { absorbPivot } from "./pivot-product.js";
import type { SemiseparableForm } from "./semiseparable-form.js";
import { projectState, stepState } from "./state-update.js";
import { TransitionLayout } from "./transition-layout.js";
import { SCALAR_SLOTS } from "./recursion-source.js";
import { initialScalars, RECURSION_CHUNK, recursionTotals, runUnrolled, unrolledRecursion, type RecursionTotals } from "./unrolled-recursion.js";
import { HALF_LOG_TWO_PI } from "../numerics/gaussian-constants.js";

/**
 * The Gaussian log-likelihood log N(r | 0, K + diag(noise)) for a semiseparable kernel, in one pass and
 * O(N R^2) operations with O(R^2) memory.
 *
 * The recursion is the LDL^T factorisation of K (Foreman-Mackey et al. 2017, AJ 154, 220, eqs. 44-47) in
 * state-space form: S_n = Phi_n (S_{n-1} + u_{n-1} u_{n-1}^T / D_{n-1}) Phi_n^T, D_n = d_n - p^T S_n p,
 * u_n = q - S_n p; the forward substitution carries f_n = Phi_n (f_{n-1} + u_{n-1} z_{n-1} / D_{n-1}),
 * z_n = r_n - p^T f_n. Then log L = -1/2 sum (z_n^2 / D_n + log D_n + log 2 pi). S_n is the covariance that
 * the earlier points explain, so it stays bounded: this is the stable form of the recursion.
 *
 * sum log D_n is the logarithm of a running product of pivots kept in range by exact power-of-two
 * rescalings (pivot-product.ts): one logarithm per pass, none inside the loop.
 *
 * @param form the kernel's semiseparable form
 * @param time sorted times (the time origin does not matter: only differences enter)
 * @param noiseVariance per-point white-noise variance added to the diagonal (errors^2 + jitter^2)
 * @param residual data minus mean, or the data themselves with `options.mean`
 * @param options `mean`: a constant subtracted from every value of `residual` on the fly (default 0),
 *   which spares the caller an N-sized array of residuals; `unrolled: false` runs the general loop even
 *   where a written-out recursion exists (for tests; both give bit-identical results)
 */
export function semiseparableLogLikelihood(
  form: SemiseparableForm,
  time: ArrayLike<number>,
  noiseVariance: ArrayLike<number>,
  residual: ArrayLike<number>,
  options: { readonly unrolled?: boolean; readonly mean?: number } = {},
): number {
  const mean = options.mean ?? 0;
  const n = time.length;
  const unrolled = options.unrolled === false ? undefined : unrolledRecursion(form.blocks);
  // Blocks of size 1 and 2 up to R = 10 (every kernel but products): the recursion written out for this
  // layout, with S, f and u in local variables; otherwise the general loop.
  const totals = unrolled
    ? runUnrolled(unrolled, form, time, noiseVariance, residual, mean)
    : generalLoop(form, time, noiseVariance, residual, mean);
  const logLikelihood = -0.5 * (totals.quadratic + totals.logDeterminant) - n * HALF_LOG_TWO_PI;
  if (!(logLikelihood > -Infinity && logLikelihood < Infinity)) throw new FactorizationError(n - 1, NaN);
  return logLikelihood;
}

/**
 * The recursion over typed arrays and `TransitionLayout`, for any blocks, chunk by chunk (with a `recorder`,
 * the gradient's forward pass).
 */
export function generalLoop(
  form: SemiseparableForm,
  time: ArrayLike<number>,
  noiseVariance: ArrayLike<number>,
  residual: ArrayLike<number>,
  mean: number,
  recorder?: TapeRecorder,
): RecursionTotals {
  const n = time.length;
  const layout = new TransitionLayout(form);
  const r = layout.dimension;
  const s = new Float64Array(r * r);
  const f = new Float64Array(r);
  const u = new Float64Array(r);
  const scalars = initialScalars();
  for (let begin = 0; begin < n; begin += RECURSION_CHUNK) {
    advance(layout, form.observation, form.projection, s, f, u, scalars, time, noiseVariance, residual, mean, begin, Math.min(n, begin + RECURSION_CHUNK), recorder);
  }
  return recursionTotals(scalars);
}

/**
 * Points begin .. end - 1 of the recursion; s, f, u and the scalars carry the state between calls. With a
 * `recorder`, the step also writes the gradient's tape (the gradient's forward pass, semiseparable-gradient.ts):
 * one forward step for the likelihood and the gradient.
 */
export function advance(
  layout: TransitionLayout,
  p: Float64Array,
  q: Float64Array,
  s: Float64Array,
  f: Float64Array,
  u: Float64Array,
  scalars: Float64Array,
  time: ArrayLike<number>,
  noiseVariance: ArrayLike<number>,
  residual: ArrayLike<number>,
  mean: number,
  begin: number,
  end: number,
  recorder?: TapeRecorder,
): void {
  const r = layout.dimension;
  let variance = 0;
  for (let i = 0; i < r; i++) variance += p[i] * q[i];
  const projection = new Float64Array(2);
  let previousInverse = scalars[SCALAR_SLOTS.previousInverse];
  let previousZ = scalars[SCALAR_SLOTS.previousZ];
  let quadratic = scalars[SCALAR_SLOTS.quadratic];
  let k = begin;
  const record = recorder && ((dt: number) => recordBeforeTransition(recorder, layout, k, s, f, dt));
  for (; k < end; k++) {
    // S <- Phi (S + u u^T / D) Phi^T ; f <- Phi (f + u z / D)
    if (k > 0) stepState(layout, s, f, u, 0, previousInverse, previousZ, time[k] - time[k - 1], true, record);
    projectState(s, f, p, q, u, 0, r, projection);
    const pSp = projection[0];
    const pf = projection[1];
    const pivot = noiseVariance[k] + variance - pSp;
    if (!(pivot > 0 && pivot < Infinity)) throw new FactorizationError(k, pivot);
    const z = residual[k] - mean - pf;
    previousInverse = 1 / pivot;
    previousZ = z;
    quadratic += z * z * previousInverse;
    absorbPivot(pivot, scalars, SCALAR_SLOTS.product, SCALAR_SLOTS.exponent);
    if (recorder) recordAfterProjection(recorder, k, s, f, u, previousInverse, z);
  }
  scalars[SCALAR_SLOTS.previousInverse] = previousInverse;
  scalars[SCALAR_SLOTS.previousZ] = previousZ;
  scalars[SCALAR_SLOTS.quadratic] = quadratic;
}
