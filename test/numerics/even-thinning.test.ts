import { describe, expect, it } from "vitest";
import { evenlySpacedIndices, evenlySpacedItems } from "../../src/numerics/even-thinning.js";

describe("evenlySpacedIndices", () => {
  it("keeps everything up to the count and spreads the rest evenly from the first item", () => {
    expect(evenlySpacedIndices(3, 5)).toEqual([0, 1, 2]);
    // floor(k 10 / 4) for k = 0..3 (worked by hand).
    expect(evenlySpacedIndices(10, 4)).toEqual([0, 2, 5, 7]);
    expect(evenlySpacedIndices(0, 4)).toEqual([]);
    expect(evenlySpacedIndices(5, 0)).toEqual([]);
    const picked = evenlySpacedIndices(1000, 7);
    expect(picked).toHaveLength(7);
    expect(picked[0]).toBe(0);
    for (let i = 1; i < picked.length; i++) expect(picked[i] - picked[i - 1]).toBeGreaterThanOrEqual(142);
    expect(1000 - picked[6]).toBeLessThanOrEqual(143);
  });

  it("picks the items at those indices", () => {
    expect(evenlySpacedItems(["a", "b", "c", "d", "e", "f", "g", "h", "i", "j"], 4)).toEqual(["a", "c", "f", "h"]);
  });
});
