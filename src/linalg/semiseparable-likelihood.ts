import { FactorizationError } from "./factorization-error.js";
import type { SemiseparableForm } from "./semiseparable-form.js";
import { TransitionLayout } from "./transition-layout.js";

const HALF_LOG_TWO_PI = 0.5 * Math.log(2 * Math.PI);

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
  const layout = new TransitionLayout(form);
  const r = layout.dimension;
  const p = form.observation;
  const q = form.projection;
  let variance = 0;
  for (let i = 0; i < r; i++) variance += p[i] * q[i];
  const s = new Float64Array(r * r);
  const f = new Float64Array(r);
  const u = new Float64Array(r);
  const n = time.length;
  let logLikelihood = 0;
  let previousInverse = 0;
  let previousZ = 0;
  for (let k = 0; k < n; k++) {
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
    if (!(pivot > 0) || !Number.isFinite(pivot)) throw new FactorizationError(k, pivot);
    const z = residual[k] - pf;
    previousInverse = 1 / pivot;
    previousZ = z;
    logLikelihood -= 0.5 * (z * z * previousInverse + Math.log(pivot)) + HALF_LOG_TWO_PI;
  }
  if (!Number.isFinite(logLikelihood)) throw new FactorizationError(n - 1, NaN);
  return logLikelihood;
}
