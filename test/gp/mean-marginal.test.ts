import { CholeskyDecomposition, Matrix } from "ml-matrix";
import { describe, expect, it } from "vitest";
import { GaussianProcess } from "../../src/gp/gaussian-process.js";
import { kernels, type Kernel } from "../../src/kernels/index.js";
import { createRng } from "../../src/random/rng.js";
import { randomErrors, seasonalTimes } from "../helpers/seasonal-times.js";

/**
 * Reference: dense linear algebra (ml-matrix Cholesky) on the definitions. Integrating a constant mean
 * mu ~ N(m0, s^2) out of y ~ N(mu 1, K) gives y ~ N(m0 1, K + s^2 1 1^T); the posterior of mu is normal
 * with precision 1^T K^-1 1 + 1/s^2 and mean (m0/s^2 + 1^T K^-1 y) / precision (Rybicki & Press 1992,
 * ApJ 398, 169, sec. 2; any textbook on Bayesian linear regression).
 */
function denseReference(kernel: Kernel, t: Float64Array, errors: Float64Array, y: Float64Array, m0: number, s: number) {
  const n = t.length;
  const k = new Matrix(n, n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) k.set(i, j, kernel.covarianceAt(t[i] - t[j]) + (i === j ? errors[i] * errors[i] : 0));
  const logNormal = (cov: Matrix, r: number[]) => {
    const chol = new CholeskyDecomposition(cov);
    const l = chol.lowerTriangularMatrix;
    let logDet = 0;
    for (let i = 0; i < n; i++) logDet += 2 * Math.log(l.get(i, i));
    const solved = chol.solve(Matrix.columnVector(r)).getColumn(0);
    const quadratic = r.reduce((sum, ri, i) => sum + ri * solved[i], 0);
    return -0.5 * (quadratic + logDet + n * Math.log(2 * Math.PI));
  };
  const withPrior = k.clone().add(Matrix.ones(n, n).mul(s * s));
  const value = logNormal(withPrior, Array.from(y, (v) => v - m0));
  const chol = new CholeskyDecomposition(k);
  const ones = chol.solve(Matrix.ones(n, 1)).getColumn(0);
  const a = ones.reduce((x, v) => x + v, 0);
  const b = ones.reduce((x, v, i) => x + v * y[i], 0);
  const precision = a + 1 / (s * s);
  return { value, mean: (m0 / (s * s) + b) / precision, sd: 1 / Math.sqrt(precision) };
}

describe("constant mean integrated out (GaussianProcess.meanMarginal)", () => {
  const rng = createRng("mean-marginal");
  const t = seasonalTimes(rng, { seasons: 3, perSeason: 60 });
  const errors = randomErrors(rng, t.length);
  const cases: Array<[string, Kernel]> = [
    ["damped random walk (written-out recursion)", kernels.dampedRandomWalk({ sigma: 0.3, tau: 150 })],
    ["quasi-periodic + damped random walk", kernels.quasiPeriodic({ sigma: 0.1, period: 23, decayTime: 29, harmonicWeight: 0.3 }).plus(kernels.dampedRandomWalk({ sigma: 0.2, tau: 300 }))],
    ["oscillator x damped random walk (generic block)", kernels.oscillator({ sigma: 0.5, period: 40, quality: 3 }).times(kernels.dampedRandomWalk({ sigma: 0.4, tau: 200 }))],
    ["product of oscillators (factorisation fallback)", kernels.oscillator({ sigma: 0.5, period: 40, quality: 3 }).times(kernels.oscillator({ sigma: 1, period: 90, quality: 2 }))],
  ];
  it.each(cases)("%s: marginal likelihood and the mean's posterior agree with dense algebra to 1e-9", (_, kernel) => {
    const gp = new GaussianProcess(kernel, t, { errors });
    const y = gp.priorDraw(rng).map((v, i) => v + 19.3 + errors[i] * rng.normal());
    const prior = { mean: 19, sd: 2.5 };
    const result = gp.meanMarginal(y, prior);
    const reference = denseReference(kernel, t, errors, y, prior.mean, prior.sd);
    expect(Math.abs(result.logLikelihood - reference.value) / Math.abs(reference.value)).toBeLessThan(1e-9);
    expect(Math.abs(result.meanPosterior.mean - reference.mean)).toBeLessThan(1e-9 * Math.abs(reference.mean));
    expect(Math.abs(result.meanPosterior.sd - reference.sd) / reference.sd).toBeLessThan(1e-9);
  });

  it("equals the log-likelihood at the posterior mean plus the Gaussian integral over mu (flat prior)", () => {
    // For a flat prior, integral of N(y | mu 1, K) d mu = N(y | mu_hat 1, K) sqrt(2 pi / a), a = 1^T K^-1 1.
    const kernel = kernels.dampedRandomWalk({ sigma: 0.25, tau: 80 });
    const gp = new GaussianProcess(kernel, t, { errors });
    const y = gp.priorDraw(rng).map((v) => v + 18.2);
    const { logLikelihood, meanPosterior } = gp.meanMarginal(y, { mean: 0, sd: Infinity });
    const atMean = gp.withKernel(kernel, { mean: meanPosterior.mean }).logLikelihood(y);
    const a = 1 / (meanPosterior.sd * meanPosterior.sd);
    expect(logLikelihood).toBeCloseTo(atMean + 0.5 * Math.log((2 * Math.PI) / a), 8);
  });
});
