import { GradientTapeLayout, packedIndex } from "./gradient-tape.js";
import { adjointKindOf, BLOCK_SIZE, type BlockKind } from "./recursion-source.js";
import { accumulateBlockAdjointSource, genericBlockAdjoint } from "./transition-adjoints.js";
import type { TransitionBlock } from "./transition-block.js";
import { blockKindsOf, MAX_UNROLLED_DIMENSION } from "./unrolled-recursion.js";

/**
 * The gradient's backward pass (`backwardGeneralLoop` in gradient-general-loop.ts) written out for one
 * layout of blocks, like the forward recursion of unrolled-recursion.ts: every element of S-bar (its upper
 * triangle), f-bar, u-bar and of the blocks' running sums in a local variable, the transitions rebuilt from
 * the tape inline, no call and no allocation in the loop (blocks without their own adjoint formulas, the
 * "called" kinds, call `genericBlockAdjoint`). The same operations in the same order as the general loop,
 * so the two give bit-identical gradients (test/linalg/semiseparable-gradient.test.ts).
 *
 * Runs points end - 1 down to begin; `adjoint` carries the running adjoints between calls in the layout of
 * GradientTapeLayout. `residualBar` and `noiseBar` (both or neither) receive the per-point adjoints.
 */
export type UnrolledReverse = (
  blocks: readonly TransitionBlock[],
  p: Float64Array,
  adjoint: Float64Array,
  kernelBar: Float64Array,
  tape: Float64Array,
  time: ArrayLike<number>,
  residualBar: Float64Array | undefined,
  noiseBar: Float64Array | undefined,
  begin: number,
  end: number,
) => void;

const PARAMETERS = "blocks, p, adjoint, kernelBar, tape, time, residualBar, noiseBar, begin, end";

/** Compiled backward passes by layout (a cache of pure functions of the layout). */
const compiled = new Map<string, UnrolledReverse | undefined>();

/**
 * The compiled backward pass for these blocks, or undefined where the forward recursion is not written out
 * either (a block larger than 2 x 2, R above MAX_UNROLLED_DIMENSION) or code cannot be compiled here.
 */
export function reverseRecursion(blocks: readonly TransitionBlock[]): UnrolledReverse | undefined {
  const kinds = blockKindsOf(blocks);
  if (!kinds) return undefined;
  const key = kinds.join(",");
  if (compiled.has(key)) return compiled.get(key);
  let reverse: UnrolledReverse | undefined;
  const dimension = kinds.reduce((r, kind) => r + BLOCK_SIZE[kind], 0);
  if (dimension <= MAX_UNROLLED_DIMENSION) {
    try {
      const factory = new Function("genericBlockAdjoint", `return function reverse(${PARAMETERS}) {\n${reverseSource(kinds)}\n};`);
      reverse = factory(genericBlockAdjoint) as UnrolledReverse;
      primeFeedback(reverse, blocks, kinds);
    } catch {
      reverse = undefined; // no run-time compilation on this host
    }
  }
  compiled.set(key, reverse);
  return reverse;
}

/** Empty calls right after compiling, as for the forward recursion (see primeFeedback in unrolled-recursion.ts). */
function primeFeedback(reverse: UnrolledReverse, blocks: readonly TransitionBlock[], kinds: readonly BlockKind[]): void {
  const layout = layoutOf(kinds);
  const adjoint = new Float64Array(layout.adjointLength);
  const p = new Float64Array(layout.dimension).fill(1);
  const none = new Float64Array(0);
  const kernelBar = new Float64Array(64);
  for (let call = 0; call < 32; call++) reverse(blocks, p, adjoint, kernelBar, none, none, undefined, undefined, 0, 0);
}

function layoutOf(kinds: readonly BlockKind[]): GradientTapeLayout {
  return new GradientTapeLayout(kinds.map(adjointKindOf), kinds.map((kind) => BLOCK_SIZE[kind]), false);
}

/** What one backward pass is written for. */
interface Writer {
  readonly kinds: readonly BlockKind[];
  readonly layout: GradientTapeLayout;
  readonly r: number;
  readonly emit: (line: string) => void;
}

const range = (n: number): number[] => Array.from({ length: n }, (_, i) => i);
/** S-bar's element (i, j) of the upper triangle, in either order. */
const sBar = (i: number, j: number): string => (i <= j ? `t${i}_${j}` : `t${j}_${i}`);
/** A_k's element (i, j), read from the tape into a local. */
const stateBefore = (i: number, j: number): string => (i <= j ? `A${i}_${j}` : `A${j}_${i}`);
const product = (i: number, j: number): string => `n${i}_${j}`;
const accumulatorNames = (kind: BlockKind, b: number): string[] =>
  range(kind === "exponential" ? 1 : kind === "oscillator" ? 6 : 0).map((c) => `x${b}_${c}`);

/**
 * The body of the generated backward pass. Per point: the point's own terms, then (k > 0) the transition
 * rebuilt from the tape, N = S-bar Phi, each block's Phi-bar into its running sums, A-bar = Phi^T N and
 * g-bar = Phi^T f-bar, and the push through the previous point's update (formulas at backwardGeneralLoop).
 */
export function reverseSource(kinds: readonly BlockKind[]): string {
  const layout = layoutOf(kinds);
  const lines: string[] = [];
  const writer: Writer = { kinds, layout, r: layout.dimension, emit: (line) => void lines.push(line) };
  emitPrologue(writer);
  writer.emit(`for (let k = last - 1; k >= first; k--) {`);
  writer.emit(`const tb = k * ${layout.width};`);
  emitLocalTerms(writer);
  writer.emit(`if (k === 0) break;`);
  writer.emit(`const dt = time[k] - time[k - 1];`);
  const phiNames = emitTransitionsFromTape(writer);
  emitStateBarTimesTransition(writer, phiNames);
  emitTransitionAdjoints(writer, phiNames);
  emitTransposedProducts(writer, phiNames);
  emitPreviousUpdate(writer);
  writer.emit(`}`);
  emitEpilogue(writer);
  return lines.join("\n");
}

/** Block constants and the running adjoints read into locals. */
function emitPrologue(w: Writer): void {
  const { kinds, layout, r, emit } = w;
  emit(`"use strict";`);
  kinds.forEach((kind, b) => {
    emit(`const block${b} = blocks[${b}];`);
    if (kind === "oscillator") emit(`const c${b} = block${b}.halfWidth * 1; const w${b} = block${b}.w0 * 1;`);
  });
  emit(`const first = begin | 0; const last = end | 0;`);
  emit(`if (time.length < last || tape.length < last * ${layout.width}) throw new RangeError("reverse: arrays shorter than the range");`);
  if (kinds.some((kind) => kind === "called1" || kind === "called2")) {
    const largest = kinds.reduce((size, kind) => Math.max(size, BLOCK_SIZE[kind]), 1);
    emit(`const phiBar = new Float64Array(${largest * largest});`);
    kinds.forEach((kind, b) => {
      if (kind === "called1" || kind === "called2") emit(`const derivativeLength${b} = block${b}.parameterIndex.length * ${BLOCK_SIZE[kind] ** 2};`);
    });
    // Scratch for transitionDerivatives of the called blocks (genericBlockAdjoint).
    emit(`const scratch = new Float64Array(Math.max(1, ${kinds.map((kind, b) => (kind === "called1" || kind === "called2" ? `derivativeLength${b}` : "0")).join(", ")}));`);
  }
  for (const i of range(r)) emit(`const p${i} = p[${i}];`);
  for (const i of range(r)) for (let j = i; j < r; j++) emit(`let ${sBar(i, j)} = adjoint[${layout.stateBar + packedIndex(i, j, r)}];`);
  for (const i of range(r)) {
    emit(`let fb${i} = adjoint[${layout.meanBar + i}]; let ub${i} = adjoint[${layout.gainBar + i}]; let us${i} = adjoint[${layout.gainBarSum + i}];`);
  }
  emit(`let dIn = adjoint[${layout.pivotBar}]; let zIn = adjoint[${layout.innovationBar}];`);
  emit(`let noiseSum = adjoint[${layout.noiseBarSum}]; let residualSum = adjoint[${layout.residualBarSum}];`);
  kinds.forEach((kind, b) => {
    accumulatorNames(kind, b).forEach((name, c) => emit(`let ${name} = adjoint[${layout.blockAccumulators[b] + c}];`));
  });
}

/** The point's terms of log L, z = r - p^T f, D = d + p^T q - p^T S p and u = q - S p. */
function emitLocalTerms(w: Writer): void {
  const { layout, r, emit } = w;
  emit(`const inversePivot = tape[tb + ${layout.inversePivot}]; const z = tape[tb + ${layout.innovation}];`);
  emit(`const w = z * inversePivot; const zBar = zIn - w; const dBar = dIn + 0.5 * (w * w - inversePivot);`);
  emit(`residualSum += zBar; noiseSum += dBar;`);
  emit(`if (residualBar !== undefined) { residualBar[k] = zBar; noiseBar[k] = dBar; }`);
  for (const i of range(r)) emit(`us${i} += ub${i}; fb${i} -= zBar * p${i};`);
  for (const i of range(r))
    for (let j = i; j < r; j++) emit(`${sBar(i, j)} -= dBar * (p${i} * p${j}) + 0.5 * (ub${i} * p${j} + p${i} * ub${j});`);
}

/** Each block's Phi from its tape record into locals a{b}_{e}, as transitionFromTape. Returns their names. */
function emitTransitionsFromTape(w: Writer): string[][] {
  const { layout, emit } = w;
  return w.kinds.map((kind, b) => {
    const m = BLOCK_SIZE[kind];
    const names = range(m * m).map((e) => `a${b}_${e}`);
    const at = `tb + ${layout.blockRecord[b]}`;
    if (kind === "oscillator") {
      emit(`const ec${b} = tape[${at}]; const es${b} = tape[${at} + 1]; const esl${b} = tape[${at} + 2];`);
      emit(`const ${names[0]} = ec${b} + es${b} * c${b}; const ${names[1]} = es${b} * w${b}; const ${names[2]} = -es${b} * w${b}; const ${names[3]} = ec${b} - es${b} * c${b};`);
    } else {
      emit(names.map((name, e) => `const ${name} = tape[${at} + ${e}];`).join(" "));
    }
    return names;
  });
}

/** N = S-bar Phi, column block by column block (stateBarTimesTransition). */
function emitStateBarTimesTransition(w: Writer, phiNames: readonly (readonly string[])[]): void {
  const { layout, r, emit } = w;
  w.kinds.forEach((kind, b) => {
    const m = BLOCK_SIZE[kind];
    const start = layout.blockStart[b];
    const a = phiNames[b];
    for (const i of range(r))
      for (const j of range(m)) {
        const terms = range(m).map((l) => `${sBar(i, start + l)} * ${a[l * m + j]}`);
        emit(`const ${product(i, start + j)} = ${terms.join(" + ")};`);
      }
  });
}

/** Phi-bar = 2 N A + f-bar g^T on each diagonal block, added into the block's running sums. */
function emitTransitionAdjoints(w: Writer, phiNames: readonly (readonly string[])[]): void {
  const { layout, r, emit } = w;
  const loads: string[] = [];
  for (const i of range(r)) for (let j = i; j < r; j++) loads.push(`const ${stateBefore(i, j)} = tape[tb + ${layout.stateBefore + packedIndex(i, j, r)}];`);
  for (const i of range(r)) loads.push(`const g${i} = tape[tb + ${layout.meanBefore + i}];`);
  emit(loads.join(" "));
  w.kinds.forEach((kind, b) => {
    const m = BLOCK_SIZE[kind];
    const start = layout.blockStart[b];
    const bars: string[] = [];
    for (const i of range(m))
      for (const j of range(m)) {
        const row = start + i;
        const column = start + j;
        const name = `P${b}_${i * m + j}`;
        bars.push(name);
        const sum = range(r).map((l) => `${product(row, l)} * ${stateBefore(l, column)}`).join(" + ");
        emit(`const ${name} = 2 * (${sum}) + fb${row} * g${column};`);
      }
    if (kind === "exponential" || kind === "oscillator") {
      const tape = kind === "oscillator" ? [`ec${b}`, `es${b}`, `esl${b}`] : [];
      emit(accumulateBlockAdjointSource(kind, bars, phiNames[b], tape, accumulatorNames(kind, b)));
    } else {
      emit(`${bars.map((name, e) => `phiBar[${e}] = ${name};`).join(" ")} genericBlockAdjoint(block${b}, dt, phiBar, kernelBar, scratch);`);
    }
  });
}

/** A-bar = Phi^T N (upper triangle) into S-bar's locals, and g-bar = Phi^T f-bar into f-bar's. */
function emitTransposedProducts(w: Writer, phiNames: readonly (readonly string[])[]): void {
  const { layout, r, emit } = w;
  const vector: string[] = [];
  w.kinds.forEach((kind, b) => {
    const m = BLOCK_SIZE[kind];
    const start = layout.blockStart[b];
    const a = phiNames[b];
    for (let i = start; i < start + m; i++) {
      for (let j = i; j < r; j++) {
        const terms = range(m).map((l) => `${a[l * m + (i - start)]} * ${product(start + l, j)}`);
        emit(`${sBar(i, j)} = ${terms.join(" + ")};`);
      }
      vector.push(`const gb${i} = ${range(m).map((l) => `${a[l * m + (i - start)]} * fb${start + l}`).join(" + ")};`);
    }
  });
  emit(vector.join(" "));
  emit(range(r).map((i) => `fb${i} = gb${i};`).join(" "));
}

/** Through A = S_{k-1} + u u^T / D and g = f_{k-1} + u z / D: u-bar, D-bar and z-bar of point k - 1. */
function emitPreviousUpdate(w: Writer): void {
  const { layout, r, emit } = w;
  const previous = `tb - ${layout.width}`;
  emit(`const previousInverse = tape[${previous} + ${layout.inversePivot}]; const previousZ = tape[${previous} + ${layout.innovation}];`);
  emit(range(r).map((i) => `const v${i} = tape[${previous} + ${layout.gain + i}];`).join(" "));
  for (const i of range(r)) emit(`const m${i} = ${range(r).map((j) => `${sBar(i, j)} * v${j}`).join(" + ")};`);
  emit(`const uAu = ${range(r).map((i) => `v${i} * m${i}`).join(" + ")};`);
  emit(`const ug = ${range(r).map((i) => `v${i} * fb${i}`).join(" + ")};`);
  for (const i of range(r)) emit(`ub${i} = (2 * m${i} + previousZ * fb${i}) * previousInverse;`);
  emit(`dIn = -(uAu + previousZ * ug) * (previousInverse * previousInverse); zIn = ug * previousInverse;`);
}

/** The running adjoints stored back for the next chunk. */
function emitEpilogue(w: Writer): void {
  const { kinds, layout, r, emit } = w;
  for (const i of range(r)) for (let j = i; j < r; j++) emit(`adjoint[${layout.stateBar + packedIndex(i, j, r)}] = ${sBar(i, j)};`);
  for (const i of range(r)) emit(`adjoint[${layout.meanBar + i}] = fb${i}; adjoint[${layout.gainBar + i}] = ub${i}; adjoint[${layout.gainBarSum + i}] = us${i};`);
  emit(`adjoint[${layout.pivotBar}] = dIn; adjoint[${layout.innovationBar}] = zIn;`);
  emit(`adjoint[${layout.noiseBarSum}] = noiseSum; adjoint[${layout.residualBarSum}] = residualSum;`);
  kinds.forEach((kind, b) => {
    accumulatorNames(kind, b).forEach((name, c) => emit(`adjoint[${layout.blockAccumulators[b] + c}] = ${name};`));
  });
}
