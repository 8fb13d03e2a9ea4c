import { medianOf } from "../numerics/order-statistics.js";
import type { LightCurve } from "../lightcurve/light-curve.js";
import { visitSpacing } from "../periodogram/frequency-grid.js";

/** Scales of a light curve from which the models derive their priors (never hard-coded days or magnitudes). */
export interface DataSummary {
  readonly n: number;
  /** Last time minus first time, input time unit. */
  readonly baseline: number;
  /** Median spacing between consecutive distinct times. */
  readonly medianCadence: number;
  /** Smallest spacing between consecutive distinct times. */
  readonly minimumSpacing: number;
  /**
   * Typical separation of visits on different nights (or of consecutive exposures of an even cadence):
   * the median of the spacings at least a tenth of the mean spacing, baseline / (n - 1). Visits
   * clustered minutes apart within a night fall below that and do not count; see {@link visitSpacing}.
   */
  readonly visitSpacing: number;
  /** Median of the values. */
  readonly median: number;
  /** Robust spread of the values: 1.4826 x median absolute deviation, or the sample sd if larger. */
  readonly spread: number;
  /** Median per-point error (0 without an error column). */
  readonly medianError: number;
  readonly hasErrors: boolean;
}

/** Computes the scales of a light curve (sorted times assumed, as the readers deliver them). Linear memory, O(N log N) time. */
export function summarizeLightCurve(lightCurve: LightCurve): DataSummary {
  const { time, value, error } = lightCurve;
  const n = time.length;
  const spacings = new Float64Array(Math.max(n - 1, 0));
  let spacingCount = 0;
  for (let i = 1; i < n; i++) if (time[i] > time[i - 1]) spacings[spacingCount++] = time[i] - time[i - 1];
  const distinctSpacings = spacings.subarray(0, spacingCount);
  let minimumSpacing = Infinity;
  for (let i = 0; i < spacingCount; i++) minimumSpacing = Math.min(minimumSpacing, distinctSpacings[i]);
  const median = medianOf(value);
  const deviations = Float64Array.from(value, (v) => Math.abs(v - median));
  let mean = 0;
  for (let i = 0; i < n; i++) mean += value[i];
  mean /= n;
  let ss = 0;
  for (let i = 0; i < n; i++) ss += (value[i] - mean) ** 2;
  const sd = n > 1 ? Math.sqrt(ss / (n - 1)) : 0;
  const spread = Math.max(1.4826 * medianOf(deviations), sd);
  const medianError = error ? medianOf(error) : 0;
  return {
    n,
    baseline: n > 0 ? time[n - 1] - time[0] : 0,
    medianCadence: spacingCount > 0 ? medianOf(distinctSpacings) : 0,
    minimumSpacing: spacingCount > 0 ? minimumSpacing : 0,
    visitSpacing: spacingCount > 0 ? visitSpacing(distinctSpacings, n > 1 ? (time[n - 1] - time[0]) / (n - 1) : 0) : 0,
    median,
    spread: spread > 0 ? spread : Math.max(medianError, 1e-12),
    medianError,
    hasErrors: error !== undefined,
  };
}
