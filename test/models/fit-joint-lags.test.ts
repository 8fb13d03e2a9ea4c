import { describe, expect, it } from "vitest";
import { fitJointDetailed } from "../../src/models/fit-joint.js";
import { QUASAR_BAND_NAMES, simulatedSixBandQuasar } from "../../src/models/simulated-quasar-bands.js";
import { createRng } from "../../src/random/rng.js";

// Six-band joint DRW fits with lags (12 sampled parameters) on two quasars of the calibration set of
// bench/multi-band-calibration.ts --lags (docs/multi-band.md, "How a joint fit samples"). Truths: the
// simulated lags. Curve 1 of seed 15: from the Laplace proposal importance sampling failed (k-hat 0.79)
// and the walker ensemble ran 5e5 evaluations; the lags' conditionals are tents 1.5-3.6 times wider than
// the curvature at their tip says, and the widened pilot fixes it. Curve 0 of seed 17: the lag scan at
// the kernel's first guess missed by about a day and the search stopped in a lesser lag mode (ln p 27
// below), four of five true lags outside their 95% intervals; the scan again at the first maximum finds
// the right one. k-hat under its threshold (Vehtari et al. 2024: reliable below about 0.7).
describe("joint fit with lags", () => {
  it.each([
    [15, 1],
    [17, 0],
  ])("calibration quasar seed %i curve %i: importance sampling, converged, every true lag in its central 95 per cent interval", (seed, curve) => {
    const quasar = simulatedSixBandQuasar(createRng(`bench:multi-band-calibration:${seed}:${curve}`), { lags: true });
    const fit = fitJointDetailed(quasar.lightCurves, { model: "drw", seed: seed * 1000 + curve, referenceBand: "g", lags: true });
    const d = fit.result.diagnostics;
    expect(d.method).toBe("importance");
    expect(d.converged).toBe(true);
    expect(d.paretoK ?? Infinity).toBeLessThanOrEqual(d.paretoKThreshold ?? 0);
    expect(d.likelihoodEvaluations).toBeLessThan(40000);
    QUASAR_BAND_NAMES.forEach((band, b) => {
      if (band === "g") return;
      const lag = fit.result.parameters[`lag.${band}`];
      const truth = quasar.lags[b] ?? NaN;
      expect(lag?.["q2.5"] ?? Infinity).toBeLessThanOrEqual(truth);
      expect(lag?.["q97.5"] ?? -Infinity).toBeGreaterThanOrEqual(truth);
    });
  });
});
