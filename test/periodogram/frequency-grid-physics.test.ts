import { describe, expect, it } from "vitest";
import { automaticFrequencyGrid, typicalVisitSpacing } from "../../src/periodogram/frequency-grid.js";
import { computePeriodogram } from "../../src/periodogram/periodogram.js";
import { createRng } from "../../src/random/rng.js";

/**
 * The grid from the physics (issue 12): a three-season ground light curve with visits clustered
 * minutes apart ended in "the frequency grid would have 2499991 points (limit 2000000)", because the
 * highest frequency came from the smallest spacing. The shortest period is now twice the typical
 * spacing of visits on different nights (a Nyquist argument for the visits; common practice), and a grid
 * over the limit becomes a coarse-then-fine search.
 */
function clusteredSeasons(rng: ReturnType<typeof createRng>) {
  const time: number[] = [];
  for (let season = 0; season < 3; season++) {
    for (let night = 0; night < 240; night += 1 + Math.floor(3 * rng.uniform())) {
      const start = 59000 + 365.25 * season + night + 0.1 * rng.uniform();
      for (let visit = 0; visit < 3; visit++) time.push(start + (visit * (2 + 10 * rng.uniform())) / 1440);
    }
  }
  return Float64Array.from(time);
}

describe("frequency grid from the cadence", () => {
  it("clustered visits: the shortest period comes from the night-to-night spacing, not the minutes between visits", () => {
    const rng = createRng("clustered");
    const time = clusteredSeasons(rng);
    const spacing = typicalVisitSpacing(time);
    expect(spacing).toBeGreaterThan(0.9);
    expect(spacing).toBeLessThan(3.1);
    const grid = automaticFrequencyGrid({ time });
    expect(grid.fineStep).toBeUndefined();
    expect(grid.count).toBeLessThan(20_000);
  });

  it("an even cadence keeps its own Nyquist limit", () => {
    const time = Float64Array.from({ length: 5000 }, (_, i) => 59000 + (2 / 1440) * i);
    expect(Math.abs(typicalVisitSpacing(time) / (2 / 1440) - 1)).toBeLessThan(1e-6);
  });

  it("a grid over the limit is searched coarse-then-fine and still finds the period", () => {
    const rng = createRng("coarse-fine");
    const time = clusteredSeasons(rng);
    const value = Float64Array.from(time, (t) => 0.1 * Math.sin((2 * Math.PI * t) / 0.2771) + 0.03 * rng.normal());
    // Periods down to 2 hours: 6e4 fine points, over a limit of 2,000.
    const periodogram = computePeriodogram({ time, value }, { maximumFrequency: 12, maximumCount: 2_000, peaks: 3 });
    expect(periodogram.grid.count).toBeLessThanOrEqual(2_000);
    expect(periodogram.grid.fineStep).toBeDefined();
    expect(Math.abs(periodogram.peaks[0].period / 0.2771 - 1)).toBeLessThan(1e-3);
  });
});
