import type { MultiBandProcess } from "../gp/multi-band-process.js";
import type { LightCurve } from "../lightcurve/light-curve.js";
import { jointProcessAt, type JointModel } from "./joint-model.js";
import { predictiveMixture, type PredictiveCurve } from "./posterior-predictive.js";

/**
 * The posterior-predictive latent light curve of one band of a joint fit, m_b + a_b f(t - l_b), at
 * `times`: the equal-weight mixture over posterior draws of the joint process's prediction given every
 * band's data ({@link predictiveMixture}), so each band borrows the others' visits.
 *
 * @param rows posterior draws, physical vectors in `model.space.names` order
 * @param band index of the band in `model.bands`
 */
export function jointPredictive(
  model: JointModel,
  lightCurves: readonly LightCurve[],
  rows: readonly ArrayLike<number>[],
  band: number,
  times: ArrayLike<number>,
): PredictiveCurve {
  let base: MultiBandProcess | undefined;
  const predictions = rows.map((row) => {
    base = base ? base.withParameters(model.kernelAt(row), model.bandParametersAt(row)) : jointProcessAt(model, lightCurves, row);
    return base.given().at(band, times);
  });
  return predictiveMixture(times, predictions);
}
