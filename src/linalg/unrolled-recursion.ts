import { cosineAndSineSource, decayFactorSource, EXPONENTIAL_TABLE_NAMES, EXPONENTIAL_TABLES } from "./elementary-functions.js";
import { ExponentialTransition } from "./exponential-transition.js";
import { FactorizationError } from "./factorization-error.js";
import { constantPool } from "./generated-constants.js";
import { hyperbolicSeriesSource, OscillatorTransition } from "./oscillator-transition.js";
import { absorbPivotSource, logDeterminantOf } from "./pivot-product.js";
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
) => void;

/** Largest state dimension written out (the code grows as R^2). */
export const MAX_UNROLLED_DIMENSION = 10;

/**
 * Points per call of a per-point loop. Running the recursion in chunks lets V8 optimise the loop as an
 * ordinary, often-called function; one long loop per call is entered through on-stack replacement, and
 * code compiled that way can deoptimise on every call (measured in bench/README.md).
 */
export const RECURSION_CHUNK = 2048;

/**
 * Slots of the running scalars carried from chunk to chunk, for the written-out code and the general loop
 * of semiseparable-likelihood.ts alike (the last three only with a constant column).
 */
export const SLOT = {
  previousInverse: 0,
  previousZ: 1,
  quadratic: 2,
  exponent: 3,
  product: 4,
  previousW: 5,
  columnQuadratic: 6,
  crossQuadratic: 7,
} as const;
const SCALAR_NAMES = ["previousInverse", "previousZ", "quadratic", "exponent", "product"] as const;
const COLUMN_SCALAR_NAMES = ["previousW", "columnQuadratic", "crossQuadratic"] as const;

/** Length of the `state` array of a recursion of dimension `r`: S (r x r), f, u and, with a constant column, g. */
function stateLength(r: number, constantColumn: boolean): number {
  return r * r + (constantColumn ? 3 : 2) * r;
}

/** A fresh array of running scalars (the pivot product starts at 1). */
export function initialScalars(): Float64Array {
  const scalars = new Float64Array(SCALAR_NAMES.length + COLUMN_SCALAR_NAMES.length);
  scalars[SLOT.product] = 1;
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
    quadratic: scalars[SLOT.quadratic],
    logDeterminant: logDeterminantOf(scalars[SLOT.product], scalars[SLOT.exponent]),
    columnQuadratic: scalars[SLOT.columnQuadratic],
    crossQuadratic: scalars[SLOT.crossQuadratic],
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
): RecursionTotals {
  const n = time.length;
  const r = form.observation.length;
  const state = new Float64Array(stateLength(r, constantColumn));
  const scalars = initialScalars();
  for (let begin = 0; begin < n; begin += RECURSION_CHUNK) {
    advance(form.blocks, form.observation, form.projection, state, scalars, time, noiseVariance, values, mean, begin, Math.min(n, begin + RECURSION_CHUNK));
  }
  return recursionTotals(scalars);
}

/**
 * How a block enters the written-out code: exponential and oscillator blocks have their transitions
 * inlined (the same formulas as their `transition` methods); any other block of size 1 or 2 is called
 * through `transition`.
 */
type BlockKind = "exponential" | "oscillator" | "generic1" | "generic2";

function blockKind(block: TransitionBlock): BlockKind | undefined {
  if (block instanceof ExponentialTransition) return "exponential";
  if (block instanceof OscillatorTransition) return "oscillator";
  if (block.size === 1) return "generic1";
  if (block.size === 2) return "generic2";
  return undefined;
}

const SIZE: Record<BlockKind, number> = { exponential: 1, oscillator: 2, generic1: 1, generic2: 2 };

/**
 * A compiled recursion for these blocks, or undefined when the layout is not supported (a block larger
 * than 2 x 2, R above {@link MAX_UNROLLED_DIMENSION}) or code cannot be compiled here.
 * `state` holds S (R x R, row-major), then f, then u (R each) between calls; `scalars` the five running
 * scalars in the order previousInverse, previousZ, quadratic, exponent, product (see pivot-product.ts).
 *
 * With `constantColumn`, the forward substitution also runs on a column of ones (state g after u in
 * `state`, R more values), and three more scalars follow: the previous w, sum w^2 / D = 1^T K^-1 1 and
 * sum z w / D = 1^T K^-1 r, which integrate a constant mean out (see semiseparableMeanMarginal).
 */
export function unrolledRecursion(
  blocks: readonly TransitionBlock[],
  options: { readonly constantColumn?: boolean } = {},
): UnrolledAdvance | undefined {
  const kinds = blocks.map(blockKind);
  if (kinds.some((k) => k === undefined)) return undefined;
  const withColumn = options.constantColumn === true;
  const key = kinds.join(",") + (withColumn ? "+ones" : "");
  if (compiled.has(key)) return compiled.get(key);
  let advance: UnrolledAdvance | undefined;
  const dimension = blocks.reduce((r, b) => r + b.size, 0);
  if (dimension <= MAX_UNROLLED_DIMENSION) {
    try {
      const { body, constants } = recursionSource(kinds as BlockKind[], withColumn);
      // The tables arrive as one object and are unpacked into the closure's locals (no spread call).
      const factory = new Function(
        "FactorizationError",
        "constants",
        "tables",
        `const { ${EXPONENTIAL_TABLE_NAMES.join(", ")} } = tables;\nreturn function advance(${PARAMETERS}) {\n${body}\n};`,
      );
      advance = factory(FactorizationError, constants, EXPONENTIAL_TABLES) as UnrolledAdvance;
      primeFeedback(advance, blocks, dimension, withColumn);
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
function primeFeedback(advance: UnrolledAdvance, blocks: readonly TransitionBlock[], r: number, withColumn: boolean): void {
  const ones = new Float64Array(r).fill(1);
  const state = new Float64Array(stateLength(r, withColumn));
  const scalars = initialScalars();
  const none = new Float64Array(0);
  for (let call = 0; call < PRIMING_CALLS; call++) advance(blocks, ones, ones, state, scalars, none, none, none, 0.5, 0, 0);
}

/** Compiled recursions by layout (a cache of pure functions of the layout: same input, same code). */
const compiled = new Map<string, UnrolledAdvance | undefined>();

const PARAMETERS = "blocks, p, q, state, scalars, time, noiseVariance, residual, mean, begin, end";

/**
 * The body of the generated function (see {@link unrolledRecursion}) and the values of the numeric constants
 * it reads from its `constants` array (generated-constants.ts).
 */
export function recursionSource(kinds: readonly BlockKind[], withColumn = false): { body: string; constants: Float64Array } {
  const pool = constantPool("K");
  const constant = pool.write;
  const blockSizes = kinds.map((kind) => SIZE[kind]);
  const starts: number[] = [];
  let r = 0;
  for (const m of blockSizes) {
    starts.push(r);
    r += m;
  }
  const range = (n: number): number[] => Array.from({ length: n }, (_, i) => i);
  const s = (i: number, j: number): string => `s${i}_${j}`;
  const lines: string[] = [];
  const emit = (line: string): void => {
    lines.push(line);
  };

  // Constants and state.
  emit(`"use strict";`);
  // Numbers that arrive as JavaScript values (object fields, arguments) are multiplied by 1 here, once: that
  // makes them doubles in registers, where a use inside the loop would check and unbox them at every point.
  kinds.forEach((kind, b) => {
    emit(`const block${b} = blocks[${b}];`);
    if (kind === "exponential") emit(`const rate${b} = block${b}.rate * 1;`);
    if (kind === "oscillator") {
      emit(`const c${b} = block${b}.halfWidth * 1; const lambda${b} = block${b}.lambda * 1; const w${b} = block${b}.w0 * 1;`);
      // dampedHyperbolicValues' per-block constants: the frequency (lambda < 0) or the two real rates (lambda > 0).
      emit(`const omega${b} = lambda${b} < 0 ? Math.sqrt(-lambda${b}) : 0; const root${b} = lambda${b} > 0 ? Math.sqrt(lambda${b}) : 0;`);
      emit(`const fastRate${b} = c${b} + root${b}; const slowRate${b} = (w${b} * w${b}) / fastRate${b};`);
    }
  });
  emit(`const meanValue = mean * 1; const first = begin | 0; const last = end | 0;`);
  // A guard for callers: the arrays must cover the range.
  emit(`if (time.length < last || noiseVariance.length < last || residual.length < last) throw new RangeError("advance: arrays shorter than the range");`);
  // Scratch for the transitions that are called rather than written out.
  if (kinds.some((kind) => kind === "generic1" || kind === "generic2")) emit(`const phi = new Float64Array(${blockSizes.reduce((a, m) => a + m * m, 0)});`);
  for (const i of range(r)) emit(`const p${i} = p[${i}]; const q${i} = q[${i}];`);
  emit(`let variance = 0; ${range(r).map((i) => `variance += p${i} * q${i};`).join(" ")}`);
  for (const i of range(r)) for (const j of range(r)) emit(`let ${s(i, j)} = state[${i * r + j}];`);
  for (const i of range(r)) emit(`let f${i} = state[${r * r + i}]; let u${i} = state[${r * r + r + i}];`);
  SCALAR_NAMES.forEach((name) => emit(`let ${name} = scalars[${SLOT[name]}];`));
  if (withColumn) {
    for (const i of range(r)) emit(`let g${i} = state[${r * r + 2 * r + i}];`);
    COLUMN_SCALAR_NAMES.forEach((name) => emit(`let ${name} = scalars[${SLOT[name]}];`));
  }

  emit(`let failedAt = -1; let failedPivot = 0;`);
  // The pooled constants are declared here, before the loop, once the loop has been written.
  const constantsAt = lines.length;
  // The previous time is carried in a local: one array load per point instead of two.
  emit(`let previousTime = first > 0 ? time[first - 1] : 0;`);
  emit(`for (let k = first; k < last; k++) {`);
  emit(`const tk = time[k];`);
  emit(`if (k > 0) {`);
  // S <- S + u u^T / D ; f <- f + u z / D (row by row, as the general loop)
  for (const i of range(r)) {
    emit(`{ const ui = u${i} * previousInverse;`);
    for (const j of range(r)) emit(`${s(i, j)} += ui * u${j};`);
    emit(`f${i} += ui * previousZ;${withColumn ? ` g${i} += ui * previousW;` : ""} }`);
  }
  emit(`const dt = tk - previousTime;`);
  let phiOffset = 0;
  const phiNames: string[][] = [];
  kinds.forEach((kind, b) => {
    const m = blockSizes[b]!;
    const names = range(m * m).map((e) => `a${b}_${e}`);
    if (kind === "exponential") {
      // ExponentialTransition.transition, with decayFactor written out (no call: see decayFactorSource).
      emit(`let ${names[0]}; ${decayFactorSource(names[0]!, `-rate${b} * dt`, constant)}`);
    } else if (kind === "oscillator") {
      // OscillatorTransition.transition: dampedHyperbolicValues written out, all three branches (a call left
      // for any of them made V8 box its double arguments at every step).
      emit(`let ec${b}; let es${b}; const x${b} = lambda${b} * dt * dt;`);
      const series = hyperbolicSeriesSource(`x${b}`, constant);
      emit(`if (x${b} > -1 && x${b} < 1) { let e; ${decayFactorSource("e", `-c${b} * dt`, constant)}`);
      emit(`ec${b} = e * ${series.cosh}; es${b} = e * (dt * ${series.sinh}); }`);
      emit(`else if (lambda${b} < 0) { let e; ${decayFactorSource("e", `-c${b} * dt`, constant)}`);
      emit(`let co; let si; ${cosineAndSineSource("co", "si", `omega${b} * dt`, constant)}`);
      emit(`ec${b} = e * co; es${b} = e * (si / omega${b}); }`);
      emit(`else { let slow; ${decayFactorSource("slow", `-slowRate${b} * dt`, constant)}`);
      emit(`let fast; ${decayFactorSource("fast", `-fastRate${b} * dt`, constant)}`);
      emit(`ec${b} = 0.5 * (slow + fast); es${b} = (slow - fast) / (2 * root${b}); }`);
      emit(`const ${names[0]} = ec${b} + es${b} * c${b}; const ${names[1]} = es${b} * w${b};`);
      emit(`const ${names[2]} = -es${b} * w${b}; const ${names[3]} = ec${b} - es${b} * c${b};`);
    } else {
      emit(`block${b}.transition(dt, phi, ${phiOffset});`);
      names.forEach((name, e) => emit(`const ${name} = phi[${phiOffset + e}];`));
    }
    phiNames.push(names);
    phiOffset += m * m;
  });
  // S <- Phi S Phi^T block pair by block pair (TransitionLayout.smallBlockCongruence, not transposed).
  blockSizes.forEach((ma, a) => {
    const ia = starts[a]!;
    const A = phiNames[a]!;
    blockSizes.forEach((mb, b) => {
      const jb = starts[b]!;
      const B = phiNames[b]!;
      if (ma === 1 && mb === 1) {
        emit(`${s(ia, jb)} = ${B[0]} * (${A[0]} * ${s(ia, jb)});`);
      } else if (ma === 1) {
        emit(`{ const y0 = ${A[0]} * ${s(ia, jb)}; const y1 = ${A[0]} * ${s(ia, jb + 1)};`);
        emit(`${s(ia, jb)} = ${B[0]} * y0 + ${B[1]} * y1; ${s(ia, jb + 1)} = ${B[2]} * y0 + ${B[3]} * y1; }`);
      } else if (mb === 1) {
        emit(`{ const x0 = ${s(ia, jb)}; const x1 = ${s(ia + 1, jb)};`);
        emit(`${s(ia, jb)} = ${B[0]} * (${A[0]} * x0 + ${A[1]} * x1); ${s(ia + 1, jb)} = ${B[0]} * (${A[2]} * x0 + ${A[3]} * x1); }`);
      } else {
        emit(`{ const x00 = ${s(ia, jb)}; const x01 = ${s(ia, jb + 1)}; const x10 = ${s(ia + 1, jb)}; const x11 = ${s(ia + 1, jb + 1)};`);
        emit(`const y00 = ${A[0]} * x00 + ${A[1]} * x10; const y01 = ${A[0]} * x01 + ${A[1]} * x11;`);
        emit(`const y10 = ${A[2]} * x00 + ${A[3]} * x10; const y11 = ${A[2]} * x01 + ${A[3]} * x11;`);
        emit(`${s(ia, jb)} = ${B[0]} * y00 + ${B[1]} * y01; ${s(ia, jb + 1)} = ${B[2]} * y00 + ${B[3]} * y01;`);
        emit(`${s(ia + 1, jb)} = ${B[0]} * y10 + ${B[1]} * y11; ${s(ia + 1, jb + 1)} = ${B[2]} * y10 + ${B[3]} * y11; }`);
      }
    });
  });
  // f <- Phi f (TransitionLayout.applyToVector).
  blockSizes.forEach((m, b) => {
    const i = starts[b]!;
    const A = phiNames[b]!;
    for (const v of withColumn ? ["f", "g"] : ["f"]) {
      if (m === 1) emit(`${v}${i} *= ${A[0]};`);
      else emit(`{ const x0 = ${v}${i}; const x1 = ${v}${i + 1}; ${v}${i} = ${A[0]} * x0 + ${A[1]} * x1; ${v}${i + 1} = ${A[2]} * x0 + ${A[3]} * x1; }`);
    }
  });
  emit(`}`);
  // u = q - S p, D = d + variance - p^T S p, z = r - p^T f.
  // Sums start from their first term (projectState): no 0 + on the critical path.
  for (const i of range(r)) {
    emit(`const sp${i} = ${range(r).map((j) => `${s(i, j)} * p${j}`).join(" + ")}; u${i} = q${i} - sp${i};`);
  }
  emit(`const pSp = ${range(r).map((i) => `p${i} * sp${i}`).join(" + ")};`);
  emit(`const pf = ${range(r).map((i) => `p${i} * f${i}`).join(" + ")};`);
  if (withColumn) emit(`const pg = ${range(r).map((i) => `p${i} * g${i}`).join(" + ")};`);
  emit(`const pivot = noiseVariance[k] + variance - pSp;`);
  emit(`if (!(pivot > 0 && pivot < Infinity)) { failedAt = k; failedPivot = pivot; break; }`);
  emit(`const z = (residual[k] - meanValue) - pf;`);
  emit(`previousInverse = 1 / pivot; previousZ = z; quadratic += z * z * previousInverse;`);
  if (withColumn) {
    emit(`const w = 1 - pg; columnQuadratic += w * w * previousInverse; crossQuadratic += z * w * previousInverse; previousW = w;`);
  }
  emit(absorbPivotSource("pivot", constant));
  emit(`previousTime = tk;`);
  emit(`}`);

  for (const i of range(r)) for (const j of range(r)) emit(`state[${i * r + j}] = ${s(i, j)};`);
  for (const i of range(r)) emit(`state[${r * r + i}] = f${i}; state[${r * r + r + i}] = u${i};`);
  SCALAR_NAMES.forEach((name) => emit(`scalars[${SLOT[name]}] = ${name};`));
  if (withColumn) {
    for (const i of range(r)) emit(`state[${r * r + 2 * r + i}] = g${i};`);
    COLUMN_SCALAR_NAMES.forEach((name) => emit(`scalars[${SLOT[name]}] = ${name};`));
  }
  emit(`if (failedAt >= 0) throw new FactorizationError(failedAt, failedPivot);`);
  lines.splice(constantsAt, 0, pool.declarations("constants"));
  return { body: lines.join("\n"), constants: Float64Array.from(pool.values) };
}
