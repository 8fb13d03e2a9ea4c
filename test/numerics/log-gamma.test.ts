import { describe, expect, it } from "vitest";
import { logGamma } from "../../src/numerics/log-gamma.js";

describe("log Gamma (@stdlib/math gammaln behind a domain check)", () => {
  it("matches exact factorials and Gamma(1/2) = sqrt(pi)", () => {
    // Gamma(n) = (n - 1)!; Gamma(1/2) = sqrt(pi); Gamma(n + 1/2) = (2n)! sqrt(pi) / (4^n n!) (Abramowitz & Stegun 6.1.12).
    let factorial = 1;
    for (let n = 1; n <= 25; n++) {
      expect(logGamma(n)).toBeCloseTo(Math.log(factorial), 10);
      factorial *= n;
    }
    expect(logGamma(0.5)).toBeCloseTo(0.5 * Math.log(Math.PI), 13);
    expect(logGamma(3.5)).toBeCloseTo(Math.log((720 * Math.sqrt(Math.PI)) / (64 * 6)), 13);
    expect(logGamma(0.1)).toBeCloseTo(Math.log(9.513507698668732), 12); // Gamma(0.1), from memory
    expect(() => logGamma(0)).toThrow(RangeError);
  });
});
