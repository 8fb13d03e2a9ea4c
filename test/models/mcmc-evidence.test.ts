import erf from "@stdlib/math/base/special/erf";
import { describe, expect, it } from "vitest";
import { createParameterSpace, findMaximumPosterior, logUniformPrior, normalPrior, startingPoints, unconstrainedPosterior } from "../../src/inference/index.js";
import { markovBridgeEvidence } from "../../src/models/mcmc-evidence.js";
import { createRng } from "../../src/random/rng.js";

/**
 * A posterior bounded by a log-uniform prior, as a CARMA moving-average coefficient's is: x log-uniform on
 * [A, B], a likelihood that does not see x below X0 (flat, as a coefficient below the cadence) and falls as a
 * Gaussian in ln x above it; m with a normal prior N(0, 1) and a Gaussian likelihood N(0.3, 0.2^2).
 * Z = Z_x Z_m with Z_x = [ln(X0 / A) + W sqrt(pi / 2) erf(ln(B / X0) / (W sqrt 2))] / ln(B / A) (the integral
 * in t = ln x, erf from stdlib) and Z_m = sqrt(2 pi) 0.2 N(0.3; 0, 1 + 0.2^2) (the Gaussian convolution,
 * common practice).
 */
const A = 0.2;
const B = 300;
const X0 = 5;
const W = 0.5;

describe("evidence by bridge sampling from the walker ensemble's draws", () => {
  it("integrates a posterior that runs flat into a log-uniform prior's lower bound, within its stated error", () => {
    const space = createParameterSpace([
      { name: "x", prior: logUniformPrior(A, B) },
      { name: "m", prior: normalPrior(0, 1) },
    ]);
    const likelihood = {
      logLikelihood: (p: Float64Array) => {
        const t = Math.log((p[0] ?? 1) / X0);
        return (t > 0 ? -0.5 * (t / W) ** 2 : 0) - 0.5 * (((p[1] ?? 0) - 0.3) / 0.2) ** 2;
      },
    };
    const zx = (Math.log(X0 / A) + W * Math.sqrt(Math.PI / 2) * erf(Math.log(B / X0) / (W * Math.SQRT2))) / Math.log(B / A);
    const variance = 1 + 0.04;
    const zm = (Math.sqrt(2 * Math.PI) * 0.2 * Math.exp((-0.5 * 0.09) / variance)) / Math.sqrt(2 * Math.PI * variance);
    const target = unconstrainedPosterior(space, likelihood, { jacobian: true });
    const maximum = findMaximumPosterior(target, { starts: startingPoints(space, 4, createRng("mcmc-evidence:starts"), {}) });
    const estimate = markovBridgeEvidence(space, likelihood, target, maximum, createRng("mcmc-evidence"), { seed: "mcmc-evidence" })!;
    expect(estimate.chainsConverged).toBe(true);
    expect(estimate.standardError).toBeGreaterThan(0);
    expect(estimate.standardError).toBeLessThan(0.05);
    expect(Math.abs(estimate.logEvidence - (Math.log(zx) + Math.log(zm)))).toBeLessThan(4 * estimate.standardError);
  });
});
