import type { PosteriorDraws } from "../inference/index.js";
import { childSeed, createRng } from "../random/rng.js";
import type { LightCurveModel } from "./light-curve-model.js";
import { restoreMean, type CollapsedMeanModel } from "./mean-marginal.js";

/** Draws and maximum a posteriori with every parameter of the model, the mean included. */
export interface RestoredPosterior {
  readonly draws: PosteriorDraws;
  readonly maximumPosterior: Readonly<Record<string, number>>;
}

/**
 * The mean-restoration stage of a fit: when the runs sampled with the mean integrated out, each pooled
 * draw gets a mean drawn from its exact conditional posterior ({@link restoreMean}, random stream
 * `childSeed(seed, 200)`), and the maximum a posteriori gets the conditional posterior mean at the
 * maximum. Without a collapsed model both pass through unchanged.
 */
export function restoredPosterior(
  model: LightCurveModel,
  collapsed: CollapsedMeanModel | undefined,
  pooled: PosteriorDraws,
  maximum: Readonly<Record<string, number>>,
  seed: number | string,
): RestoredPosterior {
  if (!collapsed) return { draws: pooled, maximumPosterior: maximum };
  const draws = restoreMean(model, collapsed, pooled, createRng(childSeed(seed, 200)));
  const meanAtMaximum = collapsed.meanPosterior(collapsed.space.physicalFromRecord(maximum)).mean;
  const maximumPosterior = Object.fromEntries(model.space.names.map((name) => [name, name === "mean" ? meanAtMaximum : maximum[name]]));
  return { draws, maximumPosterior };
}
