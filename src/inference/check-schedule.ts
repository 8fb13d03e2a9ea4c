import type { ConvergenceCriteria, ConvergenceReport } from "./convergence-check.js";

/** The most the kept draws may grow between two checks: extrapolations beyond this are not trusted. */
export const MAX_CHECK_GROWTH = 2;

/**
 * How far the kept draws should grow before the next convergence check, after a check that failed: a
 * factor in [minimumGrowth, MAX_CHECK_GROWTH], from extrapolating the first criterion that failed to
 * the length at which it would pass, with the usual scalings in the chain length L at fixed
 * autocorrelation time: ESS proportional to L, (R-hat - 1) proportional to 1 / L (Vehtari et al. 2021,
 * Bayesian Analysis 16, 667: the between-chain term of R-hat^2 - 1 falls as 1 / L), and the required
 * length autocorrelationLengths x tau fixed. 90% of the extrapolated factor is used, so the check lands
 * just before the predicted crossing rather than after it.
 *
 * Checks cost O(draws log draws); a fixed growth factor makes their total about 1 / (1 - 1 / growth) times
 * the last check, most of it spent on checks that could not have passed. Only the schedule changes: every
 * run still stops at a check that passed all criteria. The schedule depends on the draws alone, never on
 * the clock, so a seed still fixes where the run stops.
 */
export function checkGrowthAfter(report: ConvergenceReport, criteria: ConvergenceCriteria, minimumGrowth: number): number {
  const factor = extrapolatedFactor(report, criteria);
  if (!Number.isFinite(factor)) return MAX_CHECK_GROWTH;
  return Math.min(MAX_CHECK_GROWTH, Math.max(minimumGrowth, 0.9 * factor));
}

function extrapolatedFactor(report: ConvergenceReport, criteria: ConvergenceCriteria): number {
  const { parameters, chainLength } = report;
  if (parameters.some((p) => !p.autocorrReliable)) return MAX_CHECK_GROWTH;
  const neededLength = criteria.autocorrelationLengths * report.autocorrelationTime;
  if (!(chainLength >= neededLength)) return neededLength / chainLength;
  if (!(report.rhatMax < report.rhatThreshold)) return (report.rhatMax - 1) / (report.rhatThreshold - 1);
  if (!(report.essMin >= criteria.ess)) return criteria.ess / report.essMin;
  return 1;
}
