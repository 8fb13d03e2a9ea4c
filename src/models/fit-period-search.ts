import type { LightCurve } from "../lightcurve/light-curve.js";
import { computePeriodogram } from "../periodogram/periodogram.js";
import type { DataSummary } from "./data-summary.js";

/**
 * The periodogram stage of a fit: the period of the highest peak of a generalised Lomb-Scargle
 * periodogram (Zechmeister & Kurster 2009), the first guess of a periodic model's period. Periods from
 * half the baseline down to twice the smallest spacing are searched. Undefined when nothing peaks.
 */
export function periodogramPeriod(lightCurve: LightCurve, summary: DataSummary): number | undefined {
  const peaks = computePeriodogram(
    { time: lightCurve.time, value: lightCurve.value, ...(lightCurve.error ? { error: lightCurve.error } : {}) },
    {
      minimumFrequency: 2 / summary.baseline,
      maximumFrequency: 1 / (2 * Math.max(summary.minimumSpacing, summary.baseline * 1e-6)),
      peaks: 1,
    },
  ).peaks;
  return peaks[0]?.period;
}
