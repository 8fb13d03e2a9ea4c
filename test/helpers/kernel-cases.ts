import { kernels, type Kernel } from "../../src/kernels/index.js";

/** Named kernels that the engine tests check against dense linear algebra: one per family (both oscillator regimes). */
export const FAMILY_CASES: Array<[string, Kernel]> = [
  ["damped random walk", kernels.dampedRandomWalk({ sigma: 0.3, tau: 120 })],
  ["oscillator Q > 1/2", kernels.oscillator({ sigma: 0.2, period: 37, quality: 6 })],
  ["oscillator Q < 1/2", kernels.oscillator({ sigma: 0.2, period: 90, quality: 0.3 })],
  ["quasi-periodic", kernels.quasiPeriodic({ sigma: 0.1, period: 23.4, decayTime: 30, harmonicWeight: 0.35 })],
  ["matern32", kernels.matern32({ sigma: 0.15, scale: 15 })],
];

/** Named sums and products of kernels for the same checks. */
export const COMPOSITE_CASES: Array<[string, Kernel]> = [
  [
    "quasi-periodic plus damped random walk",
    kernels
      .quasiPeriodic({ sigma: 0.1, period: 23.4, decayTime: 30, harmonicWeight: 0.35 })
      .plus(kernels.dampedRandomWalk({ sigma: 0.2, tau: 300 })),
  ],
  [
    "oscillator times damped random walk",
    kernels.oscillator({ sigma: 0.5, period: 40, quality: 3 }).times(kernels.dampedRandomWalk({ sigma: 0.4, tau: 200 })),
  ],
];

/**
 * Named kernels, one per layout of transition blocks (the sizes in brackets), for the tests that the
 * written-out recursions give the same bits as the general loops (the likelihood's and the gradient's).
 * Both oscillator regimes and the critically damped one (Q = 1/2), and a product, whose transitions are
 * called rather than written out.
 */
export const BLOCK_LAYOUT_CASES: Array<[string, Kernel]> = [
  ["damped random walk [1]", kernels.dampedRandomWalk({ sigma: 0.3, tau: 120 })],
  ["oscillator Q > 1/2 [2]", kernels.oscillator({ sigma: 0.2, period: 37, quality: 6 })],
  ["oscillator Q < 1/2 [2]", kernels.oscillator({ sigma: 0.2, period: 90, quality: 0.3 })],
  ["oscillator Q = 1/2 [2]", kernels.oscillator({ sigma: 0.2, period: 60, quality: 0.5 })],
  ["matern32 [2]", kernels.matern32({ sigma: 0.15, scale: 15 })],
  ["quasi-periodic [2, 2]", kernels.quasiPeriodic({ sigma: 0.1, period: 7.3, decayTime: 12, harmonicWeight: 0.35 })],
  // A coherence time of a fifth of the period: Q = 0.53 for the fundamental, the transitions' power-series branch.
  ["quasi-periodic, short decay time [2, 2]", kernels.quasiPeriodic({ sigma: 0.1, period: 40, decayTime: 8, harmonicWeight: 0.6 })],
  [
    "quasi-periodic + damped random walk [2, 2, 1]",
    kernels.quasiPeriodic({ sigma: 0.1, period: 23.4, decayTime: 30, harmonicWeight: 0.2 }).plus(kernels.dampedRandomWalk({ sigma: 0.2, tau: 400 })),
  ],
  ["CARMA(3, 1) [2, 1]", kernels.carma({ sigma: 0.2, oscillations: [{ period: 30, quality: 2 }], timescales: [80], movingAverage: [5] })],
  [
    "damped random walks [1, 1, 1]",
    kernels.dampedRandomWalk({ sigma: 0.1, tau: 5 }).plus(kernels.dampedRandomWalk({ sigma: 0.2, tau: 50 })).plus(kernels.dampedRandomWalk({ sigma: 0.3, tau: 500 })),
  ],
  [
    "oscillator x damped random walk [2, called through transition()]",
    kernels.oscillator({ sigma: 0.5, period: 40, quality: 3 }).times(kernels.dampedRandomWalk({ sigma: 0.4, tau: 200 })),
  ],
];
