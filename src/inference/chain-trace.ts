import type { ParameterSpace } from "./parameter-space.js";

/** Most steps a trace keeps per series; it keeps between half this and this many, evenly spaced. */
export const MAX_TRACE_STEPS = 500;
/** Chains (or walkers) traced one by one; with more, the median over all of them is traced besides. */
export const MAX_TRACED_CHAINS = 4;

/** One traced series: a chain, or the median over every chain at each step. */
export interface TraceSeries {
  /** "chain 2", "walker 12", "median of 24 walkers". */
  readonly label: string;
  /** The chain or walker (0-based), or null for the median over all of them. */
  readonly chain: number | null;
  /** `values[name][k]`: the parameter at step k, in physical units. */
  readonly values: Readonly<Record<string, readonly number[]>>;
  /** ln p of the sampled (unconstrained) density at step k, up to a constant; the median for the median series. */
  readonly logPosterior: readonly number[];
}

/**
 * A bounded trace of a whole sampler run, warm-up included: a few chains (and, for a large ensemble, the
 * median over its walkers) at evenly spaced iterations from the start to the end, so that a drift, a
 * stuck chain or a slow burn-in shows, which the kept draws alone (after warm-up, thinned) hide.
 */
export interface ChainTrace {
  readonly sampler: "nuts" | "ensemble";
  /** Chains or walkers of the run. */
  readonly chains: number;
  /** Iterations of the run, warm-up included. */
  readonly iterations: number;
  /** Iterations not used for the summaries: NUTS warm-up (adaptation), or the ensemble's discarded burn-in. */
  readonly warmup: number;
  /** The iteration of each step (0 is the starting point), ascending and evenly spaced. */
  readonly steps: readonly number[];
  /** The free parameters traced, in the order of the space. */
  readonly names: readonly string[];
  readonly series: readonly TraceSeries[];
}

/** The chains traced one by one: all of them up to `limit`, else `limit` spread evenly. */
function tracedChains(chainCount: number, limit: number): number[] {
  if (chainCount <= limit) return Array.from({ length: chainCount }, (_, c) => c);
  return Array.from({ length: limit }, (_, k) => Math.floor((k * chainCount) / limit));
}

/** The median of `values` (sorted in place). */
function medianInPlace(values: Float64Array): number {
  values.sort();
  const n = values.length;
  return n % 2 === 1 ? values[(n - 1) / 2] : 0.5 * (values[n / 2 - 1] + values[n / 2]);
}

/**
 * Records a bounded trace while a sampler runs. Iterations that are multiples of a stride are recorded;
 * when `capacity` steps are held, every second one is dropped and the stride doubles, so at any time the
 * trace holds between capacity / 2 and capacity evenly spaced steps from iteration 0, whatever the length
 * of the run, and recording costs O(1) per iteration amortised (plus a median over the chains at recorded
 * steps when there are more chains than traced).
 *
 * @example
 * const trace = new ChainTraceRecorder(walkers, d);
 * if (trace.wants(i)) trace.record(i, sampler.current());
 */
export class ChainTraceRecorder {
  private readonly traced: number[];
  private readonly withMedian: boolean;
  /** Per series, `capacity` rows of d coordinates and ln p. */
  private readonly rows: Float64Array[];
  private readonly steps: Int32Array;
  private readonly scratch: Float64Array;
  private count = 0;
  private stride = 1;

  constructor(
    readonly chainCount: number,
    readonly dimension: number,
    readonly capacity = MAX_TRACE_STEPS,
    tracedLimit = MAX_TRACED_CHAINS,
  ) {
    if (!(capacity >= 2)) throw new RangeError(`chain trace: capacity must be at least 2, got ${capacity}`);
    this.traced = tracedChains(chainCount, tracedLimit);
    this.withMedian = chainCount > this.traced.length;
    const seriesCount = this.traced.length + (this.withMedian ? 1 : 0);
    this.rows = Array.from({ length: seriesCount }, () => new Float64Array(capacity * (dimension + 1)));
    this.steps = new Int32Array(capacity);
    this.scratch = new Float64Array(chainCount);
  }

  /** Whether iteration `iteration` is one to record. */
  wants(iteration: number): boolean {
    return iteration % this.stride === 0 && (this.count === 0 || iteration > this.steps[this.count - 1]);
  }

  /** Records the state after `iteration` iterations (0: the starting points); call only when {@link wants} says so. */
  record(iteration: number, state: { readonly positions: readonly Float64Array[]; readonly logPosterior: ArrayLike<number> }): void {
    if (this.count === this.capacity) this.halve();
    if (iteration % this.stride !== 0) return;
    const d = this.dimension;
    const width = d + 1;
    const at = this.count * width;
    this.traced.forEach((c, s) => {
      this.rows[s].set(state.positions[c], at);
      this.rows[s][at + d] = state.logPosterior[c];
    });
    if (this.withMedian) {
      const median = this.rows[this.traced.length];
      for (let i = 0; i <= d; i++) {
        for (let c = 0; c < this.chainCount; c++) this.scratch[c] = i < d ? state.positions[c][i] : state.logPosterior[c];
        median[at + i] = medianInPlace(this.scratch);
      }
    }
    this.steps[this.count] = iteration;
    this.count++;
  }

  /** Keeps every second step (those at multiples of twice the stride) and doubles the stride. */
  private halve(): void {
    const width = this.dimension + 1;
    let kept = 0;
    for (let k = 0; k < this.count; k += 2, kept++) {
      this.steps[kept] = this.steps[k];
      for (const block of this.rows) block.copyWithin(kept * width, k * width, (k + 1) * width);
    }
    this.count = kept;
    this.stride *= 2;
  }

  /**
   * The trace in physical units (free parameters of `space`, whose unconstrained coordinates the sampler
   * moved in), with the run's totals.
   */
  finish(space: ParameterSpace, run: { readonly sampler: "nuts" | "ensemble"; readonly iterations: number; readonly warmup: number }): ChainTrace {
    const d = this.dimension;
    const width = d + 1;
    const names = space.free.map((p) => p.name);
    const physical = new Float64Array(space.names.length);
    const unit = run.sampler === "nuts" ? "chain" : "walker";
    const labels = [
      ...this.traced.map((c) => `${unit} ${c + 1}`),
      ...(this.withMedian ? [`median of ${this.chainCount} ${unit}s`] : []),
    ];
    const series = this.rows.map((block, s): TraceSeries => {
      const values: Record<string, number[]> = Object.fromEntries(names.map((name) => [name, new Array<number>(this.count)]));
      const logPosterior = new Array<number>(this.count);
      for (let k = 0; k < this.count; k++) {
        space.toPhysical(block.subarray(k * width, k * width + d), physical);
        space.free.forEach((p) => (values[p.name][k] = physical[p.index]));
        logPosterior[k] = block[k * width + d];
      }
      return { label: labels[s], chain: s < this.traced.length ? this.traced[s] : null, values, logPosterior };
    });
    return {
      sampler: run.sampler,
      chains: this.chainCount,
      iterations: run.iterations,
      warmup: run.warmup,
      steps: Array.from(this.steps.subarray(0, this.count)),
      names,
      series,
    };
  }
}
