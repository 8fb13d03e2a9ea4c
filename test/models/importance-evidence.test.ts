import { describe, expect, it } from "vitest";
import { modeCovariance, type PosteriorTarget } from "../../src/inference/index.js";
import { evidenceFromLogRatios, importanceLogEvidence, permutationGroup, robustModeCovariance } from "../../src/models/importance-evidence.js";
import { FLAT_TOP_LOG_EVIDENCE, flatTopTarget } from "../helpers/flat-top-target.js";
import { sumOfTargets } from "../helpers/mixture-target.js";
import { createRng } from "../../src/random/rng.js";

/**
 * Targets with a known integral: an unnormalised correlated Gaussian c exp(-x^T A x / 2), whose integral is
 * c (2 pi)^(d/2) det(A)^(-1/2) (the Gaussian integral, common practice), and an equal mixture of it and its
 * mirror image under a swap of coordinates (twice the integral of one copy when they do not overlap).
 */
function gaussianTarget(precision: number[][], logScale: number, centre: number[]): PosteriorTarget {
  const d = centre.length;
  const logDensity = (x: ArrayLike<number>) => {
    let q = 0;
    for (let i = 0; i < d; i++) for (let j = 0; j < d; j++) q += ((x[i] ?? 0) - (centre[i] ?? 0)) * (precision[i]?.[j] ?? 0) * ((x[j] ?? 0) - (centre[j] ?? 0));
    return logScale - 0.5 * q;
  };
  return { dimension: d, logPosterior: logDensity };
}

const PRECISION = [
  [4, 1.2, 0],
  [1.2, 2, 0.3],
  [0, 0.3, 1],
];
/** det of PRECISION, by cofactors: 4 (2 - 0.09) - 1.2 (1.2 - 0) = 6.44. */
const DETERMINANT = 4 * (2 * 1 - 0.3 * 0.3) - 1.2 * (1.2 * 1 - 0.3 * 0);
const LOG_SCALE = -17.5;
const EXACT = LOG_SCALE + 1.5 * Math.log(2 * Math.PI) - 0.5 * Math.log(DETERMINANT);

describe("evidence by importance sampling", () => {
  it("integrates a correlated Gaussian to its known value, within its stated error", () => {
    const target = gaussianTarget(PRECISION, LOG_SCALE, [0.5, -1, 2]);
    const estimate = importanceLogEvidence(target, Float64Array.of(0.5, -1, 2), createRng("evidence:gaussian"), { draws: 2000 })!;
    expect(estimate.reliable).toBe(true);
    expect(estimate.standardError).toBeGreaterThan(0);
    expect(estimate.standardError).toBeLessThan(0.05);
    expect(Math.abs(estimate.logEvidence - EXACT)).toBeLessThan(4 * estimate.standardError);
  });

  it("counts both copies of a mode that a relabelling maps onto each other, and one without the symmetry", () => {
    // Copies centred at (3, -3, 0) and (-3, 3, 0): the swap of coordinates 0 and 1 maps one onto the other.
    const one = gaussianTarget(PRECISION, LOG_SCALE, [3, -3, 0]);
    const swapped = gaussianTarget([[2, 1.2, 0.3], [1.2, 4, 0], [0.3, 0, 1]], LOG_SCALE, [-3, 3, 0]);
    const target = sumOfTargets(one, swapped);
    const mode = Float64Array.of(3, -3, 0);
    const symmetric = importanceLogEvidence(target, mode, createRng("evidence:swap"), { draws: 2000, symmetries: [[1, 0, 2]] })!;
    expect(Math.abs(symmetric.logEvidence - (EXACT + Math.log(2)))).toBeLessThan(4 * symmetric.standardError);
    const oneCopy = importanceLogEvidence(target, mode, createRng("evidence:swap"), { draws: 2000 })!;
    expect(Math.abs(oneCopy.logEvidence - EXACT)).toBeLessThan(4 * oneCopy.standardError);
  });

  it("draws at a flat-topped mode whose wide-step curvature is not positive definite (the old path had no proposal there)", () => {
    // A CARMA posterior with a real root and moving-average roots that nearly cancel has this shape: a stiff
    // direction with a quartic wall, a soft one across it (bench/README.md, "CARMA order choice by evidence").
    const target = flatTopTarget();
    const mode = Float64Array.of(0, 0);
    // The premise: half-standard-deviation steps straddle the quartic and see a saddle; small steps see the maximum.
    expect(modeCovariance(target, mode)).toBeUndefined();
    expect(robustModeCovariance(target, mode)).toBeDefined();
    const estimate = importanceLogEvidence(target, mode, createRng("evidence:flat-top"))!;
    expect(estimate.reliable).toBe(true);
    expect(estimate.standardError).toBeLessThan(0.05);
    expect(Math.abs(estimate.logEvidence - FLAT_TOP_LOG_EVIDENCE)).toBeLessThan(4 * estimate.standardError);
  });

  it("counts the mass of every mode it is given, as a mixture of t components", () => {
    // Two unequal copies far apart (no symmetry): Z = Z1 + Z2 with Z2 = e^-1 Z1; from the first mode alone, Z1.
    const first = gaussianTarget(PRECISION, LOG_SCALE, [4, 0, 0]);
    const second = gaussianTarget(PRECISION, LOG_SCALE - 1, [-4, 2, 1]);
    const target = sumOfTargets(first, second);
    const both = importanceLogEvidence(target, [Float64Array.of(4, 0, 0), Float64Array.of(-4, 2, 1)], createRng("evidence:two-modes"))!;
    expect(both.modes).toBe(2);
    expect(both.reliable).toBe(true);
    expect(Math.abs(both.logEvidence - (EXACT + Math.log1p(Math.exp(-1))))).toBeLessThan(4 * both.standardError);
    const one = importanceLogEvidence(target, Float64Array.of(4, 0, 0), createRng("evidence:two-modes"))!;
    expect(Math.abs(one.logEvidence - EXACT)).toBeLessThan(4 * one.standardError);
  });

  it("its standard error is the delta-method one of the ratios' mean, and k-hat flags a heavy tail", () => {
    // Ratios 1 and 3 in equal numbers: mean 2, sd 1 (n / (n - 1) corrected), se of ln mean = sd / (2 sqrt(n)).
    const n = 400;
    const estimate = evidenceFromLogRatios(Float64Array.from({ length: n }, (_, s) => Math.log(s % 2 === 0 ? 1 : 3)));
    expect(estimate.logEvidence).toBeCloseTo(Math.log(2), 12);
    expect(estimate.standardError).toBeCloseTo(Math.sqrt(n / (n - 1)) / (2 * Math.sqrt(n)), 10);
    // Ratios with a Pareto tail of shape 1 (w = 1 / u): infinite variance, the error cannot be trusted.
    const rng = createRng("evidence:heavy");
    const heavy = evidenceFromLogRatios(Float64Array.from({ length: 2000 }, () => -Math.log(rng.uniform())));
    expect(heavy.paretoShape).toBeGreaterThan(0.7);
    expect(heavy.reliable).toBe(false);
  });

  it("closes the relabellings into a group", () => {
    expect(permutationGroup(3, [])).toEqual([[0, 1, 2]]);
    expect(permutationGroup(4, [[1, 0, 2, 3], [0, 2, 1, 3]])).toHaveLength(6);
  });
});
