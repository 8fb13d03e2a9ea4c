/**
 * A smooth bijection x = g(u) from the whole real line onto a parameter's support. Samplers move in
 * u; the change of variables adds ln |dx/du| to the log density so that the posterior of x is
 * unchanged (the Jacobian rule, for example Gelman et al., Bayesian Data Analysis, 3rd ed., sec. 2.8).
 */
export interface Transform {
  /** "identity", "log", "negative-log" or "logit", with its bounds, for reports. */
  readonly kind: string;
  /** u = g^-1(x). */
  toUnconstrained(x: number): number;
  /** x = g(u). */
  fromUnconstrained(u: number): number;
  /** dx/du at u (positive: every transform here is increasing). */
  derivative(u: number): number;
  /** ln |dx/du| at u. */
  logJacobian(u: number): number;
  /** d/du ln |dx/du| at u, needed for the gradient of the transformed log density. */
  logJacobianDerivative(u: number): number;
}

/** x = u on the real line. */
export const identityTransform: Transform = {
  kind: "identity",
  toUnconstrained: (x) => x,
  fromUnconstrained: (u) => u,
  derivative: () => 1,
  logJacobian: () => 0,
  logJacobianDerivative: () => 0,
};

/** x = lower + exp(u) onto (lower, inf); ln |dx/du| = u. */
export function lowerBoundTransform(lower: number): Transform {
  return {
    kind: `log(x - ${lower})`,
    toUnconstrained: (x) => Math.log(x - lower),
    fromUnconstrained: (u) => lower + Math.exp(u),
    derivative: (u) => Math.exp(u),
    logJacobian: (u) => u,
    logJacobianDerivative: () => 1,
  };
}

/** x = upper - exp(-u) onto (-inf, upper); ln |dx/du| = -u. */
export function upperBoundTransform(upper: number): Transform {
  return {
    kind: `-log(${upper} - x)`,
    toUnconstrained: (x) => -Math.log(upper - x),
    fromUnconstrained: (u) => upper - Math.exp(-u),
    derivative: (u) => Math.exp(-u),
    logJacobian: (u) => -u,
    logJacobianDerivative: () => -1,
  };
}

/** ln(1 / (1 + e^-u)), without overflow for large |u|. */
function logSigmoid(u: number): number {
  return u < 0 ? u - Math.log1p(Math.exp(u)) : -Math.log1p(Math.exp(-u));
}

/**
 * x = lower + (upper - lower) s(u) with the logistic s(u) = 1 / (1 + e^-u), onto (lower, upper);
 * ln |dx/du| = ln(upper - lower) + ln s(u) + ln s(-u), whose derivative is 1 - 2 s(u).
 */
export function intervalTransform(lower: number, upper: number): Transform {
  if (!(lower < upper) || !Number.isFinite(lower) || !Number.isFinite(upper)) {
    throw new RangeError(`interval transform: needs finite lower < upper, got [${lower}, ${upper}]`);
  }
  const width = upper - lower;
  const logWidth = Math.log(width);
  return {
    kind: `logit on [${lower}, ${upper}]`,
    toUnconstrained: (x) => {
      const f = (x - lower) / width;
      return Math.log(f) - Math.log1p(-f);
    },
    // Measuring from the nearer end keeps the last digits of x when s(u) is close to 1.
    fromUnconstrained: (u) =>
      u <= 0 ? lower + width / (1 + Math.exp(-u)) : upper - width / (1 + Math.exp(u)),
    derivative: (u) => width * Math.exp(logSigmoid(u) + logSigmoid(-u)),
    logJacobian: (u) => logWidth + logSigmoid(u) + logSigmoid(-u),
    logJacobianDerivative: (u) => {
      const s = u <= 0 ? Math.exp(u) / (1 + Math.exp(u)) : 1 / (1 + Math.exp(-u));
      return 1 - 2 * s;
    },
  };
}

/**
 * The transform that fits a support: identity on the real line, a shifted log for one bound, the
 * logit for two (common practice in probabilistic programming).
 */
export function transformForSupport(lower: number, upper: number): Transform {
  const hasLower = Number.isFinite(lower);
  const hasUpper = Number.isFinite(upper);
  if (hasLower && hasUpper) return intervalTransform(lower, upper);
  if (hasLower) return lowerBoundTransform(lower);
  if (hasUpper) return upperBoundTransform(upper);
  return identityTransform;
}
