import { effectiveSampleSize, studentTProposal, type PosteriorTarget, type StudentTProposal } from "../inference/index.js";
import type { Rng } from "../random/rng.js";
import { canonicalCopy } from "./importance-evidence.js";

/** Draws of one Markov chain (or walker) from the posterior, in the target's coordinates, with their ln p. */
export interface PosteriorChain {
  readonly points: readonly Float64Array[];
  readonly logPosterior: ArrayLike<number>;
}

/** An estimate of ln Z by bridge sampling, with its Monte Carlo standard error. */
export interface BridgeEvidence {
  /** ln Z-hat, the fixed point of the iterative optimal bridge. */
  readonly logEvidence: number;
  /**
   * Monte Carlo standard error of ln Z-hat: the square root of the relative mean-squared error of
   * Z-hat (Fruhwirth-Schnatter 2004, Econometrics Journal 7, 143, eq. 14, from memory), the posterior
   * draws' part divided by their effective sample size (the chains' autocorrelation).
   */
  readonly standardError: number;
  /** Posterior draws in the estimate (the second half of each chain). */
  readonly posteriorDraws: number;
  /** Effective sample size of the bridge function over the posterior draws. */
  readonly posteriorEss: number;
  /** Draws from the proposal. */
  readonly proposalDraws: number;
  /** Iterations of the fixed-point scheme. */
  readonly iterations: number;
}

/** Settings of {@link bridgeLogEvidence}. */
export interface BridgeEvidenceOptions {
  /** Draws from the proposal (default the number of posterior draws in the estimate, at least 1000). */
  readonly proposalDraws?: number;
  /** Degrees of freedom of the Student-t proposal (default 5). */
  readonly degreesOfFreedom?: number;
  /** Relabellings the target is invariant under, as for `importanceLogEvidence`. */
  readonly symmetries?: readonly (readonly number[])[];
}

/**
 * ln Z = ln integral p(u) du by bridge sampling (Meng & Wong 1996, Statistica Sinica 6, 831) from draws
 * of the posterior and of a proposal g: with the optimal bridge function, Z is the fixed point of
 *   r <- [(1/N2) sum_j l2_j / (s1 l2_j + s2 r)] / [(1/N1) sum_i 1 / (s1 l1_i + s2 r)],
 * l1_i = p(u_i) / g(u_i) at the N1 posterior draws u_i, l2_j = p(v_j) / g(v_j) at the N2 proposal draws
 * v_j, s_k = N_k / (N1 + N2) (Meng & Wong 1996, eq. 4.1; the scheme as set out by Gronau et al. 2017,
 * J. Math. Psych. 81, 80). The proposal is a Student-t with the mean and covariance of the first half of
 * each chain; the second halves enter the estimate, so that g does not depend on the draws it is
 * compared with. Both terms of the bridge are bounded (by 1/s1 and 1/s2) whatever the tails of p and g,
 * so the estimate keeps a finite variance where importance sampling from g alone (ratios p / g) would
 * not: a posterior with a flat top, a cliff or a curved ridge that no t at the mode covers, which MCMC
 * follows. `target` must be the unconstrained posterior including the Jacobian (the density the chains
 * sampled). With `symmetries`, the draws are moved into the canonical copy and Z counts every copy, as in
 * `importanceLogEvidence`. The chains must have visited every mode that carries mass: bridge sampling
 * cannot see one they missed.
 *
 * Undefined when fewer than 20 draws reach the estimate or their covariance is singular.
 */
export function bridgeLogEvidence(
  target: PosteriorTarget,
  chains: readonly PosteriorChain[],
  rng: Rng,
  options: BridgeEvidenceOptions = {},
): BridgeEvidence | undefined {
  const d = target.dimension;
  const { folded, fold, logCopies } = canonicalCopy(target, options.symmetries ?? []);
  const fitting: Float64Array[] = [];
  const estimating = chains.map((chain) => {
    const half = Math.floor(chain.points.length / 2);
    for (let r = 0; r < half; r++) fitting.push(fold(chain.points[r] ?? new Float64Array(d)));
    const points = chain.points.slice(half).map(fold);
    const logPosterior = Float64Array.from({ length: points.length }, (_, r) => (chain.logPosterior[half + r] ?? -Infinity) + logCopies);
    return { points, logPosterior };
  });
  const n1 = estimating.reduce((sum, c) => sum + c.points.length, 0);
  if (n1 < 20 || fitting.length < d + 2) return undefined;
  const proposal = momentProposal(fitting, options.degreesOfFreedom ?? 5);
  if (proposal === undefined) return undefined;
  const n2 = Math.max(1000, Math.round(options.proposalDraws ?? n1));
  // ln l1 over chains (kept per chain for the autocorrelation), ln l2 of the proposal's draws.
  const logL1 = estimating.map((c) => Float64Array.from(c.points, (u, r) => (c.logPosterior[r] ?? -Infinity) - proposal.logDensity(u)));
  const logL2 = new Float64Array(n2);
  const v = new Float64Array(d);
  for (let j = 0; j < n2; j++) {
    const logG = proposal.draw(rng, v);
    const logP = folded.logPosterior(v);
    logL2[j] = Number.isNaN(logP) ? -Infinity : logP - logG;
  }
  const s1 = n1 / (n1 + n2);
  const s2 = n2 / (n1 + n2);
  // Work relative to a constant c (the median of ln l1) so that exp never overflows: r = Z / e^c.
  const pooled = Float64Array.from(logL1.flatMap((c) => Array.from(c))).sort();
  const shift = pooled[Math.floor(pooled.length / 2)] ?? 0;
  let logR = 0;
  let iterations = 0;
  for (; iterations < 1000; iterations++) {
    const r = Math.exp(logR);
    let numerator = 0;
    for (const l of logL2) {
      const x = Math.exp(l - shift);
      numerator += x / (s1 * x + s2 * r);
    }
    let denominator = 0;
    for (const chain of logL1) for (const l of chain) denominator += 1 / (s1 * Math.exp(l - shift) + s2 * r);
    const next = Math.log(numerator / n2) - Math.log(denominator / n1);
    const change = Math.abs(next - logR);
    logR = next;
    if (!Number.isFinite(logR)) return undefined;
    if (change < 1e-10) break;
  }
  const r = Math.exp(logR);
  // The relative error of Z-hat: f1 = (p/Z) / (s1 p/Z + s2 g) over the proposal's draws, f2 = g / (s1 p/Z + s2 g)
  // over the posterior's, each term's variance over its squared mean, the posterior's with its ESS.
  const f1 = Float64Array.from(logL2, (l) => {
    const x = Math.exp(l - shift) / r;
    return x / (s1 * x + s2);
  });
  const f2 = logL1.map((chain) => Float64Array.from(chain, (l) => 1 / (s1 * (Math.exp(l - shift) / r) + s2)));
  const pooledF2 = Float64Array.from(f2.flatMap((c) => Array.from(c)));
  const ess = Math.min(n1, effectiveSampleSizeOf(f2, pooledF2.length));
  const relativeSquare = squaredVariation(f1) / n2 + squaredVariation(pooledF2) / ess;
  return {
    logEvidence: shift + logR,
    standardError: Math.sqrt(relativeSquare),
    posteriorDraws: n1,
    posteriorEss: ess,
    proposalDraws: n2,
    iterations,
  };
}

/** The ESS of the chains of f, or the draw count when the ESS is undefined (f constant). */
function effectiveSampleSizeOf(chains: readonly Float64Array[], count: number): number {
  const usable = chains.filter((c) => c.length >= 4);
  const length = usable.reduce((shortest, c) => Math.min(shortest, c.length), Infinity);
  const ess = usable.length > 0 ? effectiveSampleSize(usable.map((c) => c.subarray(c.length - length))) : NaN;
  return Number.isFinite(ess) && ess > 0 ? ess : count;
}

/** Var(x) / mean(x)^2. */
function squaredVariation(x: Float64Array): number {
  let sum = 0;
  for (const v of x) sum += v;
  const mean = sum / x.length;
  let squares = 0;
  for (const v of x) squares += (v - mean) * (v - mean);
  return squares / (x.length - 1) / (mean * mean);
}

/** A Student-t with the mean and covariance of the points, or undefined when that covariance is singular. */
function momentProposal(points: readonly Float64Array[], nu: number): StudentTProposal | undefined {
  const d = points[0]?.length ?? 0;
  const n = points.length;
  const mean = new Float64Array(d);
  for (const x of points) for (let i = 0; i < d; i++) mean[i] = (mean[i] ?? 0) + (x[i] ?? 0) / n;
  const covariance = new Float64Array(d * d);
  for (const x of points)
    for (let i = 0; i < d; i++)
      for (let j = 0; j < d; j++) covariance[i * d + j] = (covariance[i * d + j] ?? 0) + ((x[i] ?? 0) - (mean[i] ?? 0)) * ((x[j] ?? 0) - (mean[j] ?? 0)) / (n - 1);
  try {
    return studentTProposal(mean, covariance, nu);
  } catch (error) {
    if (error instanceof RangeError) return undefined;
    throw error;
  }
}
