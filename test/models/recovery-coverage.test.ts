import { describe, expect, it } from "vitest";
import { GaussianProcess } from "../../src/gp/gaussian-process.js";
import { kernels } from "../../src/kernels/index.js";
import { seasonalGroundCadence } from "../../src/lightcurve/cadence.js";
import { observeMagnitudes } from "../../src/lightcurve/simulated-photometry.js";
import { fitLightCurve } from "../../src/models/fit-light-curve.js";
import { createRng } from "../../src/random/rng.js";

/**
 * Recovery and interval coverage on simulated damped-random-walk light curves with seasonal gaps (fixed
 * seeds). If the posterior is calibrated, the true value lies inside the central 68% interval (q16 to q84)
 * with probability 0.68 for every parameter. With 12 light curves x 3 parameters the hit count is
 * Binomial(36, 0.68) if the parameters were independent (they are not quite, which widens the spread); the
 * test accepts 3 binomial standard deviations (16 to 33 hits). Baselines are kept above 10 tau so that the
 * timescales are not biased (Kozlowski 2017, A&A 597, A128).
 */
describe("damped-random-walk recovery on seasonal-gap cadences", () => {
  it("the truth lies in the 68% interval about 68% of the time", () => {
    let hits = 0;
    let checks = 0;
    for (let k = 0; k < 12; k++) {
      const rng = createRng(`coverage:${k}`);
      const tau = 20 + 40 * rng.uniform();
      const sigma = 0.1 + 0.2 * rng.uniform();
      const mean = 18 + 2 * rng.uniform();
      const time = seasonalGroundCadence({ seasons: 3, revisitInterval: 6 }, rng);
      const truth = new GaussianProcess(kernels.dampedRandomWalk({ sigma, tau }), time, { mean }).priorDraw(rng);
      const lightCurve = observeMagnitudes(time, truth, { depth5Sigma: 22.5 }, rng, `coverage ${k}`);
      const result = fitLightCurve(lightCurve, { model: "drw", seed: k });
      for (const [name, value] of [["tau", tau], ["sigma", sigma], ["mean", mean]] as const) {
        const s = result.parameters[name];
        checks++;
        if (s.q16 <= value && value <= s.q84) hits++;
      }
    }
    console.info(`68% interval coverage: ${hits} of ${checks} (${((100 * hits) / checks).toFixed(0)}%)`);
    expect(checks).toBe(36);
    expect(hits).toBeGreaterThanOrEqual(16);
    expect(hits).toBeLessThanOrEqual(33);
  }, 1_800_000);
});
