import { FactorizationError } from "./factorization-error.js";
import type { SemiseparableForm } from "./semiseparable-form.js";
import { generalLoop } from "./semiseparable-likelihood.js";
import { initialScalars, RECURSION_CHUNK, recursionTotals, unrolledRecursion, type BandScaling, type RecursionTotals } from "./unrolled-recursion.js";

const HALF_LOG_TWO_PI = 0.5 * Math.log(2 * Math.PI);

/**
 * The semiseparable log-likelihood log L0(r; n) of per-band scaled data, the scaling done inside the
 * recursion's loop (no pass before it, no N-sized scratch):
 *
 *     r_k = (y_k - shift_b) inverse_b,   n_k = (v_k + extra_b) inverse_b^2,   b = band[k].
 *
 * For a process seen in several bands with amplitudes a_b and means m_b (MultiBandProcess in src/gp),
 * inverse = 1 / a, shift = m, extra = jitter^2: since a_i a_j k + N = D (K0 + D^-1 N D^-1) D with
 * D = diag(a), log L = log L0 - sum_k log |a_b(k)|. The operations are those of scaling the arrays first
 * and calling `semiseparableLogLikelihood`, in the same order, so both give bit-identical results
 * (test/linalg/band-scaled-likelihood.test.ts).
 *
 * @param time sorted times of the points (every band's, in joint order)
 * @param noiseVariance each point's squared error, before `extra`
 * @param values each point's value
 * @param options `unrolled: false` runs the general loop on scaled copies (for tests; the same result)
 * @throws FactorizationError when the covariance is not positive definite
 */
export function bandScaledLogLikelihood(
  form: SemiseparableForm,
  time: ArrayLike<number>,
  noiseVariance: ArrayLike<number>,
  values: ArrayLike<number>,
  scaling: BandScaling,
  options: { readonly unrolled?: boolean } = {},
): number {
  const n = time.length;
  const advance = options.unrolled === false ? undefined : unrolledRecursion(form.blocks, { scaling: "bands" });
  let totals: RecursionTotals;
  if (advance) {
    const r = form.observation.length;
    const state = new Float64Array(r * r + 2 * r);
    const scalars = initialScalars();
    for (let begin = 0; begin < n; begin += RECURSION_CHUNK) {
      advance(form.blocks, form.observation, form.projection, state, scalars, time, noiseVariance, values, 0, begin, Math.min(n, begin + RECURSION_CHUNK), undefined, scaling);
    }
    totals = recursionTotals(scalars);
  } else {
    // No written-out recursion (a product of kernels, or no run-time compilation): scale first, then the general loop.
    const noise = new Float64Array(n);
    const residual = new Float64Array(n);
    for (let k = 0; k < n; k++) {
      const b = scaling.band[k];
      const w = scaling.inverse[b];
      residual[k] = (values[k] - scaling.shift[b]) * w;
      noise[k] = (noiseVariance[k] + scaling.extra[b]) * w * w;
    }
    totals = generalLoop(form, time, noise, residual, 0);
  }
  const logLikelihood = -0.5 * (totals.quadratic + totals.logDeterminant) - n * HALF_LOG_TWO_PI;
  if (!(logLikelihood > -Infinity && logLikelihood < Infinity)) throw new FactorizationError(n - 1, NaN);
  return logLikelihood;
}
