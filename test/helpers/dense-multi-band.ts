import { CholeskyDecomposition, Matrix } from "ml-matrix";
import type { Kernel } from "../../src/kernels/index.js";
import { formCovarianceDerivatives } from "../../src/linalg/semiseparable-form.js";

/** One band of test data. */
export interface DenseBand {
  readonly time: Float64Array;
  readonly errors: Float64Array;
  readonly values: Float64Array;
}

/** Per-band parameters, one entry per band. */
export interface DenseBandParameters {
  readonly amplitude: readonly number[];
  readonly mean: readonly number[];
  readonly jitter: readonly number[];
  readonly lag: readonly number[];
}

/**
 * The joint multi-band Gaussian likelihood, its gradient and predictions on dense linear algebra (ml-matrix
 * Cholesky), written straight from the covariance C_ij = a_i a_j k(t_i - l_i - t_j + l_j) + delta_ij
 * (e_i^2 + j_i^2) with no reordering and no scaling: the reference the semiseparable joint process is
 * tested against. Gradient: d log L / d theta = 1/2 tr((alpha alpha^T - C^-1) dC/dtheta) and d/d m = the
 * sum of alpha over the band (Rasmussen & Williams 2006, eq. 5.9); predictions by their eq. 2.25-2.26.
 */
export function denseMultiBand(kernel: Kernel, bands: readonly DenseBand[], parameters: DenseBandParameters) {
  const { band, time, values, a, covariance } = denseCovariance(kernel, bands, parameters);
  const n = time.length;
  const residual = values.map((v, i) => v - parameters.mean[band[i]]);
  const cholesky = new CholeskyDecomposition(covariance);
  const alpha = cholesky.solve(Matrix.columnVector(residual)).getColumn(0);
  const lower = cholesky.lowerTriangularMatrix;
  let logDet = 0;
  for (let i = 0; i < n; i++) logDet += 2 * Math.log(lower.get(i, i));
  let quadratic = 0;
  for (let i = 0; i < n; i++) quadratic += residual[i] * alpha[i];
  const value = -0.5 * quadratic - 0.5 * logDet - 0.5 * n * Math.log(2 * Math.PI);

  const gradient = () => {
    const inverse = cholesky.solve(Matrix.eye(n, n));
    const form = kernel.semiseparableForm()!;
    const count = kernel.parameterNames.length;
    const bandCount = bands.length;
    const kernelBar = new Float64Array(count);
    const amplitude = new Float64Array(bandCount);
    const mean = new Float64Array(bandCount);
    const jitter = new Float64Array(bandCount);
    const lag = new Float64Array(bandCount);
    for (let i = 0; i < n; i++) {
      mean[band[i]] += alpha[i];
      jitter[band[i]] += (alpha[i] * alpha[i] - inverse.get(i, i)) * parameters.jitter[band[i]];
      for (let j = 0; j < n; j++) {
        const weight = 0.5 * (alpha[i] * alpha[j] - inverse.get(i, j));
        const tau = time[i] - time[j];
        const derivative = formCovarianceDerivatives(form, tau);
        for (let c = 0; c < count; c++) kernelBar[c] += weight * a[i] * a[j] * derivative[c];
        const k = kernel.covarianceAt(tau);
        amplitude[band[i]] += weight * a[j] * k;
        amplitude[band[j]] += weight * a[i] * k;
        if (i !== j) {
          const slope = a[i] * a[j] * kernelSlope(kernel, tau);
          lag[band[i]] -= weight * slope;
          lag[band[j]] += weight * slope;
        }
      }
    }
    return { value, kernel: kernelBar, amplitude, mean, jitter, lag };
  };

  const predict = (c: number, targets: ArrayLike<number>) => {
    const m = targets.length;
    const mean = new Float64Array(m);
    const variance = new Float64Array(m);
    const ac = parameters.amplitude[c];
    for (let k = 0; k < m; k++) {
      const s = targets[k] - parameters.lag[c];
      const cross = time.map((t, i) => a[i] * ac * kernel.covarianceAt(t - s));
      const solved = cholesky.solve(Matrix.columnVector(cross)).getColumn(0);
      let mu = 0;
      let explained = 0;
      for (let i = 0; i < n; i++) {
        mu += cross[i] * alpha[i];
        explained += cross[i] * solved[i];
      }
      mean[k] = parameters.mean[c] + mu;
      variance[k] = ac * ac * kernel.covarianceAt(0) - explained;
    }
    return { mean, variance };
  };
  return { value, gradient, predict };
}

/** The bands laid out one after another: band, shifted time and value of each point, and the covariance C. */
function denseCovariance(kernel: Kernel, bands: readonly DenseBand[], parameters: DenseBandParameters) {
  const band: number[] = [];
  const time: number[] = [];
  const noise: number[] = [];
  const values: number[] = [];
  bands.forEach((b, c) => {
    for (let i = 0; i < b.time.length; i++) {
      band.push(c);
      time.push(b.time[i] - parameters.lag[c]);
      noise.push(b.errors[i] ** 2 + parameters.jitter[c] ** 2);
      values.push(b.values[i]);
    }
  });
  const n = time.length;
  const a = band.map((c) => parameters.amplitude[c]);
  const covariance = new Matrix(n, n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) covariance.set(i, j, a[i] * a[j] * kernel.covarianceAt(time[i] - time[j]) + (i === j ? noise[i] : 0));
  return { band, time, values, a, covariance };
}

/** dk/dtau by Richardson-extrapolated central differences (accurate to ~1e-11 relative away from tau = 0). */
function kernelSlope(kernel: Kernel, tau: number): number {
  const h = 1e-3 * Math.max(Math.abs(tau), 1e-3);
  const central = (step: number) => (kernel.covarianceAt(tau + step) - kernel.covarianceAt(tau - step)) / (2 * step);
  const d1 = central(h);
  const d2 = central(h / 2);
  const d4 = central(h / 4);
  const r1 = (4 * d2 - d1) / 3;
  const r2 = (4 * d4 - d2) / 3;
  return (16 * r2 - r1) / 15;
}

/**
 * log N(y | X m0, C + X diag(s^2) X^T) (X the band indicators): the likelihood with the band means
 * integrated over their normal priors, written densely; and the means' posterior mean
 * (diag(1/s^2) + X^T C^-1 X)^-1 (diag(1/s^2) m0 + X^T C^-1 y) (Rasmussen & Williams 2006, eq. 2.42 for a
 * linear mean with a Gaussian prior).
 */
export function denseMeanMarginal(
  kernel: Kernel,
  bands: readonly DenseBand[],
  parameters: DenseBandParameters,
  priors: readonly { mean: number; sd: number }[],
) {
  const { band, time, values: y, covariance: c } = denseCovariance(kernel, bands, parameters);
  const n = time.length;
  const marginal = c.clone();
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) if (band[i] === band[j]) marginal.set(i, j, marginal.get(i, j) + priors[band[i]].sd ** 2);
  const residual = y.map((v, i) => v - priors[band[i]].mean);
  const cholesky = new CholeskyDecomposition(marginal);
  const alpha = cholesky.solve(Matrix.columnVector(residual)).getColumn(0);
  let logDet = 0;
  for (let i = 0; i < n; i++) logDet += 2 * Math.log(cholesky.lowerTriangularMatrix.get(i, i));
  let quadratic = 0;
  for (let i = 0; i < n; i++) quadratic += residual[i] * alpha[i];
  const logLikelihood = -0.5 * quadratic - 0.5 * logDet - 0.5 * n * Math.log(2 * Math.PI);

  const B = bands.length;
  const x = new Matrix(n, B);
  for (let i = 0; i < n; i++) x.set(i, band[i], 1);
  const cInverse = new CholeskyDecomposition(c);
  const cx = cInverse.solve(x);
  const cy = cInverse.solve(Matrix.columnVector(y));
  const precision = x.transpose().mmul(cx);
  const rhs = x.transpose().mmul(cy);
  for (let b = 0; b < B; b++) {
    precision.set(b, b, precision.get(b, b) + 1 / priors[b].sd ** 2);
    rhs.set(b, 0, rhs.get(b, 0) + priors[b].mean / priors[b].sd ** 2);
  }
  const symmetric = precision.add(precision.transpose()).mul(0.5); // X^T C^-1 X is symmetric up to rounding
  const mean = new CholeskyDecomposition(symmetric).solve(rhs).getColumn(0);
  return { logLikelihood, mean };
}
