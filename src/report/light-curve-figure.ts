import type { TopLevelSpec } from "vega-lite";
import { medianOf } from "../numerics/order-statistics.js";
import { evenlySpacedIndices, evenlySpacedItems } from "../numerics/even-thinning.js";
import { FIGURE_COLORS, figureConfig } from "./figure-style.js";
import { formatSignificant } from "./format-measurement.js";
import { timeUnitOf, valueUnitOf } from "./parameter-display.js";
import type { ReportFigure } from "./report-figure.js";
import type { ReportInput } from "./report-input.js";
import { timeAxisTitle, timeOffset, timeScaleName } from "./time-offset.js";
import { robustFlags, valueAxisRange } from "./value-axis-range.js";
import type { LayerMember } from "./vega-lite-types.js";

/** The 0.975 quantile of the standard normal: the half-width, in sd, of a central 95% Gaussian band. */
export const NORMAL_Z95 = 1.959963984540054;

/** Above this many points, error bars are left out: they would merge into a solid smear. */
const MAX_POINTS_WITH_ERROR_BARS = 2000;
/**
 * Above this many points, an evenly spaced subset is drawn: a point costs about 150 bytes of SVG, so the
 * figure stays under a megabyte for any number of points (at 760 pixels across, 5000 points already overlap).
 */
const MAX_POINTS_DRAWN = 5000;
/** Above this many grid times, the predictive curve is thinned evenly, for the same reason. */
const MAX_GRID_DRAWN = 2000;
/**
 * Flagged points and points beyond the axis are each drawn up to this many (evenly spaced in time beyond):
 * a few per cent of a million points would otherwise outweigh the thinned data.
 */
const MAX_MARKED_DRAWN = 1000;

const SERIES_DATA_WITH_ERRORS = "data ± 1σ";
const SERIES_DATA = "data";
const SERIES_MEAN = "posterior-predictive mean";
const SERIES_INNER = "68% band";
const SERIES_OUTER = "95% band";
const SERIES_OUTLIER = "likely outlier (robust noise)";
const SERIES_BEYOND = "beyond the axis (at its edge)";

/**
 * The light curve with its error bars, and the posterior-predictive mean of the latent curve with its
 * 68% (±1 sd) and 95% (±1.96 sd) Gaussian bands across the whole grid, gaps included. Magnitudes are
 * drawn with brighter upwards (a reversed axis), as astronomers expect.
 */
export function lightCurveFigure(input: ReportInput): ReportFigure {
  const { lightCurve, prediction } = input;
  const timeUnit = timeUnitOf(input);
  const valueUnit = valueUnitOf(input);
  const offset = timeOffset(lightCurve.time.length > 0 ? lightCurve.time : prediction.time);
  const n = lightCurve.time.length;
  const drawn = evenlySpacedIndices(n, MAX_POINTS_DRAWN);
  const withErrors = lightCurve.error !== undefined && n <= MAX_POINTS_WITH_ERROR_BARS;

  // The likely outliers of a robust fit (outlier probability > 1/2, robust.flagged) are drawn apart and listed.
  const flagged = robustFlags(input.result.robust?.flagged);
  const domain = valueAxisRange(lightCurve, flagged, prediction.mean);
  const clamp = (v: number) => Math.min(domain[1], Math.max(domain[0], v));
  const dataRows = drawn
    .filter((i) => !flagged(i) && lightCurve.value[i] >= domain[0] && lightCurve.value[i] <= domain[1])
    .map((i) => {
      const y = lightCurve.value[i];
      const e = lightCurve.error?.[i] ?? 0;
      return { t: lightCurve.time[i] - offset, y, lo: clamp(y - e), hi: clamp(y + e) };
    });
  // Flagged and off-axis points are drawn apart from the thinned data (up to MAX_MARKED_DRAWN each):
  // these are the points a reader looks for.
  const allOutliers: { t: number; y: number }[] = [];
  const allBeyond: { t: number; y: number; side: string }[] = [];
  let flaggedBeyond = 0;
  for (let i = 0; i < n; i++) {
    const y = lightCurve.value[i];
    const beyond = y < domain[0] || y > domain[1];
    if (beyond) allBeyond.push({ t: lightCurve.time[i] - offset, y: clamp(y), side: (y > domain[1]) !== (lightCurve.unit === "mag") ? "up" : "down" });
    if (beyond && flagged(i)) flaggedBeyond++;
    else if (flagged(i)) allOutliers.push({ t: lightCurve.time[i] - offset, y });
  }
  const outlierRows = evenlySpacedItems(allOutliers, MAX_MARKED_DRAWN);
  const beyondRows = evenlySpacedItems(allBeyond, MAX_MARKED_DRAWN);
  const gridRows = evenlySpacedIndices(prediction.time.length, MAX_GRID_DRAWN).map((i) => {
    const m = prediction.mean[i];
    const s = prediction.sd[i];
    return {
      t: prediction.time[i] - offset,
      m,
      lo68: m - s,
      hi68: m + s,
      lo95: m - NORMAL_Z95 * s,
      hi95: m + NORMAL_Z95 * s,
    };
  });

  const isMag = lightCurve.unit === "mag";
  const yTitle = isMag ? "Magnitude [mag]" : "Flux [flux units]";
  const xTitle = timeAxisTitle(offset, timeUnit, timeScaleName(lightCurve.provenance.timeColumn));
  const dataSeries = withErrors ? SERIES_DATA_WITH_ERRORS : SERIES_DATA;
  const seriesDomain = [
    dataSeries,
    SERIES_MEAN,
    SERIES_INNER,
    SERIES_OUTER,
    ...(outlierRows.length > 0 ? [SERIES_OUTLIER] : []),
    ...(beyondRows.length > 0 ? [SERIES_BEYOND] : []),
  ];
  const colorScale = {
    domain: seriesDomain,
    range: [
      FIGURE_COLORS.data,
      FIGURE_COLORS.model,
      FIGURE_COLORS.modelBandInner,
      FIGURE_COLORS.modelBandOuter,
      ...(outlierRows.length > 0 ? [FIGURE_COLORS.marker] : []),
      ...(beyondRows.length > 0 ? [FIGURE_COLORS.marker] : []),
    ],
  };
  const x = { field: "t", type: "quantitative" as const, title: xTitle, axis: { format: "~f" }, scale: { zero: false, nice: false } };
  const yScale = { zero: false, reverse: isMag, domain, nice: false };
  const legend = { title: null, orient: "top" as const, direction: "horizontal" as const };

  const layers: LayerMember[] = [
    {
      data: { name: "grid" },
      mark: { type: "area", opacity: 0.9, clip: true },
      encoding: {
        x,
        y: { field: "lo95", type: "quantitative", title: yTitle, scale: yScale },
        y2: { field: "hi95" },
        color: { datum: SERIES_OUTER, scale: colorScale, legend },
      },
    },
    {
      data: { name: "grid" },
      mark: { type: "area", opacity: 0.9, clip: true },
      encoding: {
        x,
        y: { field: "lo68", type: "quantitative" },
        y2: { field: "hi68" },
        color: { datum: SERIES_INNER },
      },
    },
    {
      data: { name: "grid" },
      mark: { type: "line", strokeWidth: 1.5, clip: true },
      encoding: { x, y: { field: "m", type: "quantitative" }, color: { datum: SERIES_MEAN } },
    },
  ];
  if (withErrors) {
    layers.push({
      data: { name: "data" },
      // Dense marks carry no ARIA label each (the figure has one): a label per point is a third of the SVG.
      mark: { type: "rule", strokeWidth: 0.8, opacity: 0.7, aria: false },
      encoding: { x, y: { field: "lo", type: "quantitative" }, y2: { field: "hi" }, color: { datum: dataSeries } },
    });
  }
  layers.push({
    data: { name: "data" },
    mark: { type: "point", filled: true, size: n > 2000 ? 6 : 14, opacity: 0.9, aria: false },
    encoding: { x, y: { field: "y", type: "quantitative" }, color: { datum: dataSeries } },
  });
  if (outlierRows.length > 0) {
    layers.push({
      data: { name: "outliers" },
      mark: { type: "point", filled: false, size: 40, strokeWidth: 1.5, shape: "circle" },
      encoding: { x, y: { field: "y", type: "quantitative" }, color: { datum: SERIES_OUTLIER } },
    });
  }
  if (beyondRows.length > 0) {
    layers.push({
      data: { name: "beyond" },
      mark: { type: "point", filled: true, size: 45, clip: false },
      encoding: {
        x,
        y: { field: "y", type: "quantitative" },
        shape: { field: "side", type: "nominal", scale: { domain: ["up", "down"], range: ["triangle-up", "triangle-down"] }, legend: null },
        color: { datum: SERIES_BEYOND },
      },
    });
  }

  const spec: TopLevelSpec = {
    $schema: "https://vega.github.io/schema/vega-lite/v6.json",
    config: figureConfig(),
    width: 760,
    height: 320,
    datasets: { data: dataRows, grid: gridRows, outliers: outlierRows, beyond: beyondRows },
    layer: layers,
  };

  const errorNote =
    lightCurve.error === undefined
      ? "The file gives no errors, so a white-noise term was fitted and no error bars are drawn."
      : withErrors
        ? "Bars are the 1σ measurement errors."
        : `Error bars are left out above ${MAX_POINTS_WITH_ERROR_BARS} points; the median 1σ error is ${formatSignificant(medianOf(lightCurve.error), 2)} ${valueUnit}.`;
  const thinNote =
    drawn.length < n
      ? ` An evenly spaced ${drawn.length} of the ${n} points are drawn${allOutliers.length + allBeyond.length > 0 ? `, and ${allOutliers.length + allBeyond.length > outlierRows.length + beyondRows.length ? `up to ${MAX_MARKED_DRAWN} each of the flagged and off-axis points` : "every flagged and off-axis point"} besides` : ""}.`
      : "";
  const drawnOf = (drawnCount: number, all: number) => (drawnCount < all ? ` (an evenly spaced ${drawnCount} of them drawn)` : "");
  const outlierNote =
    allOutliers.length > 0
      ? ` Open red circles: the ${allOutliers.length} points the robust noise model finds more likely than not to be outliers${drawnOf(outlierRows.length, allOutliers.length)}, listed in the outlier table.`
      : "";
  const beyondNote =
    allBeyond.length > 0
      ? ` The value axis spans the bulk of the data; ${allBeyond.length} point${allBeyond.length === 1 ? " lies" : "s lie"} beyond it, drawn as red triangle${allBeyond.length === 1 ? "" : "s"} at its edge${drawnOf(beyondRows.length, allBeyond.length)}` +
        (flaggedBeyond > 0 ? ` (${flaggedBeyond === allBeyond.length ? (allBeyond.length === 1 ? "a" : "all") : `${flaggedBeyond} of them`} likely outlier${flaggedBeyond === 1 ? "" : "s"} of the robust noise, listed in the outlier table).` : ".")
      : "";
  const offsetNote = offset === 0 ? "" : ` Times are shown relative to ${offset} ${timeUnit}.`;
  return {
    id: "light-curve",
    title: "Light curve and posterior prediction",
    caption:
      `Points: the ${n} measurements. ${errorNote} Line and shading: the posterior-predictive mean of the ` +
      `latent (noise-free) light curve with its 68% and 95% bands, continued across the gaps between ` +
      `observations.${thinNote}${outlierNote}${beyondNote}${offsetNote}`,
    spec,
  };
}
