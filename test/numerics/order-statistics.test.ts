import mediansorted from "@stdlib/stats/strided/mediansorted/lib/index.js";
import { describe, expect, it } from "vitest";
import { medianOf, quantileOf, sortedQuantile } from "../../src/numerics/order-statistics.js";
import { createRng } from "../../src/random/rng.js";

describe("sortedQuantile (Hyndman & Fan 1996, definition 7)", () => {
  it("agrees with the median of @stdlib/stats at p = 0.5", () => {
    const rng = createRng(11);
    for (const n of [1, 2, 7, 100, 101]) {
      const x = Float64Array.from({ length: n }, () => rng.normal()).sort();
      // Reference: @stdlib/stats/strided/mediansorted.
      expect(sortedQuantile(x, 0.5)).toBeCloseTo(mediansorted(n, x, 1), 14);
      expect(medianOf(x.slice().reverse())).toBeCloseTo(mediansorted(n, x, 1), 14);
    }
  });

  it("interpolates between order statistics: worked example on 1, 2, 3, 4", () => {
    // Definition 7: h = (n - 1) p; p = 0.25 gives h = 0.75, Q = 1 + 0.75 (2 - 1) = 1.75; p = 0.9 gives
    // h = 2.7, Q = 3 + 0.7 (4 - 3) = 3.7 (worked by hand from the definition).
    const x = Float64Array.of(1, 2, 3, 4);
    expect(sortedQuantile(x, 0.25)).toBeCloseTo(1.75, 14);
    expect(sortedQuantile(x, 0.9)).toBeCloseTo(3.7, 14);
    expect(quantileOf([4, 1, 3, 2], 0.9)).toBeCloseTo(3.7, 14);
    expect(sortedQuantile(x, 0)).toBe(1);
    expect(sortedQuantile(x, 1)).toBe(4);
    expect(sortedQuantile(x, -1)).toBe(1);
    expect(sortedQuantile(x, 2)).toBe(4);
    expect(sortedQuantile(new Float64Array(0), 0.5)).toBeNaN();
  });

  it("returns an order statistic itself when p falls on one, infinite or not", () => {
    const x = Float64Array.of(-Infinity, 0, 5, Infinity);
    expect(sortedQuantile(x, 1)).toBe(Infinity);
    expect(sortedQuantile(x, 0)).toBe(-Infinity);
    expect(sortedQuantile(x, 2 / 3)).toBe(5);
  });
});
