/**
 * The cost of one log-likelihood-and-gradient evaluation of the Gaussian-process engine, in
 * log-likelihood evaluations, used to put gradient-based and gradient-free samplers on one scale.
 * Measured by bench/samplers-gradient-cost.ts through the models' likelihood adapters: 4.04 for a
 * damped random walk of 250 points and 3.92 for a quasi-periodic kernel on 1000 points (medians of 40
 * interleaved blocks), so 4.
 */
export const DEFAULT_GRADIENT_COST = 4;
