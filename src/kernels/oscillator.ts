import { dampedHyperbolicPair, OscillatorTransition } from "../linalg/oscillator-transition.js";
import type { SemiseparableForm } from "../linalg/semiseparable-form.js";
import { Kernel } from "./kernel.js";
import { fixedParameterFamily, STANDARD_DEVIATION } from "./kernel-family.js";
import { requirePositive } from "./parameter-checks.js";

/** Parameters of the stochastically driven damped harmonic oscillator. */
export interface OscillatorParameters {
  /** Standard deviation, sqrt(k(0)), in the unit of the data. */
  readonly sigma: number;
  /** Undamped period 2 pi / w0, in the input time unit. */
  readonly period: number;
  /** Quality factor Q > 0 (Q = 1/2 is critical damping). */
  readonly quality: number;
}

/**
 * The stochastically driven damped harmonic oscillator (Anderson et al. 1990, ApJ 364, 699; Foreman-Mackey
 * et al. 2017, AJ 154, 220), with w0 = 2 pi / period and Q = quality. For Q > 1/2, eta = sqrt(1 - 1/(4Q^2)):
 *
 *     k(t) = sigma^2 exp(-w0 t / 2Q) [cos(eta w0 t) + sin(eta w0 t) / (2 eta Q)],
 *
 * with cosh / sinh and eta = sqrt(1/(4Q^2) - 1) for Q < 1/2, and sigma^2 exp(-w0 t)(1 + w0 t) at Q = 1/2.
 * The two-sided spectrum is S(omega) = 2 sigma^2 w0^3 / Q / ((omega^2 - w0^2)^2 + w0^2 omega^2 / Q^2), which
 * peaks near w0 at S(w0) = 2 sigma^2 Q / w0. Every regime, including Q within 1e-8 of 1/2, is evaluated with
 * the series-safe functions of `OscillatorTransition`. Two semiseparable components (R = 2).
 *
 * @example const k = kernels.oscillator({ sigma: 0.01, period: 0.3, quality: 20 });
 */
export class OscillatorKernel extends Kernel {
  readonly parameterNames = ["sigma", "period", "quality"] as const;
  readonly sigma: number;
  readonly period: number;
  readonly quality: number;

  constructor({ sigma, period, quality }: OscillatorParameters) {
    super();
    this.sigma = requirePositive("oscillator", "sigma", sigma);
    this.period = requirePositive("oscillator", "period", period);
    this.quality = requirePositive("oscillator", "quality", quality);
  }

  get parameterValues(): Float64Array {
    return Float64Array.of(this.sigma, this.period, this.quality);
  }

  withParameters(values: ArrayLike<number>): OscillatorKernel {
    return new OscillatorKernel({ sigma: values[0], period: values[1], quality: values[2] });
  }

  /** The undamped angular frequency w0 = 2 pi / period. */
  get angularFrequency(): number {
    return (2 * Math.PI) / this.period;
  }

  covarianceAt(lag: number): number {
    return this.sigma * this.sigma * oscillatorCorrelation(this.angularFrequency, this.quality, Math.abs(lag));
  }

  spectralDensityAt(omega: number): number {
    return oscillatorSpectrum(this.sigma * this.sigma, this.angularFrequency, this.quality, omega);
  }

  semiseparableForm(): SemiseparableForm {
    const w0 = this.angularFrequency;
    const variance = this.sigma * this.sigma;
    return {
      blocks: [
        new OscillatorTransition(w0, this.quality, [
          { index: 1, derivatives: [-w0 / this.period, 0] },
          { index: 2, derivatives: [0, 1] },
        ]),
      ],
      observation: Float64Array.of(1, 0),
      projection: Float64Array.of(variance, 0),
      parameterCount: 3,
      observationGradient: new Float64Array(6),
      projectionGradient: Float64Array.of(2 * this.sigma, 0, 0, 0, 0, 0),
    };
  }
}

/** The oscillator's autocorrelation k(t) / k(0) at a lag t >= 0 (stable in every damping regime). */
export function oscillatorCorrelation(w0: number, quality: number, lag: number): number {
  const c = w0 / (2 * quality);
  const lambda = w0 * w0 * (1 / (4 * quality * quality) - 1);
  const out = new Float64Array(4);
  dampedHyperbolicPair(c, lambda, w0, lag, out);
  return out[0] + c * out[1];
}

/** Two-sided PSD of an oscillator with variance `variance`: 2 var w0^3 / Q / ((w^2 - w0^2)^2 + w0^2 w^2 / Q^2). */
export function oscillatorSpectrum(variance: number, w0: number, quality: number, omega: number): number {
  const d = omega * omega - w0 * w0;
  return (2 * variance * w0 * w0 * w0) / quality / (d * d + (w0 * w0 * omega * omega) / (quality * quality));
}

/** The oscillator's descriptor: `kernels.oscillator`, `oscillator(sigma=..,period=..,quality=..)`, the `oscillator` model. */
export const oscillatorFamily = fixedParameterFamily({
  name: "oscillator",
  expressionName: "oscillator",
  summary: "stochastically driven damped harmonic oscillator: one damped mode, pulsations, or (Q < 1/2) smooth noise",
  kernel: OscillatorKernel,
  parameters: [
    STANDARD_DEVIATION,
    { name: "period", kind: "period", description: "undamped period 2 pi / w0" },
    { name: "quality", kind: "quality", description: "quality factor Q" },
  ],
  model: { name: "oscillator", periodCycles: 1, purpose: "damped oscillation" },
});
