import { DEFAULT_SAMPLER, modeMixturePosterior, posteriorByMethod, type MethodPosterior, type ModeMixtureAttempt, type PhysicalLikelihood } from "../inference/index.js";
import type { LightCurve } from "../lightcurve/light-curve.js";
import { childSeed } from "../random/rng.js";
import type { FitOptions } from "./fit-options.js";
import type { ModePlan } from "./fit-mode-plan.js";
import type { LightCurveModel } from "./light-curve-model.js";
import { collapseMean, type CollapsedMeanModel } from "./mean-marginal.js";

/** The posterior of each start of the {@link ModePlan}, by whichever method computed it. */
export interface SamplingOutcome {
  readonly runs: readonly MethodPosterior[];
  /** Share of the pooled draws each run contributes (sums to 1). */
  readonly weights: readonly number[];
  /** The model with its mean integrated out, when the runs sampled it so (draws lack the mean). */
  readonly collapsed?: CollapsedMeanModel;
}

/** Default budget of a fit in log-likelihood evaluations (gradients weighted by their cost). */
export const DEFAULT_FIT_BUDGET = 2e6;

/**
 * The sampling stage of a fit. By default (importance sampling, {@link fitMethod}) a periodic model whose
 * modes were found gets one importance sample from a mixture with a component at every mode of the plan
 * ({@link modeMixturePosterior}: P, P/2, 2P and the daily aliases, the weights sharing the draws among
 * them by posterior mass); any other model gets it from its mode ({@link posteriorByMethod}). When the
 * diagnostics (k-hat, ESS) fail, or with `sampler` or `method: "mcmc"`, the MCMC sampler runs from each
 * start of the plan, the budget (less what importance sampling spent) shared equally, and the runs are
 * pooled by the plan's weights. Importance sampling and the ensemble work with the mean integrated out
 * (mean-marginal.ts); NUTS, which needs a gradient, samples the mean with the rest. One start keeps
 * the fit's seed; several get child seeds 100, 101, ...
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
  const sampledLikelihood = collapsed?.likelihood ?? likelihood;
  const sampledOnly = (record: Readonly<Record<string, number>>): Record<string, number> =>
    Object.fromEntries(Object.entries(record).filter(([name]) => space.names.includes(name)));
  const method = fitMethod(model, options, true);
  let attempt: ModeMixtureAttempt | undefined;
  if (method === "importance" && plan.modes.length > 0) {
    attempt = modeMixturePosterior(space, sampledLikelihood, {
      seed: options.seed,
      starts: plan.modes.map((m) => sampledOnly(m.parameters)),
      maxEvaluations: budget,
      ...(options.importance ? { importance: options.importance } : {}),
      clock,
    });
    if (attempt.posterior) return { runs: [attempt.posterior], weights: [1], ...(collapsed ? { collapsed } : {}) };
  }
  const spent = attempt?.evaluations ?? 0;
  const runs = plan.starts.map((initial, k) =>
    posteriorByMethod(space, sampledLikelihood, {
      seed: plan.starts.length === 1 ? options.seed : childSeed(options.seed, 100 + k),
      initial: sampledOnly(initial),
      starts: plan.startsAtModes ? 1 : 6,
      maxEvaluations: (budget - spent) / plan.starts.length,
      ...(options.sampler ? { sampler: options.sampler } : {}),
      method: attempt ? "mcmc" : method,
      ...(options.importance ? { importance: options.importance } : {}),
      ...(options.onProgress ? { onProgress: options.onProgress } : {}),
      ...(options.signal ? { signal: options.signal } : {}),
      clock,
    }),
  );
  return { runs: attempt ? withFallback(runs, attempt) : runs, weights: plan.weights, ...(collapsed ? { collapsed } : {}) };
}

/** The MCMC runs after a failed mode-mixture attempt: the first charged with its evaluations and saying why the runs were needed. */
function withFallback(runs: readonly MethodPosterior[], attempt: ModeMixtureAttempt): MethodPosterior[] {
  const figures = {
    paretoK: attempt.sample.paretoShape,
    paretoKThreshold: attempt.sample.shapeThreshold,
    importanceDraws: attempt.sample.points.length,
    importanceFallback: attempt.reason ?? "importance sampling failed",
  };
  return runs.map((run, k) =>
    k === 0 ? { ...run, diagnostics: { ...run.diagnostics, ...figures, likelihoodEvaluations: run.diagnostics.likelihoodEvaluations + attempt.evaluations } } : run,
  );
}

/**
 * Whether a fit tries importance sampling first. `method: "importance"` does for any model, and
 * `method: "auto"` (the default) for models without a period and, when the caller draws from a mixture
 * with a component at each period mode the mode search found (`modeMixture`: {@link sampleStarts} does,
 * P, P/2, 2P and the daily aliases of three periodogram peaks; fit-mode-plan.ts), for periodic ones too.
 * A proposal centred on one period mode never draws from another, and k-hat cannot see what no
 * component is near, so a caller without the mixture keeps MCMC for periodic models under "auto".
 * `method: "mcmc"`, or giving `sampler`, runs MCMC only.
 */
export function fitMethod(model: Pick<LightCurveModel, "space">, options: FitOptions, modeMixture = false): "importance" | "mcmc" {
  const asked = options.method ?? (options.sampler !== undefined ? "mcmc" : "auto");
  if (asked !== "auto") return asked;
  return modeMixture || !model.space.names.includes("period") ? "importance" : "mcmc";
}
