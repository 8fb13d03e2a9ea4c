import { describe, expect, it } from "vitest";
import { kernels } from "../../src/kernels/index.js";
import type { Kernel } from "../../src/kernels/kernel.js";
import { FactorizationError } from "../../src/linalg/factorization-error.js";
import { semiseparableLogLikelihood } from "../../src/linalg/semiseparable-likelihood.js";
import { unrolledRecursion } from "../../src/linalg/unrolled-recursion.js";
import { createRng } from "../../src/random/rng.js";
import { randomErrors, seasonalTimes } from "../helpers/seasonal-times.js";

// Reference: the general typed-array loop of the same recursion (checked against dense ml-matrix
// Cholesky in test/gp/engine-vs-dense.test.ts). The written-out code must reproduce it bit for bit.
const layouts: Array<[string, Kernel]> = [
  ["damped random walk [1]", kernels.dampedRandomWalk({ sigma: 0.3, tau: 120 })],
  ["oscillator Q > 1/2 [2]", kernels.oscillator({ sigma: 0.2, period: 37, quality: 6 })],
  ["oscillator Q < 1/2 [2]", kernels.oscillator({ sigma: 0.2, period: 90, quality: 0.3 })],
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

describe("written-out likelihood recursion", () => {
  const rng = createRng("unrolled");
  const time = seasonalTimes(rng, { seasons: 4, perSeason: 700 });
  const n = time.length;
  const noise = Float64Array.from(randomErrors(rng, n), (e) => e * e);
  const residual = Float64Array.from({ length: n }, () => 0.2 * rng.normal());

  it.each(layouts)("%s: identical to the general loop, across chunk boundaries", (_, kernel) => {
    const form = kernel.semiseparableForm()!;
    expect(unrolledRecursion(form.blocks)).toBeTypeOf("function");
    const written = semiseparableLogLikelihood(form, time, noise, residual);
    const general = semiseparableLogLikelihood(form, time, noise, residual, { unrolled: false });
    expect(Number.isFinite(written)).toBe(true);
    expect(written).toBe(general);
  });

  it("is not used for blocks larger than 2 x 2 (a product of oscillators), which take the general loop", () => {
    const product = kernels.oscillator({ sigma: 0.5, period: 40, quality: 3 }).times(kernels.oscillator({ sigma: 1, period: 9, quality: 2 }));
    expect(unrolledRecursion(product.semiseparableForm()!.blocks)).toBeUndefined();
  });

  it("throws a FactorizationError naming the point where the pivot is not positive", () => {
    const form = kernels.dampedRandomWalk({ sigma: 0.3, tau: 120 }).semiseparableForm()!;
    const negative = Float64Array.from(noise);
    negative[1234] = -10;
    expect(() => semiseparableLogLikelihood(form, time, negative, residual)).toThrow(FactorizationError);
    expect(() => semiseparableLogLikelihood(form, time, negative, residual)).toThrow(/1234/);
  });
});
