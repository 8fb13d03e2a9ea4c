import { Matrix, solve } from "ml-matrix";
import { describe, expect, it } from "vitest";
import { gridFrequencies } from "../../src/periodogram/frequency-grid.js";
import { glsPower, glsPowerAt } from "../../src/periodogram/generalised-lomb-scargle.js";
import { fitSinusoid } from "../../src/periodogram/sinusoid-fit.js";
import { createRng } from "../../src/random/rng.js";

/** Irregular times, values and heteroscedastic errors from a fixed seed. */
function irregular(n: number, seed: number, offset = 0) {
  const rng = createRng(seed);
  const time = new Float64Array(n);
  const value = new Float64Array(n);
  const error = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    time[i] = offset + 200 * rng.uniform();
    error[i] = 0.05 + 0.2 * rng.uniform();
    value[i] = 0.3 * Math.sin(2 * Math.PI * (time[i] - offset) / 7.3) + error[i] * rng.normal();
  }
  return { time, value, error };
}

/**
 * Power as defined by Zechmeister & Kurster 2009 eq. 4, p = (chi2_0 - chi2) / chi2_0, with chi2 of the
 * weighted least-squares fit of (cos, sin, 1) solved by ml-matrix (a general-purpose reference library)
 * and chi2_0 that of the weighted mean.
 */
function referencePower(time: Float64Array, value: Float64Array, error: Float64Array, f: number): number {
  const n = time.length;
  const rows: number[][] = [];
  const rhs: number[][] = [];
  for (let i = 0; i < n; i++) {
    const s = 1 / error[i];
    rows.push([s * Math.cos(2 * Math.PI * f * time[i]), s * Math.sin(2 * Math.PI * f * time[i]), s]);
    rhs.push([s * value[i]]);
  }
  const a = new Matrix(rows);
  const b = new Matrix(rhs);
  const x = solve(a, b, true);
  const residual = b.sub(a.mmul(x));
  const chi2 = residual.transpose().mmul(residual).get(0, 0);
  let sw = 0, swy = 0;
  for (let i = 0; i < n; i++) {
    sw += 1 / error[i] ** 2;
    swy += value[i] / error[i] ** 2;
  }
  const mean = swy / sw;
  let chi20 = 0;
  for (let i = 0; i < n; i++) chi20 += ((value[i] - mean) / error[i]) ** 2;
  return (chi20 - chi2) / chi20;
}

describe("generalised Lomb-Scargle (Zechmeister & Kurster 2009)", () => {
  it("equals the chi-square reduction of a weighted sinusoid-plus-mean fit (ml-matrix least squares)", () => {
    const { time, value, error } = irregular(80, 1);
    const grid = { start: 0.001, step: 0.0037, count: 300 };
    const power = glsPower({ time, value, error }, grid);
    const frequencies = gridFrequencies(grid);
    for (const k of [0, 1, 17, 64, 65, 128, 199, 299]) {
      expect(power[k]).toBeCloseTo(referencePower(time, value, error, frequencies[k]), 9);
    }
    // Direct evaluation agrees with the rotation recurrence.
    const direct = glsPowerAt({ time, value, error }, frequencies);
    for (let k = 0; k < grid.count; k++) expect(Math.abs(direct[k] - power[k])).toBeLessThan(1e-10);
  });

  it("keeps its accuracy over a long grid with Julian-date times", () => {
    // Times near 2.46e6 (Julian dates): the periodogram must not depend on the time origin (docs/architecture.md, "Numerics").
    const shifted = irregular(60, 2, 2_460_000.5);
    const plain = irregular(60, 2, 0);
    const grid = { start: 0.01, step: 0.0005, count: 20_000 };
    const a = glsPower(shifted, grid);
    const b = glsPower(plain, grid);
    let worst = 0;
    for (let k = 0; k < grid.count; k++) worst = Math.max(worst, Math.abs(a[k] - b[k]));
    expect(worst).toBeLessThan(1e-8);
    const last = gridFrequencies(grid)[grid.count - 1];
    expect(a[grid.count - 1]).toBeCloseTo(referencePower(plain.time, plain.value, plain.error, last), 8);
  });

  it("gives power 1 at the frequency of a noise-free sinusoid and recovers it (closed form)", () => {
    // A pure sinusoid plus a constant is fitted exactly at its own frequency, so chi2 = 0 and p = 1 (ZK09 eq. 4).
    const rng = createRng(3);
    const n = 40;
    const time = Float64Array.from({ length: n }, () => 50 * rng.uniform());
    const f0 = 0.37;
    const value = time.map((t) => 12.3 + 0.8 * Math.cos(2 * Math.PI * f0 * t - 1.1));
    expect(glsPowerAt({ time, value }, [f0])[0]).toBeCloseTo(1, 10);
    const fit = fitSinusoid({ time, value }, f0);
    expect(fit.amplitude).toBeCloseTo(0.8, 10);
    expect(fit.offset).toBeCloseTo(12.3, 10);
    // Phase referred to the weighted mean time: 2 pi f0 (t - t_ref) - phi = 2 pi f0 t - 1.1.
    const expected = 1.1 - 2 * Math.PI * f0 * fit.referenceTime;
    expect(Math.cos(fit.phase - expected)).toBeCloseTo(1, 10);
  });

  it("is zero at the other Fourier frequencies for a sinusoid sampled evenly over whole cycles", () => {
    // Orthogonality of the discrete Fourier basis on an even grid: sum_t cos(2 pi k t / N) cos(2 pi j t / N) = 0 for k != j.
    const n = 64;
    const time = Float64Array.from({ length: n }, (_, i) => i);
    const value = time.map((t) => Math.sin((2 * Math.PI * 5 * t) / n));
    const power = glsPowerAt({ time, value }, [1 / n, 3 / n, 5 / n, 9 / n, 31 / n]);
    expect(power[2]).toBeCloseTo(1, 12);
    for (const k of [0, 1, 3, 4]) expect(power[k]).toBeLessThan(1e-20 + 1e-12);
  });

  it("equals the classical periodogram on evenly sampled data at the Fourier frequencies", () => {
    // For even sampling and equal weights, at f_k = k / (N dt) (0 < k < N/2) the columns cos, sin, 1 are
    // orthogonal with sum cos^2 = sum sin^2 = N/2, so the GLS power is the classical (Schuster 1898)
    // periodogram 2 |sum (y - ybar) exp(-2 pi i f t)|^2 / (N sum (y - ybar)^2); Scargle 1982 (ApJ 263, 835)
    // shows the same reduction for the classical Lomb-Scargle form.
    const rng = createRng(8);
    const n = 50;
    const dt = 0.5;
    const time = Float64Array.from({ length: n }, (_, i) => 100 + i * dt);
    const value = time.map((t) => Math.sin(t) + rng.normal());
    let mean = 0;
    for (const v of value) mean += v / n;
    let scatter = 0;
    for (const v of value) scatter += (v - mean) ** 2;
    for (let k = 1; k < n / 2; k++) {
      const f = k / (n * dt);
      let re = 0, im = 0;
      for (let i = 0; i < n; i++) {
        re += (value[i] - mean) * Math.cos(2 * Math.PI * f * time[i]);
        im -= (value[i] - mean) * Math.sin(2 * Math.PI * f * time[i]);
      }
      const classical = (2 * (re * re + im * im)) / (n * scatter);
      expect(glsPowerAt({ time, value }, [f])[0]).toBeCloseTo(classical, 10);
    }
    // At the Nyquist frequency the sine column vanishes; the one-column fit gives (sum y cos)^2 / (N scatter).
    let alternating = 0;
    for (let i = 0; i < n; i++) alternating += (value[i] - mean) * (i % 2 ? -1 : 1);
    expect(glsPowerAt({ time, value }, [1 / (2 * dt)])[0]).toBeCloseTo((alternating * alternating) / (n * scatter), 10);
  });

  it("does not change when all errors are scaled by one factor, and needs scatter", () => {
    const { time, value, error } = irregular(30, 5);
    const scaled = error.map((e) => 3 * e);
    const grid = { start: 0.01, step: 0.01, count: 50 };
    const a = glsPower({ time, value, error }, grid);
    const b = glsPower({ time, value, error: scaled }, grid);
    for (let k = 0; k < grid.count; k++) expect(b[k]).toBeCloseTo(a[k], 12);
    expect(() => glsPower({ time, value: value.map(() => 2) }, grid)).toThrow(/no scatter/);
    expect(() => glsPower({ time, value, error: error.map(() => 0) }, grid)).toThrow(/positive/);
    expect(() => glsPower({ time: time.slice(0, 2), value: value.slice(0, 2) }, grid)).toThrow(/at least 3/);
  });
});
