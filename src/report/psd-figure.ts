import type { TopLevelSpec } from "vega-lite";
import { evenlySpacedIndices } from "../numerics/even-thinning.js";
import { FIGURE_COLORS, figureConfig } from "./figure-style.js";
import { formatSignificant } from "./format-measurement.js";
import { timeUnitOf, valueUnitOf } from "./parameter-display.js";
import type { PsdComparison } from "./psd-comparison.js";
import type { ReportFigure } from "./report-figure.js";
import type { ReportInput } from "./report-input.js";
import { logAxis, spectrumMarkers } from "./spectrum-figure.js";
import type { DataRows, LayerMember } from "./vega-lite-types.js";

/** The raw periodogram is thinned evenly beyond this many frequencies (more than the figure has pixels). */
const MAX_FREQUENCIES = 2500;
/** The best damped random walk's colour: apart from the model's blues and the periodogram's greys. */
const DRW_COLOR = "#d35400";
const WIDTH = 680;
const HEIGHT = 380;

/**
 * The power spectrum on one scale, for models whose spectrum is the question (CARMA, the damped random
 * walk): the posterior median PSD with its central 68% and 95% bands, the periodogram normalised to the
 * same one-sided PSD (raw, and averaged in log-frequency bins), the best damped random walk's PSD and the
 * measurement-noise level, on log-log axes with frequency in cycles per time unit; dashed lines at
 * 1/baseline and the pseudo-Nyquist frequency ({@link spectrumMarkers}). Undefined without
 * `input.psdComparison`.
 */
export function psdFigure(input: ReportInput): ReportFigure | undefined {
  const psd = input.psdComparison;
  if (psd === undefined) return undefined;
  const timeUnit = timeUnitOf(input);
  const valueUnit = valueUnitOf(input);
  const labels = legendLabels(psd, timeUnit);
  const datasets = psdRows(psd);
  const frequencyDomain = domainOf(datasets["model"] ?? [], "f", 1);
  const markers = spectrumMarkers(input)
    .filter((m) => m.label !== "1/P" && m.frequency >= frequencyDomain[0] && m.frequency <= frequencyDomain[1])
    .map((m) => ({ f: m.frequency, label: m.label }));
  if (markers.length > 0) datasets["markers"] = markers;
  const powerDomain = powerDomainOf(datasets);
  const x = logAxis("f", `Frequency [1 / ${timeUnit}]`, frequencyDomain);
  const y = (field: string) => logAxis(field, `One-sided PSD [${valueUnit}² ${timeUnit}]`, powerDomain);
  const entries = [labels.band95, labels.band68, labels.median, labels.periodogram, labels.binned, ...(psd.referenceDrw ? [labels.drw] : [])];
  const colors = [FIGURE_COLORS.modelBandOuter, FIGURE_COLORS.modelBandInner, FIGURE_COLORS.model, "#c4c4c4", "#444444", ...(psd.referenceDrw ? [DRW_COLOR] : [])];
  const color = (label: string) => ({ datum: label, scale: { domain: entries, range: colors }, legend: { title: null, orient: "top" as const, direction: "horizontal" as const, columns: 3 } });
  const layers: LayerMember[] = [
    { data: { name: "model" }, mark: { type: "area", clip: true }, encoding: { x, y: y("lo95"), y2: { field: "hi95" }, color: color(labels.band95) } },
    { data: { name: "model" }, mark: { type: "area", clip: true }, encoding: { x, y: y("lo68"), y2: { field: "hi68" }, color: color(labels.band68) } },
    { data: { name: "periodogram" }, mark: { type: "line", strokeWidth: 0.7, clip: true }, encoding: { x, y: y("p"), color: color(labels.periodogram) } },
    { data: { name: "binned" }, mark: { type: "point", filled: true, size: 22, clip: true }, encoding: { x, y: y("p"), color: color(labels.binned) } },
    { data: { name: "model" }, mark: { type: "line", strokeWidth: 2.2, clip: true }, encoding: { x, y: y("m"), color: color(labels.median) } },
  ];
  if (psd.referenceDrw) {
    layers.push({ data: { name: "model" }, mark: { type: "line", strokeWidth: 1.8, strokeDash: [7, 4], clip: true }, encoding: { x, y: y("drw"), color: color(labels.drw) } });
  }
  if (psd.noiseLevel !== undefined && psd.noiseLevel > powerDomain[0] && psd.noiseLevel < powerDomain[1]) {
    layers.push(noiseLayer(psd.noiseLevel, x, y("p")));
  }
  if (markers.length > 0) layers.push(markerLayer(x));
  const spec: TopLevelSpec = {
    $schema: "https://vega.github.io/schema/vega-lite/v6.json",
    config: figureConfig(),
    datasets,
    width: WIDTH,
    height: HEIGHT,
    layer: layers,
  };
  return { id: "spectrum", title: "Power spectrum: model, periodogram and the best damped random walk", caption: psdCaption(input, psd, markers), spec };
}

function legendLabels(psd: PsdComparison, timeUnit: string) {
  const drw = psd.referenceDrw;
  return {
    median: `${psd.modelLabel} posterior median`,
    band68: "68% band",
    band95: "95% band",
    periodogram: "periodogram",
    binned: "periodogram, binned mean",
    drw: drw ? `best DRW (τ = ${formatSignificant(drw.tau, 3)} ${timeUnit})` : "best DRW",
  };
}

/** The model curves, the periodogram (thinned, positive) and its bins as rows. */
function psdRows(psd: PsdComparison): Record<string, DataRows> {
  const model = Array.from({ length: psd.frequency.length }, (_, i) => ({
    f: psd.frequency[i] ?? NaN,
    m: psd.median[i] ?? NaN,
    lo68: psd.lower68[i] ?? NaN,
    hi68: psd.upper68[i] ?? NaN,
    lo95: psd.lower95[i] ?? NaN,
    hi95: psd.upper95[i] ?? NaN,
    ...(psd.referenceDrw ? { drw: psd.referenceDrw.psd[i] ?? NaN } : {}),
  })).filter((r) => r.f > 0 && r.lo95 > 0 && r.hi95 > 0 && r.m > 0);
  const periodogram = evenlySpacedIndices(psd.periodogram.frequency.length, MAX_FREQUENCIES)
    .map((i) => ({ f: psd.periodogram.frequency[i] ?? NaN, p: psd.periodogram.power[i] ?? NaN }))
    .filter((r) => r.f > 0 && r.p > 0);
  const binned = Array.from({ length: psd.binnedPeriodogram.frequency.length }, (_, i) => ({
    f: psd.binnedPeriodogram.frequency[i] ?? NaN,
    p: psd.binnedPeriodogram.power[i] ?? NaN,
  })).filter((r) => r.f > 0 && r.p > 0);
  return { model, periodogram, binned };
}

function domainOf(rows: DataRows, field: string, pad: number): [number, number] {
  let low = Infinity;
  let high = -Infinity;
  for (const row of rows as Record<string, number>[]) {
    const v = row[field];
    if (v !== undefined && v > 0) (low = Math.min(low, v)), (high = Math.max(high, v));
  }
  return [low / pad, high * pad];
}

/**
 * The power axis: from the binned periodogram and the model's 95% band (the raw periodogram's rare
 * near-zero values would stretch a log axis over decades; it is clipped), a factor 2 of headroom each side.
 */
function powerDomainOf(datasets: Record<string, DataRows>): [number, number] {
  const band = datasets["model"] ?? [];
  const [bandLow] = domainOf(band, "lo95", 1);
  const [, bandHigh] = domainOf(band, "hi95", 1);
  const [binLow, binHigh] = domainOf(datasets["binned"] ?? [], "p", 1);
  const [, rawHigh] = domainOf(datasets["periodogram"] ?? [], "p", 1);
  const low = Math.max(Math.min(bandLow, binLow), 1e-6 * Math.max(bandHigh, rawHigh));
  return [low / 2, 2 * Math.max(bandHigh, binHigh, rawHigh)];
}

type LogChannel = ReturnType<typeof logAxis>;

/** The measurement-noise level: a dotted horizontal line across the frequency domain, labelled at its left end. */
function noiseLayer(level: number, x: LogChannel, y: LogChannel): LayerMember {
  const [low, high] = x.scale.domain;
  return {
    data: { values: [{ f: low, p: level, label: "measurement-noise level" }, { f: high, p: level, label: "" }] },
    layer: [
      { mark: { type: "line", strokeDash: [2, 3], color: "#555555", strokeWidth: 1.2, clip: true }, encoding: { x, y } },
      {
        transform: [{ filter: "datum.label != ''" }],
        mark: { type: "text", align: "left", baseline: "bottom", dx: 4, dy: -2, fontSize: 10, color: "#555555" },
        encoding: { x, y, text: { field: "label" } },
      },
    ],
  };
}

/** Dashed vertical rules at the frequencies of the sampling (1/baseline, pseudo-Nyquist), labelled along them. */
function markerLayer(x: LogChannel): LayerMember {
  return {
    data: { name: "markers" },
    layer: [
      { mark: { type: "rule", strokeDash: [5, 4], color: FIGURE_COLORS.marker, strokeWidth: 1, clip: true }, encoding: { x } },
      {
        mark: { type: "text", angle: 270, align: "right", baseline: "bottom", dx: -4, dy: -3, fontSize: 10, color: FIGURE_COLORS.marker },
        encoding: { x, y: { value: 0 }, text: { field: "label" } },
      },
    ],
  };
}

/** The caption: what each curve is and the normalisation every power shares. */
function psdCaption(input: ReportInput, psd: PsdComparison, markers: readonly { label: string }[]): string {
  const timeUnit = timeUnitOf(input);
  const valueUnit = valueUnitOf(input);
  const drw = psd.referenceDrw;
  return [
    `Blue: the posterior median one-sided power spectral density of the ${psd.modelLabel} model with its central 68% (dark) and 95% (light) bands over ${psd.draws} posterior draws, P(f) = 2 S(2πf), which integrates over frequency to the variance.`,
    `Grey: the periodogram of the data on the same scale: the generalised Lomb-Scargle power (the fraction of the variance a sinusoid at f explains) times the data's weighted variance times the baseline, in ${valueUnit}² ${timeUnit}, the usual one-sided periodogram for even sampling; dots: its mean in bins of 1/12 decade.`,
    "The periodogram holds the measurement noise" +
      (psd.noiseLevel !== undefined ? ` (dotted: its expected level 2⟨e²⟩T/N = ${formatSignificant(psd.noiseLevel, 3)} ${valueUnit}² ${timeUnit})` : "") +
      " and the leakage of the sampling window (seasonal gaps and irregular nights spread low-frequency power over all frequencies), so it lies above the model at high frequencies; the model is the noise-free signal.",
    drw
      ? `Orange dashed: the damped random walk of highest posterior on the same data (τ = ${formatSignificant(drw.tau, 3)} ${timeUnit}, σ = ${formatSignificant(drw.sigma, 3)} ${valueUnit}), flat below 1/(2πτ) and falling as f⁻² above: where the band leaves it, the data ask for more than a damped random walk.`
      : "",
    markers.length > 0 ? `Red dashed: ${markers.map((m) => m.label).join(", ")}.` : "",
  ]
    .filter((part) => part !== "")
    .join(" ");
}
