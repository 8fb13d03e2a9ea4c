import { summarizeDraws, type PosteriorDraws, type PosteriorSummary } from "../inference/index.js";
import { derivedQuantities } from "./derived-quantities.js";
import type { DerivedSummary, FitParameterSummary } from "./fit-result.js";
import type { ModelName } from "./light-curve-model.js";

/** Posterior summaries of a fit's parameters and derived quantities. */
export interface PosteriorSummaries {
  readonly parameters: Record<string, FitParameterSummary>;
  readonly derived: Record<string, DerivedSummary>;
}

/**
 * The summaries stage of a fit: every parameter of `names` summarised over the pooled draws
 * ({@link summarizeDraws}), and every derived quantity of the model ({@link derivedQuantities})
 * computed draw by draw and summarised the same way.
 */
export function posteriorSummaries(
  draws: PosteriorDraws,
  names: readonly string[],
  model: ModelName,
  redshift?: number,
): PosteriorSummaries {
  const parameters: Record<string, FitParameterSummary> = {};
  for (const name of names) parameters[name] = compactSummary(summarizeDraws(draws.columns[name]));
  const derived: Record<string, DerivedSummary> = {};
  for (const quantity of derivedQuantities(model, redshift)) {
    const values = new Float64Array(draws.chain.length);
    const record: Record<string, number> = {};
    for (let k = 0; k < values.length; k++) {
      for (const name of draws.names) record[name] = draws.columns[name][k];
      values[k] = quantity.compute(record);
    }
    derived[quantity.name] = { ...compactSummary(summarizeDraws(values)), description: quantity.description };
  }
  return { parameters, derived };
}

/** The fit-result summary keys plus the 95% highest-density interval. */
function compactSummary(s: PosteriorSummary): FitParameterSummary {
  return { median: s.median, mean: s.mean, sd: s.sd, "q2.5": s["q2.5"], q16: s.q16, q84: s.q84, "q97.5": s["q97.5"], hdi95: s.hdi95 };
}
