import { childSeed, createRng, type Rng } from "../random/rng.js";
import { countEvaluations, evaluationCost } from "./evaluation-counter.js";
import { DEFAULT_GRADIENT_COST } from "./gradient-cost.js";
import { importanceSample, type ImportanceSample, type ImportanceSamplingOptions } from "./importance-sampling.js";
import { findMaximumPosterior, startingPoints } from "./maximum-posterior.js";
import type { NelderMeadOptions } from "./nelder-mead.js";
import type { ParameterSpace } from "./parameter-space.js";
import { unconstrainedPosterior, type PhysicalLikelihood } from "./unconstrained-posterior.js";
import { posteriorDraws, type PosteriorDraws } from "./posterior-draws.js";
import type { StopReason } from "./run-sampler.js";
import { samplePosterior, type PosteriorSample, type PosteriorSamplingOptions, type SamplerKind } from "./sample-posterior.js";
import { systematicResample } from "./weighted-resampling.js";
import { defaultWalkerCount } from "./walker-ensemble.js";

/** How a posterior was computed: Pareto-smoothed importance sampling, or one of the two MCMC samplers. */
export type PosteriorMethod = "importance" | SamplerKind;

/**
 * Importance sampling is tried only up to this many sampled parameters. A Student-t fitted to the mode
 * covers a posterior of a few dimensions well (DRW: 2 with the mean integrated out; quasi-periodic: 4;
 * quasi-periodic with a DRW background: 6); in more dimensions the weights' ESS per draw falls quickly
 * for any proposal that is not exact (common practice; Vehtari et al. 2024, sec. 5, from memory).
 */
export const IMPORTANCE_MAX_DIMENSION = 6;

/** Importance sampling is not tried with fewer evaluations than this left after the optimisation (an ESS of 400 needs more draws). */
export const MINIMUM_IMPORTANCE_BUDGET = 600;

/**
 * A draw of the importance sample whose ln p exceeds the mode's by more than this means the mode search
 * stopped at a lesser mode (a Gaussian's draws lie below its mode; the searches stop within about 1e-4
 * of a maximum): the search runs again from that draw, and importance sampling from the new mode.
 */
export const MODE_MISS_MARGIN = 1;

/** Each retried importance sample may take this many times the draws of the one before ({@link MethodPosteriorOptions.importanceRetries}). */
export const IMPORTANCE_RETRY_GROWTH = 3;

/** Most repeated mode searches after a draw beat the mode (`MODE_MISS_MARGIN`). */
export const MODE_RESEARCHES = 2;

/**
 * Start points for the MCMC fallback from a failed importance sample: `count` draws resampled by the
 * smoothed weights, or undefined when fewer than half of them are distinct (weights on a handful of
 * draws say little about the posterior's spread; the sampler then starts around the mode).
 */
export function startsFromDraws(sample: ImportanceSample, count: number, rng: Rng): Float64Array[] | undefined {
  if (sample.points.length < count) return undefined;
  const picks = systematicResample(sample.weights, count, rng);
  if (new Set(picks).size < count / 2) return undefined;
  return Array.from(picks, (s) => sample.points[s]);
}

/** Index of the draw with the highest ln p, or undefined without draws. */
function highestDraw(sample: ImportanceSample): number | undefined {
  let best: number | undefined;
  for (let s = 0; s < sample.logPosterior.length; s++) if (best === undefined || sample.logPosterior[s] > sample.logPosterior[best]) best = s;
  return best;
}

/** Options of {@link posteriorByMethod}. */
export interface MethodPosteriorOptions extends Omit<PosteriorSamplingOptions, "maximum"> {
  /**
   * "importance" (the default unless `sampler` is given): Pareto-smoothed importance sampling when the space
   * has at most {@link IMPORTANCE_MAX_DIMENSION} free parameters, the MCMC sampler when its diagnostics
   * fail; "mcmc": the sampler only (the default when `sampler` is given).
   */
  readonly method?: "importance" | "mcmc";
  readonly importance?: ImportanceSamplingOptions;
  /**
   * Most free parameters importance sampling is tried for (default {@link IMPORTANCE_MAX_DIMENSION}):
   * a caller whose posterior is close to Gaussian in more dimensions (a joint multi-band fit: per-band
   * amplitude ratios, well determined by the data) may raise it; k-hat and the ESS still decide.
   */
  readonly importanceMaxDimension?: number;
  /**
   * Settings of the Nelder-Mead mode search (targets without a gradient). The importance weights correct
   * a mode found roughly, so a caller with an expensive likelihood may loosen the default tolerances.
   */
  readonly nelderMead?: NelderMeadOptions;
  /**
   * A further start of the mode search, derived from the maximum the first search found (physical values
   * by name; missing names at their prior median), or undefined for none: the search runs again from it
   * and the higher maximum is kept. A joint fit with lags rescans its lags with the kernel and amplitudes
   * found there (models/joint-lag-scan.ts), which first guesses cannot give.
   */
  readonly restartFrom?: (maximum: Readonly<Record<string, number>>) => Readonly<Record<string, number>> | undefined;
  /**
   * Further importance samples from the same mode when one fails its diagnostics, each allowed
   * `IMPORTANCE_RETRY_GROWTH` times the draws of the one before, before MCMC runs (default 0). For
   * posteriors the walker ensemble mixes slowly in (a joint fit with lags: 5e5 to over 2e6 evaluations
   * where tens of thousands of importance draws cost a few seconds).
   */
  readonly importanceRetries?: number;
}

/** The diagnostics of a posterior computed by either method. Keys that do not apply to a method are null. */
export interface MethodDiagnostics {
  /** Importance sampling: k-hat <= threshold and ESS >= 400. MCMC: the convergence criteria held. */
  readonly converged: boolean;
  /** MCMC only (R-hat compares chains; importance draws are independent): null for importance sampling. */
  readonly rhatMax: number | null;
  readonly rhatThreshold: number | null;
  /** MCMC: smallest bulk or tail ESS. Importance sampling: the ESS of the smoothed weights, 1 / sum w^2. */
  readonly essMin: number;
  /** MCMC only: null for importance sampling. */
  readonly autocorrelationTime: number | null;
  /** MCMC only: null for importance sampling. */
  readonly acceptance: number | null;
  readonly likelihoodEvaluations: number;
  readonly seconds: number;
  /** Equally weighted draws kept for the summaries (importance sampling: the resampled draws). */
  readonly keptDraws: number;
  readonly method: PosteriorMethod;
  readonly stopReason: StopReason;
  /** Importance sampling (also when it was tried and failed): k-hat of the last round. */
  readonly paretoK?: number;
  /** The k-hat threshold applied. */
  readonly paretoKThreshold?: number;
  /** Importance draws of the last round. */
  readonly importanceDraws?: number;
  /** Why importance sampling was tried and not used (then an MCMC sampler ran). */
  readonly importanceFallback?: string;
}

/** A posterior by either method, as equally weighted draws. */
export interface MethodPosterior {
  readonly method: PosteriorMethod;
  readonly space: ParameterSpace;
  /** The maximum a posteriori in physical parameters (no Jacobian), by name. */
  readonly maximum: Readonly<Record<string, number>>;
  /**
   * Equally weighted draws in physical units: the MCMC draws after burn-in, or the importance draws
   * resampled systematically by their smoothed weights (as many as were drawn; repeated draws appear
   * more than once, and the ESS, not their count, measures their information).
   */
  readonly draws: PosteriorDraws;
  readonly diagnostics: MethodDiagnostics;
  /** The MCMC run, when one ran. */
  readonly sample?: PosteriorSample;
  /** The importance sample, when importance sampling was tried. */
  readonly importance?: ImportanceSample;
}

/**
 * The posterior of a model by the cheapest method whose diagnostics hold: the maximum a posteriori
 * (several starts, as in {@link samplePosterior}, and one more from `restartFrom` when given), then the
 * mode of the unconstrained density, then Pareto-smoothed importance sampling from a Student-t at that
 * mode ({@link importanceSample}); a draw above the mode by more than `MODE_MISS_MARGIN` sends the
 * search there again (and, unless the sample was accepted, importance sampling from the new mode, at
 * most `MODE_RESEARCHES` times); a failed sample is retried with more draws `importanceRetries`
 * times; if k-hat or the ESS still fail, the MCMC sampler of `options.sampler` from the best maximum,
 * started at draws of the failed sample, charged with everything spent so far. With `method: "mcmc"` the sampler runs
 * directly.
 */
export function posteriorByMethod(space: ParameterSpace, likelihood: PhysicalLikelihood, options: MethodPosteriorOptions): MethodPosterior {
  const clock = options.clock ?? (() => performance.now());
  const startTime = clock();
  const method = options.method ?? (options.sampler !== undefined ? "mcmc" : "importance");
  const { method: _method, importance: importanceOptions, importanceMaxDimension, nelderMead, restartFrom, importanceRetries, ...samplingOptions } = options;
  if (method === "mcmc" || space.dimension > (importanceMaxDimension ?? IMPORTANCE_MAX_DIMENSION) || space.dimension === 0) {
    return markovPosterior(samplePosterior(space, likelihood, samplingOptions));
  }
  const gradientCost = options.gradientCost ?? DEFAULT_GRADIENT_COST;
  const seed = options.seed;
  const optimiserTarget = countEvaluations(unconstrainedPosterior(space, likelihood, { jacobian: false }));
  const starts = startingPoints(space, options.starts ?? 6, createRng(childSeed(seed, 0)), options.initial);
  const searchOptions = nelderMead ? { nelderMead } : {};
  let found = findMaximumPosterior(optimiserTarget, { starts, ...searchOptions });
  const restart = restartFrom?.(space.recordFromPhysical(space.toPhysical(found.x)));
  if (restart !== undefined) {
    const again = findMaximumPosterior(optimiserTarget, { starts: [space.toUnconstrained(space.physicalFromRecord(restart))], ...searchOptions });
    if (again.logPosterior > found.logPosterior) found = again;
  }
  const target = countEvaluations(unconstrainedPosterior(space, likelihood, { jacobian: true }));
  let mode = findMaximumPosterior(target, { starts: [found.x], ...searchOptions });
  const budget = options.maxEvaluations ?? 2e6;
  const spentNow = () => evaluationCost(optimiserTarget.counts, gradientCost) + evaluationCost(target.counts, gradientCost);
  let importance: ImportanceSample | undefined;
  let maxDraws = importanceOptions?.maxDraws ?? 8000;
  for (let attempt = 0, searches = 0, retries = 0; ; attempt++) {
    const remaining = budget - spentNow();
    // Too little budget left for a useful importance sample: the sampler runs, and stops on the budget.
    if (remaining < MINIMUM_IMPORTANCE_BUDGET) break;
    importance = importanceSample(target, mode.x, createRng(childSeed(seed, attempt === 0 ? 4 : 40 + attempt)), {
      ...importanceOptions,
      maxDraws: Math.min(maxDraws, remaining),
    });
    const best = highestDraw(importance);
    if (best !== undefined && importance.logPosterior[best] > mode.logPosterior + MODE_MISS_MARGIN) {
      // A draw above the mode by more than a Gaussian's draws reach: the search stopped at a lesser mode.
      found = findMaximumPosterior(optimiserTarget, { starts: [importance.points[best], found.x], ...searchOptions });
      mode = findMaximumPosterior(target, { starts: [found.x, importance.points[best]], ...searchOptions });
      // An accepted sample stands (its weights hold whatever mode it was drawn around): only the maximum moves.
      if (importance.accepted || ++searches > MODE_RESEARCHES) break;
      continue;
    }
    if (importance.accepted || retries++ >= (importanceRetries ?? 0)) break;
    maxDraws *= IMPORTANCE_RETRY_GROWTH;
  }
  const spent = spentNow();
  const remaining = budget - spent;
  const maximum = space.recordFromPhysical(space.toPhysical(found.x));
  if (importance === undefined || !importance.accepted) {
    const walkerStarts = importance ? startsFromDraws(importance, samplingOptions.sampler === "nuts" ? (samplingOptions.chains ?? 4) : (samplingOptions.walkers ?? defaultWalkerCount(space.dimension)), createRng(childSeed(seed, 6))) : undefined;
    const sample = samplePosterior(space, likelihood, { ...samplingOptions, maximum: { found, evaluations: spent }, ...(walkerStarts ? { startPoints: walkerStarts } : {}) });
    const chains = markovPosterior(sample);
    const fallback = importance === undefined ? `${Math.round(remaining)} evaluations left after the optimisation, too few to try importance sampling` : (importance.reason ?? "importance sampling failed");
    return {
      ...chains,
      ...(importance ? { importance } : {}),
      diagnostics: {
        ...chains.diagnostics,
        ...(importance ? { paretoK: importance.paretoShape, paretoKThreshold: importance.shapeThreshold, importanceDraws: importance.points.length } : {}),
        importanceFallback: fallback,
        seconds: (clock() - startTime) / 1000,
      },
    };
  }
  return importancePosterior(space, maximum, importance, spent, (clock() - startTime) / 1000, seed);
}

/**
 * An accepted importance sample as a {@link MethodPosterior}: the draws resampled systematically by their
 * smoothed weights (child seed 5 of `seed`), the diagnostics of the weights, and `evaluations` charged.
 */
export function importancePosterior(
  space: ParameterSpace,
  maximum: Readonly<Record<string, number>>,
  importance: ImportanceSample,
  evaluations: number,
  seconds: number,
  seed: string | number,
): MethodPosterior {
  const picks = systematicResample(importance.weights, importance.points.length, createRng(childSeed(seed, 5)));
  return {
    method: "importance",
    space,
    maximum,
    draws: drawsFromPoints(space, importance, picks),
    importance,
    diagnostics: {
      converged: true,
      rhatMax: null,
      rhatThreshold: null,
      essMin: importance.effectiveSampleSize,
      autocorrelationTime: null,
      acceptance: null,
      likelihoodEvaluations: evaluations,
      seconds,
      keptDraws: picks.length,
      method: "importance",
      stopReason: "converged",
      paretoK: importance.paretoShape,
      paretoKThreshold: importance.shapeThreshold,
      importanceDraws: importance.points.length,
    },
  };
}

/** An MCMC run as a {@link MethodPosterior}: its draws after burn-in and its diagnostics. */
export function markovPosterior(sample: PosteriorSample): MethodPosterior {
  const d = sample.diagnostics;
  return {
    method: sample.sampler,
    space: sample.space,
    maximum: sample.maximum,
    draws: posteriorDraws(sample.space, sample.run),
    sample,
    diagnostics: {
      converged: d.converged,
      rhatMax: d.rhatMax,
      rhatThreshold: d.rhatThreshold,
      essMin: d.essMin,
      autocorrelationTime: d.autocorrelationTime,
      acceptance: d.acceptance,
      likelihoodEvaluations: d.likelihoodEvaluations,
      seconds: d.seconds,
      keptDraws: d.keptDraws,
      method: sample.sampler,
      stopReason: sample.stopReason,
    },
  };
}

/** The resampled importance draws as posterior draws (one "chain"; iteration = position in the resample). */
function drawsFromPoints(space: ParameterSpace, sample: ImportanceSample, picks: Int32Array): PosteriorDraws {
  const total = picks.length;
  const columns: Record<string, Float64Array> = {};
  for (const name of space.names) columns[name] = new Float64Array(total);
  const physical = new Float64Array(space.names.length);
  const logPosterior = new Float64Array(total);
  for (let k = 0; k < total; k++) {
    const s = picks[k];
    space.toPhysical(sample.points[s], physical);
    space.names.forEach((name, i) => (columns[name][k] = physical[i]));
    logPosterior[k] = sample.logPosterior[s];
  }
  return { names: space.names, columns, chain: new Int32Array(total), iteration: Int32Array.from({ length: total }, (_, k) => k), logPosterior };
}
