import { FactorizationError } from "./factorization-error.js";
import { SemiseparableFactorization } from "./semiseparable-factorization.js";
import type { SemiseparableForm } from "./semiseparable-form.js";
import { runUnrolled, unrolledRecursion } from "./unrolled-recursion.js";
import { LOG_TWO_PI } from "../numerics/gaussian-constants.js";

/** A normal prior on the constant mean of a Gaussian process. */
export interface MeanPrior {
  readonly mean: number;
  /** Prior standard deviation (> 0; Infinity for a flat prior). */
  readonly sd: number;
}

/** The marginal likelihood and the posterior of the mean given the kernel. */
export interface MeanMarginal {
  /** log p(y | kernel) = log N(y | m0 1, K + s^2 1 1^T) (for a flat prior: log of the integral over mu). */
  readonly logLikelihood: number;
  /** Posterior mean and standard deviation of the constant mean given the kernel and y. */
  readonly meanPosterior: { readonly mean: number; readonly sd: number };
}

/**
 * The likelihood of the data with a constant mean mu integrated out under a normal prior N(m0, s^2),
 * and the Gaussian posterior of mu given the kernel (Rybicki & Press 1992, ApJ 398, 169, sec. 2: the
 * mean of a light curve as a linear parameter of a Gaussian process). With r = y - m0 and the sums
 * a = 1^T K^-1 1, b = 1^T K^-1 r, c = r^T K^-1 r (K includes the noise):
 *
 *     log p(y) = -1/2 [c - b^2 / P + log det K + log(1 + s^2 a) + n log 2 pi],  P = a + 1/s^2,
 *     mu | y ~ N(m0 + b / P, 1 / P).
 *
 * a, b and c come out of one pass of the recursion run on two right-hand sides, r and a column of ones
 * (the written-out recursion of unrolled-recursion.ts); for layouts it does not cover (products of
 * kernels) a factorisation and two solves. With s = Infinity the prior is flat (density 1) and the result
 * is the integral of N(y | mu 1, K) over mu: log(1 + s^2 a) becomes log(a / 2 pi).
 *
 * @throws FactorizationError when K is not positive definite for these data
 */
export function semiseparableMeanMarginal(
  form: SemiseparableForm,
  time: ArrayLike<number>,
  noiseVariance: ArrayLike<number>,
  values: ArrayLike<number>,
  prior: MeanPrior,
): MeanMarginal {
  const n = time.length;
  const m0 = prior.mean;
  const { a, b, c, logDeterminant } = quadraticSums(form, time, noiseVariance, values, m0);
  const priorPrecision = prior.sd === Infinity ? 0 : 1 / (prior.sd * prior.sd);
  const precision = a + priorPrecision;
  const logPriorTerm = priorPrecision === 0 ? Math.log(a) - LOG_TWO_PI : Math.log1p(a / priorPrecision);
  const logLikelihood = -0.5 * (c - (b * b) / precision + logDeterminant + logPriorTerm + n * LOG_TWO_PI);
  if (!(logLikelihood > -Infinity && logLikelihood < Infinity && precision > 0)) throw new FactorizationError(n - 1, NaN);
  return { logLikelihood, meanPosterior: { mean: m0 + b / precision, sd: 1 / Math.sqrt(precision) } };
}

/** a = 1^T K^-1 1, b = 1^T K^-1 (y - m0), c = (y - m0)^T K^-1 (y - m0) and log det K. */
function quadraticSums(
  form: SemiseparableForm,
  time: ArrayLike<number>,
  noiseVariance: ArrayLike<number>,
  values: ArrayLike<number>,
  m0: number,
): { a: number; b: number; c: number; logDeterminant: number } {
  const n = time.length;
  const unrolled = unrolledRecursion(form.blocks, { constantColumn: true });
  if (unrolled) {
    const totals = runUnrolled(unrolled, form, time, noiseVariance, values, m0, true);
    return { a: totals.columnQuadratic, b: totals.crossQuadratic, c: totals.quadratic, logDeterminant: totals.logDeterminant };
  }
  const factorization = new SemiseparableFactorization(form, time, noiseVariance);
  const residual = Float64Array.from(values, (y) => y - m0);
  const solvedResidual = factorization.solve(residual);
  const solvedOnes = factorization.solve(new Float64Array(n).fill(1));
  let a = 0;
  let b = 0;
  let c = 0;
  for (let i = 0; i < n; i++) {
    a += solvedOnes[i];
    b += solvedResidual[i];
    c += residual[i] * solvedResidual[i];
  }
  return { a, b, c, logDeterminant: factorization.logDeterminant() };
}
