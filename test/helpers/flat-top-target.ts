import type { PosteriorTarget } from "../../src/inference/index.js";
import type { Rng } from "../../src/random/rng.js";
import { simpson } from "./quadrature.js";

/**
 * A two-dimensional density with a flat-topped maximum: in the rotated coordinates r = (u0 + u1) / sqrt 2
 * (stiff, with a quartic wall) and s = (u0 - u1) / sqrt 2 (soft),
 *   ln p = LOG_SCALE - STIFF r^2 / 2 - WALL r^4 - SOFT s^2 / 2.
 * At the mode the curvature is the Gaussian's, but over steps of half a conditional standard deviation the
 * quartic term adds WALL h^2 [[1/2, 2], [2, 1/2]] to -H, indefinite, which swamps the soft direction when
 * WALL > 4 SOFT (STIFF + SOFT) / 3 (the four-point differences of r^4, worked by hand).
 */
const STIFF = 100;
const SOFT = 1;
const WALL = 400;
const LOG_SCALE = -12;

export function flatTopTarget(): PosteriorTarget {
  return {
    dimension: 2,
    logPosterior: (u) => {
      const r = ((u[0] ?? 0) + (u[1] ?? 0)) / Math.SQRT2;
      const s = ((u[0] ?? 0) - (u[1] ?? 0)) / Math.SQRT2;
      return LOG_SCALE - 0.5 * STIFF * r * r - WALL * r ** 4 - 0.5 * SOFT * s * s;
    },
  };
}

/**
 * Its ln integral: the rotation has unit Jacobian, so Z = e^LOG_SCALE (integral of exp(-STIFF r^2 / 2 -
 * WALL r^4) dr, by Simpson's rule over +-1, ten standard deviations of the Gaussian part) sqrt(2 pi / SOFT)
 * (the Gaussian integral, common practice).
 */
export const FLAT_TOP_LOG_EVIDENCE =
  LOG_SCALE + Math.log(simpson((r) => Math.exp(-0.5 * STIFF * r * r - WALL * r ** 4), -1, 1, 20_000)) + 0.5 * Math.log((2 * Math.PI) / SOFT);

/**
 * An exact draw from the normalised density: r from N(0, 1/STIFF) accepted with probability exp(-WALL r^4)
 * (rejection sampling, von Neumann 1951; the bound holds as the wall only lowers the density), s from N(0, 1/SOFT).
 */
export function flatTopDraw(rng: Rng): Float64Array {
  let r = 0;
  do r = rng.normal() / Math.sqrt(STIFF);
  while (rng.uniform() > Math.exp(-WALL * r ** 4));
  const s = rng.normal() / Math.sqrt(SOFT);
  return Float64Array.of((r + s) / Math.SQRT2, (r - s) / Math.SQRT2);
}
