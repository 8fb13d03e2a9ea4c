/**
 * The covariance matrix is not numerically positive definite for these times and errors (the kernel is
 * invalid for the data, a parameter is extreme, or the input holds non-finite values). Raised instead of
 * returning NaN, naming the data point where the factorisation broke down.
 */
export class FactorizationError extends Error {
  constructor(
    readonly index: number,
    readonly pivot: number,
  ) {
    super(
      `covariance matrix is not positive definite: the factorisation failed at point ${index} ` +
        `(pivot ${pivot}); check the kernel parameters and that times and errors are finite`,
    );
    this.name = "FactorizationError";
  }
}
