import { normalCdf } from "../inference/distribution-functions.js";
import type { LightCurve } from "../lightcurve/light-curve.js";
import type { LightCurveModel } from "./light-curve-model.js";

/** The posterior-predictive distribution of the latent light curve at requested times. */
export interface PredictiveCurve {
  readonly time: Float64Array;
  readonly mean: Float64Array;
  readonly sd: Float64Array;
  readonly lower95: Float64Array;
  readonly upper95: Float64Array;
}

/**
 * The posterior-predictive distribution of the latent (noise-free) light curve at `times`: for each posterior
 * draw theta_k the Gaussian process gives N(mu_k(t), s_k(t)^2); the predictive is their equal-weight mixture.
 * Its mean is the average of mu_k, its variance the average of s_k^2 plus the variance of mu_k (law of total
 * variance), and the 95% band is the 2.5% and 97.5% quantiles of the mixture, found by bisection on the
 * mixture's distribution function, so parameter uncertainty widens the band honestly.
 *
 * @param rows posterior draws, each a physical vector in `model.space.names` order
 */
export function posteriorPredictive(
  model: LightCurveModel,
  lightCurve: LightCurve,
  rows: readonly ArrayLike<number>[],
  times: ArrayLike<number>,
): PredictiveCurve {
  if (rows.length === 0) throw new RangeError("posterior predictive: no posterior draws");
  return predictiveMixture(
    times,
    rows.map((row) => model.processAt(row, lightCurve).given(lightCurve.value).at(times)),
  );
}

/**
 * The equal-weight mixture of Gaussian predictions N(mu_k(t), s_k(t)^2), one per posterior draw: mean,
 * sd by the law of total variance, and the 2.5% and 97.5% quantiles of the mixture (see
 * {@link posteriorPredictive}).
 */
export function predictiveMixture(
  times: ArrayLike<number>,
  predictions: readonly { readonly mean: ArrayLike<number>; readonly variance: ArrayLike<number> }[],
): PredictiveCurve {
  const m = times.length;
  const k = predictions.length;
  if (k === 0) throw new RangeError("posterior predictive: no posterior draws");
  const means = new Float64Array(k * m);
  const sds = new Float64Array(k * m);
  predictions.forEach((prediction, j) => {
    for (let i = 0; i < m; i++) {
      means[j * m + i] = prediction.mean[i];
      sds[j * m + i] = Math.sqrt(prediction.variance[i]);
    }
  });
  const mean = new Float64Array(m);
  const sd = new Float64Array(m);
  const lower95 = new Float64Array(m);
  const upper95 = new Float64Array(m);
  for (let i = 0; i < m; i++) {
    let mu = 0;
    let second = 0;
    for (let j = 0; j < k; j++) {
      const a = means[j * m + i];
      const s = sds[j * m + i];
      mu += a;
      second += s * s + a * a;
    }
    mu /= k;
    mean[i] = mu;
    sd[i] = Math.sqrt(Math.max(second / k - mu * mu, 0));
    const cdf = (x: number) => {
      let total = 0;
      for (let j = 0; j < k; j++) total += normalCdf(x, means[j * m + i], Math.max(sds[j * m + i], 1e-300));
      return total / k;
    };
    lower95[i] = mixtureQuantile(cdf, 0.025, mu, sd[i]);
    upper95[i] = mixtureQuantile(cdf, 0.975, mu, sd[i]);
  }
  return { time: Float64Array.from(times), mean, sd, lower95, upper95 };
}

/** Bisection for cdf(x) = p, bracketed around the mixture's mean within 10 standard deviations. */
function mixtureQuantile(cdf: (x: number) => number, p: number, centre: number, spread: number): number {
  if (!(spread > 0)) return centre;
  let lo = centre - 10 * spread;
  let hi = centre + 10 * spread;
  for (let iteration = 0; iteration < 60; iteration++) {
    const mid = 0.5 * (lo + hi);
    if (cdf(mid) < p) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}
