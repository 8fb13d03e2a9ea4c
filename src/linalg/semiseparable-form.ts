import { KroneckerTransition } from "./kronecker-transition.js";
import type { TransitionBlock } from "./transition-block.js";

/**
 * A kernel in semiseparable (state-space) coefficient form: k(tau) = p^T exp(F |tau|) q, with F block
 * diagonal (one `TransitionBlock` per block), p the observation vector and q = P p the projection of the
 * stationary state covariance P. R = length of p is the number of semiseparable components.
 *
 * The derivatives of p and q with respect to the kernel's parameters are carried along (row k of the
 * gradient arrays holds d/dtheta_k) for the reverse-mode log-likelihood gradient.
 */
export interface SemiseparableForm {
  readonly blocks: readonly TransitionBlock[];
  /** The observation vector p (length R). */
  readonly observation: Float64Array;
  /** The projected stationary covariance q = P p (length R). */
  readonly projection: Float64Array;
  /** Number of kernel parameters the gradients refer to. */
  readonly parameterCount: number;
  /** dp/dtheta, parameterCount x R row-major. */
  readonly observationGradient: Float64Array;
  /** dq/dtheta, parameterCount x R row-major. */
  readonly projectionGradient: Float64Array;
}

/** The number R of semiseparable components of a form. */
export function componentCount(form: SemiseparableForm): number {
  return form.observation.length;
}

/** The variance k(0) = p^T q. */
export function formVariance(form: SemiseparableForm): number {
  let total = 0;
  for (let i = 0; i < form.observation.length; i++) total += form.observation[i] * form.projection[i];
  return total;
}

/**
 * The form of a sum of two kernels: blocks, p and q concatenated. The second kernel's parameters are
 * numbered after the first's (`offset` = the first kernel's parameter count).
 */
export function sumOfForms(a: SemiseparableForm, b: SemiseparableForm): SemiseparableForm {
  const offset = a.parameterCount;
  const count = a.parameterCount + b.parameterCount;
  const ra = a.observation.length;
  const rb = b.observation.length;
  const r = ra + rb;
  const observationGradient = new Float64Array(count * r);
  const projectionGradient = new Float64Array(count * r);
  for (let k = 0; k < a.parameterCount; k++)
    for (let i = 0; i < ra; i++) {
      observationGradient[k * r + i] = a.observationGradient[k * ra + i];
      projectionGradient[k * r + i] = a.projectionGradient[k * ra + i];
    }
  for (let k = 0; k < b.parameterCount; k++)
    for (let i = 0; i < rb; i++) {
      observationGradient[(offset + k) * r + ra + i] = b.observationGradient[k * rb + i];
      projectionGradient[(offset + k) * r + ra + i] = b.projectionGradient[k * rb + i];
    }
  return {
    blocks: [...a.blocks, ...b.blocks.map((block) => block.reindexed((index) => index + offset))],
    observation: concat(a.observation, b.observation),
    projection: concat(a.projection, b.projection),
    parameterCount: count,
    observationGradient,
    projectionGradient,
  };
}

/**
 * The form of a product of two kernels: one Kronecker block per pair of blocks, with p and q the
 * Kronecker products of the blocks' p and q (see `KroneckerTransition`). R multiplies.
 */
export function productOfForms(a: SemiseparableForm, b: SemiseparableForm): SemiseparableForm {
  const offset = a.parameterCount;
  const count = a.parameterCount + b.parameterCount;
  const ra = a.observation.length;
  const rb = b.observation.length;
  const blocks: TransitionBlock[] = [];
  const observation: number[] = [];
  const projection: number[] = [];
  const observationRows: number[][] = Array.from({ length: count }, () => []);
  const projectionRows: number[][] = Array.from({ length: count }, () => []);
  let startA = 0;
  for (const blockA of a.blocks) {
    let startB = 0;
    for (const blockB of b.blocks) {
      blocks.push(new KroneckerTransition(blockA, blockB.reindexed((index) => index + offset)));
      for (let i = 0; i < blockA.size; i++)
        for (let j = 0; j < blockB.size; j++) {
          const ia = startA + i;
          const jb = startB + j;
          observation.push(a.observation[ia] * b.observation[jb]);
          projection.push(a.projection[ia] * b.projection[jb]);
          for (let k = 0; k < a.parameterCount; k++) {
            observationRows[k].push(a.observationGradient[k * ra + ia] * b.observation[jb]);
            projectionRows[k].push(a.projectionGradient[k * ra + ia] * b.projection[jb]);
          }
          for (let k = 0; k < b.parameterCount; k++) {
            observationRows[offset + k].push(a.observation[ia] * b.observationGradient[k * rb + jb]);
            projectionRows[offset + k].push(a.projection[ia] * b.projectionGradient[k * rb + jb]);
          }
        }
      startB += blockB.size;
    }
    startA += blockA.size;
  }
  return {
    blocks,
    observation: Float64Array.from(observation),
    projection: Float64Array.from(projection),
    parameterCount: count,
    observationGradient: Float64Array.from(observationRows.flat()),
    projectionGradient: Float64Array.from(projectionRows.flat()),
  };
}

/** k(lag) = p^T exp(F |lag|) q, evaluated block by block. */
export function formAutocovariance(form: SemiseparableForm, lag: number): number {
  const dt = Math.abs(lag);
  let total = 0;
  let start = 0;
  for (const block of form.blocks) {
    const m = block.size;
    const phi = new Float64Array(m * m);
    block.transition(dt, phi, 0);
    for (let i = 0; i < m; i++) {
      let row = 0;
      for (let j = 0; j < m; j++) row += phi[i * m + j] * form.projection[start + j];
      total += form.observation[start + i] * row;
    }
    start += m;
  }
  return total;
}

/**
 * The two-sided power spectral density S(omega) = integral k(tau) exp(-i omega tau) dtau of a form:
 * S(omega) = 2 Re[p^T (i omega I - F)^{-1} q], solved block by block in complex arithmetic.
 */
export function formPowerSpectrum(form: SemiseparableForm, omega: number): number {
  let total = 0;
  let start = 0;
  for (const block of form.blocks) {
    const m = block.size;
    // Complex system (i omega I - F) x = q_block, by Gaussian elimination with partial pivoting.
    const re = new Float64Array(m * m);
    const im = new Float64Array(m * m);
    const bRe = new Float64Array(m);
    const bIm = new Float64Array(m);
    for (let i = 0; i < m; i++) {
      for (let j = 0; j < m; j++) re[i * m + j] = -block.generator[i * m + j];
      im[i * m + i] = omega;
      bRe[i] = form.projection[start + i];
    }
    solveComplex(re, im, bRe, bIm, m);
    for (let i = 0; i < m; i++) total += 2 * form.observation[start + i] * bRe[i];
    start += m;
  }
  return total;
}

function solveComplex(re: Float64Array, im: Float64Array, bRe: Float64Array, bIm: Float64Array, m: number): void {
  for (let col = 0; col < m; col++) {
    let pivot = col;
    let best = -1;
    for (let row = col; row < m; row++) {
      const size = Math.hypot(re[row * m + col], im[row * m + col]);
      if (size > best) {
        best = size;
        pivot = row;
      }
    }
    if (pivot !== col) {
      for (let j = 0; j < m; j++) {
        swap(re, pivot * m + j, col * m + j);
        swap(im, pivot * m + j, col * m + j);
      }
      swap(bRe, pivot, col);
      swap(bIm, pivot, col);
    }
    const pr = re[col * m + col];
    const pi = im[col * m + col];
    const norm = pr * pr + pi * pi;
    for (let row = col + 1; row < m; row++) {
      const ar = re[row * m + col];
      const ai = im[row * m + col];
      // factor = a / pivot
      const fr = (ar * pr + ai * pi) / norm;
      const fi = (ai * pr - ar * pi) / norm;
      for (let j = col; j < m; j++) {
        const cr = re[col * m + j];
        const ci = im[col * m + j];
        re[row * m + j] -= fr * cr - fi * ci;
        im[row * m + j] -= fr * ci + fi * cr;
      }
      const cr = bRe[col];
      const ci = bIm[col];
      bRe[row] -= fr * cr - fi * ci;
      bIm[row] -= fr * ci + fi * cr;
    }
  }
  for (let row = m - 1; row >= 0; row--) {
    let sr = bRe[row];
    let si = bIm[row];
    for (let j = row + 1; j < m; j++) {
      const ar = re[row * m + j];
      const ai = im[row * m + j];
      sr -= ar * bRe[j] - ai * bIm[j];
      si -= ar * bIm[j] + ai * bRe[j];
    }
    const pr = re[row * m + row];
    const pi = im[row * m + row];
    const norm = pr * pr + pi * pi;
    bRe[row] = (sr * pr + si * pi) / norm;
    bIm[row] = (si * pr - sr * pi) / norm;
  }
}

function swap(a: Float64Array, i: number, j: number): void {
  const t = a[i];
  a[i] = a[j];
  a[j] = t;
}

function concat(a: Float64Array, b: Float64Array): Float64Array {
  const out = new Float64Array(a.length + b.length);
  out.set(a, 0);
  out.set(b, a.length);
  return out;
}

/**
 * d k(lag) / d theta_k for every parameter of a form, exactly:
 * dk = dp^T Phi q + p^T dPhi q + p^T Phi dq (used by the dense engine's gradient).
 */
export function formCovarianceDerivatives(form: SemiseparableForm, lag: number): Float64Array {
  const dt = Math.abs(lag);
  const r = form.observation.length;
  const out = new Float64Array(form.parameterCount);
  let start = 0;
  for (const block of form.blocks) {
    const m = block.size;
    const phi = new Float64Array(m * m);
    block.transition(dt, phi, 0);
    const count = block.parameterIndex.length;
    const dPhi = new Float64Array(Math.max(1, count) * m * m);
    if (count > 0) block.transitionDerivatives(dt, dPhi, 0);
    for (let i = 0; i < m; i++)
      for (let j = 0; j < m; j++) {
        const pi = form.observation[start + i];
        const qj = form.projection[start + j];
        const phiIJ = phi[i * m + j];
        for (let c = 0; c < form.parameterCount; c++) {
          out[c] +=
            form.observationGradient[c * r + start + i] * phiIJ * qj +
            pi * phiIJ * form.projectionGradient[c * r + start + j];
        }
        for (let c = 0; c < count; c++) out[block.parameterIndex[c]] += pi * dPhi[c * m * m + i * m + j] * qj;
      }
    start += m;
  }
  return out;
}
