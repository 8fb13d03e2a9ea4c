import { describe, expect, it } from "vitest";
import { rhatThreshold } from "../../src/inference/convergence-check.js";
import { rankNormalizedSplitRhat } from "../../src/inference/split-rhat.js";
import { createRng, type Rng } from "../../src/random/rng.js";

/** A stationary AR(1) chain x_t = rho x_{t-1} + sqrt(1 - rho^2) e_t, integrated autocorrelation time (1 + rho) / (1 - rho). */
function ar1Chain(length: number, rho: number, rng: Rng): Float64Array {
  const chain = new Float64Array(length);
  let x = rng.normal();
  const s = Math.sqrt(1 - rho * rho);
  for (let t = 0; t < length; t++) chain[t] = x = rho * x + s * rng.normal();
  return chain;
}

describe("R-hat bound by number of chains", () => {
  it("is the four-chain bound for four chains or fewer, sqrt(1 + (rhat^2 - 1) m / 4) beyond", () => {
    expect(rhatThreshold(1.01, 4)).toBe(1.01);
    expect(rhatThreshold(1.01, 2)).toBe(1.01);
    expect(rhatThreshold(1.01, 16)).toBeCloseTo(Math.sqrt(1 + 0.0201 * 4), 15);
    expect(rhatThreshold(1.01, 16)).toBeCloseTo(1.0394, 4);
  });

  it("asks the same ESS of any number of chains: M / (bound^2 - 1) is constant, about 400", () => {
    // R-hat^2 - 1 ~ M / ESS for M split chains (Vats & Knudson 2021, from memory), so the ESS at which a
    // well-mixed run meets the bound is M / (bound^2 - 1); 1.01 with four chains (M = 8) gives 398.
    const essAtBound = (chains: number) => (2 * chains) / (rhatThreshold(1.01, chains) ** 2 - 1);
    expect(essAtBound(4)).toBeCloseTo(398, 0);
    for (const chains of [8, 16, 32, 64]) expect(essAtBound(chains)).toBeCloseTo(essAtBound(4), 8);
  });

  it("at equal total ESS, R-hat^2 - 1 of sixteen chains is four times that of four: the scaling the bound assumes", () => {
    // AR(1) chains with rho = 0.9 (tau = 19), lengths giving a total ESS of 400 either way; the mean of
    // R-hat^2 - 1 over 200 replicates (fixed seed), whose standard error is about 8% of it.
    const rho = 0.9;
    const tau = (1 + rho) / (1 - rho);
    const meanExcess = (chains: number, rng: Rng): number => {
      const length = Math.round((400 * tau) / chains);
      let sum = 0;
      for (let r = 0; r < 200; r++) {
        const rhat = rankNormalizedSplitRhat(Array.from({ length: chains }, () => ar1Chain(length, rho, rng)));
        sum += rhat * rhat - 1;
      }
      return sum / 200;
    };
    const rng = createRng(20261202);
    const four = meanExcess(4, rng);
    const sixteen = meanExcess(16, rng);
    // Measured: 0.0195 and 0.0796 (M / ESS = 0.02 and 0.08).
    expect(sixteen / four).toBeGreaterThan(3.2);
    expect(sixteen / four).toBeLessThan(5);
    // And each sits near the bound for its number of chains: the bound asks the same ESS of both.
    expect(Math.abs(Math.sqrt(1 + four) - rhatThreshold(1.01, 4))).toBeLessThan(0.002);
    expect(Math.abs(Math.sqrt(1 + sixteen) - rhatThreshold(1.01, 16))).toBeLessThan(0.008);
  });
});
