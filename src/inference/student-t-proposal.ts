import type { Rng } from "../random/rng.js";
import { studentTLogPdf } from "./distribution-functions.js";

/**
 * A multivariate Student-t distribution with location m, scale matrix L L^T and nu degrees of freedom
 * (integer), as an importance-sampling proposal. Its density
 *   ln q(x) = ln C(d, nu) - ln |L| - ((nu + d) / 2) ln(1 + r^2 / nu),  C = Gamma((nu + d) / 2) / (Gamma(nu / 2) (nu pi)^(d / 2)),
 * r = |L^-1 (x - m)|, has polynomial tails, so that importance ratios against a target with roughly
 * Gaussian tails stay bounded (Geweke 1989, Econometrica 57, 1317: a proposal must have heavier tails
 * than the target). Draws: x = m + L z sqrt(nu / chi^2_nu), z standard normal.
 */
export interface StudentTProposal {
  readonly dimension: number;
  readonly degreesOfFreedom: number;
  readonly location: Float64Array;
  /** Lower-triangular Cholesky factor L of the scale matrix, row-major d x d. */
  readonly choleskyFactor: Float64Array;
  /** Writes a draw into `out` and returns ln q of it. */
  draw(rng: Rng, out: Float64Array): number;
  /** ln q(x), normalised. */
  logDensity(x: Float64Array): number;
}

/**
 * Lower Cholesky factor of a symmetric positive-definite matrix (row-major d x d), or undefined when it
 * is not positive definite (Golub & Van Loan, Matrix Computations, alg. 4.2.1).
 */
export function choleskyFactor(matrix: ArrayLike<number>, d: number): Float64Array | undefined {
  const l = new Float64Array(d * d);
  for (let j = 0; j < d; j++) {
    let diagonal = matrix[j * d + j];
    for (let k = 0; k < j; k++) diagonal -= l[j * d + k] * l[j * d + k];
    if (!(diagonal > 0) || !Number.isFinite(diagonal)) return undefined;
    const root = Math.sqrt(diagonal);
    l[j * d + j] = root;
    for (let i = j + 1; i < d; i++) {
      let sum = matrix[i * d + j];
      for (let k = 0; k < j; k++) sum -= l[i * d + k] * l[j * d + k];
      l[i * d + j] = sum / root;
    }
  }
  return l;
}

/**
 * ln C(d, nu) = ln Gamma((nu + d) / 2) - ln Gamma(nu / 2) - (d / 2) ln(nu pi), the normalising constant of a
 * d-dimensional Student-t with unit scale. By Gamma(x + 1) = x Gamma(x), the Gamma ratio is a product of
 * d / 2 factors nu / 2 + k for even d; for odd d it starts from the univariate ratio, which is the
 * univariate t density at 0 (stdlib) times sqrt(nu pi).
 */
export function studentTLogNormaliser(d: number, nu: number): number {
  let logRatio = 0;
  let base = nu / 2;
  if (d % 2 === 1) {
    logRatio = studentTLogPdf(0, nu) + 0.5 * Math.log(nu * Math.PI);
    base = (nu + 1) / 2;
  }
  for (let k = 0; k < Math.floor(d / 2); k++) logRatio += Math.log(base + k);
  return logRatio - (d / 2) * Math.log(nu * Math.PI);
}

/**
 * The Student-t proposal with the given location, scale matrix (row-major d x d, symmetric positive
 * definite) and integer degrees of freedom. Throws a RangeError when the scale is not positive definite.
 */
export function studentTProposal(location: ArrayLike<number>, scaleMatrix: ArrayLike<number>, degreesOfFreedom: number): StudentTProposal {
  const d = location.length;
  if (!(Number.isInteger(degreesOfFreedom) && degreesOfFreedom >= 1)) {
    throw new RangeError(`Student-t proposal: degrees of freedom must be a positive integer, got ${degreesOfFreedom}`);
  }
  const l = choleskyFactor(scaleMatrix, d);
  if (l === undefined) throw new RangeError("Student-t proposal: the scale matrix is not positive definite");
  const m = Float64Array.from(location);
  const nu = degreesOfFreedom;
  let logDetL = 0;
  for (let i = 0; i < d; i++) logDetL += Math.log(l[i * d + i]);
  const constant = studentTLogNormaliser(d, nu) - logDetL;
  const z = new Float64Array(d);
  const logDensityOfSquare = (r2: number) => constant - ((nu + d) / 2) * Math.log1p(r2 / nu);
  return {
    dimension: d,
    degreesOfFreedom: nu,
    location: m,
    choleskyFactor: l,
    draw(rng: Rng, out: Float64Array): number {
      let chiSquare = 0;
      for (let k = 0; k < nu; k++) {
        const g = rng.normal();
        chiSquare += g * g;
      }
      const stretch = Math.sqrt(nu / chiSquare);
      let r2 = 0;
      for (let i = 0; i < d; i++) {
        z[i] = rng.normal();
        r2 += z[i] * z[i];
      }
      for (let i = 0; i < d; i++) {
        let sum = 0;
        for (let k = 0; k <= i; k++) sum += l[i * d + k] * z[k];
        out[i] = m[i] + stretch * sum;
      }
      return logDensityOfSquare(r2 * stretch * stretch);
    },
    logDensity(x: Float64Array): number {
      // Forward substitution: z = L^-1 (x - m).
      let r2 = 0;
      for (let i = 0; i < d; i++) {
        let sum = x[i] - m[i];
        for (let k = 0; k < i; k++) sum -= l[i * d + k] * z[k];
        z[i] = sum / l[i * d + i];
        r2 += z[i] * z[i];
      }
      return logDensityOfSquare(r2);
    },
  };
}
