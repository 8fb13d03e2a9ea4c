import { describe, expect, it } from "vitest";
import { DualAveraging } from "../../src/inference/dual-averaging.js";
import { planWarmup, RunningVariance } from "../../src/inference/warmup-schedule.js";
import { createRng } from "../../src/random/rng.js";

describe("warm-up plan", () => {
  it("500 iterations: 75 step-size only, windows 25, 50, 100 and a stretched last one, 50 terminal (worked by hand)", () => {
    // Windows start at 75 and double: [75,100), [100,150), [150,250); the next, [250,450), would be
    // followed by one of 400 that cannot fit before 450, so it runs to 450 = 500 - 50.
    const plan = planWarmup(500);
    expect(plan.windowStarts).toEqual([75, 100, 150, 250]);
    expect(plan.windowEnds).toEqual([100, 150, 250, 450]);
  });

  it("short warm-ups use 15% / 75% / 10% and very short ones no mass-matrix window", () => {
    expect(planWarmup(100)).toEqual({ windowStarts: [15], windowEnds: [90] });
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
      const expected = (n / (n + 5)) * variance + (5 / (n + 5)) * target;
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
