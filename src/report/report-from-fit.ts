import type { LightCurve } from "../lightcurve/light-curve.js";
import type { FitResult } from "../models/fit-result.js";
import type { LightCurveModel } from "../models/light-curve-model.js";
import type { Kernel } from "../kernels/index.js";
import { posteriorPredictive, type PredictiveCurve } from "../models/posterior-predictive.js";
import { evenlySpacedItems } from "../numerics/even-thinning.js";
import { conditioningLightCurve } from "../models/model-from-result.js";
import { storedPosteriorSample } from "../models/posterior-sample.js";
import { quantileOf } from "../numerics/order-statistics.js";
import { computePeriodogram } from "../periodogram/periodogram.js";
import type { ReportInput } from "./report-input.js";
import { spectrumComparison } from "./spectrum-comparison.js";

/** Sizes of the report's computed curves. */
export interface ReportSizes {
  /** Grid points of the predictive curve (default 600). */
  readonly gridPoints?: number;
  /** Posterior draws used for the predictive curve and the PSD band (default 120). */
  readonly draws?: number;
}

/**
 * Fills a report from a fit of `lightCurve` (as read: the measured errors, which the figures and the
 * outlier table show): the posterior-predictive curve, conditioned on the light curve as the fit saw it
 * (errors widened by the robust weights, when the fit was robust), on a grid spanning the data, 5% before the
 * first point and 10% after the last (so the forecast after the last point shows); the draws per chain;
 * the generalised Lomb-Scargle periodogram; and the 68% band of the model PSD, S(2 pi f) (two-sided, per
 * unit angular frequency) at log-spaced frequencies from a tenth of 1 / baseline to 1 / (2 x smallest spacing).
 */
export function reportInputFromFit(
  lightCurve: LightCurve,
  result: FitResult,
  model: LightCurveModel,
  sizes: ReportSizes = {},
): ReportInput {
  const conditioning = conditioningLightCurve(result, lightCurve);
  return reportInputFromDraws(lightCurve, result, {
    names: model.space.names,
    predict: (rows, grid) => posteriorPredictive(model, conditioning, rows, grid),
    kernelAt: (row) => model.kernelAt(row),
  }, sizes);
}

/** What the report needs of a model: its parameter names, its posterior predictive and its kernel. */
export interface ReportModel {
  readonly names: readonly string[];
  /** The posterior-predictive curve of the report's light curve over `rows` at `grid`. */
  predict(rows: readonly (readonly number[])[], grid: Float64Array): PredictiveCurve;
  kernelAt(row: readonly number[]): Kernel;
}

/** {@link reportInputFromFit} for any model that can predict and give its kernel (one band or several). */
export function reportInputFromDraws(lightCurve: LightCurve, result: FitResult, model: ReportModel, sizes: ReportSizes = {}): ReportInput {
  const names = model.names;
  const sample = storedPosteriorSample(result, names);
  const { time } = lightCurve;
  const first = time[0];
  const last = time[time.length - 1];
  const baseline = last - first;
  const points = sizes.gridPoints ?? 600;
  const grid = Float64Array.from({ length: points }, (_, i) => first - 0.05 * baseline + (1.15 * baseline * i) / (points - 1));
  const used = evenlySpacedItems(sample.rows, sizes.draws ?? 120);
  const prediction = model.predict(used, grid);

  const chains = [...new Set(sample.chain)].sort((a, b) => a - b);
  const perChain = chains.map((c) => sample.rows.filter((_, k) => sample.chain[k] === c));
  const length = perChain.reduce((shortest, rows) => Math.min(shortest, rows.length), Infinity);
  const draws = {
    names: [...names],
    chains: Object.fromEntries(
      names.map((name, i) => [name, perChain.map((rows) => rows.slice(0, length).map((row) => row[i]))]),
    ),
  };

  const periodogram = computePeriodogram({
    time: lightCurve.time,
    value: lightCurve.value,
    ...(lightCurve.error ? { error: lightCurve.error } : {}),
  });
  let smallest = Infinity;
  for (let i = 1; i < time.length; i++) if (time[i] > time[i - 1]) smallest = Math.min(smallest, time[i] - time[i - 1]);
  const fLow = 0.1 / baseline;
  const fHigh = 1 / (2 * smallest);
  const frequencies = Float64Array.from({ length: 200 }, (_, i) => fLow * Math.pow(fHigh / fLow, i / 199));
  const spectra = used.map((row) => model.kernelAt(row).psd(frequencies.map((f) => 2 * Math.PI * f)));
  const band = (q: number) => frequencies.map((_, i) => quantileOf(spectra.map((s) => s[i]), q));
  const comparison = spectrumComparison(lightCurve, result, periodogram, used.map((row) => model.kernelAt(row)));
  const period = result.parameters["period"]?.median;
  const periodic = period !== undefined && period > 0 ? periodicCurves(lightCurve, period, (grid) => model.predict(used, grid)) : undefined;
  return {
    result,
    lightCurve,
    prediction,
    draws,
    ...(periodic ? { periodic } : {}),
    periodogram: { frequency: periodogram.frequency, power: periodogram.power, label: "Lomb-Scargle power" },
    psdBand: { frequency: frequencies, median: band(0.5), lower: band(0.16), upper: band(0.84), mass: 0.68 },
    ...(comparison ? { psdComparison: comparison } : {}),
  };
}

/** Data times used for the folded model curve at most (evenly thinned beyond). */
const MAX_FOLDED_TIMES = 2000;
/** Periods shown by the zoom. */
const ZOOM_PERIODS = 4;
/** Grid points of the zoom's curve. */
const ZOOM_POINTS = 400;

/**
 * The predictive curves of a periodic model's figures: at the data's times (thinned to
 * {@link MAX_FOLDED_TIMES}) and on a fine grid over the stretch of {@link ZOOM_PERIODS} periods that holds
 * the most measurements.
 */
function periodicCurves(lightCurve: LightCurve, period: number, predict: (grid: Float64Array) => PredictiveCurve) {
  const { time } = lightCurve;
  const thinned = evenlySpacedItems(Array.from(time), MAX_FOLDED_TIMES);
  const width = ZOOM_PERIODS * period;
  let bestStart = time[0];
  let bestCount = 0;
  let last = 0;
  for (let first = 0; first < time.length; first++) {
    while (last < time.length && time[last] <= time[first] + width) last++;
    if (last - first > bestCount) (bestCount = last - first), (bestStart = time[first]);
  }
  const zoomGrid = Float64Array.from({ length: ZOOM_POINTS }, (_, i) => bestStart + (width * i) / (ZOOM_POINTS - 1));
  return { atData: predict(Float64Array.from(thinned)), zoom: predict(zoomGrid) };
}
