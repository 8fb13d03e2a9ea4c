import { describe, expect, it } from "vitest";
import { parseDelimitedLightCurves } from "../../src/lightcurve/delimited-light-curve.js";
import { isPlaceholderRow } from "../../src/lightcurve/placeholder-values.js";

/**
 * Placeholder codes (issue 12): rows with mag = 99 and err = 99, a common "no measurement" code of
 * photometric catalogues (common practice), loaded without a word. They are dropped, counted and
 * reported like missing values, unless asked to be kept.
 */
const body = (extra: string) => "mjd,mag,mag_err\n" + Array.from({ length: 8 }, (_, i) => `${59000 + i},18.${i},0.02`).join("\n") + "\n" + extra;

describe("placeholder codes", () => {
  it("drops, counts and reports rows with 99, 99.99, -99 or -999 in the magnitude or its error", () => {
    const text = body("59010,99,99\n59011,18.3,99.99\n59012,-99,0.02\n59013,18.1,-999\n59014,,0.02\n");
    const { lightCurves, warnings } = parseDelimitedLightCurves(text, "codes.csv");
    const lc = lightCurves[0];
    expect(lc.time.length).toBe(8);
    expect(lc.provenance.dropped).toBe(5);
    expect(lc.provenance.placeholders).toBe(4);
    expect(warnings).toContain("codes.csv: dropped 1 row(s) with a missing value (lines 14)");
    expect(warnings.some((w) => w.includes("dropped 4 row(s) whose value or error is a placeholder code") && w.includes("lines 10, 11, 12, 13"))).toBe(true);
  });

  it("keeps them when asked (a -999 error is still not a valid error)", () => {
    const { lightCurves } = parseDelimitedLightCurves(body("59010,99,99\n59011,18.3,99.99\n"), "codes.csv", { keepPlaceholders: true });
    expect(lightCurves[0].time.length).toBe(10);
    expect(lightCurves[0].provenance.placeholders).toBe(0);
    expect(() => parseDelimitedLightCurves(body("59013,18.1,-999\n"), "codes.csv", { keepPlaceholders: true })).toThrow(/not positive/);
  });

  it("leaves fluxes of 99 alone: only a negative code in a flux error is a placeholder", () => {
    expect(isPlaceholderRow(99, 0.5, "flux")).toBe(false);
    expect(isPlaceholderRow(-99, 0.5, "flux")).toBe(false);
    expect(isPlaceholderRow(12, -99, "flux")).toBe(true);
    expect(isPlaceholderRow(99.99, 0.1, "mag")).toBe(true);
    expect(isPlaceholderRow(19.99, 0.1, "mag")).toBe(false);
  });
});
