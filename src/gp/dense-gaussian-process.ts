import { Matrix } from "ml-matrix";
import type { Kernel } from "../kernels/kernel.js";
import { DenseCholesky } from "../linalg/dense-cholesky.js";
import { formCovarianceDerivatives } from "../linalg/semiseparable-form.js";
import { HALF_LOG_TWO_PI } from "../numerics/gaussian-constants.js";
import type { Rng } from "../random/rng.js";
import { conditionInputs, residualOf, type ConditionedInputs } from "./conditioned-inputs.js";
import type { GaussianProcessOptions, GradientResult } from "./process-interface.js";
import { DenseConditionedProcess } from "./dense-conditioned-process.js";
import { DRAW_JITTER } from "./semiseparable-prior-draw.js";


/**
 * The same interface as `GaussianProcess`, on dense O(N^3) linear algebra (ml-matrix Cholesky), for any
 * kernel, including those with no semiseparable form (the squared-exponential times periodic kernel).
 * Conditioning follows Rasmussen & Williams 2006, Algorithm 2.1 ({@link DenseConditionedProcess}).
 */
export class DenseGaussianProcess {
  readonly kernel: Kernel;
  private readonly inputs: ConditionedInputs;
  private readonly cholesky: DenseCholesky;
  private priorCholesky?: DenseCholesky;

  constructor(kernel: Kernel, time: ArrayLike<number>, options: GaussianProcessOptions = {}) {
    this.kernel = kernel;
    this.inputs = conditionInputs(time, options);
    this.cholesky = new DenseCholesky(this.covarianceMatrix(true));
  }

  get time(): Float64Array {
    return this.inputs.time;
  }

  /** K (+ noise on the diagonal when asked). */
  covarianceMatrix(withNoise: boolean): Matrix {
    const t = this.inputs.time;
    const n = t.length;
    const k = new Matrix(n, n);
    for (let i = 0; i < n; i++)
      for (let j = 0; j <= i; j++) {
        const value = this.kernel.covarianceAt(t[i] - t[j]);
        k.set(i, j, value);
        k.set(j, i, value);
      }
    if (withNoise) for (let i = 0; i < n; i++) k.set(i, i, k.get(i, i) + this.inputs.noiseVariance[i]);
    return k;
  }

  /** -1/2 r^T K^{-1} r - 1/2 log det K - N/2 log 2 pi. */
  logLikelihood(values: ArrayLike<number>): number {
    const residual = residualOf(values, this.inputs);
    const alpha = this.cholesky.solve(residual);
    let quadratic = 0;
    for (let i = 0; i < residual.length; i++) quadratic += residual[i] * alpha[i];
    return -0.5 * quadratic - 0.5 * this.cholesky.logDeterminant() - residual.length * HALF_LOG_TWO_PI;
  }

  /**
   * d log L / d theta = 1/2 tr((alpha alpha^T - K^{-1}) dK/dtheta) (Rasmussen & Williams 2006, eq. 5.9),
   * with dK/dtheta exact from the kernel's state-space form where it has one, else by central differences.
   */
  logLikelihoodGradient(values: ArrayLike<number>): GradientResult {
    const residual = residualOf(values, this.inputs);
    const alpha = this.cholesky.solve(residual);
    const inverse = this.cholesky.inverse();
    const t = this.inputs.time;
    const n = t.length;
    const count = this.kernel.parameterNames.length;
    const grad = new Float64Array(count);
    const form = this.kernel.semiseparableForm();
    let traceNoise = 0;
    for (let i = 0; i < n; i++) {
      const weightDiagonal = alpha[i] * alpha[i] - inverse.get(i, i);
      traceNoise += weightDiagonal;
      for (let j = 0; j < n; j++) {
        const weight = alpha[i] * alpha[j] - inverse.get(i, j);
        const derivative = form ? formCovarianceDerivatives(form, t[i] - t[j]) : this.numericalDerivative(t[i] - t[j]);
        for (let c = 0; c < count; c++) grad[c] += 0.5 * weight * derivative[c];
      }
    }
    let meanBar = 0;
    for (let i = 0; i < n; i++) meanBar += alpha[i];
    return {
      value: this.logLikelihood(values),
      kernel: grad,
      mean: meanBar,
      jitter: traceNoise * this.inputs.jitter,
    };
  }

  /** The process conditioned on observed values (one per observation time), queried like `GaussianProcess.given`. */
  given(values: ArrayLike<number>): DenseConditionedProcess {
    return new DenseConditionedProcess(this.kernel, this.inputs, this.cholesky, values);
  }

  /** A prior draw of the latent process at the observation times (mean included); the factor is kept. */
  priorDraw(rng: Rng): Float64Array {
    if (!this.priorCholesky) {
      const k = this.covarianceMatrix(false);
      const jitter = DRAW_JITTER * this.kernel.covarianceAt(0);
      for (let i = 0; i < k.rows; i++) k.set(i, i, k.get(i, i) + jitter);
      this.priorCholesky = new DenseCholesky(k);
    }
    const n = this.inputs.time.length;
    const xi = Float64Array.from({ length: n }, () => rng.normal());
    const draw = this.priorCholesky.correlate(xi);
    for (let i = 0; i < n; i++) draw[i] += this.inputs.mean;
    return draw;
  }

  private numericalDerivative(lag: number): Float64Array {
    const values = this.kernel.parameterValues;
    const out = new Float64Array(values.length);
    for (let c = 0; c < values.length; c++) {
      const h = 1e-6 * Math.max(Math.abs(values[c]), 1e-8);
      const plus = Float64Array.from(values);
      const minus = Float64Array.from(values);
      plus[c] += h;
      minus[c] -= h;
      out[c] =
        (this.kernel.withParameters(plus).covarianceAt(lag) - this.kernel.withParameters(minus).covarianceAt(lag)) / (2 * h);
    }
    return out;
  }
}
