import { FactorizationError } from "./factorization-error.js";
import type { SemiseparableForm } from "./semiseparable-form.js";
import { smootherBackwardStep } from "./smoother-backward-step.js";
import { projectState, stepState } from "./state-update.js";
import { TransitionLayout } from "./transition-layout.js";

/** Posterior mean and variance of the latent process at requested times. */
export interface LatentPrediction {
  readonly mean: Float64Array;
  readonly variance: Float64Array;
}

/**
 * Conditional mean and variance of the latent process f(t*) given the data, at any times (inside gaps,
 * between points, beyond both ends), in O((N + M) R^2).
 *
 * The data times and the requested times are merged into one sorted sequence. A forward pass runs the
 * semiseparable factorisation (a Kalman filter written with the explained covariance S = P - P_pred, so
 * that the stationary covariance P is only needed through q = P p); requested times are passed through
 * without conditioning. A backward pass is the fixed-interval smoother of Durbin & Koopman (2012, Time
 * Series Analysis by State Space Methods, 2nd ed., section 4.4):
 *
 *     r_{t-1} = p z_t / D_t + (I - p u_t^T / D_t) r_t,   N_{t-1} = p p^T / D_t + (I - p u_t^T / D_t) N_t (I - u_t p^T / D_t),
 *
 * propagated between points by r <- Phi^T r and N <- Phi^T N Phi. Then E f(t) = p^T f_t + u_t^T r_{t-1} and
 * Var f(t) = (k(0) - p^T S_t p) - u_t^T N_{t-1} u_t.
 *
 * @param time sorted data times; @param noiseVariance per-point noise variance; @param residual data minus mean
 * @param targets requested times, sorted ascending
 */
export function semiseparablePredict(
  form: SemiseparableForm,
  time: ArrayLike<number>,
  noiseVariance: ArrayLike<number>,
  residual: ArrayLike<number>,
  targets: ArrayLike<number>,
): LatentPrediction {
  const layout = new TransitionLayout(form);
  const r = layout.dimension;
  const p = form.observation;
  const q = form.projection;
  let variance = 0;
  for (let i = 0; i < r; i++) variance += p[i] * q[i];
  const n = time.length;
  const m = targets.length;
  const total = n + m;
  // Merge: kind >= 0 is a data index, kind < 0 encodes target -(kind + 1).
  const kinds = new Int32Array(total);
  const merged = new Float64Array(total);
  {
    let i = 0;
    let j = 0;
    for (let k = 0; k < total; k++) {
      if (j >= m || (i < n && time[i] <= targets[j])) {
        kinds[k] = i;
        merged[k] = time[i++];
      } else {
        kinds[k] = -(j + 1);
        merged[k] = targets[j++];
      }
    }
  }
  const gains = new Float64Array(total * r);
  const priorMean = new Float64Array(total); // p^T f_t
  const priorVariance = new Float64Array(total); // k(0) - p^T S_t p
  const pivots = new Float64Array(total);
  const innovations = new Float64Array(total);
  const s = new Float64Array(r * r);
  const f = new Float64Array(r);
  const projection = new Float64Array(2);
  let previousObserved = false;
  for (let k = 0; k < total; k++) {
    if (k > 0) stepState(layout, s, f, gains, (k - 1) * r, 1 / pivots[k - 1], innovations[k - 1], merged[k] - merged[k - 1], previousObserved);
    projectState(s, f, p, q, gains, k * r, r, projection);
    const pSp = projection[0];
    const pf = projection[1];
    priorMean[k] = pf;
    priorVariance[k] = variance - pSp;
    const index = kinds[k];
    previousObserved = index >= 0;
    if (previousObserved) {
      const pivot = noiseVariance[index] + variance - pSp;
      if (!(pivot > 0) || !Number.isFinite(pivot)) throw new FactorizationError(index, pivot);
      pivots[k] = pivot;
      innovations[k] = residual[index] - pf;
    }
  }

  const mean = new Float64Array(m);
  const varianceOut = new Float64Array(m);
  const rVec = new Float64Array(r);
  const nMat = new Float64Array(r * r);
  const nu = new Float64Array(r);
  for (let k = total - 1; k >= 0; k--) {
    if (k < total - 1) {
      layout.computeTransitions(merged[k + 1] - merged[k]);
      layout.applyTransposeToVector(rVec, 0);
      layout.applyTransposeCongruence(nMat, 0);
    }
    const index = kinds[k];
    const u = k * r;
    if (index >= 0) {
      smootherBackwardStep(rVec, nMat, nu, p, gains, u, innovations[k], 1 / pivots[k], r);
    } else {
      let ur = 0;
      let uNu = 0;
      for (let i = 0; i < r; i++) {
        ur += gains[u + i] * rVec[i];
        let acc = 0;
        for (let j = 0; j < r; j++) acc += nMat[i * r + j] * gains[u + j];
        uNu += gains[u + i] * acc;
      }
      const target = -(index + 1);
      mean[target] = priorMean[k] + ur;
      varianceOut[target] = Math.max(0, priorVariance[k] - uNu);
    }
  }
  return { mean, variance: varianceOut };
}
