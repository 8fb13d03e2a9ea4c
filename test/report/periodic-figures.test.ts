import { describe, expect, it } from "vitest";
import { phaseFigure, zoomFigure } from "../../src/report/periodic-figures.js";
import { renderSvg } from "../../src/report/render-svg.js";
import type { ReportInput } from "../../src/report/report-input.js";
import { inventedReportInput } from "./invented-input.js";
import { svgTexts } from "./svg-marks.js";

/** A strictly periodic invented signal, P = 5 d, amplitude 0.3 mag, sampled like the invented quasar. */
function periodicInput(): ReportInput {
  const base = inventedReportInput({ nPoints: 400 });
  const P = 5;
  const wave = (t: number) => 19 + 0.3 * Math.sin((2 * Math.PI * t) / P);
  const value = base.lightCurve.time.map(wave);
  const curve = (time: Float64Array) => ({ time, mean: time.map(wave), sd: time.map(() => 0.01) });
  const zoomTimes = Float64Array.from({ length: 200 }, (_, i) => base.lightCurve.time[0] + (20 * i) / 199);
  const period = { ...base.result.parameters["tau"], median: P, q16: 4.99, q84: 5.01, "q2.5": 4.98, "q97.5": 5.02 };
  return {
    ...base,
    lightCurve: { ...base.lightCurve, value },
    result: { ...base.result, parameters: { ...base.result.parameters, period } },
    periodic: { atData: curve(base.lightCurve.time), zoom: curve(zoomTimes) },
  };
}

describe("figures of a periodic model", () => {
  it("folds the data at the posterior period: the binned model follows the sine of the data", async () => {
    const input = periodicInput();
    const figure = phaseFigure(input)!;
    const model = figure.spec.datasets?.model as { phase: number; m: number }[];
    const t0 = input.lightCurve.time[0];
    // A folded sine: the value at phase p is 19 + 0.3 sin(2 pi (t0 / P + p)) (bins are 1/20 wide: error <= 0.3 * pi / 20).
    for (const row of model) expect(Math.abs(row.m - (19 + 0.3 * Math.sin(2 * Math.PI * (t0 / 5 + row.phase))))).toBeLessThan(0.05);
    const texts = svgTexts(await renderSvg(figure));
    expect(texts).toContain("Phase at P = 5 d");
    expect(texts).toContain("Magnitude [mag]");
  });

  it("zooms on a stretch of a few periods and leaves both out for models without a period", () => {
    const input = periodicInput();
    const zoom = zoomFigure(input)!;
    expect(zoom.title).toBe("A stretch of 4 periods");
    const rows = zoom.spec.datasets?.data as { t: number }[];
    expect(rows.length).toBeGreaterThan(0);
    const plain = inventedReportInput();
    expect(phaseFigure(plain)).toBeUndefined();
    expect(zoomFigure(plain)).toBeUndefined();
  });
});
