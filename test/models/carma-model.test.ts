import { describe, expect, it } from "vitest";
import { GaussianProcess } from "../../src/gp/gaussian-process.js";
import { kernels } from "../../src/kernels/index.js";
import { carmaTerm, parseCarmaOrder } from "../../src/models/carma-model.js";
import { carmaOrderGrid, compareModels } from "../../src/models/compare-models.js";
import { summarizeLightCurve } from "../../src/models/data-summary.js";
import { buildModel, modelLikelihood } from "../../src/models/light-curve-model.js";
import { createRng } from "../../src/random/rng.js";
import { randomErrors, seasonalTimes } from "../helpers/seasonal-times.js";

function simulated(seed: string) {
  const rng = createRng(seed);
  const time = seasonalTimes(rng, { seasons: 4, perSeason: 50 });
  const errors = randomErrors(rng, time.length, 0.02, 0.04);
  const latent = new GaussianProcess(kernels.dampedRandomWalk({ sigma: 0.3, tau: 60 }), time).priorDraw(rng);
  const value = Float64Array.from(latent, (v, i) => 19 + v + errors[i] * rng.normal());
  return {
    time,
    value,
    error: errors,
    unit: "mag" as const,
    provenance: { source: "simulated", timeColumn: "t", valueColumn: "mag", errorColumn: "err", dropped: 0, sorted: false },
  };
}

describe("CARMA model", () => {
  it("reads the order p,q with q < p <= 4 and names what is wrong", () => {
    expect(parseCarmaOrder("2,1")).toEqual({ p: 2, q: 1 });
    expect(() => parseCarmaOrder("2,2")).toThrow(/q < p/);
    expect(() => parseCarmaOrder("5,0")).toThrow(/1 to 4/);
    expect(() => parseCarmaOrder("two")).toThrow(/p,q/);
  });

  it("every order of the grid names its parameters in the kernel's order (the gradient maps back one to one)", () => {
    expect(carmaOrderGrid()).toHaveLength(10);
    for (const order of carmaOrderGrid()) {
      const term = carmaTerm(order);
      const values = term.names.map((name) => (name === "sigma" ? 0.2 : name.startsWith("period") ? 30 + 20 * Number(name.slice(6)) : name.startsWith("quality") ? 0.7 + Number(name.slice(7)) : name.startsWith("tau") ? 90 : 1));
      expect(term.build(values).parameterNames).toEqual(term.names);
    }
  });

  it("moving-average coefficients are log-uniform from (medianCadence / 10)^j to (baseline / 2 pi)^j, the guess inside", () => {
    // docs/priors.md, "CARMA": log-uniform like the other timescales (common practice for scale parameters).
    const summary = summarizeLightCurve(simulated("carma:ma-prior"));
    const model = buildModel("carma", summary, { order: { p: 3, q: 2 } });
    const shortest = summary.medianCadence / 10;
    const longest = summary.baseline / (2 * Math.PI);
    for (const j of [1, 2]) {
      const prior = model.space.free.find((p) => p.name === `ma${j}`)!.prior;
      expect(prior.family).toBe("log-uniform");
      expect(prior.settings.lower).toBeCloseTo(shortest ** j, 9);
      expect(prior.settings.upper).toBeCloseTo(longest ** j, 9);
      // Each decade of ma_j^(1/j) holds the same mass: the median timescale is the geometric mean.
      expect(prior.quantile(0.5) ** (1 / j)).toBeCloseTo(Math.sqrt(shortest * longest), 6);
      const guess = model.initialGuess[`ma${j}`]!;
      expect(guess).toBeGreaterThan(prior.settings.lower!);
      expect(guess).toBeLessThan(prior.settings.upper!);
    }
    // Tau0 keeps the damped random walk's lower bound, the same shortest timescale.
    expect(model.space.free.find((p) => p.name === "tau0")!.prior.settings.lower).toBeCloseTo(shortest, 12);
  });

  it("coincident autoregressive roots are an impossible point (-Infinity), not an internal error", () => {
    const lightCurve = simulated("carma:coincident");
    const model = buildModel("carma", summarizeLightCurve(lightCurve), { order: { p: 3, q: 0 } });
    const likelihood = modelLikelihood(model, lightCurve);
    // quality0 = 1/2 exactly: the quadratic factor has a double root.
    const at = model.space.physicalFromRecord({ sigma: 0.3, period0: 100, quality0: 0.5, tau0: 40, mean: 19 });
    expect(likelihood.logLikelihood(at)).toBe(-Infinity);
    const gradient = new Float64Array(at.length);
    expect(likelihood.logLikelihoodAndGradient!(at, gradient)).toBe(-Infinity);
    expect(Array.from(gradient).every((g) => g === 0)).toBe(true);
  });

  it("CARMA(1,0) is the damped random walk: the same likelihood, priors and evidence", () => {
    // Kelly et al. 2014, ApJ 788, 33, sec. 2: CARMA(1,0) is the Ornstein-Uhlenbeck process, the damped
    // random walk of Kelly, Bechtold & Siemiginowska 2009.
    const lightCurve = simulated("carma:drw");
    const summary = summarizeLightCurve(lightCurve);
    const drw = buildModel("drw", summary);
    const carma = buildModel("carma", summary, { order: { p: 1, q: 0 } });
    const at = { sigma: 0.27, tau: 75, mean: 19.05 };
    const drwL = modelLikelihood(drw, lightCurve).logLikelihood(drw.space.physicalFromRecord(at));
    const carmaL = modelLikelihood(carma, lightCurve).logLikelihood(carma.space.physicalFromRecord({ sigma: at.sigma, tau0: at.tau, mean: at.mean }));
    expect(Math.abs(drwL - carmaL)).toBeLessThan(1e-9 * Math.abs(drwL));
    const priorOf = (model: typeof drw, name: string) => model.space.free.find((p) => p.name === name)!.prior;
    expect(priorOf(carma, "tau0").settings).toEqual(priorOf(drw, "tau").settings);
    const comparison = compareModels(lightCurve, ["drw", "carma"], { seed: 3, carmaOrders: [{ p: 1, q: 0 }] });
    const [a, b] = comparison.ranking;
    // The Laplace values at the same mode agree to the optimiser's precision; the importance-sampling
    // estimates (independent draws) within their Monte Carlo error.
    expect(Math.abs(a!.laplaceLogEvidence - b!.laplaceLogEvidence)).toBeLessThan(1e-4);
    expect(a!.evidenceMethod).toBe("importance");
    expect(Math.abs(a!.logEvidence - b!.logEvidence)).toBeLessThan(4 * Math.hypot(a!.logEvidenceError!, b!.logEvidenceError!));
    expect(comparison.carmaOrder).toBeUndefined();
    expect(comparison.preference?.strength).toBe("inconclusive");
    expect(comparison.ranking.map((s) => s.label).sort()).toEqual(["carma(1,0)", "drw"]);
  });
});
