import tPdf from "@stdlib/stats/base/dists/t/pdf";
import tQuantile from "@stdlib/stats/base/dists/t/quantile";
import { describe, expect, it } from "vitest";
import { importanceSample, type ImportanceSample } from "../../src/inference/importance-sampling.js";
import { paretoSmoothedWeights } from "../../src/inference/pareto-smoothed-weights.js";
import type { PosteriorTarget } from "../../src/inference/posterior-target.js";
import { createRng } from "../../src/random/rng.js";
import { correlatedGaussian } from "./helpers/known-targets.js";
import { weightedQuantile } from "./helpers/weighted-quantile.js";

const PROBABILITIES = [0.025, 0.16, 0.5, 0.84, 0.975];

/**
 * A d-dimensional multivariate Student-t with nu degrees of freedom, location 0 and identity scale:
 * ln p = -((nu + d) / 2) ln(1 + |x|^2 / nu). Each marginal is a univariate t with nu degrees of freedom
 * (Kotz & Nadarajah 2004, Multivariate t Distributions, sec. 1.10), quantiles from stdlib.
 */
function multivariateT(d: number, nu: number): PosteriorTarget {
  return {
    dimension: d,
    logPosterior: (x) => {
      let r2 = 0;
      for (let i = 0; i < d; i++) r2 += x[i] * x[i];
      return -((nu + d) / 2) * Math.log1p(r2 / nu);
    },
  };
}

/**
 * The quantile check: |estimate - exact| within 4 standard errors, se = sqrt(p (1 - p) / ESS) / f(q_p)
 * (the asymptotic sd of a sample quantile, Serfling 1980, sec. 2.3, with the weights' ESS for the sample size).
 */
function expectQuantiles(sample: ImportanceSample, exact: (i: number, p: number) => number, density: (i: number, x: number) => number, d: number): void {
  for (let i = 0; i < d; i++) {
    for (const p of PROBABILITIES) {
      const q = exact(i, p);
      const se = Math.sqrt((p * (1 - p)) / sample.effectiveSampleSize) / density(i, q);
      expect(Math.abs(weightedQuantile(sample, i, p) - q)).toBeLessThan(4 * se);
    }
  }
}

describe("Pareto-smoothed importance sampling from a Student-t at the mode", () => {
  it("reproduces the quantiles of a correlated 5-D Gaussian (stdlib normal quantiles)", () => {
    const target = correlatedGaussian();
    const mode = Float64Array.from([1, -2, 0.5, 3, 0]);
    const sample = importanceSample(target.density, mode, createRng("is-gaussian"));
    expect(sample.accepted).toBe(true);
    // A t proposal has heavier tails than a Gaussian target: the ratios are bounded, k-hat well below 0.5.
    expect(sample.paretoShape).toBeLessThan(0.5);
    expect(sample.effectiveSampleSize).toBeGreaterThanOrEqual(400);
    expectQuantiles(sample, target.quantile, target.marginalDensity, 5);
  });

  it("reproduces the quantiles of a 2-D Student-t with 4 degrees of freedom (stdlib t quantiles)", () => {
    // Target tails r^-4 against the proposal's r^-5: the ratio grows like r, P(W > w) ~ w^-5, k = 0.2.
    const nu = 4;
    const sample = importanceSample(multivariateT(2, nu), new Float64Array(2), createRng("is-t4"));
    expect(sample.accepted).toBe(true);
    expect(sample.paretoShape).toBeLessThanOrEqual(sample.shapeThreshold);
    expectQuantiles(sample, (_, p) => tQuantile(p, nu), (_, x) => tPdf(x, nu), 2);
  });

  it("refuses a target with heavier tails than the proposal (Cauchy): k-hat above the threshold", () => {
    // Cauchy target (1 + x^2)^-1 against the t_5 proposal's x^-6 tail: the ratio grows like x^4, and
    // P(W > w) ~ w^(-5/4) under the proposal, so k = 0.8 > 0.7: the weights have no finite variance.
    // Without refits: a refitted proposal, as wide as the Cauchy draws' moments, can push the tail
    // beyond what 1000 draws see (k-hat is a finite-sample diagnostic).
    const sample = importanceSample(multivariateT(1, 1), new Float64Array(1), createRng("is-cauchy"), { refits: 0, pilotInflation: 1, pilotDraws: 1000 });
    expect(sample.accepted).toBe(false);
    expect(sample.paretoShape).toBeGreaterThan(sample.shapeThreshold);
    expect(sample.reason).toMatch(/k-hat/);
  });

  it("refuses a density that is not curved downwards at the given point", () => {
    const saddle: PosteriorTarget = { dimension: 2, logPosterior: (x) => -0.5 * x[0] * x[0] + 0.5 * x[1] * x[1] };
    const sample = importanceSample(saddle, new Float64Array(2), createRng("is-saddle"));
    expect(sample.accepted).toBe(false);
    expect(sample.reason).toMatch(/curved/);
  });

  it("returns the raw log ratios against the whole mixture: their mean estimates the normaliser, and smoothed they are the weights", () => {
    // The Gaussian of known-targets.ts is exp(-r^T P r / 2) unnormalised: Z = (2 pi)^(5/2) det(S)^(1/2), with det S =
    // prod s_i^2 (1 - 0.7^2)^4 (the Kac-Murdock-Szego correlation matrix rho^|i-j| has determinant (1 - rho^2)^(d-1), from memory).
    const target = correlatedGaussian();
    const sample = importanceSample(target.density, Float64Array.from([1, -2, 0.5, 3, 0]), createRng("is-normaliser"));
    const exact = 2.5 * Math.log(2 * Math.PI) + Math.log(1 * 2 * 0.5 * 3 * 1.5) + 2 * Math.log(1 - 0.49);
    const n = sample.logRatios.length;
    expect(n).toBe(sample.points.length);
    let largest = -Infinity;
    for (const r of sample.logRatios) largest = Math.max(largest, r);
    const w = Array.from(sample.logRatios, (r) => Math.exp(r - largest));
    const mean = w.reduce((a, b) => a + b, 0) / n;
    const sd = Math.sqrt(w.reduce((a, b) => a + (b - mean) ** 2, 0) / (n - 1));
    // Delta-method standard error of ln(mean ratio) (Geweke 1989, Econometrica 57, 1317, sec. 3).
    const se = sd / (mean * Math.sqrt(n));
    expect(Math.abs(largest + Math.log(mean) - exact)).toBeLessThan(4 * se);
    expect(Array.from(paretoSmoothedWeights(sample.logRatios).weights)).toEqual(Array.from(sample.weights));
  });

  it("takes the mode's covariance from the caller when given one", () => {
    const target = correlatedGaussian();
    const mode = Float64Array.from([1, -2, 0.5, 3, 0]);
    const none = importanceSample(target.density, mode, createRng("is-covariance"), { covariance: () => undefined });
    expect(none.accepted).toBe(false);
    expect(none.reason).toMatch(/curved/);
    // The identity is a poor but usable scale for this Gaussian (sds 0.5-3): the sampler still reaches it by its refits.
    const identity = Float64Array.from({ length: 25 }, (_, k) => (k % 6 === 0 ? 1 : 0));
    const given = importanceSample(target.density, mode, createRng("is-covariance"), { covariance: () => identity });
    expect(given.rounds[0]?.proposal).toBe("laplace");
    expect(given.accepted).toBe(true);
  });

  it("is reproducible: the same seed gives the same weights", () => {
    const target = correlatedGaussian();
    const mode = Float64Array.from([1, -2, 0.5, 3, 0]);
    const a = importanceSample(target.density, mode, createRng(5));
    const b = importanceSample(target.density, mode, createRng(5));
    expect(Array.from(a.weights)).toEqual(Array.from(b.weights));
  });
});
