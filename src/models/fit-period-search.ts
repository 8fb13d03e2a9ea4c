import type { LightCurve } from "../lightcurve/light-curve.js";
import { computePeriodogram } from "../periodogram/periodogram.js";
import type { PeriodRange } from "./period-range.js";

/**
 * The periodogram stage of a fit: the period of the highest peak of a generalised Lomb-Scargle
 * periodogram (Zechmeister & Kurster 2009) over the model's period range, the first guess of a periodic
 * model's period. Undefined when nothing peaks (or the values have no scatter).
 */
export function periodogramPeriod(lightCurve: LightCurve, range: PeriodRange): number | undefined {
  const peaks = computePeriodogram(
    { time: lightCurve.time, value: lightCurve.value, ...(lightCurve.error ? { error: lightCurve.error } : {}) },
    { minimumFrequency: 1 / range.longest, maximumFrequency: 1 / range.shortest, peaks: 1 },
  ).peaks;
  return peaks[0]?.period;
}
