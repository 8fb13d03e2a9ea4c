import paretoQuantile from "@stdlib/stats/base/dists/pareto-type1/quantile";
import { describe, expect, it } from "vitest";
import { fitGeneralizedPareto, generalizedParetoQuantile } from "../../src/inference/generalized-pareto-fit.js";
import { paretoShapeThreshold, paretoSmoothedWeights } from "../../src/inference/pareto-smoothed-weights.js";
import { createRng } from "../../src/random/rng.js";

/** ln of S weights drawn from a Pareto type I distribution with tail index alpha = 1 / k (stdlib quantile). */
function paretoLogWeights(k: number, count: number, seed: string): Float64Array {
  const rng = createRng(seed);
  return Float64Array.from({ length: count }, () => Math.log(paretoQuantile(rng.uniform(), 1 / k, 1)));
}

describe("generalised Pareto fit (Zhang & Stephens 2009)", () => {
  it("recovers the shape and scale of generalised Pareto draws", () => {
    // Inverse-CDF draws of GPD(k, sigma); the quantile function is the textbook one (Coles 2001, eq. 4.2 inverted).
    for (const [k, sigma] of [[0.2, 1], [0.5, 3], [0.8, 0.5]] as const) {
      const rng = createRng(`gpd:${k}`);
      const x = Float64Array.from({ length: 4000 }, () => generalizedParetoQuantile(rng.uniform(), k, sigma)).sort();
      const fit = fitGeneralizedPareto(x);
      // With n = 4000 the sd of the shape estimate is about (1 + k) / sqrt(n) ~ 0.02-0.03 (Zhang & Stephens 2009,
      // sec. 4, from memory); the prior shrinks it towards 0.5 by 10 / 4010 of the distance only.
      expect(Math.abs(fit.shape - k)).toBeLessThan(0.1);
      expect(Math.abs(fit.scale / sigma - 1)).toBeLessThan(0.15);
    }
  });
});

describe("Pareto-smoothed importance weights", () => {
  it("k-hat is near k for importance ratios with a Pareto tail of shape k (Vehtari et al. 2024)", () => {
    // Weights W with P(W > w) = w^(-1/k): the excesses over a high threshold are generalised Pareto with
    // shape k, which is what k-hat estimates (Vehtari et al. 2024, sec. 3; Pickands 1975). From the
    // M = 3 sqrt(S) = 300 largest of S = 1e4 weights one k-hat has sd about 0.1 (measured: 0.08-0.10 over
    // 100 replicates), so the mean of 20 has sd about 0.022; the tolerance is three of those.
    for (const k of [0.3, 0.5, 0.7, 0.9]) {
      const estimates = Array.from({ length: 20 }, (_, r) => paretoSmoothedWeights(paretoLogWeights(k, 10000, `pareto:${k}:${r}`)).paretoShape);
      const mean = estimates.reduce((a, b) => a + b, 0) / estimates.length;
      expect(Math.abs(mean - k)).toBeLessThan(0.07);
    }
  });

  it("k-hat is near 1 - s^2 for a N(0, 1) target and a N(0, s^2) proposal", () => {
    // The ratio w(x) = exp(x^2 (1/s^2 - 1) / 2) under x ~ N(0, s^2) has P(W > w) ~ w^(-1 / (1 - s^2)) up to a
    // slowly varying factor, so its Pareto shape is k = 1 - s^2 (derived from the normal tail; the variance
    // of the weights is finite only for s^2 > 1/2, the classical condition, Geweke 1989). The slowly varying
    // factor biases a finite-sample estimate, hence the wider tolerance (one estimate from the 949 largest
    // of 1e5 weights has sd about 0.05).
    for (const s of [0.5, 0.6, 0.75]) {
      const rng = createRng(`normal-ratio:${s}`);
      const logRatios = Float64Array.from({ length: 100000 }, () => {
        const x = s * rng.normal();
        return 0.5 * x * x * (1 / (s * s) - 1);
      });
      const kHat = paretoSmoothedWeights(logRatios).paretoShape;
      expect(Math.abs(kHat - (1 - s * s))).toBeLessThan(0.12);
    }
  });

  it("gives normalised weights in the input order and an ESS of S for equal weights", () => {
    const equal = paretoSmoothedWeights(new Float64Array(1000));
    expect(equal.effectiveSampleSize).toBeCloseTo(1000, 6);
    expect(Number.isNaN(equal.paretoShape)).toBe(true);
    const logs = paretoLogWeights(0.4, 2000, "order");
    const smoothed = paretoSmoothedWeights(logs);
    expect(smoothed.weights.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 12);
    // Smoothing replaces tail values but keeps their ranks.
    const largest = logs.indexOf(Math.max(...Array.from(logs.subarray(0, 2000))));
    expect(smoothed.weights[largest]).toBe(Math.max(...Array.from(smoothed.weights)));
    expect(smoothed.tailLength).toBe(Math.ceil(3 * Math.sqrt(2000)));
  });

  it("the threshold is min(1 - 1 / log10 S, 0.7) (Vehtari et al. 2024)", () => {
    expect(paretoShapeThreshold(1000)).toBeCloseTo(2 / 3, 12);
    expect(paretoShapeThreshold(100)).toBeCloseTo(0.5, 12);
    expect(paretoShapeThreshold(1e5)).toBe(0.7);
  });
});
