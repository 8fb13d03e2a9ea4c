import { DEFAULT_SAMPLER, posteriorByMethod, type MethodPosterior, type PhysicalLikelihood } from "../inference/index.js";
import type { LightCurve } from "../lightcurve/light-curve.js";
import { childSeed } from "../random/rng.js";
import type { FitOptions } from "./fit-options.js";
import type { ModePlan } from "./fit-mode-plan.js";
import type { LightCurveModel } from "./light-curve-model.js";
import { collapseMean, type CollapsedMeanModel } from "./mean-marginal.js";

/** The posterior of each start of the {@link ModePlan}, by whichever method computed it. */
export interface SamplingOutcome {
  readonly runs: readonly MethodPosterior[];
  /** The model with its mean integrated out, when the runs sampled it so (draws lack the mean). */
  readonly collapsed?: CollapsedMeanModel;
}

/** Default budget of a fit in log-likelihood evaluations (gradients weighted by their cost). */
export const DEFAULT_FIT_BUDGET = 2e6;

/**
 * The sampling stage of a fit: the posterior from each start of the plan by {@link posteriorByMethod}
 * (Pareto-smoothed importance sampling, with the MCMC sampler when its diagnostics fail; MCMC only when
 * `sampler` or `method: "mcmc"` is given), the budget shared equally. Importance sampling and the
 * ensemble work with the mean integrated out (mean-marginal.ts); NUTS, which needs a gradient, samples
 * the mean with the rest. One start keeps the fit's seed; several get child seeds 100, 101, ...
 */
export function sampleStarts(
  model: LightCurveModel,
  conditioning: LightCurve,
  likelihood: PhysicalLikelihood,
  plan: ModePlan,
  options: FitOptions,
  clock: () => number,
): SamplingOutcome {
  const budget = options.maxEvaluations ?? DEFAULT_FIT_BUDGET;
  const collapsed = (options.sampler ?? DEFAULT_SAMPLER) === "ensemble" ? collapseMean(model, conditioning) : undefined;
  const space = collapsed?.space ?? model.space;
  const sampledOnly = (record: Readonly<Record<string, number>>): Record<string, number> =>
    Object.fromEntries(Object.entries(record).filter(([name]) => space.names.includes(name)));
  const runs = plan.starts.map((initial, k) =>
    posteriorByMethod(space, collapsed?.likelihood ?? likelihood, {
      seed: plan.starts.length === 1 ? options.seed : childSeed(options.seed, 100 + k),
      initial: sampledOnly(initial),
      starts: plan.startsAtModes ? 1 : 6,
      maxEvaluations: budget / plan.starts.length,
      ...(options.sampler ? { sampler: options.sampler } : {}),
      method: fitMethod(model, options),
      ...(options.importance ? { importance: options.importance } : {}),
      ...(options.onProgress ? { onProgress: options.onProgress } : {}),
      ...(options.signal ? { signal: options.signal } : {}),
      clock,
    }),
  );
  return { runs, ...(collapsed ? { collapsed } : {}) };
}

/**
 * Whether a fit tries importance sampling first. `method: "auto"` (the default) does for models without
 * a period (the damped random walk) and not for periodic ones: a period posterior can have modes the
 * mode search did not find (aliases, and broad modes of a short coherence time), and a proposal centred
 * on one mode never draws from another, which k-hat cannot see; the walkers of the ensemble can cross
 * to it. `method: "importance"` tries it for any model (bench/samplers-rotation-times.ts measures it on
 * quasi-periodic fits); `method: "mcmc"`, or giving `sampler`, runs MCMC only.
 */
export function fitMethod(model: Pick<LightCurveModel, "space">, options: FitOptions): "importance" | "mcmc" {
  const asked = options.method ?? (options.sampler !== undefined ? "mcmc" : "auto");
  if (asked === "auto") return model.space.names.includes("period") ? "mcmc" : "importance";
  return asked;
}
