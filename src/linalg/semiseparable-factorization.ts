import { FactorizationError } from "./factorization-error.js";
import type { SemiseparableForm } from "./semiseparable-form.js";
import { projectState, stepState } from "./state-update.js";
import { TransitionLayout } from "./transition-layout.js";

/**
 * The LDL^T factorisation K = L D L^T of a semiseparable covariance plus a diagonal, kept for repeated
 * solves, log-determinants and correlated draws. L is unit lower triangular with L_nj = p^T Phi_n ... Phi_{j+1} w_j
 * (w_j = u_j / D_j), so L, L^T and their inverses are applied in O(N R) each after an O(N R^2)
 * factorisation (Foreman-Mackey et al. 2017, AJ 154, 220, section 5).
 */
export class SemiseparableFactorization {
  /** D_n. */
  readonly pivots: Float64Array;
  /** w_n = u_n / D_n, N x R. */
  private readonly weights: Float64Array;
  private readonly layout: TransitionLayout;
  private readonly r: number;

  constructor(
    private readonly form: SemiseparableForm,
    private readonly time: ArrayLike<number>,
    noiseVariance: ArrayLike<number>,
  ) {
    const layout = new TransitionLayout(form);
    this.layout = layout;
    const r = layout.dimension;
    this.r = r;
    const n = time.length;
    const p = form.observation;
    const q = form.projection;
    let variance = 0;
    for (let i = 0; i < r; i++) variance += p[i] * q[i];
    this.pivots = new Float64Array(n);
    this.weights = new Float64Array(n * r);
    const s = new Float64Array(r * r);
    const u = new Float64Array(r);
    const f = new Float64Array(r); // no data here: stays zero
    const projection = new Float64Array(2);
    for (let k = 0; k < n; k++) {
      if (k > 0) stepState(layout, s, f, u, 0, 1 / this.pivots[k - 1], 0, time[k] - time[k - 1], true);
      projectState(s, f, p, q, u, 0, r, projection);
      const pivot = noiseVariance[k] + variance - projection[0];
      if (!(pivot > 0) || !Number.isFinite(pivot)) throw new FactorizationError(k, pivot);
      this.pivots[k] = pivot;
      for (let i = 0; i < r; i++) this.weights[k * r + i] = u[i] / pivot;
    }
  }

  /** log det K = sum log D_n. */
  logDeterminant(): number {
    let total = 0;
    for (let k = 0; k < this.pivots.length; k++) total += Math.log(this.pivots[k]);
    return total;
  }

  /** K^{-1} b. */
  solve(b: ArrayLike<number>): Float64Array {
    const n = this.time.length;
    const r = this.r;
    const p = this.form.observation;
    const layout = this.layout;
    const x = new Float64Array(n);
    const f = new Float64Array(r);
    // z = L^{-1} b, then y = D^{-1} z (stored in x).
    for (let k = 0; k < n; k++) {
      if (k > 0) {
        for (let i = 0; i < r; i++) f[i] += this.weights[(k - 1) * r + i] * x[k - 1] * this.pivots[k - 1];
        layout.computeTransitions(this.time[k] - this.time[k - 1]);
        layout.applyToVector(f, 0);
      }
      let pf = 0;
      for (let i = 0; i < r; i++) pf += p[i] * f[i];
      x[k] = (b[k] - pf) / this.pivots[k];
    }
    // x = L^{-T} y.
    const g = new Float64Array(r);
    for (let k = n - 2; k >= 0; k--) {
      for (let i = 0; i < r; i++) g[i] += p[i] * x[k + 1];
      layout.computeTransitions(this.time[k + 1] - this.time[k]);
      layout.applyTransposeToVector(g, 0);
      let wg = 0;
      for (let i = 0; i < r; i++) wg += this.weights[k * r + i] * g[i];
      x[k] -= wg;
    }
    return x;
  }

  /** L D^{1/2} xi: a draw with covariance K when xi is standard normal. */
  correlate(xi: ArrayLike<number>): Float64Array {
    const n = this.time.length;
    const r = this.r;
    const p = this.form.observation;
    const layout = this.layout;
    const y = new Float64Array(n);
    const h = new Float64Array(r);
    let previous = 0;
    for (let k = 0; k < n; k++) {
      if (k > 0) {
        for (let i = 0; i < r; i++) h[i] += this.weights[(k - 1) * r + i] * previous;
        layout.computeTransitions(this.time[k] - this.time[k - 1]);
        layout.applyToVector(h, 0);
      }
      const v = Math.sqrt(this.pivots[k]) * xi[k];
      let ph = 0;
      for (let i = 0; i < r; i++) ph += p[i] * h[i];
      y[k] = v + ph;
      previous = v;
    }
    return y;
  }
}
