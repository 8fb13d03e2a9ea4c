import { chainsAutocorrelationTime } from "./autocorrelation.js";
import { effectiveSampleSize, tailEffectiveSampleSize } from "./effective-sample-size.js";
import { foldAboutMedian, rankNormalize, splitChains } from "./rank-normalization.js";
import { potentialScaleReduction } from "./split-rhat.js";

/** When a run counts as converged. */
export interface ConvergenceCriteria {
  /** Every rank-normalised split R-hat below this (default 1.01, Vehtari et al. 2021, sec. 4.1). */
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

/** Convergence figures of one parameter. */
export interface ParameterDiagnostics {
  readonly rhat: number;
  readonly essBulk: number;
  readonly essTail: number;
  /** Integrated autocorrelation time in iterations (Sokal window, chain-averaged autocorrelation). */
  readonly autocorrTime: number;
  /** Whether the Sokal window fitted inside the chains. */
  readonly autocorrReliable: boolean;
}

/** Convergence figures of a run. */
export interface ConvergenceReport {
  readonly parameters: readonly ParameterDiagnostics[];
  readonly rhatMax: number;
  /** Smallest bulk or tail ESS over the parameters. */
  readonly essMin: number;
  /** Largest autocorrelation time over the parameters, in iterations. */
  readonly autocorrTime: number;
  /** Draws per chain that were assessed. */
  readonly chainLength: number;
  readonly converged: boolean;
  /**
   * How far the run is from meeting the criteria, in [0, 1]: the smallest of essMin / ess and
   * chainLength / (autocorrelationLengths * autocorrTime); 1 only when converged.
   */
  readonly progress: number;
}

const nanMax = (values: number[]): number => values.reduce((m, v) => (Number.isNaN(v) || Number.isNaN(m) ? NaN : Math.max(m, v)), -Infinity);
const nanMin = (values: number[]): number => values.reduce((m, v) => (Number.isNaN(v) || Number.isNaN(m) ? NaN : Math.min(m, v)), Infinity);

/**
 * Assesses convergence from the draws of each parameter (`draws[parameter][chain]`, chains of equal
 * length): the run has converged when, for every parameter, rank-normalised split R-hat is below
 * `rhat`, bulk and tail ESS are at least `ess` (Vehtari et al. 2021, Bayesian Analysis 16, 667), and the
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
  const finish = (converged: boolean): ConvergenceReport => {
    const parameters = draws.map(
      (_, i): ParameterDiagnostics => ({
        rhat: rhat[i]!,
        essBulk: essBulk[i]!,
        essTail: essTail[i]!,
        autocorrTime: tau[i]!,
        autocorrReliable: reliable[i]!,
      }),
    );
    const rhatMax = nanMax(rhat);
    const essMin = nanMin([...essBulk, ...essTail]);
    const autocorrTime = nanMax(tau);
    const lengthRatio = reliable.every((r) => r)
      ? chainLength / (criteria.autocorrelationLengths * Math.max(autocorrTime, 1e-12))
      : 0;
    const ratio = Number.isNaN(essMin) ? Math.min(lengthRatio, 0.5) : Math.min(essMin / criteria.ess, lengthRatio);
    const progress = converged ? 1 : Number.isFinite(ratio) ? Math.max(0, Math.min(0.99, ratio)) : 0;
    return { parameters, rhatMax, essMin, autocorrTime, chainLength, converged, progress };
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
    if (!(rhat[i]! < criteria.rhat)) ok = false;
  });
  if (quick && !ok) return finish(false);

  draws.forEach((chains, i) => {
    essBulk[i] = effectiveSampleSize(bulkDraws[i]!);
    if (!(essBulk[i]! >= criteria.ess)) ok = false;
  });
  if (quick && !ok) return finish(false);

  draws.forEach((chains, i) => {
    essTail[i] = tailEffectiveSampleSize(chains);
    if (!(essTail[i]! >= criteria.ess)) ok = false;
  });
  return finish(ok);
}
