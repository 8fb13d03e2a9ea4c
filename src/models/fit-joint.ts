import { DEFAULT_SAMPLER, posteriorByMethod, type ImportanceSamplingOptions, type MethodPosterior, type PosteriorDraws } from "../inference/index.js";
import type { LightCurve } from "../lightcurve/light-curve.js";
import { combinedDiagnostics } from "./fit-diagnostics.js";
import type { FitOptions } from "./fit-options.js";
import { periodogramPeriod } from "./fit-period-search.js";
import { DEFAULT_KEPT_DRAWS, thinnedSample } from "./fit-result-assembly.js";
import { RESULT_FORMAT_VERSION, type FitResult } from "./fit-result.js";
import { DEFAULT_FIT_BUDGET, fitMethod } from "./fit-sampling.js";
import { posteriorSummaries } from "./fit-summaries.js";
import { fitWarnings } from "./fit-warnings.js";
import { buildJointModel, jointLikelihood, jointSummary, referenceBandIndex, type JointModel } from "./joint-model.js";
import { modelPeriodRange } from "./period-range.js";
import { carmaOrderOf, orderText } from "./carma-model.js";
import { collapseJointMeans, restoreBandMeans } from "./joint-mean-marginal.js";
import { jointWarnings } from "./joint-warnings.js";
import { lagScanGuess } from "./joint-lag-scan.js";
import { childSeed, createRng } from "../random/rng.js";
import { runRecords } from "./fit-run-records.js";
import { HOROLOGIUM_VERSION } from "../version.js";
import { explainingUnfittable } from "./fit-data-support.js";

/** Options of a joint multi-band fit. */
export interface JointFitOptions extends FitOptions {
  /** Fit a lag per band relative to the reference band. */
  readonly lags?: boolean;
  /** The reference band (default: the best-sampled one). */
  readonly referenceBand?: string;
}

/** Everything a joint fit produces: the result JSON, the model and the draws. */
export interface DetailedJointFit {
  readonly result: FitResult;
  readonly model: JointModel;
  readonly lightCurves: readonly LightCurve[];
  readonly draws: PosteriorDraws;
  /** The posterior as computed (importance sampling or MCMC), before the band means were put back. */
  readonly posterior: MethodPosterior;
}

/**
 * Importance sampling is tried for joint posteriors of up to this many free parameters: six bands' DRW
 * with lags (tau, sigma, five amplitude ratios, five lags). The amplitude ratios and lags are
 * determined by the data nearly as Gaussians; k-hat and the ESS still decide, with the ensemble as the
 * fallback.
 */
export const JOINT_IMPORTANCE_MAX_DIMENSION = 12;

/**
 * Starts of the joint mode search: the data-driven first guess and one prior draw. Each start of a
 * Nelder-Mead search in 7-12 dimensions costs about 1500 evaluations, most of a joint fit's, and on the
 * six-band quasars of bench/multi-band-fit.ts further starts found the same mode.
 */
const JOINT_STARTS = 2;

/**
 * With lags: the mode search starts from the first guess with the scanned lags only, and once more from
 * its maximum with the lags scanned again at the kernel found there (`restartFrom`, `lagScanGuess`); a
 * start drawn from the 12-dimensional prior ended 800-1200 below the mode in ln p on the calibration
 * quasars and never helped.
 */
const JOINT_LAG_STARTS = 1;

/**
 * With lags, a failed importance sample is tried once more with three times the draws (48,000, about
 * 5 CPU s) before the walker ensemble runs: in these 12 dimensions the ensemble's autocorrelation is
 * long (kinked, tent-shaped lag conditionals), and forced fallbacks needed 4.6e5 to over 2e6
 * evaluations (35-158 CPU s, one not converged within the budget; bench/README.md).
 */
const JOINT_LAG_IMPORTANCE_RETRIES = 1;

/**
 * Importance sampling settings of a joint fit with lags (the caller's `importance` options override them).
 * The likelihood has a kink wherever a shifted time crosses another band's time, and the lags'
 * conditionals are tents the curvature at the tip measures 1.5-3.6 times too narrow: the pilot is widened
 * to the conditional widths measured on a grid and moved to the conditional means
 * (`conditionalWidening`, inference/conditional-widths.ts). In 12 dimensions a refit at 1.5 times the
 * weighted scale (the default beyond two dimensions) is itself a 9-fold loss of ESS per draw (a
 * Gaussian proposal s times wider than a Gaussian posterior keeps 1 / E_q[(p/q)^2] = ((2 s^2 - 1) / s^4)^(d/2)
 * of the draws' worth, common practice); 1.2 times (a 1.8-fold loss) suffices with the widened pilot in
 * the mixture. Refits replace a component after 3600 of its draws and up to 16,000 draws are taken
 * (about 1.6 CPU s at 360 points), still far cheaper than the walker ensemble's 5e5 evaluations. Measured on bench/multi-band-calibration.ts --lags (bench/README.md).
 */
export const JOINT_LAG_IMPORTANCE: ImportanceSamplingOptions = {
  conditionalWidening: "shift",
  refitInflation: 1.44,
  maxDraws: 16000,
  refits: 8,
  maxDrawsPerRefit: 3600,
};

/**
 * The joint mode search's Nelder-Mead tolerances: values within 1e-7 of max(1, |ln p|) (about 1e-4 in ln p
 * for a few hundred points) and a simplex within 1e-3 along every axis of the unconstrained space. The
 * importance weights correct a mode found this closely (the Laplace proposal is inflated twofold), and
 * the library's tighter defaults cost most of the fit's evaluations in 7-12 dimensions.
 */
const JOINT_MODE_SEARCH = { valueTolerance: 1e-7, sizeTolerance: 1e-3 };

/**
 * Fits one shared process to every band at once (`buildJointModel`): the shared kernel's parameters,
 * per-band amplitudes, means, jitters and, with `lags`, lags. Stages: for periodic models the period
 * range from the joint sampling (`modelPeriodRange`) and the reference band's periodogram peak as the
 * first guess of the period (`periodogramPeriod`); with lags, each lag's first guess from a scan across
 * its prior (`lagScanGuess`); the posterior from the first guess and a prior draw by the fit's method (`posteriorByMethod`: for models without a period Pareto-smoothed importance
 * sampling from the mode, with the walker ensemble when k-hat or the ESS fail, as `fitMethod` says for
 * one band); except with NUTS the band means are integrated out and drawn back afterwards
 * (`collapseJointMeans`), NUTS samples them with the rest;
 * summaries, diagnostics and warnings as for one band (`posteriorSummaries`, `combinedDiagnostics`,
 * `fitWarnings`), plus the lag warnings (`jointWarnings`).
 */
export function fitJointDetailed(lightCurves: readonly LightCurve[], options: JointFitOptions): DetailedJointFit {
  // The robust (Student-t) noise is a model of one light curve's points; the joint model has none.
  if (options.robust) throw new RangeError("fitJointDetailed: robust noise fits one band at a time; the joint model of several bands has none");
  const clock = options.clock ?? (() => performance.now());
  const start = clock();
  const reference = referenceBandIndex(lightCurves, options.referenceBand);
  const range = modelPeriodRange(options.model, jointSummary(lightCurves, reference), options, lightCurves[reference].provenance.source);
  const periodGuess = range ? periodogramPeriod(lightCurves[reference], range) : undefined;
  const model = buildJointModel(options.model, lightCurves, {
    ...(options.background ? { background: options.background } : {}),
    ...(options.jitter ? { jitter: true } : {}),
    ...(options.lags ? { lags: true } : {}),
    ...(options.referenceBand !== undefined ? { referenceBand: options.referenceBand } : {}),
    ...(periodGuess !== undefined ? { periodGuess } : {}),
    ...(range ? { periodRange: range } : {}),
    ...(options.order !== undefined ? { order: carmaOrderOf(options.order) } : {}),
  });
  const collapsed = (options.sampler ?? DEFAULT_SAMPLER) === "ensemble" ? collapseJointMeans(model, lightCurves) : undefined;
  const space = collapsed?.space ?? model.space;
  const sampledOnly = (record: Readonly<Record<string, number>>) => Object.fromEntries(Object.entries(record).filter(([name]) => space.names.includes(name)));
  // No start with a finite density: one line about the data (fit-data-support.ts), as for one band.
  const posterior = explainingUnfittable(lightCurves[reference], model.summary, options.model, () =>
    posteriorByMethod(space, collapsed?.likelihood ?? jointLikelihood(model, lightCurves), {
      seed: options.seed,
      initial: sampledOnly({ ...model.initialGuess, ...lagScanGuess(model, lightCurves) }),
      starts: model.lags ? JOINT_LAG_STARTS : JOINT_STARTS,
      ...(model.lags ? { restartFrom: (maximum: Readonly<Record<string, number>>) => sampledOnly({ ...maximum, ...lagScanGuess(model, lightCurves, maximum) }) } : {}),
      ...(model.lags ? { importanceRetries: JOINT_LAG_IMPORTANCE_RETRIES } : {}),
      maxEvaluations: options.maxEvaluations ?? DEFAULT_FIT_BUDGET,
      ...(options.sampler ? { sampler: options.sampler } : {}),
      method: fitMethod(model, options),
      importanceMaxDimension: JOINT_IMPORTANCE_MAX_DIMENSION,
      nelderMead: JOINT_MODE_SEARCH,
      ...(model.lags || options.importance ? { importance: { ...(model.lags ? JOINT_LAG_IMPORTANCE : {}), ...options.importance } } : {}),
      ...(options.onProgress ? { onProgress: options.onProgress } : {}),
      ...(options.signal ? { signal: options.signal } : {}),
      clock,
    }),
  );
  const sampled = posterior.draws;
  const draws = collapsed ? restoreBandMeans(model, collapsed, sampled, createRng(childSeed(options.seed, 200))) : sampled;
  let maximumPosterior: Record<string, number> = { ...posterior.maximum };
  if (collapsed) {
    const means = collapsed.meanPosterior(collapsed.space.physicalFromRecord(posterior.maximum)).mean;
    model.bands.forEach((band, b) => (maximumPosterior[`mean.${band}`] = means[b]));
    maximumPosterior = Object.fromEntries(model.space.names.map((name) => [name, maximumPosterior[name]]));
  }
  const summaries = posteriorSummaries(draws, model.space.names, options.model, options.redshift);
  const diagnostics = combinedDiagnostics([posterior], (clock() - start) / 1000);
  const referenceCurve = lightCurves[model.reference];
  const dropped = lightCurves.reduce((sum, lc) => sum + lc.provenance.dropped, 0);
  const provenance = referenceCurve.provenance;
  const result: FitResult = {
    formatVersion: RESULT_FORMAT_VERSION,
    model: options.model,
    seed: options.seed,
    version: HOROLOGIUM_VERSION,
    data: {
      n: model.summary.n,
      dropped,
      baseline: model.summary.baseline,
      medianCadence: model.summary.medianCadence,
      timeColumn: provenance.timeColumn,
      valueColumn: provenance.valueColumn,
      errorColumn: provenance.errorColumn,
      source: provenance.source,
      unit: referenceCurve.unit,
    },
    bands: {
      fit: "joint",
      names: [...model.bands],
      reference: model.bands[model.reference],
      points: Object.fromEntries(lightCurves.map((lc, b) => [model.bands[b], lc.time.length])),
      dropped: Object.fromEntries(lightCurves.map((lc, b) => [model.bands[b], lc.provenance.dropped])),
      ...(model.lags ? { lagRange: model.lagRange } : {}),
    },
    parameters: summaries.parameters,
    derived: summaries.derived,
    diagnostics,
    warnings: [
      ...fitWarnings({
        model,
        summary: model.summary,
        lightCurve: { ...referenceCurve, provenance: { ...provenance, dropped } },
        parameters: summaries.parameters,
        diagnostics,
        modes: [],
        redshift: options.redshift,
      }),
      ...jointWarnings(model, lightCurves, summaries.parameters),
    ],
    options: {
      bands: "joint",
      ...(model.lags ? { lags: true } : {}),
      ...(options.referenceBand !== undefined ? { referenceBand: options.referenceBand } : {}),
      ...(options.background ? { background: options.background } : {}),
      ...(options.redshift !== undefined ? { redshift: options.redshift } : {}),
      ...(options.jitter ? { jitter: true } : {}),
      ...(options.order !== undefined ? { order: orderText(carmaOrderOf(options.order)) } : {}),
    },
    priors: Object.fromEntries(model.space.free.map((p) => [p.name, { family: p.prior.family, settings: p.prior.settings }])),
    maximumPosterior,
    ...(periodGuess !== undefined ? { periodogramPeriod: periodGuess } : {}),
    posteriorSample: thinnedSample(draws, options.keptDraws ?? DEFAULT_KEPT_DRAWS),
    ...runRecords([posterior]),
  };
  return { result, model, lightCurves, draws, posterior };
}
