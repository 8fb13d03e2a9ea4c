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
 * 2P (a spotted star with two spot groups shows half its period; common practice) and, for each
 * frequency f_a of `aliasFrequencies` (1 per day for ground data observed nightly), the aliases
 * 1 / |1/P +- f_a| that the sampling's window puts beside the true peak (VanderPlas 2018, ApJS 236, 16,
 * sect. 6); the same for each period of `otherPeaks` (further periodogram peaks, which a trend or an
 * alias can put below the true period's); by maximising from each, merging maxima within 2% in period,
 * and weighting each by its Laplace evidence. Returns the modes most probable first.
 */
export function findPeriodModes(
  model: LightCurveModel,
  likelihood: PhysicalLikelihood,
  periodGuess: number,
  aliasFrequencies: readonly number[] = [],
  otherPeaks: readonly number[] = [],
): PeriodMode[] {
  const space = model.space;
  const target = unconstrainedPosterior(space, likelihood, { jacobian: true });
  const periodIndex = space.names.indexOf("period");
  const prior = space.free.find((p) => p.name === "period")!.prior;
  const aroundPeak = (peak: number) => [
    peak,
    peak / 2,
    peak * 2,
    ...aliasFrequencies.flatMap((f) => [1 / Math.abs(1 / peak + f), 1 / Math.abs(1 / peak - f)]),
  ];
  const candidates: number[] = [];
  for (const p of [periodGuess, ...otherPeaks].flatMap(aroundPeak)) {
    // A candidate within 2% of one already listed would only find the same maximum again.
    if (Number.isFinite(p) && p > prior.lower && p < prior.upper && !candidates.some((c) => Math.abs(p / c - 1) < 0.02)) candidates.push(p);
  }
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

/** A mode of the pooled draws in the period: where the draws sit, and what share of them. */
export interface DrawnPeriodMode {
  /** Median period of the draws in the mode. */
  readonly period: number;
  /** Share of the pooled draws in the mode (the posterior mass the draws give it). */
  readonly probability: number;
}

/** Relative gap in period that separates two modes of the draws (log-period difference). */
const MODE_GAP = Math.log(1.03);

/**
 * The modes the pooled draws actually sit in: the draws' periods sorted and split wherever two
 * neighbours are more than 3% apart, each group reported by its median and its share of the draws,
 * groups with at least `minimumShare` of them, largest first. A sampler started at one mode may move
 * to another; this is what the summaries are made of, so it is what a result reports.
 */
export function drawnPeriodModes(periods: ArrayLike<number>, minimumShare = 0.01): DrawnPeriodMode[] {
  const n = periods.length;
  if (n === 0) return [];
  const sorted = Float64Array.from(periods).sort();
  const modes: DrawnPeriodMode[] = [];
  let first = 0;
  for (let i = 1; i <= n; i++) {
    if (i === n || Math.log(sorted[i] / sorted[i - 1]) > MODE_GAP) {
      const count = i - first;
      if (count / n >= minimumShare) {
        const mid = first + (count >> 1);
        modes.push({ period: count % 2 ? sorted[mid] : 0.5 * (sorted[mid - 1] + sorted[mid]), probability: count / n });
      }
      first = i;
    }
  }
  return modes.sort((a, b) => b.probability - a.probability);
}

/**
 * Whether the sampling has a strong one-day window, as ground data observed at night do: the spectral
 * window |sum_i exp(2 pi i t_i)| / N at 1 cycle per day above 1/2 (times in days). Then the daily
 * aliases of a period must be weighed too.
 */
export function hasDailyWindow(time: ArrayLike<number>): boolean {
  let c = 0;
  let s = 0;
  const t0 = time[0];
  for (let i = 0; i < time.length; i++) {
    const phase = 2 * Math.PI * (time[i] - t0);
    c += Math.cos(phase);
    s += Math.sin(phase);
  }
  return Math.hypot(c, s) / time.length > 0.5;
}
