import { Matrix } from "ml-matrix";
import type { Kernel } from "../kernels/kernel.js";
import { DenseCholesky } from "../linalg/dense-cholesky.js";
import type { Rng } from "../random/rng.js";
import { residualOf, type ConditionedInputs } from "./conditioned-inputs.js";
import { checkCovarianceSize, type ConditionedProcess, type MeanAndVariance } from "./process-interface.js";
import { checkTargets } from "./target-times.js";
import { DRAW_JITTER } from "./semiseparable-prior-draw.js";

/** The conditional mean and covariance factor at the times of the last draw. */
interface DrawFactor {
  readonly times: Float64Array;
  readonly mean: Float64Array;
  readonly cholesky: DenseCholesky;
}

/** Whether two lists of times are equal element by element. */
function sameTimes(a: Float64Array, b: ArrayLike<number>): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

/**
 * A dense Gaussian process conditioned on observed values (`DenseGaussianProcess.given`), by the
 * prediction equations of Rasmussen & Williams 2006, Algorithm 2.1 and eq. 2.24: mean
 * m + k_*^T K^{-1} r and covariance k(a, b) - k_a^T K^{-1} k_b, with alpha = K^{-1} r solved once here.
 */
export class DenseConditionedProcess implements ConditionedProcess {
  private readonly alpha: Float64Array;
  private drawFactor?: DrawFactor;

  /** @internal built by `DenseGaussianProcess.given`. */
  constructor(
    private readonly kernel: Kernel,
    private readonly inputs: ConditionedInputs,
    private readonly cholesky: DenseCholesky,
    values: ArrayLike<number>,
  ) {
    this.alpha = cholesky.solve(residualOf(values, inputs));
  }

  at(times: ArrayLike<number>): MeanAndVariance {
    checkTargets(times, "at");
    const variance = new Float64Array(times.length);
    for (let j = 0; j < times.length; j++) {
      const column = this.crossCovariance(times[j]);
      const solved = this.cholesky.solve(column);
      let explained = 0;
      for (let i = 0; i < column.length; i++) explained += column[i] * solved[i];
      variance[j] = Math.max(0, this.kernel.covarianceAt(0) - explained);
    }
    return { mean: this.meanAt(times), variance };
  }

  covarianceAt(times: ArrayLike<number>): Float64Array {
    checkCovarianceSize(times.length);
    checkTargets(times, "covarianceAt");
    return this.jointCovariance(times);
  }

  /**
   * mean + L xi with L L^T the joint conditional covariance (plus `DRAW_JITTER` k(0) on the
   * diagonal). The mean and factor of the last requested times are kept, so repeated draws at the same
   * times cost O(M^2) each.
   */
  draw(rng: Rng, times: ArrayLike<number>): Float64Array {
    checkTargets(times, "draw");
    const m = times.length;
    const kept = this.drawFactor && sameTimes(this.drawFactor.times, times) ? this.drawFactor : this.factorFor(times);
    const xi = new Float64Array(m);
    for (let i = 0; i < m; i++) xi[i] = rng.normal();
    const out = kept.cholesky.correlate(xi);
    for (let i = 0; i < m; i++) out[i] += kept.mean[i];
    return out;
  }

  private factorFor(times: ArrayLike<number>): DrawFactor {
    const m = times.length;
    const covariance = this.jointCovariance(times);
    const jitter = DRAW_JITTER * this.kernel.covarianceAt(0);
    const matrix = new Matrix(m, m);
    for (let a = 0; a < m; a++) for (let b = 0; b < m; b++) matrix.set(a, b, covariance[a * m + b] + (a === b ? jitter : 0));
    this.drawFactor = { times: Float64Array.from(times), mean: this.meanAt(times), cholesky: new DenseCholesky(matrix) };
    return this.drawFactor;
  }

  /** m + k_*^T alpha at every requested time. */
  private meanAt(times: ArrayLike<number>): Float64Array {
    const mean = new Float64Array(times.length);
    for (let j = 0; j < times.length; j++) {
      const column = this.crossCovariance(times[j]);
      let mu = 0;
      for (let i = 0; i < column.length; i++) mu += column[i] * this.alpha[i];
      mean[j] = mu + this.inputs.mean;
    }
    return mean;
  }

  /** k(t_i - tau) for every observation time t_i. */
  private crossCovariance(tau: number): Float64Array {
    const t = this.inputs.time;
    const column = new Float64Array(t.length);
    for (let i = 0; i < t.length; i++) column[i] = this.kernel.covarianceAt(t[i] - tau);
    return column;
  }

  private jointCovariance(times: ArrayLike<number>): Float64Array {
    const m = times.length;
    const n = this.inputs.time.length;
    const cross = Array.from({ length: m }, (_, j) => this.crossCovariance(times[j]));
    const solved = cross.map((column) => this.cholesky.solve(column));
    const covariance = new Float64Array(m * m);
    for (let a = 0; a < m; a++)
      for (let b = a; b < m; b++) {
        let explained = 0;
        for (let i = 0; i < n; i++) explained += cross[a][i] * solved[b][i];
        const value = this.kernel.covarianceAt(times[a] - times[b]) - explained;
        covariance[a * m + b] = value;
        covariance[b * m + a] = value;
      }
    return covariance;
  }
}
