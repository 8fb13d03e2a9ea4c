/** What a warm-up iteration should do. */
export interface WarmupPlan {
  /** Iterations at whose end the mass matrix is re-estimated from the window just finished. */
  readonly windowEnds: readonly number[];
  /** The first iteration of each mass-matrix window (same length as `windowEnds`). */
  readonly windowStarts: readonly number[];
}

/**
 * Shortest mass-matrix window, in iterations of every chain. With 4 chains, 40 iterations are 160 draws:
 * enough for each coordinate's spread to reach the 20 effective draws a window needs to have a say
 * (`MIN_SPREAD_DRAWS` in warmup-mass.ts) at autocorrelation times up to about 8. Windows of 20 often
 * supported only some coordinates of the damped random walk, whose mass matrix then mixed curvature and
 * window variances (measured in bench/nuts-warmup-compare.ts).
 */
export const MIN_WARMUP_WINDOW = 40;

/** Factor by which each mass-matrix window is longer than the one before it. */
export const WARMUP_WINDOW_GROWTH = 3;

/**
 * Where the mass-matrix windows of the NUTS warm-up lie. The warm-up as a whole is the project's own
 * design (the idea of tuning the step size by dual averaging while a diagonal mass matrix is estimated
 * from windows of draws is that of Hoffman & Gelman 2014, JMLR 15, 1593, sec. 3.2); its rules and why:
 *
 * - Start from what the fit already knows. Chains start at the mode of the sampled density, spread by
 *   its curvature, with the squared curvature scales as the inverse mass. For the light-curve models
 *   that mass is already about as good as the true posterior variances (bench/nuts-warmup-compare.ts),
 *   so the warm-up's first duty is not to make it worse.
 * - One mass matrix for all chains, from the draws of all chains in a window ((`WindowDraws`, warmup-mass.ts)):
 *   four times the draws of a chain alone, and the chains' disagreement counts against the estimate.
 * - A window changes the mass only when it contradicts it (`nextInverseMass`, warmup-mass.ts): a coordinate with at
 *   least `MIN_SPREAD_DRAWS` effective draws of its spread whose variance lies beyond two standard errors
 *   and a factor 2 from the current value. Then the window's variances replace the mass matrix and the step
 *   size is searched afresh; otherwise they only sharpen it, weighted by effective draws, and the step-size
 *   adaptation runs on. The standard error comes from the window itself (autocorrelation, chains and
 *   tails included), so a short, sticky or heavy-tailed window is trusted less.
 * - The layout (this function) for W warm-up iterations: an opening of round(W / 8) iterations that tune
 *   only the step size while the chains settle into the typical set; a middle span tiled exactly by k
 *   windows growing geometrically by `WARMUP_WINDOW_GROWTH`, k the largest number for which the first
 *   window still holds `MIN_WARMUP_WINDOW` iterations (of every chain); a closing of round(W / 8)
 *   iterations in which the step size settles for the final mass matrix. The default W = 500 gives two
 *   windows, W >= 694 three. More than one window lets a badly scaled start (such as a unit mass across
 *   six decades of scale) be corrected in stages, each letting the step size grow; the last window, at
 *   least two thirds of the span, gives the final estimate. Growth 3 rather than 2 means fewer, longer
 *   windows and fewer restarts, each costing the dual averaging some tens of iterations to settle.
 *
 * Fewer than 2 * MIN_WARMUP_WINDOW warm-up iterations: no mass-matrix window (step size only).
 *
 * @example planWarmup(500) // opening 63, windows [63, 157), [157, 437) of 94 and 280; closing 63
 */
export function planWarmup(warmup: number): WarmupPlan {
  const opening = Math.round(warmup / 8);
  const closing = Math.round(warmup / 8);
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
