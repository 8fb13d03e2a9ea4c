import { beforeAll, describe, expect, it } from "vitest";
import normalQuantile from "@stdlib/stats/base/dists/normal/quantile";
import { createRng } from "../../src/random/rng.js";
import { rhatThreshold } from "../../src/inference/convergence-check.js";
import { createParameterSpace } from "../../src/inference/parameter-space.js";
import { posteriorDraws, posteriorDrawsToCsv } from "../../src/inference/posterior-draws.js";
import { logUniformPrior, normalPrior } from "../../src/inference/priors.js";
import { samplePosterior, type PosteriorSample } from "../../src/inference/sample-posterior.js";
import type { PhysicalLikelihood } from "../../src/inference/unconstrained-posterior.js";

// Normal data with known sigma and a normal prior on the mean: the posterior of the mean is
// N(mu_n, tau_n^2) with 1/tau_n^2 = 1/tau_0^2 + n/sigma^2 and mu_n = tau_n^2 (mu_0/tau_0^2 + n ybar/sigma^2)
// (Gelman et al., Bayesian Data Analysis, 3rd ed., eq. 2.11-2.12).
const rng = createRng(77);
const sigma = 0.3;
const data = Float64Array.from({ length: 20 }, () => 17.9 + sigma * rng.normal());
const ybar = data.reduce((a, b) => a + b, 0) / data.length;
const [mu0, tau0] = [18, 0.5];
const precision = 1 / tau0 ** 2 + data.length / sigma ** 2;
const tauN = Math.sqrt(1 / precision);
const muN = (mu0 / tau0 ** 2 + (data.length * ybar) / sigma ** 2) / precision;

// A second parameter the data say nothing about: its posterior is its log-uniform prior, whose
// quantiles are lower (upper/lower)^p. This checks the transform and its Jacobian end to end.
const space = createParameterSpace([
  { name: "mean", prior: normalPrior(mu0, tau0) },
  { name: "tau", prior: logUniformPrior(1, 1000) },
  { name: "errorScale", fixed: sigma },
]);
const likelihood: PhysicalLikelihood = {
  logLikelihood: (x) => data.reduce((a, y) => a - 0.5 * ((y - x[0]) / x[2]) ** 2, 0),
  logLikelihoodAndGradient(x, g) {
    g[0] = data.reduce((a, y) => a + (y - x[0]) / x[2] ** 2, 0);
    g[1] = 0;
    g[2] = 0;
    return this.logLikelihood(x);
  },
};

describe.each(["nuts", "ensemble"] as const)("samplePosterior with %s", (sampler) => {
  let fit: PosteriorSample;
  beforeAll(() => {
    fit = samplePosterior(space, likelihood, { seed: 9, sampler, maxEvaluations: 2e6 });
  });

  it("converges and says so", () => {
    expect(fit.stopReason).toBe("converged");
    expect(fit.diagnostics.converged).toBe(true);
    expect(fit.diagnostics.rhatMax).toBeLessThan(fit.diagnostics.rhatThreshold);
    expect(fit.diagnostics.rhatThreshold).toBe(rhatThreshold(1.01, fit.run.sampler.chainCount));
    expect(fit.diagnostics.essMin).toBeGreaterThanOrEqual(400);
    expect(fit.diagnostics.likelihoodEvaluations).toBeGreaterThan(fit.diagnostics.optimizerEvaluations);
  });

  it("finds the conjugate posterior mode and quantiles of the mean (Gelman et al. eq. 2.11-2.12)", () => {
    expect(fit.maximum.mean).toBeCloseTo(muN, 5);
    const m = fit.parameters.mean!;
    // Monte-Carlo error of a quantile: sqrt(p(1-p)/ESS)/f(q) <= 2.5 tau_n / sqrt(ESS) at p = 0.025.
    const tolerance = (4 * 2.5 * tauN) / Math.sqrt(m.essBulk as number);
    expect(Math.abs(m.median - muN)).toBeLessThan(tolerance);
    expect(Math.abs(m["q2.5"] - normalQuantile(0.025, muN, tauN))).toBeLessThan(tolerance);
    expect(Math.abs(m["q97.5"] - normalQuantile(0.975, muN, tauN))).toBeLessThan(tolerance);
    expect(m.sd / tauN).toBeGreaterThan(0.9);
    expect(m.sd / tauN).toBeLessThan(1.1);
  });

  it("recovers a log-uniform prior where the data are silent (quantiles 1000^p)", () => {
    const t = fit.parameters.tau!;
    // In ln tau the prior is uniform on [0, ln 1000] (sd 2.0); compare quantiles in ln tau.
    const tolerance = (4 * 2.5 * 2.0) / Math.sqrt(t.essBulk as number);
    expect(Math.abs(Math.log(t.median) - 0.5 * Math.log(1000))).toBeLessThan(tolerance);
    expect(Math.abs(Math.log(t.q16) - 0.16 * Math.log(1000))).toBeLessThan(tolerance);
    expect(Math.abs(Math.log(t.q84) - 0.84 * Math.log(1000))).toBeLessThan(tolerance);
  });

  it("reports fixed parameters as fixed and exports the draws", () => {
    expect(fit.parameters.errorScale!.fixed).toBe(true);
    expect(fit.parameters.errorScale!.median).toBe(sigma);
    const draws = posteriorDraws(space, fit.run, 10);
    const csv = posteriorDrawsToCsv(draws);
    const lines = csv.trim().split("\n");
    expect(lines[0]).toBe("chain,iteration,mean,tau,errorScale,log_posterior");
    expect(lines.length - 1).toBe(draws.chain.length);
    expect(Number(lines[1].split(",")[2])).toBe(draws.columns.mean![0]);
  });
});

describe("samplePosterior input checks", () => {
  it("refuses NUTS without a gradient", () => {
    expect(() => samplePosterior(space, { logLikelihood: likelihood.logLikelihood }, { seed: 1, sampler: "nuts" })).toThrow(/gradient/);
  });
});
