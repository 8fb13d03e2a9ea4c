import { cosineAndSineSource, decayFactorSource } from "./elementary-functions.js";
import { constantPool, type ConstantWriter } from "./generated-constants.js";
import { GradientTapeLayout } from "./gradient-tape.js";
import { hyperbolicSeriesSource, oscillatorLambdaDerivativeSource } from "./oscillator-transition.js";
import { absorbPivotSource } from "./pivot-product.js";
import type { AdjointKind } from "./transition-adjoints.js";

/**
 * How a block enters the written-out code: exponential and oscillator blocks have their transitions
 * inlined (the same formulas as their `transition` methods); any other block of size 1 or 2 is called
 * through `transition` ("called1", "called2").
 */
export type BlockKind = "exponential" | "oscillator" | "called1" | "called2";

export const BLOCK_SIZE: Record<BlockKind, number> = { exponential: 1, oscillator: 2, called1: 1, called2: 2 };

/** The gradient's name for a kind (transition-adjoints.ts): called blocks are "generic" there. */
export function adjointKindOf(kind: BlockKind): AdjointKind {
  return kind === "exponential" || kind === "oscillator" ? kind : "generic";
}

/**
 * Slots of the running scalars carried from chunk to chunk, for the written-out code and the general loop
 * of semiseparable-likelihood.ts alike (the last three only with a constant column).
 */
export const SCALAR_SLOTS = {
  previousInverse: 0,
  previousZ: 1,
  quadratic: 2,
  exponent: 3,
  product: 4,
  previousW: 5,
  columnQuadratic: 6,
  crossQuadratic: 7,
} as const;
export const SCALAR_NAMES = ["previousInverse", "previousZ", "quadratic", "exponent", "product"] as const;
export const COLUMN_SCALAR_NAMES = ["previousW", "columnQuadratic", "crossQuadratic"] as const;

/**
 * Per-point scaling read inside the loop (band-scaled-likelihood.ts): "none", or "bands": the residual
 * (y_k - shift_b) inverse_b and the noise variance (v_k + extra_b) inverse_b^2 for the band b = band[k].
 */
export type PointScaling = "none" | "bands";

/** What the source of one recursion is written for. */
interface Writer {
  readonly kinds: readonly BlockKind[];
  readonly sizes: readonly number[];
  readonly starts: readonly number[];
  readonly r: number;
  readonly withColumn: boolean;
  readonly scaling: PointScaling;
  /** With "bands": how many band columns x_c = [band = c] / a_c the forward substitution also carries (0: none). */
  readonly bandColumns: number;
  /** The gradient's tape layout, when the pass records one. */
  readonly tape: GradientTapeLayout | undefined;
  readonly constant: ConstantWriter;
  readonly emit: (line: string) => void;
}

const range = (n: number): number[] => Array.from({ length: n }, (_, i) => i);
const s = (i: number, j: number): string => `s${i}_${j}`;

/**
 * The body of the generated forward recursion (see unrolledRecursion in unrolled-recursion.ts) and the
 * values of the numeric constants it reads from its `constants` array (generated-constants.ts). Per point:
 * absorb the previous point (S += u u^T / D, f += u z / D), the blocks' transitions, S <- Phi S Phi^T and
 * f <- Phi f, then the projection onto p, the pivot and the sums. With `record`, the gradient's tape is
 * written as well (gradient-tape.ts).
 */
export function recursionSource(
  kinds: readonly BlockKind[],
  withColumn = false,
  record = false,
  scaling: PointScaling = "none",
  bandColumns = 0,
): { body: string; constants: Float64Array } {
  const pool = constantPool("K");
  const sizes = kinds.map((kind) => BLOCK_SIZE[kind]);
  const starts: number[] = [];
  let r = 0;
  for (const m of sizes) {
    starts.push(r);
    r += m;
  }
  const lines: string[] = [];
  const tape = record ? new GradientTapeLayout(kinds.map(adjointKindOf), sizes, false) : undefined;
  const writer: Writer = { kinds, sizes, starts, r, withColumn, scaling, bandColumns, tape, constant: pool.write, emit: (line) => void lines.push(line) };

  emitPrologue(writer);
  // The pooled constants are declared here, before the loop, once the loop has been written.
  const constantsAt = lines.length;
  writer.emit(`let previousTime = first > 0 ? time[first - 1] : 0;`); // one array load per point instead of two
  writer.emit(`for (let k = first; k < last; k++) {`);
  writer.emit(`const tk = time[k];`);
  if (tape) writer.emit(`const tb = k * ${tape.width};`);
  writer.emit(`if (k > 0) {`);
  emitAbsorb(writer);
  if (tape) emitRecordBefore(writer, tape);
  writer.emit(`const dt = tk - previousTime;`);
  const phiNames = emitTransitions(writer);
  emitCongruence(writer, phiNames);
  emitVectorTransition(writer, phiNames);
  writer.emit(`}`);
  emitProjection(writer);
  writer.emit(`previousTime = tk;`);
  writer.emit(`}`);
  emitEpilogue(writer);
  lines.splice(constantsAt, 0, pool.declarations("constants"));
  return { body: lines.join("\n"), constants: Float64Array.from(pool.values) };
}

/** Block fields, p and q, the state and the running scalars read into locals. */
function emitPrologue(w: Writer): void {
  const { kinds, r, emit } = w;
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
  const tapeGuard = w.tape ? ` || tape.length < last * ${w.tape.width}` : "";
  const bandGuard = w.scaling !== "none" ? " || bandOf.length < last" : "";
  if (w.scaling !== "none") emit(`const bandOf = scaling.band; const inverseOf = scaling.inverse; const shiftOf = scaling.shift; const extraOf = scaling.extra;`);
  emit(`if (time.length < last || noiseVariance.length < last || residual.length < last${tapeGuard}${bandGuard}) throw new RangeError("advance: arrays shorter than the range");`);
  // Scratch for the transitions that are called rather than written out.
  if (kinds.some((kind) => kind === "called1" || kind === "called2")) emit(`const phi = new Float64Array(${w.sizes.reduce((a, m) => a + m * m, 0)});`);
  for (const i of range(r)) emit(`const p${i} = p[${i}]; const q${i} = q[${i}];`);
  emit(`let variance = 0; ${range(r).map((i) => `variance += p${i} * q${i};`).join(" ")}`);
  for (const i of range(r)) for (const j of range(r)) emit(`let ${s(i, j)} = state[${i * r + j}];`);
  for (const i of range(r)) emit(`let f${i} = state[${r * r + i}]; let u${i} = state[${r * r + r + i}];`);
  SCALAR_NAMES.forEach((name) => emit(`let ${name} = scalars[${SCALAR_SLOTS[name]}];`));
  if (w.withColumn) {
    for (const i of range(r)) emit(`let g${i} = state[${r * r + 2 * r + i}];`);
    COLUMN_SCALAR_NAMES.forEach((name) => emit(`let ${name} = scalars[${SCALAR_SLOTS[name]}];`));
  }
  emitBandColumnsPrologue(w);
  emit(`let failedAt = -1; let failedPivot = 0;`);
}

const columnState = (c: number, i: number): string => `h${c}_${i}`;
const gramName = (c: number, d: number): string => `gram${c}_${d}`;

/**
 * The band columns' state (after S, f and u in `state`: R values per column, then each column's last
 * innovation), the columns' values a point of band c has (1 / a_c) and the running Gram sums (in
 * `scaling.gram`, (C + 1) x (C + 1) row-major, column 0 the residual) read into locals.
 */
function emitBandColumnsPrologue(w: Writer): void {
  const { emit, r } = w;
  const columns = w.bandColumns;
  if (columns === 0) return;
  const base = r * r + 2 * r;
  for (let c = 0; c < columns; c++) {
    emit(`const columnValue${c} = inverseOf[${c}] * 1; let previousW${c} = state[${base + columns * r + c}];`);
    for (const i of range(r)) emit(`let ${columnState(c, i)} = state[${base + c * r + i}];`);
  }
  emit(`const gram = scaling.gram;`);
  for (let c = 0; c <= columns; c++) for (let d = c; d <= columns; d++) if (c + d > 0) emit(`let ${gramName(c, d)} = gram[${c * (columns + 1) + d}];`);
}

/** S <- S + u u^T / D ; f <- f + u z / D (row by row, as absorbPoint in state-update.ts). */
function emitAbsorb(w: Writer): void {
  for (const i of range(w.r)) {
    w.emit(`{ const ui = u${i} * previousInverse;`);
    for (const j of range(w.r)) w.emit(`${s(i, j)} += ui * u${j};`);
    const band = range(w.bandColumns).map((c) => ` ${columnState(c, i)} += ui * previousW${c};`).join("");
    w.emit(`f${i} += ui * previousZ;${w.withColumn ? ` g${i} += ui * previousW;` : ""}${band} }`);
  }
}

/** The tape's A_k (upper triangle) and g_k: the state the transition acts on. */
function emitRecordBefore(w: Writer, tape: GradientTapeLayout): void {
  let index = tape.stateBefore;
  const stores: string[] = [];
  for (const i of range(w.r)) for (let j = i; j < w.r; j++) stores.push(`tape[tb + ${index++}] = ${s(i, j)};`);
  for (const i of range(w.r)) stores.push(`tape[tb + ${tape.meanBefore + i}] = f${i};`);
  w.emit(stores.join(" "));
}

/** Each block's Phi = exp(F dt) into locals a{b}_{e} (and, when recording, the block's tape). Returns their names. */
function emitTransitions(w: Writer): string[][] {
  const { emit, constant, tape } = w;
  let phiOffset = 0;
  const phiNames: string[][] = [];
  w.kinds.forEach((kind, b) => {
    const m = w.sizes[b];
    const names = range(m * m).map((e) => `a${b}_${e}`);
    const record = tape ? `tb + ${tape.blockRecord[b]}` : undefined;
    if (kind === "exponential") {
      // ExponentialTransition.transition, with decayFactor written out (no call: see decayFactorSource).
      emit(`let ${names[0]}; ${decayFactorSource(names[0], `-rate${b} * dt`, constant)}`);
      if (record) emit(`tape[${record}] = ${names[0]};`);
    } else if (kind === "oscillator") {
      emitOscillatorTransition(w, b, names, record);
    } else {
      emit(`block${b}.transition(dt, phi, ${phiOffset});`);
      names.forEach((name, e) => emit(`const ${name} = phi[${phiOffset + e}];`));
      if (record) emit(names.map((name, e) => `tape[${record} + ${e}] = ${name};`).join(" "));
    }
    phiNames.push(names);
    phiOffset += m * m;
  });
  return phiNames;
}

/**
 * OscillatorTransition.transition: dampedHyperbolicValues written out, all three branches (a call left for
 * any of them made V8 box its double arguments at every step). When recording: E C, E S and E dS/dlambda
 * (transition-adjoints.ts).
 */
function emitOscillatorTransition(w: Writer, b: number, names: readonly string[], record: string | undefined): void {
  const { emit, constant } = w;
  const series = hyperbolicSeriesSource(`x${b}`, constant);
  emit(`let ec${b}; let es${b};${record ? ` let esl${b};` : ""} const x${b} = lambda${b} * dt * dt;`);
  emit(`if (x${b} > -1 && x${b} < 1) { let e; ${decayFactorSource("e", `-c${b} * dt`, constant)}`);
  // Only a recording pass writes (and pools the constants of) E dS/dlambda.
  const derivative = record ? oscillatorLambdaDerivativeSource(`esl${b}`, `lambda${b}`, `ec${b}`, `es${b}`, `x${b}`, constant) : undefined;
  emit(`ec${b} = e * ${series.cosh}; es${b} = e * (dt * ${series.sinh});${derivative ? ` ${derivative.series}` : ""} }`);
  emit(`else if (lambda${b} < 0) { let e; ${decayFactorSource("e", `-c${b} * dt`, constant)}`);
  emit(`let co; let si; ${cosineAndSineSource("co", "si", `omega${b} * dt`, constant)}`);
  emit(`ec${b} = e * co; es${b} = e * (si / omega${b});${derivative ? ` ${derivative.other}` : ""} }`);
  emit(`else { let slow; ${decayFactorSource("slow", `-slowRate${b} * dt`, constant)}`);
  emit(`let fast; ${decayFactorSource("fast", `-fastRate${b} * dt`, constant)}`);
  emit(`ec${b} = 0.5 * (slow + fast); es${b} = (slow - fast) / (2 * root${b});${derivative ? ` ${derivative.other}` : ""} }`);
  emit(`const ${names[0]} = ec${b} + es${b} * c${b}; const ${names[1]} = es${b} * w${b};`);
  emit(`const ${names[2]} = -es${b} * w${b}; const ${names[3]} = ec${b} - es${b} * c${b};`);
  if (record) emit(`tape[${record}] = ec${b}; tape[${record} + 1] = es${b}; tape[${record} + 2] = esl${b};`);
}

/** S <- Phi S Phi^T block pair by block pair (TransitionLayout.smallBlockCongruence, not transposed). */
function emitCongruence(w: Writer, phiNames: readonly (readonly string[])[]): void {
  const { emit, sizes, starts } = w;
  sizes.forEach((ma, a) => {
    const ia = starts[a];
    const A = phiNames[a];
    sizes.forEach((mb, b) => {
      const jb = starts[b];
      const B = phiNames[b];
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
}

/** f <- Phi f (and the constant column g <- Phi g), as TransitionLayout.applyToVector. */
function emitVectorTransition(w: Writer, phiNames: readonly (readonly string[])[]): void {
  w.sizes.forEach((m, b) => {
    const i = w.starts[b];
    const A = phiNames[b];
    const vectors = [(j: number) => `f${j}`, ...(w.withColumn ? [(j: number) => `g${j}`] : []), ...range(w.bandColumns).map((c) => (j: number) => columnState(c, j))];
    for (const v of vectors) {
      if (m === 1) w.emit(`${v(i)} *= ${A[0]};`);
      else w.emit(`{ const x0 = ${v(i)}; const x1 = ${v(i + 1)}; ${v(i)} = ${A[0]} * x0 + ${A[1]} * x1; ${v(i + 1)} = ${A[2]} * x0 + ${A[3]} * x1; }`);
    }
  });
}

/**
 * u = q - S p, D = d + variance - p^T S p, z = r - p^T f, the sums and the pivot product (and, when
 * recording, u, 1 / D and z on the tape). Sums start from their first term (projectState): no 0 + on the
 * critical path.
 */
function emitProjection(w: Writer): void {
  const { emit, r } = w;
  for (const i of range(r)) {
    emit(`const sp${i} = ${range(r).map((j) => `${s(i, j)} * p${j}`).join(" + ")}; u${i} = q${i} - sp${i};`);
  }
  emit(`const pSp = ${range(r).map((i) => `p${i} * sp${i}`).join(" + ")};`);
  emit(`const pf = ${range(r).map((i) => `p${i} * f${i}`).join(" + ")};`);
  if (w.withColumn) emit(`const pg = ${range(r).map((i) => `p${i} * g${i}`).join(" + ")};`);
  if (w.scaling === "none") {
    emit(`const pivot = noiseVariance[k] + variance - pSp;`);
    emit(`if (!(pivot > 0 && pivot < Infinity)) { failedAt = k; failedPivot = pivot; break; }`);
    emit(`const z = (residual[k] - meanValue) - pf;`);
  } else {
    // The same operations, in the same order, as scaling the residuals and noise variances first.
    emit(`const bk = bandOf[k]; const wk = inverseOf[bk];`);
    emit(`const pivot = (noiseVariance[k] + extraOf[bk]) * wk * wk + variance - pSp;`);
    emit(`if (!(pivot > 0 && pivot < Infinity)) { failedAt = k; failedPivot = pivot; break; }`);
    emit(`const z = (residual[k] - shiftOf[bk]) * wk - pf;`);
  }
  emit(`previousInverse = 1 / pivot; previousZ = z; quadratic += z * z * previousInverse;`);
  if (w.withColumn) {
    emit(`const w = 1 - pg; columnQuadratic += w * w * previousInverse; crossQuadratic += z * w * previousInverse; previousW = w;`);
  }
  emitBandColumnSums(w);
  if (w.tape) {
    const t = w.tape;
    emit(`${range(r).map((i) => `tape[tb + ${t.gain + i}] = u${i};`).join(" ")} tape[tb + ${t.inversePivot}] = previousInverse; tape[tb + ${t.innovation}] = z;`);
  }
  emit(absorbPivotSource("pivot", w.constant));
}

/**
 * The band columns' innovations w_c = x_c - p^T h_c (x_c = 1 / a_c at a point of band c, else 0) and
 * the Gram sums z w_c / D and w_c w_d / D (band-mean-sums.ts: the means integrated out).
 */
function emitBandColumnSums(w: Writer): void {
  const { emit, r } = w;
  const columns = w.bandColumns;
  for (let c = 0; c < columns; c++) {
    emit(`const innovation${c} = (bk === ${c} ? columnValue${c} : 0) - (${range(r).map((i) => `p${i} * ${columnState(c, i)}`).join(" + ")});`);
  }
  for (let c = 0; c < columns; c++) {
    emit(`{ const wi = innovation${c} * previousInverse; ${gramName(0, c + 1)} += z * wi;`);
    emit(range(columns).slice(c).map((d) => `${gramName(c + 1, d + 1)} += wi * innovation${d};`).join(" ") + " }");
  }
  for (let c = 0; c < columns; c++) emit(`previousW${c} = innovation${c};`);
}

/** The state and the running scalars stored back for the next chunk; a failed pivot thrown after the loop. */
function emitEpilogue(w: Writer): void {
  const { emit, r } = w;
  for (const i of range(r)) for (const j of range(r)) emit(`state[${i * r + j}] = ${s(i, j)};`);
  for (const i of range(r)) emit(`state[${r * r + i}] = f${i}; state[${r * r + r + i}] = u${i};`);
  SCALAR_NAMES.forEach((name) => emit(`scalars[${SCALAR_SLOTS[name]}] = ${name};`));
  if (w.withColumn) {
    for (const i of range(r)) emit(`state[${r * r + 2 * r + i}] = g${i};`);
    COLUMN_SCALAR_NAMES.forEach((name) => emit(`scalars[${SCALAR_SLOTS[name]}] = ${name};`));
  }
  const columns = w.bandColumns;
  if (columns > 0) {
    const base = r * r + 2 * r;
    for (let c = 0; c < columns; c++) {
      emit(`state[${base + columns * r + c}] = previousW${c};`);
      for (const i of range(r)) emit(`state[${base + c * r + i}] = ${columnState(c, i)};`);
    }
    for (let c = 0; c <= columns; c++) for (let d = c; d <= columns; d++) if (c + d > 0) emit(`gram[${c * (columns + 1) + d}] = ${gramName(c, d)};`);
  }
  emit(`if (failedAt >= 0) throw new FactorizationError(failedAt, failedPivot);`);
}
