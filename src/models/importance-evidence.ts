import {
  modeCovariance,
  paretoShapeThreshold,
  paretoSmoothedWeights,
  studentTProposal,
  type PosteriorTarget,
  type StudentTProposal,
} from "../inference/index.js";
import type { Rng } from "../random/rng.js";

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

/** Settings of {@link importanceLogEvidence}. */
export interface ImportanceEvidenceOptions {
  /** Draws (default max(1500, 250 d)). */
  readonly draws?: number;
  /** Degrees of freedom of the Student-t proposal (default 5: heavier tails than the posterior's). */
  readonly degreesOfFreedom?: number;
  /** Factor on the Laplace covariance for the proposal's scale matrix (default 1.5). */
  readonly inflation?: number;
  /** Proposals refitted to the weighted draws when k-hat is too high (default 3). */
  readonly refits?: number;
  /**
   * Permutations of the target's coordinates under which it is invariant (index maps, each of length d;
   * the identity need not be listed): label switching of exchangeable components. The proposal is
   * symmetrised over them, so that Z counts every copy of the mode.
   */
  readonly symmetries?: readonly (readonly number[])[];
}

/**
 * ln Z = ln integral p(u) du by importance sampling (Geweke 1989) from a multivariate Student-t q centred
 * on the mode u* with `inflation` times the Laplace covariance (-H)^-1 as its scale: Z-hat = (1/S) sum_s
 * p(u_s) / q(u_s), unbiased, with a Monte Carlo standard error from the ratios' spread. When k-hat says
 * the ratios' tail is too heavy, the proposal is refitted to the weighted draws (their mean and
 * `inflation` times their covariance) and the estimate is made afresh from the new draws alone, up to
 * `refits` times; the last estimate is returned, `reliable` saying whether its k-hat passed. Unlike the
 * Laplace approximation it has a stated error, and it sees skewness and curvature changes that a
 * Gaussian at the mode misses. `target` must be the unconstrained posterior including the Jacobian, so
 * that Z is the evidence of the physical model.
 *
 * With `symmetries` (a target invariant under permutations pi of its coordinates, p(pi u) = p(u)), the
 * proposal is the mixture q_sym(u) = (1/|G|) sum_pi q(pi u) over the group G they generate with the
 * identity: a draw takes a random permutation of a draw from q. It covers every relabelled copy of the
 * mode, whether the copies overlap or not (a Gaussian at one copy would count one |G|-th of Z).
 *
 * Undefined when -H is not positive definite at `mode` (no Gaussian scale to draw with).
 */
export function importanceLogEvidence(
  target: PosteriorTarget,
  mode: Float64Array,
  rng: Rng,
  options: ImportanceEvidenceOptions = {},
): EvidenceEstimate | undefined {
  const d = target.dimension;
  const covariance = modeCovariance(target, mode);
  if (covariance === undefined) return undefined;
  const inflation = options.inflation ?? 1.5;
  const nu = options.degreesOfFreedom ?? 5;
  const group = permutationGroup(d, options.symmetries ?? []);
  const draws = Math.max(100, Math.round(options.draws ?? Math.max(1500, 250 * d)));
  let location: Float64Array = Float64Array.from(mode);
  let scale: Float64Array = covariance.map((c) => inflation * c);
  let estimate: EvidenceEstimate | undefined;
  for (let round = 0; round <= (options.refits ?? 3); round++) {
    const proposal = studentTProposal(location, scale, nu);
    const { logRatios, points } = ratiosFrom(target, proposal, group, draws, rng);
    estimate = evidenceFromLogRatios(logRatios);
    if (estimate.reliable) return estimate;
    const moments = weightedMoments(points, logRatios);
    if (moments === undefined) return estimate;
    location = moments.mean;
    scale = moments.covariance.map((c) => inflation * c);
  }
  return estimate;
}

/** Draws from the symmetrised proposal and their log ratios ln p - ln q_sym (the draws before relabelling). */
function ratiosFrom(target: PosteriorTarget, proposal: StudentTProposal, group: readonly number[][], draws: number, rng: Rng) {
  const d = target.dimension;
  const logRatios = new Float64Array(draws);
  const points: Float64Array[] = [];
  const probe = new Float64Array(d);
  const permuted = new Float64Array(d);
  for (let s = 0; s < draws; s++) {
    const x = new Float64Array(d);
    proposal.draw(rng, x);
    points.push(x);
    const chosen = group[Math.min(group.length - 1, Math.floor(rng.uniform() * group.length))] ?? [];
    for (let i = 0; i < d; i++) permuted[i] = x[chosen[i] ?? i] ?? 0;
    // q_sym(y) = (1/|G|) sum_pi q(pi y): the density of the relabelled draw under the mixture.
    let largest = -Infinity;
    const logQ = group.map((pi) => {
      for (let i = 0; i < d; i++) probe[i] = permuted[pi[i] ?? i] ?? 0;
      const value = proposal.logDensity(probe);
      largest = Math.max(largest, value);
      return value;
    });
    const logMixture = largest + Math.log(logQ.reduce((sum, v) => sum + Math.exp(v - largest), 0) / group.length);
    const logP = target.logPosterior(permuted);
    logRatios[s] = Number.isNaN(logP) ? -Infinity : logP - logMixture;
  }
  return { logRatios, points };
}

/**
 * Mean and covariance of the draws under their Pareto-smoothed weights (the next proposal's location and
 * scale, adapting it to the target: Cappe et al. 2008, Stat. Comput. 18, 447, from memory); undefined when
 * the weighted covariance is not positive definite.
 */
function weightedMoments(points: readonly Float64Array[], logRatios: Float64Array): { mean: Float64Array; covariance: Float64Array } | undefined {
  const d = points[0]?.length ?? 0;
  if (!(logRatios.some((r) => r > -Infinity))) return undefined;
  const { weights } = paretoSmoothedWeights(logRatios);
  const mean = new Float64Array(d);
  points.forEach((x, s) => {
    for (let i = 0; i < d; i++) mean[i] = (mean[i] ?? 0) + (weights[s] ?? 0) * (x[i] ?? 0);
  });
  const covariance = new Float64Array(d * d);
  points.forEach((x, s) => {
    const w = weights[s] ?? 0;
    for (let i = 0; i < d; i++)
      for (let j = 0; j < d; j++) covariance[i * d + j] = (covariance[i * d + j] ?? 0) + w * ((x[i] ?? 0) - (mean[i] ?? 0)) * ((x[j] ?? 0) - (mean[j] ?? 0));
  });
  try {
    studentTProposal(mean, covariance, 5);
  } catch {
    return undefined;
  }
  return { mean, covariance };
}

/** ln of the mean ratio, its delta-method standard error and k-hat, from the log ratios ln p - ln q. */
export function evidenceFromLogRatios(logRatios: Float64Array): EvidenceEstimate {
  const draws = logRatios.length;
  let largest = -Infinity;
  for (const r of logRatios) largest = Math.max(largest, r);
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
    // NaN: a tail of equal ratios, nothing heavy in it.
    reliable: Number.isNaN(paretoShape) || paretoShape <= paretoShapeThreshold(draws),
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
