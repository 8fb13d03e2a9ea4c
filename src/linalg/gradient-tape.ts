import type { SemiseparableForm } from "./semiseparable-form.js";
import { accumulatorCount, adjointKind, tapeWidth, type AdjointKind } from "./transition-adjoints.js";

/**
 * Where the gradient's forward pass records each point, and where the backward pass keeps its running
 * adjoints between chunks: one layout shared by the general loops (gradient-general-loop.ts) and the
 * written-out passes (unrolled-recursion.ts with `record`, reverse-recursion.ts).
 *
 * Per point k the tape holds, at k * width:
 *   A_k = S_{k-1} + u u^T / D (upper triangle, row by row: the matrix Phi_k acts on), g_k = f_{k-1} + u z / D,
 *   each block's transition record (transition-adjoints.ts), u_k, 1 / D_k, z_k, and, only when p depends
 *   on the parameters, S_k (R x R) and f_k, which d log L / dp needs.
 * A symmetric matrix is kept as its upper triangle in the same order: element (i, j), i <= j, at
 * {@link packedIndex}.
 */
export class GradientTapeLayout {
  readonly dimension: number;
  readonly kinds: readonly AdjointKind[];
  readonly blockStart: readonly number[];
  readonly blockSize: readonly number[];
  /** Length of a packed symmetric R x R matrix, R (R + 1) / 2. */
  readonly packedLength: number;
  /** Whether p depends on the parameters (then S_k and f_k are recorded and d log L / dp is formed). */
  readonly observationVaries: boolean;
  // Offsets within one point's record.
  readonly stateBefore = 0;
  readonly meanBefore: number;
  readonly blockRecord: readonly number[];
  readonly gain: number;
  readonly inversePivot: number;
  readonly innovation: number;
  readonly state: number;
  readonly mean: number;
  /** Values per point. */
  readonly width: number;
  // Offsets within the backward pass's running adjoints.
  readonly stateBar = 0;
  readonly meanBar: number;
  readonly gainBar: number;
  readonly pivotBar: number;
  readonly innovationBar: number;
  readonly gainBarSum: number;
  readonly noiseBarSum: number;
  readonly residualBarSum: number;
  readonly blockAccumulators: readonly number[];
  readonly observationBar: number;
  /** Length of the running adjoints. */
  readonly adjointLength: number;

  /** The layout for a form's blocks (p recorded as varying when any dp/dtheta is not zero). */
  static of(form: SemiseparableForm): GradientTapeLayout {
    return new GradientTapeLayout(
      form.blocks.map(adjointKind),
      form.blocks.map((block) => block.size),
      form.observationGradient.some((value) => value !== 0),
    );
  }

  constructor(kinds: readonly AdjointKind[], sizes: readonly number[], observationVaries: boolean) {
    const r = sizes.reduce((sum, m) => sum + m, 0);
    this.dimension = r;
    this.kinds = kinds;
    const starts: number[] = [];
    let start = 0;
    for (const m of sizes) {
      starts.push(start);
      start += m;
    }
    this.blockStart = starts;
    this.blockSize = sizes;
    this.packedLength = (r * (r + 1)) / 2;
    this.observationVaries = observationVaries;

    this.meanBefore = this.packedLength;
    let offset = this.meanBefore + r;
    const records: number[] = [];
    this.kinds.forEach((kind, b) => {
      records.push(offset);
      offset += tapeWidth(kind, this.blockSize[b]);
    });
    this.blockRecord = records;
    this.gain = offset;
    this.inversePivot = offset + r;
    this.innovation = offset + r + 1;
    offset += r + 2;
    this.state = offset;
    this.mean = offset + r * r;
    if (this.observationVaries) offset += r * r + r;
    this.width = offset;

    this.meanBar = this.packedLength;
    this.gainBar = this.meanBar + r;
    this.pivotBar = this.gainBar + r;
    this.innovationBar = this.pivotBar + 1;
    this.gainBarSum = this.innovationBar + 1;
    this.noiseBarSum = this.gainBarSum + r;
    this.residualBarSum = this.noiseBarSum + 1;
    let accumulator = this.residualBarSum + 1;
    const accumulators: number[] = [];
    for (const kind of this.kinds) {
      accumulators.push(accumulator);
      accumulator += accumulatorCount(kind);
    }
    this.blockAccumulators = accumulators;
    this.observationBar = accumulator;
    this.adjointLength = accumulator + r;
  }
}

/** Position of element (i, j) of a packed symmetric R x R matrix (either order of i and j). */
export function packedIndex(i: number, j: number, r: number): number {
  const row = Math.min(i, j);
  const column = Math.max(i, j);
  return row * r - (row * (row - 1)) / 2 + (column - row);
}
