import type { Rng } from "../random/rng.js";
import { minimizeLbfgs, type LbfgsOptions, type LocalMinimum } from "./lbfgs.js";
import { hasGradient, type PosteriorTarget } from "./posterior-target.js";
import { minimizeNelderMead, type NelderMeadOptions } from "./nelder-mead.js";
import type { ParameterSpace } from "./parameter-space.js";

/** Options of {@link findMaximumPosterior}. */
export interface MaximumPosteriorOptions {
  /** Starting points in the target's (unconstrained) space; non-finite ones are skipped. */
  readonly starts: readonly Float64Array[];
  /** "lbfgs" (default when the target has a gradient) or "nelder-mead". */
  readonly method?: "lbfgs" | "nelder-mead";
  readonly lbfgs?: LbfgsOptions;
  readonly nelderMead?: NelderMeadOptions;
}

/** One local maximum reached from one start. */
export interface LocalMaximum {
  readonly start: Float64Array;
  readonly x: Float64Array;
  readonly logPosterior: number;
  readonly converged: boolean;
  readonly evaluations: number;
}

/** The best of several local maximisations. */
export interface MaximumPosterior {
  /** The highest point found, in the target's space. */
  readonly x: Float64Array;
  /** ln p at `x`. */
  readonly logPosterior: number;
  readonly method: "lbfgs" | "nelder-mead";
  /** Every run, best first. */
  readonly runs: readonly LocalMaximum[];
}

/**
 * Maximises a log density from several starting points and keeps the best: L-BFGS on -ln p when the
 * target has a gradient, Nelder-Mead otherwise. Several starts guard against the local maxima that
 * periodic likelihoods have at harmonics and aliases of the period (common practice).
 */
export function findMaximumPosterior(target: PosteriorTarget, options: MaximumPosteriorOptions): MaximumPosterior {
  const method = options.method ?? (hasGradient(target) ? "lbfgs" : "nelder-mead");
  if (method === "lbfgs" && !hasGradient(target)) {
    throw new RangeError("maximum a posteriori: L-BFGS needs a target with a gradient");
  }
  const runs: LocalMaximum[] = [];
  for (const start of options.starts) {
    if (start.length !== target.dimension) {
      throw new RangeError(`maximum a posteriori: start has ${start.length} entries, the target ${target.dimension}`);
    }
    if (!Number.isFinite(target.logPosterior(start))) continue;
    let result: LocalMinimum;
    if (method === "lbfgs" && hasGradient(target)) {
      result = minimizeLbfgs(
        (x, g) => {
          const v = target.logPosteriorAndGradient(x, g);
          for (let i = 0; i < g.length; i++) g[i] = -g[i];
          return -v;
        },
        start,
        options.lbfgs,
      );
    } else {
      result = minimizeNelderMead((x) => -target.logPosterior(x), start, options.nelderMead);
    }
    runs.push({
      start: Float64Array.from(start),
      x: result.x,
      logPosterior: -result.value,
      converged: result.converged,
      evaluations: result.evaluations,
    });
  }
  if (runs.length === 0) {
    throw new NoFiniteStartError();
  }
  runs.sort((a, b) => b.logPosterior - a.logPosterior);
  const best = runs[0];
  return { x: best.x, logPosterior: best.logPosterior, method, runs };
}

/**
 * Starting points for a multi-start search, in the space's unconstrained coordinates: the given
 * initial guess (by parameter name; missing names at their prior median) first, then `count - 1`
 * independent draws from the prior.
 */
export function startingPoints(
  space: ParameterSpace,
  count: number,
  rng: Rng,
  initial?: Readonly<Record<string, number>>,
): Float64Array[] {
  const points = [space.toUnconstrained(space.physicalFromRecord(initial ?? {}))];
  for (let i = 1; i < count; i++) points.push(space.drawFromPrior(rng));
  return points;
}

/**
 * No starting point of the search has a finite log density: the model cannot be evaluated near its
 * prior's typical values (for a Gaussian process, a covariance that cannot be factorised at any of them).
 * A RangeError, so callers that do not know it still see one; the fit explains it in terms of the data.
 */
export class NoFiniteStartError extends RangeError {
  constructor() {
    super("maximum a posteriori: the log density is not finite at any starting point");
    this.name = "NoFiniteStartError";
  }
}
