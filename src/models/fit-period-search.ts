import type { LightCurve } from "../lightcurve/light-curve.js";
import { computePeriodogram } from "../periodogram/periodogram.js";
import type { PeriodRange } from "./period-range.js";

/**
 * The periodogram stage of a fit: the period of the highest peak of a generalised Lomb-Scargle
 * periodogram (Zechmeister & Kurster 2009) over the model's period range, the first guess of a periodic
 * model's period. Undefined when nothing peaks (or the values have no scatter).
 */
export function periodogramPeriod(lightCurve: LightCurve, range: PeriodRange): number | undefined {
  return periodogramPeaks(lightCurve, range, 1)[0];
}

/** Periodogram peaks whose periods the mode search also starts from, besides the highest (fit-mode-plan.ts). */
export const SEARCHED_PEAKS = 3;

/**
 * The periods of the `count` highest peaks of the periodogram of {@link periodogramPeriod}, highest
 * first (at least one peak width apart in frequency). The highest is not always the rotation: a slow
 * trend (a background the model fits separately) or an alias can outrank it, so the mode search starts
 * from each.
 */
export function periodogramPeaks(lightCurve: LightCurve, range: PeriodRange, count = SEARCHED_PEAKS): number[] {
  const peaks = computePeriodogram(
    { time: lightCurve.time, value: lightCurve.value, ...(lightCurve.error ? { error: lightCurve.error } : {}) },
    { minimumFrequency: 1 / range.longest, maximumFrequency: 1 / range.shortest, peaks: count },
  ).peaks;
  return peaks.map((peak) => peak.period);
}
