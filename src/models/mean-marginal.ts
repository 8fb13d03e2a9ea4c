import { createParameterSpace, type ParameterSpace, type PhysicalLikelihood, type PosteriorDraws } from "../inference/index.js";
import { logLikelihoodOrImpossible } from "./impossible-parameters.js";
import type { MeanPrior } from "../linalg/mean-marginal-likelihood.js";
import type { LightCurve } from "../lightcurve/light-curve.js";
import type { Rng } from "../random/rng.js";
import { processFactory, type LightCurveModel } from "./light-curve-model.js";

/**
 * A model with its constant mean integrated out: the posterior of the other parameters is sampled
 * on its own, and the mean is drawn afterwards from its exact conditional posterior given each draw.
 *
 * Why: the mean of a light curve is poorly determined when the variability timescale is long (the
 * whole light curve may be one excursion), so in (timescale, amplitude, mean) the posterior is a
 * funnel, which an ensemble sampler crosses slowly. Integrated out analytically (the mean enters
 * linearly, Rybicki & Press 1992, ApJ 398, 169) the funnel disappears: for simulated 250-point quasars
 * the damped-random-walk fit needs about five times fewer evaluations (bench/README.md). The joint
 * posterior is unchanged: p(theta, mu | y) = p(theta | y) p(mu | theta, y).
 */
export interface CollapsedMeanModel {
  /** The model's parameter space without the mean. */
  readonly space: ParameterSpace;
  /** log p(y | theta) with the mean integrated over its normal prior, in `space` order. */
  readonly likelihood: PhysicalLikelihood;
  /** The mean's normal prior. */
  readonly prior: MeanPrior;
  /** Posterior of the mean given the other parameters (`space` order) and the data. */
  meanPosterior(physical: ArrayLike<number>): { readonly mean: number; readonly sd: number };
}

/** How many evaluated points' mean posteriors a collapsed model remembers (then it starts afresh). */
const RECENT_MEAN_POSTERIORS = 1 << 16;

/**
 * The collapsed form of a model for one light curve, or undefined when its mean is fixed or its prior
 * is not normal (then the mean is sampled with the rest).
 */
export function collapseMean(model: LightCurveModel, lightCurve: LightCurve): CollapsedMeanModel | undefined {
  const spec = model.space.specs.find((s) => s.name === "mean");
  if (!spec || spec.fixed !== undefined || spec.prior?.family !== "normal") return undefined;
  const prior: MeanPrior = { mean: spec.prior.settings.mean!, sd: spec.prior.settings.sd! };
  const space = createParameterSpace(model.space.specs.filter((s) => s.name !== "mean"));
  const fullIndex = Int32Array.from(space.names, (name) => model.space.names.indexOf(name));
  const meanIndex = model.space.names.indexOf("mean");
  const full = new Float64Array(model.space.names.length);
  const processAt = processFactory(model, lightCurve);
  const y = lightCurve.value;
  // The mean's posterior of recently evaluated points, so that putting the mean back into draws the
  // sampler evaluated already costs no second pass (importance draws, and walkers that stayed put).
  const recent = new Map<string, { readonly mean: number; readonly sd: number }>();
  const marginalAt = (physical: ArrayLike<number>) => {
    for (let i = 0; i < fullIndex.length; i++) full[fullIndex[i]] = physical[i];
    full[meanIndex] = prior.mean;
    const result = processAt(full).meanMarginal(y, prior);
    if (recent.size >= RECENT_MEAN_POSTERIORS) recent.clear();
    recent.set(Array.prototype.join.call(physical, " "), result.meanPosterior);
    return result;
  };
  return {
    space,
    prior,
    likelihood: {
      logLikelihood(physical) {
        return logLikelihoodOrImpossible(() => marginalAt(physical).logLikelihood);
      },
    },
    meanPosterior: (physical) => recent.get(Array.prototype.join.call(physical, " ")) ?? marginalAt(physical).meanPosterior,
  };
}

/**
 * The draws of a collapsed run with the mean put back: for every draw, a value from the mean's
 * conditional posterior given that draw's other parameters (one O(N R^2) pass per distinct draw:
 * an ensemble repeats a walker's position whenever its move is rejected). Columns in `model.space.names`
 * order.
 */
export function restoreMean(model: LightCurveModel, collapsed: CollapsedMeanModel, draws: PosteriorDraws, rng: Rng): PosteriorDraws {
  const mean = new Float64Array(draws.chain.length);
  forEachRowPosterior(draws, collapsed.space.names, collapsed.meanPosterior, (posterior, k) => {
    mean[k] = posterior.mean + posterior.sd * rng.normal();
  });
  const columns: Record<string, Float64Array> = {};
  for (const name of model.space.names) columns[name] = name === "mean" ? mean : draws.columns[name];
  return { ...draws, names: model.space.names, columns };
}

/**
 * Calls `use(posterior, k)` for every draw k, with `posterior = posteriorAt(row k of the columns
 * `names`)` computed once per run of identical rows: ensemble walkers that reject a move, and
 * importance draws resampled by weight, repeat their previous row, and a conditional posterior costs a
 * likelihood pass.
 */
export function forEachRowPosterior<P>(
  draws: PosteriorDraws,
  names: readonly string[],
  posteriorAt: (row: Float64Array) => P,
  use: (posterior: P, k: number) => void,
): void {
  const row = new Float64Array(names.length);
  const previous = new Float64Array(names.length);
  let posterior: P | undefined;
  for (let k = 0; k < draws.chain.length; k++) {
    let same = posterior !== undefined;
    for (let i = 0; i < names.length; i++) {
      row[i] = draws.columns[names[i]][k];
      if (row[i] !== previous[i]) same = false;
    }
    if (posterior === undefined || !same) {
      posterior = posteriorAt(row);
      previous.set(row);
    }
    use(posterior, k);
  }
}
