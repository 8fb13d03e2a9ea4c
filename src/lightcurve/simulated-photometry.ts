import type { Rng } from "../random/rng.js";
import type { LightCurve } from "./light-curve.js";
import { photometricError, type PhotometricErrorOptions } from "./photometric-error.js";

/**
 * Observes a model light curve as a survey would: at each time, the true magnitude plus Gaussian noise
 * whose standard deviation is the Ivezic et al. 2019 per-visit error for that magnitude and depth
 * (see {@link photometricError}). The reported error is that standard deviation. Magnitudes only.
 *
 * @param trueMagnitudes the noise-free light curve at `time`, in magnitudes
 * @param source a label for provenance (for example "simulated, seed 42")
 * @example observeMagnitudes(times, model, { depth5Sigma: 24 }, createRng(1), "simulated")
 */
export function observeMagnitudes(
  time: ArrayLike<number>,
  trueMagnitudes: ArrayLike<number>,
  errors: PhotometricErrorOptions,
  rng: Rng,
  source = "simulated",
): LightCurve {
  const n = time.length;
  if (trueMagnitudes.length !== n) throw new RangeError("time and trueMagnitudes must have the same length");
  const t = new Float64Array(n);
  const value = new Float64Array(n);
  const error = new Float64Array(n);
  let sorted = false;
  for (let i = 0; i < n; i++) {
    t[i] = time[i];
    if (i > 0 && t[i] < t[i - 1]) sorted = true;
    error[i] = photometricError(trueMagnitudes[i], errors);
    value[i] = trueMagnitudes[i] + error[i] * rng.normal();
  }
  if (sorted) throw new RangeError("times must be sorted ascending");
  return {
    time: t,
    value,
    error,
    unit: "mag",
    provenance: { source, timeColumn: "time", valueColumn: "mag", errorColumn: "mag_err", dropped: 0, sorted: false },
  };
}
