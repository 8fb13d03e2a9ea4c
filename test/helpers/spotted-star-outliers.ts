import { GaussianProcess } from "../../src/gp/gaussian-process.js";
import { kernels } from "../../src/kernels/index.js";
import { seasonalGroundCadence } from "../../src/lightcurve/cadence.js";
import type { LightCurve } from "../../src/lightcurve/light-curve.js";
import { createRng } from "../../src/random/rng.js";

/**
 * Gross outliers (issue 12): a spotted star (389 points, period 3.69 d, amplitude 0.03 mag) with five
 * points moved by 1.2-4 mag crashed the quasi-periodic fit, and where it ran with --robust reported a
 * period of 1.69 d and sigma 0.31 mag with the bad points at weights ~0.99, none flagged. Invented
 * data of that shape; the Student-t noise model is that of Lange, Little & Taylor 1989 (JASA 84, 881).
 */
export function spottedStarWithOutliers(): { lightCurve: LightCurve; bad: number[] } {
  const rng = createRng("spotted-star-outliers");
  const time = seasonalGroundCadence({ seasons: 2, revisitInterval: 1, seasonLength: 300 }, rng).slice(0, 389);
  const signal = new GaussianProcess(kernels.quasiPeriodic({ sigma: 0.03, period: 3.69, decayTime: 40, harmonicWeight: 0.2 }), time, { mean: 14.2 }).priorDraw(rng);
  const error = Float64Array.from(time, () => 0.008 + 0.004 * rng.uniform());
  const value = Float64Array.from(signal, (v, i) => v + error[i] * rng.normal());
  const bad = [37, 101, 188, 250, 333];
  const shifts = [1.2, -2.1, 3.0, 4.0, -1.6];
  bad.forEach((i, k) => (value[i] += shifts[k]));
  return {
    lightCurve: { time, value, error, unit: "mag", provenance: { source: "spotted star", timeColumn: "t", valueColumn: "mag", errorColumn: "err", dropped: 0, sorted: false } },
    bad,
  };
}

