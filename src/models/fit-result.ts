import type { ParameterSummary } from "../inference/posterior-summary.js";
import type { SamplerDiagnostics } from "../inference/sampler-diagnostics.js";

export type { ParameterSummary };

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

/**
 * Sampler convergence and cost (the keys of {@link SamplerDiagnostics}, which the inference layer owns).
 */
export interface FitDiagnostics extends SamplerDiagnostics {
  readonly [extra: string]: unknown;
}
