import { CholeskyDecomposition, Matrix } from "ml-matrix";
import type { PosteriorTarget } from "../inference/index.js";
import { HALF_LOG_TWO_PI } from "../numerics/gaussian-constants.js";

/** The Laplace approximation of a log evidence at a mode. */
export interface LaplaceEvidence {
  /** ln Z ~ ln p(u*) + d/2 ln 2 pi - 1/2 ln det H. */
  readonly logEvidence: number;
  /** Whether -Hessian was positive definite (a true local maximum). */
  readonly positiveDefinite: boolean;
}

/**
 * ln Z = ln integral p(u) du ~ ln p(u*) + (d/2) ln 2 pi - (1/2) ln det H, H = -d^2 ln p / du^2 at the mode
 * u* (MacKay 2003, Information Theory, Inference, and Learning Algorithms, eq. 27.10). `target` must be the
 * unconstrained posterior density including the Jacobian, so that Z is the evidence of the physical model.
 * H comes from central differences of the analytic gradient (step `step` in the unconstrained
 * coordinates), symmetrised.
 */
export function laplaceLogEvidence(target: PosteriorTarget, mode: Float64Array, step = 1e-4): LaplaceEvidence {
  const d = mode.length;
  const value = target.logPosterior(mode);
  if (d === 0) return { logEvidence: value, positiveDefinite: true };
  const cholesky = new CholeskyDecomposition(negativeHessianAt(target, mode, step));
  if (!cholesky.isPositiveDefinite()) return { logEvidence: value, positiveDefinite: false };
  const lower = cholesky.lowerTriangularMatrix;
  let logDet = 0;
  for (let i = 0; i < d; i++) logDet += 2 * Math.log(lower.get(i, i));
  return { logEvidence: value + d * HALF_LOG_TWO_PI - 0.5 * logDet, positiveDefinite: true };
}

/**
 * H = -d^2 ln p / du^2 at `mode` by central differences (step `step`) of the analytic gradient, or of the
 * value when the target has none, symmetrised (common practice). A step this small measures the
 * curvature at the point itself, where the half-standard-deviation steps of `modeCovariance` straddle a
 * flat top or a wall of the density and can miss a maximum that is there.
 */
export function negativeHessianAt(target: PosteriorTarget, mode: Float64Array, step = 1e-4): Matrix {
  const d = mode.length;
  const gradient = target.logPosteriorAndGradient;
  const hessian = new Matrix(d, d);
  const up = new Float64Array(d);
  const down = new Float64Array(d);
  for (let j = 0; j < d; j++) {
    const plus = Float64Array.from(mode);
    const minus = Float64Array.from(mode);
    plus[j] += step;
    minus[j] -= step;
    if (gradient) {
      gradient.call(target, plus, up);
      gradient.call(target, minus, down);
      for (let i = 0; i < d; i++) hessian.set(i, j, -(up[i] - down[i]) / (2 * step));
    } else {
      for (let i = 0; i < d; i++) {
        const f = (a: number, b: number) => {
          const x = Float64Array.from(mode);
          x[i] += a;
          x[j] += b;
          return target.logPosterior(x);
        };
        hessian.set(i, j, -(f(step, step) - f(step, -step) - f(-step, step) + f(-step, -step)) / (4 * step * step));
      }
    }
  }
  for (let i = 0; i < d; i++)
    for (let j = i + 1; j < d; j++) {
      const mean = 0.5 * (hessian.get(i, j) + hessian.get(j, i));
      hessian.set(i, j, mean);
      hessian.set(j, i, mean);
    }
  return hessian;
}
