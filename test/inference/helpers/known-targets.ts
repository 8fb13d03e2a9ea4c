import { Matrix, inverse } from "ml-matrix";
import normalCdf from "@stdlib/stats/base/dists/normal/cdf";
import normalPdf from "@stdlib/stats/base/dists/normal/pdf";
import normalQuantile from "@stdlib/stats/base/dists/normal/quantile";
import type { DifferentiablePosteriorTarget } from "../../../src/inference/posterior-target.js";
import { simpsonRule } from "./simpson-rule.js";

/** A sampling target whose marginal quantiles and densities are known exactly. */
export interface KnownTarget {
  readonly name: string;
  readonly density: DifferentiablePosteriorTarget;
  /** Exact p-quantile of coordinate i. */
  quantile(i: number, p: number): number;
  /** Exact marginal density of coordinate i at x. */
  marginalDensity(i: number, x: number): number;
}

/** Inverts a monotone CDF by bisection to 1e-12 (test reference). */
export function invertCdf(cdf: (x: number) => number, p: number, lo: number, hi: number): number {
  for (let k = 0; k < 200 && hi - lo > 1e-12 * Math.max(1, Math.abs(lo)); k++) {
    const mid = 0.5 * (lo + hi);
    if (cdf(mid) < p) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/**
 * A correlated 5-D Gaussian: means mu, standard deviations s, correlations 0.7^|i-j|. The precision
 * matrix is ml-matrix's inverse of the covariance; marginals are N(mu_i, s_i^2) (stdlib normal).
 */
export function correlatedGaussian(): KnownTarget {
  const mu = [1, -2, 0.5, 3, 0];
  const s = [1, 2, 0.5, 3, 1.5];
  const d = mu.length;
  const covariance = new Matrix(d, d);
  for (let i = 0; i < d; i++) for (let j = 0; j < d; j++) covariance.set(i, j, s[i] * s[j] * 0.7 ** Math.abs(i - j));
  const precision = inverse(covariance).to2DArray();
  const residual = new Float64Array(d);
  const logPosteriorAndGradient = (x: Float64Array, g: Float64Array): number => {
    for (let i = 0; i < d; i++) residual[i] = x[i] - mu[i];
    let q = 0;
    for (let i = 0; i < d; i++) {
      let pi = 0;
      for (let j = 0; j < d; j++) pi += precision[i][j] * residual[j];
      g[i] = -pi;
      q += residual[i] * pi;
    }
    return -0.5 * q;
  };
  const scratch = new Float64Array(d);
  return {
    name: "correlated 5-D Gaussian",
    density: { dimension: d, logPosterior: (x) => logPosteriorAndGradient(x, scratch), logPosteriorAndGradient },
    quantile: (i, p) => normalQuantile(p, mu[i], s[i]),
    marginalDensity: (i, x) => normalPdf(x, mu[i], s[i]),
  };
}

/**
 * A banana: x1 ~ N(0, 3^2), x2 | x1 ~ N(b (x1^2 - 9), 1) with b = 0.15 by default, the twisted Gaussian of Haario,
 * Saksman & Tamminen 1999 (Comput. Stat. 14, 375) with variance 9 in x1. The x1 marginal is normal; the
 * x2 marginal is F(q) = integral N(x1; 0, 3) Phi(q - b (x1^2 - 9)) dx1, by Simpson's rule with stdlib's
 * normal pdf and cdf.
 */
export function banana(b = 0.15): KnownTarget {

  const shift = (x1: number): number => b * (x1 * x1 - 9);
  const logPosteriorAndGradient = (x: Float64Array, g: Float64Array): number => {
    const r = x[1] - shift(x[0]);
    g[0] = -x[0] / 9 + r * 2 * b * x[0];
    g[1] = -r;
    return -(x[0] * x[0]) / 18 - 0.5 * r * r;
  };
  const scratch = new Float64Array(2);
  const x2Cdf = (q: number): number => simpsonRule((x1) => normalPdf(x1, 0, 3) * normalCdf(q - shift(x1), 0, 1), -30, 30, 6000);
  const x2Pdf = (q: number): number => simpsonRule((x1) => normalPdf(x1, 0, 3) * normalPdf(q - shift(x1), 0, 1), -30, 30, 6000);
  return {
    name: "banana",
    density: { dimension: 2, logPosterior: (x) => logPosteriorAndGradient(x, scratch), logPosteriorAndGradient },
    quantile: (i, p) => (i === 0 ? normalQuantile(p, 0, 3) : invertCdf(x2Cdf, p, -20, 60)),
    marginalDensity: (i, x) => (i === 0 ? normalPdf(x, 0, 3) : x2Pdf(x)),
  };
}

/**
 * A two-mode mixture in 2-D: 0.35 N((-2, -1), diag(0.7^2, 0.8^2)) + 0.65 N((2, 1), diag(0.9^2, 0.6^2)).
 * Marginals are two-component normal mixtures (stdlib normal pdf and cdf), quantiles by bisection.
 */
export function twoModeMixture(): KnownTarget {
  const weights = [0.35, 0.65];
  const means = [[-2, -1], [2, 1]];
  const sds = [[0.7, 0.8], [0.9, 0.6]];
  const logWeights = weights.map(Math.log);
  const logPosteriorAndGradient = (x: Float64Array, g: Float64Array): number => {
    const terms = [0, 1].map((k) => {
      let t = logWeights[k];
      for (let i = 0; i < 2; i++) {
        const z = (x[i] - means[k][i]) / sds[k][i];
        t += -0.5 * z * z - Math.log(sds[k][i]);
      }
      return t;
    });
    const m = Math.max(terms[0], terms[1]);
    const total = m + Math.log(Math.exp(terms[0] - m) + Math.exp(terms[1] - m));
    g.fill(0);
    for (let k = 0; k < 2; k++) {
      const responsibility = Math.exp(terms[k] - total);
      for (let i = 0; i < 2; i++) g[i] = g[i] - (responsibility * (x[i] - means[k][i])) / sds[k][i] ** 2;
    }
    return total - Math.log(2 * Math.PI);
  };
  const scratch = new Float64Array(2);
  const cdf = (i: number, q: number): number =>
    weights[0] * normalCdf(q, means[0][i], sds[0][i]) + weights[1] * normalCdf(q, means[1][i], sds[1][i]);
  return {
    name: "two-mode mixture",
    density: { dimension: 2, logPosterior: (x) => logPosteriorAndGradient(x, scratch), logPosteriorAndGradient },
    quantile: (i, p) => invertCdf((q) => cdf(i, q), p, -20, 20),
    marginalDensity: (i, x) =>
      weights[0] * normalPdf(x, means[0][i], sds[0][i]) + weights[1] * normalPdf(x, means[1][i], sds[1][i]),
  };
}
