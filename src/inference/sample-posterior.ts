import type { ChainTrace } from "./chain-trace.js";
import { childSeed, createRng, type Rng } from "../random/rng.js";
import { createWalkerEnsemble, defaultWalkerCount } from "./walker-ensemble.js";
import type { WeightedProposal } from "./walker-proposals.js";
import { countEvaluations, evaluationCost } from "./evaluation-counter.js";
import { DEFAULT_GRADIENT_COST } from "./gradient-cost.js";
import { hasGradient, type PosteriorTarget } from "./posterior-target.js";
import { findMaximumPosterior, startingPoints, type MaximumPosterior } from "./maximum-posterior.js";
import { modeScales } from "./mode-curvature.js";
import { createNutsSampler } from "./nuts-sampler.js";
import type { ParameterSpace } from "./parameter-space.js";
import { unconstrainedPosterior, type PhysicalLikelihood } from "./unconstrained-posterior.js";
import { posteriorDraws } from "./posterior-draws.js";
import { summarizeDraws, type PosteriorSummary } from "./posterior-summary.js";
import { runSampler, type RunDiagnostics, type RunSamplerOptions, type SamplerRun, type StopReason } from "./run-sampler.js";

/** The two samplers. */
export type SamplerKind = "nuts" | "ensemble";

/**
 * The sampler used when none is asked for: the walker ensemble. bench/samplers-compare.ts runs both to
 * convergence from the same mode, counting a gradient as DEFAULT_GRADIENT_COST (3) log-likelihood
 * evaluations. Measured on a shared 2-core machine:
 * - damped random walk, 250 points (seeds 1000-1002): ensemble 72 evaluations per effective sample,
 *   91k evaluations and 8 s per converged fit; NUTS 1100 per effective sample, 465k and 50 s per fit;
 * - quasi-periodic, 1000 points (seed 1000): ensemble 47 per effective sample, 144k evaluations and
 *   171 s per fit; NUTS 411 per effective sample, 169k and 268 s per fit.
 * NUTS stays selectable (`sampler: "nuts"`). Without a gradient only the ensemble runs.
 */
export const DEFAULT_SAMPLER: SamplerKind = "ensemble";

/** Options of {@link samplePosterior}. */
export interface PosteriorSamplingOptions extends RunSamplerOptions {
  /** Seed of every random choice of the fit; the same seed gives the same draws, bit for bit. */
  readonly seed: number | string;
  /** "nuts" or "ensemble" (default {@link DEFAULT_SAMPLER}, or "ensemble" without a gradient). */
  readonly sampler?: SamplerKind;
  /** A first guess by parameter name (for example from a periodogram), the first optimiser start. */
  readonly initial?: Readonly<Record<string, number>>;
  /** Optimiser starts: the initial guess plus draws from the prior (default 6). */
  readonly starts?: number;
  /** NUTS chains (default 4). */
  readonly chains?: number;
  /** NUTS warm-up iterations per chain (default 500). */
  readonly warmup?: number;
  /** NUTS target acceptance statistic (default 0.8). */
  readonly targetAcceptance?: number;
  /** NUTS maximum tree depth (default 10). */
  readonly maxTreeDepth?: number;
  /** Ensemble walkers (default {@link defaultWalkerCount}). */
  readonly walkers?: number;
  /** Ensemble proposals (default the mixture of {@link defaultWalkerProposals}). */
  readonly proposals?: readonly WeightedProposal[];
  /**
   * A maximum a posteriori found already (physical parameterisation, no Jacobian), with what finding it
   * cost in log-likelihood evaluations: the optimisation is then not repeated, and that cost is charged
   * to the budget. Used when importance sampling was tried first and its diagnostics failed.
   */
  readonly maximum?: { readonly found: MaximumPosterior; readonly evaluations: number };
  /**
   * Points to start the walkers (the first `walkers` of them) or the NUTS chains (the first `chains`) at,
   * in the target's unconstrained coordinates, instead of a cloud around the mode: draws of an importance
   * sample that failed its diagnostics are spread about as the posterior is, where the ensemble's tight
   * ball must first grow to it. Ignored when there are too few.
   */
  readonly startPoints?: readonly Float64Array[];
}

/** The result of {@link samplePosterior}. */
export interface PosteriorSample {
  readonly sampler: SamplerKind;
  readonly seed: number | string;
  readonly stopReason: StopReason;
  /** The maximum a posteriori in physical parameters (no Jacobian), by name. */
  readonly maximum: Readonly<Record<string, number>>;
  /** ln posterior at the maximum (physical parameterisation). */
  readonly maximumLogPosterior: number;
  /** Posterior summary of every parameter, by name; fixed ones carry `fixed: true` and sd 0. */
  readonly parameters: Readonly<Record<string, PosteriorSummary & { readonly fixed?: boolean; readonly rhat?: number; readonly essBulk?: number; readonly essTail?: number }>>;
  /** Run diagnostics; `likelihoodEvaluations` and `seconds` include the optimisation. */
  readonly diagnostics: RunDiagnostics & { readonly optimizerEvaluations: number };
  readonly run: SamplerRun;
  readonly space: ParameterSpace;
  /** Sampler details (step sizes, divergences, moves, ...). */
  readonly details: Record<string, unknown>;
  /** A bounded trace of the whole run, warm-up included, in physical units. */
  readonly trace: ChainTrace;
}

/** Copies of the first `count` of `points`, or undefined when there are fewer. */
function startsFrom(points: readonly Float64Array[] | undefined, count: number): Float64Array[] | undefined {
  return points !== undefined && points.length >= count ? points.slice(0, count).map((x) => Float64Array.from(x)) : undefined;
}

/** Draws `count` points around `centre`, `scale[i] * spread` wide, each with a finite log density. */
function cloudAround(
  target: PosteriorTarget,
  centre: Float64Array,
  scale: Float64Array,
  spread: number,
  count: number,
  rng: Rng,
): Float64Array[] {
  const points: Float64Array[] = [];
  for (let k = 0; k < count; k++) {
    let point = Float64Array.from(centre);
    for (let attempt = 0, s = spread; attempt < 50; attempt++, s *= 0.5) {
      const trial = Float64Array.from(centre, (c, i) => c + s * scale[i] * rng.normal());
      if (Number.isFinite(target.logPosterior(trial))) {
        point = trial;
        break;
      }
    }
    points.push(point);
  }
  return points;
}

/**
 * Samples the posterior of a model: finds the maximum a posteriori from several starts (L-BFGS with the
 * likelihood's gradient, or Nelder-Mead without), moves from it to the mode of the unconstrained density
 * the samplers see, starts NUTS chains (spread by the curvature at that mode) or ensemble walkers (a
 * tight ball, a tenth of that) around it, or at `startPoints` when given, NUTS with those scales squared as its first inverse mass matrix, and runs the sampler until the
 * convergence criteria hold or the budget is spent ({@link runSampler}). Returns summaries in
 * physical units and the run.
 *
 * @example
 * const fit = samplePosterior(space, likelihood, { seed: 7, onProgress: (p) => bar.update(p.fraction) });
 * fit.parameters.tau.median; fit.diagnostics.converged; fit.stopReason;
 */
export function samplePosterior(
  space: ParameterSpace,
  likelihood: PhysicalLikelihood,
  options: PosteriorSamplingOptions,
): PosteriorSample {
  const clock = options.clock ?? (() => performance.now());
  const startTime = clock();
  const gradientCost = options.gradientCost ?? DEFAULT_GRADIENT_COST;
  const withGradient = likelihood.logLikelihoodAndGradient !== undefined;
  const kind: SamplerKind = options.sampler ?? (withGradient ? DEFAULT_SAMPLER : "ensemble");
  if (kind === "nuts" && !withGradient) throw new RangeError("NUTS needs a likelihood with a gradient");
  if (space.dimension === 0) throw new RangeError("posterior sampling: every parameter is fixed");

  const seed = options.seed;
  let maximum: MaximumPosterior;
  let optimizerEvaluations: number;
  if (options.maximum) {
    maximum = options.maximum.found;
    optimizerEvaluations = options.maximum.evaluations;
  } else {
    const optimiserTarget = countEvaluations(unconstrainedPosterior(space, likelihood, { jacobian: false }));
    const starts = startingPoints(space, options.starts ?? 6, createRng(childSeed(seed, 0)), options.initial);
    maximum = findMaximumPosterior(optimiserTarget, { starts });
    optimizerEvaluations = evaluationCost(optimiserTarget.counts, gradientCost);
  }

  const target = countEvaluations(unconstrainedPosterior(space, likelihood, { jacobian: true }));
  // Samplers start around the mode of the density they sample (with the Jacobian), reached from the
  // physical MAP by one more local search. The physical MAP can sit on the edge of a prior's support
  // (a variability amplitude the data cannot resolve), which is -Infinity away in the unconstrained
  // space; chains started there spend their warm-up crawling back.
  const mode = findMaximumPosterior(target, { starts: [maximum.x] }).x;
  const scales = modeScales(target, mode);
  const startRng = createRng(childSeed(seed, 1));
  let sampler;
  if (kind === "nuts") {
    if (!hasGradient(target)) throw new RangeError("NUTS needs a likelihood with a gradient");
    const chains = options.chains ?? 4;
    const initial = startsFrom(options.startPoints, chains) ?? cloudAround(target, mode, scales, 1, chains, startRng);
    sampler = createNutsSampler(target, initial, childSeed(seed, 3), {
      ...(options.warmup !== undefined ? { warmup: options.warmup } : {}),
      ...(options.targetAcceptance !== undefined ? { targetAcceptance: options.targetAcceptance } : {}),
      ...(options.maxTreeDepth !== undefined ? { maxTreeDepth: options.maxTreeDepth } : {}),
      initialInverseMass: Float64Array.from(scales, (s) => s * s),
    });
  } else {
    const walkers = options.walkers ?? defaultWalkerCount(space.dimension);
    const initial = startsFrom(options.startPoints, walkers) ?? cloudAround(target, mode, scales, 0.1, walkers, startRng);
    sampler = createWalkerEnsemble(target, initial, createRng(childSeed(seed, 2)), options.proposals ? { proposals: options.proposals } : {});
  }
  const setupCost = evaluationCost(target.counts, gradientCost);
  const run = runSampler(sampler, target.counts, {
    ...options,
    gradientCost,
    maxEvaluations: Math.max(0, (options.maxEvaluations ?? 2e6) - optimizerEvaluations - setupCost),
  });

  const draws = posteriorDraws(space, run);
  const parameters: Record<string, PosteriorSummary & { fixed?: boolean; rhat?: number; essBulk?: number; essTail?: number }> = {};
  const freeIndex = new Map(space.free.map((p, i) => [p.name, i]));
  for (const name of space.names) {
    const summary = summarizeDraws(draws.columns[name]);
    const i = freeIndex.get(name);
    if (i === undefined) {
      parameters[name] = { ...summary, sd: 0, fixed: true };
    } else {
      const diag = run.diagnostics.convergence.parameters[i];
      parameters[name] = { ...summary, rhat: diag.rhat, essBulk: diag.essBulk, essTail: diag.essTail };
    }
  }
  const physicalMaximum = space.recordFromPhysical(space.toPhysical(maximum.x));
  return {
    sampler: kind,
    seed,
    stopReason: run.stopReason,
    maximum: physicalMaximum,
    maximumLogPosterior: maximum.logPosterior,
    parameters,
    diagnostics: {
      ...run.diagnostics,
      likelihoodEvaluations: run.diagnostics.likelihoodEvaluations + optimizerEvaluations + setupCost,
      seconds: (clock() - startTime) / 1000,
      optimizerEvaluations,
    },
    run,
    space,
    details: sampler.details(),
    trace: run.trace.finish(space, { sampler: kind, iterations: run.diagnostics.iterations, warmup: run.warmup }),
  };
}
