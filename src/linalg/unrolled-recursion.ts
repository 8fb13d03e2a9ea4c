import { EXPONENTIAL_TABLE_NAMES, EXPONENTIAL_TABLES } from "./elementary-functions.js";
import { ExponentialTransition } from "./exponential-transition.js";
import { FactorizationError } from "./factorization-error.js";
import { OscillatorTransition } from "./oscillator-transition.js";
import { logDeterminantOf } from "./pivot-product.js";
import { COLUMN_SCALAR_NAMES, recursionSource, SCALAR_NAMES, SCALAR_SLOTS, type BlockKind, type PointScaling } from "./recursion-source.js";
import type { SemiseparableForm } from "./semiseparable-form.js";
import type { TransitionBlock } from "./transition-block.js";

/**
 * The likelihood recursion of `semiseparableLogLikelihood` written out for one layout of blocks, with every
 * element of S, f and u in a local variable. V8 keeps locals in registers but loads, bounds-checks and
 * stores every typed-array element, and the general loop's short inner loops over R do not unroll; for
 * R = 4 (the quasi-periodic kernel) the written-out form is about three times faster (bench/README.md).
 *
 * The source is generated once per layout (the sizes of the blocks, 1 or 2) and compiled with `Function`;
 * where the host forbids that (a browser page with a Content-Security-Policy without 'unsafe-eval'),
 * {@link unrolledRecursion} returns undefined and the general loop runs instead. The generated code
 * performs the same floating-point operations in the same order as the general loop
 * (`advance` in semiseparable-likelihood.ts with `TransitionLayout`'s block-pair congruence), so the two
 * give bit-identical results; test/linalg/unrolled-recursion.test.ts checks that on every layout.
 */
export type UnrolledAdvance = (
  blocks: readonly TransitionBlock[],
  p: Float64Array,
  q: Float64Array,
  state: Float64Array,
  scalars: Float64Array,
  time: ArrayLike<number>,
  noiseVariance: ArrayLike<number>,
  residual: ArrayLike<number>,
  mean: number,
  begin: number,
  end: number,
  tape?: Float64Array,
  scaling?: BandScaling,
) => void;

/**
 * Per-band constants a scaled recursion reads at every point k, for its band b = band[k]: the residual
 * (y_k - shift[b]) * inverse[b] and the noise variance (v_k + extra[b]) * inverse[b]^2
 * (see band-scaled-likelihood.ts).
 */
export interface BandScaling {
  readonly band: Int32Array;
  readonly inverse: Float64Array;
  readonly shift: Float64Array;
  readonly extra: Float64Array;
  /**
   * With band columns: the running Gram sums of the columns [r, x_1 ... x_B], (B + 1) x (B + 1)
   * row-major, upper triangle without [0][0] (that is the `quadratic` scalar), accumulated in place.
   */
  readonly gram?: Float64Array;
}

/** Largest state dimension written out (the code grows as R^2). */
export const MAX_UNROLLED_DIMENSION = 10;

/** Most band columns written out (the Gram sums grow as B^2; more bands take the general loop). */
export const MAX_BAND_COLUMNS = 12;

/**
 * Points per call of a per-point loop. Running the recursion in chunks lets V8 optimise the loop as an
 * ordinary, often-called function; one long loop per call is entered through on-stack replacement, and
 * code compiled that way can deoptimise on every call (measured in bench/README.md).
 */
export const RECURSION_CHUNK = 2048;

/**
 * Length of the `state` array of a recursion of dimension `r`: S (r x r), f, u and, with a constant
 * column, g; with band columns, R values and one innovation per column.
 */
export function stateLength(r: number, constantColumn: boolean, bandColumns = 0): number {
  return r * r + (constantColumn ? 3 : 2) * r + bandColumns * (r + 1);
}

/** A fresh array of running scalars (the pivot product starts at 1). */
export function initialScalars(): Float64Array {
  const scalars = new Float64Array(SCALAR_NAMES.length + COLUMN_SCALAR_NAMES.length);
  scalars[SCALAR_SLOTS.product] = 1;
  return scalars;
}

/** What a pass of the recursion sums up: r^T K^-1 r, log det K and, with a constant column, 1^T K^-1 1 and 1^T K^-1 r. */
export interface RecursionTotals {
  readonly quadratic: number;
  readonly logDeterminant: number;
  readonly columnQuadratic: number;
  readonly crossQuadratic: number;
}

/** The totals of a finished pass from its running scalars (the log-determinant from the pivot product, pivot-product.ts). */
export function recursionTotals(scalars: Float64Array): RecursionTotals {
  return {
    quadratic: scalars[SCALAR_SLOTS.quadratic],
    logDeterminant: logDeterminantOf(scalars[SCALAR_SLOTS.product], scalars[SCALAR_SLOTS.exponent]),
    columnQuadratic: scalars[SCALAR_SLOTS.columnQuadratic],
    crossQuadratic: scalars[SCALAR_SLOTS.crossQuadratic],
  };
}

/**
 * Runs a compiled recursion (from {@link unrolledRecursion}, built with the same `constantColumn`) over every
 * point, chunk by chunk; `mean` is subtracted from every value on the fly.
 */
export function runUnrolled(
  advance: UnrolledAdvance,
  form: SemiseparableForm,
  time: ArrayLike<number>,
  noiseVariance: ArrayLike<number>,
  values: ArrayLike<number>,
  mean: number,
  constantColumn = false,
  tape?: Float64Array,
): RecursionTotals {
  const n = time.length;
  const r = form.observation.length;
  const state = new Float64Array(stateLength(r, constantColumn));
  const scalars = initialScalars();
  for (let begin = 0; begin < n; begin += RECURSION_CHUNK) {
    advance(form.blocks, form.observation, form.projection, state, scalars, time, noiseVariance, values, mean, begin, Math.min(n, begin + RECURSION_CHUNK), tape);
  }
  return recursionTotals(scalars);
}

/** The written-out kind of every block, or undefined when a block has none (larger than 2 x 2). */
export function blockKindsOf(blocks: readonly TransitionBlock[]): BlockKind[] | undefined {
  const kinds = blocks.map(blockKind);
  return kinds.every((kind) => kind !== undefined) ? (kinds as BlockKind[]) : undefined;
}

function blockKind(block: TransitionBlock): BlockKind | undefined {
  if (block instanceof ExponentialTransition) return "exponential";
  if (block instanceof OscillatorTransition) return "oscillator";
  if (block.size === 1) return "called1";
  if (block.size === 2) return "called2";
  return undefined;
}

/**
 * A compiled recursion for these blocks, or undefined when the layout is not supported (a block larger
 * than 2 x 2, R above {@link MAX_UNROLLED_DIMENSION}) or code cannot be compiled here.
 * With `scaling: "bands"`, the residuals and noise variances are scaled per band inside the loop
 * ({@link BandScaling}, passed as the last argument).
 * `state` holds S (R x R, row-major), then f, then u (R each) between calls; `scalars` the five running
 * scalars in the order previousInverse, previousZ, quadratic, exponent, product (see pivot-product.ts).
 *
 * With `constantColumn`, the forward substitution also runs on a column of ones (state g after u in
 * `state`, R more values), and three more scalars follow: the previous w, sum w^2 / D = 1^T K^-1 1 and
 * sum z w / D = 1^T K^-1 r, which integrate a constant mean out (see semiseparableMeanMarginal).
 */
export function unrolledRecursion(
  blocks: readonly TransitionBlock[],
  options: { readonly constantColumn?: boolean; readonly record?: boolean; readonly scaling?: PointScaling; readonly bandColumns?: number } = {},
): UnrolledAdvance | undefined {
  const kinds = blockKindsOf(blocks);
  if (!kinds) return undefined;
  const withColumn = options.constantColumn === true;
  const record = options.record === true;
  const scaling = options.scaling ?? "none";
  const bandColumns = scaling === "bands" ? (options.bandColumns ?? 0) : 0;
  if (bandColumns > MAX_BAND_COLUMNS) return undefined;
  const key = kinds.join(",") + (withColumn ? "+ones" : "") + (record ? "+tape" : "") + (scaling === "none" ? "" : `+${scaling}${bandColumns}`);
  if (compiled.has(key)) return compiled.get(key);
  let advance: UnrolledAdvance | undefined;
  const dimension = blocks.reduce((r, b) => r + b.size, 0);
  if (dimension <= MAX_UNROLLED_DIMENSION) {
    try {
      const { body, constants } = recursionSource(kinds, withColumn, record, scaling, bandColumns);
      // The tables arrive as one object and are unpacked into the closure's locals (no spread call).
      const factory = new Function(
        "FactorizationError",
        "constants",
        "tables",
        `const { ${EXPONENTIAL_TABLE_NAMES.join(", ")} } = tables;\nreturn function advance(${PARAMETERS}) {\n${body}\n};`,
      );
      advance = factory(FactorizationError, constants, EXPONENTIAL_TABLES) as UnrolledAdvance;
      primeFeedback(advance, blocks, dimension, withColumn, record, scaling !== "none", bandColumns);
    } catch {
      advance = undefined; // no run-time compilation on this host
    }
  }
  compiled.set(key, advance);
  return advance;
}

/** Empty calls made right after compiling a recursion (see {@link primeFeedback}). */
const PRIMING_CALLS = 32;

/**
 * Calls a freshly compiled recursion a few dozen times on no points, so that V8 has allocated its feedback
 * vector and recorded the types at the code around the loop before the loop first gets hot.
 *
 * Why: V8 allocates a function's feedback only after several calls. A recursion first called on a long
 * light curve gets hot inside that first call; it was then optimised without feedback for its prologue,
 * deoptimised at once ("insufficient type feedback"), and, in about one run in four, V8 kept entering the
 * loop through on-stack-replacement code, which holds the loop's doubles as heap numbers: an allocation per
 * point and twice the time (measured with --trace-opt/--trace-gc on the engine benchmark's light curves:
 * 1 scavenge against about 1100 per 2e7 points, 43 against 92 ns per point for R = 1).
 */
function primeFeedback(
  advance: UnrolledAdvance,
  blocks: readonly TransitionBlock[],
  r: number,
  withColumn: boolean,
  record: boolean,
  scaled: boolean,
  bandColumns: number,
): void {
  const ones = new Float64Array(r).fill(1);
  const state = new Float64Array(stateLength(r, withColumn, bandColumns));
  const scalars = initialScalars();
  const none = new Float64Array(0);
  const single = Float64Array.of(0);
  const tape = record ? none : undefined;
  const perBand = new Float64Array(Math.max(1, bandColumns)).fill(1);
  // Built as the callers build theirs (MultiBandProcess's order; bandMeanSums adds the Gram sums), so the
  // feedback sees the maps the real calls pass.
  const base: BandScaling = { band: Int32Array.of(0), inverse: perBand, shift: perBand, extra: perBand };
  const scaling = !scaled ? undefined : bandColumns > 0 ? { ...base, gram: new Float64Array((bandColumns + 1) ** 2) } : base;
  for (let call = 0; call < PRIMING_CALLS; call++) {
    // Every other call starts a second chunk (begin = end = 1, still no point): the code that carries the
    // previous chunk's last time gets its feedback too, or the first light curve longer than a chunk
    // deoptimises the recursion there and V8 re-enters it through on-stack replacement (measured: the
    // joint likelihood at 100 instead of 30 ns per point from N = 3600 on, bench/README.md). A recording
    // pass keeps to empty first chunks (its tape would need a row).
    const second = !record && call % 2 === 1 ? 1 : 0;
    const data = second ? single : none;
    advance(blocks, ones, ones, state, scalars, data, data, data, 0.5, second, second, tape, scaling);
  }
}

/** Compiled recursions by layout (a cache of pure functions of the layout: same input, same code). */
const compiled = new Map<string, UnrolledAdvance | undefined>();

const PARAMETERS = "blocks, p, q, state, scalars, time, noiseVariance, residual, mean, begin, end, tape, scaling";
