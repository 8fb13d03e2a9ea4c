import { describe, expect, it } from "vitest";
import { DenseGaussianProcess } from "../../src/gp/dense-gaussian-process.js";
import { GaussianProcess } from "../../src/gp/gaussian-process.js";
import { kernels } from "../../src/kernels/index.js";
import { createRng } from "../../src/random/rng.js";
import { centralDifference } from "../helpers/central-difference.js";
import { randomErrors, seasonalTimes } from "../helpers/seasonal-times.js";

type C = [number, number];
const mul = (a: C, b: C): C => [a[0] * b[0] - a[1] * b[1], a[0] * b[1] + a[1] * b[0]];
const div = (a: C, b: C): C => {
  const d = b[0] * b[0] + b[1] * b[1];
  return [(a[0] * b[0] + a[1] * b[1]) / d, (a[1] * b[0] - a[0] * b[1]) / d];
};
const poly = (coefficients: number[], z: C): C => {
  let total: C = [0, 0];
  let power: C = [1, 0];
  for (const c of coefficients) {
    total = [total[0] + c * power[0], total[1] + c * power[1]];
    power = mul(power, z);
  }
  return total;
};

/**
 * Kelly et al. 2014 (ApJ 788, 33), eq. 4: the CARMA(p, q) autocovariance
 * R(tau) = sigma^2 sum_k [b(r_k) b(-r_k) / (-2 Re(r_k) prod_{l != k} (r_l - r_k)(r_l^* + r_k))] exp(r_k tau),
 * with b(s) = sum_l beta_l s^l; written out here independently of the library.
 */
function kellyAutocovariance(roots: C[], beta: number[], tau: number): number {
  let total: C = [0, 0];
  for (const rk of roots) {
    let numerator = mul(poly(beta, rk), poly(beta, [-rk[0], -rk[1]]));
    let denominator: C = [-2 * rk[0], 0];
    for (const rl of roots) {
      if (rl === rk) continue;
      denominator = mul(denominator, mul([rl[0] - rk[0], rl[1] - rk[1]], [rl[0] + rk[0], -rl[1] + rk[1]]));
    }
    numerator = mul(numerator, [Math.exp(rk[0] * tau) * Math.cos(rk[1] * tau), Math.exp(rk[0] * tau) * Math.sin(rk[1] * tau)]);
    const term = div(numerator, denominator);
    total = [total[0] + term[0], total[1] + term[1]];
  }
  return total[0];
}

describe("CARMA kernel", () => {
  const oscillations = [{ period: 30, quality: 3 }, { period: 200, quality: 0.3 }];
  const timescales = [80];
  const movingAverage = [4, 1.5];
  const kernel = kernels.carma({ sigma: 0.2, oscillations, timescales, movingAverage });
  const roots: C[] = [];
  for (const o of oscillations) {
    const w0 = (2 * Math.PI) / o.period;
    const c = w0 / (2 * o.quality);
    const lambda = c * c - w0 * w0;
    if (lambda < 0) roots.push([-c, Math.sqrt(-lambda)], [-c, -Math.sqrt(-lambda)]);
    else roots.push([-c + Math.sqrt(lambda), 0], [-c - Math.sqrt(lambda), 0]);
  }
  roots.push([-1 / 80, 0]);
  const beta = [1, ...movingAverage];

  it("its autocorrelation matches Kelly et al. 2014, eq. 4", () => {
    const r0 = kellyAutocovariance(roots, beta, 0);
    for (const tau of [0, 1, 7, 30, 150, 600]) {
      const expected = (0.04 * kellyAutocovariance(roots, beta, tau)) / r0;
      expect(Math.abs(kernel.covarianceAt(tau) - expected)).toBeLessThan(1e-12 * 0.04);
    }
  });

  it("its PSD is proportional to |b(i w)|^2 / |a(i w)|^2 (Kelly et al. 2014, eq. 2)", () => {
    const ratio = (w: number) => {
      const b = poly(beta, [0, w]);
      let a: C = [1, 0];
      for (const r of roots) a = mul(a, [-r[0], w - r[1]]);
      return kernel.spectralDensityAt(w) / ((b[0] ** 2 + b[1] ** 2) / (a[0] ** 2 + a[1] ** 2));
    };
    const reference = ratio(0.01);
    for (const w of [0.001, 0.05, 0.2, 1, 5]) expect(ratio(w) / reference).toBeCloseTo(1, 10);
  });

  it("agrees with the dense engine and with finite differences in the gradient", () => {
    const rng = createRng("carma");
    const t = seasonalTimes(rng, { seasons: 2, perSeason: 50 });
    const errors = randomErrors(rng, t.length, 0.01, 0.03);
    const gp = new GaussianProcess(kernel, t, { errors });
    const y = gp.priorDraw(rng).map((v, i) => v + errors[i] * rng.normal());
    const dense = new DenseGaussianProcess(kernel, t, { errors });
    expect(Math.abs(gp.logLikelihood(y) - dense.logLikelihood(y))).toBeLessThan(1e-9 * Math.abs(dense.logLikelihood(y)));
    const g = gp.logLikelihoodGradient(y);
    const theta = kernel.parameterValues;
    for (let c = 0; c < theta.length; c++) {
      const fd = centralDifference((shifted) => new GaussianProcess(kernel.withParameters(shifted), t, { errors }).logLikelihood(y), theta, c, 1e-5);
      expect(Math.abs(g.kernel[c] - fd)).toBeLessThan(1e-5 * Math.max(1, Math.abs(fd)));
    }
  });

  it("only expresses stationary processes, and rejects coincident roots and q >= p", () => {
    expect(() => kernels.carma({ sigma: 1, timescales: [-3] })).toThrow(/tau0/);
    expect(() => kernels.carma({ sigma: 1, oscillations: [{ period: 3, quality: 0 }] })).toThrow(/quality0/);
    expect(() => kernels.carma({ sigma: 1, timescales: [5, 5] })).toThrow(/coincide/);
    expect(() => kernels.carma({ sigma: 1, timescales: [5], movingAverage: [1] })).toThrow(/moving-average order/);
  });

  it("builds its state-space form next to coincident roots (a difference step that lands on them shrinks)", () => {
    // tau1 - 1e-3 tau1 = 5 = tau0: the first central-difference step of tau1 lands on the excluded set.
    const kernel = kernels.carma({ sigma: 1, timescales: [5, 5 / 0.999] });
    const form = kernel.semiseparableForm();
    expect(Array.from(form?.projectionGradient ?? [NaN]).every(Number.isFinite)).toBe(true);
    expect(kernel.covarianceAt(0)).toBeCloseTo(1, 9);
  });
});
