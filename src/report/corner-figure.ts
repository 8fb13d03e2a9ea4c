import type { TopLevelSpec } from "vega-lite";
import { evenIndices } from "./even-thinning.js";
import { FIGURE_COLORS, figureConfig } from "./figure-style.js";
import { formatMeasurement } from "./format-measurement.js";
import { parameterAxisTitle, parameterDisplay } from "./parameter-display.js";
import { pooledDraws } from "./pooled-draws.js";
import { quantileSorted } from "./quantile.js";
import type { ReportFigure } from "./report-figure.js";
import type { ReportInput } from "./report-input.js";

/** At most this many pooled draws enter the histograms; more changes nothing visible and costs time. */
const MAX_DRAWS = 20000;
/** Equal-width bins across each axis, shared by the marginals and the pairwise densities. */
const BINS = 24;
/** Pixels between cells; the headings of the marginals sit in this gap, under empty cells. */
const SPACING = 16;
/** The axes span this central fraction of the draws, so a few stray draws do not squash the picture. */
const AXIS_MASS = 0.99;

/** One parameter as the corner plot draws it: its column in the data, axis range and summary lines. */
interface CornerAxis {
  readonly field: string;
  readonly title: string;
  /** For example "τ = 310 +80/−60 d". */
  readonly heading: string;
  readonly extent: [number, number];
  /** Median, 16% and 84% quantiles on the plotted (possibly log10) scale. */
  readonly marks: { median: number; q16: number; q84: number };
}

/**
 * The corner plot of the posterior: for each parameter a histogram of its marginal with the median
 * (solid) and the 16% and 84% quantiles (dashed), and below the diagonal the binned joint density of
 * each pair (darker is denser). Parameters that span decades are drawn in log10.
 */
export function cornerFigure(input: ReportInput): ReportFigure {
  const names = input.draws.names.filter((name) => input.draws.chains[name] !== undefined);
  if (names.length === 0) throw new RangeError("the corner plot needs posterior draws of at least one parameter");
  const pooled = names.map((name) => pooledDraws(input.draws, name));
  const total = pooled[0]!.length;
  const keep = evenIndices(total, MAX_DRAWS);

  const displays = names.map((name) => parameterDisplay(input, name));
  const axes: CornerAxis[] = names.map((name, p) => {
    const display = displays[p]!;
    const scaled = display.logScale ? pooled[p]!.map(Math.log10) : pooled[p]!;
    const sorted = Float64Array.from(scaled).sort();
    const tail = (1 - AXIS_MASS) / 2;
    const extent = padDegenerate(quantileSorted(sorted, tail), quantileSorted(sorted, 1 - tail));
    const summary = input.result.parameters[name];
    const rawSorted = summary ? undefined : Float64Array.from(pooled[p]!).sort();
    const rawMarks = rawSorted
      ? { median: quantileSorted(rawSorted, 0.5), q16: quantileSorted(rawSorted, 0.16), q84: quantileSorted(rawSorted, 0.84) }
      : { median: summary!.median, q16: summary!.q16, q84: summary!.q84 };
    const toPlot = (v: number) => (display.logScale ? Math.log10(v) : v);
    const text = formatMeasurement(rawMarks.median, rawMarks.median - rawMarks.q16, rawMarks.q84 - rawMarks.median);
    return {
      field: `p${p}`,
      title: parameterAxisTitle(display),
      heading: `${display.label} = ${text}${display.unit === "" ? "" : ` ${display.unit}`}`,
      extent,
      marks: { median: toPlot(rawMarks.median), q16: toPlot(rawMarks.q16), q84: toPlot(rawMarks.q84) },
    };
  });

  const rows = keep.map((i) => {
    const row: Record<string, number> = {};
    displays.forEach((display, p) => {
      const v = pooled[p]![i]!;
      row[`p${p}`] = display.logScale ? Math.log10(v) : v;
    });
    return row;
  });

  const k = axes.length;
  // Smaller cells for many parameters keep the whole plot near the page width, so its text is not shrunk.
  const cell = k <= 2 ? 200 : k <= 3 ? 170 : k <= 5 ? 135 : k <= 6 ? 110 : 90;
  const cells: unknown[] = [];
  for (let i = 0; i < k; i++) {
    for (let j = 0; j < k; j++) {
      if (j > i) cells.push(emptyCell(cell));
      else if (j === i) cells.push(marginalCell(axes[i]!, cell, i === k - 1));
      else cells.push(pairCell(axes[j]!, axes[i]!, cell, i === k - 1, j === 0));
    }
  }

  const spec = {
    $schema: "https://vega.github.io/schema/vega-lite/v6.json",
    config: { ...figureConfig(), axis: { ...figureConfig().axis, grid: false, tickCount: k <= 5 ? 4 : 3, labelOverlap: true } },
    datasets: { draws: rows },
    columns: k,
    spacing: SPACING,
    // Lay out by plot areas alone, so a long heading or axis title cannot push a column sideways; headings
    // stay clear of their neighbours because the cell right of each diagonal cell is empty.
    bounds: "flush",
    concat: cells,
  } as unknown as TopLevelSpec;

  return {
    id: "corner",
    title: "Posterior distribution",
    caption:
      `Diagonal: the marginal posterior of each parameter, with the median (solid) and the 16% and 84% ` +
      `quantiles (dashed); the heading gives the median and the 68% interval. Below the diagonal: the joint ` +
      `density of each pair of parameters (darker is denser). Axes span the central ${Math.round(AXIS_MASS * 100)}% ` +
      `of the ${total} draws${keep.length < total ? ` (an evenly spaced ${keep.length} are binned)` : ""}.`,
    spec,
  };
}

function padDegenerate(low: number, high: number): [number, number] {
  if (high > low) return [low, high];
  const half = low === 0 ? 0.5 : Math.abs(low) * 0.01;
  return [low - half, high + half];
}

function binTransform(axis: CornerAxis) {
  return {
    bin: { extent: axis.extent, step: (axis.extent[1] - axis.extent[0]) / BINS, nice: false },
    field: axis.field,
    as: [`${axis.field}_lo`, `${axis.field}_hi`],
  };
}

function inExtent(axis: CornerAxis) {
  return { field: axis.field, range: axis.extent };
}

/** A position channel over pre-binned columns, so the axis gets ordinary ticks rather than bin edges. */
function positionEncoding(axis: CornerAxis, labelled: boolean) {
  return {
    field: `${axis.field}_lo`,
    type: "quantitative",
    scale: { domain: axis.extent, nice: false, zero: false },
    axis: labelled ? { title: axis.title } : { title: null, labels: false },
  };
}

function marginalCell(axis: CornerAxis, size: number, bottom: boolean) {
  const lines = [
    { v: axis.marks.median, kind: "median" },
    { v: axis.marks.q16, kind: "quantile" },
    { v: axis.marks.q84, kind: "quantile" },
  ];
  return {
    width: size,
    height: size,
    // Never truncated: a heading wider than its cell runs over the empty cells to its right (or widens
    // the figure, for the last column), and is aligned with the plot area, not the axis labels.
    title: { text: axis.heading, fontSize: 11, limit: 0, frame: "group" },
    layer: [
      {
        data: { name: "draws" },
        transform: [
          { filter: inExtent(axis) },
          binTransform(axis),
          { aggregate: [{ op: "count", as: "count" }], groupby: [`${axis.field}_lo`, `${axis.field}_hi`] },
        ],
        mark: { type: "rect", color: FIGURE_COLORS.model, opacity: 0.75, clip: true },
        encoding: {
          x: positionEncoding(axis, bottom),
          x2: { field: `${axis.field}_hi` },
          y: { field: "count", type: "quantitative", axis: null },
          y2: { datum: 0 },
        },
      },
      {
        data: { values: lines },
        mark: { type: "rule", color: FIGURE_COLORS.marker, strokeWidth: 1.2, clip: true },
        encoding: {
          x: { field: "v", type: "quantitative" },
          strokeDash: {
            field: "kind",
            type: "nominal",
            scale: { domain: ["median", "quantile"], range: [[1, 0], [4, 3]] },
            legend: null,
          },
        },
      },
    ],
  };
}

function pairCell(xAxis: CornerAxis, yAxis: CornerAxis, size: number, bottom: boolean, left: boolean) {
  const xLo = `${xAxis.field}_lo`;
  const xHi = `${xAxis.field}_hi`;
  const yLo = `${yAxis.field}_lo`;
  const yHi = `${yAxis.field}_hi`;
  return {
    width: size,
    height: size,
    data: { name: "draws" },
    transform: [
      { filter: inExtent(xAxis) },
      { filter: inExtent(yAxis) },
      binTransform(xAxis),
      binTransform(yAxis),
      { aggregate: [{ op: "count", as: "count" }], groupby: [xLo, xHi, yLo, yHi] },
    ],
    mark: { type: "rect", clip: true },
    encoding: {
      x: positionEncoding(xAxis, bottom),
      x2: { field: xHi },
      y: positionEncoding(yAxis, left),
      y2: { field: yHi },
      color: {
        field: "count",
        type: "quantitative",
        scale: { scheme: FIGURE_COLORS.density, type: "sqrt" },
        legend: null,
      },
    },
  };
}

function emptyCell(size: number) {
  return {
    width: size,
    height: size,
    data: { values: [] },
    mark: "point",
    view: { stroke: null },
  };
}
