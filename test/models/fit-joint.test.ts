import { describe, expect, it } from "vitest";
import { kernels } from "../../src/kernels/index.js";
import { seasonalGroundCadence } from "../../src/lightcurve/cadence.js";
import { fitJointDetailed } from "../../src/models/fit-joint.js";
import { simulateInterleavedBands } from "../../src/models/simulated-bands.js";
import { createRng } from "../../src/random/rng.js";

// A joint DRW fit samples by Pareto-smoothed importance sampling from the mode (docs/multi-band.md,
// "How a joint fit samples"), its diagnostics saying so, with k-hat under its threshold (Vehtari et al.
// 2024: reliable below about 0.7). Truth: the simulated amplitude ratios (invented four-band quasar).
describe("joint fit", () => {
  it("a four-band DRW: importance sampling, converged, amplitude ratios within 3 sd of the truth", () => {
    const rng = createRng("fit-joint:four-band");
    const visits = seasonalGroundCadence({ seasons: 3, revisitInterval: 1, weatherLoss: 0.3 }, rng).slice(0, 240);
    const bands = [
      { name: "g", amplitude: 1, mean: 20, depth5Sigma: 24.5 },
      { name: "r", amplitude: 0.85, mean: 19.9, depth5Sigma: 24.3 },
      { name: "i", amplitude: 0.7, mean: 19.8, depth5Sigma: 23.9 },
      { name: "z", amplitude: 0.6, mean: 19.7, depth5Sigma: 23.3 },
    ];
    const lightCurves = simulateInterleavedBands(kernels.dampedRandomWalk({ sigma: 0.2, tau: 120 }), visits, bands, rng);
    const fit = fitJointDetailed(lightCurves, { model: "drw", seed: 4, referenceBand: "g" });
    const d = fit.result.diagnostics;
    expect(d.method).toBe("importance");
    expect(d.converged).toBe(true);
    expect(d.paretoK ?? Infinity).toBeLessThanOrEqual(d.paretoKThreshold ?? 0);
    for (const band of bands.slice(1)) {
      const a = fit.result.parameters[`amplitude.${band.name}`];
      expect(Math.abs((a?.median ?? NaN) - band.amplitude)).toBeLessThan(3 * (a?.sd ?? 0));
    }
    expect(fit.draws.columns["mean.r"]?.length).toBe(fit.draws.chain.length); // the band means drawn back
  });

  it("refuses robust noise, which is a model of one band's points, rather than fit without it", () => {
    const rng = createRng("fit-joint:robust");
    const visits = seasonalGroundCadence({ seasons: 1, revisitInterval: 2 }, rng).slice(0, 40);
    const bands = [
      { name: "g", amplitude: 1, mean: 20, depth5Sigma: 24 },
      { name: "r", amplitude: 0.8, mean: 19.9, depth5Sigma: 24 },
    ];
    const lightCurves = simulateInterleavedBands(kernels.dampedRandomWalk({ sigma: 0.2, tau: 50 }), visits, bands, rng);
    expect(() => fitJointDetailed(lightCurves, { model: "drw", seed: 1, robust: true })).toThrow(/robust noise fits one band at a time/);
  });
});
