import type { FitDiagnostics } from "./fit-result.js";

/**
 * The figures that say whether an importance-sampled posterior can be trusted, as a phrase for
 * summaries and reports: k-hat of the Pareto-smoothed weights against its threshold, and the weights'
 * ESS out of the draws (R-hat does not apply to independent weighted draws). MCMC fits are described
 * by their R-hat and ESS where they are printed.
 *
 * @example importanceFigures(result.diagnostics) // "k-hat 0.21 (threshold 0.67), ESS 812 of 1000 importance draws"
 */
export function importanceFigures(d: FitDiagnostics): string {
  const k = d.paretoK !== undefined && Number.isFinite(d.paretoK) ? d.paretoK.toFixed(2) : "not computed";
  const threshold = d.paretoKThreshold !== undefined ? ` (threshold ${d.paretoKThreshold.toFixed(2)})` : "";
  const ess = Number.isFinite(d.essMin) ? String(Math.round(d.essMin)) : "not computed";
  const draws = d.importanceDraws !== undefined ? ` of ${d.importanceDraws} importance draws` : "";
  return `k-hat ${k}${threshold}, ESS ${ess}${draws}`;
}
