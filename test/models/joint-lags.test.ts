import { describe, expect, it } from "vitest";
import { kernels } from "../../src/kernels/index.js";
import { seasonalGroundCadence } from "../../src/lightcurve/cadence.js";
import { buildJointModel, jointLikelihood } from "../../src/models/joint-model.js";
import { lagScanGuess } from "../../src/models/joint-lag-scan.js";
import { jointWarnings } from "../../src/models/joint-warnings.js";
import { simulateInterleavedBands } from "../../src/models/simulated-bands.js";
import { createRng } from "../../src/random/rng.js";

// Lags of a few days against a timescale of hundreds of days (the continuum of a quasar at longer
// wavelengths following the shorter ones): simulated interleaved bands with known lags; the likelihood
// profile of each lag, other parameters at their true values, peaks within its 1-sigma profile interval
// (Delta log L = 1/2, Wilks' theorem: common practice) of the truth.
describe("inter-band lags", () => {
  const truth = { tau: 300, sigma: 0.3, lags: [0, 3, 6] };
  const rng = createRng("joint:lags");
  const visits = seasonalGroundCadence({ seasons: 3, revisitInterval: 1, weatherLoss: 0.2 }, rng);
  const bands = [
    { name: "g", amplitude: 1, mean: 20, lag: truth.lags[0], depth5Sigma: 25 },
    { name: "r", amplitude: 0.85, mean: 19.8, lag: truth.lags[1], depth5Sigma: 25 },
    { name: "i", amplitude: 0.7, mean: 19.7, lag: truth.lags[2], depth5Sigma: 24.5 },
  ];
  const lightCurves = simulateInterleavedBands(kernels.dampedRandomWalk({ sigma: truth.sigma, tau: truth.tau }), visits, bands, rng);
  const model = buildJointModel("drw", lightCurves, { lags: true, referenceBand: "g" });
  const likelihood = jointLikelihood(model, lightCurves);
  const at = (lagR: number, lagI: number) =>
    likelihood.logLikelihood(
      model.space.physicalFromRecord({
        tau: truth.tau,
        sigma: truth.sigma,
        "amplitude.r": 0.85,
        "amplitude.i": 0.7,
        "mean.g": 20,
        "mean.r": 19.8,
        "mean.i": 19.7,
        "lag.r": lagR,
        "lag.i": lagI,
      }),
    );

  for (const [band, index] of [["r", 1], ["i", 2]] as const) {
    it(`lag.${band} (true ${truth.lags[index]} d) is recovered within its profile interval`, () => {
      const grid = Array.from({ length: 121 }, (_, k) => -6 + 0.15 * k);
      const profile = grid.map((lag) => (index === 1 ? at(lag, truth.lags[2]) : at(truth.lags[1], lag)));
      const best = profile.reduce((b, v, k) => (v > profile[b] ? k : b), 0);
      const inside = grid.filter((_, k) => profile[k] > profile[best] - 0.5);
      expect(Math.min(...inside) - 0.15).toBeLessThanOrEqual(truth.lags[index]);
      expect(Math.max(...inside) + 0.15).toBeGreaterThanOrEqual(truth.lags[index]);
      // A few days against a prior of +-20 cadences: the lag is resolved (the interval is days wide).
      expect(Math.max(...inside) - Math.min(...inside)).toBeLessThan(4);
    });
  }

  it("the lag scan's first guesses lie within a day of the true lags", () => {
    const guess = lagScanGuess(model, lightCurves);
    expect(Math.abs((guess["lag.r"] ?? NaN) - truth.lags[1])).toBeLessThan(1);
    expect(Math.abs((guess["lag.i"] ?? NaN) - truth.lags[2])).toBeLessThan(1);
    expect(guess["lag.g"]).toBeUndefined(); // the reference band's lag is fixed at 0
  });

  it("says when a lag is not resolved", () => {
    const wide = { median: 0, mean: 0, sd: 10, "q2.5": -20, q16: -0.8 * model.lagRange, q84: 0.8 * model.lagRange, "q97.5": 20 };
    const narrow = { ...wide, q16: 2, q84: 4 };
    const warnings = jointWarnings(model, lightCurves, { "lag.r": narrow, "lag.i": wide });
    expect(warnings.filter((w) => w.includes("not resolved"))).toHaveLength(1);
    expect(warnings.some((w) => w.startsWith("lag.i is not resolved"))).toBe(true);
  });
});
