import { describe, expect, it } from "vitest";
import { parameterAxisTitle, parameterDisplay } from "../../src/report/parameter-display.js";
import { timeAxisTitle, timeOffset } from "../../src/report/time-offset.js";
import { inventedReportInput } from "./invented-input.js";

const input = inventedReportInput({ chains: 2, steps: 60 });

describe("parameterDisplay", () => {
  it("gives the model parameters symbols and units from the light curve and time unit", () => {
    expect(parameterDisplay(input, "tau")).toMatchObject({ label: "τ", unit: "d", logScale: false });
    expect(parameterDisplay(input, "sigma")).toMatchObject({ label: "σ", unit: "mag" });
    expect(parameterDisplay(input, "quality").unit).toBe("");
    const flux = { ...input, timeUnit: "h", lightCurve: { ...input.lightCurve, unit: "flux" as const } };
    expect(parameterDisplay(flux, "period").unit).toBe("h");
    expect(parameterDisplay(flux, "jitter").unit).toBe("flux");
  });
  it("lets the caller override labels, units and the log axis", () => {
    const custom = { ...input, parameterDisplay: { tau: { label: "τ_DRW", logScale: true }, extra: { unit: "K" } } };
    const tau = parameterDisplay(custom, "tau");
    expect(tau).toMatchObject({ label: "τ_DRW", unit: "d", logScale: true });
    expect(parameterAxisTitle(tau)).toBe("log₁₀ τ_DRW [d]");
    expect(parameterAxisTitle(parameterDisplay(custom, "extra"))).toBe("extra [K]");
    expect(parameterAxisTitle(parameterDisplay(custom, "quality"))).toBe("Q");
  });
});

describe("timeOffset", () => {
  it("subtracts a round thousand from Julian-date-like times and nothing from small ones", () => {
    expect(timeOffset([2459123.4, 2459876.1])).toBe(2459000);
    expect(timeOffset([58012.3, 59000])).toBe(58000);
    expect(timeOffset([0, 1500])).toBe(0);
    expect(timeOffset([])).toBe(0);
    expect(timeAxisTitle(2459000, "d")).toBe("Time − 2459000 [d]");
    expect(timeAxisTitle(-12000, "d")).toBe("Time + 12000 [d]");
    expect(timeAxisTitle(0, "h")).toBe("Time [h]");
  });
});
