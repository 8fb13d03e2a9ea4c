import { describe, expect, it } from "vitest";
import { kernels } from "../../src/kernels/index.js";
import type { Kernel } from "../../src/kernels/kernel.js";
import { ExponentialTransition } from "../../src/linalg/exponential-transition.js";
import { FactorizationError } from "../../src/linalg/factorization-error.js";
import { reverseRecursion } from "../../src/linalg/reverse-recursion.js";
import { semiseparableLogLikelihoodGradient } from "../../src/linalg/semiseparable-gradient.js";
import type { SemiseparableForm } from "../../src/linalg/semiseparable-form.js";
import { semiseparableLogLikelihood } from "../../src/linalg/semiseparable-likelihood.js";
import { unrolledRecursion } from "../../src/linalg/unrolled-recursion.js";
import { createRng } from "../../src/random/rng.js";
import { BLOCK_LAYOUT_CASES } from "../helpers/kernel-cases.js";
import { randomErrors, seasonalTimes } from "../helpers/seasonal-times.js";

// Every kernel family, one layout of blocks each (the products run the general loops only).
const families: Array<[string, Kernel]> = [
  ...BLOCK_LAYOUT_CASES,
  ["oscillator x oscillator [4, general loops only]", kernels.oscillator({ sigma: 0.5, period: 40, quality: 3 }).times(kernels.oscillator({ sigma: 1, period: 9, quality: 2 }))],
];

const MEAN = 0.05;

/** A light curve drawn from nothing in particular: only the algebra is tested here. */
function lightCurve(seed: string, seasons: number, perSeason: number) {
  const rng = createRng(seed);
  const time = seasonalTimes(rng, { seasons, perSeason });
  const n = time.length;
  const noise = Float64Array.from(randomErrors(rng, n), (e) => e * e);
  const values = Float64Array.from({ length: n }, () => MEAN + 0.2 * rng.normal());
  return { time, noise, values };
}

/**
 * The derivative by the five-point central difference f' = [f(x - 2h) - 8 f(x - h) + 8 f(x + h) - f(x + 2h)] / 12h,
 * error O(h^4) (Abramowitz & Stegun 1964, 25.3.6).
 */
function centralDifference(f: (x: number) => number, x: number, h: number): number {
  return (f(x - 2 * h) - 8 * f(x - h) + 8 * f(x + h) - f(x + 2 * h)) / (12 * h);
}

describe("log-likelihood gradient", () => {
  describe("written-out passes against the general loops (bit for bit, across chunk boundaries)", () => {
    const { time, noise, values } = lightCurve("gradient:identical", 4, 700);
    it.each(families)("%s", (name, kernel) => {
      const form = kernel.semiseparableForm()!;
      const generalOnly = name.includes("general loops only");
      expect(unrolledRecursion(form.blocks, { record: true }) === undefined).toBe(generalOnly);
      expect(reverseRecursion(form.blocks) === undefined).toBe(generalOnly);
      const written = semiseparableLogLikelihoodGradient(form, time, noise, values, { mean: MEAN });
      const general = semiseparableLogLikelihoodGradient(form, time, noise, values, { mean: MEAN, unrolled: false });
      expect(Number.isFinite(written.value)).toBe(true);
      expect(written.value).toBe(general.value);
      expect(Array.from(written.kernel)).toEqual(Array.from(general.kernel));
      expect(Array.from(written.residual)).toEqual(Array.from(general.residual));
      expect(Array.from(written.noiseVariance)).toEqual(Array.from(general.noiseVariance));
      expect(written.residualSum).toBe(general.residualSum);
      expect(written.noiseVarianceSum).toBe(general.noiseVarianceSum);
      // The value is the likelihood's, to the last bit.
      expect(written.value).toBe(semiseparableLogLikelihood(form, time, noise, values, { mean: MEAN }));
    });
  });

  describe("against central finite differences (to 1e-9 of the gradient's scale)", () => {
    const { time, noise, values } = lightCurve("gradient:differences", 3, 100);
    it.each(families)("%s: kernel parameters, mean and noise", (_, kernel) => {
      const form = kernel.semiseparableForm()!;
      const g = semiseparableLogLikelihoodGradient(form, time, noise, values, { mean: MEAN });
      const base = kernel.parameterValues;
      const numeric = Array.from(base, (value, c) =>
        centralDifference(
          (x) => {
            const shifted = Float64Array.from(base);
            shifted[c] = x;
            return semiseparableLogLikelihood(kernel.withParameters(shifted).semiseparableForm()!, time, noise, values, { mean: MEAN });
          },
          value,
          1e-3 * Math.abs(value),
        ),
      );
      const scale = Math.max(1, ...numeric.map(Math.abs));
      numeric.forEach((d, c) => expect(Math.abs(g.kernel[c] - d) / scale).toBeLessThan(1e-9));
      // The mean: d log L / d mean = -sum of the residual adjoints; the noise: a constant added to every variance.
      const byMean = centralDifference((m) => semiseparableLogLikelihood(form, time, noise, values, { mean: m }), MEAN, 1e-3);
      const byNoise = centralDifference(
        (v) => semiseparableLogLikelihood(form, time, noise.map((x) => x + v), values, { mean: MEAN }),
        0,
        1e-6,
      );
      expect(Math.abs(-g.residualSum - byMean) / Math.max(1, Math.abs(byMean))).toBeLessThan(1e-9);
      expect(Math.abs(g.noiseVarianceSum - byNoise) / Math.max(1, Math.abs(byNoise))).toBeLessThan(1e-8);
    });

    it("an observation vector that depends on a parameter (p = [a], q = [a s^2]: k = a^2 s^2 exp(-|t| / tau))", () => {
      const s2 = 0.04;
      const formAt = (a: number): SemiseparableForm => ({
        blocks: [new ExponentialTransition(1 / 90, [])],
        observation: Float64Array.of(a),
        projection: Float64Array.of(a * s2),
        parameterCount: 1,
        observationGradient: Float64Array.of(1),
        projectionGradient: Float64Array.of(s2),
      });
      const g = semiseparableLogLikelihoodGradient(formAt(1.3), time, noise, values, { mean: MEAN });
      const numeric = centralDifference((a) => semiseparableLogLikelihood(formAt(a), time, noise, values, { mean: MEAN }), 1.3, 1e-3);
      expect(Math.abs(g.kernel[0] - numeric) / Math.max(1, Math.abs(numeric))).toBeLessThan(1e-9);
    });
  });

  it("pointwise: false gives the same sums without the per-point arrays", () => {
    const { time, noise, values } = lightCurve("gradient:sums", 2, 50);
    const form = kernels.quasiPeriodic({ sigma: 0.1, period: 7.3, decayTime: 12, harmonicWeight: 0.35 }).semiseparableForm()!;
    const full = semiseparableLogLikelihoodGradient(form, time, noise, values, { mean: MEAN });
    const sums = semiseparableLogLikelihoodGradient(form, time, noise, values, { mean: MEAN, pointwise: false });
    expect(sums.residual.length).toBe(0);
    expect(sums.noiseVariance.length).toBe(0);
    expect(Array.from(sums.kernel)).toEqual(Array.from(full.kernel));
    expect(sums.residualSum).toBe(full.residualSum);
    expect(full.residual.reduce((a, b) => a + b, 0)).toBeCloseTo(full.residualSum, 10);
  });

  it("throws a FactorizationError naming the point where the pivot is not positive", () => {
    const { time, noise, values } = lightCurve("gradient:failure", 2, 50);
    const form = kernels.dampedRandomWalk({ sigma: 0.3, tau: 120 }).semiseparableForm()!;
    const negative = Float64Array.from(noise);
    negative[37] = -10;
    for (const unrolled of [true, false]) {
      expect(() => semiseparableLogLikelihoodGradient(form, time, negative, values, { unrolled })).toThrow(FactorizationError);
      expect(() => semiseparableLogLikelihoodGradient(form, time, negative, values, { unrolled })).toThrow(/37/);
    }
  });
});
