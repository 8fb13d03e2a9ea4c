import type { TopLevelSpec } from "vega-lite";
import type { StoredChainTrace } from "../models/fit-result.js";
import { evenlySpacedIndices } from "../numerics/even-thinning.js";
import { FIGURE_COLORS, figureConfig } from "./figure-style.js";
import { parameterAxisTitle, parameterDisplay } from "./parameter-display.js";
import type { ReportFigure } from "./report-figure.js";
import type { ReportInput } from "./report-input.js";
import type { DataRows, LayerMember, ViewSpec } from "./vega-lite-types.js";

/** Steps per chain drawn from the stored draws of a result without a trace (older results). */
const MAX_STEPS_FROM_DRAWS = 500;
/** Chains drawn from the stored draws of a result without a trace. */
const MAX_CHAINS_FROM_DRAWS = 4;
/** Width of the panels of one run; several runs share it side by side. */
const TOTAL_WIDTH = 720;
/** The name of ln p in the panels. */
const LOG_POSTERIOR = "ln p";

/**
 * A trace built from the posterior draws of the report input (kept draws only, after warm-up): the
 * fallback for a result without `chainTraces`, drawn with a caption that says what is missing.
 */
function traceFromDraws(input: ReportInput): StoredChainTrace | undefined {
  const names = input.draws.names.filter((name) => input.draws.chains[name] !== undefined);
  if (names.length === 0) return undefined;
  const chains = input.draws.chains[names[0]].length;
  const length = input.draws.chains[names[0]][0]?.length ?? 0;
  const steps = evenlySpacedIndices(length, MAX_STEPS_FROM_DRAWS);
  const traced = evenlySpacedIndices(chains, MAX_CHAINS_FROM_DRAWS);
  return {
    sampler: input.result.diagnostics.sampler ?? "ensemble",
    chains,
    iterations: Math.max(0, length - 1),
    warmup: 0,
    steps,
    names,
    series: traced.map((c) => ({
      label: `chain ${c + 1}`,
      chain: c,
      values: Object.fromEntries(names.map((name) => [name, steps.map((s) => input.draws.chains[name][c][s])])),
      logPosterior: [],
    })),
  };
}

/** What the warm-up is called in the figure, by sampler. */
function warmupName(trace: StoredChainTrace): string {
  return trace.sampler === "nuts" ? "warm-up (adaptation, not kept)" : "burn-in (discarded)";
}

/** Colours of the traced chains, in order; the median over all walkers is drawn in the data colour. */
const CHAIN_COLOURS = ["#4c78a8", "#f58518", "#54a24b", "#b279a2", "#e45756", "#72b7b2", "#9d755d", "#bab0ac"];

/** The colour scale shared by every panel: each series label its colour, in the order of the traces. */
function seriesColours(traces: readonly StoredChainTrace[]): { domain: string[]; range: string[]; median: string | undefined } {
  const labels = [...new Set(traces.flatMap((t) => t.series.map((s) => s.label)))];
  const median = traces.flatMap((t) => t.series.filter((s) => s.chain === null).map((s) => s.label))[0];
  let next = 0;
  const range = labels.map((label) => (label === median ? FIGURE_COLORS.data : CHAIN_COLOURS[next++ % CHAIN_COLOURS.length]));
  return { domain: labels, range, median };
}

/** The rows of one panel: every series of one run at every traced step (log10 on a log axis). */
function panelRows(trace: StoredChainTrace, name: string, logScale: boolean): DataRows {
  return trace.series.flatMap((series) => {
    const values = name === LOG_POSTERIOR ? series.logPosterior : (series.values[name] ?? []);
    return trace.steps.flatMap((step, k) => {
      const v = values[k];
      if (v === undefined || !Number.isFinite(v) || (logScale && !(v > 0))) return [];
      return [{ step, series: series.label, v: logScale ? Math.log10(v) : v }];
    });
  });
}

/** One panel: the warm-up shaded, then one line per series against the iteration. */
function panel(
  trace: StoredChainTrace,
  dataset: string,
  title: string,
  layout: { readonly width: number; readonly bottom: boolean; readonly first: boolean; readonly stepTitle: string },
  colours: ReturnType<typeof seriesColours>,
): ViewSpec {
  const { width, bottom, first } = layout;
  const x = {
    field: "step",
    type: "quantitative" as const,
    scale: { domain: [0, Math.max(1, trace.iterations)], nice: false },
    axis: bottom ? { title: layout.stepTitle, format: ",d" } : { title: null, labels: false },
  };
  const warmup = Math.min(trace.warmup, trace.iterations);
  const shade: LayerMember[] =
    warmup > 0
      ? [
          {
            data: { values: [{ start: 0, end: warmup }] },
            mark: { type: "rect", color: "#e4e4e4" },
            encoding: { x: { ...x, field: "start" }, x2: { field: "end" } },
          },
          ...(first
            ? [
                {
                  data: { values: [{ start: 0, label: trace.sampler === "nuts" ? "warm-up" : "burn-in" }] },
                  mark: { type: "text" as const, align: "left" as const, baseline: "top" as const, dx: 3, y: 3, fontSize: 10, color: "#555555" },
                  encoding: { x: { ...x, field: "start" }, text: { field: "label" } },
                },
              ]
            : []),
        ]
      : [];
  return {
    width,
    height: 80,
    title: { text: title, fontSize: 12 },
    layer: [
      ...shade,
      {
        data: { name: dataset },
        mark: { type: "line", opacity: 0.85, clip: true },
        encoding: {
          x,
          y: { field: "v", type: "quantitative", scale: { zero: false }, axis: { title: null, tickCount: 4 } },
          color: {
            field: "series",
            type: "nominal",
            scale: { domain: colours.domain, range: colours.range },
            legend: { title: null, orient: "top", direction: "horizontal" },
          },
          strokeWidth: colours.median === undefined ? { value: 0.9 } : { condition: { test: `datum.series === ${JSON.stringify(colours.median)}`, value: 1.8 }, value: 0.8 },
        },
      },
    ],
  };
}

/** Whether the trace shows the whole run, and what it leaves out, in words. */
function caption(input: ReportInput, traces: readonly StoredChainTrace[], fromDraws: boolean): string {
  const first = traces[0];
  const unit = first.sampler === "nuts" ? "chains" : "walkers";
  const runs = traces.length > 1 ? `Each column is one of the ${traces.length} sampler runs (one per period mode). ` : "";
  const traced = first.series.length < first.chains
    ? `${first.series.filter((s) => s.chain !== null).length} of the ${first.chains} ${unit}${first.series.some((s) => s.chain === null) ? ` and the median over all ${first.chains} (black, thicker)` : ""}`
    : `all ${first.chains} ${unit}`;
  const untraced = Object.keys(input.result.parameters).filter((name) => !traces[0].names.includes(name) && input.draws.chains[name] !== undefined);
  const integrated =
    untraced.length > 0 && !fromDraws
      ? ` Not traced: ${untraced.join(", ")}, integrated out while sampling and drawn afterwards from ${untraced.length === 1 ? "its" : "their"} conditional posterior.`
      : "";
  if (fromDraws) {
    return (
      `The value of each parameter in ${traced} against the kept step, from the thinned draws stored in the result ` +
      `(this result holds no trace of the whole run: fit again to see the warm-up). A drift or a stuck chain means the numbers above should not be trusted.${integrated}`
    );
  }
  const totalSteps = traces.reduce((n, t) => n + t.steps.length, 0) / traces.length;
  return (
    `${runs}The value of each parameter and the log density (ln p, up to a constant) in ${traced} against the iteration, over the whole run of ` +
    `${first.iterations} iterations, drawn at ${Math.round(totalSteps)} evenly spaced iterations; the grey stretch is the ${warmupName(first)}. ` +
    `After it, mixed ${unit} overlap as one stationary band; a drift, a trend in ln p or a ${unit === "chains" ? "chain" : "walker"} stuck apart means the numbers above should not be trusted.${integrated}`
  );
}

/**
 * The chain traces over the whole run, warm-up included: one panel per traced parameter and one for ln p,
 * each run of the fit (one per period mode) in its own column, the warm-up or burn-in shaded. From the
 * result's `chainTraces`; a result without them (older files) gets the kept draws, with a caption that
 * says so. Undefined when there is nothing to trace (an importance-sampled fit: see `importance-weights-figure.ts`).
 */
export function traceFigure(input: ReportInput): ReportFigure | undefined {
  const stored = input.result.chainTraces;
  const fallback = stored === undefined && input.result.importanceWeights === undefined ? traceFromDraws(input) : undefined;
  const traces = stored ?? (fallback ? [fallback] : []);
  if (traces.length === 0) return undefined;
  const names = [...traces[0].names.filter((name) => input.result.parameters[name] !== undefined || input.draws.chains[name] !== undefined), ...(fallback ? [] : [LOG_POSTERIOR])];
  const width = Math.round(TOTAL_WIDTH / traces.length) - (traces.length > 1 ? 10 : 0);
  const colours = seriesColours(traces);
  const datasets: Record<string, DataRows> = {};
  const panels: ViewSpec[] = [];
  names.forEach((name, p) => {
    const display = name === LOG_POSTERIOR ? { label: LOG_POSTERIOR, unit: "", logScale: false } : parameterDisplay(input, name);
    traces.forEach((trace, r) => {
      const dataset = `trace${p}_${r}`;
      datasets[dataset] = panelRows(trace, name, display.logScale === true);
      const title = `${parameterAxisTitle(display)}${traces.length > 1 ? ` (run ${r + 1})` : ""}`;
      panels.push(panel(trace, dataset, title, { width, bottom: p === names.length - 1, first: p === 0, stepTitle: fallback ? "Kept step (after warm-up)" : "Iteration (warm-up included)" }, colours));
    });
  });
  const spec: TopLevelSpec = {
    $schema: "https://vega.github.io/schema/vega-lite/v6.json",
    config: figureConfig(),
    datasets,
    spacing: 12,
    columns: traces.length,
    concat: panels,
  };
  return { id: "traces", title: "Chain traces over the whole run", caption: caption(input, traces, fallback !== undefined), spec };
}
