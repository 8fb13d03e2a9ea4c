import { packedIndex, type GradientTapeLayout } from "./gradient-tape.js";
import type { SemiseparableForm } from "./semiseparable-form.js";
import { accumulateBlockAdjoint, recordTransition, transitionFromTape } from "./transition-adjoints.js";
import type { TransitionLayout } from "./transition-layout.js";

/** The gradient's tape being written by a forward pass (see semiseparable-gradient.ts). */
export interface TapeRecorder {
  readonly layout: GradientTapeLayout;
  readonly tape: Float64Array;
  /** Scratch of length 2 for the oscillator's values. */
  readonly scratch: Float64Array;
}

/**
 * The forward step's record before the transition (general loop): A_k and g_k, the state after the previous
 * point was absorbed, and every block's transition, written into `phi` for the congruence that follows.
 */
export function recordBeforeTransition(
  recorder: TapeRecorder,
  transitions: TransitionLayout,
  k: number,
  s: Float64Array,
  f: Float64Array,
  dt: number,
): void {
  const { layout, tape, scratch } = recorder;
  const r = layout.dimension;
  const base = k * layout.width;
  let index = base + layout.stateBefore;
  for (let i = 0; i < r; i++) for (let j = i; j < r; j++) tape[index++] = s[i * r + j];
  for (let i = 0; i < r; i++) tape[base + layout.meanBefore + i] = f[i];
  const blocks = transitions.blocks;
  for (let b = 0; b < blocks.length; b++) {
    recordTransition(layout.kinds[b], blocks[b], dt, transitions.phi, transitions.phiStart[b], tape, base + layout.blockRecord[b], scratch);
  }
}

/** The forward step's record after the projection: u_k, 1 / D_k, z_k (and S_k, f_k when p varies). */
export function recordAfterProjection(
  recorder: TapeRecorder,
  k: number,
  s: Float64Array,
  f: Float64Array,
  u: Float64Array,
  inversePivot: number,
  z: number,
): void {
  const { layout, tape } = recorder;
  const r = layout.dimension;
  const base = k * layout.width;
  for (let i = 0; i < r; i++) tape[base + layout.gain + i] = u[i];
  tape[base + layout.inversePivot] = inversePivot;
  tape[base + layout.innovation] = z;
  if (layout.observationVaries) {
    for (let e = 0; e < r * r; e++) tape[base + layout.state + e] = s[e];
    for (let i = 0; i < r; i++) tape[base + layout.mean + i] = f[i];
  }
}

/** Scratch arrays of the general backward pass, allocated once per gradient. */
export interface BackwardScratch {
  /** N = S-bar Phi, R x R. */
  readonly product: Float64Array;
  /** Phi of the current step, block after block (as TransitionLayout.phi). */
  readonly phi: Float64Array;
  /** Phi-bar of one block. */
  readonly phiBar: Float64Array;
  /** v = A-bar u, then the new S-bar before it is stored. */
  readonly vector: Float64Array;
  readonly packed: Float64Array;
  /** For transitionDerivatives of generic blocks. */
  readonly derivatives: Float64Array;
  readonly transitions: TransitionLayout;
}

/**
 * Points end - 1 down to begin of the backward pass over the tape (the general loop; reverse-recursion.ts
 * writes the same operations out). `adjoint` carries the running adjoints between calls (layout in
 * GradientTapeLayout): S-bar (packed) and f-bar of the current point, the adjoints of u, D and z that
 * arrive from the next point, and the sums the gradient is assembled from.
 *
 * Per point k (Foreman-Mackey 2018, RNAAS 2, 31, for the recursion's reverse mode; S, A, S-bar symmetric):
 *   z-bar += -z / D, D-bar += (z^2 / D^2 - 1 / D) / 2  (the point's terms of log L);
 *   f-bar -= z-bar p; S-bar -= D-bar p p^T + (u-bar p^T + p u-bar^T) / 2  (z = r - p^T f, D = d + p^T q - p^T S p, u = q - S p);
 *   then through S_k = Phi A Phi^T, f_k = Phi g: Phi-bar = 2 S-bar Phi A + f-bar g^T (block-diagonal part,
 *   to the blocks' accumulators), A-bar = Phi^T S-bar Phi, g-bar = Phi^T f-bar;
 *   and through A = S_{k-1} + u u^T / D, g = f_{k-1} + u z / D of point k - 1: S-bar <- A-bar, f-bar <- g-bar,
 *   u-bar = (2 A-bar u + z g-bar) / D, D-bar = -(u^T A-bar u + z u^T g-bar) / D^2, z-bar = u^T g-bar / D.
 */
export function backwardGeneralLoop(
  form: SemiseparableForm,
  layout: GradientTapeLayout,
  tape: Float64Array,
  time: ArrayLike<number>,
  adjoint: Float64Array,
  kernelBar: Float64Array,
  scratch: BackwardScratch,
  residualBar: Float64Array | undefined,
  noiseBar: Float64Array | undefined,
  begin: number,
  end: number,
): void {
  const r = layout.dimension;
  const blocks = form.blocks;
  const { product, phi, transitions } = scratch;
  for (let k = end - 1; k >= begin; k--) {
    const base = k * layout.width;
    const { zBar, dBar } = localTerms(form, layout, tape, base, adjoint);
    if (residualBar) residualBar[k] = zBar;
    if (noiseBar) noiseBar[k] = dBar;
    if (k === 0) break;
    // Through S_k = Phi A Phi^T and f_k = Phi g, then through point k - 1's update.
    const dt = time[k] - time[k - 1];
    for (let b = 0; b < blocks.length; b++) transitionFromTape(layout.kinds[b], blocks[b], tape, base + layout.blockRecord[b], phi, transitions.phiStart[b]);
    stateBarTimesTransition(layout, transitions, adjoint, product, r);
    transitionAdjoints(form, layout, tape, base, dt, adjoint, kernelBar, scratch);
    transposedProducts(layout, adjoint, scratch);
    previousUpdate(layout, tape, base, adjoint, scratch.vector);
  }
}

/**
 * The point's terms of log L, z = r - p^T f, D = d + p^T q - p^T S p and u = q - S p, into the running
 * adjoints; returns z-bar and D-bar of the point.
 */
function localTerms(
  form: SemiseparableForm,
  layout: GradientTapeLayout,
  tape: Float64Array,
  base: number,
  adjoint: Float64Array,
): { zBar: number; dBar: number } {
  const r = layout.dimension;
  const p = form.observation;
  const inversePivot = tape[base + layout.inversePivot];
  const z = tape[base + layout.innovation];
  const w = z * inversePivot;
  const zBar = adjoint[layout.innovationBar] - w;
  const dBar = adjoint[layout.pivotBar] + 0.5 * (w * w - inversePivot);
  adjoint[layout.residualBarSum] += zBar;
  adjoint[layout.noiseBarSum] += dBar;
  if (layout.observationVaries) observationStep(layout, tape, base, p, form.projection, adjoint, zBar, dBar, r);
  for (let i = 0; i < r; i++) {
    adjoint[layout.gainBarSum + i] += adjoint[layout.gainBar + i];
    adjoint[layout.meanBar + i] -= zBar * p[i];
  }
  const ub = layout.gainBar;
  for (let i = 0; i < r; i++)
    for (let j = i; j < r; j++) {
      adjoint[layout.stateBar + packedIndex(i, j, r)] -= dBar * (p[i] * p[j]) + 0.5 * (adjoint[ub + i] * p[j] + p[i] * adjoint[ub + j]);
    }
  return { zBar, dBar };
}

/** Phi-bar = 2 N A + f-bar g^T on each diagonal block (N = S-bar Phi in scratch.product), into the block's sums. */
function transitionAdjoints(
  form: SemiseparableForm,
  layout: GradientTapeLayout,
  tape: Float64Array,
  base: number,
  dt: number,
  adjoint: Float64Array,
  kernelBar: Float64Array,
  scratch: BackwardScratch,
): void {
  const r = layout.dimension;
  const { product, phi, phiBar, derivatives, transitions } = scratch;
  for (let b = 0; b < form.blocks.length; b++) {
    const start = layout.blockStart[b];
    const m = layout.blockSize[b];
    for (let i = 0; i < m; i++)
      for (let j = 0; j < m; j++) {
        const row = start + i;
        const column = start + j;
        let sum = product[row * r] * tape[base + layout.stateBefore + packedIndex(0, column, r)];
        for (let l = 1; l < r; l++) sum += product[row * r + l] * tape[base + layout.stateBefore + packedIndex(l, column, r)];
        phiBar[i * m + j] = 2 * sum + adjoint[layout.meanBar + row] * tape[base + layout.meanBefore + column];
      }
    accumulateBlockAdjoint(
      layout.kinds[b], form.blocks[b], dt, phiBar, phi, transitions.phiStart[b], tape, base + layout.blockRecord[b],
      adjoint, layout.blockAccumulators[b], kernelBar, derivatives,
    );
  }
}

/** A-bar = Phi^T N (upper triangle) into S-bar, and g-bar = Phi^T f-bar into f-bar. */
function transposedProducts(layout: GradientTapeLayout, adjoint: Float64Array, scratch: BackwardScratch): void {
  const r = layout.dimension;
  const { product, phi, vector, packed, transitions } = scratch;
  for (let b = 0; b < layout.blockStart.length; b++) {
    const start = layout.blockStart[b];
    const m = layout.blockSize[b];
    const o = transitions.phiStart[b];
    for (let i = start; i < start + m; i++)
      for (let j = i; j < r; j++) {
        let sum = phi[o + (i - start)] * product[start * r + j];
        for (let l = 1; l < m; l++) sum += phi[o + l * m + (i - start)] * product[(start + l) * r + j];
        packed[packedIndex(i, j, r)] = sum;
      }
    for (let i = start; i < start + m; i++) {
      let sum = phi[o + (i - start)] * adjoint[layout.meanBar + start];
      for (let l = 1; l < m; l++) sum += phi[o + l * m + (i - start)] * adjoint[layout.meanBar + start + l];
      vector[i] = sum;
    }
  }
  for (let e = 0; e < layout.packedLength; e++) adjoint[layout.stateBar + e] = packed[e];
  for (let i = 0; i < r; i++) adjoint[layout.meanBar + i] = vector[i];
}

/** Through A = S_{k-1} + u u^T / D and g = f_{k-1} + u z / D of point k - 1: u-bar, D-bar and z-bar arriving there. */
function previousUpdate(layout: GradientTapeLayout, tape: Float64Array, base: number, adjoint: Float64Array, vector: Float64Array): void {
  const r = layout.dimension;
  const sb = layout.stateBar;
  const previous = base - layout.width;
  const previousInverse = tape[previous + layout.inversePivot];
  const previousZ = tape[previous + layout.innovation];
  const u = previous + layout.gain;
  let uAu = 0;
  let ug = 0;
  for (let i = 0; i < r; i++) {
    let sum = adjoint[sb + packedIndex(i, 0, r)] * tape[u];
    for (let j = 1; j < r; j++) sum += adjoint[sb + packedIndex(i, j, r)] * tape[u + j];
    vector[i] = sum;
    if (i === 0) {
      uAu = tape[u] * sum;
      ug = tape[u] * adjoint[layout.meanBar];
    } else {
      uAu += tape[u + i] * sum;
      ug += tape[u + i] * adjoint[layout.meanBar + i];
    }
  }
  for (let i = 0; i < r; i++) adjoint[layout.gainBar + i] = (2 * vector[i] + previousZ * adjoint[layout.meanBar + i]) * previousInverse;
  adjoint[layout.pivotBar] = -(uAu + previousZ * ug) * (previousInverse * previousInverse);
  adjoint[layout.innovationBar] = ug * previousInverse;
}

/** N = S-bar Phi (R x R), S-bar read from its packed form in `adjoint`; Phi block diagonal. */
function stateBarTimesTransition(layout: GradientTapeLayout, transitions: TransitionLayout, adjoint: Float64Array, product: Float64Array, r: number): void {
  const phi = transitions.phi;
  for (let b = 0; b < layout.blockStart.length; b++) {
    const start = layout.blockStart[b];
    const m = layout.blockSize[b];
    const o = transitions.phiStart[b];
    for (let i = 0; i < r; i++)
      for (let j = 0; j < m; j++) {
        let sum = adjoint[layout.stateBar + packedIndex(i, start, r)] * phi[o + j];
        for (let l = 1; l < m; l++) sum += adjoint[layout.stateBar + packedIndex(i, start + l, r)] * phi[o + l * m + j];
        product[i * r + start + j] = sum;
      }
  }
}

/**
 * d log L / dp of one point, when p depends on the parameters: -z-bar f + D-bar (q - 2 S p) - S u-bar
 * (S = S_k, f = f_k from the tape), added to the running sum.
 */
function observationStep(
  layout: GradientTapeLayout,
  tape: Float64Array,
  base: number,
  p: Float64Array,
  q: Float64Array,
  adjoint: Float64Array,
  zBar: number,
  dBar: number,
  r: number,
): void {
  const s = base + layout.state;
  for (let i = 0; i < r; i++) {
    let sp = 0;
    let su = 0;
    for (let j = 0; j < r; j++) {
      sp += tape[s + i * r + j] * p[j];
      su += tape[s + j * r + i] * adjoint[layout.gainBar + j];
    }
    adjoint[layout.observationBar + i] += -zBar * tape[base + layout.mean + i] + dBar * (q[i] - 2 * sp) - su;
  }
}
