import type { Rng } from "../random/rng.js";
import { paretoSmoothedWeights, type SmoothedWeights } from "./pareto-smoothed-weights.js";
import type { ImportanceProposal } from "./profile-proposal.js";
import type { PosteriorTarget } from "./posterior-target.js";
import { studentTProposal, type StudentTProposal } from "./student-t-proposal.js";

/**
 * The draws of an importance sampler whose proposal is a mixture that grows: components are added one
 * by one, draws are taken from any of them, and every draw is weighted by p / q_mix with the
 * deterministic mixture q_mix = sum_j (n_j / n) q_j of all components so far (the balance heuristic of
 * Veach & Guibas 1995 and Owen & Zhou 2000, J. Am. Stat. Assoc. 95, 135), the ratios Pareto-smoothed
 * ({@link paretoSmoothedWeights}). ln q_j of every draw under every component is kept, so adding a
 * component costs one pass over the draws and no target evaluation.
 */
export interface ProposalMixture {
  /** Every draw so far, in the target's coordinates. */
  readonly points: readonly Float64Array[];
  /** ln p of each draw (-Infinity where the target gave NaN). */
  readonly logPosterior: readonly number[];
  /** Draws taken from each component, in the order the components were added. */
  readonly componentDraws: readonly number[];
  /** Adds a component and returns its index. */
  add(proposal: ImportanceProposal): number;
  /** Takes `count` draws from component `j`, evaluating the target at each. */
  drawFrom(j: number, count: number): void;
  /**
   * ln p(x_s) - ln q_mix(x_s) of every draw so far, before smoothing: exp of their mean estimates the
   * target's normalising constant (the deterministic-mixture estimator of Owen & Zhou 2000).
   */
  logRatios(): Float64Array;
  /** Pareto-smoothed weights of all draws so far. */
  smooth(): SmoothedWeights;
  /**
   * Share of draw s's mixture density that components `members` give it, sum_{j in members} n_j q_j(x_s) / sum_j n_j q_j(x_s),
   * for every draw (the responsibility of a group of components, as in EM for mixtures).
   */
  responsibility(members: readonly number[]): Float64Array;
}

/** An empty {@link ProposalMixture} on `target`, drawing with `rng`. */
export function proposalMixture(target: PosteriorTarget, rng: Rng): ProposalMixture {
  const d = target.dimension;
  const components: ImportanceProposal[] = [];
  const componentDraws: number[] = [];
  const points: Float64Array[] = [];
  const logDensity: number[] = [];
  const componentLogDensity: number[][] = [];
  /** ln (n_j / n) + ln q_j(x_s) for every component j of draw s, and their log-sum-exp. */
  const weightedLogDensities = (s: number, logShares: readonly number[], out: Float64Array): number => {
    let largest = -Infinity;
    for (let j = 0; j < components.length; j++) {
      out[j] = logShares[j] + componentLogDensity[j][s];
      largest = Math.max(largest, out[j]);
    }
    let sum = 0;
    for (let j = 0; j < components.length; j++) sum += Math.exp(out[j] - largest);
    return largest + Math.log(sum);
  };
  const logSharesNow = () => componentDraws.map((n) => Math.log(n / points.length));
  const logRatios = (): Float64Array => {
    const logShares = logSharesNow();
    const scratch = new Float64Array(components.length);
    const ratios = new Float64Array(points.length);
    for (let s = 0; s < points.length; s++) ratios[s] = logDensity[s] - weightedLogDensities(s, logShares, scratch);
    return ratios;
  };
  return {
    points,
    logPosterior: logDensity,
    componentDraws,
    add(proposal) {
      components.push(proposal);
      componentDraws.push(0);
      componentLogDensity.push(points.map((x) => proposal.logDensity(x)));
      return components.length - 1;
    },
    drawFrom(j, count) {
      const proposal = components[j];
      for (let s = 0; s < count; s++) {
        const x = new Float64Array(d);
        proposal.draw(rng, x);
        const logP = target.logPosterior(x);
        points.push(x);
        logDensity.push(Number.isNaN(logP) ? -Infinity : logP);
        components.forEach((c, i) => componentLogDensity[i].push(c.logDensity(x)));
      }
      componentDraws[j] = componentDraws[j] + count;
    },
    logRatios,
    smooth: () => paretoSmoothedWeights(logRatios()),
    responsibility(members) {
      const logShares = logSharesNow();
      const scratch = new Float64Array(components.length);
      const out = new Float64Array(points.length);
      for (let s = 0; s < points.length; s++) {
        const total = weightedLogDensities(s, logShares, scratch);
        let share = 0;
        for (const j of members) share += Math.exp(scratch[j] - total);
        out[s] = share;
      }
      return out;
    },
  };
}

/**
 * A Student-t with the weighted mean and `inflation` times the weighted covariance of the draws (weights
 * `weights[s] * factor[s]`, renormalised; `factor` defaults to 1), or undefined when the weights vanish or
 * that covariance is singular.
 */
export function weightedMomentProposal(
  points: readonly Float64Array[],
  weights: ArrayLike<number>,
  nu: number,
  factor?: ArrayLike<number>,
  inflation = 1,
): StudentTProposal | undefined {
  const d = points[0].length;
  const w = Float64Array.from(weights, (v, s) => v * (factor ? factor[s] : 1));
  let sum = 0;
  for (const v of w) sum += v;
  if (!(sum > 0)) return undefined;
  // Smoothed weights already sum to 1: divide only when a factor changed that.
  const total = factor ? sum : 1;
  const mean = new Float64Array(d);
  points.forEach((x, s) => {
    for (let i = 0; i < d; i++) mean[i] = mean[i] + (w[s] / total) * x[i];
  });
  const covariance = new Float64Array(d * d);
  points.forEach((x, s) => {
    for (let i = 0; i < d; i++) {
      for (let j = 0; j <= i; j++) covariance[i * d + j] = covariance[i * d + j] + (w[s] / total) * (x[i] - mean[i]) * (x[j] - mean[j]);
    }
  });
  for (let i = 0; i < d; i++) for (let j = 0; j < i; j++) covariance[j * d + i] = covariance[i * d + j];
  try {
    return studentTProposal(mean, inflation === 1 ? covariance : covariance.map((c) => inflation * c), nu);
  } catch (error) {
    if (error instanceof RangeError) return undefined;
    throw error;
  }
}
