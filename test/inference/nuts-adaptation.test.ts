import { describe, expect, it } from "vitest";
import { DualAveraging } from "../../src/inference/dual-averaging.js";
import { createNutsSampler } from "../../src/inference/nuts-sampler.js";
import { MIN_WARMUP_WINDOW, planWarmup, WARMUP_WINDOW_GROWTH } from "../../src/inference/warmup-schedule.js";
import { createRng } from "../../src/random/rng.js";

describe("warm-up plan (the schedule documented at planWarmup)", () => {
  it("500 iterations: opening 63, windows of 94 and 280 tiling [63, 437), closing 63; 700: three windows (worked by hand)", () => {
    // span = 500 - 63 - 63 = 374; windows s, 3s with 4 s = 374 give s = 93.5 >= 40 (end 156.5, rounded
    // half up), while three windows (13 s = 374, s = 28.8) would fall below the 40-iteration minimum.
    expect(planWarmup(500)).toEqual({ windowStarts: [63, 157], windowEnds: [157, 437] });
    // 700: span 700 - 88 - 88 = 524, 13 s = 524 gives s = 40.3 >= 40: ends 88 + 40.3, 88 + 4 s, 612.
    expect(planWarmup(700)).toEqual({ windowStarts: [88, 128, 249], windowEnds: [128, 249, 612] });
  });

  it("windows tile the middle span exactly, grow about threefold and never drop below MIN_WARMUP_WINDOW", () => {
    for (let warmup = 2 * MIN_WARMUP_WINDOW; warmup <= 5000; warmup += 37) {
      const { windowStarts, windowEnds } = planWarmup(warmup);
      expect(windowStarts[0]).toBe(Math.round(warmup / 8));
      expect(windowEnds[windowEnds.length - 1]).toBe(warmup - Math.round(warmup / 8));
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

describe("NUTS warm-up on an ill-scaled Gaussian from a unit mass matrix", () => {
  it("recovers standard deviations 0.01, 1 and 100 to within a factor 1.5 after 500 warm-up iterations", () => {
    // The exact posterior variances are sd^2. A mass matrix left at all ones (or adapted from too few
    // effective draws) stays orders of magnitude off, since the step size is set by the smallest scale
    // and the widest coordinate barely moves.
    const sd = [0.01, 1, 100];
    const target = {
      dimension: 3,
      logPosterior: (x: Float64Array) => x.reduce((a, v, i) => a - (0.5 * v * v) / (sd[i] * sd[i]), 0),
      logPosteriorAndGradient: (x: Float64Array, g: Float64Array) => {
        let lp = 0;
        for (let i = 0; i < 3; i++) {
          g[i] = -x[i] / (sd[i] * sd[i]);
          lp -= (0.5 * x[i] * x[i]) / (sd[i] * sd[i]);
        }
        return lp;
      },
    };
    const rng = createRng(11);
    const initial = Array.from({ length: 4 }, () => Float64Array.from(sd, () => 0.1 * rng.normal()));
    const sampler = createNutsSampler(target, initial, 12, { warmup: 500 });
    for (let i = 0; i < 500; i++) sampler.iterate();
    const { inverseMassDiagonals } = sampler.details() as { inverseMassDiagonals: number[][] };
    for (const diagonal of inverseMassDiagonals) {
      diagonal.forEach((m, i) => expect(Math.abs(Math.log(Math.sqrt(m) / sd[i])), `coordinate ${i}: sd ${Math.sqrt(m)}`).toBeLessThan(Math.log(1.5)));
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
