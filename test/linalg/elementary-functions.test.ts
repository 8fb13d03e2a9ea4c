import { describe, expect, it } from "vitest";
import { cosineAndSine, cosineAndSineSource, decayFactor, decayFactorSource, exponential, EXPONENTIAL_TABLE_NAMES, EXPONENTIAL_TABLES } from "../../src/linalg/elementary-functions.js";
import { coshSeries, hyperbolicSeriesSource, sinhSeries } from "../../src/linalg/oscillator-transition.js";
import { createRng } from "../../src/random/rng.js";

const EPSILON = 2 ** -52;

// Reference: the platform's Math.exp, Math.cos and Math.sin (V8's ports of fdlibm, accurate to < 1 ulp),
// on seeded random arguments, plus exactly known values.
describe("exponential (Tang 1989 table-driven exp)", () => {
  it("agrees with Math.exp within 1 ulp on 10^6 arguments in [-708, 708]", () => {
    const rng = createRng(20261202);
    let worst = 0;
    for (let i = 0; i < 1_000_000; i++) {
      const x = i % 2 === 0 ? (rng.uniform() - 0.5) * 1416 : (rng.uniform() - 0.9) * 40;
      const reference = Math.exp(x);
      worst = Math.max(worst, Math.abs(exponential(x) - reference) / reference);
    }
    expect(worst).toBeLessThanOrEqual(EPSILON);
  });

  it("is exact where exp is: e^0 = 1, e^1 = Math.E, and hands the edges to Math.exp", () => {
    expect(exponential(0)).toBe(1);
    expect(exponential(-0)).toBe(1);
    expect(Math.abs(exponential(1) - Math.E)).toBeLessThanOrEqual(Math.E * EPSILON);
    expect(exponential(-Infinity)).toBe(0);
    expect(exponential(Infinity)).toBe(Infinity);
    expect(exponential(800)).toBe(Infinity);
    expect(exponential(-745.2)).toBe(Math.exp(-745.2)); // subnormal
    expect(exponential(NaN)).toBeNaN();
  });
});

describe("cosineAndSine (Cody-Waite reduction, fdlibm polynomials)", () => {
  it("agrees with Math.cos and Math.sin within 2^-52 absolute for |x| up to 1e5 and beyond", () => {
    const rng = createRng(7);
    const out = new Float64Array(2);
    let worst = 0;
    for (let i = 0; i < 1_000_000; i++) {
      const scale = [4, 400, 2e5][i % 3];
      const x = (rng.uniform() - 0.5) * scale;
      cosineAndSine(x, out, 0);
      worst = Math.max(worst, Math.abs(out[0] - Math.cos(x)), Math.abs(out[1] - Math.sin(x)));
    }
    expect(worst).toBeLessThanOrEqual(EPSILON);
  });

  it("gives the exact values at 0 and the known values at pi/6, pi/2 and pi", () => {
    const out = new Float64Array(2);
    cosineAndSine(0, out, 0);
    expect([out[0], out[1]]).toEqual([1, 0]);
    cosineAndSine(Math.PI / 6, out, 0);
    expect(Math.abs(out[1] - 0.5)).toBeLessThan(2 * EPSILON);
    expect(Math.abs(out[0] - Math.sqrt(3) / 2)).toBeLessThan(2 * EPSILON);
    cosineAndSine(Math.PI / 2, out, 0);
    expect(Math.abs(out[0])).toBeLessThan(1e-16);
    expect(out[1]).toBe(1);
    cosineAndSine(-Math.PI, out, 0);
    expect(out[0]).toBe(-1);
    expect(Math.abs(out[1])).toBeLessThan(1e-15);
  });
});

describe("decayFactor (exp for transitions, no call-out)", () => {
  it("equals exponential on [-708, 708] and flushes results below 2^-1021 to zero", () => {
    const rng = createRng(11);
    for (let i = 0; i < 100_000; i++) {
      const x = (rng.uniform() - 0.5) * 1416;
      expect(decayFactor(x)).toBe(exponential(x));
    }
    expect(decayFactor(-708.5)).toBe(0);
    expect(decayFactor(-Infinity)).toBe(0);
    expect(decayFactor(NaN)).toBeNaN();
    expect(decayFactor(0)).toBe(1);
  });
});

describe("source emitters for generated code (bit-identical to the functions they write out)", () => {
  it("decayFactorSource computes decayFactor exactly, the flush to zero included", () => {
    const names = EXPONENTIAL_TABLE_NAMES.join(", ");
    const written = new Function(names, `return function (x) { let y; ${decayFactorSource("y", "x")} return y; };`)(
      ...EXPONENTIAL_TABLE_NAMES.map((name) => EXPONENTIAL_TABLES[name]),
    ) as (x: number) => number;
    const rng = createRng(7);
    for (let i = 0; i < 100_000; i++) {
      const x = i % 3 === 0 ? -rng.uniform() * 800 : (rng.uniform() - 0.5) * 20;
      expect(Object.is(written(x), decayFactor(x))).toBe(true);
    }
    expect(written(-709)).toBe(0);
    expect(written(0)).toBe(1);
  });

  it("cosineAndSineSource computes cosineAndSine exactly, the large-argument fallback included", () => {
    const written = new Function("x", `let c; let s; ${cosineAndSineSource("c", "s", "x")} return [c, s];`) as (x: number) => number[];
    const out = new Float64Array(2);
    const rng = createRng(9);
    for (let i = 0; i < 100_000; i++) {
      const x = i % 100 === 0 ? (rng.uniform() - 0.5) * 1e7 : (rng.uniform() - 0.5) * 200;
      cosineAndSine(x, out, 0);
      const [c, s] = written(x);
      expect(Object.is(c, out[0]) && Object.is(s, out[1])).toBe(true);
    }
  });

  it("hyperbolicSeriesSource computes coshSeries and sinhSeries exactly", () => {
    const { cosh, sinh } = hyperbolicSeriesSource("x");
    const coshWritten = new Function("x", `return ${cosh};`) as (x: number) => number;
    const sinhWritten = new Function("x", `return ${sinh};`) as (x: number) => number;
    const rng = createRng(8);
    for (let i = 0; i < 100_000; i++) {
      const x = 2 * rng.uniform() - 1;
      expect(Object.is(coshWritten(x), coshSeries(x))).toBe(true);
      expect(Object.is(sinhWritten(x), sinhSeries(x))).toBe(true);
    }
  });
});
