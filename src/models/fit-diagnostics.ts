import { UsageError } from "../errors/usage-error.js";
import type { PosteriorDraws, PosteriorSample } from "../inference/index.js";
import type { FitDiagnostics } from "./fit-result.js";

/** The diagnostics of a fit, with the count of kept draws always present. */
export type CombinedDiagnostics = FitDiagnostics & { readonly keptDraws: number };

/**
 * The diagnostics stage of a fit: the runs of all modes combined by their worst figures (largest
 * R-hat and autocorrelation time, smallest ESS and R-hat bound), the mean acceptance, the summed
 * evaluations. Converged only when every run converged and every figure was computed and held: a
 * NaN R-hat, ESS or autocorrelation time (too few draws to compute it) is never converged.
 * `seconds` is the whole fit's wall time.
 */
export function combinedDiagnostics(runs: readonly PosteriorSample[], seconds: number): CombinedDiagnostics {
  // The reducer is called with (a, b) only: Math.max as a reduce callback would also see the index and
  // the array (NaN), and every multi-mode fit would report NaN.
  const worst = (pick: (run: PosteriorSample) => number, better: (a: number, b: number) => number) =>
    runs.map(pick).reduce((a, b) => better(a, b));
  const stopped = runs.find((run) => run.stopReason !== "converged");
  const rhatMax = worst((run) => run.diagnostics.rhatMax, Math.max);
  const rhatThreshold = worst((run) => run.diagnostics.rhatThreshold, Math.min);
  const essMin = worst((run) => run.diagnostics.essMin, Math.min);
  const autocorrelationTime = worst((run) => run.diagnostics.autocorrelationTime, Math.max);
  const computed = Number.isFinite(rhatMax) && Number.isFinite(essMin) && Number.isFinite(autocorrelationTime);
  return {
    converged: runs.every((run) => run.diagnostics.converged) && computed && rhatMax < rhatThreshold,
    rhatMax,
    rhatThreshold,
    essMin,
    autocorrelationTime,
    acceptance: runs.reduce((sum, run) => sum + run.diagnostics.acceptance, 0) / runs.length,
    likelihoodEvaluations: runs.reduce((sum, run) => sum + run.diagnostics.likelihoodEvaluations, 0),
    seconds,
    sampler: runs[0].sampler,
    stopReason: stopped ? stopped.stopReason : "converged",
    keptDraws: runs.reduce((sum, run) => sum + run.diagnostics.keptDraws, 0),
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
