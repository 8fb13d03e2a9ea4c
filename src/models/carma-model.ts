import { logUniformPrior, type ParameterSpec } from "../inference/index.js";
import { kernels } from "../kernels/index.js";
import type { KernelTerm } from "./kernel-term.js";

/** The order (p, q) of a CARMA model: p autoregressive roots, q < p moving-average coefficients. */
export interface CarmaOrder {
  readonly p: number;
  readonly q: number;
}

/** Highest autoregressive order offered (`--order`, and the grid of `compare`). */
export const MAX_CARMA_ORDER = 4;

/**
 * Reads "p,q" (q < p, 1 <= p <= MAX_CARMA_ORDER), with a RangeError naming what is wrong.
 *
 * @example parseCarmaOrder("2,1") // { p: 2, q: 1 }
 */
export function parseCarmaOrder(text: string): CarmaOrder {
  const match = /^\s*(\d+)\s*,\s*(\d+)\s*$/.exec(text);
  if (!match) throw new RangeError(`the CARMA order must be "p,q" (for example 2,1), got "${text}"`);
  const p = Number(match[1]);
  const q = Number(match[2]);
  if (!(p >= 1 && p <= MAX_CARMA_ORDER)) throw new RangeError(`the CARMA order p must be 1 to ${MAX_CARMA_ORDER}, got ${p}`);
  if (!(q < p)) throw new RangeError(`the CARMA order needs q < p, got p = ${p}, q = ${q}`);
  return { p, q };
}

/** The text "p,q" of an order. */
export function orderText(order: CarmaOrder): string {
  return `${order.p},${order.q}`;
}

/** An order given as {p, q} or as its text "p,q". */
export function carmaOrderOf(order: CarmaOrder | string): CarmaOrder {
  return typeof order === "string" ? parseCarmaOrder(order) : order;
}

/**
 * The CARMA(p, q) kernel term (Kelly et al. 2014, ApJ 788, 33) in the stationary parameterisation of
 * `kernels.carma`: floor(p / 2) quadratic factors of the autoregressive polynomial in (period<k>,
 * quality<k>) and, for odd p, one real root in tau0. A quadratic factor with quality below 1/2 holds two
 * real roots, so every stationary root configuration (distinct roots) is reachable. Moving-average
 * coefficients ma1 ... maq of b(s) = 1 + ma1 s + ... + maq s^q.
 */
export function carmaTerm(order: CarmaOrder): KernelTerm {
  const pairs = Math.floor(order.p / 2);
  const real = order.p % 2;
  const names = [
    "sigma",
    ...Array.from({ length: pairs }, (_, k) => [`period${k}`, `quality${k}`]).flat(),
    ...Array.from({ length: real }, (_, k) => `tau${k}`),
    ...Array.from({ length: order.q }, (_, j) => `ma${j + 1}`),
  ];
  return {
    names,
    build: (values) => {
      let i = 1;
      const oscillations = Array.from({ length: pairs }, () => ({ period: values[i++], quality: values[i++] }));
      const timescales = Array.from({ length: real }, () => values[i++]);
      const movingAverage = Array.from({ length: order.q }, () => values[i++]);
      return kernels.carma({ sigma: values[0], oscillations, timescales, movingAverage });
    },
  };
}

/** What the CARMA priors are derived from (the data's scales, never hard-coded days). */
export interface CarmaScales {
  readonly shortestPeriod: number;
  readonly baseline: number;
  readonly medianCadence: number;
}

/**
 * Priors and a first guess of the CARMA parameters other than sigma, from the data's scales: periods
 * log-uniform from the shortest resolvable period to the baseline; qualities log-uniform on [0.05, 1000]
 * (either side of 1/2: complex or real root pairs); the real root's timescale as the damped random walk's
 * (a tenth of the median cadence to ten times the baseline); moving-average coefficient j (units time^j)
 * log-uniform on [(medianCadence / 10)^j, (baseline / 2 pi)^j], i.e. ma_j^(1/j) log-uniform between the
 * timescales: a tenth of the median cadence, below which b(i w) differs from 1 only at frequencies the
 * sampling does not resolve (the tau prior's lower bound), and baseline / 2 pi, where |b(i w)| departs
 * from 1 at the lowest frequency the data see; above it b(i w) ~ ma_q (i w)^q over the whole observed band
 * and the PSD's shape no longer changes with the coefficient. Log-uniform like every other timescale: the
 * data often constrain a coefficient only weakly (above a spectral bump the PSD falls as w^(2q - 2p)
 * whatever ma_q is), and a uniform prior on (0, (baseline / 2 pi)^j] put most of its mass on the longest
 * values (bench/README.md, "CARMA order choice by evidence": 92% above a true 25 d for a 319 d bound).
 * Positive coefficients because the likelihood sees only |b(i w)|^2, which is unchanged when a root of b
 * is reflected across the imaginary axis: the minimum-phase b (roots with negative real parts; Kelly et
 * al. 2014, sec. 2) is the identifiable one, and for q <= 2 it is exactly the b with positive
 * coefficients (Routh-Hurwitz). For q = 3 positive coefficients are necessary, not sufficient (b1 b2 > b3
 * is also needed), so a reflected copy of part of the posterior can remain.
 * The first guess spreads the roots over the timescales the data resolve (distinct roots, as the kernel needs).
 */
export function carmaPriors(order: CarmaOrder, scales: CarmaScales): { specs: ParameterSpec[]; guess: Record<string, number> } {
  const { shortestPeriod, baseline, medianCadence } = scales;
  const specs: ParameterSpec[] = [];
  const guess: Record<string, number> = {};
  const pairs = Math.floor(order.p / 2);
  for (let k = 0; k < pairs; k++) {
    specs.push({ name: `period${k}`, prior: logUniformPrior(shortestPeriod, baseline) });
    specs.push({ name: `quality${k}`, prior: logUniformPrior(0.05, 1000) });
    guess[`period${k}`] = Math.min(Math.sqrt(shortestPeriod * baseline) * Math.pow(3, k), baseline / 1.5);
    guess[`quality${k}`] = 0.8 + 0.7 * k;
  }
  const shortestTimescale = medianCadence / 10;
  if (order.p % 2 === 1) {
    specs.push({ name: "tau0", prior: logUniformPrior(shortestTimescale, 10 * baseline) });
    guess.tau0 = Math.max(baseline / 10, medianCadence);
  }
  const longestTimescale = baseline / (2 * Math.PI);
  // A tenth of the longest, kept inside the range when the light curve has only a few visits.
  const guessTimescale = Math.max(longestTimescale / 10, Math.sqrt(shortestTimescale * longestTimescale));
  for (let j = 1; j <= order.q; j++) {
    specs.push({ name: `ma${j}`, prior: logUniformPrior(Math.pow(shortestTimescale, j), Math.pow(longestTimescale, j)) });
    guess[`ma${j}`] = Math.pow(guessTimescale, j);
  }
  return { specs, guess };
}

/**
 * The relabellings under which a CARMA(p, q) posterior is invariant: exchanging two quadratic factors
 * (period<k>, quality<k>) <-> (period<k+1>, quality<k+1>) leaves the polynomial, and the priors (the same for
 * every factor), unchanged. Index maps over `freeNames` (the unconstrained coordinates), one per adjacent
 * swap; they generate every permutation of the factors. None for p < 4.
 */
export function carmaSymmetries(order: CarmaOrder, freeNames: readonly string[]): number[][] {
  const pairs = Math.floor(order.p / 2);
  const generators: number[][] = [];
  for (let k = 0; k + 1 < pairs; k++) {
    const swap = new Map<string, string>([
      [`period${k}`, `period${k + 1}`],
      [`period${k + 1}`, `period${k}`],
      [`quality${k}`, `quality${k + 1}`],
      [`quality${k + 1}`, `quality${k}`],
    ]);
    if ([...swap.keys()].some((name) => !freeNames.includes(name))) continue;
    generators.push(freeNames.map((name) => freeNames.indexOf(swap.get(name) ?? name)));
  }
  return generators;
}
