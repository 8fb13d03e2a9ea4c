/**
 * The distribution functions Horologium takes from @stdlib/stats, imported by explicit file path so that
 * they load under Node's ES-module loader as well as in bundlers (see src/types/stdlib-distributions.d.ts).
 * Signatures follow @stdlib: (x, ...parameters) for densities and distribution functions, (p, ...) for quantiles.
 */
import halfNormalLogPdfFunction from "@stdlib/stats/base/dists/halfnormal/logpdf/lib/index.js";
import logNormalCdfFunction from "@stdlib/stats/base/dists/lognormal/cdf/lib/index.js";
import logNormalLogPdfFunction from "@stdlib/stats/base/dists/lognormal/logpdf/lib/index.js";
import logNormalQuantileFunction from "@stdlib/stats/base/dists/lognormal/quantile/lib/index.js";
import normalCdfFunction from "@stdlib/stats/base/dists/normal/cdf/lib/index.js";
import normalLogPdfFunction from "@stdlib/stats/base/dists/normal/logpdf/lib/index.js";
import normalQuantileFunction from "@stdlib/stats/base/dists/normal/quantile/lib/index.js";
import uniformCdfFunction from "@stdlib/stats/base/dists/uniform/cdf/lib/index.js";
import uniformLogPdfFunction from "@stdlib/stats/base/dists/uniform/logpdf/lib/index.js";
import uniformQuantileFunction from "@stdlib/stats/base/dists/uniform/quantile/lib/index.js";

/** Normal CDF P(X <= x) for N(mu, sigma^2). */
export const normalCdf: (x: number, mu: number, sigma: number) => number = normalCdfFunction;
/** Normal ln density. */
export const normalLogPdf: (x: number, mu: number, sigma: number) => number = normalLogPdfFunction;
/** Normal quantile. */
export const normalQuantile: (p: number, mu: number, sigma: number) => number = normalQuantileFunction;
/** Half-normal ln density with scale sigma. */
export const halfNormalLogPdf: (x: number, sigma: number) => number = halfNormalLogPdfFunction;
/** Log-normal CDF with log-mean mu and log-sd sigma. */
export const logNormalCdf: (x: number, mu: number, sigma: number) => number = logNormalCdfFunction;
/** Log-normal ln density. */
export const logNormalLogPdf: (x: number, mu: number, sigma: number) => number = logNormalLogPdfFunction;
/** Log-normal quantile. */
export const logNormalQuantile: (p: number, mu: number, sigma: number) => number = logNormalQuantileFunction;
/** Uniform CDF on [a, b]. */
export const uniformCdf: (x: number, a: number, b: number) => number = uniformCdfFunction;
/** Uniform ln density on [a, b]. */
export const uniformLogPdf: (x: number, a: number, b: number) => number = uniformLogPdfFunction;
/** Uniform quantile on [a, b]. */
export const uniformQuantile: (p: number, a: number, b: number) => number = uniformQuantileFunction;

import gammaCdfFunction from "@stdlib/stats/base/dists/gamma/cdf/lib/index.js";
/** Gamma CDF with shape alpha and rate beta. */
export const gammaCdf: (x: number, alpha: number, beta: number) => number = gammaCdfFunction;

import studentTLogPdfFunction from "@stdlib/stats/base/dists/t/logpdf/lib/index.js";
/** Student-t ln density with nu degrees of freedom (location 0, scale 1). */
export const studentTLogPdf: (x: number, nu: number) => number = studentTLogPdfFunction;
