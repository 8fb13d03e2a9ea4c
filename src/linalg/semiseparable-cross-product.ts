import type { SemiseparableForm } from "./semiseparable-form.js";
import { TransitionLayout } from "./transition-layout.js";

/**
 * The product of the cross-covariance between sorted requested times t*_j and the data times t_i with
 * weights on the data, g_j = sum_i k(t*_j - t_i) w_i, in O((N + M) R) per weight vector, for a kernel in
 * semiseparable form k(tau) = p^T exp(F |tau|) q. With data and requested times merged (data first on
 * ties), a forward sweep a <- Phi a (+ q w_i at data) gives the terms with t_i <= t*_j as p^T a, and a
 * backward sweep b <- Phi^T b (+ p w_i at data) the terms with t_i > t*_j as q^T b (the generator
 * representation of a semiseparable matrix; Foreman-Mackey et al. 2017, AJ 154, 220, section 5).
 * The transitions of every step are computed once here and kept ((N + M) block entries), so that many
 * weight vectors (one per column of a joint covariance) cost no exponential or cosine.
 */
export class SemiseparableCrossProduct {
  private readonly layout: TransitionLayout;
  /** >= 0: a data index; < 0: requested time -(kind + 1). */
  private readonly kinds: Int32Array;
  /** Step k's transitions exp(F (time_k - time_{k-1})), phi-length entries each (step 0 unused). */
  private readonly steps: Float64Array;
  private readonly targetCount: number;

  /** @param time sorted data times; @param targets sorted requested times */
  constructor(
    private readonly form: SemiseparableForm,
    time: ArrayLike<number>,
    targets: ArrayLike<number>,
  ) {
    const layout = new TransitionLayout(form);
    this.layout = layout;
    const n = time.length;
    const m = targets.length;
    this.targetCount = m;
    const total = n + m;
    const stride = layout.phi.length;
    this.kinds = new Int32Array(total);
    this.steps = new Float64Array(total * stride);
    let previous = 0;
    for (let i = 0, j = 0, k = 0; k < total; k++) {
      const fromData = j >= m || (i < n && time[i] <= targets[j]);
      const t = fromData ? time[i] : targets[j];
      this.kinds[k] = fromData ? i++ : -(++j);
      if (k > 0) {
        layout.computeTransitions(t - previous);
        this.steps.set(layout.phi, k * stride);
      }
      previous = t;
    }
  }

  /** g_j = sum_i k(t*_j - t_i) w_i for every requested time (in sorted order). */
  apply(weights: ArrayLike<number>): Float64Array {
    const { layout, kinds, steps } = this;
    const p = this.form.observation;
    const q = this.form.projection;
    const r = layout.dimension;
    const stride = layout.phi.length;
    const total = kinds.length;
    const phi = layout.phi;
    const out = new Float64Array(this.targetCount);
    const a = new Float64Array(r);
    for (let k = 0; k < total; k++) {
      if (k > 0) {
        for (let c = 0; c < stride; c++) phi[c] = steps[k * stride + c];
        layout.applyToVector(a, 0);
      }
      const kind = kinds[k];
      if (kind >= 0) {
        const w = weights[kind];
        for (let c = 0; c < r; c++) a[c] += q[c] * w;
      } else {
        let pa = 0;
        for (let c = 0; c < r; c++) pa += p[c] * a[c];
        out[-(kind + 1)] = pa;
      }
    }
    const b = new Float64Array(r);
    for (let k = total - 1; k >= 0; k--) {
      if (k < total - 1) {
        for (let c = 0; c < stride; c++) phi[c] = steps[(k + 1) * stride + c];
        layout.applyTransposeToVector(b, 0);
      }
      const kind = kinds[k];
      if (kind >= 0) {
        const w = weights[kind];
        for (let c = 0; c < r; c++) b[c] += p[c] * w;
      } else {
        let qb = 0;
        for (let c = 0; c < r; c++) qb += q[c] * b[c];
        out[-(kind + 1)] += qb;
      }
    }
    return out;
  }
}
