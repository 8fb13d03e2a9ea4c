import { describe, expect, it } from "vitest";
import { KERNEL_FAMILIES, kernels, parameterUnit, type AnyKernelFamily, type ParameterKind } from "../../src/kernels/index.js";

const families = KERNEL_FAMILIES as readonly AnyKernelFamily[];

/** A valid value of each kind of parameter, and values that each kind must reject. */
const VALID: Record<ParameterKind, number> = { amplitude: 0.3, timescale: 20, period: 7, coherence: 25, quality: 3, fraction: 0.3, shape: 1.5, coefficient: 2 };
const INVALID: Record<ParameterKind, number[]> = {
  amplitude: [0, -1, NaN],
  timescale: [0, -2, Infinity],
  period: [0, -7],
  coherence: [0, -25],
  quality: [0, -3],
  fraction: [-0.1, 1.2, NaN],
  shape: [0, -1.5],
  coefficient: [NaN, Infinity],
};

describe("kernel family descriptors", () => {
  it("the kernels namespace has exactly one constructor per descriptor", () => {
    expect(Object.keys(kernels).sort()).toEqual(families.map((f) => f.name).sort());
    for (const family of families) expect((kernels as Record<string, unknown>)[family.name]).toBe(family.create);
  });

  for (const family of families.filter((f) => f.fromValues)) {
    const values = family.parameters.map((p) => VALID[p.kind]);
    it(`${family.name}: the descriptor's parameters are the kernel's, in order`, () => {
      const kernel = family.fromValues!(values);
      expect(kernel.parameterNames).toEqual(family.parameters.map((p) => p.name));
      expect(Array.from(kernel.parameterValues)).toEqual(values);
      expect(Array.from(kernel.withParameters(values).parameterValues)).toEqual(values);
    });

    it(`${family.name}: every invalid value its kind rules out is a RangeError naming the parameter`, () => {
      family.parameters.forEach((p, i) => {
        for (const bad of INVALID[p.kind]) {
          const trial = values.slice();
          trial[i] = bad;
          expect(() => family.fromValues!(trial)).toThrow(RangeError);
          expect(() => family.fromValues!(trial)).toThrow(new RegExp(`${p.name}.*${String(bad)}`));
        }
        if (p.kind === "fraction") {
          for (const edge of [0, 1]) expect(() => family.fromValues!(values.map((v, j) => (j === i ? edge : v)))).not.toThrow();
        }
      });
    });
  }

  it("carma (a variable parameter list) rejects its invalid values by the same kinds", () => {
    const carma = families.find((f) => f.name === "carma")!;
    const base = { sigma: 0.2, period0: 30, quality0: 2, tau0: 80, ma1: 5 };
    expect(Array.from(carma.fromExpression(base).parameterValues)).toEqual([0.2, 30, 2, 80, 5]);
    expect(() => carma.fromExpression({ ...base, quality0: -1 })).toThrow(/quality0.*-1/);
    expect(() => carma.fromExpression({ ...base, tau0: 0 })).toThrow(/tau0.*0/);
    expect(() => carma.fromExpression({ ...base, ma1: NaN })).toThrow(/ma1.*NaN/);
  });

  it("units follow the kinds: amplitudes in the data's unit, times in the time unit, the rest dimensionless", () => {
    const units = Object.fromEntries(families.flatMap((f) => f.parameters.map((p) => [`${f.name}.${p.name}`, parameterUnit(p.kind)])));
    expect(units["dampedRandomWalk.sigma"]).toBe("value");
    expect(units["dampedRandomWalk.tau"]).toBe("time");
    expect(units["quasiPeriodic.decayTime"]).toBe("time");
    expect(units["quasiPeriodic.harmonicWeight"]).toBe("none");
    expect(units["oscillator.quality"]).toBe("none");
  });
});
