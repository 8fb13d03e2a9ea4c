import type { TopLevelSpec } from "vega-lite";
import { FIGURE_COLORS, figureConfig } from "./figure-style.js";
import { formatSignificant } from "./format-measurement.js";
import type { ReportFigure } from "./report-figure.js";
import type { ReportInput } from "./report-input.js";
import type { DataRows } from "./vega-lite-types.js";

/** The largest weights drawn as dots besides the line (the result stores the 50 largest each). */
const LARGEST_WEIGHTS_DOTTED = 50;
/** The bottom of the weight axis, in equal shares: smaller weights are drawn at this edge. */
const SMALLEST_WEIGHT_DRAWN = 1e-3;

/**
 * The importance weights of an importance-sampled fit, in place of chain traces (independent weighted
 * draws form no chain): each stored weight times the number of draws (1: an equal share) against its rank,
 * largest first, on log axes. A flat curve near 1 means the proposal matched the posterior; a few weights
 * far above the rest mean a few draws carry the posterior, which k-hat (Pareto-smoothed importance
 * sampling: Vehtari et al. 2024, the tail shape of the weights) and the ESS put in numbers. Undefined
 * without `importanceWeights`.
 */
export function importanceWeightsFigure(input: ReportInput): ReportFigure | undefined {
  const runs = input.result.importanceWeights;
  if (runs === undefined || runs.length === 0) return undefined;
  const label = (r: number) => (runs.length > 1 ? `run ${r + 1}` : "weights");
  const rows = runs.flatMap((run, r) =>
    run.ranks.flatMap((rank, k) => {
      const w = run.scaledWeights[k];
      return Number.isFinite(w) ? [{ rank, w: Math.max(SMALLEST_WEIGHT_DRAWN, w), run: label(r) }] : [];
    }),
  );
  const largest = rows.reduce((m, row) => Math.max(m, row.w), 1);
  const draws = runs.reduce((m, run) => Math.max(m, run.draws), 2);
  const clipped = runs.some((run) => run.scaledWeights.some((w) => w < SMALLEST_WEIGHT_DRAWN));
  const x = { field: "rank", type: "quantitative" as const, scale: { type: "log" as const, domain: [1, draws], nice: false }, title: "Rank of the draw's weight (1: the largest)" };
  const y = {
    field: "w",
    type: "quantitative" as const,
    scale: { type: "log" as const, domain: [SMALLEST_WEIGHT_DRAWN, Math.max(2, largest * 1.5)], nice: false },
    title: "Weight × number of draws",
  };
  const color = runs.length > 1 ? { field: "run", type: "nominal" as const, legend: { title: null, orient: "top" as const } } : { value: FIGURE_COLORS.model };
  const spec: TopLevelSpec = {
    $schema: "https://vega.github.io/schema/vega-lite/v6.json",
    config: figureConfig(),
    width: 720,
    height: 240,
    datasets: { weights: rows satisfies DataRows },
    layer: [
      {
        data: { values: [{ equal: 1 }] },
        mark: { type: "rule", strokeDash: [4, 3], color: FIGURE_COLORS.periodogram },
        encoding: { y: { field: "equal", type: "quantitative" } },
      },
      {
        // The largest weights, each stored, as dots: the head that k-hat measures.
        data: { name: "weights" },
        transform: [{ filter: `datum.rank <= ${LARGEST_WEIGHTS_DOTTED}` }],
        mark: { type: "point", filled: true, size: 16, aria: false },
        encoding: { x, y, color },
      },
      {
        data: { name: "weights" },
        mark: { type: "line", strokeWidth: 1.5 },
        encoding: { x, y, color },
      },
    ],
  };
  const figures = runs.map((run, r) => {
    const k = Number.isFinite(run.paretoK) ? run.paretoK.toFixed(2) : "not computed";
    const lead = runs.length > 1 ? `run ${r + 1}: ` : "";
    return `${lead}k-hat ${k} (threshold ${run.paretoKThreshold.toFixed(2)}), ESS ${Math.round(run.effectiveSampleSize)} of ${run.draws} draws, the largest weight ${formatSignificant(run.scaledWeights[0] ?? NaN, 3)} times an equal share`;
  });
  const thinned =
    (runs.some((run) => run.ranks.length < run.draws) ? ` The ${LARGEST_WEIGHTS_DOTTED} largest weights are drawn each (dots), the rest at evenly spaced ranks.` : "") +
    (clipped ? ` Weights below ${SMALLEST_WEIGHT_DRAWN} of an equal share (draws far in the proposal's tails) are drawn at the bottom edge.` : "");
  return {
    id: "importance-weights",
    title: "Importance weights (no chain to trace)",
    caption:
      `This posterior was computed by importance sampling: independent draws from a proposal fitted at the mode, each weighed by posterior over proposal and Pareto-smoothed, ` +
      `so there is no chain and no warm-up to trace. What says whether to trust it is the weights: each drawn against its rank, times the number of draws ` +
      `(dashed: an equal share). A flat curve near 1 means the proposal matched the posterior; a steep head means a few draws carry it. ` +
      `${figures.join("; ")}.${thinned}`,
    spec,
  };
}
