import type { SemiseparableForm } from "../linalg/semiseparable-form.js";
import { Kernel } from "./kernel.js";
import { fixedParameterFamily, STANDARD_DEVIATION } from "./kernel-family.js";
import { logGamma } from "../numerics/log-gamma.js";
import { requirePositive } from "./parameter-checks.js";

/** Parameters of the squared-exponential times periodic kernel. */
export interface PeriodicSquaredExponentialParameters {
  /** Standard deviation, sqrt(k(0)). */
  readonly sigma: number;
  /** Period of the periodic factor, input time unit. */
  readonly period: number;
  /** Decay scale of the squared-exponential envelope (spot lifetime), input time unit. */
  readonly scale: number;
  /** Inverse squared length scale of the periodic factor (harmonic complexity), > 0. */
  readonly gamma: number;
}

/**
 * The classic quasi-periodic covariance for rotation, a squared exponential times a periodic
 * (exp-sine-squared) kernel (Rasmussen & Williams 2006, eqs. 4.9 and 4.31):
 *
 *     k(t) = sigma^2 exp(-t^2 / (2 scale^2) - gamma sin^2(pi t / period)).
 *
 * It has no semiseparable form, so it runs only on the dense O(N^3) engine (`DenseGaussianProcess`); it is
 * here for small data and as a reference. Its spectrum follows from exp(z cos x) = I0(z) + 2 sum I_n(z) cos(n x)
 * (Abramowitz & Stegun 9.6.34): a comb of Gaussians at multiples of 2 pi / period weighted by e^{-z} I_n(z),
 * z = gamma / 2.
 */
export class PeriodicSquaredExponentialKernel extends Kernel {
  readonly parameterNames = ["sigma", "period", "scale", "gamma"] as const;
  readonly sigma: number;
  readonly period: number;
  readonly scale: number;
  readonly gamma: number;

  constructor({ sigma, period, scale, gamma }: PeriodicSquaredExponentialParameters) {
    super();
    this.sigma = requirePositive("periodicSquaredExponential", "sigma", sigma);
    this.period = requirePositive("periodicSquaredExponential", "period", period);
    this.scale = requirePositive("periodicSquaredExponential", "scale", scale);
    this.gamma = requirePositive("periodicSquaredExponential", "gamma", gamma);
  }

  get parameterValues(): Float64Array {
    return Float64Array.of(this.sigma, this.period, this.scale, this.gamma);
  }

  withParameters(values: ArrayLike<number>): PeriodicSquaredExponentialKernel {
    return new PeriodicSquaredExponentialKernel({
      sigma: values[0],
      period: values[1],
      scale: values[2],
      gamma: values[3],
    });
  }

  covarianceAt(lag: number): number {
    const s = Math.sin((Math.PI * lag) / this.period);
    return this.sigma * this.sigma * Math.exp((-lag * lag) / (2 * this.scale * this.scale) - this.gamma * s * s);
  }

  spectralDensityAt(omega: number): number {
    const spacing = (2 * Math.PI) / this.period;
    const l = this.scale;
    const gaussian = (w: number) => l * Math.sqrt(2 * Math.PI) * Math.exp(-0.5 * w * w * l * l);
    const weights = this.harmonicWeights();
    let total = weights[0] * gaussian(omega);
    for (let n = 1; n < weights.length; n++) {
      total += weights[n] * (gaussian(omega - n * spacing) + gaussian(omega + n * spacing));
    }
    return this.sigma * this.sigma * total;
  }

  private weights?: Float64Array;

  /** e^{-z} I_n(z), z = gamma / 2, for n = 0, 1, ... until negligible (computed once). */
  private harmonicWeights(): Float64Array {
    if (!this.weights) {
      const z = this.gamma / 2;
      const values: number[] = [];
      for (let n = 0; n < 400; n++) {
        const weight = scaledBesselI(n, z);
        values.push(weight);
        if (n > z && weight < 1e-17) break;
      }
      this.weights = Float64Array.from(values);
    }
    return this.weights;
  }

  semiseparableForm(): SemiseparableForm | undefined {
    return undefined;
  }
}

/** e^{-z} I_n(z) from the power series I_n(z) = sum (z/2)^{2k+n} / (k! (k+n)!) (Abramowitz & Stegun 9.6.10). */
function scaledBesselI(n: number, z: number): number {
  const half = z / 2;
  let logTerm = n * Math.log(half) - logGamma(n + 1) - z;
  let total = 0;
  for (let k = 0; k < 500; k++) {
    const term = Math.exp(logTerm);
    total += term;
    if (k > half && term < 1e-18 * total) break;
    logTerm += 2 * Math.log(half) - Math.log(k + 1) - Math.log(k + 1 + n);
  }
  return total;
}


/** The periodicSquaredExponential descriptor: `kernels.periodicSquaredExponential` (dense engine only, so not in the CLI). */
export const periodicSquaredExponentialFamily = fixedParameterFamily({
  name: "periodicSquaredExponential",
  summary: "squared exponential times periodic: the dense-engine reference for rotation (O(N^3))",
  kernel: PeriodicSquaredExponentialKernel,
  parameters: [
    STANDARD_DEVIATION,
    { name: "period", kind: "period", description: "period" },
    { name: "scale", kind: "timescale", description: "length scale of the squared exponential" },
    { name: "gamma", kind: "shape", description: "sharpness of the periodic factor" },
  ],
});
