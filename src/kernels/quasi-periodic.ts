import { OscillatorTransition } from "../linalg/oscillator-transition.js";
import type { SemiseparableForm } from "../linalg/semiseparable-form.js";
import { Kernel } from "./kernel.js";
import { oscillatorCorrelation, oscillatorSpectrum } from "./oscillator.js";
import { requireAbove, requirePositive, requireWithin } from "./parameter-checks.js";

/** Parameters of the quasi-periodic (rotation) kernel. */
export interface QuasiPeriodicParameters {
  /** Standard deviation, sqrt(k(0)), in the unit of the data. */
  readonly sigma: number;
  /** Period of the autocorrelation's oscillation (for a spotted star, the rotation period), input time unit. */
  readonly period: number;
  /** Quality factor Q > 1/2 of both oscillators; the coherence time is about quality * period / pi. */
  readonly quality: number;
  /** Fraction of the variance in the first harmonic (period / 2), in [0, 1]. */
  readonly harmonicWeight: number;
}

/**
 * A quasi-periodic kernel for rotational modulation: two damped oscillators with the same Q > 1/2 whose
 * damped oscillation periods 2 pi / (eta w0) are exactly `period` and `period / 2`, carrying variances
 * sigma^2 (1 - harmonicWeight) and sigma^2 harmonicWeight. Spots that evolve while the star rotates give
 * an autocorrelation that oscillates at the rotation period and its first harmonic and decays on the
 * spot lifetime. Four semiseparable components (R = 4).
 *
 * @example const k = kernels.quasiPeriodic({ sigma: 0.02, period: 11.3, quality: 8, harmonicWeight: 0.3 });
 */
export class QuasiPeriodicKernel extends Kernel {
  readonly parameterNames = ["sigma", "period", "quality", "harmonicWeight"] as const;
  readonly sigma: number;
  readonly period: number;
  readonly quality: number;
  readonly harmonicWeight: number;

  constructor({ sigma, period, quality, harmonicWeight }: QuasiPeriodicParameters) {
    super();
    this.sigma = requirePositive("quasiPeriodic", "sigma", sigma);
    this.period = requirePositive("quasiPeriodic", "period", period);
    this.quality = requireAbove("quasiPeriodic", "quality", quality, 0.5);
    this.harmonicWeight = requireWithin("quasiPeriodic", "harmonicWeight", harmonicWeight, 0, 1);
  }

  get parameterValues(): Float64Array {
    return Float64Array.of(this.sigma, this.period, this.quality, this.harmonicWeight);
  }

  withParameters(values: ArrayLike<number>): QuasiPeriodicKernel {
    return new QuasiPeriodicKernel({
      sigma: values[0],
      period: values[1],
      quality: values[2],
      harmonicWeight: values[3],
    });
  }

  /** eta = sqrt(1 - 1/(4 Q^2)): the ratio of the damped to the undamped frequency. */
  private get eta(): number {
    return Math.sqrt(1 - 1 / (4 * this.quality * this.quality));
  }

  /** Undamped angular frequency of the fundamental, w0 = 2 pi / (period eta). */
  private get fundamental(): number {
    return (2 * Math.PI) / (this.period * this.eta);
  }

  covarianceAt(lag: number): number {
    const t = Math.abs(lag);
    const w = this.fundamental;
    const h = this.harmonicWeight;
    const variance = this.sigma * this.sigma;
    return (
      variance *
      ((1 - h) * oscillatorCorrelation(w, this.quality, t) + h * oscillatorCorrelation(2 * w, this.quality, t))
    );
  }

  spectralDensityAt(omega: number): number {
    const w = this.fundamental;
    const h = this.harmonicWeight;
    const variance = this.sigma * this.sigma;
    return (
      oscillatorSpectrum(variance * (1 - h), w, this.quality, omega) +
      oscillatorSpectrum(variance * h, 2 * w, this.quality, omega)
    );
  }

  semiseparableForm(): SemiseparableForm {
    const q = this.quality;
    const eta = this.eta;
    const w = this.fundamental;
    // dw/dQ = -w / eta * deta/dQ, deta/dQ = 1 / (4 Q^3 eta)
    const dwdQ = -w / (4 * q * q * q * eta * eta);
    const dwdP = -w / this.period;
    const variance = this.sigma * this.sigma;
    const h = this.harmonicWeight;
    const s2 = 2 * this.sigma;
    return {
      blocks: [
        new OscillatorTransition(w, q, [
          { index: 1, derivatives: [dwdP, 0] },
          { index: 2, derivatives: [dwdQ, 1] },
        ]),
        new OscillatorTransition(2 * w, q, [
          { index: 1, derivatives: [2 * dwdP, 0] },
          { index: 2, derivatives: [2 * dwdQ, 1] },
        ]),
      ],
      observation: Float64Array.of(1, 0, 1, 0),
      projection: Float64Array.of(variance * (1 - h), 0, variance * h, 0),
      parameterCount: 4,
      observationGradient: new Float64Array(16),
      // rows: sigma, period, quality, harmonicWeight
      projectionGradient: Float64Array.of(s2 * (1 - h), 0, s2 * h, 0, 0, 0, 0, 0, 0, 0, 0, 0, -variance, 0, variance, 0),
    };
  }
}
