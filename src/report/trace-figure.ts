import type { TopLevelSpec } from "vega-lite";
import { evenlySpacedIndices } from "../numerics/even-thinning.js";
import { FIGURE_COLORS, figureConfig } from "./figure-style.js";
import { parameterAxisTitle, parameterDisplay } from "./parameter-display.js";
import type { ReportFigure } from "./report-figure.js";
import type { ReportInput } from "./report-input.js";

/** Points drawn per parameter, over all chains together; beyond it each chain's steps are thinned evenly. */
const MAX_POINTS_PER_PARAMETER = 8000;
/** With this many chains or fewer, each chain gets its own colour; more would be indistinguishable. */
const MAX_COLOURED_CHAINS = 10;

/**
 * The chain traces: one panel per parameter, the value of every chain (or walker) against the step,
 * sharing the step axis. Well-mixed chains overlap as a stationary band; a drifting or stuck chain stands out.
 */
export function traceFigure(input: ReportInput): ReportFigure {
  const names = input.draws.names.filter((name) => input.draws.chains[name] !== undefined);
  if (names.length === 0) throw new RangeError("the trace figure needs posterior draws of at least one parameter");
  const chainCount = input.draws.chains[names[0]].length;
  const steps = input.draws.chains[names[0]][0]?.length ?? 0;
  const perChain = Math.max(50, Math.floor(MAX_POINTS_PER_PARAMETER / Math.max(1, chainCount)));
  const keptSteps = evenlySpacedIndices(steps, perChain);
  const coloured = chainCount <= MAX_COLOURED_CHAINS;

  const datasets: Record<string, unknown[]> = {};
  const panels = names.map((name, p) => {
    const display = parameterDisplay(input, name);
    const rows: { step: number; chain: number; v: number }[] = [];
    input.draws.chains[name].forEach((chain, c) => {
      for (const s of keptSteps) {
        const v = chain[s];
        rows.push({ step: s, chain: c, v: display.logScale ? Math.log10(v) : v });
      }
    });
    datasets[`trace${p}`] = rows;
    const bottom = p === names.length - 1;
    return {
      width: 720,
      height: 90,
      title: { text: parameterAxisTitle(display), fontSize: 12 },
      data: { name: `trace${p}` },
      mark: { type: "line", strokeWidth: coloured ? 0.9 : 0.6, opacity: coloured ? 0.8 : 0.35, clip: true },
      encoding: {
        x: {
          field: "step",
          type: "quantitative",
          scale: { domain: [0, Math.max(1, steps - 1)], nice: false },
          axis: bottom ? { title: "Step", format: "~f" } : { title: null, labels: false },
        },
        y: { field: "v", type: "quantitative", scale: { zero: false }, axis: { title: null, tickCount: 4 } },
        ...(coloured
          ? { color: { field: "chain", type: "nominal", scale: { scheme: "tableau10" }, legend: null } }
          : { detail: { field: "chain", type: "nominal" }, color: { value: FIGURE_COLORS.model } }),
      },
    };
  });

  const spec = {
    $schema: "https://vega.github.io/schema/vega-lite/v6.json",
    config: figureConfig(),
    datasets,
    spacing: 12,
    vconcat: panels,
  } as unknown as TopLevelSpec;

  const thinned = keptSteps.length < steps ? ` Each chain is drawn at ${keptSteps.length} evenly spaced steps.` : "";
  return {
    id: "traces",
    title: "Chain traces",
    caption:
      `The value of each parameter in each of the ${chainCount} chains${coloured ? " (one colour per chain)" : ""} ` +
      `against the step, over ${steps} steps. Mixed chains overlap as one stationary band; a drift or a stuck ` +
      `chain means the numbers above should not be trusted.${thinned}`,
    spec,
  };
}
