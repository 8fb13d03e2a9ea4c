import { ExponentialTransition } from "../linalg/exponential-transition.js";
import { solveLyapunov } from "../linalg/lyapunov.js";
import { OscillatorTransition } from "../linalg/oscillator-transition.js";
import { formAutocovariance, type SemiseparableForm } from "../linalg/semiseparable-form.js";
import type { TransitionBlock } from "../linalg/transition-block.js";
import { Kernel } from "./kernel.js";
import { STANDARD_DEVIATION, type KernelFamily } from "./kernel-family.js";
import { requirePositive } from "./parameter-checks.js";

/** One damped oscillation of a CARMA process: a quadratic factor s^2 + (w0/Q) s + w0^2 of its AR polynomial. */
export interface CarmaOscillation {
  /** Undamped period 2 pi / w0, input time unit. */
  readonly period: number;
  /** Quality factor Q > 0, not 1/2 (a repeated root). */
  readonly quality: number;
}

/** Parameters of a CARMA(p, q) process. */
export interface CarmaParameters {
  /** Standard deviation of the process, sqrt(k(0)). */
  readonly sigma: number;
  /** Quadratic factors of the autoregressive polynomial (two roots each). */
  readonly oscillations?: readonly CarmaOscillation[];
  /** Real roots -1/tau of the autoregressive polynomial: relaxation timescales, input time unit. */
  readonly timescales?: readonly number[];
  /** Moving-average coefficients b_1 ... b_q of b(s) = 1 + b_1 s + ... + b_q s^q, with q < p. */
  readonly movingAverage?: readonly number[];
}

/**
 * A continuous-time autoregressive moving-average process CARMA(p, q) (Kelly et al. 2014, ApJ 788, 33):
 * a(D) y = b(D) eps with a(s) = prod (s - r_k) of degree p and b(s) = 1 + b_1 s + ... + b_q s^q, q < p. Its
 * PSD is proportional to |b(i omega)|^2 / |a(i omega)|^2.
 *
 * The AR polynomial is given by its factors: quadratic factors in (period, quality) and real roots in
 * timescales. Every admissible parameter set has all roots in the left half-plane, so only stationary
 * processes can be expressed. The process is normalised so that k(0) = sigma^2.
 *
 * State-space form: partial fractions b(s)/a(s) = sum rho_k / (s - r_k) drive one oscillator block per
 * quadratic factor and one exponential block per real root from a common noise input L; the stationary
 * covariance P solves F P + P F^T + L L^T = 0. R = p components. The transitions' parameter derivatives
 * are exact; those of q = P p (an O(p^6) function of the parameters, independent of the data) are
 * computed by Richardson-extrapolated central differences, accurate to about 1e-10 relative (exact for
 * sigma, q being proportional to sigma^2), on first use only.
 *
 * Parameter names: sigma, period<k>, quality<k> per oscillation, tau<k> per timescale, ma<j> per MA coefficient.
 *
 * @example const k = kernels.carma({ sigma: 0.1, oscillations: [{ period: 50, quality: 2 }], timescales: [400], movingAverage: [3] });
 */
export class CarmaKernel extends Kernel {
  readonly parameterNames: readonly string[];
  readonly sigma: number;
  readonly oscillations: readonly CarmaOscillation[];
  readonly timescales: readonly number[];
  readonly movingAverage: readonly number[];
  private cachedForm?: SemiseparableForm;

  constructor({ sigma, oscillations = [], timescales = [], movingAverage = [] }: CarmaParameters) {
    super();
    this.sigma = requirePositive("carma", "sigma", sigma);
    oscillations.forEach((o, k) => {
      requirePositive("carma", `period${k}`, o.period);
      requirePositive("carma", `quality${k}`, o.quality);
    });
    timescales.forEach((tau, k) => requirePositive("carma", `tau${k}`, tau));
    movingAverage.forEach((b, j) => {
      if (!Number.isFinite(b)) throw new RangeError(`carma: ma${j + 1} must be finite, got ${b}`);
    });
    const order = 2 * oscillations.length + timescales.length;
    if (order < 1) throw new RangeError("carma: at least one oscillation or timescale is required");
    if (movingAverage.length >= order)
      throw new RangeError(`carma: the moving-average order (${movingAverage.length}) must be below the autoregressive order (${order})`);
    this.oscillations = oscillations.map((o) => ({ ...o }));
    this.timescales = [...timescales];
    this.movingAverage = [...movingAverage];
    this.parameterNames = [
      "sigma",
      ...this.oscillations.flatMap((_, k) => [`period${k}`, `quality${k}`]),
      ...this.timescales.map((_, k) => `tau${k}`),
      ...this.movingAverage.map((_, j) => `ma${j + 1}`),
    ];
    carmaRoots(this.oscillations, this.timescales); // validates distinct roots
  }

  get parameterValues(): Float64Array {
    return Float64Array.from([
      this.sigma,
      ...this.oscillations.flatMap((o) => [o.period, o.quality]),
      ...this.timescales,
      ...this.movingAverage,
    ]);
  }

  withParameters(values: ArrayLike<number>): CarmaKernel {
    const v = Array.from(values);
    let i = 1;
    const oscillations = this.oscillations.map(() => ({ period: v[i++], quality: v[i++] }));
    const timescales = this.timescales.map(() => v[i++]);
    const movingAverage = this.movingAverage.map(() => v[i++]);
    return new CarmaKernel({ sigma: v[0], oscillations, timescales, movingAverage });
  }

  covarianceAt(lag: number): number {
    return formAutocovariance(this.semiseparableForm(), lag);
  }

  /**
   * S(omega) = N |b(i omega)|^2 / |a(i omega)|^2 (Kelly et al. 2014, eq. 2), with N = sigma^2 / v and v the
   * variance of the process driven by unit white noise. Evaluating the rational function directly avoids
   * the cancellation that the partial-fraction sum suffers far above the highest root.
   */
  spectralDensityAt(omega: number): number {
    const roots = carmaRoots(this.oscillations, this.timescales);
    let numerator = { re: 0, im: 0 };
    let power = { re: 1, im: 0 };
    for (const b of [1, ...this.movingAverage]) {
      numerator = add(numerator, scale(power, b));
      power = mul(power, { re: 0, im: omega });
    }
    let denominator = { re: 1, im: 0 };
    for (const root of roots) denominator = mul(denominator, { re: -root.re, im: omega - root.im });
    const magnitude = (z: Complex) => z.re * z.re + z.im * z.im;
    return (this.noiseDensity() * magnitude(numerator)) / magnitude(denominator);
  }

  /** N: the driving-noise spectral density that gives k(0) = sigma^2. */
  private noiseDensity(): number {
    this.semiseparableForm();
    return this.drivingDensity!;
  }

  private drivingDensity?: number;

  semiseparableForm(): SemiseparableForm {
    if (this.cachedForm) return this.cachedForm;
    const count = this.parameterNames.length;
    const blocks: TransitionBlock[] = [];
    const observation: number[] = [];
    this.oscillations.forEach((o, k) => {
      const w0 = (2 * Math.PI) / o.period;
      blocks.push(
        new OscillatorTransition(w0, o.quality, [
          { index: 1 + 2 * k, derivatives: [-w0 / o.period, 0] },
          { index: 2 + 2 * k, derivatives: [0, 1] },
        ]),
      );
      observation.push(1, 0);
    });
    const tauStart = 1 + 2 * this.oscillations.length;
    this.timescales.forEach((tau, k) => {
      blocks.push(new ExponentialTransition(1 / tau, [{ index: tauStart + k, derivatives: [-1 / (tau * tau)] }]));
      observation.push(1);
    });
    const projection = this.projection(this.parameterValues);
    const r = observation.length;
    const base = this.parameterValues;
    let projectionGradient: Float64Array | undefined;
    // The projection's derivatives cost 4 (count - 1) Lyapunov solves where the value costs one: formed on
    // first use (a gradient), so that value-only evaluations (importance draws, evidence) do not pay them.
    const gradientOfProjection = (): Float64Array => {
      if (projectionGradient) return projectionGradient;
      const gradient = new Float64Array(count * r);
      // q is proportional to sigma^2: dq / dsigma = 2 q / sigma exactly.
      for (let i = 0; i < r; i++) gradient[i] = (2 * projection[i]) / this.sigma;
      for (let c = 1; c < count; c++) {
        const derivative = richardsonDerivative((x) => {
          const shifted = Float64Array.from(base);
          shifted[c] = x;
          return this.withParameters(shifted).projection(shifted);
        }, base[c]);
        gradient.set(derivative, c * r);
      }
      return (projectionGradient = gradient);
    };
    this.cachedForm = {
      blocks,
      observation: Float64Array.from(observation),
      projection,
      parameterCount: count,
      observationGradient: new Float64Array(count * r),
      get projectionGradient() {
        return gradientOfProjection();
      },
    };
    return this.cachedForm;
  }

  /** q = P p, normalised so that p^T q = sigma^2. */
  private projection(values: Float64Array): Float64Array {
    const roots = carmaRoots(this.oscillations, this.timescales);
    const order = roots.length;
    const residues = roots.map((root) => {
      let numerator = { re: 1, im: 0 };
      let power = { re: 1, im: 0 };
      for (const b of this.movingAverage) {
        power = mul(power, root);
        numerator = add(numerator, scale(power, b));
      }
      let derivative = { re: 1, im: 0 };
      for (const other of roots) if (other !== root) derivative = mul(derivative, sub(root, other));
      return div(numerator, derivative);
    });
    // Noise input per block, and the block-diagonal drift.
    const input: number[] = [];
    const generator = new Float64Array(order * order);
    let offset = 0;
    this.oscillations.forEach((o, k) => {
      const w0 = (2 * Math.PI) / o.period;
      const [r1, r2] = [roots[2 * k], roots[2 * k + 1]];
      const [rho1, rho2] = [residues[2 * k], residues[2 * k + 1]];
      const beta = add(rho1, rho2).re;
      const gamma = -add(mul(rho1, r2), mul(rho2, r1)).re;
      input.push(beta, (gamma - (w0 / o.quality) * beta) / w0);
      generator[offset * order + offset + 1] = w0;
      generator[(offset + 1) * order + offset] = -w0;
      generator[(offset + 1) * order + offset + 1] = -w0 / o.quality;
      offset += 2;
    });
    this.timescales.forEach((tau, k) => {
      input.push(residues[2 * this.oscillations.length + k].re);
      generator[offset * order + offset] = -1 / tau;
      offset += 1;
    });
    const forcing = new Float64Array(order * order);
    for (let i = 0; i < order; i++) for (let j = 0; j < order; j++) forcing[i * order + j] = input[i] * input[j];
    const covariance = solveLyapunov(generator, forcing, order);
    const observation: number[] = [];
    this.oscillations.forEach(() => observation.push(1, 0));
    this.timescales.forEach(() => observation.push(1));
    const q = new Float64Array(order);
    for (let i = 0; i < order; i++) for (let j = 0; j < order; j++) q[i] += covariance[i * order + j] * observation[j];
    let variance = 0;
    for (let i = 0; i < order; i++) variance += observation[i] * q[i];
    const factor = (values[0] * values[0]) / variance;
    for (let i = 0; i < order; i++) q[i] *= factor;
    this.drivingDensity = factor;
    return q;
  }
}

interface Complex {
  re: number;
  im: number;
}
const add = (a: Complex, b: Complex): Complex => ({ re: a.re + b.re, im: a.im + b.im });
const sub = (a: Complex, b: Complex): Complex => ({ re: a.re - b.re, im: a.im - b.im });
const mul = (a: Complex, b: Complex): Complex => ({ re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re });
const scale = (a: Complex, s: number): Complex => ({ re: a.re * s, im: a.im * s });
const div = (a: Complex, b: Complex): Complex => {
  const d = b.re * b.re + b.im * b.im;
  return { re: (a.re * b.re + a.im * b.im) / d, im: (a.im * b.re - a.re * b.im) / d };
};

/**
 * Two autoregressive roots coincide (to 1e-6 of the largest): the partial-fraction state-space form does
 * not exist there (a repeated root needs a Jordan block). A RangeError; the models layer counts such a
 * point as impossible (a set of zero prior mass), as it does a covariance that cannot be factorised.
 */
export class CoincidentRootsError extends RangeError {
  constructor() {
    super("carma: two autoregressive roots coincide (a quality of 1/2 or repeated timescales); perturb them");
    this.name = "CoincidentRootsError";
  }
}

/** The AR roots: -c +/- sqrt(c^2 - w0^2) per oscillation, -1/tau per timescale; throws a {@link CoincidentRootsError} when two coincide. */
export function carmaRoots(oscillations: readonly CarmaOscillation[], timescales: readonly number[]): Complex[] {
  const roots: Complex[] = [];
  for (const o of oscillations) {
    const w0 = (2 * Math.PI) / o.period;
    const c = w0 / (2 * o.quality);
    const lambda = c * c - w0 * w0;
    if (lambda < 0) {
      const w = Math.sqrt(-lambda);
      roots.push({ re: -c, im: w }, { re: -c, im: -w });
    } else {
      const e = Math.sqrt(lambda);
      roots.push({ re: -(w0 * w0) / (c + e), im: 0 }, { re: -(c + e), im: 0 });
    }
  }
  for (const tau of timescales) roots.push({ re: -1 / tau, im: 0 });
  let largest = 0;
  for (const r of roots) largest = Math.max(largest, Math.hypot(r.re, r.im));
  for (let i = 0; i < roots.length; i++)
    for (let j = i + 1; j < roots.length; j++)
      if (Math.hypot(roots[i].re - roots[j].re, roots[i].im - roots[j].im) < 1e-6 * largest)
        throw new CoincidentRootsError();
  return roots;
}

/**
 * Richardson-extrapolated central difference of a vector function: (4 D(h/2) - D(h)) / 3, error O(h^4).
 * Where a step lands on coincident roots (x itself is admissible, x +- h is not), the step shrinks
 * eightfold, up to four times: the derivative is local and the excluded set has zero width.
 */
function richardsonDerivative(f: (x: number) => Float64Array, x: number): Float64Array {
  let h = 1e-3 * Math.max(Math.abs(x), 1e-3);
  for (let attempt = 0; ; attempt++) {
    try {
      return richardsonAtStep(f, x, h);
    } catch (error) {
      if (!(error instanceof CoincidentRootsError) || attempt === 4) throw error;
      h /= 8;
    }
  }
}

function richardsonAtStep(f: (x: number) => Float64Array, x: number, h: number): Float64Array {
  const central = (step: number) => {
    const up = f(x + step);
    const down = f(x - step);
    return up.map((u, i) => (u - down[i]) / (2 * step));
  };
  const coarse = central(h);
  const fine = central(h / 2);
  return fine.map((v, i) => (4 * v - coarse[i]) / 3);
}

/** The indices k of the names `<prefix><k>` among `names`, ascending. */
function indicesOf(names: readonly string[], prefix: string): number[] {
  const pattern = new RegExp(`^${prefix}\\d+$`);
  return names.filter((name) => pattern.test(name)).map((name) => Number(name.slice(prefix.length))).sort((a, b) => a - b);
}

/**
 * The CARMA descriptor: `kernels.carma`, and in kernel expressions
 * `carma(sigma=..,period0=..,quality0=..,tau0=..,ma1=..)`, the oscillations, timescales and moving-average
 * coefficients numbered in any order (they are taken in ascending order of their index).
 */
export const carmaFamily: KernelFamily<"carma", CarmaParameters, never> = {
  name: "carma",
  expressionName: "carma",
  summary: "CARMA(p, q) (Kelly et al. 2014), stationary by construction: spectra with several breaks or bumps",
  parameters: [
    STANDARD_DEVIATION,
    { name: "period<k>", kind: "period", description: "undamped period of oscillation k" },
    { name: "quality<k>", kind: "quality", description: "quality factor of oscillation k" },
    { name: "tau<k>", kind: "timescale", description: "relaxation timescale k" },
    { name: "ma<j>", kind: "coefficient", description: "moving-average coefficient b_j" },
  ],
  create: (parameters) => new CarmaKernel(parameters),
  fromExpression: (values) => {
    const names = Object.keys(values);
    return new CarmaKernel({
      sigma: values.sigma,
      oscillations: indicesOf(names, "period").map((k) => ({ period: values[`period${k}`], quality: values[`quality${k}`] })),
      timescales: indicesOf(names, "tau").map((k) => values[`tau${k}`]),
      movingAverage: indicesOf(names, "ma").map((j) => values[`ma${j}`]),
    });
  },
};
