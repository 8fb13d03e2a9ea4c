import { describe, expect, it } from "vitest";
import { GaussianProcess } from "../../src/gp/gaussian-process.js";
import { kernels } from "../../src/kernels/index.js";
import { seasonalGroundCadence } from "../../src/lightcurve/cadence.js";
import type { LightCurve } from "../../src/lightcurve/light-curve.js";
import { summarizeLightCurve } from "../../src/models/data-summary.js";
import { buildModel } from "../../src/models/light-curve-model.js";
import { robustNoiseWeights, ROBUST_DEGREES_OF_FREEDOM } from "../../src/models/robust-noise.js";
import { createRng } from "../../src/random/rng.js";

describe("Student-t noise by expectation-maximisation (Lange, Little & Taylor 1989, JASA 84, 881)", () => {
  it("flags injected outliers and leaves clean points alone", () => {
    const rng = createRng("robust");
    const time = seasonalGroundCadence({ seasons: 3, revisitInterval: 4 }, rng);
    const n = time.length;
    const truth = new GaussianProcess(kernels.dampedRandomWalk({ sigma: 0.2, tau: 60 }), time, { mean: 19 }).priorDraw(rng);
    const error = new Float64Array(n).fill(0.02);
    const value = Float64Array.from(truth, (v) => v + 0.02 * rng.normal());
    const outliers = [10, 40, 41, 77, Math.floor(n / 2), n - 5];
    for (const i of outliers) value[i] += (i % 2 ? 1 : -1) * 0.4; // 20 error bars off
    const lightCurve: LightCurve = {
      time,
      value,
      error,
      unit: "mag",
      provenance: { source: "simulated", timeColumn: "time", valueColumn: "mag", errorColumn: "mag_err", dropped: 0, sorted: false },
    };
    const model = buildModel("drw", summarizeLightCurve(lightCurve));
    const robust = robustNoiseWeights(model, lightCurve);
    expect(robust.degreesOfFreedom).toBe(ROBUST_DEGREES_OF_FREEDOM);
    for (const i of outliers) expect(robust.outlierProbability[i]).toBeGreaterThan(0.9);
    const clean = Array.from(robust.outlierProbability).filter((_, i) => !outliers.includes(i));
    // For Gaussian scatter, a point is flagged (p > 0.5) only when its residual is a few sigma: rare.
    expect(clean.filter((p) => p > 0.5).length).toBeLessThanOrEqual(Math.ceil(0.02 * clean.length));
    for (const i of outliers) expect(robust.weights[i]).toBeLessThan(0.1);
  });
});
