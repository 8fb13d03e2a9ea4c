import { FactorizationError } from "./factorization-error.js";
import type { SemiseparableForm } from "./semiseparable-form.js";
import type { LatentPrediction } from "./semiseparable-smoother.js";
import { smootherBackwardStep } from "./smoother-backward-step.js";
import { absorbPoint, projectState, stepState } from "./state-update.js";
import { TransitionLayout } from "./transition-layout.js";

/**
 * The fixed-interval smoother of {@link semiseparablePredict} run once over the data alone, with what a
 * query needs kept at every data point: the filtered state (S_k^+, f_k^+, after conditioning on point k)
 * and the smoother's backward quantities (r_k, N_k, after point k has been taken in going backwards).
 * A requested time t with t_k <= t < t_{k+1} then needs only the two neighbours:
 *
 *     S_t = Phi(t - t_k) S_k^+ Phi^T,  f_t = Phi(t - t_k) f_k^+,  u_t = q - S_t p,
 *     r_t = Phi(t_{k+1} - t)^T r_{k+1},  N_t = Phi(t_{k+1} - t)^T N_{k+1} Phi(t_{k+1} - t),
 *     E f(t) = p^T f_t + u_t^T r_t,  Var f(t) = k(0) - p^T S_t p - u_t^T N_t u_t
 *
 * (Durbin & Koopman 2012, Time Series Analysis by State Space Methods, 2nd ed., section 4.4: a time with
 * no observation is a step of the recursions without an update, and Phi(a) Phi(b) = Phi(a + b)). Before
 * the first point the filtered state is the prior (S = 0, f = 0); after the last, r = 0 and N = 0.
 * Building costs O(N R^2) time and N (2 R^2 + 2 R) numbers; each requested time then costs O(R^2 + log N)
 * instead of the O((N + M) R^2) of a pass over data and requested times together.
 */
export class SemiseparableConditionedStates {
  private readonly layout: TransitionLayout;
  private readonly r: number;
  private readonly variance: number;
  /** S_k^+ (R x R) and f_k^+ (R) per data point. */
  private readonly filteredCovariance: Float64Array;
  private readonly filteredMean: Float64Array;
  /** r_k (R) and N_k (R x R) per data point. */
  private readonly backwardVector: Float64Array;
  private readonly backwardMatrix: Float64Array;

  /** Numbers kept for N points and R components (four per-point arrays). */
  static storage(n: number, r: number): number {
    return n * (2 * r * r + 2 * r);
  }

  /**
   * @param time sorted data times; @param noiseVariance per-point noise variance; @param residual data
   *   minus the mean
   */
  constructor(
    private readonly form: SemiseparableForm,
    private readonly time: ArrayLike<number>,
    noiseVariance: ArrayLike<number>,
    residual: ArrayLike<number>,
  ) {
    const layout = new TransitionLayout(form);
    this.layout = layout;
    const r = layout.dimension;
    this.r = r;
    const p = form.observation;
    const q = form.projection;
    let variance = 0;
    for (let i = 0; i < r; i++) variance += p[i] * q[i];
    this.variance = variance;
    const n = time.length;
    const gains = new Float64Array(n * r);
    const pivots = new Float64Array(n);
    const innovations = new Float64Array(n);
    this.filteredCovariance = new Float64Array(n * r * r);
    this.filteredMean = new Float64Array(n * r);
    const s = new Float64Array(r * r);
    const f = new Float64Array(r);
    const projection = new Float64Array(2);
    for (let k = 0; k < n; k++) {
      // The shared forward step (state-update.ts); point k - 1 was absorbed at the end of its own iteration.
      if (k > 0) stepState(layout, s, f, gains, 0, 0, 0, time[k] - time[k - 1], false);
      projectState(s, f, p, q, gains, k * r, r, projection);
      const pivot = noiseVariance[k] + variance - projection[0];
      if (!(pivot > 0) || !Number.isFinite(pivot)) throw new FactorizationError(k, pivot);
      pivots[k] = pivot;
      innovations[k] = residual[k] - projection[1];
      absorbPoint(s, f, gains, k * r, 1 / pivot, innovations[k], r);
      this.filteredCovariance.set(s, k * r * r);
      this.filteredMean.set(f, k * r);
    }

    this.backwardVector = new Float64Array(n * r);
    this.backwardMatrix = new Float64Array(n * r * r);
    const rVec = new Float64Array(r);
    const nMat = new Float64Array(r * r);
    const nu = new Float64Array(r);
    for (let k = n - 1; k >= 0; k--) {
      if (k < n - 1) {
        layout.computeTransitions(time[k + 1] - time[k]);
        layout.applyTransposeToVector(rVec, 0);
        layout.applyTransposeCongruence(nMat, 0);
      }
      smootherBackwardStep(rVec, nMat, nu, p, gains, k * r, innovations[k], 1 / pivots[k], r);
      this.backwardVector.set(rVec, k * r);
      this.backwardMatrix.set(nMat, k * r * r);
    }
  }

  /** Conditional mean (without the constant mean) and variance of the latent process at `targets` (any order). */
  at(targets: ArrayLike<number>): LatentPrediction {
    const { layout, r, form, time } = this;
    const p = form.observation;
    const q = form.projection;
    const n = time.length;
    const m = targets.length;
    const mean = new Float64Array(m);
    const varianceOut = new Float64Array(m);
    const s = new Float64Array(r * r);
    const f = new Float64Array(r);
    const u = new Float64Array(r);
    const rVec = new Float64Array(r);
    const nMat = new Float64Array(r * r);
    const projection = new Float64Array(2);
    for (let j = 0; j < m; j++) {
      const t = targets[j];
      const k = lastAtOrBefore(time, t);
      if (k >= 0) {
        s.set(this.filteredCovariance.subarray(k * r * r, (k + 1) * r * r));
        f.set(this.filteredMean.subarray(k * r, (k + 1) * r));
        layout.computeTransitions(t - time[k]);
        layout.applyCongruence(s, 0);
        layout.applyToVector(f, 0);
      } else {
        s.fill(0);
        f.fill(0);
      }
      projectState(s, f, p, q, u, 0, r, projection);
      let ur = 0;
      let uNu = 0;
      if (k + 1 < n) {
        rVec.set(this.backwardVector.subarray((k + 1) * r, (k + 2) * r));
        nMat.set(this.backwardMatrix.subarray((k + 1) * r * r, (k + 2) * r * r));
        layout.computeTransitions(time[k + 1] - t);
        layout.applyTransposeToVector(rVec, 0);
        layout.applyTransposeCongruence(nMat, 0);
        for (let i = 0; i < r; i++) {
          ur += u[i] * rVec[i];
          let acc = 0;
          for (let l = 0; l < r; l++) acc += nMat[i * r + l] * u[l];
          uNu += u[i] * acc;
        }
      }
      mean[j] = projection[1] + ur;
      varianceOut[j] = Math.max(0, this.variance - projection[0] - uNu);
    }
    return { mean, variance: varianceOut };
  }
}

/** The index of the last sorted time <= t, or -1 (binary search). */
function lastAtOrBefore(time: ArrayLike<number>, t: number): number {
  let lo = 0;
  let hi = time.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (time[mid] <= t) lo = mid + 1;
    else hi = mid;
  }
  return lo - 1;
}
