import type { LightCurve } from "../lightcurve/light-curve.js";
import { parseCarmaOrder } from "./carma-model.js";
import type { FitResult } from "./fit-result.js";
import { buildJointModel, type JointModel } from "./joint-model.js";

/**
 * Rebuilds the joint model a joint multi-band result was fitted with, for the same bands: the same
 * data-driven priors, reference band, lags and jitter, so that its stored draws can be used again.
 */
export function jointModelFromResult(result: FitResult, lightCurves: readonly LightCurve[]): JointModel {
  if (!result.bands) throw new RangeError("not a joint multi-band result (no \"bands\")");
  const options = result.options;
  return buildJointModel(result.model, lightCurves, {
    referenceBand: result.bands.reference,
    ...(options.lags ? { lags: true } : {}),
    ...(options.background ? { background: options.background } : {}),
    ...(options.jitter ? { jitter: true } : {}),
    ...(options.order !== undefined ? { order: parseCarmaOrder(options.order) } : {}),
  });
}
