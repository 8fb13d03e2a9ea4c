import { describe, expect, it } from "vitest";
import { continuousSpaceCadence, DAYS_PER_YEAR, seasonalGroundCadence } from "../../src/lightcurve/cadence.js";
import { createRng } from "../../src/random/rng.js";

function gaps(times: Float64Array): number[] {
  const out: number[] = [];
  for (let i = 1; i < times.length; i++) out.push(times[i] - times[i - 1]);
  return out;
}

describe("seasonal ground cadence", () => {
  it("is reproducible from the seed and sorted", () => {
    const a = seasonalGroundCadence({ start: 1000, seasons: 4 }, createRng(11));
    const b = seasonalGroundCadence({ start: 1000, seasons: 4 }, createRng(11));
    expect(Array.from(a)).toEqual(Array.from(b));
    for (let i = 1; i < a.length; i++) expect(a[i]).toBeGreaterThanOrEqual(a[i - 1]);
  });

  it("has one gap of about six months per year and the expected number of nights", () => {
    // About six months lost behind the Sun each year (common practice): the season gap is
    // one year minus the season length, give or take a few nights of revisit and weather.
    const seasons = 6;
    const times = seasonalGroundCadence(
      { start: 0, seasons, seasonLength: 182.6, revisitInterval: 3, weatherLoss: 0.3 },
      createRng(3),
    );
    const long = gaps(times).filter((g) => g > 60);
    expect(long.length).toBe(seasons - 1);
    for (const g of long) {
      expect(g).toBeGreaterThan(DAYS_PER_YEAR - 182.6 - 1);
      expect(g).toBeLessThan(DAYS_PER_YEAR - 182.6 + 30);
    }
    // Planned nights per season: ceil(182.6 / 3) = 61; 30% lost; binomial sd sqrt(366 * 0.21) ~ 9.
    const planned = Math.ceil(182.6 / 3) * seasons;
    expect(Math.abs(times.length - 0.7 * planned)).toBeLessThan(4 * Math.sqrt(planned * 0.21));
  });

  it("keeps every visit within the nightly window around midnight", () => {
    const times = seasonalGroundCadence({ start: 50000, nightlyJitter: 0.1, visitsPerNight: 2 }, createRng(5));
    for (const t of times) {
      const fromMidnight = t - Math.round(t);
      expect(fromMidnight).toBeGreaterThanOrEqual(-0.1 - 1e-9);
      expect(fromMidnight).toBeLessThanOrEqual(0.1 + 0.02 + 1e-9);
    }
  });

  it("rejects impossible options", () => {
    expect(() => seasonalGroundCadence({ weatherLoss: 1 }, createRng(1))).toThrow(/weatherLoss/);
    expect(() => seasonalGroundCadence({ seasonLength: 400 }, createRng(1))).toThrow(/seasonLength/);
    expect(() => seasonalGroundCadence({ nightlyJitter: 0.6 }, createRng(1))).toThrow(/nightlyJitter/);
    expect(() => seasonalGroundCadence({ seasons: 0 }, createRng(1))).toThrow(/seasons/);
  });
});

describe("continuous space-like cadence", () => {
  it("samples every 30 minutes with a small random loss", () => {
    const times = continuousSpaceCadence({ duration: 27, lossFraction: 0.02 }, createRng(9));
    const full = Math.floor(27 * 48) + 1;
    expect(times.length).toBeLessThan(full);
    expect(times.length).toBeGreaterThan(full * 0.95);
    const minimum = Math.min(...gaps(times));
    expect(minimum).toBeCloseTo(1 / 48, 10);
  });

  it("leaves periodic downlink gaps", () => {
    const times = continuousSpaceCadence({ duration: 24, gapEvery: 13.5, gapLength: 1, lossFraction: 0 }, createRng(9));
    const long = gaps(times).filter((g) => g > 0.5);
    expect(long.length).toBe(1);
    expect(long[0]).toBeCloseTo(1 + 1 / 48, 6);
    expect(() => continuousSpaceCadence({ gapEvery: 1, gapLength: 2 }, createRng(1))).toThrow(/gapLength/);
  });
});
