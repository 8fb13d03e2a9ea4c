/** log(2 pi), the normalising constant of a Gaussian density per dimension, doubled. */
export const LOG_TWO_PI = Math.log(2 * Math.PI);

/** (1/2) log(2 pi): -log of the standard normal density at 0 (so log N(x | mu, s) = -z^2/2 - log s - HALF_LOG_TWO_PI). */
export const HALF_LOG_TWO_PI = 0.5 * LOG_TWO_PI;
