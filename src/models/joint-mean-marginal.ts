import { drawBandMeans, type BandMeanMarginal, type BandMeanPrior } from "../gp/band-mean-sums.js";
import type { MultiBandProcess } from "../gp/multi-band-process.js";
import { createParameterSpace, type ParameterSpace, type PhysicalLikelihood, type PosteriorDraws } from "../inference/index.js";
import { logLikelihoodOrImpossible } from "./impossible-parameters.js";
import { forEachRowPosterior } from "./mean-marginal.js";
import type { LightCurve } from "../lightcurve/light-curve.js";
import type { Rng } from "../random/rng.js";
import { jointProcessAt, type JointModel } from "./joint-model.js";

/**
 * A joint model with every band's mean integrated out (the means enter linearly: Rybicki & Press 1992,
 * ApJ 398, 169; one column per band, `integrateBandMeans`). The same reason as for one band
 * (mean-marginal.ts): a long timescale leaves the means poorly determined, and the funnel between them
 * slows an ensemble sampler; with B bands there are B such directions. The joint posterior is unchanged:
 * p(theta, m | y) = p(theta | y) p(m | theta, y).
 */
export interface CollapsedJointModel {
  /** The model's parameter space without the `mean.<band>` parameters. */
  readonly space: ParameterSpace;
  readonly likelihood: PhysicalLikelihood;
  /** The band means' posterior given the other parameters (`space` order). */
  meanPosterior(physical: ArrayLike<number>): BandMeanMarginal;
}

/** The collapsed form of a joint model, or undefined when a band's mean prior is not normal. */
export function collapseJointMeans(model: JointModel, lightCurves: readonly LightCurve[]): CollapsedJointModel | undefined {
  const meanNames = model.bands.map((b) => `mean.${b}`);
  const priors: BandMeanPrior[] = [];
  for (const name of meanNames) {
    const spec = model.space.specs.find((s) => s.name === name);
    if (!spec || spec.fixed !== undefined || spec.prior?.family !== "normal") return undefined;
    priors.push({ mean: spec.prior.settings.mean!, sd: spec.prior.settings.sd! });
  }
  const space = createParameterSpace(model.space.specs.filter((s) => !meanNames.includes(s.name)));
  const fullIndex = Int32Array.from(space.names, (name) => model.space.names.indexOf(name));
  const full = new Float64Array(model.space.names.length);
  meanNames.forEach((name, b) => (full[model.space.names.indexOf(name)] = priors[b].mean));
  let base: MultiBandProcess | undefined;
  const marginalAt = (physical: ArrayLike<number>): BandMeanMarginal => {
    for (let i = 0; i < fullIndex.length; i++) full[fullIndex[i]] = physical[i];
    base = base ? base.withParameters(model.kernelAt(full), model.bandParametersAt(full)) : jointProcessAt(model, lightCurves, full);
    return base.meanMarginal(priors);
  };
  return {
    space,
    likelihood: {
      logLikelihood(physical) {
        return logLikelihoodOrImpossible(() => marginalAt(physical).logLikelihood);
      },
    },
    meanPosterior: marginalAt,
  };
}

/**
 * The draws of a collapsed run with the band means put back: for every distinct draw, the means drawn
 * from their conditional posterior (an ensemble repeats a walker's position when a move is rejected).
 */
export function restoreBandMeans(model: JointModel, collapsed: CollapsedJointModel, draws: PosteriorDraws, rng: Rng): PosteriorDraws {
  const count = draws.chain.length;
  const bands = model.bands.length;
  const means = model.bands.map(() => new Float64Array(count));
  const xi = new Float64Array(bands);
  forEachRowPosterior(draws, collapsed.space.names, collapsed.meanPosterior, (posterior, k) => {
    for (let b = 0; b < bands; b++) xi[b] = rng.normal();
    const drawn = drawBandMeans(posterior, xi);
    for (let b = 0; b < bands; b++) means[b][k] = drawn[b];
  });
  const columns: Record<string, Float64Array> = {};
  for (const name of model.space.names) {
    const band = model.bands.findIndex((b) => `mean.${b}` === name);
    columns[name] = band >= 0 ? means[band] : draws.columns[name];
  }
  return { ...draws, names: model.space.names, columns };
}
