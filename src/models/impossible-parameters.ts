import { CoincidentRootsError } from "../kernels/carma.js";
import { FactorizationError } from "../linalg/factorization-error.js";

/**
 * Whether an error of a likelihood evaluation marks parameters where the posterior is zero rather than a
 * bug: a covariance that cannot be factorised (FactorizationError), or a CARMA polynomial with coincident
 * roots (CoincidentRootsError, a set of zero prior mass whose state-space form does not exist).
 */
export function isImpossibleParameters(error: unknown): boolean {
  return error instanceof FactorizationError || error instanceof CoincidentRootsError;
}

/**
 * The log-likelihood that `evaluate` computes, or -Infinity at impossible parameters
 * ({@link isImpossibleParameters}: the posterior is zero there, so samplers and optimisers step back);
 * any other error is rethrown.
 */
export function logLikelihoodOrImpossible(evaluate: () => number): number {
  try {
    return evaluate();
  } catch (error) {
    if (isImpossibleParameters(error)) return -Infinity;
    throw error;
  }
}
