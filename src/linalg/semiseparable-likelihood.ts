import { FactorizationError } from "./factorization-error.js";
import type { SemiseparableForm } from "./semiseparable-form.js";
import type { TransitionBlock } from "./transition-block.js";
import { TransitionLayout } from "./transition-layout.js";

const HALF_LOG_TWO_PI = 0.5 * Math.log(2 * Math.PI);

/**
 * Points per call of the inner loop. Running the recursion in chunks lets V8 optimise the loop as an
 * ordinary, often-called function; one long loop per call is entered through on-stack replacement, and
 * code compiled that way can deoptimise on every call (measured in bench/README.md).
 */
const CHUNK = 2048;

/** Pivots outside this range go straight into the log-determinant; inside it they are multiplied up. */
const PIVOT_LOW = 1e-100;
const PIVOT_HIGH = 1e100;
/** The running product of pivots is folded into the log-determinant when it leaves this range. */
const PRODUCT_LOW = 1e-150;
const PRODUCT_HIGH = 1e150;

/** Slots of the scalar state carried from chunk to chunk. */
const PREVIOUS_INVERSE = 0;
const PREVIOUS_Z = 1;
const QUADRATIC = 2;
const LOG_DETERMINANT = 3;
const PRODUCT = 4;
/** First slot of S, f and u for the specialised one-block recursions (R = 1: 3 values, R = 2: 8). */
const STATE = 5;
const SCALAR_SLOTS = STATE + 8;

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
 * sum log D_n is taken as the logarithm of a running product of pivots, folded into the sum whenever the
 * product leaves [1e-150, 1e150]: one logarithm per few dozen points instead of one per point, with the
 * same rounding error (a few ulp of the result per fold).
 *
 * @param form the kernel's semiseparable form
 * @param time sorted times (the time origin does not matter: only differences enter)
 * @param noiseVariance per-point white-noise variance added to the diagonal (errors^2 + jitter^2)
 * @param residual data minus mean
 */
export function semiseparableLogLikelihood(
  form: SemiseparableForm,
  time: ArrayLike<number>,
  noiseVariance: ArrayLike<number>,
  residual: ArrayLike<number>,
): number {
  const scalars = new Float64Array(SCALAR_SLOTS);
  scalars[PRODUCT] = 1;
  const n = time.length;
  const p = form.observation;
  const q = form.projection;
  const blocks = form.blocks;
  if (blocks.length === 1 && blocks[0].size <= 2) {
    // One block (damped random walk, oscillator, Matern-3/2): S, f and u live in local variables.
    const block = blocks[0];
    const phi = new Float64Array(block.size * block.size);
    for (let begin = 0; begin < n; begin += CHUNK) {
      const end = Math.min(n, begin + CHUNK);
      if (block.size === 1) advanceOne(block, phi, p, q, scalars, time, noiseVariance, residual, begin, end);
      else advanceTwo(block, phi, p, q, scalars, time, noiseVariance, residual, begin, end);
    }
  } else {
    const layout = new TransitionLayout(form);
    const r = layout.dimension;
    const s = new Float64Array(r * r);
    const f = new Float64Array(r);
    const u = new Float64Array(r);
    for (let begin = 0; begin < n; begin += CHUNK) {
      advance(layout, p, q, s, f, u, scalars, time, noiseVariance, residual, begin, Math.min(n, begin + CHUNK));
    }
  }
  const logDeterminant = scalars[LOG_DETERMINANT] + Math.log(scalars[PRODUCT]);
  const logLikelihood = -0.5 * (scalars[QUADRATIC] + logDeterminant) - n * HALF_LOG_TWO_PI;
  if (!(logLikelihood > -Infinity && logLikelihood < Infinity)) throw new FactorizationError(n - 1, NaN);
  return logLikelihood;
}

/** Points begin .. end - 1 of the recursion; s, f, u and the scalars carry the state between calls. */
function advance(
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
  begin: number,
  end: number,
): void {
  const r = layout.dimension;
  let variance = 0;
  for (let i = 0; i < r; i++) variance += p[i] * q[i];
  let previousInverse = scalars[PREVIOUS_INVERSE];
  let previousZ = scalars[PREVIOUS_Z];
  let quadratic = scalars[QUADRATIC];
  let logDeterminant = scalars[LOG_DETERMINANT];
  let product = scalars[PRODUCT];
  for (let k = begin; k < end; k++) {
    if (k > 0) {
      // S <- Phi (S + u u^T / D) Phi^T ; f <- Phi (f + u z / D)
      for (let i = 0; i < r; i++) {
        const ui = u[i] * previousInverse;
        const row = i * r;
        for (let j = 0; j < r; j++) s[row + j] += ui * u[j];
        f[i] += ui * previousZ;
      }
      layout.computeTransitions(time[k] - time[k - 1]);
      layout.applyCongruence(s, 0);
      layout.applyToVector(f, 0);
    }
    let pSp = 0;
    let pf = 0;
    for (let i = 0; i < r; i++) {
      let sp = 0;
      const row = i * r;
      for (let j = 0; j < r; j++) sp += s[row + j] * p[j];
      u[i] = q[i] - sp;
      pSp += p[i] * sp;
      pf += p[i] * f[i];
    }
    const pivot = noiseVariance[k] + variance - pSp;
    if (!(pivot > 0 && pivot < Infinity)) throw new FactorizationError(k, pivot);
    const z = residual[k] - pf;
    previousInverse = 1 / pivot;
    previousZ = z;
    quadratic += z * z * previousInverse;
    if (pivot > PIVOT_LOW && pivot < PIVOT_HIGH) {
      product *= pivot;
      if (!(product > PRODUCT_LOW && product < PRODUCT_HIGH)) {
        logDeterminant += Math.log(product);
        product = 1;
      }
    } else {
      logDeterminant += Math.log(pivot);
    }
  }
  scalars[PREVIOUS_INVERSE] = previousInverse;
  scalars[PREVIOUS_Z] = previousZ;
  scalars[QUADRATIC] = quadratic;
  scalars[LOG_DETERMINANT] = logDeterminant;
  scalars[PRODUCT] = product;
}

/**
 * `advance` for a single 1 x 1 block (R = 1), with the state in local variables: V8 keeps them in registers,
 * which it does not do for typed-array elements. The arithmetic is the same, operation for operation, as
 * the general loop, so the result is bit-identical.
 */
function advanceOne(
  block: TransitionBlock,
  phi: Float64Array,
  p: Float64Array,
  q: Float64Array,
  scalars: Float64Array,
  time: ArrayLike<number>,
  noiseVariance: ArrayLike<number>,
  residual: ArrayLike<number>,
  begin: number,
  end: number,
): void {
  const p0 = p[0];
  const q0 = q[0];
  const variance = 0 + p0 * q0;
  let s = scalars[STATE];
  let f = scalars[STATE + 1];
  let u = scalars[STATE + 2];
  let previousInverse = scalars[PREVIOUS_INVERSE];
  let previousZ = scalars[PREVIOUS_Z];
  let quadratic = scalars[QUADRATIC];
  let logDeterminant = scalars[LOG_DETERMINANT];
  let product = scalars[PRODUCT];
  for (let k = begin; k < end; k++) {
    if (k > 0) {
      const ui = u * previousInverse;
      s += ui * u;
      f += ui * previousZ;
      block.transition(time[k] - time[k - 1], phi, 0);
      const g = phi[0];
      s = g * (g * s);
      f *= g;
    }
    const sp = s * p0;
    u = q0 - sp;
    const pivot = noiseVariance[k] + variance - p0 * sp;
    if (!(pivot > 0 && pivot < Infinity)) throw new FactorizationError(k, pivot);
    const z = residual[k] - p0 * f;
    previousInverse = 1 / pivot;
    previousZ = z;
    quadratic += z * z * previousInverse;
    if (pivot > PIVOT_LOW && pivot < PIVOT_HIGH) {
      product *= pivot;
      if (!(product > PRODUCT_LOW && product < PRODUCT_HIGH)) {
        logDeterminant += Math.log(product);
        product = 1;
      }
    } else {
      logDeterminant += Math.log(pivot);
    }
  }
  scalars[STATE] = s;
  scalars[STATE + 1] = f;
  scalars[STATE + 2] = u;
  scalars[PREVIOUS_INVERSE] = previousInverse;
  scalars[PREVIOUS_Z] = previousZ;
  scalars[QUADRATIC] = quadratic;
  scalars[LOG_DETERMINANT] = logDeterminant;
  scalars[PRODUCT] = product;
}

/** `advance` for a single 2 x 2 block (R = 2), state in local variables; bit-identical to the general loop. */
function advanceTwo(
  block: TransitionBlock,
  phi: Float64Array,
  p: Float64Array,
  q: Float64Array,
  scalars: Float64Array,
  time: ArrayLike<number>,
  noiseVariance: ArrayLike<number>,
  residual: ArrayLike<number>,
  begin: number,
  end: number,
): void {
  const p0 = p[0];
  const p1 = p[1];
  const q0 = q[0];
  const q1 = q[1];
  const variance = 0 + p0 * q0 + p1 * q1;
  let s00 = scalars[STATE];
  let s01 = scalars[STATE + 1];
  let s10 = scalars[STATE + 2];
  let s11 = scalars[STATE + 3];
  let f0 = scalars[STATE + 4];
  let f1 = scalars[STATE + 5];
  let u0 = scalars[STATE + 6];
  let u1 = scalars[STATE + 7];
  let previousInverse = scalars[PREVIOUS_INVERSE];
  let previousZ = scalars[PREVIOUS_Z];
  let quadratic = scalars[QUADRATIC];
  let logDeterminant = scalars[LOG_DETERMINANT];
  let product = scalars[PRODUCT];
  for (let k = begin; k < end; k++) {
    if (k > 0) {
      const a0 = u0 * previousInverse;
      const a1 = u1 * previousInverse;
      s00 += a0 * u0;
      s01 += a0 * u1;
      s10 += a1 * u0;
      s11 += a1 * u1;
      f0 += a0 * previousZ;
      f1 += a1 * previousZ;
      block.transition(time[k] - time[k - 1], phi, 0);
      const b00 = phi[0];
      const b01 = phi[1];
      const b10 = phi[2];
      const b11 = phi[3];
      // S <- Phi S Phi^T, left product first (as TransitionLayout.applyCongruence).
      const y00 = b00 * s00 + b01 * s10;
      const y01 = b00 * s01 + b01 * s11;
      const y10 = b10 * s00 + b11 * s10;
      const y11 = b10 * s01 + b11 * s11;
      s00 = b00 * y00 + b01 * y01;
      s01 = b10 * y00 + b11 * y01;
      s10 = b00 * y10 + b01 * y11;
      s11 = b10 * y10 + b11 * y11;
      const g0 = b00 * f0 + b01 * f1;
      f1 = b10 * f0 + b11 * f1;
      f0 = g0;
    }
    const sp0 = 0 + s00 * p0 + s01 * p1;
    const sp1 = 0 + s10 * p0 + s11 * p1;
    u0 = q0 - sp0;
    u1 = q1 - sp1;
    const pSp = 0 + p0 * sp0 + p1 * sp1;
    const pf = 0 + p0 * f0 + p1 * f1;
    const pivot = noiseVariance[k] + variance - pSp;
    if (!(pivot > 0 && pivot < Infinity)) throw new FactorizationError(k, pivot);
    const z = residual[k] - pf;
    previousInverse = 1 / pivot;
    previousZ = z;
    quadratic += z * z * previousInverse;
    if (pivot > PIVOT_LOW && pivot < PIVOT_HIGH) {
      product *= pivot;
      if (!(product > PRODUCT_LOW && product < PRODUCT_HIGH)) {
        logDeterminant += Math.log(product);
        product = 1;
      }
    } else {
      logDeterminant += Math.log(pivot);
    }
  }
  scalars[STATE] = s00;
  scalars[STATE + 1] = s01;
  scalars[STATE + 2] = s10;
  scalars[STATE + 3] = s11;
  scalars[STATE + 4] = f0;
  scalars[STATE + 5] = f1;
  scalars[STATE + 6] = u0;
  scalars[STATE + 7] = u1;
  scalars[PREVIOUS_INVERSE] = previousInverse;
  scalars[PREVIOUS_Z] = previousZ;
  scalars[QUADRATIC] = quadratic;
  scalars[LOG_DETERMINANT] = logDeterminant;
  scalars[PRODUCT] = product;
}
