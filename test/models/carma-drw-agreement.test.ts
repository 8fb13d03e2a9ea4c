import { CholeskyDecomposition, Matrix } from "ml-matrix";
import { describe, expect, it } from "vitest";
import { GaussianProcess } from "../../src/gp/gaussian-process.js";
import { kernels } from "../../src/kernels/index.js";
import { fitLightCurve } from "../../src/models/fit-light-curve.js";
import type { FitResult } from "../../src/models/fit-result.js";
import { createRng } from "../../src/random/rng.js";
import { randomErrors, seasonalTimes } from "../helpers/seasonal-times.js";

// CARMA(1,0) is the Ornstein-Uhlenbeck process (Kelly et al. 2014, ApJ 788, 33, sec. 2): a(s) = s + 1/tau,
// autocovariance sigma^2 exp(-|t| / tau), PSD 2 sigma^2 tau / (1 + (omega tau)^2), the damped random walk of
// Kelly, Bechtold & Siemiginowska 2009 (ApJ 698, 895, eq. 1 and 2). The parameter map is the identity on
// sigma and tau (carma's tau0 = drw's tau).
const SIGMA = 0.27;
const TAU = 75;

function lightCurve(seed: string) {
  const rng = createRng(seed);
  const time = seasonalTimes(rng, { seasons: 4, perSeason: 45 });
  const error = randomErrors(rng, time.length, 0.02, 0.04);
  const latent = new GaussianProcess(kernels.dampedRandomWalk({ sigma: SIGMA, tau: TAU }), time).priorDraw(rng);
  return {
    time,
    value: Float64Array.from(latent, (v, i) => 19 + v + error[i] * rng.normal()),
    error,
    unit: "mag" as const,
    provenance: { source: "simulated", timeColumn: "t", valueColumn: "mag", errorColumn: "err", dropped: 0, sorted: false },
  };
}

/** ln N(y | 0, K + diag(e^2)) on dense linear algebra (ml-matrix Cholesky), K_ij = sigma^2 exp(-|t_i - t_j| / tau). */
function denseDrwLogLikelihood(time: Float64Array, residual: Float64Array, error: Float64Array): number {
  const n = time.length;
  const covariance = new Matrix(n, n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) covariance.set(i, j, SIGMA * SIGMA * Math.exp(-Math.abs(time[i] - time[j]) / TAU) + (i === j ? error[i] * error[i] : 0));
  const cholesky = new CholeskyDecomposition(covariance);
  const alpha = cholesky.solve(Matrix.columnVector(Array.from(residual))).getColumn(0);
  let logDet = 0;
  for (let i = 0; i < n; i++) logDet += 2 * Math.log(cholesky.lowerTriangularMatrix.get(i, i));
  let quadratic = 0;
  for (let i = 0; i < n; i++) quadratic += residual[i] * alpha[i];
  return -0.5 * (quadratic + logDet + n * Math.log(2 * Math.PI));
}

describe("CARMA(1,0) and the damped random walk are the same process", () => {
  const carma = kernels.carma({ sigma: SIGMA, timescales: [TAU] });
  const drw = kernels.dampedRandomWalk({ sigma: SIGMA, tau: TAU });

  it("the same autocovariance and PSD, equal to the published DRW formulas", () => {
    for (const lag of [0, 0.3, 7, 75, 240, 900]) {
      const formula = SIGMA * SIGMA * Math.exp(-lag / TAU);
      expect(Math.abs(carma.covarianceAt(lag) - formula)).toBeLessThanOrEqual(1e-13 * SIGMA * SIGMA);
      expect(Math.abs(carma.covarianceAt(lag) - drw.covarianceAt(lag))).toBeLessThanOrEqual(1e-13 * SIGMA * SIGMA);
    }
    for (const omega of [1e-4, 0.01, 1 / TAU, 0.5, 20]) {
      const formula = (2 * SIGMA * SIGMA * TAU) / (1 + (omega * TAU) ** 2);
      expect(Math.abs(carma.spectralDensityAt(omega) / formula - 1)).toBeLessThan(1e-12);
    }
  });

  it("the same log-likelihood on the same data to 1e-12, and both equal the dense one", () => {
    const data = lightCurve("carma-drw:likelihood");
    const residual = data.value.map((v) => v - 19);
    const fromCarma = new GaussianProcess(carma, data.time, { errors: data.error }).logLikelihood(residual);
    const fromDrw = new GaussianProcess(drw, data.time, { errors: data.error }).logLikelihood(residual);
    const dense = denseDrwLogLikelihood(data.time, residual, data.error);
    expect(Math.abs(fromCarma - fromDrw)).toBeLessThan(1e-12 * Math.abs(fromDrw));
    expect(Math.abs(fromCarma - dense)).toBeLessThan(1e-10 * Math.abs(dense));
  });

  it("the fits' posteriors of tau and sigma agree within their Monte Carlo error", () => {
    // Different seeds, so the two Monte Carlo errors are independent. The posterior means of ln tau and
    // ln sigma are compared (closer to normal than tau itself); their Monte Carlo standard error is
    // sd / sqrt(ESS) for each fit (common practice), ESS the fit's own (the smoothed weights' for
    // importance sampling). Four standard errors of the difference: fails by chance about once in 16,000 runs.
    const data = lightCurve("carma-drw:fit");
    const fromDrw = fitLightCurve(data, { model: "drw", seed: 11 });
    const fromCarma = fitLightCurve(data, { model: "carma", order: { p: 1, q: 0 }, seed: 12 });
    expect(fromDrw.diagnostics.converged && fromCarma.diagnostics.converged).toBe(true);
    for (const [drwName, carmaName] of [["tau", "tau0"], ["sigma", "sigma"]] as const) {
      const a = logMoments(fromDrw, drwName);
      const b = logMoments(fromCarma, carmaName);
      const standardError = Math.hypot(a.sd / Math.sqrt(a.ess), b.sd / Math.sqrt(b.ess));
      expect(Math.abs(a.mean - b.mean)).toBeLessThan(4 * standardError);
      // and the two posteriors have the same width (to 20%: the sd's own sampling error at ESS ~ 400 is ~5%)
      expect(Math.abs(a.sd / b.sd - 1)).toBeLessThan(0.2);
    }
  });
});

/** Mean and sd of ln(parameter) over the kept posterior sample, and the fit's effective sample size. */
function logMoments(result: FitResult, name: string): { mean: number; sd: number; ess: number } {
  const column = result.posteriorSample.names.indexOf(name);
  const logs = result.posteriorSample.rows.map((row) => Math.log(row[column]));
  const mean = logs.reduce((s, v) => s + v, 0) / logs.length;
  const sd = Math.sqrt(logs.reduce((s, v) => s + (v - mean) ** 2, 0) / (logs.length - 1));
  return { mean, sd, ess: Math.min(result.diagnostics.essMin, logs.length) };
}
