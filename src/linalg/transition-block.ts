/**
 * One diagonal block of the drift matrix of a kernel in linear state-space form.
 *
 * A stationary Gaussian process with a rational power spectrum is the output of a linear stochastic
 * differential equation dx = F x dt + L dW. With the observation row p and q = P p (P the stationary state
 * covariance), its autocovariance for lags tau >= 0 is
 *
 *     k(tau) = p^T exp(F tau) q,
 *
 * so for sorted times the covariance matrix is semiseparable, K_ij = p^T Phi_i ... Phi_{j+1} q (i > j) with
 * transitions Phi_n = exp(F (t_n - t_{n-1})). Only transitions over non-negative lags appear: nothing
 * grows like exp(+c t), which is the numerically stable ("pre-conditioned") form of the recursion
 * (Foreman-Mackey et al. 2017, AJ 154, 220, section 5.2), and absolute times never enter any trigonometry.
 *
 * F is block diagonal; a `TransitionBlock` is one block. Sums of kernels concatenate blocks; products of
 * kernels take Kronecker products of blocks.
 */
export interface TransitionBlock {
  /** Dimension m of this block of the state. */
  readonly size: number;
  /** The drift F of this block (m x m, row-major). */
  readonly generator: Float64Array;
  /** Kernel parameters (indices into the kernel's parameter list) that the transition depends on. */
  readonly parameterIndex: Int32Array;
  /** Writes exp(F dt) (m x m, row-major) into out[offset ...]; requires dt >= 0. */
  transition(dt: number, out: Float64Array, offset: number): void;
  /**
   * Writes d exp(F dt) / d theta_k into out[offset + k m^2 ...] for each parameter k of `parameterIndex`.
   */
  transitionDerivatives(dt: number, out: Float64Array, offset: number): void;
  /** The same block with its parameter indices mapped (used when kernels are combined). */
  reindexed(map: (index: number) => number): TransitionBlock;
}

/** How one kernel parameter moves a block's native parameters: d(native)/d(parameter). */
export interface ParameterDependence {
  /** The kernel parameter's index. */
  readonly index: number;
  /** Derivatives of the block's native parameters with respect to that kernel parameter. */
  readonly derivatives: readonly number[];
}
