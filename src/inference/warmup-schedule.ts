import { sortedCopy, sortedQuantile } from "../numerics/order-statistics.js";

/** What a warm-up iteration should do. */
export interface WarmupPlan {
  /** Iterations at whose end the mass matrix is re-estimated from the window just finished. */
  readonly windowEnds: readonly number[];
  /** The first iteration of each mass-matrix window (same length as `windowEnds`). */
  readonly windowStarts: readonly number[];
}

/** Shortest mass-matrix window: a variance from n draws has a relative error of about sqrt(2 / n), 32% at 20. */
export const MIN_WARMUP_WINDOW = 20;

/** Factor by which each mass-matrix window is longer than the one before it. */
export const WARMUP_WINDOW_GROWTH = 3;

/**
 * Windowed warm-up for NUTS (the idea of adapting the step size by dual averaging while a diagonal mass
 * matrix is re-estimated from growing windows of draws: Hoffman & Gelman 2014, JMLR 15, 1593, sec. 3.2;
 * the constants are the project's own, derived below and checked against an oracle mass matrix in
 * bench/nuts-warmup-compare.ts).
 *
 * The warm-up of W iterations has three stages:
 * 1. an opening of round(W / 8) iterations that adapt only the step size. Chains start at the mode, spread
 *    by its curvature, with that curvature as the first mass matrix, so they need only to settle into
 *    the typical set before their draws say anything about its shape;
 * 2. a middle span tiled exactly by k windows whose lengths grow geometrically by
 *    `WARMUP_WINDOW_GROWTH`, k being the largest number for which the first window still holds
 *    `MIN_WARMUP_WINDOW` draws. Each window ends with a new mass matrix and a fresh step-size
 *    search. Growth 3 rather than 2 halves the restarts (each costs the dual averaging some tens of
 *    iterations to settle) and gives the last window, whose estimate is the one kept, two thirds of the span;
 * 3. a closing of round(W / 10) iterations in which the step size settles for the final mass matrix.
 *
 * Fewer than 2 * MIN_WARMUP_WINDOW warm-up iterations: no mass-matrix window (step size only).
 *
 * @example planWarmup(500) // opening 63, windows [63, 93), [93, 182), [182, 450) of 30, 89, 268; closing 50
 */
export function planWarmup(warmup: number): WarmupPlan {
  const opening = Math.round(warmup / 8);
  const closing = Math.round(warmup / 10);
  const span = warmup - opening - closing;
  if (warmup < 2 * MIN_WARMUP_WINDOW || span < MIN_WARMUP_WINDOW) return { windowStarts: [], windowEnds: [] };
  // Windows s, g s, g^2 s, ... sum to s (g^k - 1) / (g - 1) = span; the first must be >= MIN_WARMUP_WINDOW.
  const g = WARMUP_WINDOW_GROWTH;
  let count = 1;
  while ((span * (g - 1)) / (g ** (count + 1) - 1) >= MIN_WARMUP_WINDOW) count++;
  const first = (span * (g - 1)) / (g ** count - 1);
  const starts: number[] = [];
  const ends: number[] = [];
  let covered = 0;
  for (let w = 0; w < count; w++) {
    starts.push(opening + Math.round(covered));
    covered += first * g ** w;
    ends.push(w === count - 1 ? opening + span : opening + Math.round(covered));
  }
  return { windowStarts: starts, windowEnds: ends };
}

/** Weight, in draws, given to the previous mass matrix when a window's variances are estimated. */
export const MASS_PRIOR_DRAWS = 10;

/**
 * The spread of each coordinate over one warm-up window, for the diagonal mass matrix. The scale is the
 * interquartile range divided by 2 Phi^-1(3/4) = 1.3490 (the standard deviation for a normal
 * distribution; Hoaglin, Mosteller & Tukey 1983, Understanding Robust and Exploratory Data Analysis, from
 * memory), not the sample standard deviation: timescale posteriors of damped random walks have long
 * tails towards the baseline, and a mass matrix sized by the tail's variance makes steps too long for
 * the bulk, where the sampler spends its time.
 */
export class WindowSpread {
  private readonly columns: number[][];

  constructor(dimension: number) {
    this.columns = Array.from({ length: dimension }, () => []);
  }

  /** Vectors added since the last reset. */
  get count(): number {
    return this.columns[0]?.length ?? 0;
  }

  /** Adds one vector (for example a chain's position after an iteration). */
  add(x: Float64Array): void {
    for (let i = 0; i < this.columns.length; i++) this.columns[i].push(x[i]);
  }

  /**
   * Squared robust scales shrunk towards `target` (the previous mass matrix, or the curvature at the
   * mode) as the posterior mean of a variance under a conjugate scaled-inverse-chi-square prior centred
   * on `target` with nu0 = {@link MASS_PRIOR_DRAWS} degrees of freedom (Gelman et al. 2013, Bayesian Data
   * Analysis, 3rd ed., sec. 3.3, from memory): (nu0 target + (n - 1) s^2) / (nu0 + n - 1). A 20-draw
   * window thus moves the estimate two thirds of the way to its own spread, and a short window cannot
   * produce a near-singular mass matrix. Shrinking towards each parameter's own previous scale, not a
   * constant, keeps the regularisation right for parameters of any magnitude.
   */
  regularizedVariance(target: Float64Array): Float64Array {
    return Float64Array.from(this.columns, (column, i) => {
      const dof = column.length - 1;
      const s = interquartileScale(column);
      return (MASS_PRIOR_DRAWS * target[i] + dof * s * s) / (MASS_PRIOR_DRAWS + dof);
    });
  }

  /** Forgets every vector added, for the next adaptation window. */
  reset(): void {
    for (const column of this.columns) column.length = 0;
  }
}

/** Interquartile range / 1.3490 of `values` (linear interpolation between order statistics). */
function interquartileScale(values: readonly number[]): number {
  const sorted = sortedCopy(values);
  return (sortedQuantile(sorted, 0.75) - sortedQuantile(sorted, 0.25)) / 1.349;
}
