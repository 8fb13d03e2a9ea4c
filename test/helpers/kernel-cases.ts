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
