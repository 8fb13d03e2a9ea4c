import laplaceLogPdf from "@stdlib/stats/base/dists/laplace/logpdf";
import normalLogPdf from "@stdlib/stats/base/dists/normal/logpdf";
import { describe, expect, it } from "vitest";
import { createParameterSpace } from "../../src/inference/parameter-space.js";
import { posteriorByMethod } from "../../src/inference/posterior-by-method.js";
import { normalPrior } from "../../src/inference/priors.js";
import type { PhysicalLikelihood } from "../../src/inference/unconstrained-posterior.js";

// Two separated modes in three dimensions: a minor one at the origin (weight `minor`, sd 0.5) and the
// major one at x = (major, 0, 0) (weight 1, sd 0.5); a local search from the origin stops at the minor
// one. Densities from @stdlib's normal distribution; the priors, N(0, 10^2), barely matter.
function twoModes(major: number, minor: number): PhysicalLikelihood {
  const component = (x: Float64Array, centre: number) => normalLogPdf(x[0], centre, 0.5) + normalLogPdf(x[1], 0, 0.5) + normalLogPdf(x[2], 0, 0.5);
  return {
    logLikelihood: (x) => {
      const a = Math.log(minor) + component(x, 0);
      const b = component(x, major);
      const top = Math.max(a, b);
      return top + Math.log(Math.exp(a - top) + Math.exp(b - top));
    },
  };
}
const space = createParameterSpace(["x", "y", "z"].map((name) => ({ name, prior: normalPrior(0, 10) })));
const atOrigin = { x: 0, y: 0, z: 0 };

describe("posteriorByMethod's mode search", () => {
  it("restartFrom: a further start derived from the first maximum, the higher maximum kept", () => {
    const seen: Record<string, number>[] = [];
    const posterior = posteriorByMethod(space, twoModes(6, 0.01), {
      seed: 3,
      initial: atOrigin,
      starts: 1,
      restartFrom: (maximum) => {
        seen.push({ ...maximum });
        return { ...maximum, x: 5.5 };
      },
    });
    expect(seen.length).toBe(1);
    expect(Math.abs(seen[0]?.x ?? NaN)).toBeLessThan(0.1); // the first search stopped at the minor mode
    expect(Math.abs((posterior.maximum.x ?? NaN) - 6)).toBeLessThan(0.05);
    expect(posterior.method).toBe("importance");
  });

  it("a draw above the mode by more than the margin sends the search there again", () => {
    const posterior = posteriorByMethod(space, twoModes(2.6, 0.05), { seed: 5, initial: atOrigin, starts: 1 });
    expect(Math.abs((posterior.maximum.x ?? NaN) - 2.6)).toBeLessThan(0.05);
  });

  it("the ensemble after a failed importance sample starts from its draws, spread as the posterior is", () => {
    // Three independent N(0, 1) coordinates (the N(0, 10^2) priors shift them by 1%); an ESS no sample
    // reaches forces the fallback. The ensemble's usual start is a ball a tenth of the sd wide.
    const standard: PhysicalLikelihood = { logLikelihood: (x) => -0.5 * (x[0] * x[0] + x[1] * x[1] + x[2] * x[2]) };
    const posterior = posteriorByMethod(space, standard, { seed: 8, initial: atOrigin, starts: 1, importance: { minimumEss: 1e9, maxDraws: 2000 } });
    expect(posterior.method).toBe("ensemble");
    expect(posterior.diagnostics.importanceFallback).toContain("ESS");
    const trace = posterior.sample?.trace;
    const walkers = (trace?.series ?? []).filter((series) => series.chain !== null);
    expect(walkers.length).toBe(4);
    for (const name of ["x", "y", "z"]) {
      const starts = walkers.map((series) => series.values[name]?.[0] ?? NaN);
      // Four draws of N(0, 1) span about 2 (the expected range of 4 normals is 2.06, from memory).
      expect(Math.max(...starts) - Math.min(...starts)).toBeGreaterThan(0.6);
    }
    expect(posterior.diagnostics.converged).toBe(true);
  });

  it("importanceRetries: a failed sample is drawn again with three times the draws before MCMC runs", () => {
    // Twelve Laplace (double-exponential) coordinates, tent-shaped at the mode (@stdlib's Laplace density),
    // an ESS of 700 that 2400 draws from the widened pilot and its refits do not reach.
    const names = Array.from({ length: 12 }, (_, i) => `x${i}`);
    const tents = createParameterSpace(names.map((name) => ({ name, prior: normalPrior(0, 100) })));
    const centre = (i: number) => 0.5 * i - 2;
    const likelihood: PhysicalLikelihood = {
      logLikelihood: (x) => {
        let sum = 0;
        for (let i = 0; i < 12; i++) sum += laplaceLogPdf(x[i], centre(i), 0.05 * (1 + (i % 4)));
        return sum;
      },
    };
    const options = {
      seed: 2,
      initial: Object.fromEntries(names.map((name, i) => [name, centre(i)])),
      starts: 1,
      importanceMaxDimension: 12,
      maxEvaluations: 30000,
      importance: { conditionalWidening: "shift" as const, refitInflation: 1.44, minimumEss: 700, maxDraws: 2400 },
    };
    const once = posteriorByMethod(tents, likelihood, options);
    expect(once.method).toBe("ensemble");
    expect(once.diagnostics.importanceDraws).toBe(2400);
    const retried = posteriorByMethod(tents, likelihood, { ...options, importanceRetries: 1 });
    expect(retried.method).toBe("importance");
    expect(retried.diagnostics.essMin).toBeGreaterThanOrEqual(700);
    expect(retried.diagnostics.importanceDraws ?? 0).toBeGreaterThan(2400);
    expect(retried.diagnostics.importanceDraws ?? Infinity).toBeLessThanOrEqual(3 * 2400);
  });
});
