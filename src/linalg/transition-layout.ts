import type { SemiseparableForm } from "./semiseparable-form.js";
import type { TransitionBlock } from "./transition-block.js";

/**
 * Where each block of a form sits in the state vector, with scratch space for one step's transitions.
 * Built once per form; the per-point loops then use only these typed arrays (no allocation per point).
 */
export class TransitionLayout {
  /** State dimension R. */
  readonly dimension: number;
  readonly blocks: readonly TransitionBlock[];
  readonly blockStart: Int32Array;
  readonly blockSize: Int32Array;
  /** Start of each block's m x m transition in `phi`. */
  readonly phiStart: Int32Array;
  /** The current step's transitions, block after block. */
  readonly phi: Float64Array;
  /** Scratch of length R for in-place products. */
  readonly scratch: Float64Array;
  /** True when every block is 1 x 1 or 2 x 2 (all kernels but products): congruences go block pair by block pair. */
  private readonly smallBlocks: boolean;

  constructor(form: SemiseparableForm) {
    this.blocks = form.blocks;
    const count = form.blocks.length;
    this.blockStart = new Int32Array(count);
    this.blockSize = new Int32Array(count);
    this.phiStart = new Int32Array(count);
    let state = 0;
    let phiLength = 0;
    form.blocks.forEach((block, b) => {
      this.blockStart[b] = state;
      this.blockSize[b] = block.size;
      this.phiStart[b] = phiLength;
      state += block.size;
      phiLength += block.size * block.size;
    });
    if (state !== form.observation.length) throw new Error("blocks and observation vector disagree in size");
    this.dimension = state;
    this.phi = new Float64Array(phiLength);
    this.scratch = new Float64Array(state);
    this.smallBlocks = form.blocks.every((block) => block.size <= 2);
  }

  /** Fills `phi` with every block's exp(F dt). */
  computeTransitions(dt: number): void {
    const blocks = this.blocks;
    for (let b = 0; b < blocks.length; b++) blocks[b].transition(dt, this.phi, this.phiStart[b]);
  }

  /** vector <- Phi vector, in place (vector of length R at `offset`). */
  applyToVector(vector: Float64Array, offset: number): void {
    this.applyStrided(vector, offset, 1, false);
  }

  /** vector <- Phi^T vector, in place. */
  applyTransposeToVector(vector: Float64Array, offset: number): void {
    this.applyStrided(vector, offset, 1, true);
  }

  /** matrix <- Phi matrix Phi^T, in place (R x R row-major at `offset`). */
  applyCongruence(matrix: Float64Array, offset: number): void {
    this.congruence(matrix, offset, false);
  }

  /** matrix <- Phi^T matrix Phi, in place. */
  applyTransposeCongruence(matrix: Float64Array, offset: number): void {
    this.congruence(matrix, offset, true);
  }

  /** matrix <- A matrix A^T with A = Phi (or Phi^T when `transpose`). */
  private congruence(matrix: Float64Array, offset: number, transpose: boolean): void {
    if (this.smallBlocks) {
      this.smallBlockCongruence(matrix, offset, transpose);
      return;
    }
    const r = this.dimension;
    // Left product: every column j, block by block.
    for (let j = 0; j < r; j++) this.applyStrided(matrix, offset + j, r, transpose);
    // Right product by A^T: every row i, i.e. row <- A row.
    for (let i = 0; i < r; i++) this.applyStrided(matrix, offset + i * r, 1, transpose);
  }

  /**
   * matrix <- A matrix A^T with A = Phi (or Phi^T), for blocks of size 1 and 2 only, one block pair
   * (a, b) at a time: M_ab <- A_a M_ab A_b^T. Each element is computed with the same operations in the same
   * order as the column-then-row passes (left product first), so the results are identical, but every
   * element is loaded and stored once instead of twice and the per-column calls disappear.
   */
  private smallBlockCongruence(matrix: Float64Array, offset: number, transpose: boolean): void {
    const { blockStart, blockSize, phiStart, phi } = this;
    const r = this.dimension;
    const count = blockStart.length;
    for (let a = 0; a < count; a++) {
      const pa = phiStart[a];
      const rowStart = offset + blockStart[a] * r;
      if (blockSize[a] === 1) {
        const g = phi[pa];
        for (let b = 0; b < count; b++) {
          const pb = phiStart[b];
          const o = rowStart + blockStart[b];
          if (blockSize[b] === 1) {
            matrix[o] = phi[pb] * (g * matrix[o]);
          } else {
            const b01 = transpose ? phi[pb + 2] : phi[pb + 1];
            const b10 = transpose ? phi[pb + 1] : phi[pb + 2];
            const y0 = g * matrix[o];
            const y1 = g * matrix[o + 1];
            matrix[o] = phi[pb] * y0 + b01 * y1;
            matrix[o + 1] = b10 * y0 + phi[pb + 3] * y1;
          }
        }
      } else {
        const a00 = phi[pa];
        const a01 = transpose ? phi[pa + 2] : phi[pa + 1];
        const a10 = transpose ? phi[pa + 1] : phi[pa + 2];
        const a11 = phi[pa + 3];
        for (let b = 0; b < count; b++) {
          const pb = phiStart[b];
          const o = rowStart + blockStart[b];
          const o2 = o + r;
          if (blockSize[b] === 1) {
            const g = phi[pb];
            const x0 = matrix[o];
            const x1 = matrix[o2];
            matrix[o] = g * (a00 * x0 + a01 * x1);
            matrix[o2] = g * (a10 * x0 + a11 * x1);
          } else {
            const x00 = matrix[o];
            const x01 = matrix[o + 1];
            const x10 = matrix[o2];
            const x11 = matrix[o2 + 1];
            // Left product Y = A X, then Y B^T.
            const y00 = a00 * x00 + a01 * x10;
            const y01 = a00 * x01 + a01 * x11;
            const y10 = a10 * x00 + a11 * x10;
            const y11 = a10 * x01 + a11 * x11;
            const b00 = phi[pb];
            const b01 = transpose ? phi[pb + 2] : phi[pb + 1];
            const b10 = transpose ? phi[pb + 1] : phi[pb + 2];
            const b11 = phi[pb + 3];
            matrix[o] = b00 * y00 + b01 * y01;
            matrix[o + 1] = b10 * y00 + b11 * y01;
            matrix[o2] = b00 * y10 + b01 * y11;
            matrix[o2 + 1] = b10 * y10 + b11 * y11;
          }
        }
      }
    }
  }

  /**
   * Applies Phi (or Phi^T) in place to the strided vector matrix[start + k stride], k = 0..R-1: a column of
   * a matrix (stride R) or, with stride 1, a vector or a row.
   */
  private applyStrided(matrix: Float64Array, start: number, stride: number, transpose: boolean): void {
    const { blockStart, blockSize, phiStart, phi } = this;
    for (let b = 0; b < blockStart.length; b++) {
      const m = blockSize[b];
      const s = start + blockStart[b] * stride;
      const p = phiStart[b];
      if (m === 1) {
        matrix[s] *= phi[p];
      } else if (m === 2) {
        const x0 = matrix[s];
        const x1 = matrix[s + stride];
        const a01 = transpose ? phi[p + 2] : phi[p + 1];
        const a10 = transpose ? phi[p + 1] : phi[p + 2];
        matrix[s] = phi[p] * x0 + a01 * x1;
        matrix[s + stride] = a10 * x0 + phi[p + 3] * x1;
      } else {
        const tmp = this.scratch;
        for (let i = 0; i < m; i++) tmp[i] = matrix[s + i * stride];
        for (let i = 0; i < m; i++) {
          let acc = 0;
          for (let j = 0; j < m; j++) acc += (transpose ? phi[p + j * m + i] : phi[p + i * m + j]) * tmp[j];
          matrix[s + i * stride] = acc;
        }
      }
    }
  }
}
