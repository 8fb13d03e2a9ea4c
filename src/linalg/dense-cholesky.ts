import { CholeskyDecomposition, Matrix } from "ml-matrix";
import { FactorizationError } from "./factorization-error.js";

/**
 * A dense Cholesky factorisation K = L L^T (ml-matrix), O(N^3): the fallback for kernels with no
 * semiseparable form, for small data, and the reference the O(N) engine is tested against.
 */
export class DenseCholesky {
  private readonly decomposition: CholeskyDecomposition;
  readonly size: number;

  constructor(matrix: Matrix) {
    this.size = matrix.rows;
    this.decomposition = new CholeskyDecomposition(matrix);
    if (!this.decomposition.isPositiveDefinite()) throw new FactorizationError(-1, NaN);
  }

  /** The lower-triangular factor L. */
  get lower(): Matrix {
    return this.decomposition.lowerTriangularMatrix;
  }

  /** K^{-1} b. */
  solve(b: ArrayLike<number>): Float64Array {
    const column = Matrix.columnVector(Array.from(b));
    return Float64Array.from(this.decomposition.solve(column).getColumn(0));
  }

  /** log det K = 2 sum log L_ii. */
  logDeterminant(): number {
    const l = this.lower;
    let total = 0;
    for (let i = 0; i < this.size; i++) total += 2 * Math.log(l.get(i, i));
    return total;
  }

  /** L xi. */
  correlate(xi: ArrayLike<number>): Float64Array {
    const l = this.lower;
    const out = new Float64Array(this.size);
    for (let i = 0; i < this.size; i++) {
      let acc = 0;
      for (let j = 0; j <= i; j++) acc += l.get(i, j) * xi[j];
      out[i] = acc;
    }
    return out;
  }

  /** K^{-1} as a dense matrix. */
  inverse(): Matrix {
    return this.decomposition.solve(Matrix.eye(this.size));
  }
}
