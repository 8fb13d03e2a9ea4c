import { OscillatorTransition } from "../linalg/oscillator-transition.js";
import type { SemiseparableForm } from "../linalg/semiseparable-form.js";
import { Kernel } from "./kernel.js";
import { fixedParameterFamily, STANDARD_DEVIATION } from "./kernel-family.js";
import { requirePositive } from "./parameter-checks.js";

/** Parameters of the Matern-3/2 kernel. */
export interface Matern32Parameters {
  /** Standard deviation, sqrt(k(0)), in the unit of the data. */
  readonly sigma: number;
  /** Length scale, in the input time unit. */
  readonly scale: number;
}

/**
 * The Matern-3/2 kernel (Rasmussen & Williams 2006, eq. 4.17):
 *
 *     k(t) = sigma^2 (1 + sqrt(3)|t|/scale) exp(-sqrt(3)|t|/scale),   S(omega) = 4 sigma^2 w^3 / (w^2 + omega^2)^2,
 *
 * with w = sqrt(3)/scale. It is exactly the critically damped oscillator (Q = 1/2, w0 = w), so it has an
 * exact two-component semiseparable form with no approximation.
 *
 * @example const k = kernels.matern32({ sigma: 0.1, scale: 5 });
 */
export class Matern32Kernel extends Kernel {
  readonly parameterNames = ["sigma", "scale"] as const;
  readonly sigma: number;
  readonly scale: number;

  constructor({ sigma, scale }: Matern32Parameters) {
    super();
    this.sigma = requirePositive("matern32", "sigma", sigma);
    this.scale = requirePositive("matern32", "scale", scale);
  }

  get parameterValues(): Float64Array {
    return Float64Array.of(this.sigma, this.scale);
  }

  withParameters(values: ArrayLike<number>): Matern32Kernel {
    return new Matern32Kernel({ sigma: values[0], scale: values[1] });
  }

  covarianceAt(lag: number): number {
    const x = (Math.sqrt(3) * Math.abs(lag)) / this.scale;
    return this.sigma * this.sigma * (1 + x) * Math.exp(-x);
  }

  spectralDensityAt(omega: number): number {
    const w = Math.sqrt(3) / this.scale;
    const d = w * w + omega * omega;
    return (4 * this.sigma * this.sigma * w * w * w) / (d * d);
  }

  semiseparableForm(): SemiseparableForm {
    const w = Math.sqrt(3) / this.scale;
    return {
      blocks: [new OscillatorTransition(w, 0.5, [{ index: 1, derivatives: [-w / this.scale, 0] }])],
      observation: Float64Array.of(1, 0),
      projection: Float64Array.of(this.sigma * this.sigma, 0),
      parameterCount: 2,
      observationGradient: new Float64Array(4),
      projectionGradient: Float64Array.of(2 * this.sigma, 0, 0, 0),
    };
  }
}

/** The matern32 descriptor: `kernels.matern32`, `matern32(...)` in kernel expressions. */
export const matern32Family = fixedParameterFamily({
  name: "matern32",
  expressionName: "matern32",
  summary: "sigma^2 (1 + sqrt(3)|t|/scale) exp(-sqrt(3)|t|/scale): smooth aperiodic variability, slow trends",
  kernel: Matern32Kernel,
  parameters: [
    STANDARD_DEVIATION,
    { name: "scale", kind: "timescale", description: "length scale" },
  ],
});
