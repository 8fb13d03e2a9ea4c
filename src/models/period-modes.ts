import { findMaximumPosterior, unconstrainedPosterior, type PhysicalLikelihood } from "../inference/index.js";
import { laplaceLogEvidence } from "./laplace-evidence.js";
import type { LightCurveModel } from "./light-curve-model.js";

/** One local maximum of the posterior in the period. */
export interface PeriodMode {
  readonly period: number;
  /** ln posterior (unconstrained, with Jacobian) at the mode. */
  readonly logPosterior: number;
  /** Laplace-approximated posterior probability of the mode among those found. */
  readonly probability: number;
  /** The mode's parameters by name. */
  readonly parameters: Readonly<Record<string, number>>;
}

/**
 * Finds the posterior's modes in the period among the classic aliases of a periodogram peak: P, P/2 and
 * 2P (a spotted star with two spot groups shows half its period; common practice), by maximising from
 * each, merging maxima within 2% in period, and weighting each by its Laplace evidence. Returns the modes
 * most probable first.
 */
export function findPeriodModes(model: LightCurveModel, likelihood: PhysicalLikelihood, periodGuess: number): PeriodMode[] {
  const space = model.space;
  const target = unconstrainedPosterior(space, likelihood, { jacobian: true });
  const periodIndex = space.names.indexOf("period");
  const prior = space.free.find((p) => p.name === "period")!.prior;
  const candidates = [periodGuess, periodGuess / 2, periodGuess * 2].filter((p) => p > prior.lower && p < prior.upper);
  const found: { period: number; logPosterior: number; logEvidence: number; x: Float64Array }[] = [];
  for (const period of candidates) {
    const start = space.toUnconstrained(space.physicalFromRecord({ ...model.initialGuess, period }));
    const best = findMaximumPosterior(target, { starts: [start] });
    if (!Number.isFinite(best.logPosterior)) continue;
    const physical = space.toPhysical(best.x);
    const modePeriod = physical[periodIndex];
    const evidence = laplaceLogEvidence(target, best.x);
    if (!evidence.positiveDefinite) continue;
    const twin = found.find((m) => Math.abs(m.period / modePeriod - 1) < 0.02);
    if (twin) {
      if (best.logPosterior > twin.logPosterior) Object.assign(twin, { period: modePeriod, logPosterior: best.logPosterior, logEvidence: evidence.logEvidence, x: best.x });
      continue;
    }
    found.push({ period: modePeriod, logPosterior: best.logPosterior, logEvidence: evidence.logEvidence, x: best.x });
  }
  if (found.length === 0) return [];
  const top = found.reduce((best, m) => Math.max(best, m.logEvidence), -Infinity);
  const total = found.reduce((sum, m) => sum + Math.exp(m.logEvidence - top), 0);
  return found
    .map((m) => ({
      period: m.period,
      logPosterior: m.logPosterior,
      probability: Math.exp(m.logEvidence - top) / total,
      parameters: space.recordFromPhysical(space.toPhysical(m.x)),
    }))
    .sort((a, b) => b.probability - a.probability);
}
