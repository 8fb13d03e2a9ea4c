import {
  halfNormalLogPdf,
  logNormalCdf,
  logNormalLogPdf,
  logNormalQuantile,
  normalCdf,
  normalLogPdf,
  normalQuantile,
  uniformCdf,
  uniformLogPdf,
  uniformQuantile,
} from "./distribution-functions.js";

/**
 * A proper prior on one scalar parameter, in the parameter's physical unit. Densities, distribution
 * functions and quantiles come from @stdlib/stats where it has them; the remaining ones are the
 * closed forms given beside each constructor.
 */
export interface Prior {
  /** The family, for reports: "uniform", "log-uniform", "normal", "half-normal", "log-normal" or "truncated <family>". */
  readonly family: string;
  /** The family's parameters, for reports (for example `{ mean: 0, sd: 1 }`). */
  readonly settings: Readonly<Record<string, number>>;
  /** Lower end of the support (may be -Infinity). */
  readonly lower: number;
  /** Upper end of the support (may be +Infinity). */
  readonly upper: number;
  /** Normalised ln p(x); -Infinity outside the support. */
  logDensity(x: number): number;
  /** d ln p / dx inside the support. */
  logDensityDerivative(x: number): number;
  /** P(X <= x). */
  cdf(x: number): number;
  /** The x with P(X <= x) = p, for p in [0, 1]. */
  quantile(p: number): number;
}

function requireFinite(family: string, name: string, value: number): void {
  if (!Number.isFinite(value)) throw new RangeError(`${family} prior: ${name} must be finite, got ${value}`);
}

function requirePositive(family: string, name: string, value: number): void {
  if (!(value > 0) || !Number.isFinite(value)) {
    throw new RangeError(`${family} prior: ${name} must be positive and finite, got ${value}`);
  }
}

function requireOrdered(family: string, lower: number, upper: number): void {
  if (!(lower < upper)) throw new RangeError(`${family} prior: lower (${lower}) must be below upper (${upper})`);
}

/**
 * Uniform prior on [lower, upper]: p(x) = 1 / (upper - lower).
 *
 * @example uniformPrior(0, 1)  // the harmonic weight of a quasi-periodic kernel
 */
export function uniformPrior(lower: number, upper: number): Prior {
  requireFinite("uniform", "lower", lower);
  requireFinite("uniform", "upper", upper);
  requireOrdered("uniform", lower, upper);
  return {
    family: "uniform",
    settings: { lower, upper },
    lower,
    upper,
    logDensity: (x) => uniformLogPdf(x, lower, upper),
    logDensityDerivative: () => 0,
    cdf: (x) => uniformCdf(x, lower, upper),
    quantile: (p) => uniformQuantile(p, lower, upper),
  };
}

/**
 * Log-uniform (reciprocal) prior on [lower, upper] with 0 < lower: p(x) = 1 / (x ln(upper/lower)),
 * so ln x is uniform; P(X <= x) = ln(x/lower) / ln(upper/lower); quantile lower (upper/lower)^p.
 * The usual scale-free prior for timescales and amplitudes spanning decades (common practice).
 *
 * @example logUniformPrior(1, 1e4)  // a damped-random-walk tau in days
 */
export function logUniformPrior(lower: number, upper: number): Prior {
  requirePositive("log-uniform", "lower", lower);
  requirePositive("log-uniform", "upper", upper);
  requireOrdered("log-uniform", lower, upper);
  const logLower = Math.log(lower);
  const logWidth = Math.log(upper) - logLower;
  const logNorm = Math.log(logWidth);
  return {
    family: "log-uniform",
    settings: { lower, upper },
    lower,
    upper,
    logDensity: (x) => (x >= lower && x <= upper ? -Math.log(x) - logNorm : -Infinity),
    logDensityDerivative: (x) => -1 / x,
    cdf: (x) => (x <= lower ? 0 : x >= upper ? 1 : (Math.log(x) - logLower) / logWidth),
    quantile: (p) => (p <= 0 ? lower : p >= 1 ? upper : Math.min(upper, Math.exp(logLower + p * logWidth))),
  };
}

/**
 * Normal prior N(mean, sd^2) on the real line.
 *
 * @example normalPrior(18.2, 1)  // a mean magnitude
 */
export function normalPrior(mean: number, sd: number): Prior {
  requireFinite("normal", "mean", mean);
  requirePositive("normal", "sd", sd);
  const precision = 1 / (sd * sd);
  return {
    family: "normal",
    settings: { mean, sd },
    lower: -Infinity,
    upper: Infinity,
    logDensity: (x) => normalLogPdf(x, mean, sd),
    logDensityDerivative: (x) => -(x - mean) * precision,
    cdf: (x) => normalCdf(x, mean, sd),
    quantile: (p) => normalQuantile(p, mean, sd),
  };
}

/**
 * Half-normal prior on x >= 0 with scale s: p(x) = 2 N(x; 0, s^2). Distribution function
 * 2 Phi(x/s) - 1 and quantile s Phi^-1((1 + p) / 2) (the folding of a centred normal).
 *
 * @example halfNormalPrior(0.1)  // a white-noise jitter in magnitudes
 */
export function halfNormalPrior(scale: number): Prior {
  requirePositive("half-normal", "scale", scale);
  const precision = 1 / (scale * scale);
  return {
    family: "half-normal",
    settings: { scale },
    lower: 0,
    upper: Infinity,
    logDensity: (x) => halfNormalLogPdf(x, scale),
    logDensityDerivative: (x) => -x * precision,
    cdf: (x) => (x <= 0 ? 0 : 2 * normalCdf(x, 0, scale) - 1),
    quantile: (p) => (p <= 0 ? 0 : p >= 1 ? Infinity : normalQuantile((1 + p) / 2, 0, scale)),
  };
}

/**
 * Log-normal prior: ln x ~ N(mu, sigma^2), on x > 0.
 * d ln p / dx = -(1 + (ln x - mu) / sigma^2) / x.
 *
 * @example logNormalPrior(Math.log(0.2), 1)  // an amplitude around 0.2 mag
 */
export function logNormalPrior(mu: number, sigma: number): Prior {
  requireFinite("log-normal", "mu", mu);
  requirePositive("log-normal", "sigma", sigma);
  const precision = 1 / (sigma * sigma);
  return {
    family: "log-normal",
    settings: { mu, sigma },
    lower: 0,
    upper: Infinity,
    logDensity: (x) => logNormalLogPdf(x, mu, sigma),
    logDensityDerivative: (x) => -(1 + (Math.log(x) - mu) * precision) / x,
    cdf: (x) => logNormalCdf(x, mu, sigma),
    quantile: (p) => logNormalQuantile(p, mu, sigma),
  };
}

/**
 * Restricts a prior to [lower, upper] and renormalises it:
 * p_T(x) = p(x) / (F(upper) - F(lower)), F_T(x) = (F(x) - F(lower)) / (F(upper) - F(lower)),
 * quantile F^-1(F(lower) + p (F(upper) - F(lower))). The bounds are intersected with the base support.
 *
 * @example truncatedPrior(normalPrior(10, 5), 0, Infinity)  // a period known to be positive
 */
export function truncatedPrior(base: Prior, lower: number, upper: number): Prior {
  const lo = Math.max(lower, base.lower);
  const hi = Math.min(upper, base.upper);
  const family = `truncated ${base.family}`;
  if (Number.isNaN(lo) || Number.isNaN(hi)) throw new RangeError(`${family} prior: bounds must be numbers`);
  requireOrdered(family, lo, hi);
  const cdfLower = lo === -Infinity ? 0 : base.cdf(lo);
  const cdfUpper = hi === Infinity ? 1 : base.cdf(hi);
  const mass = cdfUpper - cdfLower;
  if (!(mass > 0)) {
    throw new RangeError(`${family} prior: [${lo}, ${hi}] holds no probability of the base prior`);
  }
  const logMass = Math.log(mass);
  return {
    family,
    settings: { ...base.settings, truncateLower: lo, truncateUpper: hi },
    lower: lo,
    upper: hi,
    logDensity: (x) => (x >= lo && x <= hi ? base.logDensity(x) - logMass : -Infinity),
    logDensityDerivative: (x) => base.logDensityDerivative(x),
    cdf: (x) => (x <= lo ? 0 : x >= hi ? 1 : (base.cdf(x) - cdfLower) / mass),
    quantile: (p) => {
      if (p <= 0) return lo;
      if (p >= 1) return hi;
      return Math.min(hi, Math.max(lo, base.quantile(cdfLower + p * mass)));
    },
  };
}
