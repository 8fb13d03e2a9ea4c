/**
 * How a sampler run went: convergence and cost. These are the keys of `diagnostics` in every fit result
 * (docs/architecture.md, "Result JSON"); the inference layer owns them so that it needs nothing of the
 * models above it, and the fit result extends them.
 */
export interface SamplerDiagnostics {
  readonly converged: boolean;
  /** Largest rank-normalised split R-hat over the parameters (Vehtari et al. 2021). */
  readonly rhatMax: number;
  /**
   * The bound R-hat had to be below: 1.01 for four chains, larger for more chains at the same demand on
   * the effective sample size (`rhatThreshold` in convergence-check.ts).
   */
  readonly rhatThreshold: number;
  /** Smallest of the bulk and tail effective sample sizes over the parameters. */
  readonly essMin: number;
  /** Largest integrated autocorrelation time over the parameters, in steps. */
  readonly autocorrelationTime: number;
  /** Mean acceptance rate. */
  readonly acceptance: number;
  /** Cost in log-likelihood evaluations, a gradient weighted by its cost in evaluations. */
  readonly likelihoodEvaluations: number;
  /** Wall-clock seconds. */
  readonly seconds: number;
}
