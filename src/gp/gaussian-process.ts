import type { Kernel } from "../kernels/kernel.js";
import { semiseparableMeanMarginal, type MeanMarginal, type MeanPrior } from "../linalg/mean-marginal-likelihood.js";
import { formVariance, type SemiseparableForm } from "../linalg/semiseparable-form.js";
import { SemiseparableFactorization } from "../linalg/semiseparable-factorization.js";
import { semiseparableLogLikelihoodGradient } from "../linalg/semiseparable-gradient.js";
import { semiseparableLogLikelihood } from "../linalg/semiseparable-likelihood.js";
import { semiseparablePredict } from "../linalg/semiseparable-smoother.js";
import type { Rng } from "../random/rng.js";
import {
  conditionInputs,
  evaluateValues,
  residualOf,
  sortTargets,
  withMeanAndJitter,
  type ConditionedInputs,
  type GaussianProcessOptions,
  type GradientResult,
  type Prediction,
} from "./gp-options.js";

/** Largest number of requested times for which the full posterior covariance is formed. */
export const MAX_COVARIANCE_SIZE = 2000;

/** Relative jitter added to the diagonal when drawing noise-free processes (keeps repeated times factorisable). */
const DRAW_JITTER = 1e-10;

/**
 * A Gaussian process with a semiseparable kernel, conditioned on observation times and per-point errors.
 * Every operation costs O(N R^2) (R = semiseparable components of the kernel): the log-likelihood, its
 * gradient, predictions at M new times (O((N + M) R^2)) and draws.
 *
 * @example
 * const gp = new GaussianProcess(kernels.dampedRandomWalk({ sigma: 0.2, tau: 300 }), t, { yerr, mean: 19.1 });
 * const logL = gp.logLikelihood(y);
 * const { mean, variance } = gp.predict(y, tNew);
 */
export class GaussianProcess {
  readonly kernel: Kernel;
  private readonly inputs: ConditionedInputs;
  private readonly form: SemiseparableForm;
  private factorization?: SemiseparableFactorization;

  /**
   * @param kernel any kernel with a semiseparable form
   * @param time sorted observation times
   * @param options per-point errors, constant mean, jitter
   * @param conditioned inputs already validated by another GaussianProcess (see {@link withKernel});
   *   when given, `time` and `options` are not read
   * @internal the last parameter
   */
  constructor(kernel: Kernel, time: ArrayLike<number>, options: GaussianProcessOptions = {}, conditioned?: ConditionedInputs) {
    const form = kernel.semiseparableForm();
    if (!form) {
      throw new RangeError(
        "GaussianProcess: this kernel has no semiseparable form; use DenseGaussianProcess for it",
      );
    }
    this.kernel = kernel;
    this.form = form;
    this.inputs = conditioned ?? conditionInputs(time, options);
  }

  /**
   * The same observation times and errors with another kernel, mean and jitter. The times and errors are
   * not checked and copied again, which is what a sampler wants at every step: for a damped random walk
   * that work costs about as much as the log-likelihood itself.
   *
   * @example
   * const base = new GaussianProcess(kernel, t, { yerr });
   * const logL = base.withKernel(kernel.withParameters(values), { mean: 19.2 }).logLikelihood(y);
   */
  withKernel(kernel: Kernel, options: Pick<GaussianProcessOptions, "mean" | "jitter"> = {}): GaussianProcess {
    return new GaussianProcess(kernel, this.inputs.time, {}, withMeanAndJitter(this.inputs, options));
  }

  /** The observation times. */
  get time(): Float64Array {
    return this.inputs.time;
  }

  /** The constant mean. */
  get mean(): number {
    return this.inputs.mean;
  }

  /** Number of semiseparable components R. */
  get components(): number {
    return this.form.observation.length;
  }

  /** log N(y | mean, K + diag(yerr^2 + jitter^2)), in one O(N R^2) pass with O(R^2) memory. */
  logLikelihood(y: ArrayLike<number>): number {
    const { time, noiseVariance, mean } = this.inputs;
    return evaluateValues(y, this.inputs, () => semiseparableLogLikelihood(this.form, time, noiseVariance, y, { mean }));
  }

  /**
   * log p(y | kernel) with the constant mean integrated out under a normal prior, and the mean's
   * Gaussian posterior given the kernel ({@link semiseparableMeanMarginal}, Rybicki & Press 1992). The
   * process's own `mean` option plays no part. One O(N R^2) pass.
   */
  meanMarginal(y: ArrayLike<number>, prior: MeanPrior): MeanMarginal {
    const { time, noiseVariance } = this.inputs;
    return evaluateValues(y, this.inputs, () => semiseparableMeanMarginal(this.form, time, noiseVariance, y, prior));
  }

  /**
   * The log-likelihood and its exact gradient with respect to every kernel parameter, the mean and the
   * jitter, by reverse mode through the recursion (O(N R^2)).
   */
  logLikelihoodGradient(y: ArrayLike<number>): GradientResult {
    const result = semiseparableLogLikelihoodGradient(
      this.form,
      this.inputs.time,
      this.inputs.noiseVariance,
      residualOf(y, this.inputs),
    );
    let meanBar = 0;
    let noiseBar = 0;
    for (let i = 0; i < result.residual.length; i++) {
      meanBar -= result.residual[i];
      noiseBar += result.noiseVariance[i];
    }
    return { value: result.value, kernel: result.kernel, mean: meanBar, jitter: 2 * this.inputs.jitter * noiseBar };
  }

  /** K^{-1} b with K = kernel matrix + noise (factorised once, then O(N R) per solve). */
  solve(b: ArrayLike<number>): Float64Array {
    return this.factorized().solve(b);
  }

  /** log det K. */
  logDeterminant(): number {
    return this.factorized().logDeterminant();
  }

  /**
   * Posterior mean and variance of the latent (noise-free) process at any times, given data y; with
   * `covariance: true`, also the full posterior covariance (at most MAX_COVARIANCE_SIZE times).
   */
  predict(y: ArrayLike<number>, tNew: ArrayLike<number>, options: { covariance?: boolean } = {}): Prediction {
    const residual = residualOf(y, this.inputs);
    const { sorted, order } = sortTargets(tNew);
    const latent = semiseparablePredict(this.form, this.inputs.time, this.inputs.noiseVariance, residual, sorted);
    const mean = new Float64Array(tNew.length);
    const variance = new Float64Array(tNew.length);
    for (let k = 0; k < order.length; k++) {
      mean[order[k]] = latent.mean[k] + this.inputs.mean;
      variance[order[k]] = latent.variance[k];
    }
    if (!options.covariance) return { mean, variance };
    return { mean, variance, covariance: this.posteriorCovariance(tNew) };
  }

  /** A draw of the latent process at the observation times from the prior (mean included). */
  sample(rng: Rng): Float64Array {
    return this.drawPrior(this.inputs.time, rng);
  }

  /**
   * A draw of the latent process at `tNew` from the posterior given y, by Matheron's rule: a joint prior
   * draw at data and new times, corrected by the posterior mean of the residual it leaves (Wilson et al.
   * 2020, ICML, "Efficiently sampling functions from Gaussian process posteriors"). O((N + M) R^2).
   */
  sampleConditional(y: ArrayLike<number>, tNew: ArrayLike<number>, rng: Rng): Float64Array {
    const residual = residualOf(y, this.inputs);
    const { sorted, order } = sortTargets(tNew);
    const n = this.inputs.time.length;
    const merged = Float64Array.from([...this.inputs.time, ...sorted]).sort();
    const joint = this.drawPrior(merged, rng);
    // Split the joint draw back into data and new times (stable for ties: data times first).
    const atData = new Float64Array(n);
    const atNew = new Float64Array(sorted.length);
    {
      let i = 0;
      let j = 0;
      for (let k = 0; k < merged.length; k++) {
        if (j >= sorted.length || (i < n && this.inputs.time[i] <= sorted[j])) atData[i++] = joint[k] - this.inputs.mean;
        else atNew[j++] = joint[k] - this.inputs.mean;
      }
    }
    const correction = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const noise = Math.sqrt(this.inputs.noiseVariance[i]) * rng.normal();
      correction[i] = residual[i] - atData[i] - noise;
    }
    const update = semiseparablePredict(this.form, this.inputs.time, this.inputs.noiseVariance, correction, sorted);
    const out = new Float64Array(sorted.length);
    for (let k = 0; k < sorted.length; k++) out[order[k]] = atNew[k] + update.mean[k] + this.inputs.mean;
    return out;
  }

  private factorized(): SemiseparableFactorization {
    this.factorization ??= new SemiseparableFactorization(this.form, this.inputs.time, this.inputs.noiseVariance);
    return this.factorization;
  }

  private drawPrior(time: Float64Array, rng: Rng): Float64Array {
    const jitter = DRAW_JITTER * formVariance(this.form);
    const factor = new SemiseparableFactorization(this.form, time, new Float64Array(time.length).fill(jitter));
    const xi = new Float64Array(time.length);
    for (let i = 0; i < xi.length; i++) xi[i] = rng.normal();
    const draw = factor.correlate(xi);
    for (let i = 0; i < draw.length; i++) draw[i] += this.inputs.mean;
    return draw;
  }

  private posteriorCovariance(tNew: ArrayLike<number>): Float64Array {
    const m = tNew.length;
    if (m > MAX_COVARIANCE_SIZE)
      throw new RangeError(`predict: the full covariance is limited to ${MAX_COVARIANCE_SIZE} times, got ${m}`);
    const n = this.inputs.time.length;
    const cross: Float64Array[] = [];
    const solved: Float64Array[] = [];
    for (let j = 0; j < m; j++) {
      const column = new Float64Array(n);
      for (let i = 0; i < n; i++) column[i] = this.kernel.covarianceAt(this.inputs.time[i] - tNew[j]);
      cross.push(column);
      solved.push(this.solve(column));
    }
    const covariance = new Float64Array(m * m);
    for (let i = 0; i < m; i++)
      for (let j = i; j < m; j++) {
        let explained = 0;
        for (let k = 0; k < n; k++) explained += cross[i][k] * solved[j][k];
        const value = this.kernel.covarianceAt(tNew[i] - tNew[j]) - explained;
        covariance[i * m + j] = value;
        covariance[j * m + i] = value;
      }
    return covariance;
  }
}
