import { describe, expect, it } from "vitest";
import { EXPRESSION_FAMILIES, parseKernelExpression } from "../../src/cli/kernel-expression.js";
import { UsageError } from "../../src/errors/usage-error.js";
import { kernels } from "../../src/kernels/index.js";

describe("kernel expressions read from the family descriptors", () => {
  it("every family with a fixed parameter list parses from name=value pairs in any order", () => {
    for (const family of EXPRESSION_FAMILIES.filter((f) => f.fromValues)) {
      const values = family.parameters.map((_, i) => (family.parameters[i].kind === "fraction" ? 0.25 : 1.5 + i));
      const pairs = family.parameters.map((p, i) => `${p.name}=${values[i]}`).reverse();
      const kernel = parseKernelExpression(`${family.expressionName}(${pairs.join(", ")})`);
      expect(Array.from(kernel.parameterValues)).toEqual(values);
    }
  });

  it("sums, products and CARMA's numbered parameters", () => {
    const k = parseKernelExpression("quasi-periodic(sigma=0.02,period=11.3,decayTime=30,harmonicWeight=0.3)+drw(sigma=0.05,tau=400)*matern32(sigma=1,scale=9)");
    const reference = kernels
      .quasiPeriodic({ sigma: 0.02, period: 11.3, decayTime: 30, harmonicWeight: 0.3 })
      .plus(kernels.dampedRandomWalk({ sigma: 0.05, tau: 400 }).times(kernels.matern32({ sigma: 1, scale: 9 })));
    expect(Array.from(k.parameterValues)).toEqual(Array.from(reference.parameterValues));
    expect(k.covarianceAt(3.7)).toBe(reference.covarianceAt(3.7));
    const carma = parseKernelExpression("carma(sigma=0.2,period0=30,quality0=2,tau0=80,ma1=5)");
    const carmaReference = kernels.carma({ sigma: 0.2, oscillations: [{ period: 30, quality: 2 }], timescales: [80], movingAverage: [5] });
    expect(Array.from(carma.parameterValues)).toEqual(Array.from(carmaReference.parameterValues));
  });

  it("names the problem: a missing or unknown parameter, an unknown family, a family the CLI cannot run", () => {
    expect(() => parseKernelExpression("drw(sigma=0.2)")).toThrow(UsageError);
    expect(() => parseKernelExpression("drw(sigma=0.2)")).toThrow("drw(...) needs tau (parameters: sigma, tau)");
    expect(() => parseKernelExpression("quasi-periodic(sigma=1,period=2,quality=3,harmonicWeight=0.1)")).toThrow(
      "quasi-periodic(...) needs decayTime (parameters: sigma, period, decayTime, harmonicWeight)",
    );
    expect(() => parseKernelExpression("drw(sigma=0.2,tau=3,scale=1)")).toThrow("drw(...) has no parameter scale");
    expect(() => parseKernelExpression("carma(sigma=0.2,tau0=3,periodX=1)")).toThrow("carma(...) has no parameter periodX");
    expect(() => parseKernelExpression("spline(sigma=1)")).toThrow(/unknown kernel "spline" \(choose drw, oscillator, quasi-periodic, matern32, carma\)/);
    expect(() => parseKernelExpression("drw(sigma=-1,tau=3)")).toThrow(RangeError);
  });
});
