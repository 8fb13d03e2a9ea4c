import { describe, expect, it } from "vitest";
import { GaussianProcess } from "../../src/gp/gaussian-process.js";
import { kernels } from "../../src/kernels/index.js";
import { seasonalGroundCadence } from "../../src/lightcurve/cadence.js";
import type { LightCurve } from "../../src/lightcurve/light-curve.js";
import { summarizeLightCurve } from "../../src/models/data-summary.js";
import { buildModel, modelLikelihood } from "../../src/models/light-curve-model.js";
import { collapseMean, restoreMean } from "../../src/models/mean-marginal.js";
import { createRng } from "../../src/random/rng.js";

function simulatedQuasar(seed: string, withErrors: boolean): LightCurve {
  const rng = createRng(seed);
  const time = seasonalGroundCadence({ seasons: 3, revisitInterval: 5 }, rng);
  const truth = new GaussianProcess(kernels.dampedRandomWalk({ sigma: 0.25, tau: 300 }), time, { mean: 19.4 }).priorDraw(rng);
  const error = new Float64Array(time.length).fill(0.03);
  return {
    time,
    value: Float64Array.from(truth, (v) => v + 0.03 * rng.normal()),
    ...(withErrors ? { error } : {}),
    unit: "mag",
    provenance: { source: "simulated", timeColumn: "time", valueColumn: "mag", errorColumn: withErrors ? "mag_err" : null, dropped: 0, sorted: false },
  };
}

/**
 * Reference: the definition p(y | theta) = integral of p(y | theta, mu) N(mu | m0, s^2) d mu, evaluated by
 * the composite Simpson rule over +-12 conditional standard deviations with the model's own likelihood
 * (which holds the mean as a parameter). Checks the plumbing of the collapsed model: parameter order,
 * jitter, background term and prior.
 */
describe("model with the constant mean integrated out", () => {
  it.each([
    ["damped random walk with errors", "drw", true, {}],
    ["damped random walk, jitter fitted (no errors) and a background term", "drw", false, { background: "drw" as const }],
  ])("%s: the collapsed likelihood equals the numerical integral over the mean", (_, name, withErrors, structure) => {
    const lightCurve = simulatedQuasar(String(name) + String(withErrors), withErrors as boolean);
    const model = buildModel(name as "drw", summarizeLightCurve(lightCurve), structure);
    const collapsed = collapseMean(model, lightCurve)!;
    expect(collapsed.space.names).not.toContain("mean");
    const full = modelLikelihood(model, lightCurve);
    const { mean: _guessedMean, ...guess } = model.initialGuess;
    const theta = collapsed.space.physicalFromRecord(guess);
    const { mean: center, sd } = collapsed.meanPosterior(theta);
    const { mean: m0, sd: s } = collapsed.prior;
    const record = collapsed.space.recordFromPhysical(theta);
    const at = (mu: number) => {
      const physical = model.space.physicalFromRecord({ ...record, mean: mu });
      return full.logLikelihood(physical) - 0.5 * ((mu - m0) / s) ** 2 - Math.log(s * Math.sqrt(2 * Math.PI));
    };
    const steps = 2000;
    const h = (24 * sd) / steps;
    const peak = at(center);
    let sum = 0;
    for (let i = 0; i <= steps; i++) {
      const weight = i === 0 || i === steps ? 1 : i % 2 ? 4 : 2;
      sum += weight * Math.exp(at(center - 12 * sd + i * h) - peak);
    }
    const integral = peak + Math.log((sum * h) / 3);
    expect(collapsed.likelihood.logLikelihood(theta)).toBeCloseTo(integral, 8);
  });

  it("draws the mean from its conditional posterior (mean and sd of 20000 draws at one parameter vector)", () => {
    const lightCurve = simulatedQuasar("draws", true);
    const model = buildModel("drw", summarizeLightCurve(lightCurve));
    const collapsed = collapseMean(model, lightCurve)!;
    const { mean: _guessedMean, ...guess } = model.initialGuess;
    const theta = collapsed.space.physicalFromRecord(guess);
    const count = 20000;
    const columns = Object.fromEntries(collapsed.space.names.map((n, i) => [n, new Float64Array(count).fill(theta[i])]));
    const draws = { names: collapsed.space.names, columns, chain: new Int32Array(count), iteration: Int32Array.from({ length: count }, (_, i) => i), logPosterior: new Float64Array(count) };
    const restored = restoreMean(model, collapsed, draws, createRng(5));
    expect(restored.names).toEqual(model.space.names);
    const mu = restored.columns.mean!;
    const average = mu.reduce((a, b) => a + b, 0) / count;
    const variance = mu.reduce((a, b) => a + (b - average) ** 2, 0) / (count - 1);
    const expected = collapsed.meanPosterior(theta);
    // 5 standard errors: of the mean sd / sqrt(n), of the variance sd^2 sqrt(2 / (n - 1)).
    expect(Math.abs(average - expected.mean)).toBeLessThan((5 * expected.sd) / Math.sqrt(count));
    expect(Math.abs(variance / expected.sd ** 2 - 1)).toBeLessThan(5 * Math.sqrt(2 / (count - 1)));
  });
});
