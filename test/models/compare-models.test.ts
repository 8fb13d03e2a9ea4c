import { describe, expect, it } from "vitest";
import { GaussianProcess } from "../../src/gp/gaussian-process.js";
import { kernels, type Kernel } from "../../src/kernels/index.js";
import { seasonalGroundCadence } from "../../src/lightcurve/cadence.js";
import { observeMagnitudes } from "../../src/lightcurve/simulated-photometry.js";
import { compareModels } from "../../src/models/compare-models.js";
import { createRng } from "../../src/random/rng.js";

function simulate(kernel: Kernel, seed: string) {
  const rng = createRng(seed);
  const time = seasonalGroundCadence({ seasons: 2, revisitInterval: 2 }, rng);
  const truth = new GaussianProcess(kernel, time, { mean: 17 }).priorDraw(rng);
  return observeMagnitudes(time, truth, { depth5Sigma: 22 }, rng, seed);
}

/**
 * "Is there a period at all?": the Laplace evidence (MacKay 2003, ch. 28) must prefer the model that made the
 * data, read on the Kass & Raftery 1995 (JASA 90, 773) scale. Simulated light curves with known truth.
 */
describe("model comparison by Bayesian evidence", () => {
  it("finds the period of a spotted star and none in a quasar", () => {
    const star = simulate(kernels.quasiPeriodic({ sigma: 0.05, period: 6.2, decayTime: 30, harmonicWeight: 0.3 }), "compare-star");
    const periodic = compareModels(star, ["drw", "quasi-periodic"], { seed: 1 });
    expect(periodic.ranking[0].model).toBe("quasi-periodic");
    expect(Math.abs(periodic.ranking[0].maximum.period / 6.2 - 1)).toBeLessThan(0.05);
    expect(periodic.verdict).toMatch(/A period is supported/);
    expect(2 * -periodic.ranking[1].deltaLogEvidence).toBeGreaterThan(10);
    // How strongly: ln B of the best over the runner-up with its Monte Carlo error, on Kass & Raftery's bands.
    expect(periodic.preference?.preferred).toBe("quasi-periodic");
    expect(periodic.preference?.strength).toBe("overwhelming");
    expect(periodic.verdict).toMatch(/2 ln B = [\d.]+( ± [\d.]+)?, overwhelming evidence/);
    const drw = periodic.ranking.find((s) => s.model === "drw")!;
    expect(drw.evidenceMethod).toBe("importance");
    expect(drw.logEvidenceError).toBeGreaterThan(0);
    expect(drw.logEvidenceError).toBeLessThan(0.2);
    expect(Math.abs(drw.logEvidence - drw.laplaceLogEvidence)).toBeLessThan(1);

    const quasar = simulate(kernels.dampedRandomWalk({ sigma: 0.2, tau: 40 }), "compare-quasar");
    const aperiodic = compareModels(quasar, ["drw", "quasi-periodic"], { seed: 1 });
    expect(aperiodic.ranking[0].model).toBe("drw");
    expect(aperiodic.verdict).toMatch(/No period/);
  });
});
