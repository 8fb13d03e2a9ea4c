import { describe, expect, it } from "vitest";
import { observeMagnitudes } from "../../src/lightcurve/simulated-photometry.js";
import { createRng } from "../../src/random/rng.js";

describe("simulated survey photometry", () => {
  it("adds Gaussian noise with the Ivezic et al. 2019 error, reproducibly", () => {
    const n = 4000;
    const time = Float64Array.from({ length: n }, (_, i) => i);
    const truth = time.map(() => 24);
    const a = observeMagnitudes(time, truth, { depth5Sigma: 24, systematicFloor: 0 }, createRng(12));
    const b = observeMagnitudes(time, truth, { depth5Sigma: 24, systematicFloor: 0 }, createRng(12));
    expect(Array.from(a.value)).toEqual(Array.from(b.value));
    // At the 5-sigma depth the error is 0.2 mag (Ivezic et al. 2019, eq. 5); the sample sd of 4000
    // normal deviates is within 3 x 0.2 / sqrt(2 x 4000) of it.
    expect(a.error![0]).toBeCloseTo(0.2, 12);
    let mean = 0;
    for (const v of a.value) mean += v / n;
    let variance = 0;
    for (const v of a.value) variance += (v - mean) ** 2 / (n - 1);
    expect(Math.abs(Math.sqrt(variance) - 0.2)).toBeLessThan((3 * 0.2) / Math.sqrt(2 * n));
    expect(Math.abs(mean - 24)).toBeLessThan((3 * 0.2) / Math.sqrt(n));
    expect(a.unit).toBe("mag");
    expect(() => observeMagnitudes([2, 1], [20, 20], { depth5Sigma: 24 }, createRng(1))).toThrow(/sorted/);
  });
});
