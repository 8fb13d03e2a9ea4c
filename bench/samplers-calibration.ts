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
import { posteriorByMethod } from "../src/inference/posterior-by-method.js";
import { samplePosterior, type SamplerKind } from "../src/inference/sample-posterior.js";
import { posteriorDraws, type PosteriorDraws } from "../src/inference/posterior-draws.js";
import { seasonalGroundCadence } from "../src/lightcurve/cadence.js";
import type { LightCurve } from "../src/lightcurve/light-curve.js";
import { summarizeLightCurve } from "../src/models/data-summary.js";
import { buildModel } from "../src/models/light-curve-model.js";
import { collapseMean, restoreMean } from "../src/models/mean-marginal.js";
import { childSeed, createRng } from "../src/random/rng.js";
import { dampedRandomWalkLikelihood, simulateDampedRandomWalk } from "./samplers-gp-models.js";

/** Options of {@link runCalibration}. */
export interface CalibrationOptions {
  readonly replicates: number;
  /** Posterior draws each true value is ranked among (ranks run 0..drawsPerRank). */
  readonly drawsPerRank: number;
  /** Histogram bins; (drawsPerRank + 1) must be a multiple of it. */
  readonly bins: number;
  /**
   * "fit": the path of a DRW fit (fitLightCurveDetailed) with the calibration priors: the mean integrated
   * out, the posterior by the default method (importance sampling, MCMC when its diagnostics fail), the
   * mean drawn back. A sampler name: that sampler on the full (tau, sigma, mean) space.
   */
  readonly sampler: SamplerKind | "fit";
  /** "short" (default): 3 seasons of 8 months, tau prior 10-500 d. "realistic": 10 seasons, a visit every 6 nights, tau prior 50-5000 d. */
  readonly setup?: "short" | "realistic";
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
  /** Replicates by method ("importance", "ensemble", "nuts"). */
  readonly methods: Readonly<Record<string, number>>;
}

/** The prior the calibration draws from and fits with: tau (days), sigma (mag), mean (mag). */
export function calibrationSpace(setup: "short" | "realistic" = "short"): ParameterSpace {
  return createParameterSpace([
    { name: "tau", prior: setup === "short" ? logUniformPrior(10, 500) : logUniformPrior(50, 5000) },
    { name: "sigma", prior: logUniformPrior(0.05, 0.5) },
    { name: "mean", prior: normalPrior(19, 0.3) },
  ]);
}

/**
 * One replicate along the path of a DRW fit (models/fit-light-curve.ts) with the calibration priors in
 * place of the data-driven ones: the DRW model's parameters are tau, sigma, mean in that order, as in
 * the calibration space, so its kernel and process builders apply unchanged.
 */
function fitPathDraws(space: ParameterSpace, lightCurve: LightCurve, seed: string, maxEvaluations: number): { draws: PosteriorDraws; converged: boolean; method: string } {
  const model = { ...buildModel("drw", summarizeLightCurve(lightCurve)), space };
  const collapsed = collapseMean(model, lightCurve)!;
  const run = posteriorByMethod(collapsed.space, collapsed.likelihood, { seed, maxEvaluations });
  const draws = restoreMean(model, collapsed, run.draws, createRng(childSeed(seed, 200)));
  return { draws, converged: run.diagnostics.converged, method: run.method };
}

/** Runs the calibration. Every replicate has its own child seed, so the result is fixed by `seed`. */
export function runCalibration(options: CalibrationOptions): CalibrationResult {
  const { replicates, drawsPerRank, bins } = options;
  if ((drawsPerRank + 1) % bins !== 0) throw new RangeError("drawsPerRank + 1 must be a multiple of bins");
  const setup = options.setup ?? "short";
  const space = calibrationSpace(setup);
  const names = space.free.map((p) => p.name);
  const ranks: number[][] = names.map(() => []);
  const methods: Record<string, number> = {};
  let converged = 0;
  for (let r = 0; r < replicates; r++) {
    const rng = createRng(childSeed(options.seed, r));
    const truthVector = space.toPhysical(space.drawFromPrior(rng));
    const truth = { tau: truthVector[0], sigma: truthVector[1], mean: truthVector[2] };
    const time = seasonalGroundCadence(
      setup === "short"
        ? { start: 60000, seasons: options.seasons ?? 3, seasonLength: 243, revisitInterval: 4, weatherLoss: 0.3 }
        : { start: 60000, seasons: options.seasons ?? 10, revisitInterval: 6 },
      rng,
    );
    const { value, error } = simulateDampedRandomWalk(time, truth, 0.04, rng);
    const seed = childSeed(options.seed, 100000 + r);
    const maxEvaluations = options.maxEvaluations ?? 1e6;
    let draws: PosteriorDraws;
    let fitConverged: boolean;
    if (options.sampler === "fit") {
      const lightCurve: LightCurve = {
        time,
        value,
        error,
        unit: "mag",
        provenance: { source: `calibration ${r}`, timeColumn: "time", valueColumn: "mag", errorColumn: "mag_err", dropped: 0, sorted: false },
      };
      const fit = fitPathDraws(space, lightCurve, seed, maxEvaluations);
      draws = fit.draws;
      fitConverged = fit.converged;
      methods[fit.method] = (methods[fit.method] ?? 0) + 1;
    } else {
      const fit = samplePosterior(space, dampedRandomWalkLikelihood(time, value, error), {
        seed,
        sampler: options.sampler,
        maxEvaluations,
        ...(options.warmup !== undefined ? { warmup: options.warmup } : {}),
        ...(options.chains !== undefined ? { chains: options.chains } : {}),
      });
      draws = posteriorDraws(space, fit.run);
      fitConverged = fit.diagnostics.converged;
      methods[fit.sampler] = (methods[fit.sampler] ?? 0) + 1;
    }
    if (fitConverged) converged++;
    options.onReplicate?.(r, fitConverged);
    const total = draws.chain.length;
    // A fit stopped before it kept any draws has no ranks; it must not pass as rank 0.
    if (total < drawsPerRank) throw new Error(`replicate ${r}: the fit kept ${total} draws`);
    names.forEach((name, i) => ranks[i].push(rankOfTruth(draws.columns[name], truthVector[i], drawsPerRank)));
  }
  return { names, ranks, converged, methods, ...rankUniformity(ranks, drawsPerRank, bins) };
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
    if (column[index] < truth) rank++;
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
    for (const rank of rs) h[Math.floor(rank / width)]++;
    return h;
  });
  const pValues = histograms.map((h) => chi2gof(h, new Array<number>(bins).fill(1 / bins)).pValue);
  return { histograms, pValues };
}
