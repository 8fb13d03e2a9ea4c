import { describe, expect, it } from "vitest";
import { GaussianProcess } from "../../src/gp/gaussian-process.js";
import { kernels } from "../../src/kernels/index.js";
import { seasonalGroundCadence } from "../../src/lightcurve/cadence.js";
import type { LightCurve } from "../../src/lightcurve/light-curve.js";
import { fitLightCurve } from "../../src/models/fit-light-curve.js";
import { createRng } from "../../src/random/rng.js";

/**
 * Sparse two-season rotators with several period modes (issue 12): amplitudes 1 to 2.5 times the errors,
 * periods 2 to 30 d, about 60 visits a season. Before, about two thirds of such light curves crashed
 * when the modes' draws were pooled; mended by hand, 19 of 20 truths were inside the 95% interval. If the
 * posterior is calibrated the truth lies inside the central 95% interval of dominantPeriod (the period
 * to quote, which is `period` for the harmonicWeight of 0.2 simulated) 95% of the time; Binomial(20, 0.95)
 * is at least 17 with probability 0.98, so the test asks for 85%. Measured 2026-12-02 (importance sampling
 * from the mode mixture, the default): 18/20 covered, 16/20 within 10%, 12/20 with several modes.
 */
function sparseRotator(k: number): { lightCurve: LightCurve; period: number } {
  const rng = createRng(`sparse-rotator:${k}`);
  const period = 2 * 15 ** rng.uniform();
  const time = seasonalGroundCadence({ seasons: 2, revisitInterval: 3 }, rng);
  const error = 0.02;
  const sigma = error * (1 + 1.5 * rng.uniform());
  const signal = new GaussianProcess(kernels.quasiPeriodic({ sigma, period, decayTime: 6 * period, harmonicWeight: 0.2 }), time, { mean: 15 }).priorDraw(rng);
  const value = Float64Array.from(signal, (v) => v + error * rng.normal());
  const source = `sparse rotator ${k}`;
  return {
    lightCurve: { time, value, error: new Float64Array(time.length).fill(error), unit: "mag", provenance: { source, timeColumn: "t", valueColumn: "mag", errorColumn: "err", dropped: 0, sorted: false } },
    period,
  };
}

describe("sparse two-season rotators", () => {
  it("the 95% interval of the dominant period covers the truth in at least 85% of 20", () => {
    let covered = 0;
    let within10 = 0;
    let multimodal = 0;
    for (let k = 0; k < 20; k++) {
      const { lightCurve, period } = sparseRotator(k);
      const result = fitLightCurve(lightCurve, { model: "quasi-periodic", seed: k });
      const dominant = result.derived.dominantPeriod!;
      if (dominant["q2.5"] <= period && period <= dominant["q97.5"]) covered++;
      if (Math.abs(dominant.median / period - 1) < 0.1) within10++;
      if ((result.periodModes?.length ?? 0) > 1) multimodal++;
      console.info(`rotator ${k}: truth ${period.toFixed(3)}, dominantPeriod ${dominant.median.toFixed(3)} [${dominant["q2.5"].toFixed(3)}, ${dominant["q97.5"].toFixed(3)}], modes ${JSON.stringify(result.periodModes)}`);
    }
    console.info(`sparse rotators: covered ${covered}/20, within 10% ${within10}/20, multimodal ${multimodal}/20`);
    expect(covered).toBeGreaterThanOrEqual(17);
  });
});
