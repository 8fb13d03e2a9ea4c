import { logUniformPrior, uniformPrior, type Prior } from "../inference/index.js";
import type { ParameterKind } from "../kernels/index.js";
import type { DataSummary } from "./data-summary.js";

/** The data's scales and the period range that a model's priors and first guesses are drawn from. */
export interface PriorScales {
  readonly summary: DataSummary;
  /** The shortest period a model considers (the lower end of every period prior). */
  readonly shortestPeriod: number;
  /** The longest period of this model (baseline / the cycles the model needs). */
  readonly longestPeriod: number;
  /** A first guess of the period (the periodogram's peak), if any. */
  readonly periodGuess?: number;
}

/**
 * The data-driven prior of a kernel parameter by its kind (never hard-coded days or magnitudes):
 * - amplitude: log-uniform from 1e-3 to 10 times the spread of the values;
 * - timescale: log-uniform from a tenth of the median cadence to ten times the baseline (Kozlowski 2017,
 *   A&A 597, A128: timescales beyond a tenth of the baseline are biased, so the prior must allow them for the
 *   warning to be meaningful);
 * - period: log-uniform over the model's period range;
 * - coherence: log-uniform from the shortest period to ten baselines (a pattern forgotten within one cycle
 *   up to one coherent over the whole light curve, where the data give only a lower limit);
 * - quality: log-uniform on [0.05, 1000] (heavily overdamped to a line narrower than any baseline resolves);
 * - fraction: uniform on [0, 1].
 * Shape parameters and coefficients have no default prior (no model uses them).
 */
export function priorForKind(kind: ParameterKind, scales: PriorScales): Prior {
  const { spread, medianCadence, baseline } = scales.summary;
  switch (kind) {
    case "amplitude":
      return logUniformPrior(1e-3 * spread, 10 * spread);
    case "timescale":
      return logUniformPrior(medianCadence / 10, 10 * baseline);
    case "period":
      return logUniformPrior(scales.shortestPeriod, scales.longestPeriod);
    case "coherence":
      return logUniformPrior(scales.shortestPeriod, 10 * baseline);
    case "quality":
      return logUniformPrior(0.05, 1000);
    case "fraction":
      return uniformPrior(0, 1);
    default:
      throw new RangeError(`no default prior for a parameter of kind "${kind}"`);
  }
}

/**
 * The first guess of a kernel parameter by its kind (the optimiser's first start only, never a prior):
 * the signal's standard deviation (spread with the median error removed in quadrature) for an amplitude,
 * max(baseline / 10, median cadence) for a timescale, the period guess (clamped into the range, else the
 * range's geometric middle) for a period, three guessed periods for a coherence time (a pattern that stays
 * coherent for a few cycles), 2 for a quality factor and 0.3 for a fraction.
 */
export function guessForKind(kind: ParameterKind, scales: PriorScales, prior: Prior): number {
  const { spread, medianError, baseline, medianCadence } = scales.summary;
  switch (kind) {
    case "amplitude":
      return Math.sqrt(Math.max(spread * spread - medianError ** 2, 0.01 * spread * spread));
    case "timescale":
      return Math.max(baseline / 10, medianCadence);
    case "period":
      return periodGuess(scales);
    case "coherence":
      return Math.min(Math.max(3 * periodGuess(scales), prior.lower * 1.01), prior.upper / 1.01);
    case "quality":
      return 2;
    case "fraction":
      return 0.3;
    default:
      return prior.quantile(0.5);
  }
}

function periodGuess({ periodGuess: value, shortestPeriod, longestPeriod }: PriorScales): number {
  return value !== undefined && value > shortestPeriod && value < longestPeriod ? value : Math.sqrt(shortestPeriod * longestPeriod);
}
