import type { Kernel } from "../kernels/index.js";
import type { LightCurve } from "../lightcurve/light-curve.js";
import { bestDampedRandomWalk } from "../models/best-damped-random-walk.js";
import type { FitResult } from "../models/fit-result.js";
import { psdComparison, type PsdComparison } from "./psd-comparison.js";

/** Frequencies of the model curves of the comparison. */
const MODEL_FREQUENCIES = 300;

/**
 * The one-scale power-spectrum comparison of a single-band CARMA or damped-random-walk fit (undefined for
 * other models and joint fits): the posterior PSD of `kernels` (one per draw used) at log-spaced
 * frequencies from a tenth of 1 / baseline to the periodogram's highest, against the periodogram and,
 * for CARMA, the damped random walk of highest posterior on the same light curve (`bestDampedRandomWalk`,
 * seeded by the fit's seed).
 */
export function spectrumComparison(
  lightCurve: LightCurve,
  result: FitResult,
  periodogram: { readonly frequency: Float64Array; readonly power: Float64Array },
  kernels: readonly Kernel[],
): PsdComparison | undefined {
  if ((result.model !== "carma" && result.model !== "drw") || result.bands !== undefined || kernels.length === 0) return undefined;
  const { time } = lightCurve;
  const baseline = (time[time.length - 1] ?? 0) - (time[0] ?? 0);
  const fHigh = periodogram.frequency[periodogram.frequency.length - 1] ?? 0;
  const fLow = 0.1 / baseline;
  if (!(baseline > 0) || !(fHigh > fLow)) return undefined;
  const frequency = Float64Array.from({ length: MODEL_FREQUENCIES }, (_, i) => fLow * Math.pow(fHigh / fLow, i / (MODEL_FREQUENCIES - 1)));
  const referenceDrw = result.model === "carma" ? bestDampedRandomWalk(lightCurve, result.seed) : undefined;
  return psdComparison({
    lightCurve,
    modelLabel: result.model === "carma" ? `CARMA(${result.options.order ?? "?"})` : "DRW",
    periodogram,
    frequency,
    kernels,
    ...(referenceDrw ? { referenceDrw: { sigma: referenceDrw.sigma, tau: referenceDrw.tau } } : {}),
  });
}
