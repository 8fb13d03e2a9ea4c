import { describe, expect, it } from "vitest";
import { GaussianProcess } from "../../src/gp/gaussian-process.js";
import { kernels } from "../../src/kernels/index.js";
import { continuousSpaceCadence } from "../../src/lightcurve/cadence.js";
import type { LightCurve } from "../../src/lightcurve/light-curve.js";
import { fitLightCurve } from "../../src/models/fit-light-curve.js";
import { createRng } from "../../src/random/rng.js";

/** An invented spotted star: 60 days, an exposure every 12 hours, period 4.2 d (quasi-periodic kernel), 3 mmag errors. */
function spottedStar(): LightCurve {
  const rng = createRng("fit-sampling-star");
  const time = continuousSpaceCadence({ start: 0, duration: 60, interval: 0.5 }, rng);
  const latent = new GaussianProcess(kernels.quasiPeriodic({ sigma: 0.02, period: 4.2, decayTime: 20, harmonicWeight: 0.2 }), time, { mean: 12 }).priorDraw(rng);
  const error = new Float64Array(time.length).fill(0.003);
  return {
    time,
    value: Float64Array.from(latent, (v) => v + 0.003 * rng.normal()),
    error,
    unit: "mag",
    provenance: { source: "spotted star", timeColumn: "t", valueColumn: "mag", errorColumn: "err", dropped: 0, sorted: false },
  };
}

describe("the sampling stage of a periodic fit", () => {
  it("draws by importance sampling from the mode mixture by default, the truth's period inside the 95% interval", () => {
    const result = fitLightCurve(spottedStar(), { model: "quasi-periodic", seed: 3 });
    expect(result.diagnostics.method).toBe("importance");
    expect(result.diagnostics.converged).toBe(true);
    expect(result.diagnostics.paretoK!).toBeLessThanOrEqual(result.diagnostics.paretoKThreshold!);
    const period = result.parameters.period!;
    expect(period["q2.5"]).toBeLessThanOrEqual(4.2);
    expect(period["q97.5"]).toBeGreaterThanOrEqual(4.2);
    expect(result.periodModes!.length).toBeGreaterThanOrEqual(1);
  });

  it("falls back to MCMC when k-hat fails, and says why", () => {
    // A threshold no k-hat can meet forces the fallback; a small budget keeps the MCMC run short.
    const result = fitLightCurve(spottedStar(), { model: "quasi-periodic", seed: 3, importance: { shapeThreshold: -10 }, maxEvaluations: 30000 });
    expect(result.diagnostics.method).not.toBe("importance");
    expect(result.diagnostics.importanceFallback).toMatch(/k-hat/);
    // The failed sample's k-hat is reported beside the chains' figures (importanceDraws only for accepted samples).
    expect(result.diagnostics.paretoK!).toBeGreaterThan(-10);
    expect(result.diagnostics.rhatMax).not.toBeNull();
  });
});
