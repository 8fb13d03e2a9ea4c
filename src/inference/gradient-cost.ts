/**
 * The cost of one log-likelihood-and-gradient evaluation of the Gaussian-process engine, in
 * log-likelihood evaluations, used to put gradient-based and gradient-free samplers on one scale.
 * Measured by bench/samplers-gradient-cost.ts (see the figures there).
 */
export const DEFAULT_GRADIENT_COST = 4;
