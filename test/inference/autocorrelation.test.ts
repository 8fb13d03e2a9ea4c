import { describe, expect, it } from "vitest";
import { createRng } from "../../src/random/rng.js";
import { autocovariance, chainsAutocorrelationTime, integratedAutocorrelationTime } from "../../src/inference/autocorrelation.js";

/** x_t = phi x_{t-1} + sqrt(1 - phi^2) e_t, started from its stationary distribution N(0, 1). */
function ar1(phi: number, n: number, seed: number): Float64Array {
  const rng = createRng(seed);
  const x = new Float64Array(n);
  x[0] = rng.normal();
  const s = Math.sqrt(1 - phi * phi);
  for (let t = 1; t < n; t++) x[t] = phi * x[t - 1] + s * rng.normal();
  return x;
}

describe("autocovariance", () => {
  it("equals the defining sum (1/n) sum (x_i - xbar)(x_{i+t} - xbar) (Box & Jenkins, Time Series Analysis, eq. 2.1.12)", () => {
    const x = ar1(0.6, 301, 4);
    const n = x.length;
    const mean = x.reduce((a, b) => a + b, 0) / n;
    const c = autocovariance(x);
    for (const t of [0, 1, 2, 7, 150, 300]) {
      let s = 0;
      for (let i = 0; i + t < n; i++) s += (x[i] - mean) * (x[i + t] - mean);
      expect(c[t]).toBeCloseTo(s / n, 12);
    }
  });
});

describe("integrated autocorrelation time (Sokal window, c = 5)", () => {
  // For AR(1), rho_t = phi^t, so tau = 1 + 2 sum phi^t = (1 + phi) / (1 - phi) (a textbook identity).
  // Tolerance: 4 standard errors from Sokal's asymptotic variance var(tau) ~ 2 (2M + 1) / n tau^2
  // (Sokal 1997, eq. 3.19; from memory).
  it.each([0.5, 0.9, 0.97])("matches (1 + phi)/(1 - phi) on an AR(1) series, phi = %s", (phi) => {
    const n = 1 << 17;
    const exact = (1 + phi) / (1 - phi);
    const result = chainsAutocorrelationTime([ar1(phi, n, 17)]);
    expect(result.reliable).toBe(true);
    const se = Math.sqrt((2 * (2 * result.window + 1)) / n) * exact;
    expect(Math.abs(result.tau - exact)).toBeLessThan(4 * se);
  });

  it("averages the autocorrelation over chains before windowing", () => {
    const phi = 0.8;
    const chains = [1, 2, 3, 4, 5, 6, 7, 8].map((s) => ar1(phi, 1 << 14, s));
    const result = chainsAutocorrelationTime(chains);
    const exact = (1 + phi) / (1 - phi);
    const se = Math.sqrt((2 * (2 * result.window + 1)) / (8 << 14)) * exact;
    expect(Math.abs(result.tau - exact)).toBeLessThan(4 * se);
  });

  it("finds the window by hand on a known autocorrelation function", () => {
    // rho = 1, 0.5, 0.25, 0.125, 0, ...: tau(1) = 2, tau(2) = 2.5, tau(3) = 2.75, tau(M >= 4) = 2.75;
    // the first M with M >= 5 tau(M) is 14 (13 < 13.75 <= 14).
    const rho = new Float64Array(40);
    rho.set([1, 0.5, 0.25, 0.125]);
    const result = integratedAutocorrelationTime(rho, 5);
    expect(result.tau).toBe(2.75);
    expect(result.window).toBe(14);
    expect(result.reliable).toBe(true);
    expect(integratedAutocorrelationTime(rho.subarray(0, 10), 5).reliable).toBe(false);
  });
});
