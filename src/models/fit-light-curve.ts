import {
  DEFAULT_SAMPLER,
  posteriorDraws,
  samplePosterior,
  summarizeDraws,
  type PosteriorDraws,
  type PosteriorSample,
  type PosteriorSummary,
} from "../inference/index.js";
import type { LightCurve } from "../lightcurve/light-curve.js";
import { computePeriodogram } from "../periodogram/periodogram.js";
import { childSeed, createRng } from "../random/rng.js";
import { HOROLOGIUM_VERSION } from "../version.js";
import { summarizeLightCurve, type DataSummary } from "./data-summary.js";
import { derivedQuantities } from "./derived-quantities.js";
import { fitWarnings } from "./fit-warnings.js";
import type { FitOptions } from "./fit-options.js";
import type { FitResult, ParameterSummary } from "./fit-result.js";
import { buildModel, modelLikelihood, type LightCurveModel } from "./light-curve-model.js";
import { collapseMean, restoreMean } from "./mean-marginal.js";
import { findPeriodModes, type PeriodMode } from "./period-modes.js";
import { robustNoiseWeights, withNoiseWeights, type RobustNoise } from "./robust-noise.js";

/** Everything a fit produces: the result JSON plus the model and draws, for predictions and reports. */
export interface DetailedFit {
  readonly result: FitResult;
  readonly model: LightCurveModel;
  readonly summary: DataSummary;
  /** Pooled posterior draws (all chains, physical units). */
  readonly draws: PosteriorDraws;
  /** The sampler run of each period mode (one run when the posterior is unimodal). */
  readonly runs: readonly PosteriorSample[];
  readonly modes: readonly PeriodMode[];
  /** The light curve the posterior is conditioned on (errors inflated by the robust weights, if any). */
  readonly conditioning: LightCurve;
  readonly robust?: RobustNoise;
}

/** Modes carrying less posterior probability than this are reported but not sampled. */
const MODE_THRESHOLD = 0.01;

/**
 * Fits a model of the trade to one light curve and returns the result JSON (DESIGN.md contract).
 * See {@link fitLightCurveDetailed}.
 */
export function fitLightCurve(lightCurve: LightCurve, options: FitOptions): FitResult {
  return fitLightCurveDetailed(lightCurve, options).result;
}

/**
 * Fits a model to one light curve:
 * 1. priors from the data's own scales (`buildModel`);
 * 2. for periodic models, a generalised Lomb-Scargle periodogram (Zechmeister & Kurster 2009) gives the
 *    first guess of the period, and the modes at P, P/2 and 2P are located and weighted by their Laplace
 *    evidence; every mode with more than 1% of the probability is sampled, and the draws are pooled in
 *    proportion to the modes' probabilities, so a multimodal posterior is reported as such;
 * 3. the posterior is sampled until converged or out of budget (`samplePosterior`); with the ensemble
 *    sampler the constant mean is integrated out analytically and drawn afterwards from its conditional
 *    posterior (`collapseMean`), which removes the funnel between timescale and mean;
 * 4. summaries, derived quantities (SF_inf, rest-frame tau, coherence time), diagnostics and warnings.
 */
export function fitLightCurveDetailed(lightCurve: LightCurve, options: FitOptions): DetailedFit {
  const clock = options.clock ?? (() => performance.now());
  const start = clock();
  const summary = summarizeLightCurve(lightCurve);
  const periodic = options.model !== "drw";
  let periodGuess: number | undefined;
  if (periodic) {
    const peaks = computePeriodogram(
      { time: lightCurve.time, value: lightCurve.value, ...(lightCurve.error ? { error: lightCurve.error } : {}) },
      { minimumFrequency: 2 / summary.baseline, maximumFrequency: 1 / (2 * Math.max(summary.minimumSpacing, summary.baseline * 1e-6)), peaks: 1 },
    ).peaks;
    periodGuess = peaks[0]?.period;
  }
  const model = buildModel(options.model, summary, {
    ...(options.background ? { background: options.background } : {}),
    ...(options.jitter ? { jitter: true } : {}),
    ...(periodGuess !== undefined ? { periodGuess } : {}),
  });
  let robust: RobustNoise | undefined;
  let conditioning = lightCurve;
  if (options.robust) {
    robust = robustNoiseWeights(model, lightCurve);
    conditioning = withNoiseWeights(lightCurve, robust.weights);
  }
  const likelihood = modelLikelihood(model, conditioning);
  const modes = periodic && periodGuess !== undefined ? findPeriodModes(model, likelihood, model.initialGuess.period) : [];
  const sampled = modes.filter((m) => m.probability >= MODE_THRESHOLD);
  const starts = sampled.length > 0 ? sampled.map((m) => m.parameters) : [model.initialGuess];
  const budget = options.maxEvaluations ?? 2e6;
  // The ensemble samples the other parameters with the mean integrated out (mean-marginal.ts); NUTS,
  // which needs a gradient, samples the mean with them.
  const collapsed = (options.sampler ?? DEFAULT_SAMPLER) === "ensemble" ? collapseMean(model, conditioning) : undefined;
  const sampledSpace = collapsed?.space ?? model.space;
  const withoutMean = (record: Readonly<Record<string, number>>): Record<string, number> =>
    Object.fromEntries(Object.entries(record).filter(([name]) => sampledSpace.names.includes(name)));
  const runs = starts.map((initial, k) =>
    samplePosterior(sampledSpace, collapsed?.likelihood ?? likelihood, {
      seed: starts.length === 1 ? options.seed : childSeed(options.seed, 100 + k),
      initial: withoutMean(initial),
      starts: sampled.length > 0 ? 1 : 6,
      maxEvaluations: budget / starts.length,
      ...(options.sampler ? { sampler: options.sampler } : {}),
      ...(options.onProgress ? { onProgress: options.onProgress } : {}),
      ...(options.signal ? { signal: options.signal } : {}),
      clock,
    }),
  );
  const weights = sampled.length > 0 ? renormalised(sampled.map((m) => m.probability)) : [1];
  const runDraws = runs.map((run, k) => {
    const sampledDraws = posteriorDraws(run.space, run.run);
    return collapsed ? restoreMean(model, collapsed, sampledDraws, createRng(childSeed(options.seed, 200 + k))) : sampledDraws;
  });
  const draws = pooledDraws(runDraws, weights);
  let maximumPosterior = runs[0].maximum;
  if (collapsed) {
    const meanAtMaximum = collapsed.meanPosterior(collapsed.space.physicalFromRecord(maximumPosterior)).mean;
    maximumPosterior = Object.fromEntries(model.space.names.map((name) => [name, name === "mean" ? meanAtMaximum : maximumPosterior[name]!]));
  }
  const parameters: Record<string, ParameterSummary> = {};
  for (const name of model.space.names) parameters[name] = compactSummary(summarizeDraws(draws.columns[name]));
  const derived: Record<string, ParameterSummary & { description: string }> = {};
  for (const quantity of derivedQuantities(options.model, options.redshift)) {
    const values = new Float64Array(draws.chain.length);
    const record: Record<string, number> = {};
    for (let k = 0; k < values.length; k++) {
      for (const name of draws.names) record[name] = draws.columns[name][k];
      values[k] = quantity.compute(record);
    }
    derived[quantity.name] = { ...compactSummary(summarizeDraws(values)), description: quantity.description };
  }
  const worst = (pick: (run: PosteriorSample) => number, better: (a: number, b: number) => number) =>
    runs.map(pick).reduce(better);
  const diagnostics = {
    converged: runs.every((run) => run.diagnostics.converged),
    rhatMax: worst((run) => run.diagnostics.rhatMax, Math.max),
    rhatThreshold: worst((run) => run.diagnostics.rhatThreshold, Math.min),
    essMin: worst((run) => run.diagnostics.essMin, Math.min),
    autocorrTime: worst((run) => run.diagnostics.autocorrTime, Math.max),
    acceptance: runs.reduce((sum, run) => sum + run.diagnostics.acceptance, 0) / runs.length,
    logProbEvaluations: runs.reduce((sum, run) => sum + run.diagnostics.logProbEvaluations, 0),
    seconds: (clock() - start) / 1000,
    sampler: runs[0].sampler,
    stopReason: runs.every((run) => run.stopReason === "converged") ? "converged" : runs.find((run) => run.stopReason !== "converged")!.stopReason,
  };
  const provenance = lightCurve.provenance;
  const data = {
    n: summary.n,
    dropped: provenance.dropped,
    baseline: summary.baseline,
    medianCadence: summary.medianCadence,
    timeColumn: provenance.timeColumn,
    valueColumn: provenance.valueColumn,
    errorColumn: provenance.errorColumn,
    source: provenance.source,
    unit: lightCurve.unit,
    ...(lightCurve.band !== undefined ? { band: lightCurve.band } : {}),
  };
  const result: FitResult = {
    model: options.model,
    seed: options.seed,
    version: HOROLOGIUM_VERSION,
    data,
    parameters,
    derived,
    diagnostics,
    warnings: [
      ...fitWarnings({ model, summary, lightCurve, parameters, diagnostics, modes, redshift: options.redshift }),
      ...(robust ? robustWarnings(robust) : []),
    ],
    options: {
      ...(options.background ? { background: options.background } : {}),
      ...(options.redshift !== undefined ? { redshift: options.redshift } : {}),
      ...(model.fitsJitter ? { jitter: true } : {}),
      ...(robust ? { robust: true } : {}),
    },
    ...(robust
      ? {
          robust: {
            noise: `Student-t, ${robust.degreesOfFreedom} degrees of freedom (scale mixture of Gaussians, EM weights)`,
            degreesOfFreedom: robust.degreesOfFreedom,
            likelyOutliers: robust.outlierProbability.filter((p) => p > 0.5).length,
            weights: Array.from(robust.weights),
            outlierProbability: Array.from(robust.outlierProbability),
          },
        }
      : {}),
    priors: Object.fromEntries(model.space.free.map((p) => [p.name, { family: p.prior.family, ...p.prior.settings }])),
    maximumPosterior,
    ...(modes.length > 0 ? { periodModes: modes.map((m) => ({ period: m.period, probability: m.probability })) } : {}),
    ...(periodGuess !== undefined ? { periodogramPeriod: periodGuess } : {}),
    posteriorSample: thinnedSample(draws, options.keptDraws ?? 400),
  };
  return { result, model, summary, draws, runs, modes, conditioning, ...(robust ? { robust } : {}) };
}

function robustWarnings(robust: RobustNoise): string[] {
  const likely = robust.outlierProbability.filter((p) => p > 0.5).length;
  return likely > 0
    ? [`${likely} points are likely outliers (probability > 0.5 that their scatter exceeds twice their error bar); the Student-t noise down-weights them.`]
    : [];
}

function renormalised(weights: number[]): number[] {
  const total = weights.reduce((a, b) => a + b, 0);
  return weights.map((w) => w / total);
}

/** Pools the draws of several mode runs, keeping from each a share proportional to its weight. */
function pooledDraws(all: PosteriorDraws[], weights: number[]): PosteriorDraws {
  if (all.length === 1) return all[0];
  const size = Math.min(...all.map((d, k) => d.chain.length / weights[k]));
  const picks = all.map((d, k) => evenlySpaced(d.chain.length, Math.max(1, Math.round(size * weights[k]))));
  const names = all[0].names;
  const columns: Record<string, Float64Array> = {};
  for (const name of names) columns[name] = Float64Array.from(picks.flatMap((p, k) => p.map((i) => all[k].columns[name][i])));
  let chainOffset = 0;
  const chain: number[] = [];
  picks.forEach((p, k) => {
    const chains = Math.max(...all[k].chain) + 1;
    p.forEach((i) => chain.push(all[k].chain[i] + chainOffset));
    chainOffset += chains;
  });
  return {
    names,
    columns,
    chain: Int32Array.from(chain),
    iteration: Int32Array.from(picks.flatMap((p, k) => p.map((i) => all[k].iteration[i]))),
    logDensity: Float64Array.from(picks.flatMap((p, k) => p.map((i) => all[k].logDensity[i]))),
  };
}

function evenlySpaced(length: number, count: number): number[] {
  const n = Math.min(length, count);
  return Array.from({ length: n }, (_, k) => Math.floor((k * length) / n));
}

/** The DESIGN.md summary keys plus the 95% highest-density interval. */
function compactSummary(s: PosteriorSummary): ParameterSummary & { hdi95: readonly [number, number] } {
  return { median: s.median, mean: s.mean, sd: s.sd, "q2.5": s["q2.5"], q16: s.q16, q84: s.q84, "q97.5": s["q97.5"], hdi95: s.hdi95 };
}

/** At most `count` draws spread evenly over the pooled draws, for predictions and reports from the JSON. */
function thinnedSample(draws: PosteriorDraws, count: number) {
  const picks = evenlySpaced(draws.chain.length, count);
  return {
    names: draws.names,
    chain: picks.map((i) => draws.chain[i]),
    rows: picks.map((i) => draws.names.map((name) => draws.columns[name][i])),
  };
}
