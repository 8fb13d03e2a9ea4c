import { Matrix, solve } from "ml-matrix";

/**
 * Solves the continuous Lyapunov equation F P + P F^T + B = 0 for P (all m x m, row-major), by
 * vectorisation: (I (x) F + F (x) I) vec(P) = -vec(B) (Horn & Johnson 1991, Topics in Matrix Analysis, 4.4).
 * O(m^6): meant for the small state dimensions of kernels, once per parameter set. For a stable F and
 * B = L L^T, P is the stationary covariance of dx = F x dt + L dW.
 */
export function solveLyapunov(generator: Float64Array, forcing: Float64Array, m: number): Float64Array {
  const size = m * m;
  const system = new Matrix(size, size);
  // Row-major vec: P_ij at index i m + j. (F P)_ij = sum_k F_ik P_kj ; (P F^T)_ij = sum_k P_ik F_jk.
  for (let i = 0; i < m; i++)
    for (let j = 0; j < m; j++) {
      const row = i * m + j;
      for (let k = 0; k < m; k++) {
        system.set(row, k * m + j, system.get(row, k * m + j) + generator[i * m + k]);
        system.set(row, i * m + k, system.get(row, i * m + k) + generator[j * m + k]);
      }
    }
  const rhs = Matrix.columnVector(Array.from(forcing, (v) => -v));
  const solution = solve(system, rhs).getColumn(0);
  const p = Float64Array.from(solution);
  for (let i = 0; i < m; i++)
    for (let j = i + 1; j < m; j++) {
      const mean = 0.5 * (p[i * m + j] + p[j * m + i]);
      p[i * m + j] = mean;
      p[j * m + i] = mean;
    }
  return p;
}
