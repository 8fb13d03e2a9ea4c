import type { Rng } from "../random/rng.js";
import type { FrequencyGrid } from "./frequency-grid.js";
import { glsPower } from "./generalised-lomb-scargle.js";
import type { SampledSeries } from "./time-series.js";

/** Result of {@link bootstrapFalseAlarm}. */
export interface BootstrapFalseAlarm {
  /** (1 + #{maxima >= observed}) / (1 + trials): the usual Monte Carlo p-value (common practice). */
  readonly falseAlarm: number;
  /** Highest power of each resampled periodogram, in trial order. */
  readonly maxima: Float64Array;
}

/**
 * Bootstrap false-alarm probability of a peak: the (value, error) pairs are drawn with replacement onto
 * the fixed observation times, which destroys any periodicity but keeps the sampling and the value
 * distribution; the highest power over the same grid is recorded for each trial (VanderPlas 2018,
 * sect. 7.4.2). Cost: trials times one periodogram. Needs an explicit generator for reproducibility.
 */
export function bootstrapFalseAlarm(
  series: SampledSeries,
  grid: FrequencyGrid,
  observedPower: number,
  options: { readonly trials?: number; readonly rng: Rng },
): BootstrapFalseAlarm {
  const trials = options.trials ?? 200;
  if (!(Number.isInteger(trials) && trials >= 1)) throw new RangeError(`trials must be a positive integer, got ${trials}`);
  const n = series.time.length;
  const value = new Float64Array(n);
  const error = series.error ? new Float64Array(n) : undefined;
  const maxima = new Float64Array(trials);
  let exceed = 0;
  for (let trial = 0; trial < trials; trial++) {
    for (let i = 0; i < n; i++) {
      const j = Math.min(n - 1, Math.floor(options.rng.uniform() * n));
      value[i] = series.value[j];
      if (error) error[i] = series.error![j];
    }
    let highest = 0;
    try {
      const power = glsPower({ time: series.time, value, error }, grid);
      for (let k = 0; k < power.length; k++) if (power[k] > highest) highest = power[k];
    } catch (problem) {
      // A resample of one repeated value has no scatter and no periodogram: power 0.
      if (!(problem instanceof RangeError)) throw problem;
    }
    maxima[trial] = highest;
    if (highest >= observedPower) exceed++;
  }
  return { falseAlarm: (1 + exceed) / (1 + trials), maxima };
}
