import type { Rng } from "../random/rng.js";
import type { PosteriorTarget } from "./posterior-target.js";
import { widenedToConditionals } from "./conditional-widths.js";
import { modeCovariance } from "./mode-covariance.js";
import { paretoShapeThreshold, type SmoothedWeights } from "./pareto-smoothed-weights.js";
import { profileProposal, type ImportanceProposal, type ProfileProposalOptions } from "./profile-proposal.js";
import { proposalMixture, weightedMomentProposal } from "./proposal-mixture.js";
import { studentTProposal } from "./student-t-proposal.js";

/** Options of {@link importanceSample}. */
export interface ImportanceSamplingOptions {
  /** Draws from the Laplace proposal, the pilot round (default max(300, 50 d) in d dimensions). */
  readonly pilotDraws?: number;
  /**
   * Draws from each refitted proposal (default max(400, 150 d): weighted moments in six dimensions need
   * several hundred draws; more are added when the ESS falls short).
   */
  readonly draws?: number;
  /** Most draws in all (default 8000). */
  readonly maxDraws?: number;
  /**
   * Most draws from one refitted component before the next refit, while k-hat holds and the ESS is short
   * (default: no limit, up to `maxDraws`). A component whose ESS grows slowly is then replaced by one
   * fitted to more draws instead of being drawn from to the end of the budget.
   */
  readonly maxDrawsPerRefit?: number;
  /** Smallest acceptable effective sample size of the smoothed weights (default 400, as for MCMC). */
  readonly minimumEss?: number;
  /** Degrees of freedom of the Student-t proposals (default 5). */
  readonly degreesOfFreedom?: number;
  /** Factor on the Laplace covariance for the pilot proposal (default 2: wider than the curvature says). */
  readonly pilotInflation?: number;
  /** Most components refitted to the weighted draws (default 4). */
  readonly refits?: number;
  /**
   * Factor on the weighted covariance of a refitted component: default 1 in up to two dimensions, 2.25
   * (1.5 times the scale) in more. The weighted moments of draws from a proposal thinner than the target
   * underestimate its tails, and in 4-6 dimensions (quasi-periodic models) a refit at the plain moments
   * left k-hat at 0.70-0.97 where 1.5 times the scale gave 0.53-0.60 (bench/README.md, "Quasi-periodic
   * fits by default").
   */
  readonly refitInflation?: number;
  /** Two-dimensional targets: draws from the ridge-following profile proposal (default 700), besides the pilot's. */
  readonly profileDraws?: number;
  /** Two-dimensional targets: use the profile proposal (default true). */
  readonly profile?: boolean;
  /** Settings of the profile proposal. */
  readonly profileOptions?: ProfileProposalOptions;
  /**
   * The covariance of a t at a mode (row-major d x d), undefined when there is none: default
   * `modeCovariance`. A caller may supply one that copes with densities it knows to be awkward there.
   */
  readonly covariance?: (target: PosteriorTarget, mode: Float64Array) => Float64Array | undefined;
  /**
   * Largest acceptable k-hat; default {@link paretoShapeThreshold} of the number of draws (0.67 at
   * 1000 draws, 0.7 from 2154).
   */
  readonly shapeThreshold?: number;
  /**
   * Widen the pilot's covariance to each coordinate's conditional width measured on a grid through the mode
   * (`widenedToConditionals`), for likelihoods that are not differentiable at the mode (lagged bands
   * of a damped random walk); "shift" also moves the pilot to the conditional means. Default false.
   */
  readonly conditionalWidening?: boolean | "shift";
}

/** One component of the proposal mixture. */
export interface ImportanceRound {
  /**
   * "laplace" (a t at the mode with the curvature, the pilot), "profile" (following the ridge of a
   * two-dimensional target, {@link profileProposal}), "weighted-moments" (refitted to the weighted draws
   * before it) or "defensive" (the wide component of a mode mixture, modeMixtureSample).
   */
  readonly proposal: "laplace" | "profile" | "weighted-moments" | "defensive";
  /** Draws taken from this component. */
  readonly draws: number;
  /** k-hat and ESS of all draws so far, after this component's draws were added. */
  readonly paretoShape: number;
  readonly effectiveSampleSize: number;
}

/** What {@link importanceSample} returns. */
export interface ImportanceSample {
  /** Whether the diagnostics hold: k-hat at most the threshold and the ESS at least the minimum. */
  readonly accepted: boolean;
  /** Why the draws were not accepted (absent when accepted). */
  readonly reason?: string;
  /** Every draw, in the target's coordinates (empty when no draw was made). */
  readonly points: readonly Float64Array[];
  /** ln p of each draw (the target's unnormalised log posterior). */
  readonly logPosterior: Float64Array;
  /** Pareto-smoothed normalised weights of the draws. */
  readonly weights: Float64Array;
  /**
   * ln p - ln q_mix of each draw, before smoothing (q_mix the mixture of every component, normalised):
   * the mean of their exponentials estimates the target's normalising constant.
   */
  readonly logRatios: Float64Array;
  /** k-hat of the weights (NaN when the tail could not be fitted). */
  readonly paretoShape: number;
  /** The threshold k-hat was compared with. */
  readonly shapeThreshold: number;
  /** ESS of the smoothed weights, 1 / sum w^2. */
  readonly effectiveSampleSize: number;
  /** The components of the proposal mixture, in the order they were used. */
  readonly rounds: readonly ImportanceRound[];
}

/**
 * Pareto-smoothed importance sampling (Vehtari, Simpson, Gelman, Yao & Gabry 2024, JMLR 25, from memory)
 * from a mixture of two Student-t proposals:
 * 1. pilot: `pilotDraws` from a t centred on the mode with `pilotInflation` times the Laplace covariance
 *    (-H)^-1 as its scale matrix ({@link modeCovariance});
 * 2. main: a t with the weighted mean and covariance of the pilot (adapting the proposal to the target,
 *    as in Cappe et al. 2008, Stat. Comput. 18, 447, from memory), `draws` draws;
 * 3. every draw weighted by p / q_mix with the deterministic mixture q_mix = sum_j (n_j / n) q_j of the
 *    components it could have come from (the balance heuristic of Veach & Guibas 1995 and Owen & Zhou
 *    2000, J. Am. Stat. Assoc. 95, 135), the weights Pareto-smoothed ({@link paretoSmoothedWeights});
 * 4. if k-hat is at most the threshold and the ESS short of the minimum, more draws from the main
 *    component (up to `maxDraws` in all); if k-hat exceeds it, one more component refitted to all the
 *    weighted draws, and then the same test.
 * Accepts when k-hat <= threshold and ESS >= minimum; otherwise says why not (the caller falls back to
 * MCMC). The k-hat threshold guards the reliability of the weighted estimates, the ESS their precision
 * (with ESS = 400 the Monte Carlo error of a median is about 5% of the posterior sd).
 *
 * Why a mixture: the Laplace approximation is centred on the mode, and a skewed posterior (a damped
 * random walk's timescale has a long tail towards the baseline) puts mass where a t at the mode is
 * thin; the weighted moments move the main component there, and the pilot, kept in the mixture, still
 * covers the mode's neighbourhood, so no region the pilot saw gets weights from one thin component.
 */
export function importanceSample(target: PosteriorTarget, mode: Float64Array, rng: Rng, options: ImportanceSamplingOptions = {}): ImportanceSample {
  const d = target.dimension;
  const pilotDraws = Math.max(100, Math.round(options.pilotDraws ?? Math.max(300, 50 * d)));
  const mainDraws = Math.max(100, Math.round(options.draws ?? Math.max(400, 150 * d)));
  const maxDraws = Math.max(pilotDraws + mainDraws, Math.round(options.maxDraws ?? 8000));
  const minimumEss = options.minimumEss ?? 400;
  const nu = options.degreesOfFreedom ?? 5;
  const inflation = options.pilotInflation ?? 2;
  const maxRefits = options.refits ?? 4;
  const rounds: ImportanceRound[] = [];
  const empty = (reason: string): ImportanceSample => ({
    accepted: false,
    reason,
    points: [],
    logPosterior: new Float64Array(0),
    weights: new Float64Array(0),
    logRatios: new Float64Array(0),
    paretoShape: NaN,
    shapeThreshold: NaN,
    effectiveSampleSize: 0,
    rounds,
  });

  const laplace = (options.covariance ?? modeCovariance)(target, mode);
  if (laplace === undefined) return empty("the log density is not curved downwards in every direction at the mode");
  const widened = options.conditionalWidening ? widenedToConditionals(target, mode, laplace, options.conditionalWidening === "shift") : undefined;
  const covariance = widened?.covariance ?? laplace;
  const centre = widened?.location ?? mode;
  const mixture = proposalMixture(target, rng);
  const { points, componentDraws } = mixture;
  const drawFrom = mixture.drawFrom;
  const smooth = mixture.smooth;
  const record = (kind: ImportanceRound["proposal"], draws: number, smoothed: SmoothedWeights) =>
    rounds.push({ proposal: kind, draws, paretoShape: smoothed.paretoShape, effectiveSampleSize: smoothed.effectiveSampleSize });

  mixture.add(studentTProposal(centre, covariance.map((c) => inflation * c), nu));
  const drawUntilEss = (j: number) => {
    // More draws from component j while k-hat is fine and the ESS short: the ESS grows about in
    // proportion to the draws, so ask for 10% more than that predicts.
    let smoothed = smooth();
    const limit = () => Math.min(maxDraws, points.length + Math.max(0, (options.maxDrawsPerRefit ?? Infinity) - componentDraws[j]));
    while (smoothed.paretoShape <= threshold(points.length) && smoothed.effectiveSampleSize < minimumEss && points.length < limit()) {
      const wanted = Math.ceil((1.1 * points.length * minimumEss) / Math.max(1, smoothed.effectiveSampleSize));
      drawFrom(j, Math.min(limit(), Math.max(wanted, points.length + 100)) - points.length);
      smoothed = smooth();
    }
    return smoothed;
  };
  let smoothed: SmoothedWeights;
  const ridge = d === 2 && options.profile !== false ? profileFromCovariance(target, mode, covariance, options.profileOptions) : undefined;
  if (ridge !== undefined) {
    // The pilot stays in the mixture as a defensive component (Hesterberg 1995, Technometrics 37, 185):
    // its heavier tails bound the weights wherever the profile proposal is thin.
    drawFrom(0, Math.max(100, Math.round(pilotDraws / 3)));
    mixture.add(ridge);
    drawFrom(1, Math.max(100, Math.round(options.profileDraws ?? 700)));
    smoothed = drawUntilEss(1);
    record("laplace", componentDraws[0], smoothed);
    record("profile", componentDraws[1], smoothed);
  } else {
    drawFrom(0, pilotDraws);
    smoothed = smooth();
    record("laplace", pilotDraws, smoothed);
  }
  const holds = (w: SmoothedWeights) => w.paretoShape <= threshold(points.length) && w.effectiveSampleSize >= minimumEss;
  for (let refits = 0; refits < maxRefits && !holds(smoothed) && points.length < maxDraws; refits++) {
    const refitted = weightedMomentProposal(points, smoothed.weights, nu, undefined, refitInflation(d, options));
    if (refitted === undefined) break;
    const j = mixture.add(refitted);
    drawFrom(j, Math.min(mainDraws, maxDraws - points.length));
    smoothed = drawUntilEss(j);
    record("weighted-moments", componentDraws[j], smoothed);
  }
  const shapeThreshold = threshold(points.length);
  const result = {
    points,
    logPosterior: Float64Array.from(mixture.logPosterior),
    weights: smoothed.weights,
    logRatios: mixture.logRatios(),
    paretoShape: smoothed.paretoShape,
    shapeThreshold,
    effectiveSampleSize: smoothed.effectiveSampleSize,
    rounds,
  };
  if (!(smoothed.paretoShape <= shapeThreshold)) {
    const shape = Number.isNaN(smoothed.paretoShape) ? "could not be estimated" : `is ${smoothed.paretoShape.toFixed(2)}`;
    return { accepted: false, reason: `k-hat ${shape} (threshold ${shapeThreshold.toFixed(2)})`, ...result };
  }
  if (smoothed.effectiveSampleSize < minimumEss) {
    return { accepted: false, reason: `the weights' ESS stayed at ${smoothed.effectiveSampleSize.toFixed(0)} (< ${minimumEss}) with ${points.length} draws`, ...result };
  }
  return { accepted: true, ...result };

  function threshold(count: number): number {
    return options.shapeThreshold ?? paretoShapeThreshold(count);
  }
}
/** The profile proposal of a two-dimensional target, its scales taken from the Laplace covariance. */
function profileFromCovariance(target: PosteriorTarget, mode: Float64Array, covariance: Float64Array, options: ProfileProposalOptions = {}): ImportanceProposal | undefined {
  const a = options.coordinate ?? 0;
  const b = 1 - a;
  const marginal = Math.sqrt(covariance[a * 2 + a]);
  // Conditional variance of b given a for a Gaussian: S_bb - S_ab^2 / S_aa.
  const conditional = Math.sqrt(covariance[b * 2 + b] - covariance[a * 2 + b] ** 2 / covariance[a * 2 + a]);
  if (!(marginal > 0 && conditional > 0)) return undefined;
  return profileProposal(target, mode, marginal, conditional, options)?.proposal;
}

/** The factor on a refitted component's covariance ({@link ImportanceSamplingOptions.refitInflation}). */
export function refitInflation(dimension: number, options: { readonly refitInflation?: number }): number {
  return options.refitInflation ?? (dimension <= 2 ? 1 : 2.25);
}
