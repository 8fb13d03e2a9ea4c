import { findMaximumPosterior, unconstrainedPosterior } from "../inference/index.js";
import { gammaCdf } from "../inference/distribution-functions.js";
import type { LightCurve } from "../lightcurve/light-curve.js";
import type { LightCurveModel } from "./light-curve-model.js";
import { modelLikelihood } from "./light-curve-model.js";
import { robustResiduals } from "./outlier-screen.js";

/** Smallest weight a point may get: its error grows at most a million-fold (keeps the solver finite). */
const MINIMUM_WEIGHT = 1e-12;

/** Degrees of freedom of the Student-t noise (heavy enough for outliers, common practice: 3 to 5). */
export const ROBUST_DEGREES_OF_FREEDOM = 4;

/** The outcome of `robustNoiseWeights`. */
export interface RobustNoise {
  readonly degreesOfFreedom: number;
  /** E[lambda_i | data]: each point's noise variance is its error^2 / weight. */
  readonly weights: Float64Array;
  /** P(lambda_i < 1/4 | data): the probability that the point's true scatter is over twice its error bar. */
  readonly outlierProbability: Float64Array;
  /**
   * The physical parameters (by name) at which the weights were computed, the maximum a posteriori of EM's
   * last M-step: with the light curve they determine every weight (`robustWeightsAt`), so a result
   * stores them instead of N weights.
   */
  readonly parameters: Readonly<Record<string, number>>;
  /** EM iterations used. */
  readonly iterations: number;
  /** Whether the weights settled (largest change below 1e-3) within the iterations allowed. */
  readonly converged: boolean;
}

/**
 * Student-t measurement noise written as a scale mixture of Gaussians: eps_i ~ N(0, s_i^2 / lambda_i) with
 * lambda_i ~ Gamma(nu/2, rate nu/2) (Lange, Little & Taylor 1989, JASA 84, 881). Per-point variances are
 * exactly what the semiseparable solver takes, so the heavier tails cost nothing extra per evaluation.
 *
 * The weights come from expectation-maximisation at the maximum a posteriori. E-step: removing point i's own
 * precision from the latent posterior gives the prediction of all the other points, N(mu_-i, V_-i); with the
 * point's noise n_i = s_i^2 / lambda_i, the posterior of its noise eps_i has mean (y_i - mu_-i) n_i / (V_-i + n_i)
 * and variance n_i V_-i / (V_-i + n_i), and E[lambda_i | y] = (nu + 1) / (nu + E[eps_i^2 | y] / s_i^2). Because
 * n_i depends on lambda_i, this is iterated to its fixed point point by point (a scalar loop) before the
 * M-step re-maximises the parameters; the outer loop stops when the weights settle. Without the inner
 * fixed point, a flexible kernel absorbs an outlier as signal and every weight stays near 1. The posterior
 * is then sampled with the weights held at their final values (a plug-in approximation), and
 * lambda_i | y ~ Gamma((nu + 1)/2, rate (nu + E[eps_i^2]/s_i^2)/2) gives each point's outlier probability.
 *
 * The start decides which fixed point EM reaches. The first weights come from the points' standardised
 * residuals about a running median of their neighbours ({@link robustResiduals}), which outliers of any
 * size cannot pull, w_i = (nu + 1) / (nu + z_i^2); the first maximisation uses them. Started from equal
 * weights, or from a model already fitted to the outliers, a gross outlier of 1-4 mag is absorbed as
 * signal (a short timescale, a large sigma) and keeps a weight near 1.
 */
export function robustNoiseWeights(model: LightCurveModel, lightCurve: LightCurve, maxIterations = 50): RobustNoise {
  const errors = requireErrors(lightCurve);
  const nu = ROBUST_DEGREES_OF_FREEDOM;
  const n = lightCurve.time.length;
  const z = robustResiduals(lightCurve);
  const maximise = (weights: Float64Array, from: Float64Array) =>
    findMaximumPosterior(unconstrainedPosterior(model.space, modelLikelihood(model, withNoiseWeights(lightCurve, weights)), { jacobian: false }), {
      starts: [from],
    }).x;
  const expectation = (point: Float64Array, weights: Float64Array) => expectationStep(model, lightCurve, errors, model.space.toPhysical(point), weights, z);
  // The start: each point's weight is the smaller of two that outliers cannot pull, the Student-t weight of
  // its residual about the running median, and an E-step at the first guess with amplitudes from the
  // median absolute deviation (the sample sd that the guess would otherwise use is inflated by the
  // outliers themselves).
  const guess = model.space.toUnconstrained(model.space.physicalFromRecord(robustFirstGuess(model, lightCurve)));
  const fromGuess = expectation(guess, new Float64Array(n).fill(1)).next;
  let weights: Float64Array = Float64Array.from(medianWeights(z), (w, i) => Math.min(w, fromGuess[i]));
  let point = maximise(weights, guess);
  let iteration = 0;
  let converged = false;
  for (; iteration < maxIterations; iteration++) {
    const step = expectation(point, weights);
    const change = largestChange(step.next, weights);
    weights = step.next;
    if (change < 1e-3) {
      iteration++;
      converged = true;
      break;
    }
    point = maximise(weights, point);
  }
  const parameters = model.space.toPhysical(point);
  return { degreesOfFreedom: nu, ...robustWeightsAt(model, lightCurve, parameters), parameters: model.space.recordFromPhysical(parameters), iterations: iteration, converged };
}

/** Largest change of a weight between two steps below which E-steps at fixed parameters have settled. */
const SETTLED_CHANGE = 1e-7;

/**
 * The robust weights and outlier probabilities of every point at fixed physical parameters: E-steps of
 * {@link robustNoiseWeights} at `parameters`, started from the Student-t weights of the residuals about
 * the running median ({@link robustResiduals}, which outliers cannot pull) and repeated until no weight
 * changes by more than 1e-7 (at most 100 steps). Removing each point's own precision makes its
 * prediction depend on its neighbours' weights only, so the steps settle in a few rounds. Deterministic
 * in (model, light curve, parameters): the fit conditions on exactly these weights, and a reader of the
 * result recomputes them from the stored parameters (models/model-from-result.ts) instead of reading N numbers.
 */
export function robustWeightsAt(model: LightCurveModel, lightCurve: LightCurve, parameters: ArrayLike<number>): { weights: Float64Array; outlierProbability: Float64Array } {
  const errors = requireErrors(lightCurve);
  const nu = ROBUST_DEGREES_OF_FREEDOM;
  const z = robustResiduals(lightCurve);
  let weights = medianWeights(z);
  let step = expectationStep(model, lightCurve, errors, parameters, weights, z);
  for (let round = 1; round < 100 && largestChange(step.next, weights) > SETTLED_CHANGE; round++) {
    weights = step.next;
    step = expectationStep(model, lightCurve, errors, parameters, weights, z);
  }
  const standardised = step.standardised;
  const outlierProbability = Float64Array.from(standardised, (s) => gammaCdf(0.25, (nu + 1) / 2, (nu + s) / 2));
  return { weights: step.next, outlierProbability };
}

/**
 * The Student-t weights (nu + 1) / (nu + z^2) of the points' residuals z about the running median of
 * their neighbours ({@link robustResiduals}): the start of the E-steps, which outliers of any size
 * cannot pull; also the weights of the robust fit's period search (fit-robust-stage.ts).
 */
export function runningMedianWeights(lightCurve: LightCurve): Float64Array {
  return medianWeights(robustResiduals(lightCurve));
}

/** The Student-t weights (nu + 1) / (nu + z^2) of residuals z about the running median. */
function medianWeights(z: Float64Array): Float64Array {
  const nu = ROBUST_DEGREES_OF_FREEDOM;
  return Float64Array.from(z, (zi) => Math.max((nu + 1) / (nu + zi * zi), MINIMUM_WEIGHT));
}

function largestChange(next: Float64Array, previous: Float64Array): number {
  let change = 0;
  for (let i = 0; i < next.length; i++) change = Math.max(change, Math.abs(next[i] - previous[i]));
  return change;
}

function requireErrors(lightCurve: LightCurve): Float64Array {
  if (!lightCurve.error) throw new RangeError("robust noise needs per-point errors (an error column)");
  return lightCurve.error;
}

/**
 * One E-step at the physical parameters `parameters` from `weights`: the new weights and E[eps_i^2 | y] / s_i^2
 * of every point (see {@link robustNoiseWeights}); `z` are the residuals about the running median, used
 * where the E-step is not finite.
 */
function expectationStep(
  model: LightCurveModel,
  lightCurve: LightCurve,
  errors: Float64Array,
  parameters: ArrayLike<number>,
  weights: Float64Array,
  z: Float64Array,
): { next: Float64Array; standardised: Float64Array } {
  const nu = ROBUST_DEGREES_OF_FREEDOM;
  const n = lightCurve.time.length;
  const weighted = withNoiseWeights(lightCurve, weights);
  const latent = model.processAt(parameters, weighted).given(weighted.value).at(weighted.time);
  // The point's own precision removed from the latent posterior gives the prediction of all the other
  // points, N(mu_-i, V_-i); the E-step for lambda_i is then a scalar fixed point (the point's noise enters
  // its own posterior), iterated to convergence at fixed parameters.
  const next = new Float64Array(n);
  const standardised = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const noise = errors[i] ** 2 / weights[i];
    const variance = latent.variance[i];
    // Removing the point's own precision is ill-conditioned when the latent variance is almost all the
    // point's own noise; then the latent posterior itself is the (slightly optimistic) prediction.
    const removed = variance < noise ? 1 / (1 / variance - 1 / noise) : NaN;
    const looVariance = Number.isFinite(removed) && removed > 0 ? removed : variance;
    const looMean = looVariance !== variance ? looVariance * (latent.mean[i] / variance - lightCurve.value[i] / noise) : latent.mean[i];
    const residual = lightCurve.value[i] - looMean;
    const base = errors[i] ** 2;
    let w = weights[i];
    let e2 = 0;
    for (let inner = 0; inner < 200; inner++) {
      const n2 = base / w;
      const shrink = n2 / (looVariance + n2);
      e2 = (residual * shrink) ** 2 + looVariance * shrink; // E[eps_i^2 | y] = mean^2 + n V / (V + n)
      const updated = (nu + 1) / (nu + e2 / base);
      const settled = Math.abs(updated - w) < 1e-9;
      w = updated;
      if (settled) break;
    }
    next[i] = Number.isFinite(w) ? Math.max(w, MINIMUM_WEIGHT) : weights[i];
    standardised[i] = Number.isFinite(e2) ? e2 / base : z[i] * z[i];
  }
  return { next, standardised };
}

/**
 * The model's first guess with its amplitudes (sigma, backgroundSigma) set from the robust spread of the
 * values, 1.4826 x their median absolute deviation (less the median error in quadrature), instead of
 * a spread that gross outliers inflate.
 */
function robustFirstGuess(model: LightCurveModel, lightCurve: LightCurve): Record<string, number> {
  const { value } = lightCurve;
  const sorted = Float64Array.from(value).sort();
  const median = sorted[sorted.length >> 1];
  const deviations = Float64Array.from(value, (v) => Math.abs(v - median)).sort();
  const spread = 1.4826 * deviations[deviations.length >> 1];
  const errors = Float64Array.from(lightCurve.error ?? [0]).sort();
  const medianError = errors[errors.length >> 1];
  const amplitude = Math.sqrt(Math.max(spread * spread - medianError * medianError, 0.01 * spread * spread));
  const guess: Record<string, number> = { ...model.initialGuess };
  for (const name of ["sigma", "backgroundSigma"]) {
    const prior = model.space.free.find((p) => p.name === name)?.prior;
    if (guess[name] !== undefined && prior && amplitude > prior.lower && amplitude < prior.upper) guess[name] = name === "sigma" ? amplitude : amplitude / 2;
  }
  if (guess.mean !== undefined) guess.mean = median;
  return guess;
}

/** The light curve with each error divided by sqrt(weight): variance error^2 / weight. */
export function withNoiseWeights(lightCurve: LightCurve, weights: ArrayLike<number>): LightCurve {
  const errors = lightCurve.error;
  if (!errors) throw new RangeError("noise weights need per-point errors");
  if (weights.length !== errors.length) throw new RangeError(`${weights.length} noise weights for ${errors.length} points`);
  return { ...lightCurve, error: Float64Array.from(errors, (e, i) => e / Math.sqrt(weights[i])) };
}
