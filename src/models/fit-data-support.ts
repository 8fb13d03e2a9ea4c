import { InputError } from "../errors/input-error.js";
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
