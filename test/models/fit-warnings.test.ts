import { describe, expect, it } from "vitest";
import { createParameterSpace } from "../../src/inference/parameter-space.js";
import { logUniformPrior, normalPrior } from "../../src/inference/priors.js";
import type { LightCurve } from "../../src/lightcurve/light-curve.js";
import { fitWarnings } from "../../src/models/fit-warnings.js";
import { inventedFitResult, inventedSummary } from "../helpers/invented-fit-result.js";

/** An invented damped-random-walk fit whose timescale piles against the top of its prior (common practice: a limit, not a measurement). */
const space = createParameterSpace([
  { name: "tau", prior: logUniformPrior(1, 5420) },
  { name: "sigma", prior: logUniformPrior(1e-3, 5) },
  { name: "mean", prior: normalPrior(19, 2) },
]);
const lightCurve: LightCurve = {
  time: new Float64Array([0, 542]),
  value: new Float64Array([19, 19.1]),
  unit: "mag",
  provenance: { source: "lds-invented.csv", timeColumn: "mjd", valueColumn: "mag", errorColumn: "mag_err", dropped: 0, sorted: false },
};
const summary = { n: 76, baseline: 542, medianCadence: 3.09, minimumSpacing: 1, visitSpacing: 3, median: 19, spread: 0.1, medianError: 0.01, hasErrors: true };

describe("fitWarnings: every number with its unit", () => {
  it("gives the baseline, the timescale and the prior bound in days", () => {
    const parameters = { tau: inventedSummary(3000, 1500), sigma: inventedSummary(0.2, 0.05), mean: inventedSummary(19, 0.1) };
    const warnings = fitWarnings({ model: { name: "drw", space }, summary, lightCurve, parameters: { ...parameters, tau: { ...parameters.tau, "q97.5": 5400, "q2.5": 600 } }, diagnostics: inventedFitResult().diagnostics, modes: [] });
    expect(warnings).toContain("The baseline (542 d) is shorter than 10 tau (tau = 3.00e+3 d): damped-random-walk timescales this long relative to the baseline are biased (Kozlowski 2017, A&A 597, A128).");
    expect(warnings.some((w) => w.startsWith("tau runs into the upper end of its prior (5.42e+3 d): the data give only a lower limit (tau > 600 d with 97.5% probability)"))).toBe(true);
  });
});
