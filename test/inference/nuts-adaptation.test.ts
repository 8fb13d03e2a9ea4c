import { describe, expect, it } from "vitest";
import { DualAveraging } from "../../src/inference/dual-averaging.js";
import {
  MASS_PRIOR_DRAWS,
  MIN_WARMUP_WINDOW,
  planWarmup,
  RunningVariance,
  WARMUP_WINDOW_GROWTH,
} from "../../src/inference/warmup-schedule.js";
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
        expect(windowEnds[w]! - windowStarts[w]!).toBeGreaterThanOrEqual(MIN_WARMUP_WINDOW);
        if (w > 0) {
          expect(windowStarts[w]).toBe(windowEnds[w - 1]);
          const ratio = (windowEnds[w]! - windowStarts[w]!) / (windowEnds[w - 1]! - windowStarts[w - 1]!);
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

describe("running variance (Welford 1962)", () => {
  it("equals the two-pass sample variance, then is shrunk as documented", () => {
    const rng = createRng(4);
    const rows = Array.from({ length: 57 }, () => Float64Array.of(3 + rng.normal(), 1e6 + 0.01 * rng.normal()));
    const acc = new RunningVariance(2);
    rows.forEach((r) => acc.add(r));
    const n = rows.length;
    for (let i = 0; i < 2; i++) {
      const mean = rows.reduce((a, r) => a + r[i]!, 0) / n;
      const variance = rows.reduce((a, r) => a + (r[i]! - mean) ** 2, 0) / (n - 1);
      const target = [0.5, 2e-4][i]!;
      // Conjugate shrinkage (Gelman et al. 2013, sec. 3.3): (nu0 target + (n - 1) s^2) / (nu0 + n - 1).
      const expected = (MASS_PRIOR_DRAWS * target + (n - 1) * variance) / (MASS_PRIOR_DRAWS + n - 1);
      // Values near 1e6 with spread 0.01 carry only about 8 significant digits of their deviations.
      expect(acc.regularizedVariance(Float64Array.of(0.5, 2e-4))[i]! / expected).toBeCloseTo(1, 7);
    }
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
