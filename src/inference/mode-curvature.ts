import { hasGradient, type PosteriorTarget } from "./posterior-target.js";

/**
 * Per-coordinate scale of a log density near a mode: 1 / sqrt(-d^2 ln p / dx_i^2), the conditional
 * standard deviation of a Gaussian (Laplace) approximation. The second derivative is a central
 * difference of the gradient, or of the value when there is no gradient. Coordinates where the
 * curvature is not negative get `fallback`. Used to size the cloud of starting points around the mode.
 */
export function modeScales(target: PosteriorTarget, mode: Float64Array, fallback = 0.1): Float64Array {
  const n = target.dimension;
  const scales = new Float64Array(n);
  const x = Float64Array.from(mode);
  const gPlus = new Float64Array(n);
  const gMinus = new Float64Array(n);
  const f0 = target.logPosterior(mode);
  for (let i = 0; i < n; i++) {
    let curvature: number;
    if (hasGradient(target)) {
      const h = 1e-5 * Math.max(1, Math.abs(mode[i]));
      x[i] = mode[i] + h;
      target.logPosteriorAndGradient(x, gPlus);
      x[i] = mode[i] - h;
      target.logPosteriorAndGradient(x, gMinus);
      curvature = (gPlus[i] - gMinus[i]) / (2 * h);
    } else {
      const h = 1e-3 * Math.max(1, Math.abs(mode[i]));
      x[i] = mode[i] + h;
      const fp = target.logPosterior(x);
      x[i] = mode[i] - h;
      const fm = target.logPosterior(x);
      curvature = (fp - 2 * f0 + fm) / (h * h);
    }
    x[i] = mode[i];
    scales[i] = curvature < 0 && Number.isFinite(curvature) ? 1 / Math.sqrt(-curvature) : fallback;
  }
  return scales;
}
