import { describe, expect, it } from "vitest";
import { absorbPivot, absorbPivotSource, logDeterminantOf, PIVOT_SCALE_DOWN, PIVOT_SCALE_UP, PRODUCT_SCALE_DOWN, PRODUCT_SCALE_UP } from "../../src/linalg/pivot-product.js";
import { createRng } from "../../src/random/rng.js";

// Reference: the plain sum of Math.log over the pivots (what the running product replaces).
function sumOfLogs(pivots: readonly number[]): number {
  return pivots.reduce((sum, d) => sum + Math.log(d), 0);
}

function logDeterminant(pivots: readonly number[]): number {
  const state = Float64Array.of(1, 0);
  for (const d of pivots) absorbPivot(d, state, 0, 1);
  return logDeterminantOf(state[0], state[1]);
}

describe("log-determinant from a rescaled running product of pivots", () => {
  it("uses exact powers of two as scale factors", () => {
    expect(PIVOT_SCALE_UP * PIVOT_SCALE_DOWN).toBe(1);
    expect(PRODUCT_SCALE_UP * PRODUCT_SCALE_DOWN).toBe(1);
    expect(Math.log2(PIVOT_SCALE_UP)).toBe(332);
    expect(Math.log2(PRODUCT_SCALE_UP)).toBe(498);
  });

  it("equals the sum of logarithms for 10^5 pivots of a typical light curve (1e-4 .. 1)", () => {
    const rng = createRng(3);
    const pivots = Array.from({ length: 100_000 }, () => 1e-4 * Math.exp(9 * rng.uniform()));
    const expected = sumOfLogs(pivots);
    expect(Math.abs(logDeterminant(pivots) - expected)).toBeLessThan(1e-12 * Math.abs(expected));
  });

  it("handles pivots far outside [1e-100, 1e100], subnormal ones included", () => {
    const pivots = [1e-300, 3e250, 5e-324, 1e308, 2.5, 1e-200, 7e-120, 4e180];
    const expected = sumOfLogs(pivots);
    expect(Math.abs(logDeterminant(pivots) - expected)).toBeLessThan(1e-13 * Math.abs(expected));
  });

  it("has a source form for generated code that gives the same product and exponent, bit for bit", () => {
    const written = new Function(
      "pivots",
      `let product = 1; let exponent = 0; for (const pivot of pivots) ${absorbPivotSource("pivot")} return [product, exponent];`,
    ) as (pivots: number[]) => number[];
    const rng = createRng(4);
    const pivots = Array.from({ length: 10_000 }, () => Math.exp(1400 * (rng.uniform() - 0.5)));
    const state = Float64Array.of(1, 0);
    for (const d of pivots) absorbPivot(d, state, 0, 1);
    const [product, exponent] = written(pivots);
    expect(product).toBe(state[0]);
    expect(exponent).toBe(state[1]);
  });
});
