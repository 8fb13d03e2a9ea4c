import { describe, expect, it } from "vitest";
import { expectedColumns } from "../../src/batch/result-columns.js";
import { buildModel, MODEL_NAMES, modelParameterNames } from "../../src/models/light-curve-model.js";
import type { DataSummary } from "../../src/models/data-summary.js";

const summary: DataSummary = { n: 300, baseline: 900, medianCadence: 2.1, minimumSpacing: 0.3, median: 16.2, spread: 0.04, medianError: 0.01, hasErrors: true, visitSpacing: 0.3 };

// Reference: the fit-result contract in docs/choosing-a-kernel.md ("The models of the trade") and the
// parameter names of each model it lists.
describe("the models of the trade, read from the kernel family descriptors", () => {
  it("are drw, oscillator, quasi-periodic and carma with the documented parameters, in order", () => {
    expect(MODEL_NAMES).toEqual(["drw", "oscillator", "quasi-periodic", "carma"]);
    expect(modelParameterNames("drw")).toEqual(["tau", "sigma", "mean"]);
    expect(modelParameterNames("oscillator")).toEqual(["period", "quality", "sigma", "mean"]);
    expect(modelParameterNames("quasi-periodic")).toEqual(["period", "decayTime", "harmonicWeight", "sigma", "mean"]);
    for (const name of MODEL_NAMES.filter((m) => m !== "carma")) expect(buildModel(name, summary).space.names).toEqual(modelParameterNames(name));
    // CARMA's parameters follow its order; the amplitude and the mean are those of every model.
    expect(modelParameterNames("carma")).toEqual(["sigma", "mean"]);
    const carma = buildModel("carma", summary, { order: { p: 2, q: 1 } }).space.names;
    for (const name of modelParameterNames("carma")) expect(carma).toContain(name);
  });

  it("priors by kind: the rotation period stops at half the baseline, the oscillator's at the baseline; the decay time from the shortest period to ten baselines", () => {
    const rotation = buildModel("quasi-periodic", summary, { periodGuess: 7.4 });
    const prior = (name: string) => rotation.space.free.find((p) => p.name === name)!.prior;
    // Shortest period twice the typical spacing of visits on different nights (0.3 d).
    expect(prior("period").settings).toEqual({ lower: 0.6, upper: 450 });
    expect(prior("decayTime").settings).toEqual({ lower: 0.6, upper: 9000 });
    expect(prior("harmonicWeight").settings).toEqual({ lower: 0, upper: 1 });
    expect(rotation.initialGuess).toMatchObject({ period: 7.4, decayTime: 3 * 7.4, harmonicWeight: 0.3 });
    const oscillator = buildModel("oscillator", summary);
    expect(oscillator.space.free.find((p) => p.name === "period")!.prior.settings).toEqual({ lower: 0.6, upper: 900 });
    const withBackground = buildModel("quasi-periodic", summary, { background: "drw" });
    expect(withBackground.space.names).toEqual(["period", "decayTime", "harmonicWeight", "sigma", "mean", "backgroundTau", "backgroundSigma"]);
  });

  it("the batch table's columns follow the same parameter lists", () => {
    const columns = expectedColumns("quasi-periodic", undefined);
    for (const name of modelParameterNames("quasi-periodic")) expect(columns).toContain(`${name}.median`);
    expect(columns).not.toContain("quality.median");
  });
});
