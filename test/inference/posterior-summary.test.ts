import { describe, expect, it } from "vitest";
import exponentialQuantile from "@stdlib/stats/base/dists/exponential/quantile";
import normalQuantile from "@stdlib/stats/base/dists/normal/quantile";
import { highestDensityInterval } from "../../src/inference/highest-density-interval.js";
import { summarizeDraws } from "../../src/inference/posterior-summary.js";
import { sortedQuantile } from "../../src/numerics/order-statistics.js";

/** n evenly spread probability points (i - 1/2)/n mapped through a quantile function: a "perfect" sample. */
const grid = (n: number, quantile: (p: number) => number): Float64Array =>
  Float64Array.from({ length: n }, (_, i) => quantile((i + 0.5) / n));

describe("sample quantiles (Hyndman & Fan 1996 definition 7)", () => {
  it("interpolates between order statistics: 1..10 at p = 0.1 is 1.9, at 0.5 is 5.5", () => {
    // h = (n - 1) p = 0.9 -> 1 + 0.9 (2 - 1); h = 4.5 -> 5 + 0.5 (6 - 5).
    const x = Float64Array.of(1, 2, 3, 4, 5, 6, 7, 8, 9, 10);
    expect(sortedQuantile(x, 0.1)).toBeCloseTo(1.9, 14);
    expect(sortedQuantile(x, 0.5)).toBeCloseTo(5.5, 14);
    expect(sortedQuantile(x, 0.975)).toBeCloseTo(9.775, 14);
  });
});

describe("highest-density interval", () => {
  it("of an exponential is [0, -ln 0.05] (the density decreases, so the HDI starts at 0)", () => {
    const draws = grid(100000, (p) => exponentialQuantile(p, 1));
    const [lo, hi] = highestDensityInterval(draws, 0.95);
    expect(lo).toBeLessThan(1e-4);
    expect(hi).toBeCloseTo(-Math.log(0.05), 3);
  });

  it("of a normal is the central interval mean +- 1.96 sd (stdlib normal quantile)", () => {
    const draws = grid(100000, (p) => normalQuantile(p, 3, 2));
    const [lo, hi] = highestDensityInterval(draws, 0.95);
    expect(lo).toBeCloseTo(normalQuantile(0.025, 3, 2), 2);
    expect(hi).toBeCloseTo(normalQuantile(0.975, 3, 2), 2);
  });

  it("is worked by hand on five points", () => {
    // Windows of ceil(0.6 * 5) = 3 points: [1,2,6] width 5, [2,6,7] width 5, [6,7,7.5] width 1.5.
    expect(highestDensityInterval(Float64Array.of(1, 2, 6, 7, 7.5), 0.6)).toEqual([6, 7.5]);
  });
});

describe("posterior summary", () => {
  it("gives the quantiles, mean and sd of a normal sample (stdlib normal quantile)", () => {
    const draws = grid(200000, (p) => normalQuantile(p, -1, 0.5));
    const s = summarizeDraws(draws);
    expect(s.median).toBeCloseTo(-1, 6);
    expect(s.mean).toBeCloseTo(-1, 10);
    expect(s.sd).toBeCloseTo(0.5, 3);
    expect(s["q2.5"]).toBeCloseTo(normalQuantile(0.025, -1, 0.5), 3);
    expect(s.q16).toBeCloseTo(normalQuantile(0.16, -1, 0.5), 3);
    expect(s.q84).toBeCloseTo(normalQuantile(0.84, -1, 0.5), 3);
    expect(s["q97.5"]).toBeCloseTo(normalQuantile(0.975, -1, 0.5), 3);
    expect(s.hdi68[0]).toBeCloseTo(-1.5, 2);
    expect(s.hdi68[1]).toBeCloseTo(-0.5, 2);
  });

  it("is NaN, not an error, without draws", () => {
    expect(summarizeDraws(new Float64Array(0)).median).toBeNaN();
  });
});
