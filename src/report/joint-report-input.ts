import type { DetailedJointFit } from "../models/fit-joint.js";
import { jointPredictive } from "../models/joint-predictive.js";
import { evenlySpacedItems } from "../numerics/even-thinning.js";
import { storedPosteriorSample } from "../models/posterior-sample.js";
import { reportInputFromDraws, type ReportSizes } from "./report-from-fit.js";
import type { BandPanel, ReportInput } from "./report-input.js";
import { sourceStem } from "./source-stem.js";

/**
 * The report of a joint multi-band fit: the reference band in the place of the single light curve (its
 * periodogram against the shared process's PSD band), one light-curve panel per band with that band's
 * posterior-predictive curve given all bands (`bandPanels`), and the per-band amplitudes, means and
 * lags in the parameter table with the shared parameters.
 */
export function jointReportInput(
  fit: Pick<DetailedJointFit, "model" | "lightCurves" | "result">,
  sizes: ReportSizes = {},
): ReportInput {
  const { model, lightCurves, result } = fit;
  const names = model.space.names;
  const reference = model.reference;
  const base = reportInputFromDraws(lightCurves[reference], result, {
    names,
    predict: (rows, grid) => jointPredictive(model, lightCurves, rows, reference, grid),
    kernelAt: (row) => model.kernelAt(row),
  }, sizes);
  const rows = evenlySpacedItems(storedPosteriorSample(result, names).rows, sizes.draws ?? 120);
  const grid = base.prediction.time as Float64Array;
  const bandPanels: BandPanel[] = lightCurves.map((lightCurve, b) => ({
    band: model.bands[b],
    lightCurve,
    prediction: b === reference ? base.prediction : jointPredictive(model, lightCurves, rows, b, grid),
  }));
  return { ...base, bandPanels, title: `${sourceStem(lightCurves[reference].provenance.source)}, ${model.bands.length} bands fitted jointly: ${result.model}` };
}
