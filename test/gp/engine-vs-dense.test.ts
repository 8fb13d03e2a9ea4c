import { describe, expect, it } from "vitest";
import { DenseGaussianProcess } from "../../src/gp/dense-gaussian-process.js";
import { GaussianProcess } from "../../src/gp/gaussian-process.js";
import { kernels, type Kernel } from "../../src/kernels/index.js";
import { createRng } from "../../src/random/rng.js";
import { COMPOSITE_CASES, FAMILY_CASES } from "../helpers/kernel-cases.js";
import { expectSameConditioning } from "../helpers/conditioned-agreement.js";
import { randomErrors, seasonalTimes } from "../helpers/seasonal-times.js";

// Reference: the dense Cholesky of ml-matrix (a general-purpose linear-algebra library) computing
// log N(y | m, K) and the prediction equations of Rasmussen & Williams 2006, Algorithm 2.1 / eq. 5.9.
const families: Array<[string, Kernel]> = [
  ...FAMILY_CASES,
  ["oscillator Q = 1/2", kernels.oscillator({ sigma: 0.2, period: 60, quality: 0.5 })],
  ...COMPOSITE_CASES,
  [
    "(matern32 + drw) times oscillator",
    kernels
      .matern32({ sigma: 0.3, scale: 20 })
      .plus(kernels.dampedRandomWalk({ sigma: 0.2, tau: 80 }))
      .times(kernels.oscillator({ sigma: 1.1, period: 55, quality: 0.8 })),
  ],
];

describe("semiseparable engine against dense linear algebra", () => {
  for (const [name, kernel] of families) {
    it(`${name}: log-likelihood, gradient and predictions agree to 1e-9`, () => {
      const rng = createRng(`dense:${name}`);
      const t = seasonalTimes(rng, { seasons: 3, perSeason: 60 });
      const errors = randomErrors(rng, t.length);
      const options = { errors, mean: 0.4, jitter: 0.01 };
      const sparse = new GaussianProcess(kernel, t, options);
      const dense = new DenseGaussianProcess(kernel, t, options);
      const y = sparse.priorDraw(rng).map((v, i) => v + errors[i] * rng.normal());

      const logL = sparse.logLikelihood(y);
      expect(Math.abs(logL - dense.logLikelihood(y)) / Math.abs(dense.logLikelihood(y))).toBeLessThan(1e-9);

      const g = sparse.logLikelihoodGradient(y);
      const gd = dense.logLikelihoodGradient(y);
      expect(Math.abs(g.value - logL)).toBeLessThan(1e-9 * Math.abs(logL));
      const scale = Math.max(...Array.from(gd.kernel, Math.abs), 1);
      for (let c = 0; c < gd.kernel.length; c++) expect(Math.abs(g.kernel[c] - gd.kernel[c]) / scale).toBeLessThan(1e-9);
      expect(Math.abs(g.mean - gd.mean) / Math.max(1, Math.abs(gd.mean))).toBeLessThan(1e-9);
      expect(Math.abs(g.jitter - gd.jitter) / Math.max(1, Math.abs(gd.jitter))).toBeLessThan(1e-9);

      // Inside the gaps, between points, before the first and after the last point.
      const tNew = Float64Array.from([-150, -3, t[5] + 0.1, 250, 300, t[70], 640, 800, 1200, 1500]);
      expectSameConditioning(sparse, dense, y, tNew, kernel.variance);
    });
  }

  it("agrees at N = 2000 with months-long gaps", () => {
    const rng = createRng("dense:large");
    const kernel = kernels
      .quasiPeriodic({ sigma: 0.1, period: 13.1, decayTime: 42, harmonicWeight: 0.2 })
      .plus(kernels.dampedRandomWalk({ sigma: 0.05, tau: 200 }));
    const t = seasonalTimes(rng, { seasons: 5, perSeason: 400 });
    const errors = randomErrors(rng, t.length, 0.005, 0.03);
    const sparse = new GaussianProcess(kernel, t, { errors });
    const dense = new DenseGaussianProcess(kernel, t, { errors });
    const y = sparse.priorDraw(rng).map((v, i) => v + errors[i] * rng.normal());
    const a = sparse.logLikelihood(y);
    const b = dense.logLikelihood(y);
    expect(Math.abs(a - b) / Math.abs(b)).toBeLessThan(1e-9);
  });
});
