import { findMaximumPosterior, startingPoints, unconstrainedPosterior } from "../inference/index.js";
import type { LightCurve } from "../lightcurve/light-curve.js";
import { createRng } from "../random/rng.js";
import { summarizeLightCurve } from "./data-summary.js";
import { buildModel, modelLikelihood } from "./light-curve-model.js";

/** The damped random walk that fits a light curve best: its parameters at the maximum a posteriori. */
export interface BestDampedRandomWalk {
  readonly sigma: number;
  readonly tau: number;
  readonly mean: number;
  /** ln L at that point, for reference. */
  readonly logLikelihood: number;
}

/**
 * The maximum a posteriori of the `drw` model (the same data-driven priors as `fit --model drw`) of a
 * light curve, from four starts (the model's first guess and three prior draws, seeded by `seed`): the
 * DRW a richer model (CARMA) is read against, in the report's power-spectrum figure. A few hundred DRW
 * evaluations, O(N) each.
 */
export function bestDampedRandomWalk(lightCurve: LightCurve, seed: number | string): BestDampedRandomWalk {
  const model = buildModel("drw", summarizeLightCurve(lightCurve));
  const likelihood = modelLikelihood(model, lightCurve);
  const target = unconstrainedPosterior(model.space, likelihood, { jacobian: false });
  const starts = startingPoints(model.space, 4, createRng(`best-drw:${seed}`), model.initialGuess);
  const best = findMaximumPosterior(target, { starts });
  const physical = model.space.toPhysical(best.x);
  const values = model.space.recordFromPhysical(physical);
  return { sigma: values.sigma ?? NaN, tau: values.tau ?? NaN, mean: values.mean ?? NaN, logLikelihood: likelihood.logLikelihood(physical) };
}
