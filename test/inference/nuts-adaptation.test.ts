import { describe, expect, it } from "vitest";
import { DualAveraging } from "../../src/inference/dual-averaging.js";
import { MASS_PRIOR_DRAWS, MIN_WARMUP_WINDOW, planWarmup, WindowSpread, WARMUP_WINDOW_GROWTH } from "../../src/inference/warmup-schedule.js";
import { createRng } from "../../src/random/rng.js";

describe("warm-up plan (the schedule documented at planWarmup)", () => {
  it("500 iterations: opening 63, windows of 30, 89, 268 tiling [63, 450), closing 50 (worked by hand)", () => {
    // span = 500 - 63 - 50 = 387; windows s, 3s, 9s with 13 s = 387 give s = 29.8 >= 20, while four
    // windows (40 s = 387, s = 9.7) would fall below the 20-draw minimum.
    const plan = planWarmup(500);
    expect(plan.windowStarts).toEqual([63, 93, 182]);
    expect(plan.windowEnds).toEqual([93, 182, 450]);
  });

  it("windows tile the middle span exactly, grow about threefold and never drop below MIN_WARMUP_WINDOW", () => {
    for (let warmup = 2 * MIN_WARMUP_WINDOW; warmup <= 5000; warmup += 37) {
      const { windowStarts, windowEnds } = planWarmup(warmup);
      expect(windowStarts[0]).toBe(Math.round(warmup / 8));
      expect(windowEnds[windowEnds.length - 1]).toBe(warmup - Math.round(warmup / 10));
      for (let w = 0; w < windowStarts.length; w++) {
        expect(windowEnds[w] - windowStarts[w]).toBeGreaterThanOrEqual(MIN_WARMUP_WINDOW);
        if (w > 0) {
          expect(windowStarts[w]).toBe(windowEnds[w - 1]);
          const ratio = (windowEnds[w] - windowStarts[w]) / (windowEnds[w - 1] - windowStarts[w - 1]);
          expect(Math.abs(ratio - WARMUP_WINDOW_GROWTH)).toBeLessThan(0.2);
        }
      }
    }
  });

  it("very short warm-ups adapt the step size only", () => {
    expect(planWarmup(2 * MIN_WARMUP_WINDOW - 1)).toEqual({ windowStarts: [], windowEnds: [] });
    expect(planWarmup(10)).toEqual({ windowStarts: [], windowEnds: [] });
  });
});

describe("window spread (normal-consistent interquartile range)", () => {
  it("estimates the standard deviation of normal draws: IQR = 2 Phi^-1(3/4) sd = 1.349 sd (normal quantile, common practice)", () => {
    const rng = createRng(4);
    const spread = new WindowSpread(2);
    for (let i = 0; i < 20_000; i++) spread.add(Float64Array.of(3 + rng.normal(), 1e6 + 0.01 * rng.normal()));
    // With nu0 pseudo-draws at the target the estimate is (nu0 t + (n - 1) s^2) / (nu0 + n - 1); a target
    // equal to the true variance leaves it unbiased. The IQR of 2e4 normal draws has a relative sd near 1.1%.
    const variance = spread.regularizedVariance(Float64Array.of(1, 1e-4));
    expect(Math.sqrt(variance[0])).toBeCloseTo(1, 1);
    expect(Math.sqrt(variance[1]) / 0.01).toBeCloseTo(1, 1);
  });

  it("is not moved by a long tail, unlike the sample variance, and is shrunk towards the target as documented", () => {
    const rng = createRng(5);
    const values = Array.from({ length: 200 }, (_, i) => (i % 20 === 0 ? 50 + 50 * rng.uniform() : rng.normal()));
    const spread = new WindowSpread(1);
    values.forEach((v) => spread.add(Float64Array.of(v)));
    const n = values.length;
    const target = 4;
    const shrunk = spread.regularizedVariance(Float64Array.of(target))[0];
    // Solve the documented shrinkage for the spread itself: s^2 = ((nu0 + n - 1) v - nu0 t) / (n - 1).
    const s2 = ((MASS_PRIOR_DRAWS + n - 1) * shrunk - MASS_PRIOR_DRAWS * target) / (n - 1);
    const mean = values.reduce((a, v) => a + v, 0) / n;
    const sampleVariance = values.reduce((a, v) => a + (v - mean) ** 2, 0) / (n - 1);
    expect(Math.sqrt(s2)).toBeGreaterThan(0.8);
    expect(Math.sqrt(s2)).toBeLessThan(1.4);
    expect(sampleVariance).toBeGreaterThan(100);
    spread.reset();
    expect(spread.count).toBe(0);
  });
});

describe("dual averaging (Hoffman & Gelman 2014, sec. 3.2)", () => {
  it("drives the acceptance statistic to its target: with alpha(eps) = exp(-eps) the step tends to -ln(delta)", () => {
    // The scheme solves E[alpha] = delta; for this deterministic alpha the solution is eps = -ln delta.
    const delta = 0.8;
    const adaptation = new DualAveraging(delta, 1);
    let step = 1;
    for (let t = 0; t < 5000; t++) step = adaptation.update(Math.exp(-step));
    expect(adaptation.finalStep()).toBeCloseTo(-Math.log(delta), 2);
    expect(step).toBeCloseTo(-Math.log(delta), 2);
  });
});
