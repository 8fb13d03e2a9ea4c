import { describe, expect, it } from "vitest";
import { kernels } from "../../src/kernels/index.js";
import { FactorizationError } from "../../src/linalg/factorization-error.js";
import { semiseparableLogLikelihood } from "../../src/linalg/semiseparable-likelihood.js";
import { unrolledRecursion } from "../../src/linalg/unrolled-recursion.js";
import { createRng } from "../../src/random/rng.js";
import { BLOCK_LAYOUT_CASES } from "../helpers/kernel-cases.js";
import { randomErrors, seasonalTimes } from "../helpers/seasonal-times.js";

// Reference: the general typed-array loop of the same recursion (checked against dense ml-matrix
// Cholesky in test/gp/engine-vs-dense.test.ts). The written-out code must reproduce it bit for bit.
const layouts = BLOCK_LAYOUT_CASES;

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
