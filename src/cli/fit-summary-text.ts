import type { FitResult } from "../models/fit-result.js";
import { importanceFigures } from "../models/importance-figures.js";
import { convergenceFigure } from "../report/format-measurement.js";
import { parameterUnit } from "../report/parameter-display.js";

/** The time unit of console lines: days, the unit of every time column Horologium recognises (common practice). */
const TIME_UNIT = "d";

const fmt = (x: number) => (Math.abs(x) >= 1e5 || (Math.abs(x) < 1e-3 && x !== 0) ? x.toExponential(3) : x.toPrecision(4));

/**
 * A short human-readable summary of a fit: one line per parameter with the median and the 16-84% interval,
 * the derived quantities, the diagnostics and the warnings.
 */
export function fitSummaryText(result: FitResult, label?: string): string {
  const lines: string[] = [];
  const band = result.data.band;
  lines.push(`${label ?? result.data.source}${band ? ` [band ${band}]` : ""}: ${result.model} model, ${result.data.n} points over ${fmt(result.data.baseline)} ${TIME_UNIT}, median spacing ${fmt(result.data.medianCadence)} ${TIME_UNIT}`);
  const valueUnit = result.data.unit === "flux" ? "flux" : "mag";
  const row = (name: string, s: { median: number; q16: number; q84: number }) => {
    const unit = parameterUnit(name, valueUnit, TIME_UNIT);
    return `  ${name.padEnd(16)} ${fmt(s.median).padStart(11)}  (+${fmt(s.q84 - s.median)} / -${fmt(s.median - s.q16)})${unit ? ` ${unit}` : ""}`;
  };
  for (const [name, s] of Object.entries(result.parameters)) lines.push(row(name, s));
  for (const [name, s] of Object.entries(result.derived)) lines.push(row(name, s));
  const d = result.diagnostics;
  lines.push(
    `  ${d.converged ? "converged" : "NOT converged"}: ${d.method === "importance" ? `importance sampling, ${importanceFigures(d)}` : `R-hat max ${convergenceFigure(d.rhatMax, 5)}, ESS min ${convergenceFigure(d.essMin, 3)}`}, ` +
      `${Math.round(d.likelihoodEvaluations)} log-likelihood evaluations, ${d.seconds.toFixed(1)} s`,
  );
  for (const warning of result.warnings) lines.push(`  warning: ${warning}`);
  return lines.join("\n") + "\n";
}
