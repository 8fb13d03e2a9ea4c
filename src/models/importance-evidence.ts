import { CholeskyDecomposition, Matrix } from "ml-matrix";
import {
  modeCovariance,
  modeMixtureSample,
  paretoShapeThreshold,
  paretoSmoothedWeights,
  type ImportanceSample,
  type PosteriorTarget,
} from "../inference/index.js";
import type { Rng } from "../random/rng.js";
import { negativeHessianAt } from "./laplace-evidence.js";

/** An estimate of ln Z with its Monte Carlo standard error. */
export interface EvidenceEstimate {
  /** ln Z-hat = ln((1/S) sum_s p(x_s) / q(x_s)). */
  readonly logEvidence: number;
  /**
   * Monte Carlo standard error of ln Z-hat by the delta method, sd(w) / (mean(w) sqrt(S)) for the ratios
   * w_s = p(x_s) / q(x_s) (Geweke 1989, Econometrica 57, 1317, sec. 3): finite and meaningful when k-hat is
   * below the threshold.
   */
  readonly standardError: number;
  /** k-hat of the ratios (Pareto-smoothed importance sampling's diagnostic; NaN when not fitted). */
  readonly paretoShape: number;
  /** Whether k-hat is at most {@link paretoShapeThreshold}: the ratios have a finite variance, so the error holds. */
  readonly reliable: boolean;
  readonly draws: number;
}

/** What {@link importanceLogEvidence} returns: the estimate, how many modes its proposal covered, and its draws. */
export interface ImportanceEvidence extends EvidenceEstimate {
  /** Modes the proposal mixture had a component at (the distinct local maxima among those given). */
  readonly modes: number;
  /** The weighted draws (of the canonical copy, with `symmetries`): where a sampler may start when k-hat failed. */
  readonly sample: ImportanceSample;
}

/** Settings of {@link importanceLogEvidence}. */
export interface ImportanceEvidenceOptions {
  /** Draws from each round of refitted components (default max(1500, 250 d)). */
  readonly draws?: number;
  /** Most draws in all (default 12,000). */
  readonly maxDraws?: number;
  /**
   * Effective sample size of the weights to draw for (default 800): the standard error of ln Z is about
   * sqrt(1 / ESS - 1 / S), 0.035 at the default.
   */
  readonly minimumEss?: number;
  /** Degrees of freedom of the Student-t components (default 5: heavier tails than the posterior's). */
  readonly degreesOfFreedom?: number;
  /** Factor on the Laplace covariance for each mode's first component (default 1.5). */
  readonly inflation?: number;
  /** Rounds of components refitted to the weighted draws while k-hat is too high (default 4). */
  readonly refits?: number;
  /**
   * Permutations of the target's coordinates under which it is invariant (index maps, each of length d;
   * the identity need not be listed): label switching of exchangeable components. Z then counts every
   * copy of the mode, whether the copies overlap or not.
   */
  readonly symmetries?: readonly (readonly number[])[];
}

/**
 * ln Z = ln integral p(u) du by adaptive mixture importance sampling: a Student-t at each of `modes` (the
 * distinct local maxima of the optimiser, best first) with `inflation` times its Laplace covariance, a
 * defensive wide component when there are several (Hesterberg 1995, Technometrics 37, 185), and rounds
 * of components refitted to the weighted draws each mode is responsible for while k-hat is too high or
 * the ESS short (`modeMixtureSample`; Cappe et al. 2008, Stat. Comput. 18, 447, from memory). Every draw
 * is weighted by p / q_mix against the deterministic mixture of all components, and
 * Z-hat = (1/S) sum_s p(u_s) / q_mix(u_s) (Owen & Zhou 2000, J. Am. Stat. Assoc. 95, 135; reusing the
 * draws of every adaptive round as in Cornuet et al. 2012, Scand. J. Stat. 39, 798, from memory), with
 * the delta-method standard error of {@link evidenceFromLogRatios}; `reliable` says whether k-hat passed.
 * `target` must be the unconstrained posterior including the Jacobian, so that Z is the evidence of the
 * physical model.
 *
 * The covariance at a mode is `modeCovariance` (half-standard-deviation steps, the curvature over the
 * bulk), or where that is not positive definite the inverse Hessian from small steps at the mode
 * itself: a posterior with a flat top and steep walls (a CARMA real root and moving-average roots that
 * nearly cancel) has a maximum whose wide-step curvature straddles the walls.
 *
 * With `symmetries` (p(pi u) = p(u) for every pi of the group G they generate with the identity), the
 * integral is taken over the canonical copies only: Z = |G| integral_C p(u) du, C the points that are the
 * lexicographically smallest of their orbit (the images pi C tile the space, and each holds the same
 * mass), and the modes are moved into C. This holds whether the copies overlap or not.
 *
 * Undefined when -H is positive definite at none of the modes (no Gaussian scale to draw with).
 */
export function importanceLogEvidence(
  target: PosteriorTarget,
  modes: Float64Array | readonly Float64Array[],
  rng: Rng,
  options: ImportanceEvidenceOptions = {},
): ImportanceEvidence | undefined {
  const d = target.dimension;
  const { folded, fold } = canonicalCopy(target, options.symmetries ?? []);
  const listed = modes instanceof Float64Array ? [modes] : modes;
  const sample = modeMixtureSample(folded, listed.map(fold), rng, {
    pilotDraws: Math.max(300, 50 * d),
    draws: Math.max(100, Math.round(options.draws ?? Math.max(1500, 250 * d))),
    maxDraws: options.maxDraws ?? 12_000,
    minimumEss: options.minimumEss ?? 800,
    degreesOfFreedom: options.degreesOfFreedom ?? 5,
    pilotInflation: options.inflation ?? 1.5,
    refits: options.refits ?? 4,
    covariance: robustModeCovariance,
  });
  if (sample.logRatios.length === 0) return undefined;
  return { ...evidenceFromLogRatios(sample.logRatios), modes: sample.modes.length, sample };
}

/** `modeCovariance`, else (-H)^-1 from small steps at the mode ({@link pointCovariance}). */
export function robustModeCovariance(target: PosteriorTarget, mode: Float64Array): Float64Array | undefined {
  return modeCovariance(target, mode) ?? pointCovariance(target, mode);
}

/**
 * (-H)^-1 with H from steps of 1e-4 at the mode itself (`negativeHessianAt`), row-major; undefined when
 * -H is not positive definite there either.
 */
export function pointCovariance(target: PosteriorTarget, mode: Float64Array): Float64Array | undefined {
  const d = mode.length;
  const cholesky = new CholeskyDecomposition(negativeHessianAt(target, mode));
  if (!cholesky.isPositiveDefinite()) return undefined;
  const inverse = Float64Array.from(cholesky.solve(Matrix.eye(d, d)).to1DArray());
  return inverse.every(Number.isFinite) ? inverse : undefined;
}

/**
 * The target restricted to its canonical copy under the group the `symmetries` generate
 * ({@link canonicalTarget}; the target itself without symmetries), the map of a point into that copy
 * ({@link canonicalForm}), and ln |G|.
 */
export function canonicalCopy(
  target: PosteriorTarget,
  symmetries: readonly (readonly number[])[],
): { folded: PosteriorTarget; fold: (u: Float64Array) => Float64Array; logCopies: number } {
  const group = permutationGroup(target.dimension, symmetries);
  if (group.length === 1) return { folded: target, fold: (u) => u, logCopies: 0 };
  return { folded: canonicalTarget(target, group), fold: (u) => canonicalForm(u, group), logCopies: Math.log(group.length) };
}

/** The image of u under pi: (pi u)_i = u_pi(i). */
function permuted(u: ArrayLike<number>, pi: readonly number[], out: Float64Array): Float64Array {
  for (let i = 0; i < out.length; i++) out[i] = u[pi[i] ?? i] ?? 0;
  return out;
}

/** Whether a comes before b lexicographically. */
function before(a: ArrayLike<number>, b: ArrayLike<number>): boolean {
  for (let i = 0; i < a.length; i++) {
    const x = a[i] ?? 0;
    const y = b[i] ?? 0;
    if (x !== y) return x < y;
  }
  return false;
}

/** The lexicographically smallest point of u's orbit under `group`. */
function canonicalForm(u: Float64Array, group: readonly (readonly number[])[]): Float64Array {
  let best = Float64Array.from(u);
  const image = new Float64Array(u.length);
  for (const pi of group) {
    permuted(u, pi, image);
    if (before(image, best)) best = Float64Array.from(image);
  }
  return best;
}

/**
 * |G| p(u) on the canonical points C (u no greater, lexicographically, than any of its images), -Infinity
 * elsewhere: its integral is Z when p is invariant under the group.
 */
function canonicalTarget(target: PosteriorTarget, group: readonly (readonly number[])[]): PosteriorTarget {
  const logCopies = Math.log(group.length);
  const image = new Float64Array(target.dimension);
  const canonical = (u: Float64Array) => group.every((pi) => !before(permuted(u, pi, image), u));
  const gradient = target.logPosteriorAndGradient;
  return {
    dimension: target.dimension,
    logPosterior: (u) => (canonical(u) ? target.logPosterior(u) + logCopies : -Infinity),
    ...(gradient
      ? {
          logPosteriorAndGradient: (u: Float64Array, out: Float64Array) => {
            if (!canonical(u)) {
              out.fill(0);
              return -Infinity;
            }
            return gradient.call(target, u, out) + logCopies;
          },
        }
      : {}),
  };
}

/** ln of the mean ratio, its delta-method standard error and k-hat, from the log ratios ln p - ln q. */
export function evidenceFromLogRatios(logRatios: Float64Array): EvidenceEstimate {
  const draws = logRatios.length;
  let largest = -Infinity;
  let zeros = 0;
  for (const r of logRatios) {
    largest = Math.max(largest, r);
    if (r === -Infinity) zeros++;
  }
  if (largest === -Infinity) return { logEvidence: -Infinity, standardError: NaN, paretoShape: NaN, reliable: false, draws };
  let sum = 0;
  let sumSquares = 0;
  for (const r of logRatios) {
    const w = Math.exp(r - largest);
    sum += w;
    sumSquares += w * w;
  }
  const mean = sum / draws;
  const variance = Math.max(0, sumSquares / draws - mean * mean) * (draws / (draws - 1));
  const paretoShape = paretoSmoothedWeights(logRatios).paretoShape;
  return {
    logEvidence: largest + Math.log(mean),
    standardError: Math.sqrt(variance / draws) / mean,
    paretoShape,
    // NaN: a tail of equal ratios, nothing heavy in it (unless the tail is the zero weights of draws outside the support).
    reliable: Number.isNaN(paretoShape) ? zeros < 0.8 * draws : paretoShape <= paretoShapeThreshold(draws),
    draws,
  };
}

/** The group generated by the identity and the given permutations of 0..d-1 (closure under composition). */
export function permutationGroup(d: number, generators: readonly (readonly number[])[]): number[][] {
  const identity = Array.from({ length: d }, (_, i) => i);
  const key = (p: readonly number[]) => p.join(",");
  const members = new Map<string, number[]>([[key(identity), identity]]);
  const queue = [identity];
  while (queue.length > 0) {
    const current = queue.pop() ?? identity;
    for (const g of generators) {
      const composed = current.map((i) => g[i] ?? i);
      if (!members.has(key(composed))) {
        members.set(key(composed), composed);
        queue.push(composed);
      }
    }
  }
  return [...members.values()];
}
