/**
 * The fit result: the stable JSON contract of `horologium fit` (see DESIGN.md). Keys may be added;
 * none of these may be renamed or removed.
 */
export interface FitResult {
  /** "drw", "oscillator" or "quasi-periodic". */
  readonly model: string;
  readonly seed: number | string;
  /** The Horologium version that produced the result. */
  readonly version: string;
  readonly data: FitDataSummary;
  /** Posterior summary of each parameter, by name (for example `tau`, `sigma`, `mean`). */
  readonly parameters: Record<string, ParameterSummary>;
  readonly diagnostics: FitDiagnostics;
  /** Plain-language warnings about what the data do not constrain. */
  readonly warnings: string[];
  /** Anything else a model reports (derived quantities, the band, options). */
  readonly [extra: string]: unknown;
}

/** What was fitted. */
export interface FitDataSummary {
  readonly n: number;
  readonly dropped: number;
  /** Last time minus first time, in the input time unit. */
  readonly baseline: number;
  /** Median spacing between consecutive times, in the input time unit. */
  readonly medianCadence: number;
  readonly timeColumn: string;
  readonly valueColumn: string;
  readonly errorColumn: string | null;
  readonly [extra: string]: unknown;
}

/** Posterior summary of one scalar parameter. */
export interface ParameterSummary {
  readonly median: number;
  readonly mean: number;
  readonly sd: number;
  readonly "q2.5": number;
  readonly q16: number;
  readonly q84: number;
  readonly "q97.5": number;
  readonly [extra: string]: unknown;
}

/** Sampler convergence and cost. */
export interface FitDiagnostics {
  readonly converged: boolean;
  /** Largest rank-normalised split R-hat over the parameters. */
  readonly rhatMax: number;
  /**
   * The bound R-hat had to be below: 1.01 for four chains, larger for more chains at the same demand on
   * the effective sample size (inference/convergence-check.ts, rhatThreshold). Absent in results written
   * before it was added, where the bound was 1.01.
   */
  readonly rhatThreshold?: number;
  /** Smallest of the bulk and tail effective sample sizes over the parameters. */
  readonly essMin: number;
  /** Largest integrated autocorrelation time over the parameters, in steps. */
  readonly autocorrTime: number;
  /** Mean acceptance rate. */
  readonly acceptance: number;
  readonly logProbEvaluations: number;
  readonly seconds: number;
  readonly [extra: string]: unknown;
}
