import type { CarmaOrder } from "./carma-model.js";
import type { CancellationSignal, ImportanceSamplingOptions, SamplerKind, SamplerProgress } from "../inference/index.js";
import type { ModelName } from "./light-curve-model.js";

/** Options of a fit. */
export interface FitOptions {
  /** The order of a CARMA model (`model: "carma"`), or its text "p,q" (as batch workers receive it). */
  readonly order?: CarmaOrder | string;
  readonly model: ModelName;
  /** Seed of every random choice; the same seed gives the same result, bit for bit. */
  readonly seed: number | string;
  /** Add a slow damped random walk for trends. */
  readonly background?: "drw";
  /** Fit a white-noise jitter even when the light curve has errors. */
  readonly jitter?: boolean;
  /** Source redshift: adds the rest-frame timescale tau / (1 + z) to damped-random-walk results. */
  readonly redshift?: number;
  /** Shortest period searched and allowed (periodic models); default twice the typical visit spacing. */
  readonly minimumPeriod?: number;
  /** Longest period searched and allowed; default the baseline (oscillator) or half of it (rotation). */
  readonly maximumPeriod?: number;
  /** Student-t noise with per-point outlier probabilities instead of Gaussian noise (needs an error column). */
  readonly robust?: boolean;
  /**
   * "auto" (the default unless `sampler` is given) and "importance": Pareto-smoothed importance sampling
   * from a proposal fitted at the mode (for periodic models, a mixture with a component at every period
   * mode found; fitMethod in fit-sampling.ts), with MCMC when its diagnostics fail. "mcmc": the MCMC
   * sampler only (the default when `sampler` is given).
   */
  readonly method?: "auto" | "importance" | "mcmc";
  /** Settings of the importance sampler (draws, proposals, thresholds); the defaults suit most fits. */
  readonly importance?: ImportanceSamplingOptions;
  /** "nuts" or "ensemble" (default: DEFAULT_SAMPLER of the inference layer), the sampler MCMC uses. */
  readonly sampler?: SamplerKind;
  /** Budget in log-likelihood evaluations (gradients weighted by their cost); default 2e6. */
  readonly maxEvaluations?: number;
  /** Number of posterior draws kept in the result for predictions and reports (default 400). */
  readonly keptDraws?: number;
  readonly onProgress?: (progress: SamplerProgress) => void;
  readonly signal?: CancellationSignal;
  /** Milliseconds clock for the timing figure (default performance.now). */
  readonly clock?: () => number;
}
