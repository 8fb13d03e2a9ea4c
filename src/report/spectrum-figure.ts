import type { TopLevelSpec } from "vega-lite";
import { evenIndices } from "./even-thinning.js";
import { FIGURE_COLORS, figureConfig } from "./figure-style.js";
import { timeUnitOf, valueUnitOf } from "./parameter-display.js";
import { quantileSorted } from "./quantile.js";
import type { ReportFigure } from "./report-figure.js";
import type { ReportInput } from "./report-input.js";

/** More frequencies than this are thinned evenly: a line cannot show more detail than the figure has pixels. */
const MAX_FREQUENCIES = 3000;
/**
 * The periodogram axis starts at this quantile of the power: a periodogram scatters like a chi-square with
 * two degrees of freedom, whose rare near-zero values would otherwise stretch a log axis over decades.
 */
const POWER_FLOOR_QUANTILE = 0.02;

/** A vertical marker at a frequency the reader should compare the spectrum with. */
export interface FrequencyMarker {
  readonly frequency: number;
  readonly label: string;
}

/**
 * Frequencies worth marking: the model's characteristic frequency (the break 1/(2πτ) of a damped random
 * walk, whose PSD is flat below it and falls as f⁻² above it; 1/P for oscillators and rotation), and the
 * range the sampling can probe, from 1/baseline up to the pseudo-Nyquist frequency 1/(2 × median cadence)
 * (VanderPlas 2018, ApJS 236, 16, section 4.1 on the Nyquist limit of uneven sampling).
 */
export function spectrumMarkers(input: ReportInput): FrequencyMarker[] {
  const { result } = input;
  const markers: FrequencyMarker[] = [];
  const tau = result.parameters["tau"]?.median;
  const period = result.parameters["period"]?.median;
  if (period !== undefined && period > 0) markers.push({ frequency: 1 / period, label: "1/P" });
  else if (tau !== undefined && tau > 0) markers.push({ frequency: 1 / (2 * Math.PI * tau), label: "1/(2πτ)" });
  if (result.data.baseline > 0) markers.push({ frequency: 1 / result.data.baseline, label: "1/baseline" });
  if (result.data.medianCadence > 0) {
    markers.push({ frequency: 1 / (2 * result.data.medianCadence), label: "1/(2 × cadence)" });
  }
  return markers;
}

/**
 * The power spectrum: the posterior median PSD of the model with its credible band (left axis), over the
 * periodogram of the data (right axis, its own normalisation), on log-log axes, with vertical markers at
 * the model's characteristic frequency and the limits of the sampling. Returns undefined when the input
 * has neither a periodogram nor a PSD band.
 */
export function spectrumFigure(input: ReportInput): ReportFigure | undefined {
  const { periodogram, psdBand } = input;
  if (periodogram === undefined && psdBand === undefined) return undefined;
  const timeUnit = timeUnitOf(input);
  const psdUnit = psdBand?.unit ?? `${valueUnitOf(input)}² ${timeUnit}`;
  const mass = Math.round((psdBand?.mass ?? 0.68) * 100);
  const xTitle = `Frequency [cycles / ${timeUnit}]`;
  const layers: unknown[] = [];
  const datasets: Record<string, unknown[]> = {};
  const frequencies: number[] = [];

  if (psdBand !== undefined) {
    datasets["psd"] = evenIndices(psdBand.frequency.length, MAX_FREQUENCIES)
      .map((i) => ({ f: psdBand.frequency[i]!, m: psdBand.median[i]!, lo: psdBand.lower[i]!, hi: psdBand.upper[i]! }))
      .filter((r) => r.f > 0 && r.m > 0 && r.lo > 0 && r.hi > 0);
    for (const r of datasets["psd"] as { f: number }[]) frequencies.push(r.f);
  }
  let powerDomain: [number, number] = [1, 1];
  if (periodogram !== undefined) {
    const rows = evenIndices(periodogram.frequency.length, MAX_FREQUENCIES)
      .map((i) => ({ f: periodogram.frequency[i]!, p: periodogram.power[i]! }))
      .filter((r) => r.f > 0 && r.p > 0);
    const sortedPower = Float64Array.from(rows, (r) => r.p).sort();
    // Headroom above the highest peak, so it is not flattened against the frame.
    powerDomain = [quantileSorted(sortedPower, POWER_FLOOR_QUANTILE), 1.5 * quantileSorted(sortedPower, 1)];
    datasets["periodogram"] = rows;
    for (const r of rows) frequencies.push(r.f);
  }
  const fMin = frequencies.reduce((a, b) => Math.min(a, b), Infinity);
  const fMax = frequencies.reduce((a, b) => Math.max(a, b), -Infinity);
  const x = {
    field: "f",
    type: "quantitative" as const,
    title: xTitle,
    scale: { type: "log", domain: [fMin, fMax], nice: false },
    axis: { format: "~g", grid: true },
  };
  const seriesLabels = {
    band: `model PSD, ${mass}% band`,
    median: "model PSD, median",
    periodogram: "periodogram",
  };
  const colorScale = {
    domain: [
      ...(psdBand ? [seriesLabels.median, seriesLabels.band] : []),
      ...(periodogram ? [seriesLabels.periodogram] : []),
    ],
    range: [
      ...(psdBand ? [FIGURE_COLORS.model, FIGURE_COLORS.modelBandInner] : []),
      ...(periodogram ? [FIGURE_COLORS.periodogram] : []),
    ],
  };
  const legend = { title: null, orient: "top" as const, direction: "horizontal" as const };

  if (periodogram !== undefined) {
    layers.push({
      data: { name: "periodogram" },
      mark: { type: "line", strokeWidth: 1, clip: true },
      encoding: {
        x,
        y: {
          field: "p",
          type: "quantitative",
          title: periodogram.label ?? "Periodogram power (normalised)",
          scale: { type: "log", domain: powerDomain, nice: false },
          axis: psdBand ? { orient: "right", titleColor: "#555555", format: "~g", grid: false } : { format: "~g" },
        },
        color: { datum: seriesLabels.periodogram, scale: colorScale, legend },
      },
    });
  }
  if (psdBand !== undefined) {
    layers.push({
      data: { name: "psd" },
      layer: [
        {
          mark: { type: "area", opacity: 0.7, clip: true },
          encoding: {
            x,
            y: {
              field: "lo",
              type: "quantitative",
              title: `Power spectral density [${psdUnit}]`,
              scale: { type: "log" },
              axis: { orient: "left", titleColor: FIGURE_COLORS.model, format: "~g" },
            },
            y2: { field: "hi" },
            color: { datum: seriesLabels.band, scale: colorScale, legend },
          },
        },
        {
          mark: { type: "line", strokeWidth: 2, clip: true },
          encoding: { x, y: { field: "m", type: "quantitative" }, color: { datum: seriesLabels.median } },
        },
      ],
    });
  }
  const markers = spectrumMarkers(input).filter((m) => m.frequency >= fMin && m.frequency <= fMax);
  if (markers.length > 0) {
    datasets["markers"] = markers.map((m) => ({ f: m.frequency, label: m.label }));
    layers.push({
      data: { name: "markers" },
      layer: [
        {
          mark: { type: "rule", strokeDash: [5, 4], color: FIGURE_COLORS.marker, strokeWidth: 1 },
          encoding: { x },
        },
        // A white outline under each label keeps it legible where it crosses a curve.
        ...[{ stroke: "white", strokeWidth: 3 }, {}].map((outline) => ({
          mark: {
            type: "text",
            angle: 270,
            align: "right",
            baseline: "bottom",
            dx: -4,
            dy: -3,
            fontSize: 10,
            color: FIGURE_COLORS.marker,
            ...outline,
          },
          encoding: { x, y: { value: 0 }, text: { field: "label" } },
        })),
      ],
    });
  }

  const spec = {
    $schema: "https://vega.github.io/schema/vega-lite/v6.json",
    config: figureConfig(),
    width: 680,
    height: 320,
    datasets,
    layer: layers,
    ...(periodogram && psdBand ? { resolve: { scale: { y: "independent" } } } : {}),
  } as unknown as TopLevelSpec;

  const parts = [
    psdBand
      ? `Blue: the posterior median power spectral density of the model with its ${mass}% credible band (left axis).`
      : "",
    periodogram
      ? `Grey: the periodogram of the data${psdBand ? " (right axis; its normalisation differs, so compare shapes, not heights)" : ""}.`
      : "",
    markers.length > 0 ? `Dashed lines: ${markers.map((m) => m.label).join(", ")}.` : "",
  ];
  return {
    id: "spectrum",
    title: "Power spectrum",
    caption: parts.filter((p) => p !== "").join(" "),
    spec,
  };
}
