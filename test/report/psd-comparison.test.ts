import { beforeAll, describe, expect, it } from "vitest";
import { GaussianProcess } from "../../src/gp/gaussian-process.js";
import { kernels } from "../../src/kernels/index.js";
import { computePeriodogram } from "../../src/periodogram/periodogram.js";
import { createRng } from "../../src/random/rng.js";
import { binnedPeriodogram, oneSidedPsd, periodogramAsPsd, psdComparison, type PsdComparison } from "../../src/report/psd-comparison.js";
import { psdFigure } from "../../src/report/psd-figure.js";
import { renderFigure, type RenderedFigure } from "../../src/report/render-figure.js";
import { reportFigures } from "../../src/report/report-figures.js";
import { spectrumComparison } from "../../src/report/spectrum-comparison.js";
import { bestDampedRandomWalk } from "../../src/models/best-damped-random-walk.js";
import { simpson } from "../helpers/quadrature.js";
import { inventedReportInput } from "./invented-input.js";
import { PNG_SIGNATURE, svgTexts } from "./svg-marks.js";

function evenlySampled(seed: string, n: number, step: number, signal: (t: Float64Array) => Float64Array, noise: number) {
  const rng = createRng(seed);
  const time = Float64Array.from({ length: n }, (_, i) => i * step);
  const latent = signal(time);
  return {
    time,
    value: Float64Array.from(latent, (v) => 17 + v + noise * rng.normal()),
    error: new Float64Array(n).fill(noise),
    unit: "mag" as const,
    provenance: { source: "simulated", timeColumn: "t", valueColumn: "mag", errorColumn: "err", dropped: 0, sorted: false },
  };
}

describe("the power spectrum on one scale", () => {
  it("the one-sided PSD integrates over frequency to the variance (DRW: sigma^2; CARMA(2,1) likewise)", () => {
    // integral_0^inf 2 S(2 pi f) df = k(0) (Wiener-Khinchin, common practice); on a log grid, f = e^x.
    for (const kernel of [
      kernels.dampedRandomWalk({ sigma: 0.3, tau: 40 }),
      kernels.carma({ sigma: 0.2, oscillations: [{ period: 90, quality: 1.5 }], movingAverage: [25] }),
    ]) {
      const integral = simpson((x) => Math.exp(x) * (oneSidedPsd(kernel, [Math.exp(x)])[0] ?? 0), Math.log(1e-8), Math.log(1e4), 6000);
      expect(integral / kernel.covarianceAt(0)).toBeCloseTo(1, 3);
    }
  });

  it("the periodogram of white noise lies at the expected level 2 e^2 T / N, and that of a DRW follows its PSD", () => {
    // White noise of variance e^2 has the flat one-sided PSD 2 e^2 dt (dt = T / N for even sampling; common
    // practice): the periodogram's mean over frequencies must sit there, and its noise level say so.
    const white = evenlySampled("psd:white", 1000, 1, (t) => new Float64Array(t.length), 0.05);
    const gls = computePeriodogram(white);
    const scaled = periodogramAsPsd(white, gls.power);
    const mean = scaled.power.reduce((s, p) => s + p, 0) / scaled.power.length;
    expect(scaled.noiseLevel).toBeCloseTo((2 * 0.05 ** 2 * 999) / 1000, 10);
    expect(mean / scaled.noiseLevel!).toBeGreaterThan(0.9);
    expect(mean / scaled.noiseLevel!).toBeLessThan(1.1);

    // A DRW sampled every day for 4000 d, little noise: where a bin holds m >= 20 independent frequencies
    // (spacing 1 / T; bins of 1/12 decade hold 0.21 f T) and below 0.2 / d (aliasing from above the Nyquist
    // frequency 0.5 / d adds a few per cent there), the binned periodogram follows 2 S(2 pi f): the mean log
    // ratio within 0.1, each within 4 / sqrt(m) + 0.1 (a mean of m chi-square_2 / 2 has relative sd 1 / sqrt(m)).
    const drw = kernels.dampedRandomWalk({ sigma: 0.2, tau: 30 });
    const rng = createRng("psd:drw");
    const red = evenlySampled("psd:drw-noise", 4000, 1, (t) => new GaussianProcess(drw, t).priorDraw(rng), 0.002);
    const redGls = computePeriodogram(red);
    const bins = binnedPeriodogram(redGls.frequency, periodogramAsPsd(red, redGls.power).power);
    const independent = (f: number) => (Math.pow(10, 1 / 12) - 1) * f * 4000;
    const ratios = Array.from(bins.frequency)
      .map((f, i) => ({ f, ratio: (bins.power[i] ?? 0) / (oneSidedPsd(drw, [f])[0] ?? 1) }))
      .filter((b) => independent(b.f) >= 20 && b.f < 0.2);
    expect(ratios.length).toBeGreaterThan(8);
    const logs = ratios.map((b) => Math.log(b.ratio));
    expect(Math.abs(logs.reduce((s, v) => s + v, 0) / logs.length)).toBeLessThan(0.1);
    for (const b of ratios) expect(Math.abs(Math.log(b.ratio))).toBeLessThan(4 / Math.sqrt(independent(b.f)) + 0.1);
  });

  it("posterior quantiles over the draws, and the best DRW's PSD on the model's frequencies", () => {
    const lightCurve = evenlySampled("psd:quantiles", 200, 2, (t) => new Float64Array(t.length), 0.05);
    const frequency = Float64Array.of(0.001, 0.01, 0.1);
    const draws = Array.from({ length: 41 }, (_, k) => kernels.dampedRandomWalk({ sigma: 0.1 + 0.005 * k, tau: 20 }));
    const comparison = psdComparison({
      lightCurve,
      modelLabel: "DRW",
      periodogram: { frequency: Float64Array.of(0.01, 0.02), power: Float64Array.of(0.1, 0.2) },
      frequency,
      kernels: draws,
      referenceDrw: { sigma: 0.2, tau: 20 },
    });
    // The median draw is the middle one (sigma = 0.2), the reference DRW the same process.
    expect(comparison.median[1]).toBeCloseTo(oneSidedPsd(kernels.dampedRandomWalk({ sigma: 0.2, tau: 20 }), [0.01])[0] ?? NaN, 12);
    expect(comparison.referenceDrw?.psd[1]).toBeCloseTo(comparison.median[1] ?? NaN, 12);
    for (let i = 0; i < 3; i++) {
      expect(Number(comparison.lower95[i])).toBeLessThan(Number(comparison.lower68[i]));
      expect(Number(comparison.lower68[i])).toBeLessThan(Number(comparison.median[i]));
      expect(Number(comparison.upper68[i])).toBeLessThan(Number(comparison.upper95[i]));
    }
    expect(comparison.draws).toBe(41);
  });
});

describe("which fits get the one-scale comparison", () => {
  it("CARMA fits, against the best DRW of the same data; DRW fits without it; other models not", () => {
    const base = inventedReportInput();
    const gls = computePeriodogram(base.lightCurve);
    const draws = [kernels.dampedRandomWalk({ sigma: 0.2, tau: 30 })];
    const carma = spectrumComparison(base.lightCurve, { ...base.result, model: "carma", options: { ...base.result.options, order: "2,1" } }, gls, draws);
    const best = bestDampedRandomWalk(base.lightCurve, base.result.seed);
    expect(carma?.modelLabel).toBe("CARMA(2,1)");
    expect(carma?.referenceDrw?.tau).toBe(best.tau);
    expect(best.tau).toBeGreaterThan(0);
    const drw = spectrumComparison(base.lightCurve, { ...base.result, model: "drw" }, gls, draws);
    expect(drw?.modelLabel).toBe("DRW");
    expect(drw?.referenceDrw).toBeUndefined();
    expect(spectrumComparison(base.lightCurve, { ...base.result, model: "quasi-periodic" }, gls, draws)).toBeUndefined();
  });
});

describe("power-spectrum figure of a CARMA fit", () => {
  const base = inventedReportInput();
  let comparison: PsdComparison;
  let rendered: RenderedFigure;
  beforeAll(async () => {
    const frequency = Float64Array.from({ length: 120 }, (_, i) => 1e-4 * Math.pow(1e4, i / 119));
    const draws = Array.from({ length: 30 }, (_, k) =>
      kernels.carma({ sigma: 0.2 + 0.002 * k, oscillations: [{ period: 90 + k, quality: 1.5 }], movingAverage: [25] }),
    );
    const gls = computePeriodogram(base.lightCurve);
    comparison = psdComparison({ lightCurve: base.lightCurve, modelLabel: "CARMA(2,1)", periodogram: gls, frequency, kernels: draws, referenceDrw: { sigma: 0.2, tau: 15 } });
    rendered = await renderFigure(psdFigure({ ...base, psdComparison: comparison })!);
  });

  it("takes the spectrum's place in the report when the input has the comparison", () => {
    const ids = reportFigures({ ...base, psdComparison: comparison }).map((f) => f.id);
    expect(ids.filter((id) => id === "spectrum")).toHaveLength(1);
    const figure = reportFigures({ ...base, psdComparison: comparison }).find((f) => f.id === "spectrum")!;
    expect(figure.title).toMatch(/best damped random walk/);
    expect(psdFigure(base)).toBeUndefined();
  });

  it("names every curve, puts frequency in 1/d and the PSD unit on the axes, and states the normalisation", async () => {
    expect(Array.from(rendered.png.slice(0, 8))).toEqual(PNG_SIGNATURE);
    const texts = svgTexts(rendered.svg);
    for (const text of ["Frequency [1 / d]", "One-sided PSD [mag² d]", "CARMA(2,1) posterior median", "68% band", "95% band", "periodogram", "periodogram, binned mean", "best DRW (τ = 15 d)"])
      expect(texts).toContain(text);
    const caption = psdFigure({ ...base, psdComparison: comparison })!.caption;
    expect(caption).toMatch(/P\(f\) = 2 S\(2πf\)/);
    expect(caption).toMatch(/generalised Lomb-Scargle power .* times the data's weighted variance times the baseline/);
    expect(caption).toMatch(/2⟨e²⟩T\/N/);
  });
});
