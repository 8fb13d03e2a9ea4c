import type { Rng } from "../random/rng.js";

/** Options of a Gaussian process conditioned on observation times. */
export interface GaussianProcessOptions {
  /** Per-point 1-sigma measurement errors (array, same length as the times) or one error for all. Default 0. */
  readonly errors?: number | ArrayLike<number>;
  /** Constant mean of the process, in the unit of the data. Default 0. */
  readonly mean?: number;
  /** Extra white-noise standard deviation added in quadrature to every error ("jitter"). Default 0. */
  readonly jitter?: number;
}

/** Mean and variance of the latent (noise-free) process at requested times, given the data. */
export interface MeanAndVariance {
  readonly mean: Float64Array;
  readonly variance: Float64Array;
}

/**
 * A Gaussian process conditioned on observed values (`gp.given(values)`): the latent (noise-free) light
 * curve's distribution anywhere, in gaps, between points and beyond both ends. Both engines return one.
 */
export interface ConditionedProcess {
  /** Conditional mean (the process's constant mean included) and variance at `times` (any order). */
  at(times: ArrayLike<number>): MeanAndVariance;
  /**
   * Joint conditional covariance at `times` (row-major M x M, in the order given); refused with a
   * RangeError above {@link MAX_COVARIANCE_SIZE} times.
   */
  covarianceAt(times: ArrayLike<number>): Float64Array;
  /** One draw of the latent process at `times` from its conditional distribution (mean included). */
  draw(rng: Rng, times: ArrayLike<number>): Float64Array;
}

/** Largest number of requested times for which a joint conditional covariance is formed (M^2 numbers). */
export const MAX_COVARIANCE_SIZE = 2000;

/** Refuses a joint covariance over more than {@link MAX_COVARIANCE_SIZE} times, naming the count. */
export function checkCovarianceSize(count: number): void {
  if (count > MAX_COVARIANCE_SIZE)
    throw new RangeError(
      `covarianceAt: a joint covariance is limited to ${MAX_COVARIANCE_SIZE} times (${MAX_COVARIANCE_SIZE}^2 numbers), got ${count}; use at() for the variances`,
    );
}

/** The log-likelihood and its gradient. */
export interface GradientResult {
  readonly value: number;
  /** d log L / d kernel parameter, in the kernel's `parameterNames` order. */
  readonly kernel: Float64Array;
  /** d log L / d mean. */
  readonly mean: number;
  /** d log L / d jitter. */
  readonly jitter: number;
}
