import { effectiveSampleSize } from "./effective-sample-size.js";

/** Fewest effective draws of a coordinate's squared deviations for a window to have a say about that coordinate. */
export const MIN_SPREAD_DRAWS = 20;

/** Standard errors by which a window's spread must differ from the current inverse mass to replace it. */
export const SPREAD_CHANGE_THRESHOLD = 2;

/** What one window says about one coordinate's spread. */
export interface WindowSpreadEstimate {
  /** Variance of the window's draws of all chains about their common mean. */
  readonly variance: number;
  /** Effective draws of the squared deviations (their autocorrelation and the chains' disagreement counted), at most the draws. */
  readonly effectiveDraws: number;
  /** Standard error of ln(variance): sd of the squared deviations / (variance sqrt(effectiveDraws)). */
  readonly logStandardError: number;
}

/**
 * The draws of all chains over one warm-up window, one column per chain and coordinate, pooled into
 * one spread estimate per coordinate ({@link WindowDraws.estimates}).
 */
export class WindowDraws {
  /** columns[j][c]: coordinate j of chain c, in iteration order. */
  private readonly columns: number[][][];

  constructor(chains: number, dimension: number) {
    this.columns = Array.from({ length: dimension }, () => Array.from({ length: chains }, () => []));
  }

  /** Iterations recorded since the last reset. */
  get count(): number {
    return this.columns[0]?.[0]?.length ?? 0;
  }

  /** Records chain `chain`'s position after an iteration. */
  add(chain: number, x: Float64Array): void {
    for (let j = 0; j < this.columns.length; j++) this.columns[j][chain].push(x[j]);
  }

  /**
   * Per coordinate: the variance v of the pooled draws about their common mean (between-chain differences
   * are part of the spread), and the standard error of ln v from the squared deviations y = (x - mean)^2,
   * whose mean v is: se(ln v) = se(v) / v = sd(y) / (v sqrt(n_eff)) (delta method), n_eff the effective sample size of y over the
   * chains (Vehtari et al. 2021, Bayesian Analysis 16, 667, eq. 10-11). For normal draws sd(y) = sqrt(2) v
   * and se(ln v) = sqrt(2 / n_eff) (common practice); heavy tails and slowly moving chains make it larger,
   * so the rule in {@link nextInverseMass} trusts such a window less.
   */
  estimates(): WindowSpreadEstimate[] {
    return this.columns.map((chains) => {
      const n = chains.reduce((total, chain) => total + chain.length, 0);
      let sum = 0;
      for (const chain of chains) for (const v of chain) sum += v;
      const mean = sum / n;
      const squares = chains.map((chain) => Float64Array.from(chain, (v) => (v - mean) * (v - mean)));
      let sumSquares = 0;
      for (const chain of squares) for (const y of chain) sumSquares += y;
      const variance = sumSquares / (n - 1);
      let spreadOfSquares = 0;
      const meanSquare = sumSquares / n;
      for (const chain of squares) for (const y of chain) spreadOfSquares += (y - meanSquare) * (y - meanSquare);
      const sdSquares = Math.sqrt(spreadOfSquares / (n - 1));
      const ess = effectiveSampleSize(squares);
      const effectiveDraws = Number.isFinite(ess) ? Math.min(n, Math.max(0, ess)) : 0;
      const logStandardError = effectiveDraws > 0 && variance > 0 ? sdSquares / (variance * Math.sqrt(effectiveDraws)) : Infinity;
      return { variance, effectiveDraws, logStandardError };
    });
  }

  /** Forgets every draw, for the next window. */
  reset(): void {
    for (const chains of this.columns) for (const chain of chains) chain.length = 0;
  }
}

/** The diagonal mass matrix being adapted, with the effective draws behind each entry. */
export interface AdaptedMass {
  /** Diagonal of M^-1, one entry per coordinate. */
  readonly inverseMass: Float64Array;
  /** Effective draws each entry rests on (0 for the starting value, such as the curvature at the mode). */
  readonly support: Float64Array;
  /** Whether the last update changed the mass enough for the step size to be searched afresh. */
  readonly restart: boolean;
}

/**
 * Smallest change of ln(inverse mass) that counts as a contradiction: a factor 2 in variance, a factor
 * 1.41 in scale. Smaller changes gain little sampling efficiency and would cost a step-size search
 * each; measured in bench/nuts-warmup-compare.ts (without it every window restarted the step size).
 */
export const LEAST_CONTRADICTION = Math.LN2;

/** Whether the window supports coordinate j's spread well enough to use it. */
function supports(estimate: WindowSpreadEstimate): boolean {
  return estimate.effectiveDraws >= MIN_SPREAD_DRAWS && estimate.variance > 0 && Number.isFinite(estimate.variance);
}

/**
 * The inverse mass after a window. A coordinate whose spread the window supports with fewer than
 * {@link MIN_SPREAD_DRAWS} effective draws keeps its value and has no say. The window contradicts the
 * current mass when some supported coordinate's |ln(v / m)| exceeds both {@link SPREAD_CHANGE_THRESHOLD}
 * standard errors of ln v and {@link LEAST_CONTRADICTION}. Then every supported coordinate takes the
 * window's variance v, with the window's effective draws as its support, and the step size is searched
 * afresh (`restart`). All together, because the starting curvature (a conditional scale at the mode) and a
 * window's spread (a marginal one) are different quantities: for correlated parameters a mixture of the two
 * is a worse mass matrix than either (measured: one seed of the damped random walk at 15 times the cost).
 * Otherwise each supported coordinate is refined to the mean of ln m and ln v weighted by their supports,
 * and the step-size adaptation runs on: a window that agrees with the mass sharpens it for free.
 */
export function nextInverseMass(current: AdaptedMass, window: readonly WindowSpreadEstimate[]): AdaptedMass {
  const d = current.inverseMass.length;
  if (window.length !== d) throw new RangeError(`warm-up: ${window.length} spread estimates for ${d} coordinates`);
  const contradicted = window.some(
    (e, j) =>
      supports(e) &&
      Math.abs(Math.log(e.variance / current.inverseMass[j])) > Math.max(LEAST_CONTRADICTION, SPREAD_CHANGE_THRESHOLD * e.logStandardError),
  );
  const inverseMass = Float64Array.from(current.inverseMass);
  const support = Float64Array.from(current.support);
  window.forEach((e, j) => {
    if (!supports(e)) return;
    if (contradicted) {
      inverseMass[j] = e.variance;
      support[j] = e.effectiveDraws;
    } else {
      const total = support[j] + e.effectiveDraws;
      inverseMass[j] = Math.exp((support[j] * Math.log(inverseMass[j]) + e.effectiveDraws * Math.log(e.variance)) / total);
      support[j] = total;
    }
  });
  return { inverseMass, support, restart: contradicted };
}
