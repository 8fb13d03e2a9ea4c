import { describe, expect, it } from "vitest";
import { GaussianProcess } from "../../src/gp/gaussian-process.js";
import { kernels, type Kernel } from "../../src/kernels/index.js";
import { FactorizationError } from "../../src/linalg/factorization-error.js";
import { createRng } from "../../src/random/rng.js";
import { centralDifference } from "../helpers/central-difference.js";
import { randomErrors, seasonalTimes } from "../helpers/seasonal-times.js";

const families: Array<[string, Kernel]> = [
  ["damped random walk", kernels.dampedRandomWalk({ sigma: 0.3, tau: 40 })],
  ["oscillator", kernels.oscillator({ sigma: 0.2, period: 17, quality: 3 })],
  ["overdamped oscillator", kernels.oscillator({ sigma: 0.2, period: 17, quality: 0.2 })],
  ["quasi-periodic", kernels.quasiPeriodic({ sigma: 0.1, period: 9.4, decayTime: 15, harmonicWeight: 0.3 })],
  ["matern32", kernels.matern32({ sigma: 0.15, scale: 6 })],
  ["product", kernels.oscillator({ sigma: 0.5, period: 12, quality: 2 }).times(kernels.dampedRandomWalk({ sigma: 0.4, tau: 60 }))],
];

describe("log-likelihood gradient against central finite differences", () => {
  // Reference: the symmetric difference quotient (f(x + h) - f(x - h)) / 2h, truncation error O(h^2).
  for (const [name, kernel] of families) {
    it(name, () => {
      const rng = createRng(`fd:${name}`);
      const t = seasonalTimes(rng, { seasons: 2, perSeason: 80 });
      const errors = randomErrors(rng, t.length);
      const build = (k: Kernel, mean: number, jitter: number) => new GaussianProcess(k, t, { errors, mean, jitter });
      const y = build(kernel, 1.5, 0.03).priorDraw(rng).map((v, i) => v + errors[i] * rng.normal());
      const g = build(kernel, 1.5, 0.03).logLikelihoodGradient(y);
      const theta = kernel.parameterValues;
      for (let c = 0; c < theta.length; c++) {
        const fd = centralDifference((shifted) => build(kernel.withParameters(shifted), 1.5, 0.03).logLikelihood(y), theta, c, 1e-5);
        expect(Math.abs(g.kernel[c] - fd)).toBeLessThan(1e-5 * Math.max(1, Math.abs(fd)));
      }
      const fdMean = (build(kernel, 1.5 + 1e-6, 0.03).logLikelihood(y) - build(kernel, 1.5 - 1e-6, 0.03).logLikelihood(y)) / 2e-6;
      expect(Math.abs(g.mean - fdMean)).toBeLessThan(1e-5 * Math.max(1, Math.abs(fdMean)));
      const fdJitter = (build(kernel, 1.5, 0.03 + 1e-7).logLikelihood(y) - build(kernel, 1.5, 0.03 - 1e-7).logLikelihood(y)) / 2e-7;
      expect(Math.abs(g.jitter - fdJitter)).toBeLessThan(1e-5 * Math.max(1, Math.abs(fdJitter)));
    });
  }
});

describe("numerical robustness", () => {
  it("Julian dates near 2.46e6 with minute spacings give the log-likelihood of the series shifted to zero, to 1e-9", () => {
    const rng = createRng("julian");
    const minutes = Float64Array.from({ length: 3000 }, (_, i) => (i * 2 + rng.uniform()) / 1440);
    const jd = minutes.map((t) => 2_460_123.5 + t);
    const kernel = kernels.quasiPeriodic({ sigma: 0.01, period: 0.37, decayTime: 3.5, harmonicWeight: 0.2 });
    const y = new GaussianProcess(kernel, minutes, { errors: 0.001 }).priorDraw(rng);
    const shifted = jd.map((t) => t - jd[0]);
    const a = new GaussianProcess(kernel, jd, { errors: 0.001 }).logLikelihood(y);
    const b = new GaussianProcess(kernel, shifted, { errors: 0.001 }).logLikelihood(y);
    expect(Math.abs(a - b) / Math.abs(b)).toBeLessThan(1e-9);
  });

  it("a factorisation that breaks down raises FactorizationError, never NaN", () => {
    // Two identical times with no noise make the covariance matrix singular (common practice).
    const gp = new GaussianProcess(kernels.dampedRandomWalk({ sigma: 1, tau: 10 }), [0, 1, 1, 2], { errors: 0 });
    expect(() => gp.logLikelihood([0, 0.1, 0.2, 0.3])).toThrow(FactorizationError);
    expect(() => gp.logLikelihoodGradient([0, 0.1, 0.2, 0.3])).toThrow(/not positive definite/);
  });

  it("rejects unsorted or non-finite inputs with a RangeError", () => {
    const k = kernels.dampedRandomWalk({ sigma: 1, tau: 10 });
    expect(() => new GaussianProcess(k, [0, 2, 1])).toThrow(/sorted/);
    expect(() => new GaussianProcess(k, [0, NaN])).toThrow(/time\[1\]/);
    expect(() => new GaussianProcess(k, [0, 1], { errors: [0.1, -1] })).toThrow(/errors\[1\]/);
    expect(() => new GaussianProcess(k, [0, 1]).logLikelihood([0, Infinity])).toThrow(/values\[1\]/);
    // Values are checked within the recursion's pass, yet the error still names the bad value.
    const several = new GaussianProcess(k, [0, 1, 2, 3], { errors: 0.1 });
    expect(() => several.logLikelihood([0, 0.1, NaN, 0.3])).toThrow(/values\[2\] is not finite/);
    expect(() => several.logLikelihood([0, 0.1, 0.2, -Infinity])).toThrow(/values\[3\] is not finite/);
    expect(() => several.meanMarginal([NaN, 0.1, 0.2, 0.3], { mean: 0, sd: 1 })).toThrow(/values\[0\] is not finite/);
    expect(() => several.logLikelihood([0, 0.1, 0.2])).toThrow(/3 values for 4 times/);
    expect(() => new GaussianProcess(kernels.periodicSquaredExponential({ sigma: 1, period: 2, scale: 3, gamma: 1 }), [0, 1])).toThrow(
      /DenseGaussianProcess/,
    );
  });
});

describe("draws", () => {
  it("the sample covariance of prior draws matches the kernel (fixed seed)", () => {
    // Reference: for n Gaussian draws the sample covariance of entries (i, j) has standard error
    // sqrt((K_ii K_jj + K_ij^2) / n) (Anderson 2003, An Introduction to Multivariate Statistical Analysis, 3.4).
    const kernel = kernels.quasiPeriodic({ sigma: 1, period: 5, decayTime: 6.4, harmonicWeight: 0.3 }).plus(kernels.dampedRandomWalk({ sigma: 0.5, tau: 20 }));
    const t = Float64Array.from([0, 0.5, 1.3, 2, 4.1, 7, 7.2, 15, 40, 41]);
    const gp = new GaussianProcess(kernel, t);
    const rng = createRng("prior-draws");
    const n = 6000;
    const m = t.length;
    const sums = new Float64Array(m * m);
    for (let d = 0; d < n; d++) {
      const x = gp.priorDraw(rng);
      for (let i = 0; i < m; i++) for (let j = 0; j < m; j++) sums[i * m + j] += x[i] * x[j];
    }
    let worst = 0;
    for (let i = 0; i < m; i++)
      for (let j = 0; j < m; j++) {
        const kij = kernel.covarianceAt(t[i] - t[j]);
        const se = Math.sqrt((kernel.variance ** 2 + kij * kij) / n);
        worst = Math.max(worst, Math.abs(sums[i * m + j] / n - kij) / se);
      }
    // 100 entries (55 distinct): 4.5 standard errors is exceeded with probability < 1e-3.
    expect(worst).toBeLessThan(4.5);
  });

  it("conditional draws reproduce the predictive mean and variance (fixed seed)", () => {
    const rng = createRng("conditional-draws");
    const kernel = kernels.oscillator({ sigma: 0.3, period: 20, quality: 2 });
    const t = seasonalTimes(rng, { seasons: 2, perSeason: 25 });
    const errors = randomErrors(rng, t.length);
    const gp = new GaussianProcess(kernel, t, { errors, mean: 2 });
    const y = gp.priorDraw(rng).map((v, i) => v + errors[i] * rng.normal());
    const tNew = Float64Array.from([-30, 100, 250, 300, 500, 800]);
    const given = gp.given(y);
    const { mean, variance } = given.at(tNew);
    const n = 4000;
    const s1 = new Float64Array(tNew.length);
    const s2 = new Float64Array(tNew.length);
    for (let d = 0; d < n; d++) {
      const x = given.draw(rng, tNew);
      for (let i = 0; i < x.length; i++) {
        s1[i] += x[i];
        s2[i] += x[i] * x[i];
      }
    }
    for (let i = 0; i < tNew.length; i++) {
      const m = s1[i] / n;
      const v = s2[i] / n - m * m;
      expect(Math.abs(m - mean[i]) / Math.sqrt(variance[i] / n)).toBeLessThan(4.5);
      // The sample variance of n normal draws has relative standard error sqrt(2 / n).
      expect(Math.abs(v / variance[i] - 1)).toBeLessThan(4.5 * Math.sqrt(2 / n));
    }
  });

  it("the same seed gives the same draws bit for bit", () => {
    const gp = new GaussianProcess(kernels.matern32({ sigma: 1, scale: 3 }), [0, 1, 2, 5, 9]);
    expect(Array.from(gp.priorDraw(createRng(7)))).toEqual(Array.from(gp.priorDraw(createRng(7))));
  });
});
