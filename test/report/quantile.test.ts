import mediansorted from "@stdlib/stats/strided/mediansorted/lib/index.js";
import { describe, expect, it } from "vitest";
import { evenIndices } from "../../src/report/even-thinning.js";
import { quantileSorted } from "../../src/report/quantile.js";
import { createRng } from "../../src/random/rng.js";

describe("quantileSorted", () => {
  it("agrees with the median of @stdlib/stats at q = 0.5", () => {
    const rng = createRng(11);
    for (const n of [1, 2, 7, 100, 101]) {
      const x = Float64Array.from({ length: n }, () => rng.normal()).sort();
      // Reference: @stdlib/stats/strided/mediansorted.
      expect(quantileSorted(x, 0.5)).toBeCloseTo(mediansorted(n, x, 1), 14);
    }
  });
  it("interpolates between order statistics as definition 7 of Hyndman & Fan 1996", () => {
    // R's quantile(1:4, c(0.25, 0.9)) is 1.75 and 3.7 with its default type 7 (from memory).
    const x = Float64Array.of(1, 2, 3, 4);
    expect(quantileSorted(x, 0.25)).toBeCloseTo(1.75, 14);
    expect(quantileSorted(x, 0.9)).toBeCloseTo(3.7, 14);
    expect(quantileSorted(x, 0)).toBe(1);
    expect(quantileSorted(x, 1)).toBe(4);
    expect(quantileSorted(new Float64Array(0), 0.5)).toBeNaN();
  });
});

describe("evenIndices", () => {
  it("keeps everything under the limit and spreads the rest evenly, ends included", () => {
    expect(evenIndices(3, 5)).toEqual([0, 1, 2]);
    expect(evenIndices(10, 4)).toEqual([0, 3, 6, 9]);
    const picked = evenIndices(1000, 7);
    expect(picked).toHaveLength(7);
    expect(picked[0]).toBe(0);
    expect(picked[6]).toBe(999);
    for (let i = 1; i < picked.length; i++) expect(picked[i]! - picked[i - 1]!).toBeGreaterThanOrEqual(166);
  });
});
