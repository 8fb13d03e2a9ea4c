import { describe, expect, it } from "vitest";
import { drawnPeriodModes, hasDailyWindow } from "../../src/models/period-modes.js";
import { createRng } from "../../src/random/rng.js";

/**
 * Mode report vs draws (issue 12): a sparse rotator's result listed modes at 0.28 d (74%) and 0.11 d
 * (26%) while the pooled draws sat at 17 d. `periodModes` now comes from the draws themselves.
 */
describe("the modes the draws sit in", () => {
  it("splits the draws' periods at gaps and reports each group's median and share", () => {
    const rng = createRng("drawn-modes");
    const periods = [
      ...Array.from({ length: 700 }, () => 17 * (1 + 0.004 * rng.normal())),
      ...Array.from({ length: 290 }, () => 8.5 * (1 + 0.004 * rng.normal())),
      ...Array.from({ length: 10 }, () => 0.28 * (1 + 0.004 * rng.normal())),
    ];
    const modes = drawnPeriodModes(periods);
    expect(modes.map((m) => m.probability)).toEqual([0.7, 0.29, 0.01]);
    expect(modes[0].period).toBeCloseTo(17, 1);
    expect(modes[1].period).toBeCloseTo(8.5, 1);
    expect(drawnPeriodModes(periods, 0.05)).toHaveLength(2);
    expect(drawnPeriodModes([])).toEqual([]);
  });

  it("sees the one-day window of nightly ground data and not of a continuous stare (common practice)", () => {
    const rng = createRng("daily-window");
    const nightly = Float64Array.from({ length: 300 }, (_, i) => 59000 + i + 0.05 * rng.normal());
    const stare = Float64Array.from({ length: 3000 }, (_, i) => 59000 + i / 144);
    expect(hasDailyWindow(nightly)).toBe(true);
    expect(hasDailyWindow(stare)).toBe(false);
  });
});
