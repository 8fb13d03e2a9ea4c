import { describe, expect, it } from "vitest";
import { automaticFrequencyGrid, medianSpacing, typicalVisitSpacing } from "../../src/periodogram/frequency-grid.js";
import { findPeaks } from "../../src/periodogram/periodogram-peaks.js";
import { computePeriodogram } from "../../src/periodogram/periodogram.js";
import { seasonalGroundCadence } from "../../src/lightcurve/cadence.js";
import { createRng } from "../../src/random/rng.js";

describe("automatic frequency grid (VanderPlas 2018, sect. 7.1)", () => {
  it("spaces frequencies 1 / (oversampling x baseline) up to the pseudo-Nyquist frequency of the visits", () => {
    const time = [0, 1, 2, 4, 5, 7, 100];
    const grid = automaticFrequencyGrid({ time });
    expect(grid.step).toBeCloseTo(1 / (5 * 100), 15);
    expect(grid.start).toBeCloseTo(1 / 100, 15);
    // Median spacing of distinct times is 1 (gaps 1,1,2,1,2,93), so f_max = 0.5 (common practice).
    expect(medianSpacing([0, 1, 2, 4, 5, 7, 100])).toBe(1.5);
    expect(medianSpacing([0, 0, 1, 2, 3])).toBe(1);
    // The typical visit spacing counts the gaps of at least a tenth of the mean spacing 100 / 6: the gaps
    // 2, 2 and 93, median 2, so f_max = 0.5 / 2 (twice the visit spacing is the shortest period).
    expect(typicalVisitSpacing(time)).toBe(2);
    const last = grid.start + (grid.count - 1) * grid.step;
    expect(last).toBeLessThanOrEqual(0.5 / 2 + 1e-12);
    expect(last).toBeGreaterThan(0.5 / 2 - grid.step);
    expect(automaticFrequencyGrid({ time }, { oversampling: 10, maximumFrequency: 2 }).step).toBeCloseTo(1 / 1000, 15);
    expect(() => automaticFrequencyGrid({ time: [3, 3] })).toThrow(/distinct/);
    // Over the limit: a coarse grid of at most the limit, with the fine step to refine peaks at.
    const coarse = automaticFrequencyGrid({ time }, { maximumFrequency: 1e4, maximumCount: 1000 });
    expect(coarse.count).toBeLessThanOrEqual(1000);
    expect(coarse.fineStep).toBeCloseTo(1 / 500, 15);
  });
});

describe("peak finding", () => {
  it("finds maxima strongest first, refined between grid points, without side lobes", () => {
    // A parabola through three points has its vertex where the derivative vanishes (elementary algebra).
    const grid = { start: 0, step: 1, count: 11 };
    const power = [0, 0.1, 0.2, 0.45, 0.5, 0.25, 0.1, 0.15, 0.125, 0.05, 0.025];
    const peaks = findPeaks(grid, power, { count: 3, minimumSeparation: 2 });
    expect(peaks.map((p) => p.index)).toEqual([4, 7]);
    // Parabola through (3, 0.45), (4, 0.5), (5, 0.25): y = 0.5 - 0.1 (x - 4) - 0.15 (x - 4)^2,
    // vertex at x = 4 - 1/3, height 0.5 + 0.1/3 - 0.15/9.
    expect(peaks[0].frequency).toBeCloseTo(4 - 1 / 3, 12);
    expect(peaks[0].power).toBeCloseTo(0.5 + 0.1 / 3 - 0.15 / 9, 12);
    expect(peaks[0].atEdge).toBe(false);
    const edge = findPeaks(grid, [1, 0.5, 0.2, 0.1, 0.1, 0.1, 0.1, 0.1, 0.1, 0.1, 0.1]);
    expect(edge[0].atEdge).toBe(true);
  });

  it("recovers the period of a noisy sinusoid observed with a seasonal ground cadence", () => {
    const rng = createRng(21);
    const time = seasonalGroundCadence({ start: 58000, seasons: 3, revisitInterval: 2 }, rng);
    const period = 3.71;
    const error = time.map(() => 0.05);
    const value = time.map((t) => 17 + 0.1 * Math.sin((2 * Math.PI * t) / period) + 0.05 * rng.normal());
    const result = computePeriodogram({ time, value, error }, { maximumFrequency: 1 });
    const best = result.peaks[0];
    // The peak is 1/baseline wide; the refined frequency should be far closer than that.
    expect(Math.abs(best.frequency - 1 / period)).toBeLessThan(0.1 / result.baseline);
    expect(best.falseAlarm).toBeLessThan(1e-6);
    expect(best.sinusoid!.amplitude).toBeGreaterThan(0.08);
    expect(best.sinusoid!.amplitude).toBeLessThan(0.12);
    expect(result.falseAlarmLevels.map((l) => l.probability)).toEqual([0.1, 0.01, 0.001]);
    expect(result.falseAlarmLevels[2].power).toBeGreaterThan(result.falseAlarmLevels[0].power);
    expect(result.frequency.length).toBe(result.power.length);
  });
});
