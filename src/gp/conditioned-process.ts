import type { Kernel } from "../kernels/kernel.js";
import type { SemiseparableForm } from "../linalg/semiseparable-form.js";
import type { SemiseparableFactorization } from "../linalg/semiseparable-factorization.js";
import { SemiseparableConditionedStates } from "../linalg/semiseparable-conditioned-states.js";
import { SemiseparableCrossProduct } from "../linalg/semiseparable-cross-product.js";
import { semiseparablePredict, type LatentPrediction } from "../linalg/semiseparable-smoother.js";
import type { Rng } from "../random/rng.js";
import { residualOf, type ConditionedInputs } from "./conditioned-inputs.js";
import { checkCovarianceSize, type ConditionedProcess, type MeanAndVariance } from "./process-interface.js";
import { checkTargets, sortTargets } from "./target-times.js";
import { priorFactorization, semiseparablePriorDraw } from "./semiseparable-prior-draw.js";

/**
 * Most numbers the smoother's states at every data point may take before `at` stops keeping them
 * (2^22 numbers, 32 MB: N = 1e5 points of a four-component kernel); above, every `at` runs the smoother
 * over data and requested times together, O((N + M) R^2) per call.
 */
export const CONDITIONED_STATES_LIMIT = 2 ** 22;

/**
 * A semiseparable Gaussian process conditioned on observed values: what `GaussianProcess.given(values)`
 * returns. The values are checked and the residual formed once. The first `at` runs the smoother over
 * data and requested times together (one O((N + M) R^2) pass: a single query costs no more than that);
 * the second runs it over the data once more and keeps its states
 * (`SemiseparableConditionedStates`, about twice a pass), so that every later requested time costs
 * O(R^2 + log N), whatever N (`bench/conditioned-queries.ts`).
 *
 * @example
 * const given = gp.given(values);
 * const { mean, variance } = given.at(gapTimes);
 * const curve = given.draw(createRng(3), gapTimes);
 */
export class SemiseparableConditionedProcess implements ConditionedProcess {
  private readonly residual: Float64Array;
  private states?: SemiseparableConditionedStates;
  private queries = 0;

  /**
   * @internal built by `GaussianProcess.given`, which shares its LDL factorisation through `factorized`
   * (formed at the first call that needs it).
   */
  constructor(
    private readonly kernel: Kernel,
    private readonly form: SemiseparableForm,
    private readonly inputs: ConditionedInputs,
    private readonly factorized: () => SemiseparableFactorization,
    values: ArrayLike<number>,
  ) {
    this.residual = residualOf(values, inputs);
  }

  /**
   * Conditional mean and variance at any times: by one smoother pass over data and requested times
   * (`semiseparablePredict`) at the first call, from the smoother's kept states from the second on
   * (O(R^2 + log N) per requested time; not kept above `CONDITIONED_STATES_LIMIT`).
   */
  at(times: ArrayLike<number>): MeanAndVariance {
    checkTargets(times, "at");
    const latent = this.latentAt(times);
    const mean = latent.mean;
    for (let k = 0; k < mean.length; k++) mean[k] += this.inputs.mean;
    return { mean, variance: latent.variance };
  }

  private latentAt(times: ArrayLike<number>): LatentPrediction {
    const { time, noiseVariance } = this.inputs;
    this.queries++;
    const keep = SemiseparableConditionedStates.storage(time.length, this.form.observation.length) <= CONDITIONED_STATES_LIMIT;
    if (keep && this.queries > 1) {
      this.states ??= new SemiseparableConditionedStates(this.form, time, noiseVariance, this.residual);
      return this.states.at(times);
    }
    const { sorted, order } = sortTargets(times, "at");
    const merged = semiseparablePredict(this.form, time, noiseVariance, this.residual, sorted);
    const mean = new Float64Array(times.length);
    const variance = new Float64Array(times.length);
    for (let k = 0; k < order.length; k++) {
      mean[order[k]] = merged.mean[k];
      variance[order[k]] = merged.variance[k];
    }
    return { mean, variance };
  }

  /**
   * Joint conditional covariance k(a, b) - k_a^T K^{-1} k_b (Rasmussen & Williams 2006, eq. 2.24): per
   * requested time b one O(N R) solve z = K^{-1} k_b and one semiseparable product k_a^T z for every a at
   * once (`SemiseparableCrossProduct`), O(M (N + M) R) in all; symmetric to the last bit.
   */
  covarianceAt(times: ArrayLike<number>): Float64Array {
    const m = times.length;
    checkCovarianceSize(m);
    const { sorted, order } = sortTargets(times, "covarianceAt");
    const t = this.inputs.time;
    const n = t.length;
    const product = new SemiseparableCrossProduct(this.form, t, sorted);
    const explained = new Float64Array(m * m);
    const column = new Float64Array(n);
    for (let b = 0; b < m; b++) {
      for (let i = 0; i < n; i++) column[i] = this.kernel.covarianceAt(t[i] - sorted[b]);
      const g = product.apply(this.factorized().solve(column));
      for (let a = 0; a < m; a++) explained[a * m + b] = g[a];
    }
    const covariance = new Float64Array(m * m);
    for (let a = 0; a < m; a++)
      for (let b = a; b < m; b++) {
        const value = this.kernel.covarianceAt(sorted[a] - sorted[b]) - 0.5 * (explained[a * m + b] + explained[b * m + a]);
        covariance[order[a] * m + order[b]] = value;
        covariance[order[b] * m + order[a]] = value;
      }
    return covariance;
  }

  /**
   * A conditional draw at `times` by Matheron's rule: a joint prior draw at data and requested times,
   * corrected by the conditional mean of the residual it leaves (Wilson et al. 2020, ICML, "Efficiently
   * sampling functions from Gaussian process posteriors"). O((N + M) R^2).
   */
  draw(rng: Rng, times: ArrayLike<number>): Float64Array {
    const { sorted, order } = sortTargets(times, "draw");
    const data = this.inputs.time;
    const n = data.length;
    const m = sorted.length;
    // Merge data and requested times (data first on ties), remembering which is which.
    const merged = new Float64Array(n + m);
    const isData = new Uint8Array(n + m);
    for (let i = 0, j = 0, k = 0; k < n + m; k++) {
      if (j >= m || (i < n && data[i] <= sorted[j])) {
        merged[k] = data[i++];
        isData[k] = 1;
      } else merged[k] = sorted[j++];
    }
    const joint = semiseparablePriorDraw(priorFactorization(this.form, merged), 0, rng);
    const atData = new Float64Array(n);
    const atNew = new Float64Array(m);
    for (let i = 0, j = 0, k = 0; k < n + m; k++) {
      if (isData[k]) atData[i++] = joint[k];
      else atNew[j++] = joint[k];
    }
    const correction = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const noise = Math.sqrt(this.inputs.noiseVariance[i]) * rng.normal();
      correction[i] = this.residual[i] - atData[i] - noise;
    }
    const update = semiseparablePredict(this.form, data, this.inputs.noiseVariance, correction, sorted);
    const out = new Float64Array(m);
    for (let k = 0; k < m; k++) out[order[k]] = atNew[k] + update.mean[k] + this.inputs.mean;
    return out;
  }
}
