import { FactorizationError } from "./factorization-error.js";
import type { SemiseparableForm } from "./semiseparable-form.js";
import { absorbPoint, projectState } from "./state-update.js";
import { TransitionLayout } from "./transition-layout.js";

const HALF_LOG_TWO_PI = 0.5 * Math.log(2 * Math.PI);

/** The log-likelihood and its gradient with respect to the kernel parameters, the noise and the data. */
export interface LikelihoodGradient {
  readonly value: number;
  /** d log L / d theta_k for each kernel parameter of the form. */
  readonly kernel: Float64Array;
  /** d log L / d noiseVariance_n for each point (chain to errors or jitter). */
  readonly noiseVariance: Float64Array;
  /** d log L / d residual_n for each point (the mean's gradient is minus their sum). */
  readonly residual: Float64Array;
}

/**
 * The log-likelihood of `semiseparableLogLikelihood` and its exact gradient, by reverse-mode
 * differentiation through the recursion (Foreman-Mackey 2018, RNAAS 2, 31): a forward pass that keeps the
 * states S_n, f_n, u_n, D_n, z_n, then a backward pass that carries the adjoints of S_n and f_n. Both passes
 * cost O(N R^2); memory is O(N R^2).
 *
 * Adjoint identities used (S, A symmetric): for S_n = Phi A Phi^T, dPhi-bar = 2 S-bar Phi A and
 * A-bar = Phi^T S-bar Phi; for f_n = Phi g, dPhi-bar = f-bar g^T and g-bar = Phi^T f-bar.
 */
export function semiseparableLogLikelihoodGradient(
  form: SemiseparableForm,
  time: ArrayLike<number>,
  noiseVariance: ArrayLike<number>,
  residual: ArrayLike<number>,
): LikelihoodGradient {
  const layout = new TransitionLayout(form);
  const r = layout.dimension;
  const rr = r * r;
  const n = time.length;
  const p = form.observation;
  const q = form.projection;
  let variance = 0;
  for (let i = 0; i < r; i++) variance += p[i] * q[i];

  // ---- forward pass, keeping the states ----
  const states = new Float64Array(n * rr); // S_n
  const phiLength = layout.phi.length;
  const transitions = new Float64Array(n * phiLength); // Phi_n, kept for the backward pass
  const means = new Float64Array(n * r); // f_n
  const gains = new Float64Array(n * r); // u_n = q - S_n p
  const pivots = new Float64Array(n); // D_n
  const innovations = new Float64Array(n); // z_n
  const s = new Float64Array(rr);
  const f = new Float64Array(r);
  const projection = new Float64Array(2);
  let value = 0;
  for (let k = 0; k < n; k++) {
    if (k > 0) {
      absorbPoint(s, f, gains, (k - 1) * r, 1 / pivots[k - 1], innovations[k - 1], r);
      layout.computeTransitions(time[k] - time[k - 1]);
      transitions.set(layout.phi, k * phiLength);
      layout.applyCongruence(s, 0);
      layout.applyToVector(f, 0);
    }
    states.set(s, k * rr);
    means.set(f, k * r);
    projectState(s, f, p, q, gains, k * r, r, projection);
    const pSp = projection[0];
    const pf = projection[1];
    const pivot = noiseVariance[k] + variance - pSp;
    if (!(pivot > 0) || !Number.isFinite(pivot)) throw new FactorizationError(k, pivot);
    pivots[k] = pivot;
    const z = residual[k] - pf;
    innovations[k] = z;
    value -= 0.5 * ((z * z) / pivot + Math.log(pivot)) + HALF_LOG_TWO_PI;
  }

  // ---- backward pass ----
  const kernelBar = new Float64Array(form.parameterCount);
  const noiseBar = new Float64Array(n);
  const residualBar = new Float64Array(n);
  const pBar = new Float64Array(r);
  const qBar = new Float64Array(r);
  const sBar = new Float64Array(rr); // adjoint of S_k
  const fBar = new Float64Array(r); // adjoint of f_k
  const uBar = new Float64Array(r); // adjoint of u_k
  const a = new Float64Array(rr); // A_k = S_{k-1} + u u^T / D
  const g = new Float64Array(r); // g_k = f_{k-1} + u z / D
  const phiA = new Float64Array(rr);
  const sp = new Float64Array(r);
  const work = new Float64Array(r);
  let derivativeLength = 0;
  for (const block of form.blocks) derivativeLength = Math.max(derivativeLength, block.parameterIndex.length * block.size * block.size);
  const phiDerivatives = new Float64Array(Math.max(1, derivativeLength));
  let dBar = 0; // adjoint of D_k arriving from step k + 1
  let zBar = 0; // adjoint of z_k arriving from step k + 1
  uBar.fill(0);

  for (let k = n - 1; k >= 0; k--) {
    const pivot = pivots[k];
    const z = innovations[k];
    const sOffset = k * rr;
    const uOffset = k * r;
    // Local terms of log L: -1/2 (z^2 / D + log D).
    zBar += -z / pivot;
    dBar += (0.5 * z * z) / (pivot * pivot) - 0.5 / pivot;
    // z = r - p^T f
    residualBar[k] = zBar;
    for (let i = 0; i < r; i++) {
      fBar[i] -= zBar * p[i];
      pBar[i] -= zBar * means[uOffset + i];
    }
    // u = q - S p  and  D = d + p^T q - p^T S p
    noiseBar[k] = dBar;
    for (let i = 0; i < r; i++) {
      let acc = 0;
      for (let j = 0; j < r; j++) acc += states[sOffset + i * r + j] * p[j];
      sp[i] = acc;
    }
    for (let i = 0; i < r; i++) {
      qBar[i] += uBar[i] + dBar * p[i];
      pBar[i] += dBar * q[i] - 2 * dBar * sp[i];
      let acc = 0;
      for (let j = 0; j < r; j++) acc += states[sOffset + j * r + i] * uBar[j];
      pBar[i] -= acc;
      for (let j = 0; j < r; j++) sBar[i * r + j] -= dBar * p[i] * p[j] + uBar[i] * p[j];
    }
    // Symmetrise: only the symmetric part of S-bar matters because S is symmetric.
    for (let i = 0; i < r; i++)
      for (let j = i + 1; j < r; j++) {
        const mean = 0.5 * (sBar[i * r + j] + sBar[j * r + i]);
        sBar[i * r + j] = mean;
        sBar[j * r + i] = mean;
      }
    if (k === 0) break;

    // Rebuild A_k and g_k from step k - 1.
    const prevInverse = 1 / pivots[k - 1];
    const prevZ = innovations[k - 1];
    const prevU = (k - 1) * r;
    for (let i = 0; i < r; i++) {
      const ui = gains[prevU + i] * prevInverse;
      for (let j = 0; j < r; j++) a[i * r + j] = states[(k - 1) * rr + i * r + j] + ui * gains[prevU + j];
      g[i] = means[prevU + i] + ui * prevZ;
    }
    const dt = time[k] - time[k - 1];
    layout.phi.set(transitions.subarray(k * phiLength, (k + 1) * phiLength));
    // phiA = Phi A (left product, column by column).
    phiA.set(a);
    for (let j = 0; j < r; j++) applyColumn(layout, phiA, j, r);
    // Phi-bar restricted to each block, contracted with dPhi/dtheta.
    for (let b = 0; b < layout.blocks.length; b++) {
      const block = layout.blocks[b];
      const count = block.parameterIndex.length;
      if (count === 0) continue;
      const m = block.size;
      const start = layout.blockStart[b];
      block.transitionDerivatives(dt, phiDerivatives, 0);
      for (let i = 0; i < m; i++)
        for (let j = 0; j < m; j++) {
          const row = start + i;
          const col = start + j;
          let bar = fBar[row] * g[col];
          for (let l = 0; l < r; l++) bar += 2 * sBar[row * r + l] * phiA[l * r + col];
          for (let c = 0; c < count; c++) kernelBar[block.parameterIndex[c]] += bar * phiDerivatives[c * m * m + i * m + j];
        }
    }
    // A-bar = Phi^T S-bar Phi ; g-bar = Phi^T f-bar (in place).
    layout.applyTransposeCongruence(sBar, 0);
    layout.applyTransposeToVector(fBar, 0);
    // Push to step k - 1 through A = S + u u^T / D and g = f + u z / D.
    let uAu = 0;
    let ug = 0;
    for (let i = 0; i < r; i++) {
      let acc = 0;
      for (let j = 0; j < r; j++) acc += sBar[i * r + j] * gains[prevU + j];
      work[i] = acc;
      uAu += gains[prevU + i] * acc;
      ug += gains[prevU + i] * fBar[i];
    }
    for (let i = 0; i < r; i++) uBar[i] = 2 * work[i] * prevInverse + fBar[i] * prevZ * prevInverse;
    dBar = -uAu * prevInverse * prevInverse - prevZ * ug * prevInverse * prevInverse;
    zBar = ug * prevInverse;
    // S-bar and f-bar now hold the adjoints of S_{k-1} and f_{k-1}.
  }

  for (let c = 0; c < form.parameterCount; c++) {
    let acc = kernelBar[c];
    for (let i = 0; i < r; i++) {
      acc += pBar[i] * form.observationGradient[c * r + i] + qBar[i] * form.projectionGradient[c * r + i];
    }
    kernelBar[c] = acc;
  }
  return { value, kernel: kernelBar, noiseVariance: noiseBar, residual: residualBar };
}

/** Column j of `matrix` <- Phi column j. */
function applyColumn(layout: TransitionLayout, matrix: Float64Array, column: number, r: number): void {
  const { blockStart, blockSize, phiStart, phi } = layout;
  for (let b = 0; b < blockStart.length; b++) {
    const m = blockSize[b];
    const s = blockStart[b];
    const p = phiStart[b];
    const tmp = layout.scratch;
    for (let i = 0; i < m; i++) tmp[i] = matrix[(s + i) * r + column];
    for (let i = 0; i < m; i++) {
      let acc = 0;
      for (let l = 0; l < m; l++) acc += phi[p + i * m + l] * tmp[l];
      matrix[(s + i) * r + column] = acc;
    }
  }
}
