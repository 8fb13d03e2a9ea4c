import type { PosteriorTarget } from "./posterior-target.js";
import type { ParameterSpace } from "./parameter-space.js";

/**
 * A log-likelihood in physical parameters: vectors hold every parameter of the space (fixed ones
 * included) in the space's order.
 */
export interface PhysicalLikelihood {
  /** ln L(theta). */
  logLikelihood(physical: Float64Array): number;
  /**
   * ln L(theta), and d ln L / d theta written into `gradientOut` (one entry per parameter of the
   * space; entries of fixed parameters are ignored).
   */
  logLikelihoodAndGradient?(physical: Float64Array, gradientOut: Float64Array): number;
}

/** Options of {@link unconstrainedPosterior}. */
export interface UnconstrainedPosteriorOptions {
  /**
   * Include ln |dx/du| (default true). Sampling needs it so that the draws of x follow the posterior;
   * a maximum a posteriori in the physical parameters leaves it out.
   */
  readonly jacobian?: boolean;
}

/**
 * The log posterior on the unconstrained space:
 * ln p(u) = ln L(x(u)) + sum_i ln prior_i(x_i(u)) + [sum_i ln |dx_i/du_i|],
 * with gradient d/du_i = (d ln L/dx_i + d ln prior_i/dx_i) dx_i/du_i + [d ln |dx_i/du_i| / du_i]
 * (the chain rule). NaN from the likelihood counts as -Infinity (an impossible point).
 */
export function unconstrainedPosterior(
  space: ParameterSpace,
  likelihood: PhysicalLikelihood,
  options: UnconstrainedPosteriorOptions = {},
): PosteriorTarget {
  const jacobian = options.jacobian ?? true;
  const free = space.free;
  const physical = new Float64Array(space.names.length);
  const physicalGradient = new Float64Array(space.names.length);

  const logPosterior = (u: Float64Array): number => {
    space.toPhysical(u, physical);
    const prior = space.logPrior(physical);
    if (!(prior > -Infinity)) return -Infinity;
    const logL = likelihood.logLikelihood(physical);
    if (Number.isNaN(logL)) return -Infinity;
    return logL + prior + (jacobian ? space.logJacobian(u) : 0);
  };

  const target: PosteriorTarget = { dimension: space.dimension, logPosterior };
  const gradientFn = likelihood.logLikelihoodAndGradient;
  if (gradientFn !== undefined) {
    target.logPosteriorAndGradient = (u: Float64Array, gradientOut: Float64Array): number => {
      space.toPhysical(u, physical);
      const prior = space.logPrior(physical);
      if (!(prior > -Infinity)) {
        gradientOut.fill(0);
        return -Infinity;
      }
      physicalGradient.fill(0);
      const logL = gradientFn.call(likelihood, physical, physicalGradient);
      if (Number.isNaN(logL)) {
        gradientOut.fill(0);
        return -Infinity;
      }
      let value = logL + prior;
      for (let i = 0; i < free.length; i++) {
        const p = free[i];
        const x = physical[p.index];
        const ui = u[i];
        let g = (physicalGradient[p.index] + p.prior.logDensityDerivative(x)) * p.transform.derivative(ui);
        if (jacobian) {
          g += p.transform.logJacobianDerivative(ui);
          value += p.transform.logJacobian(ui);
        }
        gradientOut[i] = g;
      }
      return value;
    };
  }
  return target;
}
