import { describe, expect, it } from "vitest";
import type { PosteriorTarget } from "../../src/inference/index.js";
import { bridgeLogEvidence, type PosteriorChain } from "../../src/models/bridge-evidence.js";
import { createRng, type Rng } from "../../src/random/rng.js";
import { FLAT_TOP_LOG_EVIDENCE, flatTopDraw, flatTopTarget } from "../helpers/flat-top-target.js";
import { sumOfTargets } from "../helpers/mixture-target.js";

/**
 * Bridge sampling (Meng & Wong 1996, Statistica Sinica 6, 831) from exact draws of targets with a known
 * integral: a correlated Gaussian c exp(-x^T A x / 2), integral c (2 pi)^(d/2) det(A)^(-1/2) (the Gaussian
 * integral, common practice), and the flat-topped density of test/helpers/flat-top-target.ts.
 */
const COVARIANCE_FACTOR = [
  [0.5, 0, 0],
  [-0.3, 0.8, 0],
  [0.1, 0.2, 1.1],
];
const LOG_SCALE = -40;
const CENTRE = [1, -2, 0.5];

/** x = centre + L z: covariance L L^T, so A = (L L^T)^-1 and det(A)^(-1/2) = det L = product of L's diagonal. */
function gaussianTarget(centre: readonly number[]): PosteriorTarget {
  const l = COVARIANCE_FACTOR;
  return {
    dimension: 3,
    logPosterior: (x) => {
      // z = L^-1 (x - centre) by forward substitution.
      const z = [0, 0, 0];
      for (let i = 0; i < 3; i++) {
        let sum = (x[i] ?? 0) - (centre[i] ?? 0);
        for (let k = 0; k < i; k++) sum -= (l[i]?.[k] ?? 0) * (z[k] ?? 0);
        z[i] = sum / (l[i]?.[i] ?? 1);
      }
      return LOG_SCALE - 0.5 * z.reduce((s, v) => s + v * v, 0);
    },
  };
}
const EXACT = LOG_SCALE + 1.5 * Math.log(2 * Math.PI) + Math.log(0.5 * 0.8 * 1.1);

function gaussianDraw(rng: Rng, centre: readonly number[]): Float64Array {
  const z = [rng.normal(), rng.normal(), rng.normal()];
  return Float64Array.from(centre, (c, i) => c + (COVARIANCE_FACTOR[i] ?? []).reduce((s, v, k) => s + v * (z[k] ?? 0), 0));
}

/** `count` chains of `length` independent draws, with their ln p. */
function chainsOf(target: PosteriorTarget, draw: (rng: Rng) => Float64Array, seed: string, count = 4, length = 600): PosteriorChain[] {
  const rng = createRng(seed);
  return Array.from({ length: count }, () => {
    const points = Array.from({ length }, () => draw(rng));
    return { points, logPosterior: Float64Array.from(points, (x) => target.logPosterior(x)) };
  });
}

describe("evidence by bridge sampling", () => {
  it("integrates a correlated Gaussian to its known value, within its stated error", () => {
    const target = gaussianTarget(CENTRE);
    const estimate = bridgeLogEvidence(target, chainsOf(target, (rng) => gaussianDraw(rng, CENTRE), "bridge:gaussian"), createRng("bridge:g"))!;
    expect(estimate.posteriorDraws).toBe(1200);
    expect(estimate.standardError).toBeGreaterThan(0);
    expect(estimate.standardError).toBeLessThan(0.05);
    expect(Math.abs(estimate.logEvidence - EXACT)).toBeLessThan(4 * estimate.standardError);
  });

  it("integrates the flat-topped density that defeats a t at its mode with wide-step curvature", () => {
    const target = flatTopTarget();
    const estimate = bridgeLogEvidence(target, chainsOf(target, flatTopDraw, "bridge:flat-top"), createRng("bridge:f"))!;
    expect(estimate.standardError).toBeLessThan(0.05);
    expect(Math.abs(estimate.logEvidence - FLAT_TOP_LOG_EVIDENCE)).toBeLessThan(4 * estimate.standardError);
  });

  it("counts both relabelled copies from chains that stayed in one", () => {
    // p(x) = g(x) + g(swap x), g the Gaussian above at (3, -3, 0.5): copies far apart, Z = 2 Z_g.
    const one = gaussianTarget([3, -3, 0.5]);
    const swapped: PosteriorTarget = { dimension: 3, logPosterior: (x) => one.logPosterior(Float64Array.of(x[1] ?? 0, x[0] ?? 0, x[2] ?? 0)) };
    const target = sumOfTargets(one, swapped);
    const chains = chainsOf(target, (rng) => gaussianDraw(rng, [3, -3, 0.5]), "bridge:swap");
    const symmetric = bridgeLogEvidence(target, chains, createRng("bridge:s"), { symmetries: [[1, 0, 2]] })!;
    expect(Math.abs(symmetric.logEvidence - (EXACT + Math.log(2)))).toBeLessThan(4 * symmetric.standardError);
    // Without the symmetry the chains' copy alone is measured: one half of Z.
    const oneCopy = bridgeLogEvidence(target, chains, createRng("bridge:s"))!;
    expect(Math.abs(oneCopy.logEvidence - EXACT)).toBeLessThan(4 * oneCopy.standardError);
  });

  it("states a larger error for autocorrelated chains than for independent draws of the same length", () => {
    const target = gaussianTarget(CENTRE);
    const independent = chainsOf(target, (rng) => gaussianDraw(rng, CENTRE), "bridge:ar");
    // Each draw repeated five times: the same marginal, an autocorrelation time of about 5.
    const sticky = independent.map((c) => {
      const points = c.points.slice(0, 120).flatMap((x) => [x, x, x, x, x]);
      return { points, logPosterior: Float64Array.from(points, (x) => target.logPosterior(x)) };
    });
    const a = bridgeLogEvidence(target, independent, createRng("bridge:a"))!;
    const b = bridgeLogEvidence(target, sticky, createRng("bridge:a"))!;
    expect(b.posteriorEss).toBeLessThan(0.4 * b.posteriorDraws);
    expect(b.standardError).toBeGreaterThan(a.standardError);
    expect(Math.abs(b.logEvidence - EXACT)).toBeLessThan(4 * b.standardError);
  });
});
