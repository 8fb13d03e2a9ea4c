import { ChainTraceRecorder } from "./chain-trace.js";
import { checkGrowthAfter } from "./check-schedule.js";
import { assessConvergence, DEFAULT_CONVERGENCE_CRITERIA, type ConvergenceCriteria, type ConvergenceReport } from "./convergence-check.js";
import { evaluationCost, type EvaluationCounts } from "./evaluation-counter.js";
import { DEFAULT_GRADIENT_COST } from "./gradient-cost.js";
import type { MarkovSampler } from "./markov-sampler.js";
import type { SamplerDiagnostics } from "./sampler-diagnostics.js";

/** Why a run stopped. */
export type StopReason = "converged" | "budget" | "cancelled";

/** Anything with an `aborted` flag, such as an AbortSignal. */
export interface CancellationSignal {
  readonly aborted: boolean;
}

/** What the progress callback receives. */
export interface SamplerProgress {
  readonly phase: "warmup" | "sampling";
  /** Iterations done, warm-up included. */
  readonly iteration: number;
  /** Estimated fraction of the run done, in [0, 1], never decreasing: the larger of the budget used and the convergence progress. */
  readonly fraction: number;
  /** Cost so far in log-likelihood evaluations (a gradient counts as `gradientCost`). */
  readonly likelihoodEvaluations: number;
  /** The latest convergence assessment, when one has been made. */
  readonly convergence?: ConvergenceReport;
}

/** Options of {@link runSampler}. */
export interface RunSamplerOptions {
  /** Budget in log-likelihood evaluations, gradients weighted by `gradientCost` (default 2e6). */
  readonly maxEvaluations?: number;
  /** Budget in iterations, warm-up included (default unlimited). */
  readonly maxIterations?: number;
  /** Kept iterations before the first convergence check (default 100). */
  readonly minIterations?: number;
  /**
   * Factor by which the kept draws grow between convergence checks (default 1.25). Larger values
   * check less often (cheaper for cheap targets) but may run up to that factor past convergence.
   */
  readonly checkGrowth?: number;
  /** Cost of one value-and-gradient evaluation in value evaluations (default {@link DEFAULT_GRADIENT_COST}). */
  readonly gradientCost?: number;
  readonly criteria?: Partial<ConvergenceCriteria>;
  /** Called every `progressInterval` iterations and after each convergence check. */
  readonly onProgress?: (progress: SamplerProgress) => void;
  /** Iterations between progress calls (default 10). */
  readonly progressInterval?: number;
  /** Checked before every iteration; when `aborted` the run stops with the draws it has. */
  readonly signal?: CancellationSignal;
  /** A clock in milliseconds (default `performance.now`); only used for the `seconds` figure. */
  readonly clock?: () => number;
}

/** Diagnostics of a run: the fit-result keys plus per-parameter figures. */
export interface RunDiagnostics extends SamplerDiagnostics {
  readonly stopReason: StopReason;
  readonly iterations: number;
  readonly keptDraws: number;
  readonly valueEvaluations: number;
  readonly gradientEvaluations: number;
  readonly gradientCost: number;
  readonly convergence: ConvergenceReport;
}

/** A finished (or stopped) sampler run. */
export interface SamplerRun {
  readonly sampler: MarkovSampler;
  readonly stopReason: StopReason;
  /** First kept row used for summaries (after the ensemble's burn-in). */
  readonly analysisStart: number;
  /**
   * Iterations before the first draw used for summaries: NUTS's warm-up, or the ensemble's burn-in
   * (the first half of its iterations, `analysisStart`).
   */
  readonly warmup: number;
  readonly diagnostics: RunDiagnostics;
  /** A bounded trace of the whole run, warm-up included, in the sampler's coordinates ({@link ChainTraceRecorder}). */
  readonly trace: ChainTraceRecorder;
}

/**
 * Runs a sampler until its draws pass the convergence criteria ({@link assessConvergence}), the budget
 * is spent, or the signal is aborted, and says which. Convergence is checked after `minIterations`
 * kept iterations and then whenever the kept draws have grown by at least `checkGrowth`, further when
 * the last check says the criteria are far off ({@link checkGrowthAfter}), so checks cost a small
 * fraction of the run. The schedule depends on iteration counts only, never on the clock, so a seed
 * fixes where the run stops. `counts` must be the tally of the target the sampler evaluates.
 */
export function runSampler(
  sampler: MarkovSampler,
  counts: EvaluationCounts,
  options: RunSamplerOptions = {},
): SamplerRun {
  const criteria: ConvergenceCriteria = { ...DEFAULT_CONVERGENCE_CRITERIA, ...options.criteria };
  const maxEvaluations = options.maxEvaluations ?? 2e6;
  const maxIterations = options.maxIterations ?? Infinity;
  const minIterations = Math.max(16, options.minIterations ?? 100);
  const gradientCost = options.gradientCost ?? DEFAULT_GRADIENT_COST;
  const progressInterval = Math.max(1, options.progressInterval ?? 10);
  const checkGrowth = Math.max(1.01, options.checkGrowth ?? 1.25);
  const clock = options.clock ?? (() => performance.now());
  const startTime = clock();
  const startCost = evaluationCost(counts, gradientCost);
  const startValues = counts.values;
  const startGradients = counts.gradients;
  const cost = (): number => evaluationCost(counts, gradientCost) - startCost;

  let report: ConvergenceReport | undefined;
  let nextCheck = minIterations;
  let fraction = 0;
  let stopReason: StopReason = "budget";
  const trace = new ChainTraceRecorder(sampler.chainCount, sampler.dimension);
  if (trace.wants(sampler.iterations)) trace.record(sampler.iterations, sampler.current());

  const assess = (quick: boolean): ConvergenceReport => {
    const start = sampler.analysisStart();
    const draws = Array.from({ length: sampler.dimension }, (_, i) => sampler.draws.coordinate(i, start));
    return assessConvergence(draws, criteria, { stopAtFirstFailure: quick });
  };
  const notify = (): void => {
    if (options.onProgress === undefined) return;
    const warm = sampler.iterations < sampler.warmupIterations;
    const budgetFraction = Math.max(cost() / maxEvaluations, sampler.iterations / maxIterations);
    const runFraction = warm
      ? (0.25 * sampler.iterations) / Math.max(1, sampler.warmupIterations)
      : sampler.warmupIterations > 0
        ? 0.25 + 0.75 * (report?.progress ?? 0)
        : (report?.progress ?? 0);
    fraction = Math.max(fraction, Math.min(1, Math.max(budgetFraction, runFraction)));
    options.onProgress({
      phase: warm ? "warmup" : "sampling",
      iteration: sampler.iterations,
      fraction,
      likelihoodEvaluations: cost(),
      ...(report ? { convergence: report } : {}),
    });
  };

  for (;;) {
    if (options.signal?.aborted) {
      stopReason = "cancelled";
      break;
    }
    if (cost() >= maxEvaluations || sampler.iterations >= maxIterations) {
      stopReason = "budget";
      break;
    }
    sampler.iterate();
    if (trace.wants(sampler.iterations)) trace.record(sampler.iterations, sampler.current());
    const kept = sampler.draws.length;
    if (kept >= nextCheck) {
      report = assess(true);
      nextCheck = Math.ceil(kept * checkGrowthAfter(report, criteria, checkGrowth));
      if (report.converged) {
        stopReason = "converged";
        fraction = 1;
        notify();
        break;
      }
      notify();
    } else if (sampler.iterations % progressInterval === 0) {
      notify();
    }
  }
  // A full assessment (every criterion evaluated) of the final draws; a check that passed already is one
  // (the quick form skips criteria only after a failure), and at tens of thousands of draws a check can
  // cost as much as the sampling since the previous one.
  if (stopReason !== "converged" || report === undefined) report = assess(false);
  const diagnostics: RunDiagnostics = {
    converged: stopReason === "converged",
    rhatMax: report.rhatMax,
    rhatThreshold: report.rhatThreshold,
    essMin: report.essMin,
    autocorrelationTime: report.autocorrelationTime,
    acceptance: sampler.acceptanceRate(),
    likelihoodEvaluations: cost(),
    seconds: (clock() - startTime) / 1000,
    stopReason,
    iterations: sampler.iterations,
    keptDraws: report.chainLength * sampler.chainCount,
    valueEvaluations: counts.values - startValues,
    gradientEvaluations: counts.gradients - startGradients,
    gradientCost,
    convergence: report,
  };
  const analysisStart = sampler.analysisStart();
  return { sampler, stopReason, analysisStart, warmup: sampler.warmupIterations + analysisStart, diagnostics, trace };
}
