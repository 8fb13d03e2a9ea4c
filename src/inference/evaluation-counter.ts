import type { PosteriorTarget } from "./posterior-target.js";

/**
 * Running tally of how often a target was evaluated. Values and gradients are counted apart because
 * a gradient costs several forward passes of the likelihood (see `DEFAULT_GRADIENT_COST`).
 */
export interface EvaluationCounts {
  /** Calls that computed the log density only. */
  values: number;
  /** Calls that computed the log density together with its gradient. */
  gradients: number;
}

/** A target wrapped so that every evaluation is counted. */
export interface CountedPosteriorTarget extends PosteriorTarget {
  readonly counts: EvaluationCounts;
}

/**
 * Wraps a target so that its evaluations are tallied in `counts`. The wrapper owns its tally, so two
 * runs on the same target do not share counts.
 */
export function countEvaluations(target: PosteriorTarget): CountedPosteriorTarget {
  const counts: EvaluationCounts = { values: 0, gradients: 0 };
  const gradientFn = target.logPosteriorAndGradient;
  const counted: CountedPosteriorTarget = {
    dimension: target.dimension,
    counts,
    logPosterior(x: Float64Array): number {
      counts.values++;
      return target.logPosterior(x);
    },
  };
  if (gradientFn !== undefined) {
    counted.logPosteriorAndGradient = (x: Float64Array, gradientOut: Float64Array): number => {
      counts.gradients++;
      return gradientFn.call(target, x, gradientOut);
    };
  }
  return counted;
}

/**
 * Cost of the evaluations in units of one log-likelihood evaluation:
 * values + gradientCost * gradients, where a value-and-gradient call costs `gradientCost` forward passes.
 */
export function evaluationCost(counts: EvaluationCounts, gradientCost: number): number {
  return counts.values + gradientCost * counts.gradients;
}
