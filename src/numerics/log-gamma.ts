import gammaln from "@stdlib/math/base/special/gammaln/lib/index.js";

/**
 * log Gamma(x) for x > 0, from @stdlib (`@stdlib/math`, base/special/gammaln, tested there against
 * reference tables); a RangeError for x <= 0 or NaN, where the project never needs it.
 */
export function logGamma(x: number): number {
  if (!(x > 0)) throw new RangeError(`logGamma needs x > 0, got ${x}`);
  return gammaln(x);
}
