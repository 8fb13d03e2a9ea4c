import { InputError } from "../errors/input-error.js";
import { NoFiniteStartError } from "../inference/index.js";
import type { LightCurve } from "../lightcurve/light-curve.js";
import type { DataSummary } from "./data-summary.js";
import type { LightCurveModel, ModelName } from "./light-curve-model.js";

/**
 * The first check of a fit: what the data cannot support at all ends here in one InputError naming
 * the file (the command line prints it as one line and exits 2), never deeper in an internal error:
 * - all points at one time (no time span to see variability over);
 * - all values equal (no variability to model: every amplitude would be zero).
 */
export function requireVariableData(lightCurve: LightCurve, summary: DataSummary, model: ModelName): void {
  const where = { file: lightCurve.provenance.source };
  if (summary.n < 2 || !(summary.baseline > 0)) {
    throw new InputError(`all ${summary.n} points are at one time: a ${model} model needs a time span`, where);
  }
  const first = lightCurve.value[0];
  let constant = true;
  for (let i = 1; i < summary.n && constant; i++) if (lightCurve.value[i] !== first) constant = false;
  if (constant) {
    throw new InputError(
      `all ${summary.n} values are equal (${first}): a constant light curve has no variability for a ${model} model to describe`,
      { ...where, column: lightCurve.provenance.valueColumn },
    );
  }
}

/**
 * The second check, once the model is built: at least one more point than the model has free
 * parameters, or their posterior is the prior's and the mean's uncertainty undefined.
 */
export function requireEnoughPoints(lightCurve: LightCurve, model: LightCurveModel): void {
  const parameters = model.space.free.map((p) => p.name);
  if (lightCurve.time.length <= parameters.length) {
    throw new InputError(
      `only ${lightCurve.time.length} points for the ${parameters.length} parameters of the ${model.name} model ` +
        `(${parameters.join(", ")}): at least ${parameters.length + 1} are needed`,
      { file: lightCurve.provenance.source },
    );
  }
}

/**
 * Runs the stages of a fit that search the posterior, turning "not finite at any starting point" into a
 * one-line InputError about the data. The usual cause: errors so small against the values' spread that,
 * at the light curve's spacing, the covariance of a process smooth on that scale is singular in double
 * precision (its Cholesky pivots fall below the rounding of the variance, about 1e-16 of it); white noise
 * fitted beside the model (`--jitter`), or a model rough at short lags (the damped random walk), remove it.
 */
export function explainingUnfittable<T>(lightCurve: LightCurve, summary: DataSummary, model: ModelName, stages: () => T): T {
  try {
    return stages();
  } catch (error) {
    if (!(error instanceof NoFiniteStartError)) throw error;
    const ratio = summary.hasErrors && summary.spread > 0 ? summary.medianError / summary.spread : NaN;
    const cause =
      ratio < 1e-6
        ? `: the errors (median ${ratio.toPrecision(2)} of the values' spread) are too small for double precision at this spacing (median ${summary.medianCadence.toPrecision(3)})`
        : "";
    throw new InputError(
      `the ${model} model's covariance cannot be factorised at any starting point${cause}; fit a white-noise term beside it (--jitter) or use the drw model`,
      { file: lightCurve.provenance.source },
    );
  }
}
