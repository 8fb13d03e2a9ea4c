import type { TopLevelSpec } from "vega-lite";
import { evenlySpacedIndices } from "../numerics/even-thinning.js";
import { FIGURE_COLORS, figureConfig } from "./figure-style.js";
import { formatSignificant } from "./format-measurement.js";
import { timeUnitOf, valueUnitOf } from "./parameter-display.js";
import { sortedQuantile } from "../numerics/order-statistics.js";
import type { ReportFigure } from "./report-figure.js";
import type { ReportInput } from "./report-input.js";
import type { DataRows, LayeredView, LayerMember } from "./vega-lite-types.js";

/** More frequencies than this are thinned evenly: a line cannot show more detail than the figure has pixels. */
const MAX_FREQUENCIES = 3000;
/**
 * The periodogram axis starts at this quantile of the power: a periodogram scatters like a chi-square with
 * two degrees of freedom, whose rare near-zero values would otherwise stretch a log axis over decades.
 */
const POWER_FLOOR_QUANTILE = 0.02;
/** Width of each panel in pixels. */
const WIDTH = 680;

/** A vertical marker at a frequency the reader should compare the spectrum with. */
export interface FrequencyMarker {
  readonly frequency: number;
  readonly label: string;
}

/** The posterior period of a periodic model and the other period modes the fit weighed. */
interface PeriodMarks {
  readonly median: number;
  /** The central 95% credible interval of the period. */
  readonly lower95: number;
  readonly upper95: number;
  /** Alias candidates: the weighed modes other than the posterior's, and the periodogram's highest peak. */
  readonly candidates: readonly { period: number; label: string }[];
}

/** The curves of the figure as rows, with their common frequency range and the periodogram's power range. */
interface SpectrumRows {
  readonly datasets: Record<string, DataRows>;
  readonly frequencyDomain: [number, number];
  readonly powerDomain: [number, number];
  /** Frequencies the periodogram covers (the period panel's range). */
  readonly periodogramDomain: [number, number];
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
 * the model's characteristic frequency and the limits of the sampling. For a model with a period, the
 * posterior period's 95% interval is shaded, the alias candidates the fit weighed are marked, and a second
 * panel shows the periodogram against period. Undefined when the input has neither a periodogram nor a
 * PSD band.
 */
export function spectrumFigure(input: ReportInput): ReportFigure | undefined {
  if (input.periodogram === undefined && input.psdBand === undefined) return undefined;
  const rows = spectrumRows(input);
  const periods = periodMarks(input);
  const markers = spectrumMarkers(input).filter((m) => m.frequency >= rows.frequencyDomain[0] && m.frequency <= rows.frequencyDomain[1]);
  if (markers.length > 0) rows.datasets["markers"] = markers.map((m) => ({ f: m.frequency, label: m.label }));
  if (periods) addPeriodRows(rows, periods);
  const frequency = frequencyPanel(input, rows, markers.length > 0, periods);
  const byPeriod = periods && input.periodogram ? periodPanel(input, rows, periods) : undefined;
  const spec: TopLevelSpec = byPeriod
    ? { $schema: SCHEMA, config: figureConfig(), datasets: rows.datasets, vconcat: [frequency, byPeriod], spacing: 28 }
    : { $schema: SCHEMA, config: figureConfig(), datasets: rows.datasets, ...frequency };
  return { id: "spectrum", title: "Power spectrum", caption: spectrumCaption(input, markers, periods, byPeriod !== undefined), spec };
}

const SCHEMA = "https://vega.github.io/schema/vega-lite/v6.json";

/** Stage 1: the PSD band and the periodogram as rows (thinned evenly, positive values only). */
function spectrumRows(input: ReportInput): SpectrumRows {
  const { periodogram, psdBand } = input;
  const datasets: Record<string, DataRows> = {};
  let fMin = Infinity;
  let fMax = -Infinity;
  if (psdBand !== undefined) {
    const psd = evenlySpacedIndices(psdBand.frequency.length, MAX_FREQUENCIES)
      .map((i) => ({ f: psdBand.frequency[i], m: psdBand.median[i], lo: psdBand.lower[i], hi: psdBand.upper[i] }))
      .filter((r) => r.f > 0 && r.m > 0 && r.lo > 0 && r.hi > 0);
    for (const r of psd) (fMin = Math.min(fMin, r.f)), (fMax = Math.max(fMax, r.f));
    datasets["psd"] = psd;
  }
  let powerDomain: [number, number] = [1, 1];
  let periodogramDomain: [number, number] = [1, 1];
  if (periodogram !== undefined) {
    const power = evenlySpacedIndices(periodogram.frequency.length, MAX_FREQUENCIES)
      .map((i) => ({ f: periodogram.frequency[i], period: 1 / periodogram.frequency[i], p: periodogram.power[i] }))
      .filter((r) => r.f > 0 && r.p > 0);
    const sorted = Float64Array.from(power, (r) => r.p).sort();
    // Headroom above the highest peak, so it is not flattened against the frame.
    powerDomain = [sortedQuantile(sorted, POWER_FLOOR_QUANTILE), 1.5 * sortedQuantile(sorted, 1)];
    let low = Infinity;
    let high = -Infinity;
    for (const r of power) (low = Math.min(low, r.f)), (high = Math.max(high, r.f));
    periodogramDomain = [low, high];
    fMin = Math.min(fMin, low);
    fMax = Math.max(fMax, high);
    datasets["periodogram"] = power;
  }
  return { datasets, frequencyDomain: [fMin, fMax], powerDomain, periodogramDomain };
}

/** Stage 2: the posterior period, its 95% interval and the alias candidates, for models with a period. */
function periodMarks(input: ReportInput): PeriodMarks | undefined {
  const { result } = input;
  const period = result.parameters["period"];
  if (period === undefined || !(period["q2.5"] > 0)) return undefined;
  const unit = timeUnitOf(input);
  const candidates: { period: number; label: string }[] = [];
  const distinct = (p: number) => p > 0 && (p < period["q2.5"] || p > period["q97.5"]) && candidates.every((c) => Math.abs(c.period / p - 1) > 0.01);
  for (const mode of result.periodModes ?? []) {
    if (distinct(mode.period)) {
      candidates.push({ period: mode.period, label: `mode ${formatSignificant(mode.period, 4)} ${unit}, ${formatProbability(mode.probability)}` });
    }
  }
  const peak = result.periodogramPeriod;
  if (peak !== undefined && distinct(peak)) candidates.push({ period: peak, label: `highest peak ${formatSignificant(peak, 4)} ${unit}` });
  for (const candidate of result.periodCandidates ?? []) {
    if (distinct(candidate.period)) {
      candidates.push({ period: candidate.period, label: `candidate ${formatSignificant(candidate.period, 4)} ${unit}, ${formatProbability(candidate.probability)}` });
    }
  }
  return { median: period.median, lower95: period["q2.5"], upper95: period["q97.5"], candidates };
}

function formatProbability(p: number): string {
  return p < 1e-3 ? "p < 0.001" : `p = ${formatSignificant(p, 2)}`;
}

/** Stage 3: the rows of the period marks, in both frequency and period. */
function addPeriodRows(rows: SpectrumRows, periods: PeriodMarks): void {
  rows.datasets["period-interval"] = [
    { f: 1 / periods.upper95, f2: 1 / periods.lower95, period: periods.lower95, period2: periods.upper95 },
  ];
  rows.datasets["alias-candidates"] = periods.candidates
    .filter((c) => 1 / c.period >= rows.frequencyDomain[0] && 1 / c.period <= rows.frequencyDomain[1])
    .map((c) => ({ f: 1 / c.period, period: c.period, label: c.label }));
}

/** A quantitative channel on a logarithmic scale over a fixed domain, with a grid (shared with psd-figure.ts). */
export function logAxis(field: string, title: string, domain: [number, number]) {
  return {
    field,
    type: "quantitative" as const,
    title,
    scale: { type: "log" as const, domain, nice: false },
    axis: { format: "~g", grid: true },
  };
}

/** Stage 4: the frequency panel, periodogram under the model's PSD band, markers over both. */
function frequencyPanel(input: ReportInput, rows: SpectrumRows, withMarkers: boolean, periods: PeriodMarks | undefined): LayeredView {
  const { periodogram, psdBand } = input;
  const timeUnit = timeUnitOf(input);
  const x = logAxis("f", `Frequency [cycles / ${timeUnit}]`, rows.frequencyDomain);
  const labels = { band: `model PSD, ${bandPercent(input)}% band`, median: "model PSD, median", periodogram: "periodogram" };
  const colorScale = {
    domain: [...(psdBand ? [labels.median, labels.band] : []), ...(periodogram ? [labels.periodogram] : [])],
    range: [
      ...(psdBand ? [FIGURE_COLORS.model, FIGURE_COLORS.modelBandInner] : []),
      ...(periodogram ? [FIGURE_COLORS.periodogram] : []),
    ],
  };
  const legend = { title: null, orient: "top" as const, direction: "horizontal" as const };
  const layers: LayerMember[] = [];
  if (periods) layers.push(intervalLayer("f", x));
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
          scale: { type: "log", domain: rows.powerDomain, nice: false },
          axis: psdBand ? { orient: "right", titleColor: "#555555", format: "~g", grid: false } : { format: "~g" },
        },
        color: { datum: labels.periodogram, scale: colorScale, legend },
      },
    });
  }
  if (psdBand !== undefined) {
    const psdUnit = psdBand.unit ?? `${valueUnitOf(input)}² ${timeUnit}`;
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
            color: { datum: labels.band, scale: colorScale, legend },
          },
        },
        {
          mark: { type: "line", strokeWidth: 2, clip: true },
          encoding: { x, y: { field: "m", type: "quantitative" }, color: { datum: labels.median } },
        },
      ],
    });
  }
  if (withMarkers) layers.push(labelledRules("markers", x, FIGURE_COLORS.marker, [5, 4]));
  if (periods && periods.candidates.length > 0) layers.push(labelledRules("alias-candidates", x, FIGURE_COLORS.periodogram, [2, 3]));
  return {
    width: WIDTH,
    height: 320,
    layer: layers,
    ...(periodogram && psdBand ? { resolve: { scale: { y: "independent" as const } } } : {}),
  };
}

/** Stage 5: the periodogram against period, with the posterior period, its interval and the alias candidates. */
function periodPanel(input: ReportInput, rows: SpectrumRows, periods: PeriodMarks): LayeredView {
  const [fMin, fMax] = rows.periodogramDomain;
  const x = logAxis("period", `Period [${timeUnitOf(input)}]`, [1 / fMax, 1 / fMin]);
  const layers: LayerMember[] = [
    intervalLayer("period", x),
    {
      data: { name: "periodogram" },
      mark: { type: "line", strokeWidth: 1, color: FIGURE_COLORS.periodogram, clip: true },
      encoding: {
        x,
        y: {
          field: "p",
          type: "quantitative",
          title: input.periodogram?.label ?? "Periodogram power (normalised)",
          scale: { type: "log", domain: rows.powerDomain, nice: false },
          axis: { format: "~g" },
        },
      },
    },
    {
      data: { values: [{ period: periods.median, label: "posterior period" }] },
      layer: [
        { mark: { type: "rule", color: FIGURE_COLORS.model, strokeWidth: 1.5 }, encoding: { x } },
        ...ruleLabels(x, FIGURE_COLORS.model),
      ],
    },
  ];
  if (periods.candidates.length > 0) layers.push(labelledRules("alias-candidates", x, FIGURE_COLORS.marker, [2, 3]));
  return { width: WIDTH, height: 220, layer: layers };
}

/** The shaded central 95% interval of the posterior period. */
function intervalLayer(field: "f" | "period", x: ReturnType<typeof logAxis>): LayerMember {
  return {
    data: { name: "period-interval" },
    mark: { type: "rect", color: FIGURE_COLORS.modelBandOuter, opacity: 0.8, clip: true },
    encoding: { x, x2: { field: field === "f" ? "f2" : "period2" } },
  };
}

/** Vertical rules at the rows of a dataset, each labelled along its length. */
function labelledRules(name: string, x: ReturnType<typeof logAxis>, color: string, dash: number[]): LayerMember {
  return {
    data: { name },
    layer: [{ mark: { type: "rule", strokeDash: dash, color, strokeWidth: 1, clip: true }, encoding: { x } }, ...ruleLabels(x, color)],
  };
}

/** A label along a vertical rule; a white outline under it keeps it legible where it crosses a curve. */
function ruleLabels(x: ReturnType<typeof logAxis>, color: string): LayerMember[] {
  return [{ stroke: "white", strokeWidth: 3 }, {}].map(
    (outline): LayerMember => ({
      mark: { type: "text", angle: 270, align: "right", baseline: "bottom", dx: -4, dy: -3, fontSize: 10, color, ...outline },
      encoding: { x, y: { value: 0 }, text: { field: "label" } },
    }),
  );
}

function bandPercent(input: ReportInput): number {
  return Math.round((input.psdBand?.mass ?? 0.68) * 100);
}

/** Stage 6: the caption, saying what each colour and line is. */
function spectrumCaption(input: ReportInput, markers: readonly FrequencyMarker[], periods: PeriodMarks | undefined, byPeriod: boolean): string {
  const unit = timeUnitOf(input);
  const parts = [
    input.psdBand
      ? `Blue: the posterior median power spectral density of the model with its ${bandPercent(input)}% credible band (left axis).`
      : "",
    input.periodogram
      ? `Grey: the periodogram of the data${input.psdBand ? " (right axis; its normalisation differs, so compare shapes, not heights)" : ""}.`
      : "",
    markers.length > 0 ? `Dashed lines: ${markers.map((m) => m.label).join(", ")}.` : "",
    periods
      ? `Shaded: the 95% credible interval of the period, ${formatSignificant(periods.lower95, 4)} to ${formatSignificant(periods.upper95, 4)} ${unit}` +
        (periods.candidates.length > 0
          ? `; dotted: the alias candidates the fit weighed (${periods.candidates.map((c) => c.label).join("; ")}).`
          : "; the fit found no other period mode worth weighing.")
      : "",
    byPeriod ? "Lower panel: the same periodogram against period, with the posterior period (solid)." : "",
  ];
  return parts.filter((p) => p !== "").join(" ");
}
