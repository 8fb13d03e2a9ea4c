/**
 * A complete, made-up fit result of format RESULT_FORMAT_VERSION (every declared key present), for tests of
 * the code that reads results: a damped random walk of the invented quasar "LDS J0000-0001". The numbers are
 * invented, not fitted.
 */
import { RESULT_FORMAT_VERSION, type FitParameterSummary, type FitResult } from "../../src/models/fit-result.js";

/** A summary with the given median and a symmetric 68% half-width (the other statistics follow a normal shape). */
export function inventedSummary(median: number, halfWidth: number): FitParameterSummary {
  return {
    median,
    mean: median,
    sd: halfWidth,
    "q2.5": median - 1.96 * halfWidth,
    q16: median - halfWidth,
    q84: median + halfWidth,
    "q97.5": median + 1.96 * halfWidth,
    hdi95: [median - 1.96 * halfWidth, median + 1.96 * halfWidth],
  };
}

/** The invented result; `patch` replaces top-level keys. */
export function inventedFitResult(patch: Partial<FitResult> = {}): FitResult {
  return {
    formatVersion: RESULT_FORMAT_VERSION,
    model: "drw",
    seed: 11,
    version: "0.1.0",
    data: {
      n: 250,
      dropped: 2,
      baseline: 3650.5,
      medianCadence: 3.1,
      timeColumn: "mjd",
      valueColumn: "mag",
      errorColumn: "mag_err",
      source: "lds-j0000-0001.csv",
      unit: "mag",
    },
    parameters: { tau: inventedSummary(210, 45), sigma: inventedSummary(0.2, 0.02), mean: inventedSummary(19.4, 0.05) },
    derived: { sfInf: { ...inventedSummary(0.28, 0.03), description: "sqrt(2) sigma" } },
    diagnostics: {
      converged: true,
      rhatMax: 1.004,
      rhatThreshold: 1.01,
      essMin: 812,
      autocorrelationTime: 23.4,
      acceptance: 0.41,
      likelihoodEvaluations: 96000,
      seconds: 4.2,
      method: "ensemble",
      sampler: "ensemble",
      stopReason: "converged",
    },
    warnings: [],
    options: {},
    priors: {
      tau: { family: "log-uniform", settings: { lower: 1, upper: 36505 } },
      sigma: { family: "log-uniform", settings: { lower: 0.001, upper: 5 } },
      mean: { family: "normal", settings: { mean: 19.4, sd: 2 } },
    },
    maximumPosterior: { tau: 205, sigma: 0.2, mean: 19.4 },
    posteriorSample: {
      names: ["tau", "sigma", "mean"],
      chain: [0, 0, 1, 1],
      rows: [
        [200, 0.19, 19.38],
        [215, 0.21, 19.41],
        [190, 0.2, 19.43],
        [230, 0.22, 19.37],
      ],
    },
    ...patch,
  };
}
