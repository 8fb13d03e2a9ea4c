import { UsageError } from "../errors/usage-error.js";
import type { MethodPosterior, PosteriorDraws } from "../inference/index.js";
import type { FitDiagnostics } from "./fit-result.js";

/** The diagnostics of a fit, with the count of kept draws always present. */
export type CombinedDiagnostics = FitDiagnostics & { readonly keptDraws: number };

/**
 * The diagnostics stage of a fit: the runs of all modes combined by their worst figures over the runs
 * that have them (largest R-hat, autocorrelation time and k-hat; smallest ESS, R-hat bound and k-hat
 * threshold; R-hat, autocorrelation time and acceptance exist for MCMC runs only, k-hat for importance
 * sampling only, and a figure no run has is null), the mean acceptance, the summed evaluations and
 * kept draws, and the method of each run. Converged only when every run converged and, for MCMC runs,
 * every figure was computed and held: a NaN R-hat, ESS or autocorrelation time (too few draws to
 * compute it) is never converged. `seconds` is the whole fit's wall time.
 */
export function combinedDiagnostics(runs: readonly MethodPosterior[], seconds: number): CombinedDiagnostics {
  const figures = (pick: (d: MethodPosterior["diagnostics"]) => number | null | undefined): number[] =>
    runs.map((run) => pick(run.diagnostics)).filter((v): v is number => typeof v === "number");
  // The reducer is called with (a, b) only: Math.max as a reduce callback would also see the index and
  // the array (NaN), and every multi-mode fit would report NaN.
  const worst = (values: number[], better: (a: number, b: number) => number): number | null =>
    values.length > 0 ? values.reduce((a, b) => better(a, b)) : null;
  const markovHeld = (d: MethodPosterior["diagnostics"]): boolean =>
    d.method === "importance" ||
    (Number.isFinite(d.rhatMax) && Number.isFinite(d.essMin) && Number.isFinite(d.autocorrelationTime) && d.rhatMax! < d.rhatThreshold!);
  const acceptances = figures((d) => d.acceptance);
  const methods = runs.map((run) => run.method);
  const markov = runs.find((run) => run.sample !== undefined);
  const fallbacks = runs.map((run) => run.diagnostics.importanceFallback).filter((v): v is string => v !== undefined);
  const paretoK = worst(figures((d) => d.paretoK), Math.max);
  const paretoKThreshold = worst(figures((d) => d.paretoKThreshold), Math.min);
  const importanceDraws = worst(figures((d) => (d.method === "importance" ? d.importanceDraws : undefined)), Math.min);
  const stopped = runs.find((run) => run.diagnostics.stopReason !== "converged");
  return {
    converged: runs.every((run) => run.diagnostics.converged && markovHeld(run.diagnostics)),
    rhatMax: worst(figures((d) => d.rhatMax), Math.max),
    rhatThreshold: worst(figures((d) => d.rhatThreshold), Math.min),
    essMin: worst(figures((d) => d.essMin), Math.min) ?? NaN,
    autocorrelationTime: worst(figures((d) => d.autocorrelationTime), Math.max),
    acceptance: acceptances.length > 0 ? acceptances.reduce((a, b) => a + b, 0) / acceptances.length : null,
    likelihoodEvaluations: runs.reduce((sum, run) => sum + run.diagnostics.likelihoodEvaluations, 0),
    seconds,
    method: methods.every((m) => m === methods[0]) ? methods[0] : "mixed",
    ...(methods.length > 1 ? { methods } : {}),
    ...(markov?.sample ? { sampler: markov.sample.sampler } : {}),
    stopReason: stopped ? stopped.diagnostics.stopReason : "converged",
    keptDraws: runs.reduce((sum, run) => sum + run.diagnostics.keptDraws, 0),
    ...(paretoK !== null ? { paretoK } : {}),
    ...(paretoKThreshold !== null ? { paretoKThreshold } : {}),
    ...(importanceDraws !== null ? { importanceDraws } : {}),
    ...(fallbacks.length > 0 ? { importanceFallback: fallbacks.join("; ") } : {}),
  };
}

/**
 * A fit with no kept draws has nothing to summarise: instead of summaries of nothing, a one-line
 * UsageError saying why the sampler stopped and what to change.
 */
export function requireKeptDraws(draws: PosteriorDraws, diagnostics: CombinedDiagnostics): void {
  if (draws.chain.length > 0) return;
  const why =
    diagnostics.stopReason === "cancelled"
      ? "the fit was cancelled"
      : `the budget of ${Math.round(diagnostics.likelihoodEvaluations)} log-likelihood evaluations ran out`;
  throw new UsageError(
    `no posterior draws were kept: ${why} during the sampler's warm-up, so there is nothing to summarise; ` +
      "raise the budget (--max-evaluations)",
  );
}
