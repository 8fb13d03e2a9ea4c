/**
 * An invented report input for rendering tests: a damped-random-walk quasar light curve of the made-up
 * object "QSS-0042" of the made-up Quillmere Sky Survey, with seasonal gaps, a dense-GP prediction,
 * made-up correlated posterior draws and a classical periodogram. Nothing here is a real measurement.
 */
import { CholeskyDecomposition, Matrix } from "ml-matrix";
import type { LightCurve } from "../../src/lightcurve/light-curve.js";
import type { FitParameterSummary, FitResult } from "../../src/models/fit-result.js";
import { inventedFitResult } from "../helpers/invented-fit-result.js";
import { createRng, type Rng } from "../../src/random/rng.js";
import type { ReportInput } from "../../src/report/report-input.js";

/** Options for {@link inventedReportInput}. */
export interface InventedOptions {
  readonly seed?: number;
  readonly nPoints?: number;
  readonly chains?: number;
  readonly steps?: number;
  readonly warnings?: string[];
  readonly withErrors?: boolean;
  readonly timeStart?: number;
}

const TRUE_TAU = 300;
const TRUE_SIGMA = 0.25;
const TRUE_MEAN = 19.4;

/** Seasonal observing: 200 days on, 165 days off, random nights, over about five years. */
function inventedTimes(rng: Rng, n: number, start: number): Float64Array {
  const times: number[] = [];
  while (times.length < n) {
    const t = rng.uniform() * 5 * 365;
    if (t % 365 < 200) times.push(start + t);
  }
  return Float64Array.from(times).sort();
}

/**
 * Exact damped-random-walk simulation by its AR(1) form with irregular spacing:
 * x_i = x_{i-1} e^{-dt/tau} + sigma sqrt(1 - e^{-2 dt/tau}) N(0,1) (Kelly, Bechtold & Siemiginowska 2009, eq. A4 form).
 */
function simulateDrw(rng: Rng, time: Float64Array): Float64Array {
  const x = new Float64Array(time.length);
  x[0] = TRUE_SIGMA * rng.normal();
  for (let i = 1; i < time.length; i++) {
    const a = Math.exp(-(time[i] - time[i - 1]) / TRUE_TAU);
    x[i] = a * x[i - 1] + TRUE_SIGMA * Math.sqrt(1 - a * a) * rng.normal();
  }
  return x;
}

function drwCov(t1: number, t2: number): number {
  return TRUE_SIGMA * TRUE_SIGMA * Math.exp(-Math.abs(t1 - t2) / TRUE_TAU);
}

/** Dense GP prediction (Rasmussen & Williams 2006, eqs. 2.25-2.26) with the true kernel. */
function densePrediction(time: Float64Array, y: Float64Array, err: Float64Array, grid: Float64Array) {
  const n = time.length;
  const k = new Matrix(n, n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) k.set(i, j, drwCov(time[i], time[j]) + (i === j ? err[i] ** 2 : 0));
  const chol = new CholeskyDecomposition(k);
  const resid = Matrix.columnVector(Array.from(y, (v) => v - TRUE_MEAN));
  const alpha = chol.solve(resid);
  const cross = new Matrix(n, grid.length);
  for (let i = 0; i < n; i++) for (let g = 0; g < grid.length; g++) cross.set(i, g, drwCov(time[i], grid[g]));
  const solved = chol.solve(cross);
  const mean = new Float64Array(grid.length);
  const sd = new Float64Array(grid.length);
  for (let g = 0; g < grid.length; g++) {
    let m = 0;
    let reduction = 0;
    for (let i = 0; i < n; i++) {
      m += cross.get(i, g) * alpha.get(i, 0);
      reduction += cross.get(i, g) * solved.get(i, g);
    }
    mean[g] = TRUE_MEAN + m;
    sd[g] = Math.sqrt(Math.max(drwCov(grid[g], grid[g]) - reduction, 0));
  }
  return { mean, sd };
}

/** Classical periodogram (Scargle 1982, ApJ 263, 835, eq. 10), normalised by twice the variance. */
function classicalPeriodogram(time: Float64Array, y: Float64Array, frequency: Float64Array): Float64Array {
  let mean = 0;
  for (const v of y) mean += v / y.length;
  let variance = 0;
  for (const v of y) variance += (v - mean) ** 2 / (y.length - 1);
  return frequency.map((f) => {
    const w = 2 * Math.PI * f;
    let s2 = 0;
    let c2 = 0;
    for (const t of time) {
      s2 += Math.sin(2 * w * t);
      c2 += Math.cos(2 * w * t);
    }
    const shift = Math.atan2(s2, c2) / (2 * w);
    let yc = 0;
    let ys = 0;
    let cc = 0;
    let ss = 0;
    for (let i = 0; i < time.length; i++) {
      const c = Math.cos(w * (time[i] - shift));
      const s = Math.sin(w * (time[i] - shift));
      yc += (y[i] - mean) * c;
      ys += (y[i] - mean) * s;
      cc += c * c;
      ss += s * s;
    }
    return (yc * yc / cc + ys * ys / ss) / (2 * variance);
  });
}

function summarise(values: Float64Array): FitParameterSummary {
  const s = Float64Array.from(values).sort();
  const q = (p: number) => {
    const pos = (s.length - 1) * p;
    const lo = Math.floor(pos);
    const hi = Math.min(s.length - 1, lo + 1);
    return s[lo] + (pos - lo) * (s[hi] - s[lo]);
  };
  let mean = 0;
  for (const v of s) mean += v / s.length;
  let variance = 0;
  for (const v of s) variance += (v - mean) ** 2 / (s.length - 1);
  return { median: q(0.5), mean, sd: Math.sqrt(variance), "q2.5": q(0.025), q16: q(0.16), q84: q(0.84), "q97.5": q(0.975), hdi95: [q(0.025), q(0.975)] };
}

/** Builds the invented input; the same options give the same input, bit for bit. */
export function inventedReportInput(options: InventedOptions = {}): ReportInput {
  const rng = createRng(options.seed ?? 2024);
  const n = options.nPoints ?? 140;
  const start = options.timeStart ?? 58000;
  const time = inventedTimes(rng, n, start);
  const signal = simulateDrw(rng, time);
  const error = Float64Array.from(time, () => 0.03 + 0.04 * rng.uniform());
  const value = Float64Array.from(signal, (s, i) => TRUE_MEAN + s + error[i] * rng.normal());
  const withErrors = options.withErrors ?? true;
  const lightCurve: LightCurve = {
    time,
    value,
    ...(withErrors ? { error } : {}),
    unit: "mag",
    band: "r",
    provenance: {
      source: "qss-0042.csv",
      timeColumn: "mjd",
      valueColumn: "mag",
      errorColumn: withErrors ? "mag_err" : null,
      dropped: 2,
      sorted: false,
    },
  };

  const first = time[0];
  const last = time[time.length - 1];
  const grid = Float64Array.from({ length: 400 }, (_, i) => first - 30 + ((last - first + 60) * i) / 399);
  const prediction = { time: grid, ...densePrediction(time, value, error, grid) };

  // Made-up draws: an AR(1) random walk around the truth in log space, so chains look like real traces.
  const chainsCount = options.chains ?? 6;
  const steps = options.steps ?? 400;
  const centres = { tau: Math.log(310), sigma: Math.log(0.24), mean: TRUE_MEAN };
  const widths = { tau: 0.22, sigma: 0.12, mean: 0.06 };
  const names = ["tau", "sigma", "mean"] as const;
  const chains: Record<string, Float64Array[]> = { tau: [], sigma: [], mean: [] };
  for (let c = 0; c < chainsCount; c++) {
    const state = { tau: rng.normal(), sigma: rng.normal(), mean: rng.normal() };
    const arrays = { tau: new Float64Array(steps), sigma: new Float64Array(steps), mean: new Float64Array(steps) };
    for (let s = 0; s < steps; s++) {
      const shared = rng.normal();
      for (const name of names) {
        const corr = name === "mean" ? 0 : 0.6 * shared;
        state[name] = 0.8 * state[name] + 0.6 * (corr + (name === "mean" ? 1 : 0.8) * rng.normal());
        const v = centres[name] + widths[name] * state[name];
        arrays[name][s] = name === "mean" ? v : Math.exp(v);
      }
    }
    for (const name of names) chains[name].push(arrays[name]);
  }
  const pooled = (name: string) => {
    const out: number[] = [];
    for (const chain of chains[name]) out.push(...chain);
    return Float64Array.from(out);
  };

  const frequency = Float64Array.from({ length: 300 }, (_, i) => 10 ** (-3.5 + (2.5 * i) / 299));
  const power = classicalPeriodogram(time, value, frequency);
  // DRW PSD S(f) = 4 sigma^2 tau / (1 + (2 pi f tau)^2) per draw, then quantiles per frequency.
  const stride = Math.max(1, Math.floor(pooled("tau").length / 2000));
  const tauDraws = pooled("tau").filter((_, i) => i % stride === 0);
  const sigmaDraws = pooled("sigma").filter((_, i) => i % stride === 0);
  const median = new Float64Array(frequency.length);
  const lower = new Float64Array(frequency.length);
  const upper = new Float64Array(frequency.length);
  frequency.forEach((f, k) => {
    const s = tauDraws.map((tau, d) => (4 * sigmaDraws[d] ** 2 * tau) / (1 + (2 * Math.PI * f * tau) ** 2)).sort();
    const q = (p: number) => s[Math.round((s.length - 1) * p)];
    median[k] = q(0.5);
    lower[k] = q(0.16);
    upper[k] = q(0.84);
  });

  const parameters = { tau: summarise(pooled("tau")), sigma: summarise(pooled("sigma")), mean: summarise(pooled("mean")) };
  const ratio = (last - first) / parameters.tau.median;
  const base = inventedFitResult();
  const result: FitResult = {
    ...base,
    seed: options.seed ?? 2024,
    data: {
      ...base.data,
      n,
      dropped: 2,
      baseline: last - first,
      medianCadence: 3.1,
      timeColumn: "mjd",
      valueColumn: "mag",
      errorColumn: withErrors ? "mag_err" : null,
    },
    parameters,
    diagnostics: { ...base.diagnostics, rhatMax: 1.006 },
    warnings: options.warnings ?? [
      `The baseline is only ${ratio.toFixed(1)} times the timescale tau; timescales are biased low unless the baseline is at least about 10 tau.`,
    ],
  };

  return {
    result,
    lightCurve,
    prediction,
    draws: { names: [...names], chains },
    periodogram: { frequency, power },
    psdBand: { frequency, median, lower, upper },
    timeUnit: "d",
    title: "QSS-0042 (invented Quillmere Sky Survey quasar), band r",
  };
}
