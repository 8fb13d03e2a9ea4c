import { OscillatorTransition } from "../linalg/oscillator-transition.js";
import type { SemiseparableForm } from "../linalg/semiseparable-form.js";
import type { ParameterDependence } from "../linalg/transition-block.js";
import { Kernel } from "./kernel.js";
import { fixedParameterFamily, STANDARD_DEVIATION } from "./kernel-family.js";
import { requirePositive, requireWithin } from "./parameter-checks.js";

/** Parameters of the quasi-periodic (rotation) kernel. */
export interface QuasiPeriodicParameters {
  /** Standard deviation, sqrt(k(0)), in the unit of the data. */
  readonly sigma: number;
  /** Period at which the autocorrelation oscillates (for a spotted star, the rotation period), input time unit. */
  readonly period: number;
  /** Coherence time: the e-folding time of the autocorrelation's envelope (spot evolution), input time unit. */
  readonly decayTime: number;
  /** Fraction of the variance in the first harmonic (period / 2), in [0, 1]. */
  readonly harmonicWeight: number;
}

/**
 * A quasi-periodic kernel for rotational modulation: a spot pattern that repeats every `period` while it
 * evolves on `decayTime`. With a = 1 / decayTime and
 *
 *     c(w, t) = cos(w t) + sin(w |t|) / (w decayTime),
 *     k(t) = sigma^2 exp(-|t| / decayTime) [(1 - harmonicWeight) c(2 pi / period, t) + harmonicWeight c(4 pi / period, t)],
 *
 * the fundamental and its first harmonic share one envelope (the whole pattern decorrelates as the spots
 * evolve), so the autocorrelation oscillates at exactly `period` and decayTime is the coherence time.
 *
 * Each term exp(-a|t|) c(w, t) is the autocovariance of a stochastically driven damped harmonic oscillator
 * (Anderson et al. 1990, ApJ 364, 699) with damping rate w0 / (2Q) = a and damped frequency
 * eta w0 = w, i.e. w0 = sqrt(w^2 + a^2) and Q = w0 / (2a) = sqrt((w decayTime)^2 + 1) / 2 > 1/2: it is
 * positive definite for every w, decayTime > 0, and its state-space form is an oscillator block. Four
 * semiseparable components (R = 4), two complex pairs. Its spectrum is the oscillators' (see
 * `dampedOscillationSpectrum`).
 *
 * @example const k = kernels.quasiPeriodic({ sigma: 0.02, period: 11.3, decayTime: 30, harmonicWeight: 0.3 });
 */
export class QuasiPeriodicKernel extends Kernel {
  readonly parameterNames = ["sigma", "period", "decayTime", "harmonicWeight"] as const;
  readonly sigma: number;
  readonly period: number;
  readonly decayTime: number;
  readonly harmonicWeight: number;

  constructor({ sigma, period, decayTime, harmonicWeight }: QuasiPeriodicParameters) {
    super();
    this.sigma = requirePositive("quasiPeriodic", "sigma", sigma);
    this.period = requirePositive("quasiPeriodic", "period", period);
    this.decayTime = requirePositive("quasiPeriodic", "decayTime", decayTime);
    this.harmonicWeight = requireWithin("quasiPeriodic", "harmonicWeight", harmonicWeight, 0, 1);
  }

  get parameterValues(): Float64Array {
    return Float64Array.of(this.sigma, this.period, this.decayTime, this.harmonicWeight);
  }

  withParameters(values: ArrayLike<number>): QuasiPeriodicKernel {
    return new QuasiPeriodicKernel({
      sigma: values[0],
      period: values[1],
      decayTime: values[2],
      harmonicWeight: values[3],
    });
  }

  /** Angular frequency of the fundamental, 2 pi / period (rad per time unit). */
  get angularFrequency(): number {
    return (2 * Math.PI) / this.period;
  }

  covarianceAt(lag: number): number {
    const t = Math.abs(lag);
    const w = this.angularFrequency;
    const h = this.harmonicWeight;
    const d = this.decayTime;
    const oscillation = (1 - h) * dampedOscillation(w, d, t) + h * dampedOscillation(2 * w, d, t);
    return this.sigma * this.sigma * Math.exp(-t / d) * oscillation;
  }

  spectralDensityAt(omega: number): number {
    const w = this.angularFrequency;
    const h = this.harmonicWeight;
    const rate = 1 / this.decayTime;
    const variance = this.sigma * this.sigma;
    return (
      dampedOscillationSpectrum(variance * (1 - h), w, rate, omega) +
      dampedOscillationSpectrum(variance * h, 2 * w, rate, omega)
    );
  }

  semiseparableForm(): SemiseparableForm {
    const w = this.angularFrequency;
    const variance = this.sigma * this.sigma;
    const h = this.harmonicWeight;
    const s2 = 2 * this.sigma;
    return {
      blocks: [
        dampedOscillationBlock(w, this.period, this.decayTime),
        dampedOscillationBlock(2 * w, this.period, this.decayTime),
      ],
      observation: Float64Array.of(1, 0, 1, 0),
      projection: Float64Array.of(variance * (1 - h), 0, variance * h, 0),
      parameterCount: 4,
      observationGradient: new Float64Array(16),
      // rows: sigma, period, decayTime (p and q do not depend on it), harmonicWeight
      projectionGradient: Float64Array.of(s2 * (1 - h), 0, s2 * h, 0, 0, 0, 0, 0, 0, 0, 0, 0, -variance, 0, variance, 0),
    };
  }
}

/** The bracket c(w, t) = cos(w t) + sin(w t) / (w decayTime) at a lag t >= 0 (the envelope left out). */
function dampedOscillation(w: number, decayTime: number, t: number): number {
  return Math.cos(w * t) + Math.sin(w * t) / (w * decayTime);
}

/**
 * The oscillator block of one term exp(-a t) c(w, t), a = 1 / decayTime, w = m 2 pi / period: undamped
 * frequency w0 = sqrt(w^2 + a^2) and quality Q = w0 decayTime / 2, so that w0 / (2Q) = a and the damped
 * frequency w0 sqrt(1 - 1/(4Q^2)) = w. Kernel parameters 1 (period) and 2 (decayTime) move (w0, Q) by
 *
 *     dw0/dP = -w^2 / (w0 P),  dQ/dP = (decayTime / 2) dw0/dP   (w = m 2 pi / P, so dw/dP = -w / P);
 *     dw0/dd = -a^3 / w0,      dQ/dd = w0 / 2 + (d / 2) dw0/dd = w^2 / (2 w0).
 */
function dampedOscillationBlock(w: number, period: number, decayTime: number): OscillatorTransition {
  const a = 1 / decayTime;
  const w0 = Math.sqrt(w * w + a * a);
  const quality = (w0 * decayTime) / 2;
  const dw0dP = -(w * w) / (w0 * period);
  const dependencies: ParameterDependence[] = [
    { index: 1, derivatives: [dw0dP, (decayTime / 2) * dw0dP] },
    { index: 2, derivatives: [-(a * a * a) / w0, (w * w) / (2 * w0)] },
  ];
  return new OscillatorTransition(w0, quality, dependencies);
}

/**
 * Two-sided PSD of variance * exp(-a|t|) [cos(w t) + (a / w) sin(w |t|)]:
 *
 *     S(omega) = 4 variance a (a^2 + w^2) / ([a^2 + (omega - w)^2] [a^2 + (omega + w)^2]).
 *
 * Derived from the Fourier pairs exp(-a|t|) cos(w t) -> a / (a^2 + (omega -/+ w)^2) (summed over both
 * signs) and exp(-a|t|) sin(w|t|) -> (w -/+ omega) / (a^2 + (w -/+ omega)^2) (summed). The denominator equals
 * (omega^2 - w0^2)^2 + 4 a^2 omega^2 with w0^2 = w^2 + a^2, so this is the oscillator spectrum
 * 2 variance w0^3 / Q / ((omega^2 - w0^2)^2 + w0^2 omega^2 / Q^2) of Anderson et al. 1990 (ApJ 364, 699)
 * at Q = w0 / (2a); the factored form avoids the cancellation in omega^2 - w0^2 near the peak.
 */
export function dampedOscillationSpectrum(variance: number, w: number, a: number, omega: number): number {
  const below = omega - w;
  const above = omega + w;
  return (4 * variance * a * (a * a + w * w)) / ((a * a + below * below) * (a * a + above * above));
}

/**
 * The quasi-periodic kernel's descriptor: `kernels.quasiPeriodic`,
 * `quasi-periodic(sigma=..,period=..,decayTime=..,harmonicWeight=..)`, the `quasi-periodic` model (whose
 * period must repeat at least twice within the baseline).
 */
export const quasiPeriodicFamily = fixedParameterFamily({
  name: "quasiPeriodic",
  expressionName: "quasi-periodic",
  summary: "damped oscillations at period and period / 2 sharing one decay time: rotation of a spotted star",
  kernel: QuasiPeriodicKernel,
  parameters: [
    STANDARD_DEVIATION,
    { name: "period", kind: "period", description: "period of the autocorrelation (rotation period)" },
    { name: "decayTime", kind: "coherence", description: "decay (coherence) time of the pattern" },
    { name: "harmonicWeight", kind: "fraction", description: "fraction of the variance at period / 2" },
  ],
  model: { name: "quasi-periodic", periodCycles: 2, purpose: "stellar rotation" },
});
