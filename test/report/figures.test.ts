import normalQuantile from "@stdlib/stats/base/dists/normal/quantile/lib/index.js";
import { beforeAll, describe, expect, it } from "vitest";
import { cornerFigure } from "../../src/report/corner-figure.js";
import { formatMeasurement } from "../../src/report/format-measurement.js";
import { lightCurveFigure, NORMAL_Z95 } from "../../src/report/light-curve-figure.js";
import { renderFigure, renderSvg, type RenderedFigure } from "../../src/report/render-figure.js";
import type { ReportInput } from "../../src/report/report-input.js";
import { spectrumFigure, spectrumMarkers } from "../../src/report/spectrum-figure.js";
import { traceFigure } from "../../src/report/trace-figure.js";
import { inventedReportInput } from "./invented-input.js";
import { markSets, PNG_SIGNATURE, pngSize, svgTexts } from "./svg-marks.js";

const input = inventedReportInput();
const rendered: Record<string, RenderedFigure> = {};

beforeAll(async () => {
  for (const figure of [lightCurveFigure(input), cornerFigure(input), spectrumFigure(input)!, traceFigure(input)]) {
    rendered[figure.id] = await renderFigure(figure);
  }
});

function datasets(spec: unknown): Record<string, Record<string, number>[]> {
  return (spec as { datasets: Record<string, Record<string, number>[]> }).datasets;
}

describe("every figure renders to SVG and PNG", () => {
  it.each(["light-curve", "corner", "spectrum", "traces"])("%s: PNG signature and size twice the SVG's", (id) => {
    const r = rendered[id]!;
    expect(r.svg.startsWith("<svg")).toBe(true);
    expect(Array.from(r.png.slice(0, 8))).toEqual(PNG_SIGNATURE);
    expect(pngSize(r.png)).toEqual({ width: r.pngWidth, height: r.pngHeight });
    expect(r.pngWidth).toBe(Math.round(2 * r.width));
    expect(r.pngHeight).toBe(Math.round(2 * r.height));
    expect(r.width).toBeGreaterThan(300);
    expect(r.height).toBeGreaterThan(200);
  });
});

describe("light-curve figure", () => {
  it("labels both axes with units and names every series", () => {
    const texts = svgTexts(rendered["light-curve"]!.svg);
    // MJD-like times near 58000 are shown relative to a round offset (common practice).
    expect(texts).toContain("Time − 58000 [d]");
    expect(texts).toContain("Magnitude [mag]");
    for (const label of ["data ± 1σ", "posterior-predictive mean", "68% band", "95% band"]) expect(texts).toContain(label);
  });
  it("draws every measurement and its error bar, and both bands and the mean", () => {
    const sets = markSets(rendered["light-curve"]!.svg);
    const n = input.lightCurve.time.length;
    expect(sets.find((s) => s.type === "symbol")!.items).toBe(n);
    expect(sets.find((s) => s.type === "rule")!.items).toBe(n);
    expect(sets.filter((s) => s.type === "area")).toHaveLength(2);
    expect(sets.filter((s) => s.type === "line")).toHaveLength(1);
  });
  it("puts the 95% band at the Gaussian 0.975 quantile times the sd", () => {
    // Reference: the normal quantile function of @stdlib/stats.
    expect(NORMAL_Z95).toBeCloseTo(normalQuantile(0.975, 0, 1), 14);
    const grid = datasets(lightCurveFigure(input).spec)["grid"]!;
    grid.forEach((row, i) => {
      const sd = input.prediction.sd[i]!;
      expect(row["hi95"]! - row["m"]!).toBeCloseTo(normalQuantile(0.975, 0, 1) * sd, 10);
      expect(row["m"]! - row["lo68"]!).toBeCloseTo(sd, 12);
    });
  });
  it("reverses the axis for magnitudes only, and drops error bars for files without errors", async () => {
    // Brighter is up: magnitudes decrease with brightness (common practice).
    const magSpec = JSON.stringify(lightCurveFigure(input).spec);
    expect(magSpec).toContain('"reverse":true');
    const fluxInput: ReportInput = {
      ...input,
      lightCurve: { ...input.lightCurve, unit: "flux", error: undefined },
    };
    const figure = lightCurveFigure(fluxInput);
    expect(JSON.stringify(figure.spec)).toContain('"reverse":false');
    expect(figure.caption).toContain("no error bars");
    const svg = await renderSvg(figure);
    expect(svgTexts(svg)).toContain("Flux [flux units]");
    expect(svgTexts(svg)).toContain("data");
    expect(svgTexts(svg)).not.toContain("data ± 1σ");
    expect(markSets(svg).some((s) => s.type === "rule")).toBe(false);
  });
  it("leaves out error bars and thins points for very long light curves, and says so", () => {
    const n = 25000;
    const time = Float64Array.from({ length: n }, (_, i) => i * 0.02);
    const big: ReportInput = {
      ...input,
      lightCurve: {
        ...input.lightCurve,
        time,
        value: new Float64Array(n).fill(19),
        error: new Float64Array(n).fill(0.05),
      },
    };
    const figure = lightCurveFigure(big);
    expect(datasets(figure.spec)["data"]).toHaveLength(20000);
    expect(figure.caption).toContain("median 1σ error is 0.05 mag");
    expect(figure.caption).toContain("20000 of the 25000 points");
    expect(JSON.stringify(figure.spec)).not.toContain('"type":"rule"');
  });
});

describe("corner figure", () => {
  it("has a labelled axis per parameter and the median with its 68% interval above each marginal", () => {
    const texts = svgTexts(rendered["corner"]!.svg);
    for (const title of ["τ [d]", "σ [mag]", "mean [mag]"]) expect(texts).toContain(title);
    const tau = input.result.parameters["tau"]!;
    const expected = `τ = ${formatMeasurement(tau.median, tau.median - tau.q16, tau.q84 - tau.median)} d`;
    expect(texts).toContain(expected);
  });
  it("draws k marginals and k(k-1)/2 pair densities, each with marks", () => {
    const k = input.draws.names.length;
    const rects = markSets(rendered["corner"]!.svg).filter((s) => s.type === "rect");
    expect(rects).toHaveLength(k + (k * (k - 1)) / 2);
    for (const set of rects) expect(set.items).toBeGreaterThan(10);
    const rules = markSets(rendered["corner"]!.svg).filter((s) => s.type === "rule");
    expect(rules).toHaveLength(k);
    for (const set of rules) expect(set.items).toBe(3);
  });
  it("puts every kept draw into the marginal histogram that covers it", () => {
    const rows = datasets(cornerFigure(input).spec)["draws"]!;
    const total = input.draws.chains["tau"]!.reduce((sum, chain) => sum + chain.length, 0);
    expect(rows).toHaveLength(total);
  });
  it("switches to a log10 axis for a parameter whose draws span decades", async () => {
    const spread: ReportInput = {
      ...input,
      draws: {
        names: ["tau", "sigma"],
        chains: {
          tau: [Float64Array.from({ length: 400 }, (_, i) => 10 ** (1 + (3 * i) / 399))],
          sigma: [Float64Array.from({ length: 400 }, (_, i) => 0.2 + 0.0001 * i)],
        },
      },
    };
    const svg = await renderSvg(cornerFigure(spread));
    expect(svgTexts(svg)).toContain("log₁₀ τ [d]");
    expect(svgTexts(svg)).toContain("σ [mag]");
  });
});

describe("spectrum figure", () => {
  it("labels frequency, PSD and periodogram axes with units", () => {
    const texts = svgTexts(rendered["spectrum"]!.svg);
    expect(texts).toContain("Frequency [cycles / d]");
    expect(texts).toContain("Power spectral density [mag² d]");
    expect(texts).toContain("Periodogram power (normalised)");
    expect(texts).toContain("1/(2πτ)");
  });
  it("draws the band, the median and the periodogram", () => {
    const sets = markSets(rendered["spectrum"]!.svg);
    expect(sets.filter((s) => s.type === "area")).toHaveLength(1);
    expect(sets.filter((s) => s.type === "line")).toHaveLength(2);
  });
  it("marks the damped-random-walk break at 1/(2π tau) and an oscillator at 1/P", () => {
    // The DRW PSD is proportional to 1 / (1 + (2 pi f tau)^2) (Kelly, Bechtold & Siemiginowska 2009, ApJ 698, 895),
    // so it falls to half its low-frequency level at f = 1 / (2 pi tau).
    const tau = input.result.parameters["tau"]!.median;
    const breakMarker = spectrumMarkers(input).find((m) => m.label === "1/(2πτ)")!;
    expect(1 / (1 + (2 * Math.PI * breakMarker.frequency * tau) ** 2)).toBeCloseTo(0.5, 12);
    const baseline = spectrumMarkers(input).find((m) => m.label === "1/baseline")!;
    expect(baseline.frequency).toBeCloseTo(1 / input.result.data.baseline, 15);
    const oscillator: ReportInput = {
      ...input,
      result: { ...input.result, model: "oscillator", parameters: { period: { ...input.result.parameters["tau"]!, median: 12.5 } } },
    };
    expect(spectrumMarkers(oscillator)[0]).toEqual({ frequency: 0.08, label: "1/P" });
  });
  it("is left out when there is neither a periodogram nor a PSD band, and works with either alone", async () => {
    expect(spectrumFigure({ ...input, periodogram: undefined, psdBand: undefined })).toBeUndefined();
    const onlyPeriodogram = spectrumFigure({ ...input, psdBand: undefined })!;
    const svg = await renderSvg(onlyPeriodogram);
    expect(svgTexts(svg)).toContain("Periodogram power (normalised)");
    expect(svgTexts(svg)).not.toContain("Power spectral density [mag² d]");
  });
});

describe("trace figure", () => {
  it("draws one line per chain and parameter, on a labelled step axis", () => {
    const svg = rendered["traces"]!.svg;
    const lines = markSets(svg).filter((s) => s.type === "line");
    const chains = input.draws.chains["tau"]!.length;
    expect(lines).toHaveLength(chains * input.draws.names.length);
    for (const line of lines) expect(line.items).toBe(1);
    const texts = svgTexts(svg);
    for (const title of ["Step", "τ [d]", "σ [mag]", "mean [mag]"]) expect(texts).toContain(title);
  });
  it("thins long runs of many walkers evenly and says so", () => {
    const many = inventedReportInput({ chains: 40, steps: 400 });
    const figure = traceFigure(many);
    expect(datasets(figure.spec)["trace0"]).toHaveLength(40 * 200);
    expect(figure.caption).toContain("200 evenly spaced steps");
    expect(figure.caption).not.toContain("one colour per chain");
  });
});
