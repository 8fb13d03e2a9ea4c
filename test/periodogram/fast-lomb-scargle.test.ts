import { describe, expect, it } from "vitest";
import { fastGlsIsCheaper, fastGlsPower } from "../../src/periodogram/fast-lomb-scargle.js";
import { glsPower } from "../../src/periodogram/generalised-lomb-scargle.js";
import { createRng } from "../../src/random/rng.js";

/**
 * The Press & Rybicki 1989 (ApJ 338, 277) fast sums against the direct sums of the generalised
 * Lomb-Scargle power (Zechmeister & Kurster 2009), on random cadences with Julian-date times, errors
 * and grids that do not start at a multiple of their step.
 */
describe("fast generalised Lomb-Scargle", () => {
  it("agrees with the direct sums to 3e-5 in power", () => {
    const rng = createRng("fast-gls");
    for (const n of [12, 300, 3000]) {
      const time = Float64Array.from({ length: n }, () => 2460000.5 + 400 * rng.uniform()).sort();
      const value = Float64Array.from(time, (t) => Math.sin((2 * Math.PI * t) / 5.3) + 0.7 * rng.normal());
      const error = Float64Array.from(time, () => 0.2 + rng.uniform());
      const grid = { start: 0.00317, step: 1 / (5 * 400), count: 6000 };
      const fast = fastGlsPower({ time, value, error }, grid);
      const direct = glsPower({ time, value, error }, grid);
      let worst = 0;
      for (let k = 0; k < grid.count; k++) worst = Math.max(worst, Math.abs(fast[k] - direct[k]));
      expect(worst).toBeLessThan(3e-5);
    }
  });

  it("is chosen only where it is cheaper", () => {
    expect(fastGlsIsCheaper(50, 1000)).toBe(false);
    expect(fastGlsIsCheaper(200_000, 500_000)).toBe(true);
  });
});
