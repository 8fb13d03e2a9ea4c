import { describe, expect, it } from "vitest";
import { convertLightCurve, fluxErrorToMagnitudeError, fluxToMagnitude, magnitudeErrorToFluxError, magnitudeToFlux, POGSON_ERROR_FACTOR } from "../../src/lightcurve/units.js";
import type { LightCurve } from "../../src/lightcurve/light-curve.js";

describe("magnitude and flux units", () => {
  it("follows Pogson's scale: 5 magnitudes are a factor 100 in flux", () => {
    // Pogson 1856, the definition of the magnitude scale.
    expect(magnitudeToFlux(15, 0) / magnitudeToFlux(20, 0)).toBeCloseTo(100, 10);
    expect(fluxToMagnitude(1, 25)).toBe(25);
  });

  it("puts 3631 Jy at AB magnitude 0 with the 8.90 mag zero point for janskys", () => {
    // Oke & Gunn 1983 (ApJ 266, 713): m_AB = -2.5 log10(f_nu / 3631 Jy), i.e. zp = 2.5 log10(3631) = 8.90.
    expect(fluxToMagnitude(3631, 8.9)).toBeCloseTo(0, 3);
  });

  it("propagates errors with the factor 2.5 / ln 10 = 1.0857", () => {
    // 1.0857 is the textbook value of 2.5 / ln 10 (common practice).
    expect(POGSON_ERROR_FACTOR).toBeCloseTo(1.0857, 4);
    expect(fluxErrorToMagnitudeError(0.01, 1)).toBeCloseTo(0.010857, 6);
    // First-order propagation equals the slope |dm/df| times sigma_f, checked by a central difference.
    const f = 3.7;
    const h = 1e-6;
    const slope = Math.abs(fluxToMagnitude(f + h, 0) - fluxToMagnitude(f - h, 0)) / (2 * h);
    expect(fluxErrorToMagnitudeError(0.2, f)).toBeCloseTo(slope * 0.2, 7);
    expect(magnitudeErrorToFluxError(fluxErrorToMagnitudeError(0.2, f), f)).toBeCloseTo(0.2, 12);
  });

  it("returns NaN for non-positive fluxes", () => {
    expect(fluxToMagnitude(0, 25)).toBeNaN();
    expect(fluxToMagnitude(-1, 25)).toBeNaN();
  });

  it("converts a whole light curve both ways", () => {
    const lc: LightCurve = {
      time: Float64Array.of(1, 2),
      value: Float64Array.of(100, 1000),
      error: Float64Array.of(1, 10),
      unit: "flux",
      provenance: { source: "t", timeColumn: "t", valueColumn: "flux", errorColumn: "flux_err", dropped: 0, sorted: false },
    };
    const mag = convertLightCurve(lc, "mag", 25);
    expect(mag.unit).toBe("mag");
    expect(mag.value[0]).toBeCloseTo(20, 12);
    expect(mag.value[1]).toBeCloseTo(17.5, 12);
    expect(mag.error![0]).toBeCloseTo(0.010857, 6);
    const back = convertLightCurve(mag, "flux", 25);
    expect(back.value[1]).toBeCloseTo(1000, 9);
    expect(back.error![1]).toBeCloseTo(10, 9);
    expect(() => convertLightCurve({ ...lc, value: Float64Array.of(1, -1) }, "mag", 25)).toThrow(/index 1/);
  });
});
