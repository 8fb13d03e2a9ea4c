import { describe, expect, it } from "vitest";
import logisticLogPdf from "@stdlib/stats/base/dists/logistic/logpdf";
import normalLogPdf from "@stdlib/stats/base/dists/normal/logpdf";
import { createRng } from "../../src/random/rng.js";
import { createParameterSpace, withFixedParameters, withFreeParameter } from "../../src/inference/parameter-space.js";
import { unconstrainedPosterior, type PhysicalLikelihood } from "../../src/inference/unconstrained-posterior.js";
import { logNormalPrior, logUniformPrior, normalPrior, uniformPrior } from "../../src/inference/priors.js";

const space = createParameterSpace([
  { name: "tau", prior: logNormalPrior(Math.log(200), 1) },
  { name: "sigma", prior: logUniformPrior(0.01, 2) },
  { name: "mean", prior: normalPrior(18, 2) },
  { name: "jitter", fixed: 0.02 },
]);

/** A smooth likelihood in all four parameters, with its analytic gradient. */
const likelihood: PhysicalLikelihood = {
  logLikelihood: (x) => -((Math.log(x[0]) - 5) ** 2) - 3 * (x[1] - 0.3) ** 2 - 0.5 * (x[2] - 18.4) ** 2 + x[3],
  logLikelihoodAndGradient(x, g) {
    g[0] = (-2 * (Math.log(x[0]) - 5)) / x[0];
    g[1] = -6 * (x[1] - 0.3);
    g[2] = -(x[2] - 18.4);
    g[3] = 1;
    return this.logLikelihood(x);
  },
};

describe("parameter space", () => {
  it("maps physical <-> unconstrained, fixed values included, free ones only in u", () => {
    expect(space.dimension).toBe(3);
    expect(space.free.map((p) => p.name)).toEqual(["tau", "sigma", "mean"]);
    const physical = space.physicalFromRecord({ tau: 150, sigma: 0.4, mean: 17.5 });
    expect(Array.from(physical)).toEqual([150, 0.4, 17.5, 0.02]);
    const back = space.toPhysical(space.toUnconstrained(physical));
    for (let i = 0; i < 4; i++) expect(back[i]).toBeCloseTo(physical[i], 10);
  });

  it("the prior in u of a log-normal parameter under x = exp(u) is the normal N(mu, sigma) (change of variables)", () => {
    const one = createParameterSpace([{ name: "tau", prior: logNormalPrior(2, 0.5) }]);
    const target = unconstrainedPosterior(one, { logLikelihood: () => 0 });
    for (const u of [0.5, 2, 3.7]) expect(target.logPosterior(Float64Array.of(u))).toBeCloseTo(normalLogPdf(u, 2, 0.5), 12);
  });

  it("the prior in u of a uniform parameter under the logit transform is the standard logistic (change of variables)", () => {
    const one = createParameterSpace([{ name: "harmonicWeight", prior: uniformPrior(0, 1) }]);
    const target = unconstrainedPosterior(one, { logLikelihood: () => 0 });
    for (const u of [-4, 0, 2.2]) expect(target.logPosterior(Float64Array.of(u))).toBeCloseTo(logisticLogPdf(u, 0, 1), 12);
  });

  it("without the Jacobian the density is likelihood times prior in physical units", () => {
    const target = unconstrainedPosterior(space, likelihood, { jacobian: false });
    const physical = space.physicalFromRecord({ tau: 150, sigma: 0.4, mean: 17.5 });
    const expected = likelihood.logLikelihood(physical) + space.logPrior(physical);
    expect(target.logPosterior(space.toUnconstrained(physical))).toBeCloseTo(expected, 12);
  });

  it.each([true, false])("gradient in u (jacobian %s) matches central differences", (jacobian) => {
    const target = unconstrainedPosterior(space, likelihood, { jacobian });
    const u = space.toUnconstrained(space.physicalFromRecord({ tau: 90, sigma: 0.7, mean: 18.9 }));
    const g = new Float64Array(3);
    const value = target.logPosteriorAndGradient!(u, g);
    expect(value).toBeCloseTo(target.logPosterior(u), 12);
    for (let i = 0; i < 3; i++) {
      const h = 1e-6;
      const up = Float64Array.from(u);
      const down = Float64Array.from(u);
      up[i] = up[i] + h;
      down[i] = down[i] - h;
      expect(g[i]).toBeCloseTo((target.logPosterior(up) - target.logPosterior(down)) / (2 * h), 5);
    }
  });

  it("parameters can be fixed and freed again", () => {
    const fixed = withFixedParameters(space, { mean: 18.3 });
    expect(fixed.dimension).toBe(2);
    expect(fixed.toPhysical(new Float64Array(2))[2]).toBe(18.3);
    const freed = withFreeParameter(fixed, "jitter", uniformPrior(0, 0.5));
    expect(freed.free.map((p) => p.name)).toEqual(["tau", "sigma", "jitter"]);
  });

  it("prior draws stay inside the supports", () => {
    const rng = createRng(11);
    for (let k = 0; k < 200; k++) {
      const x = space.toPhysical(space.drawFromPrior(rng));
      expect(x[1]).toBeGreaterThanOrEqual(0.01);
      expect(x[1]).toBeLessThanOrEqual(2);
      expect(x[0]).toBeGreaterThan(0);
    }
  });

  it("rejects bad declarations with a message naming the parameter", () => {
    expect(() => createParameterSpace([{ name: "tau" }])).toThrow(/"tau" is free but has no prior/);
    expect(() => createParameterSpace([{ name: "a", fixed: 1 }, { name: "a", fixed: 2 }])).toThrow(/"a" is declared twice/);
    expect(() => createParameterSpace([{ name: "q", fixed: NaN }])).toThrow(/"q"/);
    expect(() => space.physicalFromRecord({ period: 3 })).toThrow(/unknown parameter "period"/);
  });
});
