import { carmaOrderOf, orderText } from "./carma-model.js";
import type { LightCurve } from "../lightcurve/light-curve.js";
import type { MethodPosterior, PosteriorDraws } from "../inference/index.js";
import { HOROLOGIUM_VERSION } from "../version.js";
import type { DataSummary } from "./data-summary.js";
import type { FitOptions } from "./fit-options.js";
import { evenlySpacedIndices } from "../numerics/even-thinning.js";
import { RESULT_FORMAT_VERSION, type FitDiagnostics, type FitResult, type RobustNoiseSummary, type StoredPosteriorSample } from "./fit-result.js";
import type { PosteriorSummaries } from "./fit-summaries.js";
import { runRecords } from "./fit-run-records.js";
import { fitWarnings } from "./fit-warnings.js";
import type { LightCurveModel } from "./light-curve-model.js";
import type { DrawnPeriodMode } from "./period-modes.js";
import { grossOutlierThreshold, grossOutliers } from "./outlier-screen.js";
import type { RobustNoise } from "./robust-noise.js";
import { robustSummary } from "./robust-summary.js";

/** Everything the result JSON is assembled from. */
export interface ResultParts {
  readonly options: FitOptions;
  readonly lightCurve: LightCurve;
  readonly summary: DataSummary;
  readonly model: LightCurveModel;
  readonly summaries: PosteriorSummaries;
  readonly diagnostics: FitDiagnostics;
  /** The modes the pooled draws sit in, with the share of the draws in each (`drawnPeriodModes`). */
  readonly modes: readonly DrawnPeriodMode[];
  readonly periodogramPeriod?: number;
  readonly robust?: RobustNoise;
  readonly maximumPosterior: Readonly<Record<string, number>>;
  readonly draws: PosteriorDraws;
  /** The posterior of each start, for the traces of MCMC runs and the weights of importance-sampled ones. */
  readonly runs: readonly MethodPosterior[];
  /** The candidate period modes the fit weighed before sampling (`planModes`), when it searched for them. */
  readonly candidates?: readonly { readonly period: number; readonly probability: number }[];
}

/** Number of posterior draws kept in the result when the options do not say (`keptDraws`). */
export const DEFAULT_KEPT_DRAWS = 400;

/**
 * The result stage of a fit: the result JSON ({@link FitResult}) with the data's provenance, the
 * summaries, diagnostics and warnings, the options that change the model, the robust noise (bounded: robust-summary.ts), the
 * priors, the maximum a posteriori, the period modes, and at most `keptDraws` posterior draws spread
 * evenly over the pooled ones.
 */
export function assembleFitResult(parts: ResultParts): FitResult {
  const { options, lightCurve, summary, model, summaries, diagnostics, modes, robust } = parts;
  const provenance = lightCurve.provenance;
  const robustSection = robust ? robustSummary(robust, lightCurve) : undefined;
  return {
    formatVersion: RESULT_FORMAT_VERSION,
    model: options.model,
    seed: options.seed,
    version: HOROLOGIUM_VERSION,
    data: {
      n: summary.n,
      dropped: provenance.dropped,
      placeholders: provenance.placeholders ?? 0,
      baseline: summary.baseline,
      medianCadence: summary.medianCadence,
      timeColumn: provenance.timeColumn,
      valueColumn: provenance.valueColumn,
      errorColumn: provenance.errorColumn,
      source: provenance.source,
      unit: lightCurve.unit,
      ...(lightCurve.band !== undefined ? { band: lightCurve.band } : {}),
    },
    parameters: summaries.parameters,
    derived: summaries.derived,
    diagnostics,
    warnings: [
      ...fitWarnings({ model, summary, lightCurve, parameters: summaries.parameters, derived: summaries.derived, diagnostics, modes, redshift: options.redshift }),
      ...(robust && robustSection ? robustWarnings(robust, robustSection) : outlierWarnings(lightCurve)),
    ],
    options: {
      ...(options.background ? { background: options.background } : {}),
      ...(options.redshift !== undefined ? { redshift: options.redshift } : {}),
      ...(model.fitsJitter ? { jitter: true } : {}),
      ...(robust ? { robust: true } : {}),
      ...(options.order !== undefined ? { order: orderText(carmaOrderOf(options.order)) } : {}),
    },
    ...(robustSection ? { robust: robustSection } : {}),
    priors: Object.fromEntries(model.space.free.map((p) => [p.name, { family: p.prior.family, settings: p.prior.settings }])),
    maximumPosterior: parts.maximumPosterior,
    ...(modes.length > 0 ? { periodModes: modes.map((m) => ({ period: m.period, probability: m.probability })) } : {}),
    ...(parts.candidates && parts.candidates.length > 0 ? { periodCandidates: parts.candidates.map((m) => ({ period: m.period, probability: m.probability })) } : {}),
    ...(parts.periodogramPeriod !== undefined ? { periodogramPeriod: parts.periodogramPeriod } : {}),
    posteriorSample: thinnedSample(parts.draws, options.keptDraws ?? DEFAULT_KEPT_DRAWS),
    ...runRecords(parts.runs),
  };
}

function robustWarnings(robust: RobustNoise, summary: RobustNoiseSummary): string[] {
  const likely = summary.likelyOutliers;
  return [
    ...(likely > 0
      ? [`${likely} points are likely outliers (probability > 0.5 that their scatter exceeds twice their error bar); the Student-t noise down-weights them.`]
      : []),
    ...(robust.converged
      ? []
      : [`The robust noise weights had not settled after ${robust.iterations} iterations: the outlier probabilities are approximate.`]),
  ];
}

/** A fit with Gaussian noise whose data hold gross outliers says that --robust exists. */
function outlierWarnings(lightCurve: LightCurve): string[] {
  const found = grossOutliers(lightCurve);
  if (found.length === 0) return [];
  const shown = found.slice(0, 5).map((i) => lightCurve.time[i]).join(", ") + (found.length > 5 ? ", ..." : "");
  return [
    `${found.length} point(s) lie more than ${grossOutlierThreshold(lightCurve.time.length).toFixed(1)} standard deviations from a running median of ` +
      `their neighbours (at times ${shown}), far more than Gaussian noise allows: the fit treats them as real. ` +
      (lightCurve.error ? "Refit with --robust (Student-t noise) to down-weight outliers." : "With an error column, --robust (Student-t noise) would down-weight them."),
  ];
}

/** At most `count` draws spread evenly over the pooled draws, for predictions and reports from the JSON. */
export function thinnedSample(draws: PosteriorDraws, count: number): StoredPosteriorSample {
  const picks = evenlySpacedIndices(draws.chain.length, count);
  return {
    names: draws.names,
    chain: picks.map((i) => draws.chain[i]),
    rows: picks.map((i) => draws.names.map((name) => draws.columns[name][i])),
  };
}
