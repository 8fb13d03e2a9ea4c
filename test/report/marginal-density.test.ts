import normalPdf from "@stdlib/stats/base/dists/normal/pdf/lib/index.js";
import { describe, expect, it } from "vitest";
import { kernelDensity } from "../../src/report/marginal-density.js";
import { createRng } from "../../src/random/rng.js";

describe("kernelDensity", () => {
  it("recovers the standard normal density from 20000 draws (reference: @stdlib's normal pdf)", () => {
    const rng = createRng(11);
    const draws = Float64Array.from({ length: 20000 }, () => rng.normal());
    const curve = kernelDensity(draws, -4, 4, 81);
    let integral = 0;
    // Expected error at the mode: bias f''h^2/2 = 0.003 plus noise sd sqrt(f R(K) / (n h)) = 0.007 with
    // h = 0.124 (Silverman 1986, eqs. 3.14 and 3.17); 0.02 is the bias and about 2.5 sd.
    for (let i = 0; i < curve.x.length; i++) {
      expect(Math.abs(curve.density[i] - normalPdf(curve.x[i], 0, 1))).toBeLessThan(0.02);
      integral += curve.density[i] * (i === 0 || i === 80 ? 0.05 : 0.1);
    }
    expect(integral).toBeCloseTo(1, 2);
  });

  it("puts a sample with no spread at one grid point", () => {
    const curve = kernelDensity(Float64Array.of(2, 2, 2), 0, 4, 5);
    expect(Array.from(curve.density)).toEqual([0, 0, 1, 0, 0]);
  });
});
