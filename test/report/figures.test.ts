import normalQuantile from "@stdlib/stats/base/dists/normal/quantile/lib/index.js";
import { beforeAll, describe, expect, it } from "vitest";
import { cornerFigure } from "../../src/report/corner-figure.js";
import { formatMeasurement } from "../../src/report/format-measurement.js";
import { lightCurveFigure, NORMAL_Z95 } from "../../src/report/light-curve-figure.js";
import { renderFigure, renderSvg, type RenderedFigure } from "../../src/report/render-figure.js";
import type { ReportInput } from "../../src/report/report-input.js";
import { spectrumFigure, spectrumMarkers } from "../../src/report/spectrum-figure.js";
import type { StoredChainTrace } from "../../src/models/fit-result.js";
import { importanceWeightsFigure } from "../../src/report/importance-weights-figure.js";
import { traceFigure } from "../../src/report/trace-figure.js";
import { inventedReportInput } from "./invented-input.js";
import { markSets, PNG_SIGNATURE, pngSize, svgTexts } from "./svg-marks.js";

const input = inventedReportInput();
const rendered: Record<string, RenderedFigure> = {};

beforeAll(async () => {
  for (const figure of [lightCurveFigure(input), cornerFigure(input), spectrumFigure(input)!, traceFigure(input)!]) {
    rendered[figure.id] = await renderFigure(figure);
  }
});

function datasets(spec: unknown): Record<string, Record<string, number>[]> {
  return (spec as { datasets: Record<string, Record<string, number>[]> }).datasets;
}

describe("every figure renders to SVG and PNG", () => {
  it.each(["light-curve", "corner", "spectrum", "traces"])("%s: PNG signature and size twice the SVG's", (id) => {
    const r = rendered[id];
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
    const texts = svgTexts(rendered["light-curve"].svg);
    // MJD-like times near 58000 are shown relative to a round offset (common practice).
    expect(texts).toContain(`${input.lightCurve.provenance.timeColumn === "mjd" ? "MJD" : "Time"} − 58000 [d]`);
    expect(texts).toContain("Magnitude [mag]");
    for (const label of ["data ± 1σ", "posterior-predictive mean", "68% band", "95% band"]) expect(texts).toContain(label);
  });
  it("draws every measurement and its error bar, and both bands and the mean", () => {
    const sets = markSets(rendered["light-curve"].svg);
    const n = input.lightCurve.time.length;
    expect(sets.find((s) => s.type === "symbol")!.items).toBe(n);
    expect(sets.find((s) => s.type === "rule")!.items).toBe(n);
    expect(sets.filter((s) => s.type === "area")).toHaveLength(2);
    expect(sets.filter((s) => s.type === "line")).toHaveLength(1);
  });
  it("puts the 95% band at the Gaussian 0.975 quantile times the sd", () => {
    // Reference: the normal quantile function of @stdlib/stats.
    expect(NORMAL_Z95).toBeCloseTo(normalQuantile(0.975, 0, 1), 14);
    const grid = datasets(lightCurveFigure(input).spec)["grid"];
    grid.forEach((row, i) => {
      const sd = input.prediction.sd[i];
      expect(row["hi95"] - row["m"]).toBeCloseTo(normalQuantile(0.975, 0, 1) * sd, 10);
      expect(row["m"] - row["lo68"]).toBeCloseTo(sd, 12);
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
    expect(datasets(figure.spec)["data"].length).toBeLessThanOrEqual(5000);
    expect(figure.caption).toContain("median 1σ error is 0.05 mag");
    expect(figure.caption).toContain("5000 of the 25000 points");
    expect(JSON.stringify(figure.spec)).not.toContain('"type":"rule"');
  });
});

describe("pair figure of the posterior", () => {
  it("has a labelled axis per parameter and no numbers over the marginals (they are in the parameter table)", () => {
    const texts = svgTexts(rendered["corner"].svg);
    for (const title of ["τ [d]", "σ [mag]", "mean [mag]"]) expect(texts).toContain(title);
    expect(texts.filter((t) => /=|\+.*\/|−.*\+/.test(t))).toEqual([]);
  });
  it("draws per parameter a density line, a 68% and a 95% band and the median; per pair the regions and the medians", () => {
    const k = input.draws.names.length;
    const sets = markSets(rendered["corner"].svg);
    expect(sets.filter((s) => s.type === "area")).toHaveLength(2 * k);
    expect(sets.filter((s) => s.type === "line")).toHaveLength(k);
    expect(sets.filter((s) => s.type === "rule")).toHaveLength(k);
    const regions = sets.filter((s) => s.type === "rect");
    expect(regions).toHaveLength((k * (k - 1)) / 2);
    for (const set of regions) expect(set.items).toBeGreaterThan(3);
  });
  it("shades the marginal exactly over the parameter table's 68% and 95% intervals", () => {
    const rows = datasets(cornerFigure(input).spec)["marginal-0"] as unknown as { x: number; part: string }[];
    const tau = input.result.parameters["tau"];
    const span = (part: string) => {
      const xs = rows.filter((r) => r.part === part).map((r) => r.x);
      return [Math.min(...xs), Math.max(...xs)];
    };
    const [lo68, hi68] = span("68%");
    const [lo95, hi95] = span("95%");
    expect(lo68).toBeCloseTo(tau.q16, 9);
    expect(hi68).toBeCloseTo(tau.q84, 9);
    // The axis spans the central 99% of the draws, so the 95% interval fits inside it.
    expect(lo95).toBeCloseTo(tau["q2.5"], 9);
    expect(hi95).toBeCloseTo(tau["q97.5"], 9);
  });
  it("stays readable from 2 to 8 parameters: every axis titled, the figure near the page width", async () => {
    for (const k of [2, 8]) {
      const names = Array.from({ length: k }, (_, i) => `theta${i}`);
      const many: ReportInput = {
        ...input,
        result: { ...input.result, parameters: {} },
        draws: {
          names,
          chains: Object.fromEntries(names.map((name, i) => [name, [Float64Array.from({ length: 600 }, (_, s) => Math.sin(s * (i + 1.3)) + i)]])),
        },
      };
      const svg = await renderSvg(cornerFigure(many));
      const texts = svgTexts(svg);
      for (const name of names) expect(texts.filter((t) => t === name).length).toBeGreaterThanOrEqual(2);
      const width = Number(/width="(\d+(?:\.\d+)?)"/.exec(svg)![1]);
      expect(width).toBeGreaterThan(350);
      expect(width).toBeLessThan(1000);
    }
  });
  it("draws a parameter whose draws span decades on a logarithmic axis in its own unit", async () => {
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
    const figure = cornerFigure(spread);
    expect(JSON.stringify(figure.spec)).toContain('"type":"log"');
    const texts = svgTexts(await renderSvg(figure));
    expect(texts).toContain("τ [d]");
    expect(texts).toContain("1000");
    expect(texts).toContain("σ [mag]");
  });
});

describe("spectrum figure of a periodic model", () => {
  const period = { ...input.result.parameters["tau"], median: 7.4, q16: 7.35, q84: 7.45, "q2.5": 7.3, "q97.5": 7.5 };
  const periodic: ReportInput = {
    ...input,
    result: { ...input.result, model: "quasi-periodic", parameters: { period }, periodModes: [{ period: 7.4, probability: 0.97 }, { period: 22.2, probability: 0.03 }], periodogramPeriod: 14.8,
      // The candidates weighed before sampling: P itself (inside the interval, not marked again), 2P (the peak, marked once) and 6P.
      periodCandidates: [{ period: 7.41, probability: 0.9 }, { period: 14.8, probability: 0.06 }, { period: 44.4, probability: 0.04 }] },
  };
  it("shades the period's 95% interval in frequency and period, marks the alias candidates, adds a period panel", async () => {
    const figure = spectrumFigure(periodic)!;
    const data = datasets(figure.spec);
    expect(data["period-interval"]).toEqual([{ f: 1 / 7.5, f2: 1 / 7.3, period: 7.3, period2: 7.5 }]);
    const candidates = data["alias-candidates"] as unknown as { period: number; label: string }[];
    expect(candidates.map((c) => c.period)).toEqual([22.2, 14.8, 44.4]);
    expect(candidates[2].label).toBe("candidate 44.4 d, p = 0.04");
    expect(candidates[0].label).toBe("mode 22.2 d, p = 0.03");
    expect((figure.spec as { vconcat?: unknown[] }).vconcat).toHaveLength(2);
    const texts = svgTexts(await renderSvg(figure));
    expect(texts).toContain("Period [d]");
    expect(texts).toContain("posterior period");
    expect(figure.caption).toContain("95% credible interval of the period, 7.3 to 7.5 d");
  });
});

describe("spectrum figure", () => {
  it("labels frequency, PSD and periodogram axes with units", () => {
    const texts = svgTexts(rendered["spectrum"].svg);
    expect(texts).toContain("Frequency [cycles / d]");
    expect(texts).toContain("Power spectral density [mag² d]");
    expect(texts).toContain("Periodogram power (normalised)");
    expect(texts).toContain("1/(2πτ)");
  });
  it("draws the band, the median and the periodogram", () => {
    const sets = markSets(rendered["spectrum"].svg);
    expect(sets.filter((s) => s.type === "area")).toHaveLength(1);
    expect(sets.filter((s) => s.type === "line")).toHaveLength(2);
  });
  it("marks the damped-random-walk break at 1/(2π tau) and an oscillator at 1/P", () => {
    // The DRW PSD is proportional to 1 / (1 + (2 pi f tau)^2) (Kelly, Bechtold & Siemiginowska 2009, ApJ 698, 895),
    // so it falls to half its low-frequency level at f = 1 / (2 pi tau).
    const tau = input.result.parameters["tau"].median;
    const breakMarker = spectrumMarkers(input).find((m) => m.label === "1/(2πτ)")!;
    expect(1 / (1 + (2 * Math.PI * breakMarker.frequency * tau) ** 2)).toBeCloseTo(0.5, 12);
    const baseline = spectrumMarkers(input).find((m) => m.label === "1/baseline")!;
    expect(baseline.frequency).toBeCloseTo(1 / input.result.data.baseline, 15);
    const oscillator: ReportInput = {
      ...input,
      result: { ...input.result, model: "oscillator", parameters: { period: { ...input.result.parameters["tau"], median: 12.5 } } },
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
  /** A trace of 3 walkers and their median over 900 iterations (burn-in 450) in which walker 3 drifts in tau. */
  function driftingTrace(): StoredChainTrace {
    const steps = Array.from({ length: 300 }, (_, k) => 3 * k);
    const series = [0, 1, 2].map((c) => ({
      label: `walker ${c + 1}`,
      chain: c as number | null,
      values: { tau: steps.map((s) => (c === 2 ? 200 + s : 200 + 10 * Math.sin(s + c))), sigma: steps.map(() => 0.2 + 0.01 * c) },
      logPosterior: steps.map((s) => -100 - (c === 2 ? s / 100 : 0)),
    }));
    return { sampler: "ensemble", chains: 24, iterations: 900, warmup: 450, steps, names: ["tau", "sigma"], series: [...series, { ...series[0], label: "median of 24 walkers", chain: null }] };
  }

  it("draws the whole run from the result's trace: one line per series in each parameter's panel and in ln p, the burn-in shaded", async () => {
    const traced = { ...input, result: { ...input.result, chainTraces: [driftingTrace()] } };
    const figure = traceFigure(traced)!;
    const rows = datasets(figure.spec)["trace0_0"];
    // Reference: the trace itself (4 series x 300 steps), drawn in log10 when tau spans a decade, else as is.
    expect(rows).toHaveLength(4 * 300);
    const drifting = rows.filter((r) => (r as Record<string, unknown>)["series"] === "walker 3"); // series are labels
    expect(drifting[drifting.length - 1]["step"]).toBe(897);
    const svg = await renderSvg(figure);
    const texts = svgTexts(svg);
    for (const title of ["Iteration (warm-up included)", "ln p", "burn-in", "walker 3", "median of 24 walkers"]) expect(texts).toContain(title);
    const marks = markSets(svg);
    // Panels: tau, sigma, ln p; in each one line per series and the shaded burn-in.
    expect(marks.filter((m) => m.type === "line")).toHaveLength(3 * 4);
    expect(marks.filter((m) => m.type === "rect").length).toBeGreaterThanOrEqual(3);
    expect(figure.caption).toContain("over the whole run of 900 iterations, drawn at 300 evenly spaced iterations");
    expect(figure.caption).toContain("3 of the 24 walkers and the median over all 24");
    expect(figure.caption).toContain("Not traced: mean, integrated out while sampling");
  });

  it("without a stored trace, draws the kept draws (a few chains, thinned) and says the warm-up is missing", () => {
    const many = inventedReportInput({ chains: 40, steps: 800 });
    const figure = traceFigure(many)!;
    expect(datasets(figure.spec)["trace0_0"]).toHaveLength(4 * 500);
    expect(figure.caption).toContain("holds no trace of the whole run");
  });

  it("is left out for an importance-sampled fit, whose weights are drawn instead", async () => {
    const weights = { draws: 1000, paretoK: 0.31, paretoKThreshold: 0.67, effectiveSampleSize: 640, ranks: [1, 2, 3, 500, 1000], scaledWeights: [4.2, 3.1, 2.5, 1.0, 0.0001] };
    const sampled = { ...input, result: { ...input.result, importanceWeights: [weights] } };
    expect(traceFigure(sampled)).toBeUndefined();
    const figure = importanceWeightsFigure(sampled)!;
    // The weights as stored, the smallest raised to the axis floor (1e-3 of an equal share).
    expect(datasets(figure.spec)["weights"].map((r) => r["w"])).toEqual([4.2, 3.1, 2.5, 1.0, 1e-3]);
    expect(figure.caption).toContain("k-hat 0.31 (threshold 0.67), ESS 640 of 1000 draws, the largest weight 4.2 times an equal share");
    expect(figure.caption).toContain("there is no chain");
    const texts = svgTexts(await renderSvg(figure));
    expect(texts).toContain("Weight × number of draws");
    expect(importanceWeightsFigure(input)).toBeUndefined();
  });
});

