import { describe, expect, it } from "vitest";
import { photometricError, photometricErrors, randomMagnitudeError } from "../../src/lightcurve/photometric-error.js";

describe("Ivezic et al. 2019 photometric error (ApJ 873, 111, eq. 5)", () => {
  it("is 0.2 mag at the 5-sigma depth", () => {
    // Ivezic et al. 2019 eq. 5 with x = 1: sigma^2 = (0.04 - gamma) + gamma = 0.04, for any gamma.
    for (const gamma of [0.037, 0.038, 0.039]) {
      expect(randomMagnitudeError(24.16, 24.16, gamma)).toBeCloseTo(0.2, 12);
    }
    // A 5-sigma detection has S/N = 5, so sigma_m = 1.0857 / 5 = 0.217 mag: the same to 10% (common practice).
    expect(Math.abs(randomMagnitudeError(23, 23) - 2.5 / Math.LN10 / 5)).toBeLessThan(0.02);
  });

  it("is about 0.01 mag 3.5 mag above the depth", () => {
    // Common practice for a wide survey: ~1% photometry 3.5 mag above the single-visit depth.
    const random = randomMagnitudeError(24.5 - 3.5, 24.5, 0.039);
    expect(random).toBeGreaterThan(0.009);
    expect(random).toBeLessThan(0.011);
    // With the 0.005 mag systematic floor of Ivezic et al. 2019 (eq. 4) added in quadrature.
    const total = photometricError(21, { depth5Sigma: 24.5 });
    expect(total).toBeCloseTo(Math.hypot(0.005, random), 12);
    expect(total).toBeGreaterThan(0.01);
    expect(total).toBeLessThan(0.012);
  });

  it("grows as 10^(0.4 (m - m5)) per magnitude far below the depth", () => {
    // Eq. 5 is dominated by gamma x^2 for x >> 1, so sigma ~ sqrt(gamma) x: a factor 10^0.4 per magnitude.
    const a = randomMagnitudeError(30, 24);
    const b = randomMagnitudeError(31, 24);
    expect(b / a).toBeCloseTo(Math.pow(10, 0.4), 2);
  });

  it("rejects invalid options with a message naming the option", () => {
    expect(() => photometricError(20, { depth5Sigma: Number.NaN })).toThrow(/depth5Sigma/);
    expect(() => photometricError(20, { depth5Sigma: 24, gamma: 0.5 })).toThrow(/gamma/);
    expect(() => photometricError(20, { depth5Sigma: 24, systematicFloor: -1 })).toThrow(/systematicFloor/);
  });

  it("maps arrays element by element", () => {
    const errors = photometricErrors([20, 22, 24], { depth5Sigma: 24, systematicFloor: 0 });
    expect(errors[2]).toBeCloseTo(0.2, 12);
    expect(errors[0]).toBeLessThan(errors[1]);
  });
});
