import type { Kernel } from "../kernels/kernel.js";
import { semiseparableMeanMarginal, type MeanMarginal, type MeanPrior } from "../linalg/mean-marginal-likelihood.js";
import type { SemiseparableForm } from "../linalg/semiseparable-form.js";
import { SemiseparableFactorization } from "../linalg/semiseparable-factorization.js";
import { semiseparableLogLikelihoodGradient } from "../linalg/semiseparable-gradient.js";
import { semiseparableLogLikelihood } from "../linalg/semiseparable-likelihood.js";
import type { Rng } from "../random/rng.js";
import { SemiseparableConditionedProcess } from "./conditioned-process.js";
import { conditionInputs, evaluateWithDeferredValueCheck, residualOf, withMeanAndJitter, type ConditionedInputs } from "./conditioned-inputs.js";
import type { GaussianProcessOptions, GradientResult } from "./process-interface.js";
import { priorFactorization, semiseparablePriorDraw } from "./semiseparable-prior-draw.js";

/**
 * A Gaussian process with a semiseparable kernel, conditioned on observation times and per-point errors.
 * Every operation costs O(N R^2) (R = semiseparable components of the kernel): the log-likelihood, its
 * gradient, the conditioned process at M new times (O((N + M) R^2)) and draws.
 *
 * @example
 * const gp = new GaussianProcess(kernels.dampedRandomWalk({ sigma: 0.2, tau: 300 }), times, { errors, mean: 19.1 });
 * const logL = gp.logLikelihood(values);
 * const { mean, variance } = gp.given(values).at(newTimes);
 */
export class GaussianProcess {
  readonly kernel: Kernel;
  private readonly inputs: ConditionedInputs;
  private readonly form: SemiseparableForm;
  private factorization?: SemiseparableFactorization;
  private priorFactor?: SemiseparableFactorization;

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
   * const base = new GaussianProcess(kernel, times, { errors });
   * const logL = base.withKernel(kernel.withParameters(parameters), { mean: 19.2 }).logLikelihood(values);
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

  /** log N(values | mean, K + diag(errors^2 + jitter^2)), in one O(N R^2) pass with O(R^2) memory. */
  logLikelihood(values: ArrayLike<number>): number {
    const { time, noiseVariance, mean } = this.inputs;
    return evaluateWithDeferredValueCheck(values, this.inputs, () => semiseparableLogLikelihood(this.form, time, noiseVariance, values, { mean }));
  }

  /**
   * log p(values | kernel) with the constant mean integrated out under a normal prior, and the mean's
   * Gaussian posterior given the kernel (`semiseparableMeanMarginal`, Rybicki & Press 1992). The
   * process's own `mean` option plays no part. One O(N R^2) pass.
   */
  meanMarginal(values: ArrayLike<number>, prior: MeanPrior): MeanMarginal {
    const { time, noiseVariance } = this.inputs;
    return evaluateWithDeferredValueCheck(values, this.inputs, () => semiseparableMeanMarginal(this.form, time, noiseVariance, values, prior));
  }

  /**
   * The log-likelihood and its exact gradient with respect to every kernel parameter, the mean and the
   * jitter, by reverse mode through the recursion (O(N R^2)).
   */
  logLikelihoodGradient(values: ArrayLike<number>): GradientResult {
    const { time, noiseVariance, mean, gradientWorkspace: workspace } = this.inputs;
    const result = evaluateWithDeferredValueCheck(values, this.inputs, () =>
      semiseparableLogLikelihoodGradient(this.form, time, noiseVariance, values, { mean, pointwise: false, workspace }),
    );
    return { value: result.value, kernel: result.kernel, mean: -result.residualSum, jitter: 2 * this.inputs.jitter * result.noiseVarianceSum };
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
   * The process conditioned on observed values (one per observation time): query it with `.at(times)`
   * for the conditional mean and variance, `.covarianceAt(times)` and `.draw(rng, times)`. The values are
   * checked once here.
   *
   * @example
   * const { mean, variance } = gp.given(values).at(gridTimes);
   */
  given(values: ArrayLike<number>): SemiseparableConditionedProcess {
    return new SemiseparableConditionedProcess(this.kernel, this.form, this.inputs, () => this.factorized(), values);
  }

  /**
   * A draw of the latent process at the observation times from the prior (the constant mean included);
   * the noise-free factorisation is formed at the first draw and kept, O(N R) per later draw.
   */
  priorDraw(rng: Rng): Float64Array {
    this.priorFactor ??= priorFactorization(this.form, this.inputs.time);
    return semiseparablePriorDraw(this.priorFactor, this.inputs.mean, rng);
  }

  private factorized(): SemiseparableFactorization {
    this.factorization ??= new SemiseparableFactorization(this.form, this.inputs.time, this.inputs.noiseVariance);
    return this.factorization;
  }
}
