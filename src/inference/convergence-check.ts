import { chainsAutocorrelationTime } from "./autocorrelation.js";
import { effectiveSampleSize, tailEffectiveSampleSize } from "./effective-sample-size.js";
import { foldAboutMedian, rankNormalize, splitChains } from "./rank-normalization.js";
import { potentialScaleReduction } from "./split-rhat.js";

/** When a run counts as converged. */
export interface ConvergenceCriteria {
  /**
   * Every rank-normalised split R-hat below this for four chains (default 1.01, Vehtari et al. 2021,
   * sec. 4.1); with more chains the bound applied is {@link rhatThreshold}, the same demand on the
   * effective sample size.
   */
  readonly rhat: number;
  /** Every bulk and tail ESS at least this (default 400, Vehtari et al. 2021, sec. 4.2). */
  readonly ess: number;
  /** Chains at least this many integrated autocorrelation times long (default 50, common practice). */
  readonly autocorrelationLengths: number;
  /** Sokal's window constant c (default 5). */
  readonly sokalWindow: number;
}

/** The defaults of {@link ConvergenceCriteria}. */
export const DEFAULT_CONVERGENCE_CRITERIA: ConvergenceCriteria = Object.freeze({
  rhat: 1.01,
  ess: 400,
  autocorrelationLengths: 50,
  sokalWindow: 5,
});

/** The number of chains for which `ConvergenceCriteria.rhat` is stated: Vehtari et al. 2021 run four. */
export const RHAT_REFERENCE_CHAINS = 4;

/**
 * The R-hat bound applied to `chains` chains, from the bound `rhat` stated for four:
 * sqrt(1 + (rhat^2 - 1) chains / 4).
 *
 * Why it grows with the chains: for M well-mixed split chains of n draws, R-hat^2 = (n - 1) / n +
 * B / (n W) with B / n the variance of the chain means, about tau W / n, so R-hat^2 - 1 ~ M / ESS
 * (Vats & Knudson 2021, Statistical Science 36, 518, from memory; ESS = M n / tau). A fixed 1.01 thus
 * asks for ESS ~ 50 M: about 400 with four chains (eight halves), which is why it pairs with ESS >= 400,
 * but 1600 with sixteen ensemble walkers, four times the ESS criterion, spent only on averaging down
 * R-hat's own noise. Scaling keeps the demand at the four-chain level, while chains that disagree (stuck
 * walkers, unfinished burn-in) add a between-chain term that does not shrink with n and still fail it.
 *
 * @example rhatThreshold(1.01, 4) // 1.01; rhatThreshold(1.01, 16) // 1.0394
 */
export function rhatThreshold(rhat: number, chains: number): number {
  if (chains <= RHAT_REFERENCE_CHAINS) return rhat;
  return Math.sqrt(1 + ((rhat * rhat - 1) * chains) / RHAT_REFERENCE_CHAINS);
}

/** Convergence figures of one parameter. */
export interface ParameterDiagnostics {
  readonly rhat: number;
  readonly essBulk: number;
  readonly essTail: number;
  /** Integrated autocorrelation time in iterations (Sokal window, chain-averaged autocorrelation). */
  readonly autocorrelationTime: number;
  /** Whether the Sokal window fitted inside the chains. */
  readonly autocorrReliable: boolean;
}

/** Convergence figures of a run. */
export interface ConvergenceReport {
  readonly parameters: readonly ParameterDiagnostics[];
  readonly rhatMax: number;
  /** The R-hat bound applied, {@link rhatThreshold} for the number of chains. */
  readonly rhatThreshold: number;
  /** Smallest bulk or tail ESS over the parameters. */
  readonly essMin: number;
  /** Largest autocorrelation time over the parameters, in iterations. */
  readonly autocorrelationTime: number;
  /** Draws per chain that were assessed. */
  readonly chainLength: number;
  readonly converged: boolean;
  /**
   * How far the run is from meeting the criteria, in [0, 1]: the smallest of essMin / ess and
   * chainLength / (autocorrelationLengths * autocorrelationTime); 1 only when converged.
   */
  readonly progress: number;
}

const nanMax = (values: number[]): number => values.reduce((m, v) => (Number.isNaN(v) || Number.isNaN(m) ? NaN : Math.max(m, v)), -Infinity);
const nanMin = (values: number[]): number => values.reduce((m, v) => (Number.isNaN(v) || Number.isNaN(m) ? NaN : Math.min(m, v)), Infinity);

/**
 * Assesses convergence from the draws of each parameter (`draws[parameter][chain]`, chains of equal
 * length): the run has converged when, for every parameter, rank-normalised split R-hat is below
 * {@link rhatThreshold}(`rhat`, chains), bulk and tail ESS are at least `ess` (Vehtari et al. 2021, Bayesian Analysis 16, 667), and the
 * chains are at least `autocorrelationLengths` integrated autocorrelation times long, with the
 * autocorrelation time from Sokal's adaptive window. Any NaN (for example constant draws) means not
 * converged.
 *
 * With `stopAtFirstFailure` the criteria are tested from the cheapest (autocorrelation time, then
 * R-hat, then ESS) and the rest are skipped, left NaN, once one fails; the run loop uses this so that
 * frequent checks stay cheap.
 */
export function assessConvergence(
  draws: readonly (readonly Float64Array[])[],
  criteria: ConvergenceCriteria = DEFAULT_CONVERGENCE_CRITERIA,
  options: { stopAtFirstFailure?: boolean } = {},
): ConvergenceReport {
  const chainLength = draws[0]?.[0]?.length ?? 0;
  const quick = options.stopAtFirstFailure ?? false;
  const p = draws.length;
  const rhat = new Array<number>(p).fill(NaN);
  const essBulk = new Array<number>(p).fill(NaN);
  const essTail = new Array<number>(p).fill(NaN);
  const tau = new Array<number>(p).fill(NaN);
  const reliable = new Array<boolean>(p).fill(false);
  const rhatBound = rhatThreshold(criteria.rhat, draws[0]?.length ?? 0);
  const finish = (converged: boolean): ConvergenceReport => {
    const parameters = draws.map(
      (_, i): ParameterDiagnostics => ({
        rhat: rhat[i],
        essBulk: essBulk[i],
        essTail: essTail[i],
        autocorrelationTime: tau[i],
        autocorrReliable: reliable[i],
      }),
    );
    const rhatMax = nanMax(rhat);
    const essMin = nanMin([...essBulk, ...essTail]);
    const autocorrelationTime = nanMax(tau);
    const lengthRatio = reliable.every((r) => r)
      ? chainLength / (criteria.autocorrelationLengths * Math.max(autocorrelationTime, 1e-12))
      : 0;
    const ratio = Number.isNaN(essMin) ? Math.min(lengthRatio, 0.5) : Math.min(essMin / criteria.ess, lengthRatio);
    const progress = converged ? 1 : Number.isFinite(ratio) ? Math.max(0, Math.min(0.99, ratio)) : 0;
    return { parameters, rhatMax, rhatThreshold: rhatBound, essMin, autocorrelationTime, chainLength, converged, progress };
  };
  if (chainLength < 8) return finish(false);

  let ok = true;
  draws.forEach((chains, i) => {
    const t = chainsAutocorrelationTime(chains, criteria.sokalWindow);
    tau[i] = t.tau;
    reliable[i] = t.reliable;
    if (!(t.reliable && chainLength >= criteria.autocorrelationLengths * t.tau)) ok = false;
  });
  if (quick && !ok) return finish(false);

  const bulkDraws: Float64Array[][] = [];
  draws.forEach((chains, i) => {
    // The same steps as rankNormalizedSplitRhat and bulkEffectiveSampleSize, sharing the ranking.
    const split = splitChains(chains);
    const bulk = rankNormalize(split);
    bulkDraws.push(bulk);
    const folded = rankNormalize(foldAboutMedian(split));
    rhat[i] = Math.max(potentialScaleReduction(bulk), potentialScaleReduction(folded));
    if (!(rhat[i] < rhatBound)) ok = false;
  });
  if (quick && !ok) return finish(false);

  draws.forEach((chains, i) => {
    essBulk[i] = effectiveSampleSize(bulkDraws[i]);
    if (!(essBulk[i] >= criteria.ess)) ok = false;
  });
  if (quick && !ok) return finish(false);

  draws.forEach((chains, i) => {
    essTail[i] = tailEffectiveSampleSize(chains);
    if (!(essTail[i] >= criteria.ess)) ok = false;
  });
  return finish(ok);
}
