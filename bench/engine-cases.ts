import { GaussianProcess } from "../src/gp/gaussian-process.js";
import { kernels, type Kernel } from "../src/kernels/index.js";
import type { Rng } from "../src/random/rng.js";

/**
 * One kernel of the engine benchmark: R semiseparable components, the TypeScript kernel, and the same
 * kernel spelled as terms for the C reference program (bench/c/engine-loglike.c).
 */
export interface EngineCase {
  /** Number of semiseparable components R. */
  readonly components: number;
  /** A short description for the tables. */
  readonly label: string;
  readonly kernel: Kernel;
  /** The kernel as command-line terms of the C program (drw:..., osc:..., qp:...). */
  readonly nativeTerms: readonly string[];
}

/** A benchmark light curve: sorted times, 1-sigma errors, values and the constant mean. */
export interface EngineData {
  readonly time: Float64Array;
  readonly errors: Float64Array;
  readonly value: Float64Array;
  readonly mean: number;
}

const drw = { sigma: 0.2, tau: 45 };
const oscillator = { sigma: 0.1, period: 20, quality: 4 };
const rotation = { sigma: 0.05, period: 7.3, decayTime: 14, harmonicWeight: 0.3 };
const slowRotation = { sigma: 0.03, period: 31, decayTime: 30, harmonicWeight: 0.2 };

/** Numbers are written with String(), the shortest round-trip form, so C's strtod reads the same double. */
const term = (kind: string, values: readonly number[]): string => [kind, ...values.map(String)].join(":");

/**
 * The kernels timed at R = 1, 2, 4, 8: a damped random walk, an oscillator, a quasi-periodic kernel, and
 * the sum of two quasi-periodic kernels. With the cadence of `benchmarkTimes` (median step about 0.7 day)
 * the oscillator blocks take both branches of the transition (power series for short steps, cos/sin for
 * long ones), as real light curves do.
 */
export function engineCases(): EngineCase[] {
  return [
    {
      components: 1,
      label: "damped random walk",
      kernel: kernels.dampedRandomWalk(drw),
      nativeTerms: [term("drw", [drw.sigma, drw.tau])],
    },
    {
      components: 2,
      label: "oscillator",
      kernel: kernels.oscillator(oscillator),
      nativeTerms: [term("osc", [oscillator.sigma, oscillator.period, oscillator.quality])],
    },
    {
      components: 4,
      label: "quasi-periodic",
      kernel: kernels.quasiPeriodic(rotation),
      nativeTerms: [term("qp", [rotation.sigma, rotation.period, rotation.decayTime, rotation.harmonicWeight])],
    },
    {
      components: 8,
      label: "quasi-periodic + quasi-periodic",
      kernel: kernels.quasiPeriodic(rotation).plus(kernels.quasiPeriodic(slowRotation)),
      nativeTerms: [
        term("qp", [rotation.sigma, rotation.period, rotation.decayTime, rotation.harmonicWeight]),
        term("qp", [slowRotation.sigma, slowRotation.period, slowRotation.decayTime, slowRotation.harmonicWeight]),
      ],
    },
  ];
}

/** Points per observing season of `benchmarkTimes`. */
const SEASON_POINTS = 200;
/** Days between seasons. */
const SEASON_GAP = 165;

/**
 * n sorted times (days, starting at 60000): seasons of 200 points with exponentially distributed steps
 * of mean 1 day, separated by 165-day gaps. The step distribution does not depend on n, so the cost
 * per point can be compared across n. Invented cadence, for benchmarks only.
 */
export function benchmarkTimes(rng: Rng, n: number): Float64Array {
  const out = new Float64Array(n);
  let t = 60000;
  for (let i = 0; i < n; i++) {
    if (i > 0 && i % SEASON_POINTS === 0) t += SEASON_GAP;
    t += -Math.log(1 - rng.uniform());
    out[i] = t;
  }
  return out;
}

/**
 * A benchmark light curve for one kernel: `benchmarkTimes`, errors between 0.02 and 0.06, and values drawn
 * from the kernel's prior plus white noise of those errors (so the pivots are typical of a real fit).
 */
export function benchmarkData(kernel: Kernel, n: number, rng: Rng): EngineData {
  const mean = 17.5;
  const time = benchmarkTimes(rng, n);
  const errors = new Float64Array(n);
  for (let i = 0; i < n; i++) errors[i] = 0.02 + 0.04 * rng.uniform();
  const latent = new GaussianProcess(kernel, time, { mean }).priorDraw(rng);
  const value = new Float64Array(n);
  for (let i = 0; i < n; i++) value[i] = latent[i] + errors[i] * rng.normal();
  return { time, errors, value, mean };
}

/** The first n points of a light curve. */
export function leadingPoints(data: EngineData, n: number): EngineData {
  return {
    time: data.time.subarray(0, n),
    errors: data.errors.subarray(0, n),
    value: data.value.subarray(0, n),
    mean: data.mean,
  };
}
