/**
 * The cost of one log-likelihood-and-gradient evaluation of the Gaussian-process engine, in
 * log-likelihood evaluations, used to put gradient-based and gradient-free samplers on one scale.
 * Measured by bench/samplers-gradient-cost.ts through the models' likelihood adapters (`modelLikelihood`,
 * what NUTS and L-BFGS call; medians of 40-60 interleaved blocks, 2026-12-02, bench/README.md
 * "Gradient cost constant"): 2.17-2.18 for a damped random walk of 250 points (three runs, wall- and
 * CPU-timed alike), and for a quasi-periodic kernel on 1000 points 3.0-3.1 wall-timed (this script and
 * bench/engine-adapters.ts) and 5.0-5.3 CPU-timed on a machine at load 30, where the gradient's tape
 * suffers most from the other processes' use of the caches. Before the written-out reverse pass it was
 * 4.04 and 3.92. 3 weighs a damped-random-walk gradient within 40% and a quasi-periodic one within a
 * factor 1.8 on every measurement.
 */
export const DEFAULT_GRADIENT_COST = 3;
