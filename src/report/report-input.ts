import type { LightCurve } from "../lightcurve/light-curve.js";
import type { FitResult } from "../models/fit-result.js";
import type { PsdComparison } from "./psd-comparison.js";

/** A numeric column: a typed array or a plain array, whichever the producer has at hand. */
export type NumericColumn = ArrayLike<number>;

/**
 * The posterior-predictive latent light curve on a time grid (typically spanning the data and its
 * seasonal gaps): Gaussian mean and standard deviation at each grid time, in the units of the data.
 */
export interface PredictiveCurve {
  /** Grid times in the input time unit, ascending. */
  readonly time: NumericColumn;
  /** Posterior-predictive mean of the latent (noise-free) curve. */
  readonly mean: NumericColumn;
  /** Posterior-predictive standard deviation of the latent curve. */
  readonly sd: NumericColumn;
  /** The 2.5% and 97.5% quantiles of the predictive mixture, when the producer has them (for the CSV download). */
  readonly lower95?: NumericColumn;
  readonly upper95?: NumericColumn;
}

/**
 * Posterior draws in physical units, kept per chain so traces can be drawn. For an ensemble sampler a
 * "chain" is one walker. `chains[name][c][s]` is draw `s` of parameter `name` in chain `c`.
 *
 * @example { names: ["tau", "sigma"], chains: { tau: [walker0Tau, walker1Tau], sigma: [walker0Sigma, walker1Sigma] } }
 */
export interface PosteriorDraws {
  /** Parameter names in display order (normally the keys of `FitResult.parameters`). */
  readonly names: readonly string[];
  /** Per parameter, one array of draws per chain; every chain of every parameter has the same length. */
  readonly chains: Readonly<Record<string, readonly NumericColumn[]>>;
}

/** A periodogram of the data, for example generalised Lomb-Scargle power. */
export interface PeriodogramCurve {
  /** Frequencies in cycles per input time unit, ascending and positive. */
  readonly frequency: NumericColumn;
  readonly power: NumericColumn;
  /** How the power is normalised, shown on the axis (default "normalised power"). */
  readonly label?: string;
}

/**
 * The posterior band of the model's power spectral density: at each frequency, the median and a
 * central credible interval of the PSD over posterior draws.
 */
export interface PsdBand {
  /** Frequencies in cycles per input time unit, ascending and positive. */
  readonly frequency: NumericColumn;
  readonly median: NumericColumn;
  readonly lower: NumericColumn;
  readonly upper: NumericColumn;
  /** Credible mass of [lower, upper], for the legend (default 0.68). */
  readonly mass?: number;
  /** The PSD unit as text, for the axis (default "<value unit>² <time unit>"). */
  readonly unit?: string;
}

/** How to show one parameter: a symbol, its unit and whether a logarithmic axis suits it better. */
export interface ParameterDisplay {
  /** A short symbol or name, for example "τ" or "P". */
  readonly label: string;
  /** The unit as text, for example "d" or "mag"; empty for dimensionless parameters. */
  readonly unit: string;
  /** A plain-language noun for the summary, for example "variability timescale". */
  readonly description?: string;
  /** Draw the corner and trace axes in log10 of the parameter (for scale parameters spanning decades). */
  readonly logScale?: boolean;
}

/**
 * Everything the report shows for one light curve. The models layer fills it after a fit; only
 * `result`, `lightCurve`, `prediction` and `draws` are required.
 */
export interface ReportInput {
  readonly result: FitResult;
  /**
   * A joint multi-band fit: every band's light curve with its posterior prediction, drawn one panel per
   * band after the main light-curve figure (which shows the reference band).
   */
  readonly bandPanels?: readonly BandPanel[];
  readonly lightCurve: LightCurve;
  readonly prediction: PredictiveCurve;
  readonly draws: PosteriorDraws;
  /** The periodogram of the data; with `psdBand` it makes the spectrum figure. */
  readonly periodogram?: PeriodogramCurve;
  readonly psdBand?: PsdBand;
  /**
   * CARMA and damped-random-walk fits: the model PSD, the periodogram and the best DRW on one scale; the
   * spectrum figure is then `psdFigure`'s (psd-figure.ts) instead of the two-axis one.
   */
  readonly psdComparison?: PsdComparison;
  /** The time unit as text for axes and sentences (default "d"). */
  readonly timeUnit?: string;
  /** Overrides of the default labels and units, by parameter name. */
  readonly parameterDisplay?: Readonly<Record<string, Partial<ParameterDisplay>>>;
  /**
   * Models with a period: the posterior-predictive curve at (an evenly thinned subset of) the data's own
   * times, for the phase-folded figure, and on a fine grid over a stretch of a few periods, for the zoom.
   */
  readonly periodic?: {
    readonly atData: PredictiveCurve;
    readonly zoom: PredictiveCurve;
  };
  /** A heading for the report, for example the object's identifier (default: the light curve's source). */
  readonly title?: string;
}

/** One band of a joint multi-band fit, as its light-curve panel draws it. */
export interface BandPanel {
  readonly band: string;
  readonly lightCurve: LightCurve;
  readonly prediction: PredictiveCurve;
}
