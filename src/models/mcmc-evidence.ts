import { samplePosterior, type MaximumPosterior, type ParameterSpace, type PhysicalLikelihood, type PosteriorTarget, type SamplerRun } from "../inference/index.js";
import type { Rng } from "../random/rng.js";
import { bridgeLogEvidence, type BridgeEvidence, type PosteriorChain } from "./bridge-evidence.js";

/** Bridge sampling's estimate with how the posterior draws it used were made. */
export interface MarkovBridgeEvidence extends BridgeEvidence {
  /** Whether the chains passed their convergence criteria (R-hat, ESS) before the budget ran out. */
  readonly chainsConverged: boolean;
  /** Log-likelihood evaluations of the chains (gradients weighted as the sampler counts them). */
  readonly chainEvaluations: number;
}

/** Settings of {@link markovBridgeEvidence}. */
export interface MarkovBridgeOptions {
  readonly seed: number | string;
  /** Budget of the chains in log-likelihood evaluations (default 60,000). */
  readonly maxEvaluations?: number;
  /** Most posterior draws kept for the estimate, thinned evenly along each chain (default 3000). */
  readonly maxDraws?: number;
  readonly symmetries?: readonly (readonly number[])[];
  /**
   * Where to start the walkers instead of a tight ball at the mode (`startPoints` of `samplePosterior`):
   * draws of a failed importance sample resampled by their weights, spread over the modes it found.
   */
  readonly startPoints?: readonly Float64Array[];
}

/**
 * ln Z by bridge sampling ({@link bridgeLogEvidence}) from the walker ensemble's draws of the posterior
 * (`samplePosterior`, started at the mode already found or at `startPoints`, run to its convergence
 * criteria or the budget),
 * after the ensemble's burn-in, thinned evenly to at most `maxDraws`. The second estimator of the
 * evidence, for a posterior that importance sampling from t components at its modes cannot cover.
 * `target` is the unconstrained posterior with the Jacobian of `space` and `likelihood`, and `maximum`
 * its maximum.
 */
export function markovBridgeEvidence(
  space: ParameterSpace,
  likelihood: PhysicalLikelihood,
  target: PosteriorTarget,
  maximum: MaximumPosterior,
  rng: Rng,
  options: MarkovBridgeOptions,
): MarkovBridgeEvidence | undefined {
  const sample = samplePosterior(space, likelihood, {
    seed: options.seed,
    sampler: "ensemble",
    maximum: { found: maximum, evaluations: 0 },
    maxEvaluations: options.maxEvaluations ?? 60_000,
    ...(options.startPoints ? { startPoints: options.startPoints } : {}),
  });
  const chains = keptChains(sample.run, options.maxDraws ?? 3000);
  const estimate = bridgeLogEvidence(target, chains, rng, options.symmetries ? { symmetries: options.symmetries } : {});
  if (estimate === undefined) return undefined;
  return { ...estimate, chainsConverged: sample.diagnostics.converged, chainEvaluations: sample.diagnostics.likelihoodEvaluations };
}

/** Every chain's draws after burn-in, every k-th row so that at most `limit` draws are kept in all. */
function keptChains(run: SamplerRun, limit: number): PosteriorChain[] {
  const store = run.sampler.draws;
  const first = run.analysisStart;
  const rows = store.length - first;
  const stride = Math.max(1, Math.ceil((rows * store.chains) / limit));
  return Array.from({ length: store.chains }, (_, chain) => {
    const logPosterior = store.logPosteriorOf(chain, first);
    const points: Float64Array[] = [];
    const values: number[] = [];
    for (let r = 0; r < rows; r += stride) {
      points.push(store.row(chain, first + r));
      values.push(logPosterior[r] ?? -Infinity);
    }
    return { points, logPosterior: Float64Array.from(values) };
  });
}
