import type { LightCurve } from "./light-curve.js";

/**
 * Magnitude/flux conversion with first-order error propagation. Magnitudes follow Pogson's definition
 * m = -2.5 log10(f) + zp; the zero point zp is the magnitude of unit flux in the chosen flux unit
 * (for example 8.90 for flux densities in janskys on the AB system of Oke & Gunn 1983).
 */

/** 2.5 / ln 10 = 1.0857...: d m / d ln f, the factor that turns a relative flux error into magnitudes. */
export const POGSON_ERROR_FACTOR = 2.5 / Math.LN10;

/** m = -2.5 log10(f) + zp. Flux must be positive (NaN otherwise). */
export function fluxToMagnitude(flux: number, zeroPoint: number): number {
  return flux > 0 ? -2.5 * Math.log10(flux) + zeroPoint : Number.NaN;
}

/** f = 10^(-0.4 (m - zp)), the inverse of {@link fluxToMagnitude}. */
export function magnitudeToFlux(magnitude: number, zeroPoint: number): number {
  return Math.pow(10, -0.4 * (magnitude - zeroPoint));
}

/** sigma_m = 2.5 / ln 10 * sigma_f / f (first-order propagation; f > 0). */
export function fluxErrorToMagnitudeError(fluxError: number, flux: number): number {
  return (POGSON_ERROR_FACTOR * fluxError) / flux;
}

/** sigma_f = f * sigma_m * ln 10 / 2.5, the inverse of {@link fluxErrorToMagnitudeError}. */
export function magnitudeErrorToFluxError(magnitudeError: number, flux: number): number {
  return (flux * magnitudeError) / POGSON_ERROR_FACTOR;
}

/**
 * The same light curve in the other unit: values converted with {@link fluxToMagnitude} or
 * {@link magnitudeToFlux} and errors propagated to first order. Converting fluxes to magnitudes
 * needs every flux positive; a RangeError names the first index that is not (readers check this
 * earlier, with file and line).
 */
export function convertLightCurve(lightCurve: LightCurve, unit: LightCurve["unit"], zeroPoint: number): LightCurve {
  if (lightCurve.unit === unit) return lightCurve;
  const n = lightCurve.value.length;
  const value = new Float64Array(n);
  const error = lightCurve.error ? new Float64Array(n) : undefined;
  for (let i = 0; i < n; i++) {
    if (unit === "mag") {
      const flux = lightCurve.value[i];
      if (!(flux > 0)) throw new RangeError(`flux at index ${i} is ${flux}; magnitudes need positive fluxes`);
      value[i] = fluxToMagnitude(flux, zeroPoint);
      if (error) error[i] = fluxErrorToMagnitudeError(lightCurve.error![i], flux);
    } else {
      value[i] = magnitudeToFlux(lightCurve.value[i], zeroPoint);
      if (error) error[i] = magnitudeErrorToFluxError(lightCurve.error![i], value[i]);
    }
  }
  return { ...lightCurve, value, error, unit };
}
