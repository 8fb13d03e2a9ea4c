import { describe, expect, it } from "vitest";
import { GaussianProcess } from "../../src/gp/gaussian-process.js";
import { kernels } from "../../src/kernels/index.js";
import { seasonalGroundCadence } from "../../src/lightcurve/cadence.js";
import type { LightCurve } from "../../src/lightcurve/light-curve.js";
import { summarizeLightCurve } from "../../src/models/data-summary.js";
import { buildModel } from "../../src/models/light-curve-model.js";
import { fitLightCurveDetailed } from "../../src/models/fit-light-curve.js";
import { conditioningLightCurve, modelFromResult } from "../../src/models/model-from-result.js";
import { parseFitResult } from "../../src/models/parse-fit-result.js";
import { robustNoiseWeights, robustWeightsAt, ROBUST_DEGREES_OF_FREEDOM } from "../../src/models/robust-noise.js";
import { createRng } from "../../src/random/rng.js";

/** A damped random walk (sigma 0.2 mag, tau 60 d) seen over a few seasons with 0.02 mag errors, `shift(i)` added at the outliers. */
function drwWithOutliers(seed: string, seasons: number, at: (n: number) => number[], shift: (i: number) => number): { lightCurve: LightCurve; outliers: number[] } {
  const rng = createRng(seed);
  const time = seasonalGroundCadence({ seasons, revisitInterval: 4 }, rng);
  const n = time.length;
  const truth = new GaussianProcess(kernels.dampedRandomWalk({ sigma: 0.2, tau: 60 }), time, { mean: 19 }).priorDraw(rng);
  const value = Float64Array.from(truth, (v) => v + 0.02 * rng.normal());
  const outliers = at(n);
  for (const i of outliers) value[i] += shift(i);
  const provenance = { source: "simulated", timeColumn: "time", valueColumn: "mag", errorColumn: "mag_err", dropped: 0, sorted: false };
  return { lightCurve: { time, value, error: new Float64Array(n).fill(0.02), unit: "mag", provenance }, outliers };
}

describe("Student-t noise by expectation-maximisation (Lange, Little & Taylor 1989, JASA 84, 881)", () => {
  it("flags injected outliers and leaves clean points alone", () => {
    const { lightCurve, outliers } = drwWithOutliers("robust", 3, (n) => [10, 40, 41, 77, Math.floor(n / 2), n - 5], (i) => (i % 2 ? 1 : -1) * 0.4); // 20 error bars off
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

describe("the robust section of a result stays bounded and gives every weight back", () => {
  it("lists the flagged points, and the stored parameters reproduce the weights the fit conditioned on", () => {
    const { lightCurve, outliers } = drwWithOutliers("robust-bounded", 2, (n) => [7, 30, Math.floor(n / 2), n - 3], () => 1.5); // 75 error bars off
    const { time, value } = lightCurve;
    const n = time.length;
    const fit = fitLightCurveDetailed(lightCurve, { model: "drw", robust: true, seed: 4, keptDraws: 40, clock: () => 0 });
    const robust = parseFitResult(JSON.parse(JSON.stringify(fit.result)), "lds-robust.json").robust!;
    // Bounded: no per-point array, only the flagged points (here exactly the injected ones).
    expect(robust.points).toBe(n);
    expect(robust.flagged.map((p) => p.index)).toEqual(outliers);
    for (const p of robust.flagged) {
      expect(p.time).toBe(time[p.index]);
      expect(p.value).toBe(value[p.index]);
      expect(p.weight).toBeLessThan(0.1);
    }
    expect(JSON.stringify(fit.result.robust).length).toBeLessThan(3000);
    expect(robust.weightSummary.belowHalf).toBeGreaterThanOrEqual(outliers.length);
    expect(robust.weightSummary.minimum).toBe(fit.robust!.weights.reduce((a, b) => Math.min(a, b), Infinity));
    // A reader (predict, report) recomputes the very errors the posterior was conditioned on.
    const again = conditioningLightCurve(parseFitResult(JSON.parse(JSON.stringify(fit.result)), "lds-robust.json"), lightCurve);
    expect(Array.from(again.error!)).toEqual(Array.from(fit.conditioning.error!));
    const model = modelFromResult(fit.result, lightCurve);
    const { weights } = robustWeightsAt(model, lightCurve, model.space.physicalFromRecord(robust.weightParameters));
    expect(Array.from(weights)).toEqual(Array.from(fit.robust!.weights));
  });
});
