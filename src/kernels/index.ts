import { CarmaKernel, type CarmaOscillation, type CarmaParameters } from "./carma.js";
import { DampedRandomWalkKernel, type DampedRandomWalkParameters } from "./damped-random-walk.js";
import { Matern32Kernel, type Matern32Parameters } from "./matern32.js";
import { OscillatorKernel, type OscillatorParameters } from "./oscillator.js";
import {
  PeriodicSquaredExponentialKernel,
  type PeriodicSquaredExponentialParameters,
} from "./periodic-squared-exponential.js";
import { QuasiPeriodicKernel, type QuasiPeriodicParameters } from "./quasi-periodic.js";

export { Kernel, SumKernel, ProductKernel, autocovarianceFromForm } from "./kernel.js";
export { CarmaKernel, DampedRandomWalkKernel, Matern32Kernel, OscillatorKernel, PeriodicSquaredExponentialKernel, QuasiPeriodicKernel };
export type {
  CarmaOscillation,
  CarmaParameters,
  DampedRandomWalkParameters,
  Matern32Parameters,
  OscillatorParameters,
  PeriodicSquaredExponentialParameters,
  QuasiPeriodicParameters,
};

/**
 * The kernel families in physical parameters. Every family rejects invalid parameters with a RangeError
 * naming the parameter and value.
 *
 * @example
 * const rotation = kernels.quasiPeriodic({ sigma: 0.02, period: 11.3, decayTime: 30, harmonicWeight: 0.3 });
 * const trend = kernels.dampedRandomWalk({ sigma: 0.05, tau: 400 });
 * const k = rotation.plus(trend);
 */
export const kernels = {
  /** sigma^2 exp(-|t| / tau): quasar variability. */
  dampedRandomWalk: (parameters: DampedRandomWalkParameters) => new DampedRandomWalkKernel(parameters),
  /** Stochastically driven damped harmonic oscillator. */
  oscillator: (parameters: OscillatorParameters) => new OscillatorKernel(parameters),
  /** Rotation: a damped oscillation at period and one at period / 2 sharing one decay time. */
  quasiPeriodic: (parameters: QuasiPeriodicParameters) => new QuasiPeriodicKernel(parameters),
  /** sigma^2 (1 + sqrt(3)|t|/scale) exp(-sqrt(3)|t|/scale). */
  matern32: (parameters: Matern32Parameters) => new Matern32Kernel(parameters),
  /** CARMA(p, q) (Kelly et al. 2014), stationary by construction. */
  carma: (parameters: CarmaParameters) => new CarmaKernel(parameters),
  /** Squared exponential times periodic: dense engine only. */
  periodicSquaredExponential: (parameters: PeriodicSquaredExponentialParameters) =>
    new PeriodicSquaredExponentialKernel(parameters),
};
