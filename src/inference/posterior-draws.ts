import type { ParameterSpace } from "./parameter-space.js";
import type { SamplerRun } from "./run-sampler.js";

/** Posterior draws in physical parameters, one column per parameter, ready to export. */
export interface PosteriorDraws {
  /** Every parameter of the space, fixed ones included (constant columns). */
  readonly names: readonly string[];
  /** `columns[name][k]` is draw k of that parameter, in its physical unit. */
  readonly columns: Readonly<Record<string, Float64Array>>;
  /** Chain (NUTS) or walker (ensemble) of each draw. */
  readonly chain: Int32Array;
  /** Kept iteration of each draw, counted from the first one used for summaries. */
  readonly iteration: Int32Array;
  /** ln posterior (unconstrained, with the Jacobian) of each draw. */
  readonly logPosterior: Float64Array;
}

/**
 * The draws a run keeps for summaries (after the ensemble's burn-in), mapped to physical parameters,
 * ordered chain by chain. `thin` keeps every thin-th iteration (default 1, all of them).
 */
export function posteriorDraws(space: ParameterSpace, run: SamplerRun, thin = 1): PosteriorDraws {
  if (!(Number.isInteger(thin) && thin >= 1)) throw new RangeError(`posterior draws: thin must be a positive integer, got ${thin}`);
  const store = run.sampler.draws;
  const from = run.analysisStart;
  const perChain = Math.ceil((store.length - from) / thin);
  const total = perChain * store.chains;
  const columns: Record<string, Float64Array> = {};
  for (const name of space.names) columns[name] = new Float64Array(total);
  const chain = new Int32Array(total);
  const iteration = new Int32Array(total);
  const logPosterior = new Float64Array(total);
  const physical = new Float64Array(space.names.length);
  let k = 0;
  for (let c = 0; c < store.chains; c++) {
    const logp = store.logPosteriorOf(c, from);
    for (let r = from, j = 0; r < store.length; r += thin, j += thin) {
      space.toPhysical(store.row(c, r), physical);
      space.names.forEach((name, i) => (columns[name][k] = physical[i]));
      chain[k] = c;
      iteration[k] = j;
      logPosterior[k] = logp[j];
      k++;
    }
  }
  return { names: space.names, columns, chain, iteration, logPosterior };
}

/**
 * The draws as CSV text: a header `chain,iteration,<parameters...>,log_posterior` and one row per draw,
 * numbers with full double precision (shortest round-trip form).
 */
export function posteriorDrawsToCsv(draws: PosteriorDraws): string {
  const lines = [["chain", "iteration", ...draws.names, "log_posterior"].join(",")];
  for (let k = 0; k < draws.chain.length; k++) {
    const row = [String(draws.chain[k]), String(draws.iteration[k])];
    for (const name of draws.names) row.push(String(draws.columns[name][k]));
    row.push(String(draws.logPosterior[k]));
    lines.push(row.join(","));
  }
  return lines.join("\n") + "\n";
}
