import { childSeed, createRng } from "../random/rng.js";
import { countEvaluations, evaluationCost } from "./evaluation-counter.js";
import { DEFAULT_GRADIENT_COST } from "./gradient-cost.js";
import { findMaximumPosterior } from "./maximum-posterior.js";
import { modeMixtureSample, type ModeMixtureOptions, type ModeMixtureSample } from "./mode-mixture-sampling.js";
import type { ParameterSpace } from "./parameter-space.js";
import { importancePosterior, MINIMUM_IMPORTANCE_BUDGET, type MethodPosterior } from "./posterior-by-method.js";
import { unconstrainedPosterior, type PhysicalLikelihood } from "./unconstrained-posterior.js";

/** Options of {@link modeMixturePosterior}. */
export interface ModeMixturePosteriorOptions {
  readonly seed: number | string;
  /** One optimiser start per candidate mode, physical parameters by name (a name left out starts at its prior median). */
  readonly starts: readonly Readonly<Record<string, number>>[];
  /** Budget in log-likelihood evaluations (default 2e6); the draws stop where it ends. */
  readonly maxEvaluations?: number;
  /** Cost of a gradient in log-likelihoods (default DEFAULT_GRADIENT_COST). */
  readonly gradientCost?: number;
  readonly importance?: ModeMixtureOptions;
  readonly clock?: () => number;
}

/** What {@link modeMixturePosterior} returns: the posterior when the diagnostics held, and what it cost either way. */
export interface ModeMixtureAttempt {
  /** The posterior by importance sampling, when k-hat and the ESS held. */
  readonly posterior?: MethodPosterior;
  /** The importance sample (also when it failed). */
  readonly sample: ModeMixtureSample;
  /** Evaluations spent (optimisations and draws, gradients weighted by their cost). */
  readonly evaluations: number;
  /** Why the sample was not accepted (absent when it was). */
  readonly reason?: string;
}

/**
 * The posterior of a multimodal model by importance sampling from a mixture with one component per
 * mode ({@link modeMixtureSample}): from each start, the maximum a posteriori of the density without
 * the Jacobian (the reported maximum is the highest of these) and then the mode of the unconstrained
 * density with it, which the components are centred on. When k-hat or the ESS fail, the attempt says
 * why and what it spent, and the caller runs MCMC. The mixture's weights share the draws among the
 * modes by their posterior mass, so one run covers every mode found.
 */
export function modeMixturePosterior(space: ParameterSpace, likelihood: PhysicalLikelihood, options: ModeMixturePosteriorOptions): ModeMixtureAttempt {
  const clock = options.clock ?? (() => performance.now());
  const startTime = clock();
  const gradientCost = options.gradientCost ?? DEFAULT_GRADIENT_COST;
  const optimiserTarget = countEvaluations(unconstrainedPosterior(space, likelihood, { jacobian: false }));
  const target = countEvaluations(unconstrainedPosterior(space, likelihood, { jacobian: true }));
  const spent = () => evaluationCost(optimiserTarget.counts, gradientCost) + evaluationCost(target.counts, gradientCost);
  const found = options.starts.map((start) => findMaximumPosterior(optimiserTarget, { starts: [space.toUnconstrained(space.physicalFromRecord(start))] }));
  const modes = found
    .map((f) => findMaximumPosterior(target, { starts: [f.x] }))
    .filter((m) => Number.isFinite(m.logPosterior))
    .sort((a, b) => b.logPosterior - a.logPosterior)
    .map((m) => m.x);
  const best = found.reduce((a, b) => (b.logPosterior > a.logPosterior ? b : a));
  const remaining = (options.maxEvaluations ?? 2e6) - spent();
  const rng = createRng(childSeed(options.seed, 4));
  // Too little budget left for a useful importance sample: no draws, and the caller's sampler stops on the budget.
  const sample =
    remaining >= MINIMUM_IMPORTANCE_BUDGET
      ? modeMixtureSample(target, modes, rng, { ...options.importance, maxDraws: Math.min(options.importance?.maxDraws ?? 8000, remaining) })
      : { ...modeMixtureSample(target, [], rng), reason: `${Math.round(remaining)} evaluations left after the optimisation, too few to try importance sampling` };
  const evaluations = spent();
  if (!sample.accepted) return { sample, evaluations, reason: sample.reason ?? "importance sampling failed" };
  const maximum = space.recordFromPhysical(space.toPhysical(best.x));
  return { posterior: importancePosterior(space, maximum, sample, evaluations, (clock() - startTime) / 1000, options.seed), sample, evaluations };
}
