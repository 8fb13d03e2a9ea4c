import type { PosteriorTarget } from "./posterior-target.js";
import { modeScales } from "./mode-curvature.js";
import { choleskyFactor } from "./student-t-proposal.js";

/**
 * The covariance of the Laplace (Gaussian) approximation at a mode, (-H)^-1 with H the Hessian of ln p,
 * row-major d x d; undefined when -H is not positive definite there (a saddle or a flat direction).
 *
 * H is formed by central differences of the value, with steps of half the conditional standard deviation
 * ({@link modeScales}) in each coordinate: H_ii = [f(+h_i) - 2 f(0) + f(-h_i)] / h_i^2 and
 * H_ij = [f(+h_i +h_j) - f(+h_i -h_j) - f(-h_i +h_j) + f(-h_i -h_j)] / (4 h_i h_j) (common practice).
 * Steps of that size measure the curvature over the bulk of the posterior, not at a point, and keep the
 * likelihood's rounding noise out. Cost: 2d + 1 + 2d + 2d(d - 1) evaluations.
 */
export function modeCovariance(target: PosteriorTarget, mode: Float64Array): Float64Array | undefined {
  const d = target.dimension;
  const scales = modeScales(target, mode, NaN);
  if (scales.some((s) => !Number.isFinite(s))) return undefined;
  const step = Float64Array.from(scales, (s) => 0.5 * s);
  const x = Float64Array.from(mode);
  const at = (i: number, si: number, j = -1, sj = 0): number => {
    x.set(mode);
    x[i] = x[i] + si * step[i];
    if (j >= 0) x[j] = x[j] + sj * step[j];
    return target.logPosterior(x);
  };
  const f0 = target.logPosterior(mode);
  const negativeHessian = new Float64Array(d * d);
  for (let i = 0; i < d; i++) {
    negativeHessian[i * d + i] = -(at(i, 1) - 2 * f0 + at(i, -1)) / (step[i] * step[i]);
    for (let j = 0; j < i; j++) {
      const h = (at(i, 1, j, 1) - at(i, 1, j, -1) - at(i, -1, j, 1) + at(i, -1, j, -1)) / (4 * step[i] * step[j]);
      negativeHessian[i * d + j] = -h;
      negativeHessian[j * d + i] = -h;
    }
  }
  if (!negativeHessian.every(Number.isFinite)) return undefined;
  const l = choleskyFactor(negativeHessian, d);
  if (l === undefined) return undefined;
  return inverseFromCholesky(l, d);
}

/** (L L^T)^-1 from the lower Cholesky factor L (row-major), column by column by two triangular solves. */
export function inverseFromCholesky(l: Float64Array, d: number): Float64Array {
  const inverse = new Float64Array(d * d);
  const y = new Float64Array(d);
  for (let c = 0; c < d; c++) {
    for (let i = 0; i < d; i++) {
      let sum = i === c ? 1 : 0;
      for (let k = 0; k < i; k++) sum -= l[i * d + k] * y[k];
      y[i] = sum / l[i * d + i];
    }
    for (let i = d - 1; i >= 0; i--) {
      let sum = y[i];
      for (let k = i + 1; k < d; k++) sum -= l[k * d + i] * inverse[k * d + c];
      inverse[i * d + c] = sum / l[i * d + i];
    }
  }
  return inverse;
}
