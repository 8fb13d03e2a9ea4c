import normalCdf from "@stdlib/stats/base/dists/normal/cdf";
import { describe, expect, it } from "vitest";
import { importanceSample } from "../../src/inference/importance-sampling.js";
import { modeMixtureSample } from "../../src/inference/mode-mixture-sampling.js";
import type { PosteriorTarget } from "../../src/inference/posterior-target.js";
import { createRng } from "../../src/random/rng.js";

/**
 * A mixture of well-separated Gaussians in d dimensions, component k at centre c_k (in coordinate 0,
 * the others 0) with standard deviations s_k (all coordinates) and weight a_k:
 * p(x) = sum_k a_k N(x; c_k, s_k^2 I). Its marginal CDF in coordinate 0 is sum_k a_k Phi((x - c_k) / s_k)
 * (stdlib's normal CDF), the mass of component k is a_k: the shape of a period posterior with modes at
 * P and 2P (ln-period apart by ln 2 = 0.69, each a few hundredths wide).
 */
function separatedModes(d: number, centres: readonly number[], scales: readonly number[], masses: readonly number[]): PosteriorTarget {
  return {
    dimension: d,
    logPosterior: (x) => {
      let largest = -Infinity;
      const terms = centres.map((c, k) => {
        let r2 = (x[0] - c) ** 2;
        for (let i = 1; i < d; i++) r2 += x[i] * x[i];
        const t = Math.log(masses[k]) - d * Math.log(scales[k]) - (0.5 * r2) / scales[k] ** 2;
        largest = Math.max(largest, t);
        return t;
      });
      return largest + Math.log(terms.reduce((sum, t) => sum + Math.exp(t - largest), 0));
    },
  };
}

/** Weighted share of the draws with x_0 below `cut`. */
function weightedShareBelow(points: readonly Float64Array[], weights: Float64Array, cut: number): number {
  let share = 0;
  points.forEach((x, s) => {
    if (x[0] < cut) share += weights[s];
  });
  return share;
}

describe("importance sampling from a mixture with one component per mode", () => {
  const centres = [0, 0.69, -0.69];
  const scales = [0.04, 0.05, 0.03];
  const masses = [0.6, 0.3, 0.1];
  const d = 4;
  const target = separatedModes(d, centres, scales, masses);
  const modes = centres.map((c) => Float64Array.from({ length: d }, (_, i) => (i === 0 ? c : 0)));

  it("shares the draws among three separated modes by their mass (0.6, 0.3, 0.1) and accepts", () => {
    const sample = modeMixtureSample(target, modes, createRng("mode-mixture-3"));
    expect(sample.accepted).toBe(true);
    expect(sample.effectiveSampleSize).toBeGreaterThanOrEqual(400);
    expect(sample.modes).toHaveLength(3);
    // The weighted mass of each mode within 4 binomial standard errors at the weights' ESS.
    masses.forEach((a, k) => {
      const se = Math.sqrt((a * (1 - a)) / sample.effectiveSampleSize);
      expect(Math.abs(sample.modeShares[k] - a)).toBeLessThan(4 * se);
    });
    // The marginal CDF of coordinate 0 at points inside and between the modes against the exact mixture CDF.
    for (const cut of [-0.7, -0.3, 0, 0.02, 0.35, 0.72]) {
      const exact = centres.reduce((sum, c, k) => sum + masses[k] * normalCdf(cut, c, scales[k]), 0);
      const se = Math.sqrt(Math.max(exact * (1 - exact), 0.01) / sample.effectiveSampleSize);
      expect(Math.abs(weightedShareBelow(sample.points, sample.weights, cut) - exact)).toBeLessThan(4 * se);
    }
  });

  it("a duplicate of a mode listed twice gets no second component", () => {
    const sample = modeMixtureSample(target, [modes[0], modes[0].map((v, i) => (i === 0 ? v + 0.001 : v)), modes[1], modes[2]], createRng("mode-mixture-twin"));
    expect(sample.modes).toHaveLength(3);
    expect(sample.accepted).toBe(true);
  });

  it("a single-mode proposal misses the other modes (why the fit lists every candidate): its mass stays at the mode it sees", () => {
    // One Student-t at the highest mode: the draws almost never reach P or 2P, so the weights give
    // the other modes next to nothing although they hold 40% of the mass.
    const single = importanceSample(target, modes[0], createRng("mode-mixture-single"));
    const elsewhere = 1 - weightedShareBelow(single.points, single.weights, 0.35) + weightedShareBelow(single.points, single.weights, -0.35);
    expect(elsewhere).toBeLessThan(0.05);
    const mixture = modeMixtureSample(target, modes, createRng("mode-mixture-3"));
    const mixtureElsewhere = 1 - weightedShareBelow(mixture.points, mixture.weights, 0.35) + weightedShareBelow(mixture.points, mixture.weights, -0.35);
    expect(mixtureElsewhere).toBeGreaterThan(0.3);
  });

  it("says why when no mode is curved downwards", () => {
    const flat: PosteriorTarget = { dimension: 2, logPosterior: () => 0 };
    const sample = modeMixtureSample(flat, [new Float64Array(2)], createRng("mode-mixture-flat"));
    expect(sample.accepted).toBe(false);
    expect(sample.reason).toMatch(/not curved downwards/);
  });
});
