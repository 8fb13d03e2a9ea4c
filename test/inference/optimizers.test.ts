import { describe, expect, it } from "vitest";
import { minimizeLbfgs } from "../../src/inference/lbfgs.js";
import { minimizeNelderMead } from "../../src/inference/nelder-mead.js";
import { findMaximumPosterior } from "../../src/inference/maximum-posterior.js";

// Test problems with known minima from More, Garbow & Hillstrom 1981 (ACM TOMS 7, 17): problems 1
// (Rosenbrock, minimum 0 at (1, 1), start (-1.2, 1)), 7 (helical valley, 0 at (1, 0, 0), start (-1, 0, 0)),
// 13 (Powell singular, 0 at the origin, start (3, -1, 0, 1)) and 5 (Beale, 0 at (3, 0.5), start (1, 1)).
type Problem = { name: string; f: (x: Float64Array, g?: Float64Array) => number; start: number[]; minimum: number[] };

const problems: Problem[] = [
  {
    name: "Rosenbrock",
    start: [-1.2, 1],
    minimum: [1, 1],
    f: (x, g) => {
      const [a, b] = [x[0], x[1]];
      if (g) {
        g[0] = -400 * a * (b - a * a) - 2 * (1 - a);
        g[1] = 200 * (b - a * a);
      }
      return 100 * (b - a * a) ** 2 + (1 - a) ** 2;
    },
  },
  {
    name: "helical valley",
    start: [-1, 0, 0],
    minimum: [1, 0, 0],
    f: (x, g) => {
      const [a, b, c] = [x[0], x[1], x[2]];
      const theta = (Math.atan2(b, a) / (2 * Math.PI) + 1) % 1;
      const r = Math.hypot(a, b);
      const f1 = 10 * (c - 10 * theta);
      const f2 = 10 * (r - 1);
      if (g) {
        const dThetaDa = -b / (2 * Math.PI * r * r);
        const dThetaDb = a / (2 * Math.PI * r * r);
        g[0] = 2 * f1 * (-100 * dThetaDa) + 2 * f2 * (10 * a) / r;
        g[1] = 2 * f1 * (-100 * dThetaDb) + 2 * f2 * (10 * b) / r;
        g[2] = 2 * f1 * 10 + 2 * c;
      }
      return f1 * f1 + f2 * f2 + c * c;
    },
  },
  {
    name: "Beale",
    start: [1, 1],
    minimum: [3, 0.5],
    f: (x, g) => {
      const [a, b] = [x[0], x[1]];
      const r = [1.5 - a * (1 - b), 2.25 - a * (1 - b * b), 2.625 - a * (1 - b ** 3)];
      if (g) {
        g[0] = 2 * (r[0] * -(1 - b) + r[1] * -(1 - b * b) + r[2] * -(1 - b ** 3));
        g[1] = 2 * (r[0] * a + r[1] * 2 * a * b + r[2] * 3 * a * b * b);
      }
      return r[0] ** 2 + r[1] ** 2 + r[2] ** 2;
    },
  },
];

const powell: Problem = {
  name: "Powell singular",
  start: [3, -1, 0, 1],
  minimum: [0, 0, 0, 0],
  f: (x, g) => {
    const [a, b, c, d] = [x[0], x[1], x[2], x[3]];
    const f1 = a + 10 * b;
    const f2 = Math.sqrt(5) * (c - d);
    const f3 = (b - 2 * c) ** 2;
    const f4 = Math.sqrt(10) * (a - d) ** 2;
    if (g) {
      g[0] = 2 * f1 + 2 * f4 * Math.sqrt(10) * 2 * (a - d);
      g[1] = 20 * f1 + 2 * f3 * 2 * (b - 2 * c);
      g[2] = 2 * f2 * Math.sqrt(5) + 2 * f3 * -4 * (b - 2 * c);
      g[3] = -2 * f2 * Math.sqrt(5) - 2 * f4 * Math.sqrt(10) * 2 * (a - d);
    }
    return f1 * f1 + f2 * f2 + f3 * f3 + f4 * f4;
  },
};

describe("L-BFGS", () => {
  it.each(problems)("finds the published minimum of $name", (problem) => {
    const result = minimizeLbfgs((x, g) => problem.f(x, g), Float64Array.from(problem.start), { gradientTolerance: 1e-9 });
    expect(result.converged).toBe(true);
    expect(result.value).toBeLessThan(1e-12);
    problem.minimum.forEach((m, i) => expect(result.x[i]).toBeCloseTo(m, 5));
  });

  it("reaches the singular minimum of Powell's function (slowly convergent: only the value is tight)", () => {
    const result = minimizeLbfgs((x, g) => powell.f(x, g), Float64Array.from(powell.start), { gradientTolerance: 1e-12 });
    expect(result.value).toBeLessThan(1e-10);
    powell.minimum.forEach((m, i) => expect(Math.abs(result.x[i] - m)).toBeLessThan(1e-2));
  });

  it("shortens steps into regions where the objective is infinite", () => {
    // f = x - ln x has its minimum at x = 1 and is +Infinity for x <= 0 (as -ln p outside a support).
    const result = minimizeLbfgs(
      (x, g) => {
        const v = x[0];
        g[0] = 1 - 1 / v;
        return v > 0 ? v - Math.log(v) : Infinity;
      },
      Float64Array.of(8),
    );
    expect(result.x[0]).toBeCloseTo(1, 6);
  });
});

describe("Nelder-Mead", () => {
  it.each(problems)("finds the published minimum of $name", (problem) => {
    const result = minimizeNelderMead((x) => problem.f(x), Float64Array.from(problem.start), {
      maxEvaluations: 20000,
      sizeTolerance: 1e-10,
      valueTolerance: 1e-14,
    });
    expect(result.converged).toBe(true);
    problem.minimum.forEach((m, i) => expect(result.x[i]).toBeCloseTo(m, 4));
  });
});

describe("maximum a posteriori from several starts", () => {
  it("keeps the highest of two local maxima of a two-mode density", () => {
    // ln p = ln(0.3 N(x; -2, 0.5) + 0.7 N(x; 3, 0.5)): the global maximum is the mode near 3.
    const logPosterior = (x: Float64Array): number => {
      const a = 0.3 * Math.exp(-0.5 * ((x[0] + 2) / 0.5) ** 2);
      const b = 0.7 * Math.exp(-0.5 * ((x[0] - 3) / 0.5) ** 2);
      return Math.log(a + b);
    };
    const target = { dimension: 1, logPosterior };
    const result = findMaximumPosterior(target, { starts: [Float64Array.of(-2.5), Float64Array.of(2)] });
    expect(result.method).toBe("nelder-mead");
    expect(result.x[0]).toBeCloseTo(3, 4);
    expect(result.runs).toHaveLength(2);
    expect(result.runs[1].x[0]).toBeCloseTo(-2, 3);
  });
});
