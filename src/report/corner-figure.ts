import type { TopLevelSpec } from "vega-lite";
import { credibleRegions } from "./credible-regions.js";
import { evenlySpacedIndices } from "../numerics/even-thinning.js";
import { FIGURE_COLORS, figureConfig } from "./figure-style.js";
import { kernelDensity } from "./marginal-density.js";
import { parameterDisplay } from "./parameter-display.js";
import { pooledDraws } from "./pooled-draws.js";
import { sortedQuantile } from "../numerics/order-statistics.js";
import type { ReportFigure } from "./report-figure.js";
import type { ReportInput } from "./report-input.js";
import type { DataRows, LayerMember, ViewSpec } from "./vega-lite-types.js";

/** At most this many pooled draws enter the densities; more changes nothing visible and costs time. */
const MAX_DRAWS = 20000;
/** Grid points of each marginal density curve. */
const CURVE_POINTS = 120;
/** Cells per axis of the joint credible regions: about 0.8 sqrt(draws), within these bounds. */
const REGION_BINS = { fewest: 12, most: 28 } as const;
/** The two credible masses shaded on the diagonal and drawn as regions below it. */
const MASSES = [0.68, 0.95] as const;
/** Pixels between cells. */
const SPACING = 10;
/** The axes span this central fraction of the draws, so a few stray draws do not squash the picture. */
const AXIS_MASS = 0.99;

/** One parameter as the pair figure draws it. */
interface PairAxis {
  /** The symbol, for the in-panel label. */
  readonly label: string;
  /** Axis title with the unit, for example "τ [d]". */
  readonly title: string;
  readonly log: boolean;
  /** Axis range in the parameter's own unit. */
  readonly extent: [number, number];
  /** Thinned draws on the plotting scale (log10 of the value on a log axis). */
  readonly plotted: Float64Array;
  /** 2.5, 16, 50, 84 and 97.5% quantiles in the parameter's own unit. */
  readonly quantiles: readonly [number, number, number, number, number];
}

/**
 * The pair figure of the posterior. On the diagonal, the marginal density of each parameter (a Gaussian
 * kernel estimate) with its central 68% and 95% credible intervals shaded in two tones and the median as
 * a dark stroke; the numbers are in the parameter table, not on the figure. Below the diagonal, the joint
 * highest-density regions of each pair holding 68% and 95% of the draws, in the same two tones, and the
 * pair of medians as a cross. Parameters whose draws span more than a decade get logarithmic axes.
 */
export function cornerFigure(input: ReportInput): ReportFigure {
  const names = input.draws.names.filter((name) => input.draws.chains[name] !== undefined);
  if (names.length === 0) throw new RangeError("the pair figure needs posterior draws of at least one parameter");
  const total = pooledDraws(input.draws, names[0]).length;
  const axes = names.map((name) => pairAxis(input, name));
  const k = axes.length;
  // Smaller cells for many parameters keep the whole figure near the page width, so its text is not shrunk.
  const cell = k <= 2 ? 210 : k <= 3 ? 175 : k <= 5 ? 135 : k <= 6 ? 112 : 92;
  const datasets: Record<string, DataRows> = {};
  const cells: ViewSpec[] = [];
  for (let row = 0; row < k; row++) {
    for (let column = 0; column < k; column++) {
      const bottom = row === k - 1;
      if (column > row) cells.push(emptyCell(cell));
      else if (column === row) cells.push(marginalCell(axes[row], `marginal-${row}`, datasets, cell, bottom));
      else cells.push(pairCell(axes[column], axes[row], `pair-${row}-${column}`, datasets, cell, bottom, column === 0));
    }
  }
  const base = figureConfig();
  const spec: TopLevelSpec = {
    $schema: "https://vega.github.io/schema/vega-lite/v6.json",
    config: { ...base, axis: { ...base.axis, grid: false, tickCount: k <= 4 ? 4 : 3, labelOverlap: true, labelFlush: true } },
    datasets,
    columns: k,
    spacing: SPACING,
    bounds: "flush",
    concat: cells,
  };
  return {
    id: "corner",
    title: "Posterior distribution",
    caption:
      `Diagonal: the marginal posterior density of each parameter, its central 68% (darker) and 95% (lighter) ` +
      `credible intervals shaded and the median as a dark stroke; the numbers are in the parameter table. Below ` +
      `the diagonal: the smallest regions holding 68% (darker) and 95% (lighter) of the draws for each pair, and ` +
      `the medians (cross). Axes span the central ${formatPercent(AXIS_MASS)} of the ${total} draws` +
      `${total > MAX_DRAWS ? ` (an evenly spaced ${MAX_DRAWS} enter the densities)` : ""}; parameters spanning more ` +
      `than a decade are on logarithmic axes.`,
    spec,
  };
}

function pairAxis(input: ReportInput, name: string): PairAxis {
  const display = parameterDisplay(input, name);
  const pooled = pooledDraws(input.draws, name);
  const thinned = Float64Array.from(evenlySpacedIndices(pooled.length, MAX_DRAWS), (i) => pooled[i]);
  const log = display.logScale === true;
  const sorted = Float64Array.from(thinned).sort();
  const tail = (1 - AXIS_MASS) / 2;
  const extent = padDegenerate(sortedQuantile(sorted, tail), sortedQuantile(sorted, 1 - tail), log);
  const summary = input.result.parameters[name];
  const q = (p: number) => sortedQuantile(sorted, p);
  const quantiles: PairAxis["quantiles"] = summary
    ? [summary["q2.5"], summary.q16, summary.median, summary.q84, summary["q97.5"]]
    : [q(0.025), q(0.16), q(0.5), q(0.84), q(0.975)];
  return {
    label: display.label,
    title: display.unit === "" ? display.label : `${display.label} [${display.unit}]`,
    log,
    extent,
    plotted: log ? thinned.map(Math.log10) : thinned,
    quantiles,
  };
}

function padDegenerate(low: number, high: number, log: boolean): [number, number] {
  if (high > low) return [low, high];
  if (log) return [low / 1.05, high * 1.05];
  const half = low === 0 ? 0.5 : Math.abs(low) * 0.01;
  return [low - half, high + half];
}

/** The plotting scale: log10 on a logarithmic axis, the value itself otherwise. */
function toPlot(axis: PairAxis, value: number): number {
  return axis.log ? Math.log10(value) : value;
}

function fromPlot(axis: PairAxis, value: number): number {
  return axis.log ? Math.pow(10, value) : value;
}

function positionScale(axis: PairAxis) {
  return axis.log ? { type: "log" as const, domain: axis.extent, nice: false } : { type: "linear" as const, domain: axis.extent, nice: false, zero: false };
}

/** Log axes print 100 and 0.001, not 1e+2; linear axes keep Vega's own tick format. */
function tickFormat(axis: PairAxis): { format?: string } {
  return axis.log ? { format: "~g" } : {};
}

function marginalCell(axis: PairAxis, name: string, datasets: Record<string, DataRows>, size: number, bottom: boolean): ViewSpec {
  const low = toPlot(axis, axis.extent[0]);
  const high = toPlot(axis, axis.extent[1]);
  const curve = kernelDensity(axis.plotted, low, high, CURVE_POINTS);
  const at = (v: number) => interpolate(curve.x, curve.density, toPlot(axis, v));
  const [q025, q16, median, q84, q975] = axis.quantiles;
  const rows: { x: number; d: number; part: string }[] = [];
  const addPart = (part: string, from: number, to: number) => {
    const a = Math.max(toPlot(axis, from), low);
    const b = Math.min(toPlot(axis, to), high);
    if (!(b > a)) return;
    rows.push({ x: fromPlot(axis, a), d: interpolate(curve.x, curve.density, a), part });
    for (let i = 0; i < curve.x.length; i++) {
      if (curve.x[i] > a && curve.x[i] < b) rows.push({ x: fromPlot(axis, curve.x[i]), d: curve.density[i], part });
    }
    rows.push({ x: fromPlot(axis, b), d: interpolate(curve.x, curve.density, b), part });
  };
  addPart("95%", q025, q975);
  addPart("68%", q16, q84);
  addPart("curve", axis.extent[0], axis.extent[1]);
  datasets[name] = rows;
  let peak = 0;
  for (const d of curve.density) peak = Math.max(peak, d);
  const x = { field: "x", type: "quantitative" as const, scale: positionScale(axis), axis: bottom ? { title: axis.title, ...tickFormat(axis) } : { title: null, labels: false } };
  const y = { field: "d", type: "quantitative" as const, scale: { domain: [0, 1.12 * (peak > 0 ? peak : 1)], nice: false }, axis: null };
  const band = (part: "95%" | "68%", color: string): LayerMember => ({
    transform: [{ filter: { field: "part", equal: part } }],
    mark: { type: "area", color, opacity: 1, clip: true },
    encoding: { x, y },
  });
  return {
    width: size,
    height: size,
    data: { name },
    layer: [
      band("95%", FIGURE_COLORS.modelBandOuter),
      band("68%", FIGURE_COLORS.modelBandInner),
      {
        transform: [{ filter: { field: "part", equal: "curve" } }],
        mark: { type: "line", color: FIGURE_COLORS.model, strokeWidth: 1.6, clip: true },
        encoding: { x, y },
      },
      {
        data: { values: [{ x: median, d: at(median) }] },
        mark: { type: "rule", color: FIGURE_COLORS.data, strokeWidth: 2, clip: true },
        encoding: { x, y, y2: { datum: 0 } },
      },
      {
        data: { values: [{ label: axis.label }] },
        mark: { type: "text", align: "left", baseline: "top", x: 5, y: 4, fontSize: 12, color: "#333333" },
        encoding: { text: { field: "label" } },
      },
    ],
  };
}

function pairCell(
  xAxis: PairAxis,
  yAxis: PairAxis,
  name: string,
  datasets: Record<string, DataRows>,
  size: number,
  bottom: boolean,
  left: boolean,
): ViewSpec {
  const bins = Math.round(Math.min(REGION_BINS.most, Math.max(REGION_BINS.fewest, 0.8 * Math.sqrt(xAxis.plotted.length))));
  const grid = credibleRegions(
    xAxis.plotted,
    yAxis.plotted,
    [toPlot(xAxis, xAxis.extent[0]), toPlot(xAxis, xAxis.extent[1])],
    [toPlot(yAxis, yAxis.extent[0]), toPlot(yAxis, yAxis.extent[1])],
    bins,
    MASSES,
  );
  // Runs of equal level along a row become one rectangle: fewer marks, the same picture.
  const rows: { x: number; x2: number; y: number; y2: number; region: string }[] = [];
  for (let r = 0; r < bins; r++) {
    let start = 0;
    for (let c = 1; c <= bins; c++) {
      const level = grid.level[r * bins + start];
      if (c < bins && Object.is(grid.level[r * bins + c], level)) continue;
      if (!Number.isNaN(level)) {
        rows.push({
          x: fromPlot(xAxis, grid.xEdges[start]),
          x2: fromPlot(xAxis, grid.xEdges[c]),
          y: fromPlot(yAxis, grid.yEdges[r]),
          y2: fromPlot(yAxis, grid.yEdges[r + 1]),
          region: formatPercent(level),
        });
      }
      start = c;
    }
  }
  datasets[name] = rows;
  const x = { field: "x", type: "quantitative" as const, scale: positionScale(xAxis), axis: bottom ? { title: xAxis.title, ...tickFormat(xAxis) } : { title: null, labels: false } };
  const y = { field: "y", type: "quantitative" as const, scale: positionScale(yAxis), axis: left ? { title: yAxis.title, ...tickFormat(yAxis) } : { title: null, labels: false } };
  return {
    width: size,
    height: size,
    layer: [
      {
        data: { name },
        mark: { type: "rect", clip: true },
        encoding: {
          x,
          x2: { field: "x2" },
          y,
          y2: { field: "y2" },
          color: {
            field: "region",
            type: "nominal",
            scale: { domain: MASSES.map(formatPercent), range: [FIGURE_COLORS.modelBandInner, FIGURE_COLORS.modelBandOuter] },
            legend: null,
          },
        },
      },
      {
        data: { values: [{ x: xAxis.quantiles[2], y: yAxis.quantiles[2] }] },
        mark: { type: "point", shape: "cross", filled: true, size: 40, color: FIGURE_COLORS.data, clip: true },
        encoding: { x, y },
      },
    ],
  };
}

function emptyCell(size: number): ViewSpec {
  return { width: size, height: size, data: { values: [] }, mark: "point", view: { stroke: null } };
}

/** Linear interpolation of (xs, ys) at x, clamped to the ends. */
function interpolate(xs: Float64Array, ys: Float64Array, x: number): number {
  const n = xs.length;
  if (x <= xs[0]) return ys[0];
  if (x >= xs[n - 1]) return ys[n - 1];
  const step = (xs[n - 1] - xs[0]) / (n - 1);
  const i = Math.min(n - 2, Math.floor((x - xs[0]) / step));
  const w = (x - xs[i]) / (xs[i + 1] - xs[i]);
  return ys[i] + w * (ys[i + 1] - ys[i]);
}

function formatPercent(mass: number): string {
  return `${Math.round(mass * 1000) / 10}%`;
}
