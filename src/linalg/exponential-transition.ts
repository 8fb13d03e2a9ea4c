import { decayFactor } from "./elementary-functions.js";
import type { ParameterDependence, TransitionBlock } from "./transition-block.js";

/**
 * A one-dimensional block with drift -rate: the transition over a lag dt is exp(-rate dt). Used by the
 * damped random walk (rate = 1/tau) and by real roots of CARMA processes.
 *
 * Native parameter: the rate (1 / time unit).
 */
export class ExponentialTransition implements TransitionBlock {
  readonly size = 1;
  readonly generator: Float64Array;
  readonly parameterIndex: Int32Array;
  private readonly rateDerivative: Float64Array;

  /**
   * @param rate decay rate, 1/timescale (must be > 0)
   * @param dependencies how kernel parameters move the rate: derivatives = [d rate / d parameter]
   */
  constructor(
    readonly rate: number,
    private readonly dependencies: readonly ParameterDependence[],
  ) {
    this.generator = Float64Array.of(-rate);
    this.parameterIndex = Int32Array.from(dependencies.map((d) => d.index));
    this.rateDerivative = Float64Array.from(dependencies.map((d) => d.derivatives[0]));
  }

  transition(dt: number, out: Float64Array, offset: number): void {
    out[offset] = decayFactor(-this.rate * dt);
  }

  transitionDerivatives(dt: number, out: Float64Array, offset: number): void {
    const value = decayFactor(-this.rate * dt);
    for (let k = 0; k < this.rateDerivative.length; k++) out[offset + k] = -dt * value * this.rateDerivative[k];
  }

  /** Adds rateBar d rate / d theta_k to kernelBar[k] for every kernel parameter the rate depends on. */
  addRateGradient(rateBar: number, kernelBar: Float64Array): void {
    for (let k = 0; k < this.rateDerivative.length; k++) kernelBar[this.parameterIndex[k]] += rateBar * this.rateDerivative[k];
  }

  reindexed(map: (index: number) => number): TransitionBlock {
    return new ExponentialTransition(
      this.rate,
      this.dependencies.map((d) => ({ index: map(d.index), derivatives: d.derivatives })),
    );
  }
}
