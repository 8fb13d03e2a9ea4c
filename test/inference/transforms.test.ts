import { describe, expect, it } from "vitest";
import normalCdf from "@stdlib/stats/base/dists/normal/cdf";
import { identityTransform, intervalTransform, lowerBoundTransform, transformForSupport, upperBoundTransform, type Transform } from "../../src/inference/transforms.js";
import { normalPrior, truncatedPrior } from "../../src/inference/priors.js";
import { simpsonRule } from "./helpers/simpson-rule.js";

const transforms: [string, Transform, number[]][] = [
  ["identity", identityTransform, [-3, 0, 2.5]],
  ["lower bound", lowerBoundTransform(2), [2.001, 3, 400]],
  ["upper bound", upperBoundTransform(-1), [-50, -1.2, -1.0001]],
  ["interval", intervalTransform(0.5, 30), [0.51, 7, 29.9]],
];

describe("transforms", () => {
  it.each(transforms)("%s: x -> u -> x round trip", (_, t, xs) => {
    for (const x of xs) expect(t.fromUnconstrained(t.toUnconstrained(x))).toBeCloseTo(x, 10);
  });

  it.each(transforms)("%s: dx/du, ln|dx/du| and its derivative match central differences", (_, t, xs) => {
    for (const x of xs) {
      const u = t.toUnconstrained(x);
      const h = 1e-6;
      const numeric = (t.fromUnconstrained(u + h) - t.fromUnconstrained(u - h)) / (2 * h);
      expect(t.derivative(u) / numeric).toBeCloseTo(1, 6);
      expect(t.logJacobian(u)).toBeCloseTo(Math.log(numeric), 6);
      const numericLogJ = (t.logJacobian(u + h) - t.logJacobian(u - h)) / (2 * h);
      expect(t.logJacobianDerivative(u)).toBeCloseTo(numericLogJ, 5);
    }
  });

  it("the interval transform keeps x inside its bounds far out on the real line", () => {
    const t = intervalTransform(0, 1);
    expect(t.fromUnconstrained(800)).toBeLessThanOrEqual(1);
    expect(t.fromUnconstrained(-800)).toBeGreaterThanOrEqual(0);
    expect(Number.isFinite(t.logJacobian(800))).toBe(true);
  });

  it("change of variables: p_x(g(u)) |g'(u)| integrates to P(a < X < b) (stdlib normal cdf)", () => {
    // Truncated normal on [1, 6], mapped to the real line by the logit transform.
    const prior = truncatedPrior(normalPrior(2, 1.5), 1, 6);
    const t = transformForSupport(prior.lower, prior.upper);
    const density = (u: number): number => Math.exp(prior.logDensity(t.fromUnconstrained(u)) + t.logJacobian(u));
    expect(simpsonRule(density, -40, 40, 4000)).toBeCloseTo(1, 8);
    // Mass below u0 is the prior's CDF at g(u0); the truncated CDF from stdlib's normal CDF.
    const u0 = t.toUnconstrained(2.5);
    const expected = (normalCdf(2.5, 2, 1.5) - normalCdf(1, 2, 1.5)) / (normalCdf(6, 2, 1.5) - normalCdf(1, 2, 1.5));
    expect(simpsonRule(density, -40, u0, 4000)).toBeCloseTo(expected, 8);
  });

  it("transformForSupport picks identity, log and logit by the support", () => {
    expect(transformForSupport(-Infinity, Infinity).kind).toBe("identity");
    expect(transformForSupport(0, Infinity).fromUnconstrained(0)).toBe(1);
    expect(transformForSupport(-Infinity, 0).fromUnconstrained(0)).toBe(-1);
    expect(transformForSupport(0, 1).fromUnconstrained(0)).toBe(0.5);
  });
});
