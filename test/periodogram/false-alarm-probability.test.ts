import kstest from "@stdlib/stats/kstest";
import { describe, expect, it } from "vitest";
import { bootstrapFalseAlarm } from "../../src/periodogram/bootstrap-false-alarm.js";
import { baluevFalseAlarm, baluevFalseAlarmBound, baluevPowerLevel, singleFrequencyFalseAlarm, timeVariance } from "../../src/periodogram/false-alarm-probability.js";
import { automaticFrequencyGrid } from "../../src/periodogram/frequency-grid.js";
import { glsPower, glsPowerAt } from "../../src/periodogram/generalised-lomb-scargle.js";
import { childSeed, createRng, type Rng } from "../../src/random/rng.js";

function noiseSeries(rng: Rng, n: number, signal = 0, equalErrors = false) {
  const time = new Float64Array(n);
  const error = new Float64Array(n);
  const value = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    time[i] = 100 * rng.uniform();
    error[i] = equalErrors ? 1 : 0.5 + rng.uniform();
  }
  for (let i = 0; i < n; i++) value[i] = 3 + signal * Math.sin(2 * Math.PI * 0.21 * time[i]) + error[i] * rng.normal();
  return { time, value, error };
}

describe("single-frequency false-alarm probability", () => {
  it("matches the Beta(1, (N - 3) / 2) law of the power for Gaussian noise (KS test, @stdlib/stats)", () => {
    // ZK09 eq. 24: Prob(p > p0) = (1 - p0)^((N - 3) / 2), i.e. p ~ Beta(1, (N - 3) / 2).
    const rng = createRng(101);
    const n = 20;
    const noisePowers: number[] = [];
    const signalPowers: number[] = [];
    for (let trial = 0; trial < 1500; trial++) {
      noisePowers.push(glsPowerAt(noiseSeries(rng, n), [0.21])[0]);
      if (trial < 300) signalPowers.push(glsPowerAt(noiseSeries(rng, n, 1.5), [0.21])[0]);
    }
    const b = (n - 3) / 2;
    expect(kstest(noisePowers, "beta", 1, b).pValue).toBeGreaterThan(0.01);
    // The same test rejects when a signal is present, so it can fail.
    expect(kstest(signalPowers, "beta", 1, b).pValue).toBeLessThan(1e-6);
    expect(singleFrequencyFalseAlarm(0.2, 23)).toBeCloseTo(Math.pow(0.8, 10), 14);
    expect(singleFrequencyFalseAlarm(0, 23)).toBe(1);
    expect(singleFrequencyFalseAlarm(1, 23)).toBe(0);
  });
});

describe("search-wide false-alarm probability (Baluev 2008)", () => {
  // White Gaussian noise, 40 irregular points over 100 d, searched up to 1 cycle/d on a 10x oversampled
  // grid (fine enough not to miss the tops of the peaks).
  const n = 40;
  const rng = createRng(202);
  const maxima: number[] = [];
  let extentVariance = 0;
  const trials = 1000;
  for (let trial = 0; trial < trials; trial++) {
    const series = noiseSeries(rng, n, 0, true);
    const grid = automaticFrequencyGrid(series, { maximumFrequency: 1, oversampling: 10 });
    const power = glsPower(series, grid);
    maxima.push(Math.max(...power));
    extentVariance += timeVariance(series) / trials;
  }
  const extent = { n, maximumFrequency: 1, timeVariance: extentVariance };
  const exceed = (level: number) => maxima.filter((m) => m >= level).length / trials;

  it("agrees with the simulated distribution of the highest peak of noise", () => {
    // Baluev 2008 shows the approximation is tight for small FAP and slightly conservative otherwise.
    for (const probability of [0.3, 0.1, 0.03]) {
      const level = baluevPowerLevel(probability, extent);
      expect(baluevFalseAlarm(level, extent)).toBeCloseTo(probability, 8);
      const observed = exceed(level);
      if (process.env.HOROLOGIUM_SHOW_FIGURES) console.log(`Baluev FAP ${probability}: simulated ${observed}`);
      const sd = Math.sqrt((probability * (1 - probability)) / trials);
      expect(observed).toBeLessThan(probability + 3 * sd);
      expect(observed).toBeGreaterThan(0.7 * probability - 3 * sd);
    }
  });

  it("is a far better estimate than the single-frequency probability, and below the Davies bound", () => {
    const level = baluevPowerLevel(0.05, extent);
    expect(singleFrequencyFalseAlarm(level, n)).toBeLessThan(0.005);
    expect(baluevFalseAlarmBound(level, extent)).toBeGreaterThanOrEqual(baluevFalseAlarm(level, extent));
    expect(baluevFalseAlarm(0.99, extent)).toBeLessThan(1e-30);
    expect(baluevFalseAlarm(0.01, extent)).toBeCloseTo(1, 6);
    expect(() => baluevFalseAlarm(0.5, { ...extent, n: 4 })).toThrow(/5 points/);
  });

  it("is matched on average by the bootstrap, which is reproducible from its seed", () => {
    // The bootstrap of one data set scatters with that set's value distribution, so average over five.
    const seriesRng = createRng(303);
    let total = 0;
    for (let k = 0; k < 5; k++) {
      const series = noiseSeries(seriesRng, n);
      series.error.fill(1);
      const grid = automaticFrequencyGrid(series, { maximumFrequency: 1 });
      const level = baluevPowerLevel(0.1, { n, maximumFrequency: 1, timeVariance: timeVariance(series) });
      const a = bootstrapFalseAlarm(series, grid, level, { trials: 150, rng: createRng(childSeed(7, k)) });
      total += a.falseAlarm / 5;
      if (k === 0) {
        const b = bootstrapFalseAlarm(series, grid, level, { trials: 150, rng: createRng(childSeed(7, k)) });
        expect(Array.from(a.maxima)).toEqual(Array.from(b.maxima));
      }
    }
    // Baluev's 0.1 is slightly conservative (previous test); binomial sd of the mean ~ sqrt(0.1 * 0.9 / 750) = 0.011.
    expect(total).toBeGreaterThan(0.04);
    expect(total).toBeLessThan(0.14);
  });
});
