import { ExponentialTransition } from "../linalg/exponential-transition.js";
import type { SemiseparableForm } from "../linalg/semiseparable-form.js";
import { Kernel } from "./kernel.js";
import { fixedParameterFamily } from "./kernel-family.js";
import { requirePositive } from "./parameter-checks.js";

/** Parameters of the damped random walk. */
export interface DampedRandomWalkParameters {
  /** Long-term standard deviation (unit of the data); the asymptotic structure function is sqrt(2) sigma. */
  readonly sigma: number;
  /** Damping (decorrelation) timescale, in the input time unit. */
  readonly tau: number;
}

/**
 * The damped random walk (Ornstein-Uhlenbeck process), the standard model of quasar optical variability
 * (Kelly, Bechtold & Siemiginowska 2009, ApJ 698, 895; MacLeod et al. 2010, ApJ 721, 1014):
 *
 *     k(t) = sigma^2 exp(-|t| / tau),    S(omega) = 2 sigma^2 tau / (1 + omega^2 tau^2).
 *
 * One semiseparable component (R = 1).
 *
 * @example const k = kernels.dampedRandomWalk({ sigma: 0.2, tau: 300 });
 */
export class DampedRandomWalkKernel extends Kernel {
  readonly parameterNames = ["sigma", "tau"] as const;
  readonly sigma: number;
  readonly tau: number;

  constructor({ sigma, tau }: DampedRandomWalkParameters) {
    super();
    this.sigma = requirePositive("dampedRandomWalk", "sigma", sigma);
    this.tau = requirePositive("dampedRandomWalk", "tau", tau);
  }

  get parameterValues(): Float64Array {
    return Float64Array.of(this.sigma, this.tau);
  }

  withParameters(values: ArrayLike<number>): DampedRandomWalkKernel {
    return new DampedRandomWalkKernel({ sigma: values[0], tau: values[1] });
  }

  covarianceAt(lag: number): number {
    return this.sigma * this.sigma * Math.exp(-Math.abs(lag) / this.tau);
  }

  spectralDensityAt(omega: number): number {
    const x = omega * this.tau;
    return (2 * this.sigma * this.sigma * this.tau) / (1 + x * x);
  }

  semiseparableForm(): SemiseparableForm {
    const { sigma, tau } = this;
    return {
      blocks: [new ExponentialTransition(1 / tau, [{ index: 1, derivatives: [-1 / (tau * tau)] }])],
      observation: Float64Array.of(1),
      projection: Float64Array.of(sigma * sigma),
      parameterCount: 2,
      observationGradient: new Float64Array(2),
      projectionGradient: Float64Array.of(2 * sigma, 0),
    };
  }
}

/** The damped random walk's descriptor: `kernels.dampedRandomWalk`, `drw(sigma=..,tau=..)`, the `drw` model. */
export const dampedRandomWalkFamily = fixedParameterFamily({
  name: "dampedRandomWalk",
  expressionName: "drw",
  summary: "sigma^2 exp(-|t| / tau): quasar and AGN variability",
  kernel: DampedRandomWalkKernel,
  parameters: [
    { name: "sigma", kind: "amplitude", description: "long-term standard deviation" },
    { name: "tau", kind: "timescale", description: "damping timescale" },
  ],
  model: { name: "drw", periodCycles: 1, purpose: "quasar timescale" },
});
