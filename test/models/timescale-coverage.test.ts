import { describe, expect, it } from "vitest";
import { GaussianProcess } from "../../src/gp/gaussian-process.js";
import { createParameterSpace, logUniformPrior, normalPrior, posteriorByMethod, summarizeDraws } from "../../src/inference/index.js";
import { kernels } from "../../src/kernels/index.js";
import { seasonalGroundCadence } from "../../src/lightcurve/cadence.js";
import type { LightCurve } from "../../src/lightcurve/light-curve.js";
import { summarizeLightCurve } from "../../src/models/data-summary.js";
import { buildModel } from "../../src/models/light-curve-model.js";
import { collapseMean } from "../../src/models/mean-marginal.js";
import { childSeed, createRng } from "../../src/random/rng.js";

/**
 * Coverage of the true damped-random-walk timescale by the fit's default method (Pareto-smoothed
 * importance sampling with the mean integrated out, MCMC when its diagnostics fail), on realistic
 * cadences: ten seasons, a visit every six nights (about 210 epochs), errors 0.04 mag. The truths are
 * drawn from the prior the posterior is computed with (tau log-uniform 50-5000 d, reaching past the
 * 9.5-year baseline; sigma log-uniform 0.05-0.5 mag; mean normal), so a calibrated posterior puts the
 * truth in its central 68% interval with probability 0.68 and in its 95% interval with 0.95 whatever the
 * data (Talts, Betancourt, Simpson, Vehtari & Gelman 2018, arXiv:1804.06788). With 80
 * replicates the hit counts are Binomial(80, 0.68) (mean 54.4, sd 4.2) and Binomial(80, 0.95) (mean 76,
 * sd 1.9); the test accepts three binomial standard deviations: 42-66 and 71-80. The slow,
 * many-replicate check is bench/samplers-sbc.ts.
 */
describe("damped-random-walk timescale coverage (default method)", () => {
  it("the true tau lies in the 68% and 95% intervals as often as a calibrated posterior says", () => {
    const space = createParameterSpace([
      { name: "tau", prior: logUniformPrior(50, 5000) },
      { name: "sigma", prior: logUniformPrior(0.05, 0.5) },
      { name: "mean", prior: normalPrior(19, 0.3) },
    ]);
    const replicates = 80;
    let in68 = 0;
    let in95 = 0;
    const methods: Record<string, number> = {};
    for (let r = 0; r < replicates; r++) {
      const rng = createRng(childSeed("timescale-coverage", r));
      const truth = space.toPhysical(space.drawFromPrior(rng));
      const [tau, sigma, mean] = [truth[0], truth[1], truth[2]];
      const time = seasonalGroundCadence({ start: 60000, seasons: 10, revisitInterval: 6 }, rng);
      const latent = new GaussianProcess(kernels.dampedRandomWalk({ sigma, tau }), time, { mean }).priorDraw(rng);
      const error = new Float64Array(time.length).fill(0.04);
      const lightCurve: LightCurve = {
        time,
        value: Float64Array.from(latent, (v) => v + 0.04 * rng.normal()),
        error,
        unit: "mag",
        provenance: { source: `coverage ${r}`, timeColumn: "time", valueColumn: "mag", errorColumn: "mag_err", dropped: 0, sorted: false },
      };
      // The DRW model with these priors in place of the data-driven ones (same parameter order).
      const model = { ...buildModel("drw", summarizeLightCurve(lightCurve)), space };
      const collapsed = collapseMean(model, lightCurve)!;
      const fit = posteriorByMethod(collapsed.space, collapsed.likelihood, { seed: r });
      methods[fit.method] = (methods[fit.method] ?? 0) + 1;
      const s = summarizeDraws(fit.draws.columns.tau!);
      if (s.q16 <= tau && tau <= s.q84) in68++;
      if (s["q2.5"] <= tau && tau <= s["q97.5"]) in95++;
    }
    console.info(`tau coverage over ${replicates} replicates: 68% interval ${in68}, 95% interval ${in95}; methods ${JSON.stringify(methods)}`);
    expect(in68).toBeGreaterThanOrEqual(42);
    expect(in68).toBeLessThanOrEqual(66);
    expect(in95).toBeGreaterThanOrEqual(71);
  }, 600_000);
});
