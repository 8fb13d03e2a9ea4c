import type { DrawStore } from "./draw-store.js";

/**
 * A running Markov chain Monte Carlo sampler with one or more chains (NUTS) or walkers (ensemble),
 * advanced one iteration at a time by the convergence loop in `run-sampler.ts`.
 */
export interface MarkovSampler {
  readonly kind: "ensemble" | "nuts";
  /** Chains or walkers. */
  readonly chainCount: number;
  readonly dimension: number;
  /** Iterations done so far, warm-up included. */
  readonly iterations: number;
  /** Iterations of adaptation that are not kept (0 for the ensemble, which discards burn-in instead). */
  readonly warmupIterations: number;
  /** The kept draws. */
  readonly draws: DrawStore;
  /** Advances every chain or walker by one iteration. */
  iterate(): void;
  /** First kept row that diagnostics and summaries use (the ensemble drops its first half as burn-in). */
  analysisStart(): number;
  /** Mean acceptance over the kept iterations (NUTS: mean Metropolis acceptance statistic of the trees). */
  acceptanceRate(): number;
  /** Where every chain or walker is now (unconstrained coordinates) and its ln p, warm-up included: what a trace records. */
  current(): { readonly positions: readonly Float64Array[]; readonly logPosterior: ArrayLike<number> };
  /** Sampler-specific figures for the result (step sizes, divergences, tree depths, moves). */
  details(): Record<string, unknown>;
}
