/**
 * A target distribution as the samplers and optimisers see it: an unnormalised log density on an
 * unconstrained real vector space. Keeping the samplers on this interface, and not on the Gaussian
 * process, lets them be checked on targets whose quantiles are known exactly.
 */
export interface LogDensity {
  /** Length of the vectors `x` this density is defined on. */
  readonly dimension: number;
  /** ln p(x) up to a constant; -Infinity outside the support. Must not modify `x`. */
  logDensity(x: Float64Array): number;
  /**
   * ln p(x) and, written into `gradientOut`, its gradient d ln p / dx. Absent when the target has no
   * gradient; gradient-free methods (Nelder-Mead, the ensemble sampler) are then used.
   */
  logDensityAndGradient?(x: Float64Array, gradientOut: Float64Array): number;
}

/** A log density whose gradient is known to be available. */
export type DifferentiableLogDensity = LogDensity & {
  logDensityAndGradient(x: Float64Array, gradientOut: Float64Array): number;
};

/** Whether a target supplies gradients. */
export function hasGradient(target: LogDensity): target is DifferentiableLogDensity {
  return typeof target.logDensityAndGradient === "function";
}
