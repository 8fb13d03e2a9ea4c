/**
 * What the samplers and optimisers explore: an unnormalised log posterior on an unconstrained real
 * vector space (the model's parameters after their transforms, `unconstrainedPosterior`). Keeping
 * the samplers on this interface, and not on the Gaussian process, lets them be checked on targets whose
 * quantiles are known exactly.
 */
export interface PosteriorTarget {
  /** Length of the vectors `x` this target is defined on. */
  readonly dimension: number;
  /** ln p(x) up to a constant; -Infinity outside the support. Must not modify `x`. */
  logPosterior(x: Float64Array): number;
  /**
   * ln p(x) and, written into `gradientOut`, its gradient d ln p / dx. Absent when the target has no
   * gradient; gradient-free methods (Nelder-Mead, the ensemble sampler) are then used.
   */
  logPosteriorAndGradient?(x: Float64Array, gradientOut: Float64Array): number;
}

/** A posterior target whose gradient is known to be available. */
export type DifferentiablePosteriorTarget = PosteriorTarget & {
  logPosteriorAndGradient(x: Float64Array, gradientOut: Float64Array): number;
};

/** Whether a target supplies gradients. */
export function hasGradient(target: PosteriorTarget): target is DifferentiablePosteriorTarget {
  return typeof target.logPosteriorAndGradient === "function";
}
