import { describe, expect, it } from "vitest";
import type { FitParameterSummary } from "../../src/models/fit-result.js";
import { plainSummary } from "../../src/report/plain-summary.js";
import type { ReportInput } from "../../src/report/report-input.js";
import { inventedReportInput } from "./invented-input.js";

const base = inventedReportInput({ chains: 2, steps: 50 });

function summary(median: number, q16: number, q84: number): FitParameterSummary {
  const q2 = q16 - (median - q16);
  const q97 = q84 + (q84 - median);
  return { median, mean: median, sd: (q84 - q16) / 2, "q2.5": q2, q16, q84, "q97.5": q97, hdi95: [q2, q97] };
}

function withResult(patch: Partial<ReportInput["result"]>, extra: Partial<ReportInput> = {}): ReportInput {
  return { ...base, ...extra, result: { ...base.result, ...patch } };
}

describe("plainSummary", () => {
  it("states the DRW timescale and amplitude with rounded 68% intervals and their units", () => {
    const input = withResult({
      parameters: { tau: summary(312.4, 250.7, 391.6), sigma: summary(0.2381, 0.2131, 0.2669), mean: summary(19.4, 19.34, 19.46) },
      data: { ...base.result.data, baseline: 4000 },
    });
    const text = plainSummary(input).join(" ");
    expect(text).toContain("The damping timescale τ is 310 +80/−60 d");
    expect(text).toContain("the variability amplitude σ is 0.238 +0.029/−0.025 mag");
    expect(text).toContain("Other parameters: mean = 19.40 ± 0.06 mag");
    // Kozlowski 2017 (A&A 597, A128): the baseline should be at least about 10 tau; 4000/312.4 = 12.8.
    expect(text).toContain("The baseline is 13 times the timescale, long enough");
  });
  it("counts a joint fit's measurements per band and names the reference band", () => {
    const band = (name: string, count: number) => ({ ...base.lightCurve, band: name, time: new Float64Array(count) });
    const prediction = base.prediction;
    const bandPanels = [band("g", 30), band("r", 25), band("i", 20)].map((lightCurve) => ({ band: lightCurve.band, lightCurve, prediction }));
    const input = withResult(
      { data: { ...base.result.data, n: 75 }, parameters: { ...base.result.parameters, "lag.r": summary(2, 1.8, 2.2), "amplitude.r": summary(0.8, 0.78, 0.82) } },
      { bandPanels, lightCurve: bandPanels[0].lightCurve },
    );
    const text = plainSummary(input).join(" ");
    expect(text).toContain("The 3 bands have 75 measurements together (30 in g, 25 in r, 20 in i) over a baseline of");
    expect(text).toContain("The amplitudes and lags are relative to band g.");
  });
  it("says when the baseline is too short for an unbiased DRW timescale", () => {
    // Kozlowski 2017: below ~10 tau the timescale is biased; 1500 / 312.4 = 4.8.
    const input = withResult({
      parameters: { tau: summary(312.4, 250.7, 391.6), sigma: summary(0.24, 0.21, 0.27) },
      data: { ...base.result.data, baseline: 1500 },
    });
    expect(plainSummary(input).join(" ")).toContain("The baseline is 4.8 times the timescale, short of the 10 times");
  });
  it("flags a sampler that did not converge and counts the warnings", () => {
    const input = withResult({
      diagnostics: { ...base.result.diagnostics, converged: false, rhatMax: 1.234 },
      warnings: ["one", "two"],
    });
    const text = plainSummary(input).join(" ");
    expect(text).toContain("The sampler did not converge (largest R-hat 1.234, target below 1.01");
    expect(text).toContain("There are 2 warnings");
  });
  it("reports a quasi-periodic period, its decay time in periods and a dominant first harmonic", () => {
    const input = withResult({
      model: "quasi-periodic",
      parameters: {
        period: summary(6.2832, 6.2, 6.35),
        decayTime: summary(31.4, 25, 40),
        harmonicWeight: summary(0.7, 0.6, 0.8),
        sigma: summary(0.02, 0.018, 0.023),
      },
    });
    const text = plainSummary(input).join(" ");
    expect(text).toContain("Fitted model: a quasi-periodic model");
    expect(text).toContain("The period P is 6.28 +0.07/−0.08 d");
    expect(text).toContain("the decay time τ_decay is");
    // 31.4 / 6.2832 = 5.0 periods; harmonicWeight 0.7 > 1/2 puts most of the variance at P / 2 = 3.14 d.
    expect(text).toMatch(/coherent for about 31 \+9\/−6 d \(the decay time\), 5 periods/);
    expect(text).toContain("repeats mostly every P/2 = 3.14 d");
    const fundamental = withResult({ model: "quasi-periodic", parameters: { period: summary(6.3, 6.2, 6.4), decayTime: summary(30, 25, 40), harmonicWeight: summary(0.2, 0.1, 0.3) } });
    expect(plainSummary(fundamental).join(" ")).not.toContain("P/2");
  });
  it("mentions dropped rows and a missing error column", () => {
    const input = withResult({ data: { ...base.result.data, dropped: 1, errorColumn: null } });
    const text = plainSummary(input)[0];
    expect(text).toContain("1 row was dropped (1 with a missing value)");
    expect(text).toContain("a white-noise term was fitted");
    const placeholders = withResult({ data: { ...base.result.data, dropped: 3, placeholders: 2 } });
    expect(plainSummary(placeholders)[0]).toContain("3 rows were dropped (1 with a missing value, 2 with a placeholder code instead of a measurement)");
  });
});
