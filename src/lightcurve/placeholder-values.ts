import type { PhotometricUnit } from "./light-curve.js";

/**
 * Numbers that catalogues write where a measurement is missing: 99, 99.99, -99 and -999 (common
 * practice: "no detection" and "no data" codes of photometric catalogues). A real magnitude is
 * never 99 or negative by 99, and a real error is never negative.
 */
export const PLACEHOLDER_CODES: readonly number[] = [99, 99.99, -99, -999];

function isCode(x: number): boolean {
  for (const code of PLACEHOLDER_CODES) if (x === code) return true;
  return false;
}

/**
 * Whether a row's value or error is a placeholder code rather than a measurement: in magnitudes, a
 * value or an error equal to one of {@link PLACEHOLDER_CODES}; in fluxes (where 99 or -99 can be a
 * real flux), only a negative code in the error.
 */
export function isPlaceholderRow(value: number, error: number | undefined, unit: PhotometricUnit): boolean {
  if (unit === "mag") return isCode(value) || (error !== undefined && isCode(error));
  return error !== undefined && error < 0 && isCode(error);
}
