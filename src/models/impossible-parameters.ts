import { FactorizationError } from "../linalg/factorization-error.js";

/**
 * The log-likelihood that `evaluate` computes, or -Infinity where the parameters give a covariance that
 * cannot be factorised (a FactorizationError: the posterior is zero there, so samplers and optimisers
 * step back); any other error is rethrown.
 */
export function logLikelihoodOrImpossible(evaluate: () => number): number {
  try {
    return evaluate();
  } catch (error) {
    if (error instanceof FactorizationError) return -Infinity;
    throw error;
  }
}
