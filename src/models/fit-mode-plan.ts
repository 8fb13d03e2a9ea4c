import type { PhysicalLikelihood } from "../inference/index.js";
import type { LightCurveModel } from "./light-curve-model.js";
import { findPeriodModes, hasDailyWindow, type PeriodMode } from "./period-modes.js";

/** Modes carrying less posterior probability than this are reported but not sampled. */
export const MODE_THRESHOLD = 0.01;

/** Where the sampler starts, and how the runs from each start are pooled. */
export interface ModePlan {
  /** Every period mode found (empty for aperiodic models or without a periodogram peak). */
  readonly modes: readonly PeriodMode[];
  /** One sampler start per sampled mode, or the model's first guess alone. */
  readonly starts: readonly Readonly<Record<string, number>>[];
  /** Share of the pooled draws that comes from each start (sums to 1). */
  readonly weights: readonly number[];
  /** Whether the starts are modes already found by the optimiser (one optimiser start each suffices). */
  readonly startsAtModes: boolean;
}

/**
 * The modes stage of a fit: for a periodic model with a period guess, the period modes at P, P/2 and 2P
 * (and the daily aliases 1 / |1/P +- 1 per day| when the sampling has a one-day window,
 * {@link hasDailyWindow}) of the guess and of each of `otherPeaks` (further periodogram peaks), weighted
 * by their Laplace evidence ({@link findPeriodModes}); every mode with at least
 * {@link MODE_THRESHOLD} of the probability is sampled, with a share of the pooled draws proportional
 * to its probability. Otherwise one start at the model's first guess.
 */
export function planModes(
  model: LightCurveModel,
  likelihood: PhysicalLikelihood,
  periodGuess: number | undefined,
  time: ArrayLike<number>,
  otherPeaks: readonly number[] = [],
): ModePlan {
  const modes = periodGuess !== undefined && model.initialGuess.period !== undefined
    ? findPeriodModes(model, likelihood, model.initialGuess.period, hasDailyWindow(time) ? [1] : [], otherPeaks)
    : [];
  const sampled = modes.filter((m) => m.probability >= MODE_THRESHOLD);
  if (sampled.length === 0) return { modes, starts: [model.initialGuess], weights: [1], startsAtModes: false };
  const total = sampled.reduce((sum, m) => sum + m.probability, 0);
  return {
    modes,
    starts: sampled.map((m) => m.parameters),
    weights: sampled.map((m) => m.probability / total),
    startsAtModes: true,
  };
}
