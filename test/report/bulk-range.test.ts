import { describe, expect, it } from "vitest";
import { bulkRange } from "../../src/report/bulk-range.js";
import { lightCurveFigure } from "../../src/report/light-curve-figure.js";
import type { ReportInput } from "../../src/report/report-input.js";
import { timeScaleName } from "../../src/report/time-offset.js";
import { inventedReportInput } from "./invented-input.js";

describe("the value axis spans the bulk of the data", () => {
  it("ignores a few wild values and keeps the model curve in view", () => {
    const values = Float64Array.from({ length: 1000 }, (_, i) => 20 + 0.1 * Math.sin(i));
    values[10] = 99;
    values[20] = -5;
    const [low, high] = bulkRange(values, [20.3]);
    expect(low).toBeGreaterThan(19.8);
    expect(high).toBeCloseTo(20.3, 12);
  });

  it("draws an off-axis point at the edge with a triangle pointing its way, and says so", () => {
    const input = inventedReportInput({ nPoints: 300 });
    const value = Float64Array.from(input.lightCurve.value);
    value[5] = value[5] + 6; // six magnitudes fainter: below the bottom of a magnitude axis
    const faint: ReportInput = { ...input, lightCurve: { ...input.lightCurve, value } };
    const figure = lightCurveFigure(faint);
    const spec = figure.spec as { datasets: Record<string, { y: number; side?: string }[]> };
    expect(spec.datasets["beyond"]).toHaveLength(1);
    expect(spec.datasets["beyond"][0].side).toBe("down");
    expect(spec.datasets["data"].every((r) => r.y < value[5])).toBe(true);
    expect(figure.caption).toContain("1 point lies beyond it");
  });
});

describe("timeScaleName", () => {
  it("names the time scale from the column", () => {
    expect(timeScaleName("mjd")).toBe("MJD");
    expect(timeScaleName("MJD_obs")).toBe("MJD");
    expect(timeScaleName("bjd")).toBe("BJD");
    expect(timeScaleName("time")).toBe("Time");
    expect(timeScaleName(undefined)).toBe("Time");
  });
});
