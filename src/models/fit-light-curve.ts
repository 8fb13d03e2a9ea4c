import type { MethodPosterior, PosteriorDraws } from "../inference/index.js";
import type { LightCurve } from "../lightcurve/light-curve.js";
import { summarizeLightCurve, type DataSummary } from "./data-summary.js";
import { explainingUnfittable, requireEnoughPoints, requireVariableData } from "./fit-data-support.js";
import { combinedDiagnostics, requireKeptDraws } from "./fit-diagnostics.js";
import { restoredPosterior } from "./fit-mean-restoration.js";
import { planModes } from "./fit-mode-plan.js";
import type { FitOptions } from "./fit-options.js";
import { periodogramPeaks } from "./fit-period-search.js";
import { pooledDraws, summaryDrawLimit, thinnedDraws } from "./fit-pooling.js";
import { assembleFitResult } from "./fit-result-assembly.js";
import type { FitResult } from "./fit-result.js";
import { noiseConditioning, periodSearchCurve } from "./fit-robust-stage.js";
import { stageTimer, type StageSeconds } from "./fit-stage-timer.js";
import { sampleStarts } from "./fit-sampling.js";
import { posteriorSummaries } from "./fit-summaries.js";
import { buildModel, modelLikelihood, type LightCurveModel } from "./light-curve-model.js";
import { drawnPeriodModes, type PeriodMode } from "./period-modes.js";
import { modelPeriodRange } from "./period-range.js";
import { carmaOrderOf } from "./carma-model.js";
import type { RobustNoise } from "./robust-noise.js";

/** Everything a fit produces: the result JSON plus the model and draws, for predictions and reports. */
export interface DetailedFit {
  readonly result: FitResult;
  readonly model: LightCurveModel;
  readonly summary: DataSummary;
  /** Pooled posterior draws (all chains, physical units). */
  readonly draws: PosteriorDraws;
  /** The posterior of each period mode (one when the posterior is unimodal), by whichever method computed it. */
  readonly runs: readonly MethodPosterior[];
  readonly modes: readonly PeriodMode[];
  /** The light curve the posterior is conditioned on (errors inflated by the robust weights, if any). */
  readonly conditioning: LightCurve;
  readonly robust?: RobustNoise;
  /** Wall time of each stage, seconds (data summary, periodogram, robust noise, modes, sampling, ...). */
  readonly stageSeconds: StageSeconds;
}

/**
 * Fits a model of the trade to one light curve and returns the result JSON (see {@link FitResult}).
 * See {@link fitLightCurveDetailed}.
 */
export function fitLightCurve(lightCurve: LightCurve, options: FitOptions): FitResult {
  return fitLightCurveDetailed(lightCurve, options).result;
}

/**
 * Fits a model to one light curve, in named stages (each in its own file):
 * 0. data support (`fit-data-support.ts`): data that cannot support any fit (one time, constant
 *    values, fewer points than parameters) end in an InputError; the period range (`period-range.ts`)
 *    from the cadence, or the user's limits;
 * 1. periodogram (`fit-period-search.ts`): for periodic models, the highest generalised Lomb-Scargle
 *    peak (Zechmeister & Kurster 2009) in the period range as the first guess of the period, and the
 *    next two highest as further starts of the mode search (with `robust`, gross outliers down-weighted
 *    by their residuals about a running median, `periodSearchCurve`);
 * 2. model (`buildModel`): priors from the data's own scales;
 * 3. robust noise (`fit-robust-stage.ts`): with `robust`, Student-t weights folded into the errors;
 * 4. modes (`fit-mode-plan.ts`): the period modes at P, P/2 and 2P of each of those peaks, weighted by
 *    their Laplace evidence; every mode with more than 1% of the probability gets a sampler start;
 * 5. sampling (`fit-sampling.ts`): the posterior by Pareto-smoothed importance sampling (for a
 *    periodic model one sample from a mixture with a component at every mode found, whose weights
 *    share the draws among the modes), or, when its diagnostics fail (or a sampler is asked for), by
 *    MCMC from each start until converged or out of budget; except with NUTS the constant mean is
 *    integrated out (`collapseMean`), which removes the funnel between timescale and mean;
 * 6. pooling (`fit-pooling.ts`): MCMC runs' draws in proportion to their modes' probabilities, so a
 *    multimodal posterior is reported as such;
 * 7. mean restoration (`fit-mean-restoration.ts`): the mean drawn back from its conditional posterior;
 * 8. summaries (`fit-summaries.ts`): parameters and derived quantities, and the modes the pooled draws
 *    sit in with their shares (`drawnPeriodModes`), which the result reports as `periodModes`;
 * 9. diagnostics (`fit-diagnostics.ts`): the runs' worst convergence figures;
 * 10. result (`fit-result-assembly.ts`): the result JSON with warnings.
 */
export function fitLightCurveDetailed(lightCurve: LightCurve, options: FitOptions): DetailedFit {
  const clock = options.clock ?? (() => performance.now());
  const start = clock();
  const timer = stageTimer(clock);
  const summary = summarizeLightCurve(lightCurve);
  requireVariableData(lightCurve, summary, options.model);
  const range = modelPeriodRange(options.model, summary, options, lightCurve.provenance.source);
  timer.lap("data summary");
  const peaks = range ? periodogramPeaks(periodSearchCurve(lightCurve, options.robust === true), range) : [];
  const periodGuess = peaks[0];
  timer.lap("periodogram");
  const model = buildModel(options.model, summary, {
    ...(options.background ? { background: options.background } : {}),
    ...(options.jitter ? { jitter: true } : {}),
    ...(periodGuess !== undefined ? { periodGuess } : {}),
    ...(range ? { periodRange: range } : {}),
    ...(options.order !== undefined ? { order: carmaOrderOf(options.order) } : {}),
  });
  requireEnoughPoints(lightCurve, model);
  // The stages that search the posterior, each of which can find no start with a finite density.
  const { conditioning, robust, likelihood, plan, runs, weights, collapsed } = explainingUnfittable(lightCurve, summary, options.model, () => {
    const noise = noiseConditioning(model, lightCurve, options.robust === true);
    timer.lap("robust noise");
    const likelihood = modelLikelihood(model, noise.conditioning);
    const plan = planModes(model, likelihood, periodGuess, noise.conditioning.time, peaks.slice(1));
    timer.lap("modes");
    const sampled = sampleStarts(model, noise.conditioning, likelihood, plan, options, clock);
    timer.lap("sampling");
    return { ...noise, likelihood, plan, ...sampled };
  });
  const pooled = pooledDraws(runs.map((run) => run.draws), weights);
  const kept = thinnedDraws(pooled, summaryDrawLimit(summary.n));
  timer.lap("pooling");
  const { draws, maximumPosterior } = restoredPosterior(model, collapsed, kept, runs[0].maximum, options.seed);
  timer.lap("mean restoration");
  const diagnostics = combinedDiagnostics(runs, (clock() - start) / 1000);
  requireKeptDraws(draws, diagnostics);
  const summaries = posteriorSummaries(draws, model.space.names, options.model, options.redshift);
  const periodModes = plan.modes.length > 0 && draws.columns.period ? drawnPeriodModes(draws.columns.period) : [];
  timer.lap("summaries");
  const result = assembleFitResult({
    options,
    lightCurve,
    summary,
    model,
    summaries,
    diagnostics,
    modes: periodModes,
    ...(periodGuess !== undefined ? { periodogramPeriod: periodGuess } : {}),
    ...(robust ? { robust } : {}),
    maximumPosterior,
    draws,
    runs,
    candidates: plan.modes,
  });
  timer.lap("result");
  return { result, model, summary, draws, runs, modes: plan.modes, conditioning, stageSeconds: timer.seconds, ...(robust ? { robust } : {}) };
}
