import { describe, expect, it } from "vitest";
import normalQuantile from "@stdlib/stats/base/dists/normal/quantile";
import { createRng } from "../../src/random/rng.js";
import { effectiveSampleSize, bulkEffectiveSampleSize, tailEffectiveSampleSize } from "../../src/inference/effective-sample-size.js";
import { rankNormalize, splitChains } from "../../src/inference/rank-normalization.js";
import { potentialScaleReduction, rankNormalizedSplitRhat } from "../../src/inference/split-rhat.js";

// Values worked by hand from the formulas of Vehtari, Gelman, Simpson, Carpenter & Buerkner 2021
// (Bayesian Analysis 16, 667): eq. 1-4 (W, B, var+, R-hat), 10-11 (rho_t and Geyer's initial
// positive sequence), 14 (rank normalisation with (r - 3/8) / (S + 1/4)).

describe("R-hat worked by hand", () => {
  it("potential scale reduction of chains [1,2,3,4] and [3,4,5,6]", () => {
    // means 2.5 and 4.5, variances 5/3 each: W = 5/3; B = 4 / 1 * (1 + 1) = 8;
    // var+ = 3/4 * 5/3 + 8/4 = 3.25; R = sqrt(3.25 / (5/3)) = sqrt(1.95).
    const r = potentialScaleReduction([Float64Array.of(1, 2, 3, 4), Float64Array.of(3, 4, 5, 6)]);
    expect(r).toBeCloseTo(Math.sqrt(1.95), 14);
  });

  it("rank normalisation of 1..8 split over two chains", () => {
    // Ranks equal the values; z_r = Phi^-1((r - 0.375) / 8.25).
    const z = rankNormalize([Float64Array.of(1, 3, 5, 7), Float64Array.of(2, 4, 6, 8)]);
    expect(z[0][1]).toBeCloseTo(normalQuantile((3 - 0.375) / 8.25, 0, 1), 14);
    expect(z[1][3]).toBeCloseTo(normalQuantile((8 - 0.375) / 8.25, 0, 1), 14);
    // Ties share their average rank: 2, 2, 2 get rank 2 among 1, 2, 2, 2.
    const tied = rankNormalize([Float64Array.of(1, 2, 2, 2)]);
    expect(tied[0][2]).toBeCloseTo(normalQuantile((3 - 0.375) / 4.25, 0, 1), 14);
  });

  it("rank-normalised split R-hat of chains [1,3,5,7] and [2,4,6,8]", () => {
    const z = (r: number): number => normalQuantile((r - 0.375) / 8.25, 0, 1);
    const rhatOf = (chains: number[][]): number => {
      // Eq. 1-4 with N = 2 draws per (split) chain and M = 4 chains.
      const n = 2;
      const means = chains.map((c) => (c[0] + c[1]) / 2);
      const variances = chains.map((c) => (c[0] - c[1]) ** 2 / 2);
      const grand = means.reduce((a, b) => a + b, 0) / 4;
      const w = variances.reduce((a, b) => a + b, 0) / 4;
      const b = (n / 3) * means.reduce((a, m) => a + (m - grand) ** 2, 0);
      return Math.sqrt((((n - 1) / n) * w + b / n) / w);
    };
    // Bulk: split chains [1,3], [5,7], [2,4], [6,8] of ranks.
    const bulk = rhatOf([[z(1), z(3)], [z(5), z(7)], [z(2), z(4)], [z(6), z(8)]]);
    // Tails: |x - 4.5| = [3.5,1.5], [0.5,2.5], [2.5,0.5], [1.5,3.5]; pairs of ties get average ranks
    // 1.5 (0.5), 3.5 (1.5), 5.5 (2.5), 7.5 (3.5) among the 8 folded values.
    const folded = rhatOf([[z(7.5), z(3.5)], [z(1.5), z(5.5)], [z(5.5), z(1.5)], [z(3.5), z(7.5)]]);
    const expected = Math.max(bulk, folded);
    expect(rankNormalizedSplitRhat([Float64Array.of(1, 3, 5, 7), Float64Array.of(2, 4, 6, 8)])).toBeCloseTo(expected, 13);
    expect(expected).toBeGreaterThan(1.01);
  });

  it("split chains drop the middle draw of an odd-length chain", () => {
    expect(splitChains([Float64Array.of(1, 2, 3, 4, 5)]).map((c) => Array.from(c))).toEqual([[1, 2], [4, 5]]);
  });
});

describe("ESS worked by hand", () => {
  it("chains [1,2,3,4] and [2,3,4,5]: ESS = 56/11", () => {
    // Both chains have deviations (-1.5, -0.5, 0.5, 1.5): autocovariances (divisor 4)
    // c_0 = 1.25, c_1 = 0.3125, c_2 = -0.375, c_3 = -0.5625; s^2 = 5/3, W = 5/3.
    // Means 2.5 and 3.5: B = 4 * (0.25 + 0.25) = 2, var+ = 3/4 * 5/3 + 2/4 = 1.75.
    // rho_t = 1 - (W - c_t * 4/3) / var+: rho = 1, 2/7, -5/21, -8/21.
    // Pair sums: P_0 = 9/7 > 0, P_1 = -13/21 < 0 stops; tau = -1 + 2 * 9/7 = 11/7; ESS = 8 / tau = 56/11.
    expect(effectiveSampleSize([Float64Array.of(1, 2, 3, 4), Float64Array.of(2, 3, 4, 5)])).toBeCloseTo(56 / 11, 12);
  });

  it("matches a direct evaluation of eq. 10-11 with the monotone sequence, on longer chains", () => {
    const rng = createRng(8);
    const chains = [0, 1, 2].map(() => {
      const x = new Float64Array(60);
      for (let t = 1; t < 60; t++) x[t] = 0.7 * x[t - 1] + rng.normal();
      return x;
    });
    const m = chains.length;
    const n = 60;
    const mean = (c: Float64Array): number => c.reduce((a, b) => a + b, 0) / n;
    const acov = (c: Float64Array, t: number): number => {
      const mu = mean(c);
      let s = 0;
      for (let i = 0; i + t < n; i++) s += (c[i] - mu) * (c[i + t] - mu);
      return s / n;
    };
    const w = chains.reduce((a, c) => a + (acov(c, 0) * n) / (n - 1), 0) / m;
    const means = chains.map(mean);
    const grand = means.reduce((a, b) => a + b, 0) / m;
    const b = (n / (m - 1)) * means.reduce((a, x) => a + (x - grand) ** 2, 0);
    const varPlus = ((n - 1) / n) * w + b / n;
    const rho = (t: number): number => 1 - (w - chains.reduce((a, c) => a + (acov(c, t) * n) / (n - 1), 0) / m) / varPlus;
    let sum = 0;
    let last = Infinity;
    for (let k = 0; 2 * k + 1 < n; k++) {
      const pair = Math.min(rho(2 * k) + rho(2 * k + 1), last);
      if (!(pair > 0)) break;
      last = pair;
      sum += pair;
    }
    expect(effectiveSampleSize(chains)).toBeCloseTo((n * m) / (-1 + 2 * sum), 9);
  });

  it("independent draws give bulk and tail ESS near the number of draws", () => {
    const rng = createRng(21);
    const chains = [0, 1, 2, 3].map(() => Float64Array.from({ length: 1000 }, () => rng.normal()));
    // For independent draws ESS / S has sampling sd of a few percent (common practice); 4000 draws.
    expect(bulkEffectiveSampleSize(chains) / 4000).toBeGreaterThan(0.85);
    expect(bulkEffectiveSampleSize(chains) / 4000).toBeLessThan(1.15);
    expect(tailEffectiveSampleSize(chains) / 4000).toBeGreaterThan(0.8);
    expect(rankNormalizedSplitRhat(chains)).toBeLessThan(1.01);
  });

  it("chains stuck in different places have R-hat far above 1.01", () => {
    const rng = createRng(3);
    const chains = [0, 5].map((offset) => Float64Array.from({ length: 500 }, () => offset + rng.normal()));
    expect(rankNormalizedSplitRhat(chains)).toBeGreaterThan(1.5);
  });
});
