/**
 * Simulation-based calibration (Talts, Betancourt, Simpson, Vehtari & Gelman 2018, arXiv:1804.06788)
 * of the damped-random-walk model on a seasonal-gap cadence. For each replicate: parameters are drawn
 * from the prior, a light curve is simulated from them, the posterior is sampled, and the rank of each
 * true value among `drawsPerRank` posterior draws (thinned evenly from the kept draws) is recorded. If
 * priors, likelihood, transforms and sampler are all right, every rank is uniform on 0..drawsPerRank;
 * a chi-square test (stdlib chi2gof) on a histogram of the ranks checks this per parameter.
 */
import chi2gof from "@stdlib/stats/chi2gof";
import { createParameterSpace, type ParameterSpace } from "../src/inference/parameter-space.js";
import { logUniformPrior, normalPrior } from "../src/inference/priors.js";
import { samplePosterior, type SamplerKind } from "../src/inference/sample-posterior.js";
import { posteriorDraws } from "../src/inference/posterior-draws.js";
import { seasonalGroundCadence } from "../src/lightcurve/cadence.js";
import { childSeed, createRng } from "../src/random/rng.js";
import { dampedRandomWalkLikelihood, simulateDampedRandomWalk } from "./samplers-gp-models.js";

/** Options of {@link runCalibration}. */
export interface CalibrationOptions {
  readonly replicates: number;
  /** Posterior draws each true value is ranked among (ranks run 0..drawsPerRank). */
  readonly drawsPerRank: number;
  /** Histogram bins; (drawsPerRank + 1) must be a multiple of it. */
  readonly bins: number;
  readonly sampler: SamplerKind;
  readonly seed: number;
  /** Observing seasons (each about 8 months, a visit every 4 nights, 4-month gaps). */
  readonly seasons?: number;
  /** Budget per fit, in log-likelihood evaluations. */
  readonly maxEvaluations?: number;
  /** NUTS warm-up per chain. */
  readonly warmup?: number;
  readonly chains?: number;
  readonly onReplicate?: (index: number, converged: boolean) => void;
}

/** Ranks and uniformity tests per parameter. */
export interface CalibrationResult {
  readonly names: readonly string[];
  /** ranks[parameter][replicate]. */
  readonly ranks: readonly number[][];
  /** Rank histograms, `bins` counts per parameter. */
  readonly histograms: readonly number[][];
  /** Chi-square p-values of uniformity, per parameter. */
  readonly pValues: readonly number[];
  /** Replicates whose fit met the convergence criteria. */
  readonly converged: number;
}

/** The prior the calibration draws from and fits with: tau (days), sigma (mag), mean (mag). */
export function calibrationSpace(): ParameterSpace {
  return createParameterSpace([
    { name: "tau", prior: logUniformPrior(10, 500) },
    { name: "sigma", prior: logUniformPrior(0.05, 0.5) },
    { name: "mean", prior: normalPrior(19, 0.3) },
  ]);
}

/** Runs the calibration. Every replicate has its own child seed, so the result is fixed by `seed`. */
export function runCalibration(options: CalibrationOptions): CalibrationResult {
  const { replicates, drawsPerRank, bins } = options;
  if ((drawsPerRank + 1) % bins !== 0) throw new RangeError("drawsPerRank + 1 must be a multiple of bins");
  const space = calibrationSpace();
  const names = space.free.map((p) => p.name);
  const ranks: number[][] = names.map(() => []);
  let converged = 0;
  for (let r = 0; r < replicates; r++) {
    const rng = createRng(childSeed(options.seed, r));
    const truthVector = space.toPhysical(space.drawFromPrior(rng));
    const truth = { tau: truthVector[0]!, sigma: truthVector[1]!, mean: truthVector[2]! };
    const time = seasonalGroundCadence(
      { start: 60000, seasons: options.seasons ?? 3, seasonLength: 243, revisitInterval: 4, weatherLoss: 0.3 },
      rng,
    );
    const { value, error } = simulateDampedRandomWalk(time, truth, 0.04, rng);
    const fit = samplePosterior(space, dampedRandomWalkLikelihood(time, value, error), {
      seed: childSeed(options.seed, 100000 + r),
      sampler: options.sampler,
      maxEvaluations: options.maxEvaluations ?? 1e6,
      ...(options.warmup !== undefined ? { warmup: options.warmup } : {}),
      ...(options.chains !== undefined ? { chains: options.chains } : {}),
    });
    if (fit.diagnostics.converged) converged++;
    options.onReplicate?.(r, fit.diagnostics.converged);
    const draws = posteriorDraws(space, fit.run);
    const total = draws.chain.length;
    // A fit stopped before it kept any draws has no ranks; it must not pass as rank 0.
    if (total < drawsPerRank) throw new Error(`replicate ${r}: the fit kept ${total} draws (${fit.stopReason})`);
    names.forEach((name, i) => ranks[i]!.push(rankOfTruth(draws.columns[name]!, truthVector[i]!, drawsPerRank)));
  }
  return { names, ranks, converged, ...rankUniformity(ranks, drawsPerRank, bins) };
}

/**
 * The rank of a true value among `drawsPerRank` draws spaced evenly across the pooled chains (0 to
 * drawsPerRank); with ESS >= 400 of several thousand draws they are close to independent, as the rank
 * statistic needs (Talts et al. 2018, sec. 4.1).
 */
export function rankOfTruth(column: ArrayLike<number>, truth: number, drawsPerRank: number): number {
  let rank = 0;
  for (let k = 0; k < drawsPerRank; k++) {
    const index = Math.floor(((k + 0.5) * column.length) / drawsPerRank);
    if (column[index]! < truth) rank++;
  }
  return rank;
}

/** Rank histograms (`bins` counts per parameter) and their chi-square p-values of uniformity (stdlib chi2gof). */
export function rankUniformity(
  ranks: readonly number[][],
  drawsPerRank: number,
  bins: number,
): { histograms: number[][]; pValues: number[] } {
  const width = (drawsPerRank + 1) / bins;
  const histograms = ranks.map((rs) => {
    const h = new Array<number>(bins).fill(0);
    for (const rank of rs) h[Math.floor(rank / width)]!++;
    return h;
  });
  const pValues = histograms.map((h) => chi2gof(h, new Array<number>(bins).fill(1 / bins)).pValue);
  return { histograms, pValues };
}
