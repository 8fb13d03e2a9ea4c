import type { ChainTrace, TraceSeries } from "../inference/chain-trace.js";
import type { ParameterSummary } from "../inference/posterior-summary.js";
import type { MethodDiagnostics, PosteriorMethod } from "../inference/posterior-by-method.js";
import type { SamplerKind } from "../inference/sample-posterior.js";
import type { PhotometricUnit } from "../lightcurve/light-curve.js";
import type { ModelName } from "./light-curve-model.js";

export type { ParameterSummary };

/**
 * The format of the fit-result JSON this version writes and reads (`formatVersion`). Raise it whenever a
 * key is renamed, removed or changes meaning, so that a reader can tell an older file from a malformed
 * one (docs/architecture.md, "Result JSON"). Format 2 is the first that carries the key; files without it
 * were written by earlier versions (priors flattened, diagnostics keys since renamed). Format 3: `robust`
 * lists the flagged points and the weights' parameters instead of N weights and probabilities.
 */
export const RESULT_FORMAT_VERSION = 3;

/**
 * The fit result: the JSON contract of `horologium fit` (docs/architecture.md, "Result JSON"). Every key
 * is declared here; a producer that adds one declares it, and {@link parseFitResult} checks it.
 */
export interface FitResult {
  /** {@link RESULT_FORMAT_VERSION} of the format the file was written in. */
  readonly formatVersion: typeof RESULT_FORMAT_VERSION;
  readonly model: ModelName;
  /** The seed of every random choice of the fit (the same seed gives the same result, bit for bit). */
  readonly seed: number | string;
  /** The Horologium version that produced the result. */
  readonly version: string;
  readonly data: FitDataSummary;
  /** Posterior summary of each parameter, by name (for example `tau`, `sigma`, `mean`), physical units. */
  readonly parameters: Readonly<Record<string, FitParameterSummary>>;
  /** Posterior summaries of quantities computed from the parameters (SF_inf, rest-frame tau, ...). */
  readonly derived: Readonly<Record<string, DerivedSummary>>;
  readonly diagnostics: FitDiagnostics;
  /** Plain-language warnings about what the data do not constrain. */
  readonly warnings: readonly string[];
  /** The choices of the fit that change the model, to rebuild it from the result. */
  readonly options: FitChoices;
  /** The Student-t noise, present when the fit was asked for robust noise. */
  readonly robust?: RobustNoiseSummary;
  /** The prior of each free parameter. */
  readonly priors: Readonly<Record<string, PriorDescription>>;
  /** The parameters at the maximum of the posterior found by the optimiser, physical units. */
  readonly maximumPosterior: Readonly<Record<string, number>>;
  /**
   * Periodic models: the modes in the period that the pooled posterior draws sit in (after P, P/2, 2P and
   * the daily aliases of the periodogram peak were weighed and sampled), each with its share of the draws.
   */
  readonly periodModes?: readonly PeriodModeSummary[];
  /**
   * Periodic models: the candidate periods the fit weighed before sampling (the periodogram peak, P/2, 2P and
   * the window's aliases, merged), each with its Laplace probability among them; those above 1% were sampled.
   */
  readonly periodCandidates?: readonly PeriodModeSummary[];
  /** Periodic models: the period of the highest periodogram peak, the first guess. */
  readonly periodogramPeriod?: number;
  /** Evenly thinned posterior draws, for predictions and reports made from the file alone. */
  readonly posteriorSample: StoredPosteriorSample;
  /** The bands of a joint multi-band fit (`fit --bands joint`); absent for one band. */
  readonly bands?: JointBandsSummary;
  /**
   * A bounded trace of each MCMC run over all its iterations, warm-up included (one per sampled period
   * mode; absent when no MCMC ran), for the trace figure.
   */
  readonly chainTraces?: readonly StoredChainTrace[];
  /** The weights of each importance-sampled run (absent when none was): importance draws form no chain. */
  readonly importanceWeights?: readonly StoredImportanceWeights[];
}

/** What was fitted. */
export interface FitDataSummary {
  /** Points used. */
  readonly n: number;
  /** Rows dropped: missing values and placeholder codes. */
  readonly dropped: number;
  /** Of the dropped rows, those whose magnitude or error was a placeholder code (99, 99.99, -99, -999). */
  readonly placeholders?: number;
  /** Last time minus first time, in the input time unit. */
  readonly baseline: number;
  /** Median spacing between consecutive times, in the input time unit. */
  readonly medianCadence: number;
  readonly timeColumn: string;
  readonly valueColumn: string;
  /** The error column, or null when the file has none (a white-noise term was then fitted). */
  readonly errorColumn: string | null;
  /** The file the light curve was read from (or a label for built-in or simulated data). */
  readonly source: string;
  readonly unit: PhotometricUnit;
  /** The band, when the light curve was one band of a multi-band file. */
  readonly band?: string;
}

/** The summary of one parameter in a result: {@link ParameterSummary} and the 95% highest-density interval. */
export interface FitParameterSummary extends ParameterSummary {
  /** Shortest interval holding 95% of the draws, [lower, upper]. */
  readonly hdi95: readonly [number, number];
}

/** The summary of a derived quantity: its statistics and what it is, in words. */
export interface DerivedSummary extends FitParameterSummary {
  readonly description: string;
}

/**
 * How the posterior was computed, whether its diagnostics hold, and its cost ({@link MethodDiagnostics},
 * which the inference layer owns): for importance sampling k-hat and the weights' ESS (R-hat, the
 * autocorrelation time and the acceptance do not apply and are null), for MCMC R-hat, ESS,
 * autocorrelation time and acceptance. A fit whose period modes used different methods says "mixed"
 * and lists them in `methods`.
 */
export interface FitDiagnostics extends Omit<MethodDiagnostics, "method" | "keptDraws"> {
  /** "importance", "ensemble", "nuts", or "mixed" when the period modes used different methods. */
  readonly method: PosteriorMethod | "mixed";
  /** The method of each period mode, when there are several. */
  readonly methods?: readonly PosteriorMethod[];
  /** The MCMC sampler, when one ran (absent when every mode was importance-sampled). */
  readonly sampler?: SamplerKind;
  /** Posterior draws kept for the summaries, over all runs (absent in results written before it was added). */
  readonly keptDraws?: number;
}

/** The choices of a fit that shape the model (absent keys: not chosen). */
export interface FitChoices {
  readonly background?: "drw";
  readonly redshift?: number;
  /** A white-noise term was fitted. */
  readonly jitter?: boolean;
  /** Student-t noise instead of Gaussian. */
  readonly robust?: boolean;
  /** The CARMA order "p,q" (`--model carma --order p,q`). */
  readonly order?: string;
  /** "joint": one shared process fitted to every band (`--bands joint`). */
  readonly bands?: "joint";
  /** Per-band lags were fitted (`--lags`). */
  readonly lags?: boolean;
  /** The reference band asked for (`--reference-band`). */
  readonly referenceBand?: string;
}

/**
 * The robust noise of a fit: the Student-t as a scale mixture of Gaussians. Bounded in size whatever the
 * number of points: the flagged points in full, a summary of the weights, and the parameters that
 * determine every weight, from which readers recompute them with the light curve (`robustWeightsAt`,
 * models/robust-noise.ts; predict and report do).
 */
export interface RobustNoiseSummary {
  /** The noise model, in words. */
  readonly noise: string;
  readonly degreesOfFreedom: number;
  /** Points whose outlier probability exceeds 1/2. */
  readonly likelyOutliers: number;
  /** Points the weights are for (the light curve's length). */
  readonly points: number;
  /** The physical parameters (by name) at which the weights were computed: with the light curve they give every weight. */
  readonly weightParameters: Readonly<Record<string, number>>;
  /** The precision weights of all points (each error is divided by sqrt(weight)). */
  readonly weightSummary: RobustWeightSummary;
  /**
   * The likely outliers (outlier probability above 1/2) in the order of the light curve; when there are
   * more than `MAX_FLAGGED_POINTS_STORED`, the most probable that many (`likelyOutliers` counts all).
   */
  readonly flagged: readonly RobustFlaggedPoint[];
}

/** Most flagged points a result lists (`robust.flagged`); `robust.likelyOutliers` counts all of them. */
export const MAX_FLAGGED_POINTS_STORED = 1000;

/** The distribution of the robust weights over all points. */
export interface RobustWeightSummary {
  readonly minimum: number;
  readonly median: number;
  readonly maximum: number;
  /** Points whose weight is below 1/2 (their error bar more than sqrt(2) times wider). */
  readonly belowHalf: number;
}

/** One likely outlier of a robust fit. */
export interface RobustFlaggedPoint {
  /** Position in the light curve (0-based, time order). */
  readonly index: number;
  readonly time: number;
  readonly value: number;
  /** Precision weight: the point's error is divided by sqrt(weight). */
  readonly weight: number;
  /** Probability that the point's scatter exceeds twice its error bar. */
  readonly outlierProbability: number;
}

/** A prior, for readers: its family and the family's settings (for example `{ lower, upper }`). */
export interface PriorDescription {
  /** "uniform", "log-uniform", "normal", "half-normal", "log-normal" or "truncated <family>". */
  readonly family: string;
  readonly settings: Readonly<Record<string, number>>;
}

/** One mode in the period of the posterior draws. */
export interface PeriodModeSummary {
  /** Median period of the draws in the mode. */
  readonly period: number;
  /** Share of the pooled draws in the mode: the posterior mass the draws give it. */
  readonly probability: number;
}

/** The thinned posterior draws stored in a fit result (`posteriorSample`). */
export interface StoredPosteriorSample {
  /** Parameter names, in the order of each row. */
  readonly names: readonly string[];
  /** Chain (or walker) of each row. */
  readonly chain: readonly number[];
  /** Physical parameter vectors. */
  readonly rows: readonly (readonly number[])[];
}

/**
 * One MCMC run traced over all its iterations (`chainTraces`): the inference layer's `ChainTrace`, a few
 * chains (and, for a large ensemble, the median over its walkers) at evenly spaced iterations, at most a
 * few hundred steps, values rounded to 6 significant digits.
 */
export type StoredChainTrace = ChainTrace;

/** One traced chain, walker, or the median over every walker (`TraceSeries`). */
export type StoredTraceSeries = TraceSeries;

/**
 * The Pareto-smoothed weights of one importance-sampled run, as the report draws them: the weights
 * times the number of draws (1: an equal share), largest first, the largest ones all kept and the rest
 * thinned evenly by rank.
 */
export interface StoredImportanceWeights {
  /** Importance draws. */
  readonly draws: number;
  /** k-hat of the weights and the threshold it was compared with. */
  readonly paretoK: number;
  readonly paretoKThreshold: number;
  /** ESS of the smoothed weights, 1 / sum w^2. */
  readonly effectiveSampleSize: number;
  /** Rank of each stored weight (1: the largest). */
  readonly ranks: readonly number[];
  /** The weight at that rank times `draws`. */
  readonly scaledWeights: readonly number[];
}

/** The bands of a joint multi-band fit: one shared process, per-band amplitude, mean and lag. */
export interface JointBandsSummary {
  readonly fit: "joint";
  /** Band names, in the file's order of first appearance. */
  readonly names: readonly string[];
  /** The band whose amplitude is 1 and lag 0; `sigma` is its amplitude of the shared process. */
  readonly reference: string;
  /** Points and dropped rows per band. */
  readonly points: Readonly<Record<string, number>>;
  readonly dropped: Readonly<Record<string, number>>;
  /** With lags: the prior half-width of every lag (input time unit). */
  readonly lagRange?: number;
}
