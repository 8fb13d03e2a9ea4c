/** What a warm-up iteration should do. */
export interface WarmupPlan {
  /** Iterations at whose end the mass matrix is re-estimated from the window just finished. */
  readonly windowEnds: readonly number[];
  /** The first iteration of each mass-matrix window (same length as `windowEnds`). */
  readonly windowStarts: readonly number[];
}

/**
 * Windowed warm-up for NUTS (common practice in Hamiltonian Monte Carlo software): a first stretch of
 * 75 iterations adapts only the step size, then windows of 25, 50, 100, ... iterations each end with
 * a new diagonal mass matrix, the last one stretched to the start of a final 50 iterations of step-size
 * adaptation. With fewer than 150 warm-up iterations the stretches are 15%, 75% and 10%; below 20 no
 * mass-matrix window is used.
 */
export function planWarmup(warmup: number): WarmupPlan {
  if (warmup < 20) return { windowStarts: [], windowEnds: [] };
  let initial = 75;
  let terminal = 50;
  let base = 25;
  if (warmup < initial + terminal + base) {
    initial = Math.floor(0.15 * warmup);
    terminal = Math.floor(0.1 * warmup);
    base = warmup - initial - terminal;
  }
  const starts: number[] = [];
  const ends: number[] = [];
  const lastEnd = warmup - terminal;
  let start = initial;
  let size = base;
  while (start < lastEnd) {
    let end = start + size;
    // Stretch this window to the end when the next, doubled one would not fit.
    if (end + 2 * size > lastEnd) end = lastEnd;
    starts.push(start);
    ends.push(end);
    start = end;
    size *= 2;
  }
  return { windowStarts: starts, windowEnds: ends };
}

/**
 * Running mean and variance of vectors by Welford's update (Welford 1962, Technometrics 4, 419),
 * for the diagonal mass matrix.
 */
export class RunningVariance {
  private n = 0;
  private readonly mean: Float64Array;
  private readonly m2: Float64Array;

  constructor(dimension: number) {
    this.mean = new Float64Array(dimension);
    this.m2 = new Float64Array(dimension);
  }

  /** Vectors added since the last reset. */
  get count(): number {
    return this.n;
  }

  /** Adds one vector (for example a chain's position after an iteration). */
  add(x: Float64Array): void {
    this.n++;
    for (let i = 0; i < x.length; i++) {
      const delta = x[i]! - this.mean[i]!;
      this.mean[i] = this.mean[i]! + delta / this.n;
      this.m2[i] = this.m2[i]! + delta * (x[i]! - this.mean[i]!);
    }
  }

  /**
   * Sample variances (divisor n - 1) shrunk towards `target`: (n / (n + 5)) var + (5 / (n + 5)) target,
   * which keeps a short window from producing a near-singular mass matrix. Common practice shrinks
   * towards the constant 1e-3, which presumes parameters of order one; shrinking towards the previous
   * mass matrix (or a Laplace approximation) keeps the regularisation on each parameter's own scale.
   */
  regularizedVariance(target: Float64Array): Float64Array {
    const n = this.n;
    return Float64Array.from(this.m2, (m2, i) => (n / (n + 5)) * (m2 / (n - 1)) + (5 / (n + 5)) * target[i]!);
  }

  /** Forgets every vector added, for the next adaptation window. */
  reset(): void {
    this.n = 0;
    this.mean.fill(0);
    this.m2.fill(0);
  }
}
