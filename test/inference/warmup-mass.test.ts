import { describe, expect, it } from "vitest";
import {
  LEAST_CONTRADICTION,
  MIN_SPREAD_DRAWS,
  type AdaptedMass,
  nextInverseMass,
  SPREAD_CHANGE_THRESHOLD,
  WindowDraws,
  type WindowSpreadEstimate,
} from "../../src/inference/warmup-mass.js";
import { createRng, type Rng } from "../../src/random/rng.js";

/** Fills a window with `chains` chains of `n` draws per coordinate from `draw(rng, chain, coordinate)`. */
function windowOf(chains: number, n: number, dimension: number, draw: (rng: Rng, chain: number, j: number) => number, seed = 1): WindowDraws {
  const rng = createRng(seed);
  const window = new WindowDraws(chains, dimension);
  for (let t = 0; t < n; t++) {
    for (let c = 0; c < chains; c++) window.add(c, Float64Array.from({ length: dimension }, (_, j) => draw(rng, c, j)));
  }
  return window;
}

describe("window spread estimates (pooled over chains)", () => {
  it("independent normal draws: variance, effective draws near the count, se(ln v) = sqrt(2 / n)", () => {
    // Var(s^2) = 2 sigma^4 / (n - 1) for normal draws (common practice), so se(ln s^2) = sqrt(2 / n).
    const n = 4 * 2000;
    const [a, b] = windowOf(4, 2000, 2, (rng, _c, j) => (j === 0 ? 3 + 0.5 * rng.normal() : 1e6 + 1e-3 * rng.normal())).estimates();
    expect(a.variance / 0.25).toBeCloseTo(1, 1);
    expect(b.variance / 1e-6).toBeCloseTo(1, 1);
    for (const e of [a, b]) {
      expect(e.effectiveDraws / n).toBeGreaterThan(0.85);
      expect(e.effectiveDraws).toBeLessThanOrEqual(n);
      expect(e.logStandardError / Math.sqrt(2 / n)).toBeGreaterThan(0.9);
      expect(e.logStandardError / Math.sqrt(2 / n)).toBeLessThan(1.15);
    }
  });

  it("autocorrelated draws: a Gaussian AR(1) with coefficient phi has squares correlated as phi^(2k), so n_eff = n (1 - phi^2) / (1 + phi^2)", () => {
    // corr(x_t^2, x_{t+k}^2) = phi^(2k) for a zero-mean Gaussian process (Isserlis 1918, Biometrika 12, 134);
    // the integrated autocorrelation time of a series with correlations r^k is (1 + r) / (1 - r).
    const phi = 0.8;
    const chains = 4;
    const n = 5000;
    const state = new Float64Array(chains);
    const rng = createRng(7);
    const window = new WindowDraws(chains, 1);
    for (let t = 0; t < n; t++) {
      for (let c = 0; c < chains; c++) {
        state[c] = phi * state[c] + Math.sqrt(1 - phi * phi) * rng.normal();
        window.add(c, Float64Array.of(state[c]));
      }
    }
    const [e] = window.estimates();
    const expected = (chains * n * (1 - phi * phi)) / (1 + phi * phi);
    expect(e.effectiveDraws / expected).toBeGreaterThan(0.8);
    expect(e.effectiveDraws / expected).toBeLessThan(1.25);
    expect(e.variance).toBeCloseTo(1, 1);
  });

  it("heavy tails widen the standard error: Laplace draws (kurtosis 6) give se(ln v) = sqrt(5 / n)", () => {
    // Var(y) / v^2 = kurtosis - 1 for y = (x - mean)^2; the Laplace distribution has kurtosis 6 (common practice).
    const n = 4 * 5000;
    const laplace = (rng: Rng) => Math.log(rng.uniform()) - Math.log(rng.uniform());
    const [e] = windowOf(4, 5000, 1, (rng) => laplace(rng), 3).estimates();
    expect(e.variance / 2).toBeCloseTo(1, 1);
    expect(e.logStandardError / Math.sqrt(5 / n)).toBeGreaterThan(0.85);
    expect(e.logStandardError / Math.sqrt(5 / n)).toBeLessThan(1.2);
  });

  it("chains that barely move from different places count as few effective draws (between-chain spread)", () => {
    // Four chains each jittering by 1e-3 around its own offset 0, 1, 2, 3: the window's spread is the
    // spread of the offsets, which four chains support only weakly.
    const [e] = windowOf(4, 200, 1, (rng, c) => c + 1e-3 * rng.normal()).estimates();
    expect(e.variance).toBeGreaterThan(1);
    expect(e.effectiveDraws).toBeLessThan(MIN_SPREAD_DRAWS);
  });

  it("reset forgets the draws", () => {
    const window = windowOf(2, 10, 3, (rng) => rng.normal());
    expect(window.count).toBe(10);
    window.reset();
    expect(window.count).toBe(0);
  });
});

describe("the next inverse mass (kept unless a window contradicts it)", () => {
  const estimate = (variance: number, effectiveDraws: number, logStandardError = Math.sqrt(2 / effectiveDraws)): WindowSpreadEstimate => ({
    variance,
    effectiveDraws,
    logStandardError,
  });
  const start = (...inverseMass: number[]): AdaptedMass => ({
    inverseMass: Float64Array.from(inverseMass),
    support: new Float64Array(inverseMass.length),
    restart: false,
  });

  it("a contradiction in one coordinate replaces every supported coordinate by the window's variance and restarts the step size", () => {
    // Coordinate 0 lies e^1.5 away with se 0.1: beyond both 2 se and ln 2. Coordinate 1 agrees with its
    // current value but is replaced too (the window's spreads are one consistent set); coordinate 2 has too
    // few effective draws and keeps its value.
    const next = nextInverseMass(start(1, 4, 9), [estimate(Math.exp(1.5), 200, 0.1), estimate(4.4, 300, 0.08), estimate(100, MIN_SPREAD_DRAWS - 1)]);
    expect(next.restart).toBe(true);
    expect(next.inverseMass[0]).toBeCloseTo(Math.exp(1.5), 12);
    expect(next.inverseMass[1]).toBe(4.4);
    expect(next.inverseMass[2]).toBe(9);
    expect(Array.from(next.support)).toEqual([200, 300, 0]);
  });

  it("a change beyond 2 standard errors but within a factor 2 is no contradiction: support-weighted refinement, no restart", () => {
    // ln(1.6) = 0.47 < ln 2 although it is 9 standard errors of 0.05. From a supported current value the
    // refinement is the mean of the logs weighted by effective draws: exp((100 ln 1 + 300 ln 1.6) / 400).
    expect(Math.log(1.6)).toBeGreaterThan(SPREAD_CHANGE_THRESHOLD * 0.05);
    expect(Math.log(1.6)).toBeLessThan(LEAST_CONTRADICTION);
    const current: AdaptedMass = { inverseMass: Float64Array.of(1), support: Float64Array.of(100), restart: true };
    const next = nextInverseMass(current, [estimate(1.6, 300, 0.05)]);
    expect(next.restart).toBe(false);
    expect(next.inverseMass[0]).toBeCloseTo(Math.exp((300 * Math.log(1.6)) / 400), 12);
    expect(next.support[0]).toBe(400);
    expect(current.inverseMass[0]).toBe(1);
  });

  it("a change of more than a factor 2 within 2 standard errors (a noisy window) is no contradiction", () => {
    const next = nextInverseMass(start(1), [estimate(2.5, 30, 0.6)]);
    expect(next.restart).toBe(false);
    // The starting value has no support of its own, so the refinement takes the window's value.
    expect(next.inverseMass[0]).toBeCloseTo(2.5, 12);
  });

  it("ignores windows with too few effective draws, however far their spread lies, and spreads that are zero, infinite or undefined", () => {
    const next = nextInverseMass(start(2, 3, 3, 3), [estimate(1e6, MIN_SPREAD_DRAWS - 1, 0.01), estimate(0, 100), estimate(Infinity, 100), estimate(NaN, 100)]);
    expect(next.restart).toBe(false);
    expect(Array.from(next.inverseMass)).toEqual([2, 3, 3, 3]);
  });
});
