import type { Rng } from "../random/rng.js";
import { importanceSample, refitInflation, type ImportanceRound, type ImportanceSample, type ImportanceSamplingOptions } from "./importance-sampling.js";
import { modeCovariance } from "./mode-covariance.js";
import { paretoShapeThreshold, type SmoothedWeights } from "./pareto-smoothed-weights.js";
import type { PosteriorTarget } from "./posterior-target.js";
import { proposalMixture, weightedMomentProposal } from "./proposal-mixture.js";
import { studentTProposal } from "./student-t-proposal.js";

/** Options of {@link modeMixtureSample} (the names and defaults of {@link ImportanceSamplingOptions} where they share a meaning). */
export interface ModeMixtureOptions
  extends Pick<ImportanceSamplingOptions, "maxDraws" | "minimumEss" | "degreesOfFreedom" | "pilotInflation" | "shapeThreshold" | "refitInflation" | "covariance"> {
  /** Draws from each mode's Laplace component, the pilot round (default max(200, 50 d) in d dimensions). */
  readonly pilotDraws?: number;
  /** Draws from the refitted components of one round, shared by the modes in proportion to their mass (default max(400, 150 d)). */
  readonly draws?: number;
  /** Most rounds of refitted components (default 4). */
  readonly refits?: number;
  /** Share of the pilot draws taken from the defensive component (default 0.1). */
  readonly defensiveShare?: number;
  /** Modes carrying less of the weighted mass than this get no refitted component (default 0.01). */
  readonly minimumModeShare?: number;
}

/** What {@link modeMixtureSample} returns: an importance sample, and the modes its proposal was built on. */
export interface ModeMixtureSample extends ImportanceSample {
  /** The distinct modes a component was centred on (in the target's coordinates), in the order given. */
  readonly modes: readonly Float64Array[];
  /** Share of the weighted draws each of `modes` accounts for (sums to 1 with the defensive component's share spread over them). */
  readonly modeShares: Float64Array;
}

/**
 * Pareto-smoothed importance sampling of a posterior with several modes (Vehtari, Simpson, Gelman, Yao &
 * Gabry 2024, JMLR 25, from memory), from a mixture with one heavy-tailed component per mode:
 * 1. each of `modes` (local maxima found by the caller, e.g. at a period's aliases) gets a Student-t
 *    at the mode with `pilotInflation` times its Laplace covariance (-H)^-1 ({@link modeCovariance}),
 *    `pilotDraws` draws each; modes where -H is not positive definite, and modes within half a
 *    standard deviation (in every coordinate) of one listed before, are left out; when one mode is
 *    left, the single-mode sampler {@link importanceSample} draws;
 * 2. a defensive component (Hesterberg 1995, Technometrics 37, 185): a Student-t with the mean and
 *    twice the covariance of the pilot mixture (the components' covariances plus the spread of the
 *    modes), `defensiveShare` of the pilot draws; its heavy, wide tails bound the weights wherever the
 *    mode components are thin, including between the modes;
 * 3. every draw weighted by p / q_mix, q_mix the deterministic mixture of all components
 *    (`proposalMixture`); the mass of mode k is sum_s w_s r_sk with r_sk the responsibility of
 *    mode k's components for draw s;
 * 4. while k-hat exceeds its threshold (or the ESS its minimum), a round of refitted components: for each
 *    mode with at least `minimumModeShare` of the mass, a t with the weighted mean and (times
 *    `refitInflation`) covariance of the draws it is responsible for (w_s r_sk; adaptive mixture importance sampling, Cappe et al. 2008, Stat. Comput.
 *    18, 447, from memory), `draws` shared among the modes by mass; then, while k-hat holds and only the
 *    ESS is short, more draws from each mode's latest component in the same proportion.
 * The weights then measure how the posterior mass splits among the modes, which no Laplace evidence
 * need approximate. A mode that no component is near gets no draws, and k-hat cannot see it: the
 * caller must list every candidate (for a period: P, P/2, 2P and the window's aliases).
 */
export function modeMixtureSample(target: PosteriorTarget, modes: readonly Float64Array[], rng: Rng, options: ModeMixtureOptions = {}): ModeMixtureSample {
  const d = target.dimension;
  const pilotDraws = Math.max(50, Math.round(options.pilotDraws ?? Math.max(200, 50 * d)));
  const roundDraws = Math.max(100, Math.round(options.draws ?? Math.max(400, 150 * d)));
  const maxDraws = Math.round(options.maxDraws ?? 8000);
  const minimumEss = options.minimumEss ?? 400;
  const nu = options.degreesOfFreedom ?? 5;
  const inflation = options.pilotInflation ?? 2;
  const maxRefits = options.refits ?? 4;
  const defensiveShare = options.defensiveShare ?? 0.1;
  const minimumShare = options.minimumModeShare ?? 0.01;
  const threshold = (count: number) => options.shapeThreshold ?? paretoShapeThreshold(count);
  const rounds: ImportanceRound[] = [];

  // Distinct modes with their Laplace covariances.
  const kept: { mode: Float64Array; covariance: Float64Array }[] = [];
  for (const mode of modes) {
    const covariance = (options.covariance ?? modeCovariance)(target, mode);
    if (covariance === undefined) continue;
    const twin = kept.some((k) => k.mode.every((v, i) => Math.abs(v - mode[i]) < 0.5 * Math.sqrt(k.covariance[i * d + i])));
    if (!twin) kept.push({ mode: Float64Array.from(mode), covariance });
  }
  const mixture = proposalMixture(target, rng);
  const { points } = mixture;
  const result = (smoothed: SmoothedWeights | undefined, shares: Float64Array, reason?: string): ModeMixtureSample => ({
    accepted: reason === undefined,
    ...(reason !== undefined ? { reason } : {}),
    points,
    logPosterior: Float64Array.from(mixture.logPosterior),
    weights: smoothed?.weights ?? new Float64Array(0),
    logRatios: smoothed ? mixture.logRatios() : new Float64Array(0),
    paretoShape: smoothed?.paretoShape ?? NaN,
    shapeThreshold: smoothed ? threshold(points.length) : NaN,
    effectiveSampleSize: smoothed?.effectiveSampleSize ?? 0,
    rounds,
    modes: kept.map((k) => k.mode),
    modeShares: shares,
  });
  if (kept.length === 0) return result(undefined, new Float64Array(0), "the log density is not curved downwards in every direction at any mode");
  if (kept.length === 1) {
    // One mode: the single-mode sampler (its pilot is the defensive component), as a fit of a model
    // without a period draws.
    return { ...importanceSample(target, kept[0].mode, rng, options), modes: [kept[0].mode], modeShares: Float64Array.of(1) };
  }

  // Components of each mode (its Laplace t, then its refits), and the defensive component.
  const members: number[][] = kept.map((k) => [mixture.add(studentTProposal(k.mode, k.covariance.map((c) => inflation * c), nu))]);
  const defensive = mixture.add(defensiveProposal(kept, inflation, nu));
  members.forEach(([j]) => mixture.drawFrom(j, Math.min(pilotDraws, Math.max(0, maxDraws - points.length))));
  mixture.drawFrom(defensive, Math.max(20, Math.round(defensiveShare * pilotDraws * kept.length)));
  let smoothed = mixture.smooth();
  const record = (kind: ImportanceRound["proposal"], draws: number) =>
    rounds.push({ proposal: kind, draws, paretoShape: smoothed.paretoShape, effectiveSampleSize: smoothed.effectiveSampleSize });
  members.forEach(([j]) => record("laplace", mixture.componentDraws[j]));
  record("defensive", mixture.componentDraws[defensive]);

  const modeMasses = (): Float64Array => {
    const masses = Float64Array.from(members, (group) => {
      const r = mixture.responsibility(group);
      let mass = 0;
      for (let s = 0; s < r.length; s++) mass += smoothed.weights[s] * r[s];
      return mass;
    });
    const total = masses.reduce((a, b) => a + b, 0);
    return total > 0 ? masses.map((m) => m / total) : masses.fill(1 / masses.length);
  };
  /** `count` more draws, shared among the modes' latest components by mass. */
  const drawByMass = (count: number, masses: Float64Array) => {
    members.forEach((group, k) => {
      const n = Math.min(Math.round(count * masses[k]), maxDraws - points.length);
      if (masses[k] >= minimumShare && n > 0) mixture.drawFrom(group[group.length - 1], n);
    });
  };
  const drawUntilEss = () => {
    while (smoothed.paretoShape <= threshold(points.length) && smoothed.effectiveSampleSize < minimumEss && points.length < maxDraws) {
      const wanted = Math.ceil((1.1 * points.length * minimumEss) / Math.max(1, smoothed.effectiveSampleSize));
      const before = points.length;
      drawByMass(Math.min(maxDraws, Math.max(wanted, points.length + 100)) - points.length, modeMasses());
      if (points.length === before) break;
      smoothed = mixture.smooth();
    }
  };
  const holds = () => smoothed.paretoShape <= threshold(points.length) && smoothed.effectiveSampleSize >= minimumEss;
  for (let refit = 0; refit < maxRefits && !holds() && points.length < maxDraws; refit++) {
    const masses = modeMasses();
    const added: number[] = [];
    members.forEach((group, k) => {
      if (masses[k] < minimumShare) return;
      const proposal = weightedMomentProposal(points, smoothed.weights, nu, mixture.responsibility(group), refitInflation(d, options));
      if (proposal === undefined) return;
      const j = mixture.add(proposal);
      group.push(j);
      const n = Math.min(Math.max(50, Math.round(roundDraws * masses[k])), maxDraws - points.length);
      if (n > 0) mixture.drawFrom(j, n);
      added.push(j);
    });
    if (added.length === 0) break;
    smoothed = mixture.smooth();
    drawUntilEss();
    for (const j of added) record("weighted-moments", mixture.componentDraws[j]);
  }
  const shares = modeMasses();
  const shapeThreshold = threshold(points.length);
  if (!(smoothed.paretoShape <= shapeThreshold)) {
    const shape = Number.isNaN(smoothed.paretoShape) ? "could not be estimated" : `is ${smoothed.paretoShape.toFixed(2)}`;
    return result(smoothed, shares, `k-hat ${shape} (threshold ${shapeThreshold.toFixed(2)}) with ${kept.length} mode component(s)`);
  }
  if (smoothed.effectiveSampleSize < minimumEss) {
    return result(smoothed, shares, `the weights' ESS stayed at ${smoothed.effectiveSampleSize.toFixed(0)} (< ${minimumEss}) with ${points.length} draws`);
  }
  return result(smoothed, shares);
}

/**
 * The defensive component: a Student-t with the mean of the modes and twice the covariance of the
 * pilot mixture, (1/K) sum_k (c C_k + (m_k - m)(m_k - m)^T) with c the pilot inflation (the law of total
 * covariance for an equal-weight mixture of K components at m_k with covariances c C_k).
 */
function defensiveProposal(kept: readonly { mode: Float64Array; covariance: Float64Array }[], inflation: number, nu: number) {
  const d = kept[0].mode.length;
  const K = kept.length;
  const mean = new Float64Array(d);
  for (const k of kept) for (let i = 0; i < d; i++) mean[i] = mean[i] + k.mode[i] / K;
  const scale = new Float64Array(d * d);
  for (const k of kept) {
    for (let i = 0; i < d; i++) {
      for (let j = 0; j < d; j++) {
        scale[i * d + j] = scale[i * d + j] + (2 / K) * (inflation * k.covariance[i * d + j] + (k.mode[i] - mean[i]) * (k.mode[j] - mean[j]));
      }
    }
  }
  return studentTProposal(mean, scale, nu);
}
