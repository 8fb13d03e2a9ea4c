import { describe, expect, it } from "vitest";
import erf from "@stdlib/math/base/special/erf";
import normalLogPdf from "@stdlib/stats/base/dists/normal/logpdf";
import normalQuantile from "@stdlib/stats/base/dists/normal/quantile";
import logNormalLogPdf from "@stdlib/stats/base/dists/lognormal/logpdf";
import logNormalQuantile from "@stdlib/stats/base/dists/lognormal/quantile";
import uniformLogPdf from "@stdlib/stats/base/dists/uniform/logpdf";
import uniformQuantile from "@stdlib/stats/base/dists/uniform/quantile";
import truncatedNormalPdf from "@stdlib/stats/base/dists/truncated-normal/pdf";
import { halfNormalPrior, logNormalPrior, logUniformPrior, normalPrior, truncatedPrior, uniformPrior, type Prior } from "../../src/inference/priors.js";

const probabilities = [0.001, 0.025, 0.16, 0.5, 0.84, 0.975, 0.999];

/** Central difference of ln p, the reference for the analytic derivatives. */
function numericDerivative(prior: Prior, x: number): number {
  const h = 1e-6 * Math.max(1, Math.abs(x));
  return (prior.logDensity(x + h) - prior.logDensity(x - h)) / (2 * h);
}

describe("priors against @stdlib/stats", () => {
  it("normal: density and quantiles are stdlib's", () => {
    const prior = normalPrior(18.2, 0.7);
    for (const x of [16, 18.2, 19.9]) expect(prior.logDensity(x)).toBeCloseTo(normalLogPdf(x, 18.2, 0.7), 12);
    for (const p of probabilities) expect(prior.quantile(p)).toBeCloseTo(normalQuantile(p, 18.2, 0.7), 12);
  });

  it("log-normal: density and quantiles are stdlib's", () => {
    const prior = logNormalPrior(Math.log(0.2), 0.8);
    for (const x of [0.05, 0.2, 1.3]) expect(prior.logDensity(x)).toBeCloseTo(logNormalLogPdf(x, Math.log(0.2), 0.8), 12);
    for (const p of probabilities) expect(prior.quantile(p)).toBeCloseTo(logNormalQuantile(p, Math.log(0.2), 0.8), 12);
    expect(prior.logDensity(-1)).toBe(-Infinity);
  });

  it("uniform: density and quantiles are stdlib's", () => {
    const prior = uniformPrior(0, 1);
    expect(prior.logDensity(0.3)).toBeCloseTo(uniformLogPdf(0.3, 0, 1), 14);
    expect(prior.logDensity(1.2)).toBe(-Infinity);
    for (const p of probabilities) expect(prior.quantile(p)).toBeCloseTo(uniformQuantile(p, 0, 1), 14);
  });

  it("log-uniform: ln x is uniform, so p(x) = p_U(ln x) / x (change of variables)", () => {
    const prior = logUniformPrior(1, 1e4);
    const [a, b] = [Math.log(1), Math.log(1e4)];
    for (const x of [1.5, 300, 9999]) {
      expect(prior.logDensity(x)).toBeCloseTo(uniformLogPdf(Math.log(x), a, b) - Math.log(x), 12);
    }
    // Quantile of x is exp of the uniform quantile of ln x.
    for (const p of probabilities) expect(prior.quantile(p)).toBeCloseTo(Math.exp(uniformQuantile(p, a, b)), 8);
    expect(prior.logDensity(0.5)).toBe(-Infinity);
  });

  it("half-normal: P(X <= x) = erf(x / (s sqrt 2)), the folded centred normal (common practice)", () => {
    const prior = halfNormalPrior(0.1);
    for (const x of [0.01, 0.1, 0.25]) expect(prior.cdf(x)).toBeCloseTo(erf(x / (0.1 * Math.SQRT2)), 12);
    for (const p of probabilities) expect(erf(prior.quantile(p) / (0.1 * Math.SQRT2))).toBeCloseTo(p, 10);
    // Density is twice the centred normal's on x >= 0.
    expect(prior.logDensity(0.07)).toBeCloseTo(Math.log(2) + normalLogPdf(0.07, 0, 0.1), 12);
    expect(prior.logDensity(-0.01)).toBe(-Infinity);
  });

  it("truncated normal: density is stdlib's truncated-normal pdf", () => {
    const prior = truncatedPrior(normalPrior(10, 5), 2, 30);
    for (const x of [2.5, 10, 21]) expect(Math.exp(prior.logDensity(x))).toBeCloseTo(truncatedNormalPdf(x, 2, 30, 10, 5), 12);
    expect(prior.logDensity(1)).toBe(-Infinity);
    for (const p of probabilities) expect(prior.cdf(prior.quantile(p))).toBeCloseTo(p, 10);
    expect(prior.quantile(0)).toBe(2);
    expect(prior.quantile(1)).toBe(30);
  });

  it("every family's d ln p / dx matches a central difference of its log density", () => {
    const cases: [Prior, number[]][] = [
      [normalPrior(1, 2), [-3, 1, 4]],
      [halfNormalPrior(0.3), [0.05, 0.4]],
      [logNormalPrior(0.5, 0.4), [0.7, 1.6, 3]],
      [logUniformPrior(0.1, 100), [0.3, 20]],
      [uniformPrior(-1, 1), [0.2]],
      [truncatedPrior(logNormalPrior(0, 1), 0.5, 5), [0.8, 2]],
    ];
    for (const [prior, xs] of cases) {
      for (const x of xs) expect(prior.logDensityDerivative(x)).toBeCloseTo(numericDerivative(prior, x), 5);
    }
  });

  it("rejects impossible settings with a RangeError naming the setting", () => {
    expect(() => normalPrior(0, -1)).toThrow(/sd/);
    expect(() => logUniformPrior(0, 10)).toThrow(/lower/);
    expect(() => uniformPrior(3, 1)).toThrow(/lower/);
    expect(() => truncatedPrior(normalPrior(0, 1), 50, 60)).toThrow(/no probability/);
  });
});
