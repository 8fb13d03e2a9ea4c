import type { PosteriorSample } from "../inference/index.js";
import type { FitDiagnostics } from "./fit-result.js";

/**
 * The diagnostics stage of a fit: the runs of all modes combined by their worst figures (largest
 * R-hat and autocorrelation time, smallest ESS and R-hat bound), the mean acceptance, the summed
 * evaluations, and converged only when every run converged. `seconds` is the whole fit's wall time.
 */
export function combinedDiagnostics(runs: readonly PosteriorSample[], seconds: number): FitDiagnostics {
  // The reducer is called with (a, b) only: Math.max as a reduce callback would also see the index and
  // the array (NaN), and every multi-mode fit would report NaN.
  const worst = (pick: (run: PosteriorSample) => number, better: (a: number, b: number) => number) =>
    runs.map(pick).reduce((a, b) => better(a, b));
  const stopped = runs.find((run) => run.stopReason !== "converged");
  return {
    converged: runs.every((run) => run.diagnostics.converged),
    rhatMax: worst((run) => run.diagnostics.rhatMax, Math.max),
    rhatThreshold: worst((run) => run.diagnostics.rhatThreshold, Math.min),
    essMin: worst((run) => run.diagnostics.essMin, Math.min),
    autocorrelationTime: worst((run) => run.diagnostics.autocorrelationTime, Math.max),
    acceptance: runs.reduce((sum, run) => sum + run.diagnostics.acceptance, 0) / runs.length,
    likelihoodEvaluations: runs.reduce((sum, run) => sum + run.diagnostics.likelihoodEvaluations, 0),
    seconds,
    sampler: runs[0].sampler,
    stopReason: stopped ? stopped.stopReason : "converged",
  };
}
