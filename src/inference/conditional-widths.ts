import { inverseFromCholesky } from "./mode-covariance.js";
import type { PosteriorTarget } from "./posterior-target.js";
import { choleskyFactor } from "./student-t-proposal.js";

/**
 * Offsets of the quadrature grid along one coordinate, in units of that coordinate's Laplace conditional
 * standard deviation, on each side of the mode: fine near the mode, geometric beyond, out to 192 so a
 * tent-shaped conditional whose tip the curvature measured (100 times too narrow, say) is still spanned.
 */
const GRID_OFFSETS = [0.25, 0.5, 0.75, 1, 1.5, 2, 3, 4, 6, 8, 12, 16, 24, 32, 48, 64, 96, 128, 192];

/** Sub-intervals of each grid step for the quadrature of exp(ln p), ln p linear in between. */
const SUBDIVISIONS = 16;

/** A side of the grid stops once ln p has fallen this far below its value at the mode (density ratio 6e-6). */
const GRID_DROP = 12;

/** Mean and standard deviation of every coordinate's conditional density at the mode. */
export interface ConditionalWidths {
  /** E[x_i | x_-i = mode_-i], by quadrature. */
  readonly mean: Float64Array;
  /** sd[x_i | x_-i = mode_-i], by quadrature. */
  readonly sd: Float64Array;
  /** Target evaluations spent. */
  readonly evaluations: number;
}

/**
 * The conditional density of each coordinate through the mode, p(x_i | x_-i = mode_-i), measured on a grid
 * instead of from the curvature at the mode: ln p at mode_i +- c s_i for the offsets c of `GRID_OFFSETS`
 * (s_i the Laplace conditional standard deviation), each side until ln p has dropped by `GRID_DROP`,
 * then the mean and variance of exp(ln p) by the midpoint rule with ln p interpolated linearly between
 * the grid points (exact in the limit for a tent, whose ln p is linear on each side; common practice).
 *
 * Why: where the likelihood is not differentiable at the mode the curvature there says nothing about the
 * width. A damped random walk's covariance exp(-|dt| / tau) has a kink at dt = 0, so the likelihood of
 * lagged bands has a kink wherever a shifted time crosses another band's time; the conditional of a lag
 * is tent-shaped (ln p falling linearly on both sides), and finite differences of ln p at the tip
 * measure the kink, not the tent: on the six-band quasars of bench/multi-band-calibration.ts the
 * conditional sd of a lag was 1.5-3.6 times the Laplace one (bench/README.md).
 * Cost: at most 2 x 19 evaluations per coordinate, 2 x 10 for a Gaussian whose curvature was right.
 */
export function conditionalWidths(target: PosteriorTarget, mode: Float64Array, scales: ArrayLike<number>): ConditionalWidths {
  const d = target.dimension;
  const mean = new Float64Array(d);
  const sd = new Float64Array(d);
  const x = Float64Array.from(mode);
  const top = target.logPosterior(mode);
  let evaluations = 1;
  for (let i = 0; i < d; i++) {
    const offsets: number[] = [0];
    const values: number[] = [0];
    for (const side of [-1, 1]) {
      for (const c of GRID_OFFSETS) {
        x[i] = mode[i] + side * c * scales[i];
        const drop = target.logPosterior(x) - top;
        evaluations++;
        offsets.push(side * c * scales[i]);
        values.push(Number.isFinite(drop) ? drop : -Infinity);
        if (!(drop > -GRID_DROP)) break;
      }
    }
    x[i] = mode[i];
    const order = offsets.map((_, k) => k).sort((a, b) => offsets[a] - offsets[b]);
    const t = order.map((k) => offsets[k]);
    const f = order.map((k) => values[k]);
    let mass = 0;
    let first = 0;
    let second = 0;
    for (let k = 1; k < t.length; k++) {
      const h = (t[k] - t[k - 1]) / SUBDIVISIONS;
      for (let j = 0; j < SUBDIVISIONS; j++) {
        const u = (j + 0.5) / SUBDIVISIONS;
        const at = t[k - 1] + (j + 0.5) * h;
        // -Infinity at an end (outside the support) leaves that step's density at 0.
        const logDensity = f[k - 1] === -Infinity || f[k] === -Infinity ? -Infinity : f[k - 1] + u * (f[k] - f[k - 1]);
        const p = Math.exp(logDensity) * h;
        mass += p;
        first += p * at;
        second += p * at * at;
      }
    }
    const m = first / mass;
    mean[i] = mode[i] + m;
    sd[i] = Math.sqrt(Math.max(0, second / mass - m * m));
  }
  return { mean, sd, evaluations };
}

/** A Laplace covariance widened to the measured conditional widths, and the proposal centre. */
export interface WidenedCovariance {
  readonly covariance: Float64Array;
  /** The mode moved to the conditional means (`shift`), or the mode. */
  readonly location: Float64Array;
  /** max(1, measured conditional sd / Laplace conditional sd) per coordinate. */
  readonly factors: Float64Array;
  readonly evaluations: number;
}

/**
 * The Laplace covariance C (row-major d x d) with each coordinate's scale widened to its conditional width
 * on a grid ({@link conditionalWidths}): C'_ij = r_i r_j C_ij with r_i = max(1, sd_i / s_i), s_i = 1 / sqrt((C^-1)_ii)
 * the Laplace conditional sd, so the correlations stay the Laplace ones and no direction narrows. With
 * `shift`, the location moves to the conditional means (a skewed conditional's mass lies off the mode).
 * Undefined when C is not positive definite.
 */
export function widenedToConditionals(target: PosteriorTarget, mode: Float64Array, covariance: Float64Array, shift = false): WidenedCovariance | undefined {
  const d = target.dimension;
  const factor = choleskyFactor(covariance, d);
  if (factor === undefined) return undefined;
  const precision = inverseFromCholesky(factor, d);
  const scales = Float64Array.from({ length: d }, (_, i) => 1 / Math.sqrt(precision[i * d + i]));
  const widths = conditionalWidths(target, mode, scales);
  const factors = Float64Array.from(scales, (s, i) => (Number.isFinite(widths.sd[i]) ? Math.max(1, widths.sd[i] / s) : 1));
  const widened = Float64Array.from(covariance, (c, k) => c * factors[Math.floor(k / d)] * factors[k % d]);
  const location = shift ? Float64Array.from(widths.mean, (m, i) => (Number.isFinite(m) ? m : mode[i])) : Float64Array.from(mode);
  return { covariance: widened, location, factors, evaluations: widths.evaluations };
}
