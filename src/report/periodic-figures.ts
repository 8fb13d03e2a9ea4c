import type { TopLevelSpec } from "vega-lite";
import type { LightCurve } from "../lightcurve/light-curve.js";
import { evenlySpacedIndices } from "../numerics/even-thinning.js";
import { FIGURE_COLORS, figureConfig } from "./figure-style.js";
import { formatSignificant } from "./format-measurement.js";
import { lightCurveFigure } from "./light-curve-figure.js";
import { timeUnitOf } from "./parameter-display.js";
import { sortedQuantile } from "../numerics/order-statistics.js";
import type { ReportFigure } from "./report-figure.js";
import type { ReportInput } from "./report-input.js";
import { robustFlags, valueAxisRange } from "./value-axis-range.js";

/** Phase bins of the folded model curve. */
const PHASE_BINS = 20;
/** At most this many folded points are drawn (evenly thinned beyond, as the caption says). */
const MAX_POINTS_DRAWN = 3000;

/**
 * The light curve folded at the posterior median period, phase = ((t - t0) / P) mod 1 with t0 the first
 * time, over two cycles so a feature at phase 0 is not cut in half (common practice). The model: in each of
 * 20 phase bins, the median of the posterior-predictive mean at the data's times in that bin, and its
 * 16-84% range across cycles (how much the spot pattern changes from one rotation to the next).
 * Undefined when the input has no periodic curves.
 */
export function phaseFigure(input: ReportInput): ReportFigure | undefined {
  const period = input.result.parameters["period"];
  const curves = input.periodic;
  if (period === undefined || curves === undefined) return undefined;
  const P = period.median;
  const { lightCurve } = input;
  const t0 = lightCurve.time[0];
  const phase = (t: number) => (((t - t0) / P) % 1 + 1) % 1;
  const drawn = evenlySpacedIndices(lightCurve.time.length, MAX_POINTS_DRAWN);
  const points = drawn.flatMap((i) => {
    const p = phase(lightCurve.time[i]);
    return [{ phase: p, y: lightCurve.value[i] }, { phase: p + 1, y: lightCurve.value[i] }];
  });
  const binned: number[][] = Array.from({ length: PHASE_BINS }, () => []);
  for (let i = 0; i < curves.atData.time.length; i++) {
    binned[Math.min(PHASE_BINS - 1, Math.floor(phase(curves.atData.time[i]) * PHASE_BINS))].push(curves.atData.mean[i]);
  }
  const model = binned.flatMap((values, b) => {
    if (values.length < 3) return [];
    const sorted = Float64Array.from(values).sort();
    const row = { m: sortedQuantile(sorted, 0.5), lo: sortedQuantile(sorted, 0.16), hi: sortedQuantile(sorted, 0.84) };
    const centre = (b + 0.5) / PHASE_BINS;
    return [{ phase: centre, ...row }, { phase: centre + 1, ...row }];
  });
  const isMag = lightCurve.unit === "mag";
  const domain = valueAxisRange(lightCurve, robustFlags(input.result.robust?.flagged), model.map((r) => r.m));
  const y = { type: "quantitative" as const, scale: { zero: false, reverse: isMag, domain, nice: false } };
  const x = { field: "phase", type: "quantitative" as const, title: `Phase at P = ${formatSignificant(P, 5)} ${timeUnitOf(input)}`, scale: { domain: [0, 2], nice: false } };
  const spec: TopLevelSpec = {
    $schema: "https://vega.github.io/schema/vega-lite/v6.json",
    config: figureConfig(),
    width: 760,
    height: 300,
    datasets: { points, model },
    layer: [
      {
        data: { name: "points" },
        mark: { type: "point", filled: true, size: points.length > 4000 ? 5 : 12, opacity: 0.6, color: FIGURE_COLORS.data, clip: true, aria: false },
        encoding: { x, y: { ...y, field: "y", title: isMag ? "Magnitude [mag]" : "Flux [flux units]" } },
      },
      {
        data: { name: "model" },
        mark: { type: "area", color: FIGURE_COLORS.modelBandInner, opacity: 0.6, clip: true },
        encoding: { x, y: { ...y, field: "lo" }, y2: { field: "hi" } },
      },
      {
        data: { name: "model" },
        mark: { type: "line", color: FIGURE_COLORS.model, strokeWidth: 2, clip: true },
        encoding: { x, y: { ...y, field: "m" } },
      },
    ],
  };
  const thinNote = drawn.length < lightCurve.time.length ? ` An evenly spaced ${drawn.length} of the ${lightCurve.time.length} points are drawn.` : "";
  return {
    id: "phase",
    title: "Light curve folded at the posterior period",
    caption:
      `Points: the measurements folded at the posterior median period P = ${formatSignificant(P, 5)} ${timeUnitOf(input)} ` +
      `(95% interval ${formatSignificant(period["q2.5"], 5)} to ${formatSignificant(period["q97.5"], 5)}), shown over two cycles. ` +
      `Line: in each of ${PHASE_BINS} phase bins, the median of the posterior-predictive mean at the data's times; shading: its ` +
      `16-84% range across cycles, the change of the pattern from one cycle to the next.${thinNote}`,
    spec,
  };
}

/**
 * A zoom on the stretch of a few periods that holds the most measurements, drawn like the light-curve
 * figure (the same conventions), so the shape of each cycle shows where the whole light curve is a solid band.
 */
export function zoomFigure(input: ReportInput): ReportFigure | undefined {
  const period = input.result.parameters["period"];
  const zoom = input.periodic?.zoom;
  if (period === undefined || zoom === undefined || zoom.time.length < 2) return undefined;
  const start = zoom.time[0];
  const end = zoom.time[zoom.time.length - 1];
  const { lightCurve, kept } = windowOf(input.lightCurve, start, end);
  if (lightCurve.time.length === 0) return undefined;
  // The robust flags follow the points into the window (they are indexed like the light curve).
  const robust = input.result.robust;
  const position = new Map(kept.map((index, k) => [index, k]));
  const flagged = robust?.flagged.flatMap((point) => {
    const k = position.get(point.index);
    return k === undefined ? [] : [{ ...point, index: k }];
  });
  const result = robust && flagged ? { ...input.result, robust: { ...robust, flagged } } : input.result;
  const figure = lightCurveFigure({ ...input, result, lightCurve, prediction: zoom });
  const cycles = Math.round((end - start) / period.median);
  return {
    ...figure,
    id: "zoom",
    title: `A stretch of ${cycles} periods`,
    caption: `The ${cycles} periods (${formatSignificant(end - start, 3)} ${timeUnitOf(input)}) that hold the most measurements, drawn as in the light-curve figure. ${figure.caption}`,
  };
}

/** The points of a light curve from `start` to `end`, and their indices in it. */
function windowOf(lightCurve: LightCurve, start: number, end: number): { lightCurve: LightCurve; kept: number[] } {
  const keep: number[] = [];
  for (let i = 0; i < lightCurve.time.length; i++) if (lightCurve.time[i] >= start && lightCurve.time[i] <= end) keep.push(i);
  const pick = (values: Float64Array) => Float64Array.from(keep, (i) => values[i]);
  return {
    lightCurve: {
      ...lightCurve,
      time: pick(lightCurve.time),
      value: pick(lightCurve.value),
      ...(lightCurve.error ? { error: pick(lightCurve.error) } : {}),
    },
    kept: keep,
  };
}
